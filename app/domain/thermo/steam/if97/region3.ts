// Region 3 (near-critical): basic equation f(rho,T) and its inversion rho(p,T).
// Source: IAPWS R7-97(2012), Section 7, Eq. (28), coefficients Table 30, property relations
// Table 31, derivatives Table 32. Reducing quantities rho* = rho_c = 322 kg/m^3, T* = T_c.
//
// The release gives region 3 in (rho, T). For (p, T) input we solve p(rho, T) = p by a
// safeguarded Newton iteration started from the correct side of the phase loop (the optional
// supplementary backward equations v(p,T) of IAPWS SR5-05 are not used):
//  - vapour-like states (T < T_c, p < p_s(T)) start from the ideal-gas density p/(RT), which lies
//    below the root; on the concave vapour branch Newton iterates then rise monotonically to it;
//  - liquid-like states (T < T_c, p >= p_s(T)) start from a density above the root; on the convex
//    liquid branch Newton iterates fall monotonically to it;
//  - above T_c the isotherm is monotone and the root is bracketed by both starts.
// If an iterate ever overshoots (sign change of p - p_target) the iteration falls back to a
// bracketed Newton/bisection hybrid inside [last good iterate, overshoot].
import { REGION3_I, REGION3_J, REGION3_N, REGION3_N1 } from './coefficients.ts'
import { R, RHOC, TC } from './constants.ts'
import type { If97Props } from './types.ts'

const N = REGION3_N.length
const I = Int32Array.from(REGION3_I)
const J = Int32Array.from(REGION3_J)
const CI = Float64Array.from(REGION3_I)
const CJ = Float64Array.from(REGION3_J)
const CII = Float64Array.from(REGION3_I, (i) => i * (i - 1))
const CJJ = Float64Array.from(REGION3_J, (j) => j * (j - 1))
const CIJ = Float64Array.from(REGION3_I, (i, k) => i * REGION3_J[k]!)
const I_MAX = Math.max(...REGION3_I)
const J_MAX = Math.max(...REGION3_J)
const dPow = new Float64Array(I_MAX + 1)
const tPow = new Float64Array(J_MAX + 1)

/**
 * Dimensionless Helmholtz free energy of region 3 and scaled derivatives into `out`:
 * [phi, delta*phi_delta, delta^2*phi_deltadelta, tau*phi_tau, tau^2*phi_tautau,
 *  delta*tau*phi_deltatau]. rho in kg/m^3, T in K.
 */
export const r3 = new Float64Array(6)
export function region3Phi(rho: number, T: number, out: Float64Array = r3): Float64Array {
  const delta = rho / RHOC
  const tau = TC / T
  dPow[0] = 1
  for (let k = 1; k <= I_MAX; k++) dPow[k] = dPow[k - 1]! * delta
  tPow[0] = 1
  for (let k = 1; k <= J_MAX; k++) tPow[k] = tPow[k - 1]! * tau
  let f = REGION3_N1 * Math.log(delta)
  let fd = REGION3_N1
  let fdd = -REGION3_N1
  let ft = 0
  let ftt = 0
  let fdt = 0
  for (let k = 0; k < N; k++) {
    const t = REGION3_N[k]! * dPow[I[k]!]! * tPow[J[k]!]!
    f += t
    fd += CI[k]! * t
    fdd += CII[k]! * t
    ft += CJ[k]! * t
    ftt += CJJ[k]! * t
    fdt += CIJ[k]! * t
  }
  out[0] = f
  out[1] = fd
  out[2] = fdd
  out[3] = ft
  out[4] = ftt
  out[5] = fdt
  return out
}

/** Pressure (MPa) of region 3 at (rho kg/m^3, T K), Table 31. */
export function region3Pressure(rho: number, T: number): number {
  const d = region3Phi(rho, T, r3)
  return (rho * R * T * d[1]!) / 1000
}

/** All properties of region 3 from (rho kg/m^3, T K), Table 31. No range check here. */
export function region3(rho: number, T: number): If97Props {
  const d = region3Phi(rho, T, r3)
  const f = d[0]!
  const dfd = d[1]!
  const d2fdd = d[2]!
  const tft = d[3]!
  const t2ftt = d[4]!
  const dtfdt = d[5]!
  const RT = R * T
  const x = dfd - dtfdt
  const y = 2 * dfd + d2fdd
  return {
    region: 3,
    p: (rho * RT * dfd) / 1000,
    T,
    v: 1 / rho,
    rho,
    h: RT * (tft + dfd),
    u: RT * tft,
    s: R * (tft - f),
    cp: R * (-t2ftt + (x * x) / y),
    cv: -R * t2ftt,
    w: Math.sqrt(RT * 1000 * (y - (x * x) / t2ftt)),
  }
}

