/**
 * Saturation from the equal-pressure and equal-Gibbs-energy (Maxwell) conditions, solved by
 * Newton on the two densities (after Akasaka, J. Thermal Sci. Technol. 3 (2008) 442), from
 * ancillary-equation starting guesses. saturationP wraps it in a Newton iteration on T using
 * the Clausius–Clapeyron slope.
 */
import { ancillary, pressureGibbs, stateAt, type Model } from './model.ts'
import { newResidual, residual } from './helmholtz.ts'
import type { FluidResult, SaturationPair } from './types.ts'
import { fail, ok } from './result.ts'

const rr = newResidual()

/** highest temperature at which we solve the saturation equations (K below Tc) */
export const SAT_T_MARGIN = 0.01

export interface SatDensities {
  rhoL: number
  rhoV: number
  p: number
}

/** Densities (kg/m³) of the coexisting phases at T, or null when Newton does not converge. */
const anchors = new WeakMap<Model, SatDensities | null>()
/** width (K) of the near-critical band where guesses come from scaling, not ancillaries */
const NEAR = 1

export function satDensities(m: Model, T: number): SatDensities | null {
  const eos = m.data.eos
  const dc = m.data.rhoc / m.rhor
  let dL: number, dV: number
  const gap = m.data.Tc - T
  if (gap < NEAR) {
    // near Tc: scale the coexistence densities from Tc − NEAR with the critical exponent β ≈ 0.35
    let a = anchors.get(m)
    if (a === undefined) {
      a = solve(
        m,
        m.data.Tc - NEAR,
        ancillary(m.data.rhoL, m.data.Tc - NEAR) / eos.rhor,
        ancillary(m.data.rhoV, m.data.Tc - NEAR) / eos.rhor,
        dc,
      )
      anchors.set(m, a)
    }
    if (!a) return null
    const f = Math.pow(Math.max(gap, 1e-9) / NEAR, 0.35)
    dL = dc + (a.rhoL / m.rhor - dc) * f
    dV = dc + (a.rhoV / m.rhor - dc) * f
  } else {
    dL = ancillary(m.data.rhoL, T) / eos.rhor
    dV = ancillary(m.data.rhoV, T) / eos.rhor
  }
  const first = solve(m, T, dL, dV, dc)
  if (first || gap >= NEAR) return first
  // continuation: march in from 0.1 K further from Tc, using each solution as the next guess
  let prev = satDensities(m, Math.min(T - 0.1, m.data.Tc - NEAR))
  for (let k = 1; k <= 4 && prev; k++) {
    const Tk = T - 0.1 * (1 - k / 4)
    prev = solve(m, Tk, prev.rhoL / m.rhor, prev.rhoV / m.rhor, dc)
  }
  return prev
}

function solve(m: Model, T: number, dL: number, dV: number, dc: number): SatDensities | null {
  const eos = m.data.eos
  const tau = eos.Tr / T
  if (!(dL > dc)) dL = dc * 1.05
  if (!(dV < dc) || !(dV > 0)) dV = dc * 0.95
  for (let it = 0; it < 100; it++) {
    residual(eos, tau, dL, rr)
    const JL = dL * (1 + dL * rr.d)
    const KL = dL * rr.d + rr.a + Math.log(dL)
    const JLd = 1 + 2 * dL * rr.d + dL * dL * rr.dd
    const KLd = 2 * rr.d + dL * rr.dd + 1 / dL
    residual(eos, tau, dV, rr)
    const JV = dV * (1 + dV * rr.d)
    const KV = dV * rr.d + rr.a + Math.log(dV)
    const JVd = 1 + 2 * dV * rr.d + dV * dV * rr.dd
    const KVd = 2 * rr.d + dV * rr.dd + 1 / dV
    const f1 = JV - JL,
      f2 = KV - KL
    const det = JVd * KLd - JLd * KVd
    if (!Number.isFinite(det) || det === 0) return null
    const stepL = (f2 * JVd - f1 * KVd) / det
    const stepV = (f2 * JLd - f1 * KLd) / det
    // keep both densities positive and on their own side of the critical density
    let lam = 1
    for (let k = 0; k < 40; k++) {
      const nL = dL + lam * stepL,
        nV = dV + lam * stepV
      if (nL > 0 && nV > 0 && nL > nV) break
      lam *= 0.5
    }
    dL += lam * stepL
    dV += lam * stepV
    if (Math.abs(stepL) < 1e-13 * dL && Math.abs(stepV) < 1e-13 * dV) break
    if (it === 99 && !(Math.abs(f1) < 1e-12 * JL && Math.abs(f2) < 1e-12)) return null
  }
  if (!(dL > dV * (1 + 1e-9))) return null
  const rhoL = dL * m.rhor,
    rhoV = dV * m.rhor
  const out = new Float64Array(2)
  pressureGibbs(m, T, rhoL, out)
  const pL = out[0]!
  // the pressure is computed from the liquid; the vapour agrees to ~1e-12 relative
  return { rhoL, rhoV, p: pL }
}

