/**
 * Generic reduced Helmholtz energy a/(RT) = α⁰(τ, δ) + αʳ(τ, δ) of a pure fluid, with the
 * τ/δ derivatives the properties need (τ = Tr/T, δ = ρ/ρr). Term forms are those of the
 * published multiparameter equations (power, exponential, Gaussian bell-shaped and the
 * Span–Wagner non-analytic near-critical terms; ideal-gas lead, log τ, power and
 * Planck–Einstein terms). Pure: no Node, web or database imports.
 */

export interface PowerTerm {
  readonly n: number
  readonly d: number
  readonly t: number
  readonly l: number
}
export interface GaussTerm {
  readonly n: number
  readonly d: number
  readonly t: number
  readonly eta: number
  readonly epsilon: number
  readonly beta: number
  readonly gamma: number
}
export interface NonAnalyticTerm {
  readonly n: number
  readonly a: number
  readonly b: number
  readonly beta: number
  readonly A: number
  readonly B: number
  readonly C: number
  readonly D: number
}

export interface IdealGas {
  /** α⁰ = ln δ + a1 + a2 τ + logTau ln τ + Σ n τ^t + Σ m ln(1 − exp(−θ τ)) */
  readonly a1: number
  readonly a2: number
  readonly logTau: number
  readonly power: readonly { readonly n: number; readonly t: number }[]
  readonly planck: readonly { readonly n: number; readonly t: number }[]
}

export interface EquationOfState {
  /** J/(mol K) as used in the paper */
  readonly R: number
  /** kg/mol */
  readonly M: number
  /** reducing temperature (K) and molar density (mol/m³) */
  readonly Tr: number
  readonly rhor: number
  readonly ideal: IdealGas
  readonly power: readonly PowerTerm[]
  readonly gauss: readonly GaussTerm[]
  readonly nonAnalytic: readonly NonAnalyticTerm[]
}

/** Residual part and derivatives; filled in place to avoid allocation. */
export interface Residual {
  a: number
  d: number
  dd: number
  t: number
  tt: number
  dt: number
}
export const newResidual = (): Residual => ({ a: 0, d: 0, dd: 0, t: 0, tt: 0, dt: 0 })