// --- rho(p, T) ------------------------------------------------------------------------------

let fVal = 0
let dVal = 0
/** Sets fVal = p(rho,T) - pTarget (MPa) and dVal = dp/drho (MPa m^3/kg). */
function evalF(rho: number, T: number, pTarget: number): void {
  const d = region3Phi(rho, T, r3)
  const RT = R * T
  fVal = (rho * RT * d[1]!) / 1000 - pTarget
  dVal = (RT * (2 * d[1]! + d[2]!)) / 1000
}

const REL_TOL = 1e-14
const MAX_ITER = 200

/** Newton/bisection hybrid inside a bracket with f(lo) < 0 < f(hi); returns NaN on failure. */
function bracketed(lo: number, hi: number, T: number, p: number): number {
  let x = 0.5 * (lo + hi)
  for (let it = 0; it < MAX_ITER; it++) {
    evalF(x, T, p)
    if (fVal === 0) return x
    if (fVal < 0) lo = x
    else hi = x
    let xn = dVal > 0 ? x - fVal / dVal : NaN
    if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi)
    if (Math.abs(xn - x) <= REL_TOL * x || hi - lo <= REL_TOL * x) return xn
    x = xn
  }
  return NaN
}

/** Monotone Newton from one side; falls back to `bracketed` on an overshoot. */
function fromSide(x: number, T: number, p: number, fromBelow: boolean): number {
  evalF(x, T, p)
  for (let it = 0; it < MAX_ITER; it++) {
    if (fVal === 0) return x
    if (!(dVal > 0)) return NaN
    const xn = x - fVal / dVal
    if (!(xn > 0)) return NaN
    evalF(xn, T, p)
    const overshoot = fromBelow ? fVal > 0 : fVal < 0
    if (overshoot) return fromBelow ? bracketed(x, xn, T, p) : bracketed(xn, x, T, p)
    if (Math.abs(xn - x) <= REL_TOL * x) return xn
    x = xn
  }
  return NaN
}

/**
 * Fallback when Newton cannot proceed (dp/drho <= 0, which happens only at or extremely near
 * the critical point): scan from the chosen side in 0.5 kg/m^3 steps to the first sign change
 * of p - p_target, then bisect. The first crossing seen from a side is on that side's branch.
 */
function scan(T: number, p: number, fromBelow: boolean, start: number): number {
  const step = fromBelow ? 0.5 : -0.5
  let a = start
  evalF(a, T, p)
  let fa = fVal
  for (let k = 0; k < 4000; k++) {
    const b = a + step
    if (!(b > 0)) return NaN
    evalF(b, T, p)
    const fb = fVal
    if (fb === 0) return b
    if ((fa < 0 && fb > 0) || (fa > 0 && fb < 0)) {
      let lo = fa < 0 ? a : b
      let hi = fa < 0 ? b : a
      for (let it = 0; it < 200 && Math.abs(hi - lo) > REL_TOL * lo; it++) {
        const m = 0.5 * (lo + hi)
        evalF(m, T, p)
        if (fVal === 0) return m
        if (fVal < 0) lo = m
        else hi = m
      }
      return 0.5 * (lo + hi)
    }
    a = b
    fa = fb
  }
  return NaN
}

/**
 * Density (kg/m^3) of region 3 at (p MPa, T K). `liquidSide` selects the branch below the
 * critical temperature (true: p >= p_s(T), liquid-like; false: vapour-like); above T_c it is
 * ignored. Returns NaN if no root is found (not expected inside region 3).
 */
export function region3Density(p: number, T: number, liquidSide: boolean): number {
  const rho = newtonDensity(p, T, liquidSide)
  if (rho > 0) return rho
  const rhoIdeal = (p * 1000) / (R * T)
  return T < TC && !liquidSide ? scan(T, p, true, rhoIdeal) : scan(T, p, false, 800)
}

function newtonDensity(p: number, T: number, liquidSide: boolean): number {
  const rhoIdeal = (p * 1000) / (R * T)
  if (T < TC && !liquidSide) return fromSide(rhoIdeal, T, p, true)
  // A density above the liquid-side root: start at 800 kg/m^3 (region 3 never exceeds about
  // 762 kg/m^3) and move up if needed.
  let hi = 800
  evalF(hi, T, p)
  while (fVal <= 0 && hi < 1400) {
    hi += 100
    evalF(hi, T, p)
  }
  if (!(fVal > 0)) return NaN
  if (T < TC) return fromSide(hi, T, p, false)
  evalF(rhoIdeal, T, p)
  if (!(fVal < 0)) return fromSide(hi, T, p, false)
  return bracketed(rhoIdeal, hi, T, p)
}