export function satAtT(m: Model, T: number): FluidResult<SaturationPair> {
  const d = m.data
  if (!Number.isFinite(T)) return fail('invalid-input', `${d.id}: saturation temperature must be a number`)
  if (T < d.Ttriple)
    return fail('out-of-range', `${d.id}: ${T.toFixed(3)} K is below the triple point (${d.Ttriple} K)`)
  if (T > d.Tc - SAT_T_MARGIN) {
    return fail(
      'out-of-range',
      `${d.id}: no saturation at ${T.toFixed(3)} K — saturation is computed up to ${SAT_T_MARGIN} K below the critical temperature (${d.Tc} K); above Tc the fluid is supercritical`,
    )
  }
  const sd = satDensities(m, T)
  if (!sd) return fail('no-convergence', `${d.id}: the saturation equations did not converge at ${T.toFixed(3)} K`)
  const liquid = stateAt(m, T, sd.rhoL, 'two-phase', 0)
  const vapour = stateAt(m, T, sd.rhoV, 'two-phase', 1)
  return ok({
    T,
    p: sd.p,
    liquid: { ...liquid, p: sd.p, phase: 'liquid' },
    vapour: { ...vapour, p: sd.p, phase: 'vapour' },
  })
}

/** ln p_sat ancillary inverted by Newton for a starting T */
function tGuess(m: Model, p: number): number {
  const d = m.data
  let lo = d.Ttriple,
    hi = d.Tc - SAT_T_MARGIN
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi)
    if (ancillary(d.pSat, mid) < p) lo = mid
    else hi = mid
  }
  return 0.5 * (lo + hi)
}

const endCache = new WeakMap<Model, { lo: FluidResult<SaturationPair>; top: FluidResult<SaturationPair> }>()
/** saturation at the triple point and at Tc − margin, computed once per fluid */
function ends(m: Model) {
  let e = endCache.get(m)
  if (!e) {
    e = { lo: satAtT(m, m.data.Ttriple), top: satAtT(m, m.data.Tc - SAT_T_MARGIN) }
    endCache.set(m, e)
  }
  return e
}

export function satAtP(m: Model, p: number): FluidResult<SaturationPair> {
  const d = m.data
  if (!Number.isFinite(p) || p <= 0)
    return fail('invalid-input', `${d.id}: saturation pressure must be a positive number of pascals`)
  const lo = ends(m).lo
  if (!lo.ok) return lo
  if (p < lo.value.p * (1 - 1e-12))
    return fail(
      'out-of-range',
      `${d.id}: ${(p / 1000).toPrecision(5)} kPa is below the triple-point pressure (${(lo.value.p / 1000).toPrecision(5)} kPa)`,
    )
  const top = ends(m).top
  if (!top.ok) return top
  if (p > top.value.p) {
    return fail(
      'out-of-range',
      `${d.id}: no saturation at ${(p / 1e6).toPrecision(5)} MPa — at or above the critical pressure (${(d.pc / 1e6).toPrecision(5)} MPa) the fluid is supercritical`,
    )
  }
  let T = Math.min(Math.max(tGuess(m, p), d.Ttriple), d.Tc - SAT_T_MARGIN)
  let last: FluidResult<SaturationPair> | null = null
  for (let it = 0; it < 50; it++) {
    const s = satAtT(m, T)
    if (!s.ok) return s
    last = s
    const L = s.value.liquid,
      V = s.value.vapour
    const dpdT = (V.h - L.h) / (T * (V.v - L.v))
    const dT = (p - s.value.p) / dpdT
    let Tn = T + dT
    if (Tn < d.Ttriple) Tn = 0.5 * (T + d.Ttriple)
    if (Tn > d.Tc - SAT_T_MARGIN) Tn = 0.5 * (T + d.Tc - SAT_T_MARGIN)
    if (Math.abs(Tn - T) < 1e-12 * T) {
      T = Tn
      break
    }
    T = Tn
  }
  const s = satAtT(m, T)
  if (!s.ok) return last ?? s
  return s
}
