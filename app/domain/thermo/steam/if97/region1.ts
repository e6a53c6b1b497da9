// Region 1 (compressed liquid): basic equation g(p,T).
// Source: IAPWS R7-97(2012), Section 5.1, Eq. (7), coefficients Table 2, property relations
// Table 3, derivatives Table 4. Reducing quantities p* = 16.53 MPa, T* = 1386 K.
//
// Speed: all 34 terms are evaluated with precomputed power tables (no Math.pow, no allocation);
// every derivative is formed from the same term t_i = n_i (7.1 - pi)^I_i (tau - 1.222)^J_i.
import { REGION1_I, REGION1_J, REGION1_N } from './coefficients.ts'
import { R } from './constants.ts'
import type { If97Props } from './types.ts'

const N = REGION1_N.length
const I = Int32Array.from(REGION1_I)
const J = Int32Array.from(REGION1_J)
const CI = Float64Array.from(REGION1_I)
const CJ = Float64Array.from(REGION1_J)
const CII = Float64Array.from(REGION1_I, (i) => i * (i - 1))
const CJJ = Float64Array.from(REGION1_J, (j) => j * (j - 1))
const CIJ = Float64Array.from(REGION1_I, (i, k) => i * REGION1_J[k]!)
const I_MAX = Math.max(...REGION1_I)
const J_MIN = Math.min(...REGION1_J)
const J_MAX = Math.max(...REGION1_J)
const J_OFF = -J_MIN

const aPow = new Float64Array(I_MAX + 1)
const bPow = new Float64Array(J_MAX - J_MIN + 1)

/**
 * Dimensionless Gibbs free energy of region 1 and its derivatives, written into `out`:
 * [gamma, gamma_pi, gamma_pipi, gamma_tau, gamma_tautau, gamma_pitau]. p in MPa, T in K.
 */
export const r1 = new Float64Array(6)
export function region1Gamma(p: number, T: number, out: Float64Array = r1): Float64Array {
  const a = 7.1 - p / 16.53
  const b = 1386 / T - 1.222
  aPow[0] = 1
  for (let k = 1; k <= I_MAX; k++) aPow[k] = aPow[k - 1]! * a
  bPow[J_OFF] = 1
  for (let k = 1; k <= J_MAX; k++) bPow[J_OFF + k] = bPow[J_OFF + k - 1]! * b
  const ib = 1 / b
  for (let k = 1; k <= J_OFF; k++) bPow[J_OFF - k] = bPow[J_OFF - k + 1]! * ib
  let g = 0
  let gp = 0
  let gpp = 0
  let gt = 0
  let gtt = 0
  let gpt = 0
  for (let k = 0; k < N; k++) {
    const t = REGION1_N[k]! * aPow[I[k]!]! * bPow[J[k]! + J_OFF]!
    g += t
    gp += CI[k]! * t
    gpp += CII[k]! * t
    gt += CJ[k]! * t
    gtt += CJJ[k]! * t
    gpt += CIJ[k]! * t
  }
  const ia = 1 / a
  out[0] = g
  out[1] = -gp * ia
  out[2] = gpp * ia * ia
  out[3] = gt * ib
  out[4] = gtt * ib * ib
  out[5] = -gpt * ia * ib
  return out
}

/** Only gamma and gamma_tau (enough for h and s), p in MPa, T in K; into out[0], out[3]. */
function region1GammaHS(p: number, T: number, out: Float64Array): void {
  const a = 7.1 - p / 16.53
  const b = 1386 / T - 1.222
  aPow[0] = 1
  for (let k = 1; k <= I_MAX; k++) aPow[k] = aPow[k - 1]! * a
  bPow[J_OFF] = 1
  for (let k = 1; k <= J_MAX; k++) bPow[J_OFF + k] = bPow[J_OFF + k - 1]! * b
  const ib = 1 / b
  for (let k = 1; k <= J_OFF; k++) bPow[J_OFF - k] = bPow[J_OFF - k + 1]! * ib
  let g = 0
  let gt = 0
  for (let k = 0; k < N; k++) {
    const t = REGION1_N[k]! * aPow[I[k]!]! * bPow[J[k]! + J_OFF]!
    g += t
    gt += CJ[k]! * t
  }
  out[0] = g
  out[3] = gt * ib
}

const hsScratch = new Float64Array(6)
/** h (kJ/kg) into out[0] and s (kJ/(kg K)) into out[1]; p in MPa, T in K. No range check. */
export function region1HS(p: number, T: number, out: Float64Array): void {
  region1GammaHS(p, T, hsScratch)
  const tau = 1386 / T
  out[0] = R * T * tau * hsScratch[3]!
  out[1] = R * (tau * hsScratch[3]! - hsScratch[0]!)
}

/** All properties of region 1 from (p MPa, T K), Table 3. No range check here. */
export function region1(p: number, T: number): If97Props {
  const d = region1Gamma(p, T, r1)
  const pi = p / 16.53
  const tau = 1386 / T
  const g = d[0]!
  const gp = d[1]!
  const gpp = d[2]!
  const gt = d[3]!
  const gtt = d[4]!
  const gpt = d[5]!
  const RT = R * T
  const v = (RT * pi * gp) / p / 1000
  const x = gp - tau * gpt
  return {
    region: 1,
    p,
    T,
    v,
    rho: 1 / v,
    h: RT * tau * gt,
    u: RT * (tau * gt - pi * gp),
    s: R * (tau * gt - g),
    cp: -R * tau * tau * gtt,
    cv: R * (-tau * tau * gtt + (x * x) / gpp),
    w: Math.sqrt((RT * 1000 * gp * gp) / ((x * x) / (tau * tau * gtt) - gpp)),
  }
}
