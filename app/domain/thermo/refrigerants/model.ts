/**
 * A fluid = its equation of state, ancillary starting guesses, limits and reference state.
 * Properties at (T, ρ) straight from the Helmholtz energy (SI, per kg).
 */
import { ideal, newIdeal, newResidual, residual, type EquationOfState } from './helmholtz.ts'
import type { FluidPhase, FluidState, RefrigerantId } from './types.ts'

/** Ancillary: value = r · (1 + Σ n θ^t) ('linear') or r · exp[(Tr/T if tauR) Σ n θ^t] ('exp'), θ = 1 − T/Ta */
export interface Ancillary {
  readonly kind: 'linear' | 'exp'
  readonly Ta: number
  readonly r: number
  readonly tauR: boolean
  readonly n: readonly number[]
  readonly t: readonly number[]
}

export function ancillary(a: Ancillary, T: number): number {
  const th = Math.max(1 - T / a.Ta, 0)
  let s = 0
  for (let i = 0; i < a.n.length; i++) s += a.n[i]! * Math.pow(th, a.t[i]!)
  if (a.kind === 'linear') return a.r * (1 + s)
  return a.r * Math.exp(a.tauR ? (a.Ta / T) * s : s)
}

export interface FluidData {
  readonly id: RefrigerantId
  readonly name: string
  readonly source: string
  readonly referenceState: string
  /** reference state: saturated liquid at Tref has h = href, s = sref (J/kg, J/(kg K)) */
  readonly ref: { readonly T: number; readonly h: number; readonly s: number }
  readonly eos: EquationOfState
  readonly Tc: number
  readonly pc: number
  /** kg/m³ */
  readonly rhoc: number
  readonly Ttriple: number
  readonly Tmin: number
  readonly Tmax: number
  readonly pmax: number
  /** molar-density ancillaries (mol/m³) and vapour pressure ancillary (Pa) */
  readonly rhoL: Ancillary
  readonly rhoV: Ancillary
  readonly pSat: Ancillary
}

export interface Model {
  readonly data: FluidData
  /** specific gas constant J/(kg K) */
  readonly R: number
  /** reducing mass density kg/m³ */
  readonly rhor: number
  /** offsets added to the raw h, s to meet the reference state */
  dh: number
  ds: number
}

const r = newResidual()
const i0 = newIdeal()

export function pressure(m: Model, T: number, rho: number): number {
  const delta = rho / m.rhor
  residual(m.data.eos, m.data.eos.Tr / T, delta, r)
  return rho * m.R * T * (1 + delta * r.d)
}

/** p and ∂p/∂ρ at T, filled into out[0], out[1]! */
export function pressureAndSlope(m: Model, T: number, rho: number, out: Float64Array): void {
  const delta = rho / m.rhor
  residual(m.data.eos, m.data.eos.Tr / T, delta, r)
  out[0] = rho * m.R * T * (1 + delta * r.d)
  out[1] = m.R * T * (1 + 2 * delta * r.d + delta * delta * r.dd)
}

/** Gibbs energy per kg, raw (no offsets), and pressure: into out[0] = p, out[1] = g */
export function pressureGibbs(m: Model, T: number, rho: number, out: Float64Array): void {
  const delta = rho / m.rhor
  const tau = m.data.eos.Tr / T
  residual(m.data.eos, tau, delta, r)
  ideal(m.data.eos.ideal, tau, i0)
  out[0] = rho * m.R * T * (1 + delta * r.d)
  out[1] = m.R * T * (1 + delta * r.d + i0.a + Math.log(delta) + r.a)
}

export function stateAt(m: Model, T: number, rho: number, phase: FluidPhase, x: number | null): FluidState {
  const delta = rho / m.rhor
  const tau = m.data.eos.Tr / T
  residual(m.data.eos, tau, delta, r)
  ideal(m.data.eos.ideal, tau, i0)
  const R = m.R
  const p = rho * R * T * (1 + delta * r.d)
  const h = R * T * (1 + tau * (i0.t + r.t) + delta * r.d) + m.dh
  const s = R * (tau * (i0.t + r.t) - i0.a - Math.log(delta) - r.a) + m.ds
  const cv = -R * tau * tau * (i0.tt + r.tt)
  const num = 1 + delta * r.d - delta * tau * r.dt
  const den = 1 + 2 * delta * r.d + delta * delta * r.dd
  const cp = cv + (R * num * num) / den
  const w2 = R * T * (den - (num * num) / (tau * tau * (i0.tt + r.tt)))
  return { T, p, rho, v: 1 / rho, h, u: h - p / rho, s, x, phase, cp, cv, w: w2 > 0 ? Math.sqrt(w2) : null }
}

export function makeModel(data: FluidData): Model {
  return { data, R: data.eos.R / data.eos.M, rhor: data.eos.rhor * data.eos.M, dh: 0, ds: 0 }
}