export function residual(eos: EquationOfState, tau: number, delta: number, out: Residual): Residual {
  let a = 0,
    d = 0,
    dd = 0,
    t = 0,
    tt = 0,
    dt = 0
  const lnd = Math.log(delta),
    lnt = Math.log(tau)
  for (const k of eos.power) {
    const base = k.n * Math.exp(k.d * lnd + k.t * lnt)
    if (k.l === 0) {
      a += base
      d += (base * k.d) / delta
      dd += (base * k.d * (k.d - 1)) / (delta * delta)
      t += (base * k.t) / tau
      tt += (base * k.t * (k.t - 1)) / (tau * tau)
      dt += (base * k.d * k.t) / (delta * tau)
    } else {
      const dl = Math.pow(delta, k.l)
      const e = Math.exp(-dl)
      const v = base * e
      const g = k.d - k.l * dl // δ ∂/∂δ of ln(δ^d e^{-δ^l})
      a += v
      d += (v * g) / delta
      dd += (v * (g * (g - 1) - k.l * k.l * dl)) / (delta * delta)
      t += (v * k.t) / tau
      tt += (v * k.t * (k.t - 1)) / (tau * tau)
      dt += (v * k.t * g) / (delta * tau)
    }
  }
  for (const k of eos.gauss) {
    const de = delta - k.epsilon,
      tg = tau - k.gamma
    const v = k.n * Math.exp(k.d * lnd + k.t * lnt - k.eta * de * de - k.beta * tg * tg)
    const fd = k.d / delta - 2 * k.eta * de
    const ft = k.t / tau - 2 * k.beta * tg
    a += v
    d += v * fd
    dd += v * (fd * fd - k.d / (delta * delta) - 2 * k.eta)
    t += v * ft
    tt += v * (ft * ft - k.t / (tau * tau) - 2 * k.beta)
    dt += v * fd * ft
  }
  for (const k of eos.nonAnalytic) {
    let dm1 = delta - 1
    if (dm1 === 0) dm1 = 1e-12
    const q = dm1 * dm1
    const tm1 = tau - 1
    const ib = 1 / (2 * k.beta)
    const theta = 1 - tau + k.A * Math.pow(q, ib)
    const Dl = theta * theta + k.B * Math.pow(q, k.a)
    if (!(Dl > 0)) continue
    const psi = Math.exp(-k.C * q - k.D * tm1 * tm1)
    const psiD = -2 * k.C * dm1 * psi
    const psiDD = (2 * k.C * q - 1) * 2 * k.C * psi
    const psiT = -2 * k.D * tm1 * psi
    const psiTT = (2 * k.D * tm1 * tm1 - 1) * 2 * k.D * psi
    const psiDT = 4 * k.C * k.D * dm1 * tm1 * psi
    const qib1 = Math.pow(q, ib - 1)
    const DlD = dm1 * (k.A * theta * (2 / k.beta) * qib1 + 2 * k.B * k.a * Math.pow(q, k.a - 1))
    const DlDD =
      DlD / dm1 +
      q *
        (4 * k.B * k.a * (k.a - 1) * Math.pow(q, k.a - 2) +
          2 * k.A * k.A * (1 / (k.beta * k.beta)) * qib1 * qib1 +
          k.A * theta * (4 / k.beta) * (ib - 1) * Math.pow(q, ib - 2))
    const Db = Math.pow(Dl, k.b)
    const Db1 = Math.pow(Dl, k.b - 1)
    const Db2 = Math.pow(Dl, k.b - 2)
    const DbD = k.b * Db1 * DlD
    const DbDD = k.b * (Db1 * DlDD + (k.b - 1) * Db2 * DlD * DlD)
    const DbT = -2 * theta * k.b * Db1
    const DbTT = 2 * k.b * Db1 + 4 * theta * theta * k.b * (k.b - 1) * Db2
    const DbDT = -k.A * k.b * (2 / k.beta) * Db1 * dm1 * qib1 - 2 * theta * k.b * (k.b - 1) * Db2 * DlD
    const n = k.n
    a += n * Db * delta * psi
    d += n * (Db * (psi + delta * psiD) + DbD * delta * psi)
    dd += n * (Db * (2 * psiD + delta * psiDD) + 2 * DbD * (psi + delta * psiD) + DbDD * delta * psi)
    t += n * delta * (DbT * psi + Db * psiT)
    tt += n * delta * (DbTT * psi + 2 * DbT * psiT + Db * psiTT)
    dt += n * (Db * (psiT + delta * psiDT) + delta * DbD * psiT + DbT * (psi + delta * psiD) + DbDT * delta * psi)
  }
  out.a = a
  out.d = d
  out.dd = dd
  out.t = t
  out.tt = tt
  out.dt = dt
  return out
}

/** Ideal part: returns α⁰ − ln δ (the δ dependence is exactly ln δ), plus τ derivatives. */
export interface Ideal {
  a: number
  t: number
  tt: number
}
export const newIdeal = (): Ideal => ({ a: 0, t: 0, tt: 0 })

export function ideal(ig: IdealGas, tau: number, out: Ideal): Ideal {
  let a = ig.a1 + ig.a2 * tau + ig.logTau * Math.log(tau)
  let t = ig.a2 + ig.logTau / tau
  let tt = -ig.logTau / (tau * tau)
  for (const k of ig.power) {
    const v = k.n * Math.pow(tau, k.t)
    a += v
    t += (v * k.t) / tau
    tt += (v * k.t * (k.t - 1)) / (tau * tau)
  }
  for (const k of ig.planck) {
    const e = Math.exp(-k.t * tau)
    a += k.n * Math.log(1 - e)
    t += (k.n * k.t * e) / (1 - e)
    tt -= (k.n * k.t * k.t * e) / ((1 - e) * (1 - e))
  }
  out.a = a
  out.t = t
  out.tt = tt
  return out
}
