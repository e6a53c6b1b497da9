// Region 2 (vapour, and supercritical above the B23 line): basic equation g(p,T).
// Source: IAPWS R7-97(2012), Section 6.1, Eq. (15) = ideal-gas part Eq. (16) (Table 10) +
// residual part Eq. (17) (Table 11); property relations Table 12, derivatives Tables 13, 14.
// Reducing quantities p* = 1 MPa, T* = 540 K.
import { REGION2_IDEAL_J, REGION2_IDEAL_N, REGION2_RES_I, REGION2_RES_J, REGION2_RES_N } from './coefficients.ts'
import { R } from './constants.ts'
import type { If97Props } from './types.ts'

const N0 = REGION2_IDEAL_N.length
const J0 = Int32Array.from(REGION2_IDEAL_J)
const C0J = Float64Array.from(REGION2_IDEAL_J)
const C0JJ = Float64Array.from(REGION2_IDEAL_J, (j) => j * (j - 1))
const J0_MIN = Math.min(...REGION2_IDEAL_J)
const J0_MAX = Math.max(...REGION2_IDEAL_J)
const J0_OFF = -J0_MIN
const tPow = new Float64Array(J0_MAX - J0_MIN + 1)

const NR = REGION2_RES_N.length
const IR = Int32Array.from(REGION2_RES_I)
const JR = Int32Array.from(REGION2_RES_J)
const CI = Float64Array.from(REGION2_RES_I)
const CJ = Float64Array.from(REGION2_RES_J)
const CII = Float64Array.from(REGION2_RES_I, (i) => i * (i - 1))
const CJJ = Float64Array.from(REGION2_RES_J, (j) => j * (j - 1))
const CIJ = Float64Array.from(REGION2_RES_I, (i, k) => i * REGION2_RES_J[k]!)
const IR_MAX = Math.max(...REGION2_RES_I)
const JR_MAX = Math.max(...REGION2_RES_J)
const piPow = new Float64Array(IR_MAX + 1)
const bPow = new Float64Array(JR_MAX + 1)

/** Ideal-gas part (without the ln(pi) term) into out: [g0 - ln pi, g0_tau, g0_tautau]. */
function ideal(tau: number, out: Float64Array): void {
  tPow[J0_OFF] = 1
  for (let k = 1; k <= J0_MAX; k++) tPow[J0_OFF + k] = tPow[J0_OFF + k - 1]! * tau
  const it = 1 / tau
  for (let k = 1; k <= J0_OFF; k++) tPow[J0_OFF - k] = tPow[J0_OFF - k + 1]! * it
  let g = 0
  let gt = 0
  let gtt = 0
  for (let k = 0; k < N0; k++) {
    const t = REGION2_IDEAL_N[k]! * tPow[J0[k]! + J0_OFF]!
    g += t
    gt += C0J[k]! * t
    gtt += C0JJ[k]! * t
  }
  out[0] = g
  out[1] = gt * it
  out[2] = gtt * it * it
}

function powers(pi: number, b: number): void {
  piPow[0] = 1
  for (let k = 1; k <= IR_MAX; k++) piPow[k] = piPow[k - 1]! * pi
  bPow[0] = 1
  for (let k = 1; k <= JR_MAX; k++) bPow[k] = bPow[k - 1]! * b
}

/**
 * Residual part of region 2 and its derivatives into `out`:
 * [gr, gr_pi, gr_pipi, gr_tau, gr_tautau, gr_pitau]. p in MPa, T in K.
 */
export function region2Residual(p: number, T: number, out: Float64Array): Float64Array {
  const pi = p
  const b = 540 / T - 0.5
  powers(pi, b)
  let g = 0
  let gp = 0
  let gpp = 0
  let gt = 0
  let gtt = 0
  let gpt = 0
  for (let k = 0; k < NR; k++) {
    const t = REGION2_RES_N[k]! * piPow[IR[k]!]! * bPow[JR[k]!]!
    g += t
    gp += CI[k]! * t
    gpp += CII[k]! * t
    gt += CJ[k]! * t
    gtt += CJJ[k]! * t
    gpt += CIJ[k]! * t
  }
  const ip = 1 / pi
  const ib = 1 / b
  out[0] = g
  out[1] = gp * ip
  out[2] = gpp * ip * ip
  out[3] = gt * ib
  out[4] = gtt * ib * ib
  out[5] = gpt * ip * ib
  return out
}

const id = new Float64Array(3)
const rs = new Float64Array(6)

/** h (kJ/kg) into out[0] and s (kJ/(kg K)) into out[1]; p in MPa, T in K. No range check. */
export function region2HS(p: number, T: number, out: Float64Array): void {
  const tau = 540 / T
  ideal(tau, id)
  const b = tau - 0.5
  powers(p, b)
  let g = 0
  let gt = 0
  for (let k = 0; k < NR; k++) {
    const t = REGION2_RES_N[k]! * piPow[IR[k]!]! * bPow[JR[k]!]!
    g += t
    gt += CJ[k]! * t
  }
  gt /= b
  const gTau = id[1]! + gt
  out[0] = R * T * tau * gTau
  out[1] = R * (tau * gTau - (Math.log(p) + id[0]! + g))
}

/** All properties of region 2 from (p MPa, T K), Table 12. No range check here. */
export function region2(p: number, T: number): If97Props {
  const pi = p
  const tau = 540 / T
  ideal(tau, id)
  region2Residual(p, T, rs)
  const g0 = Math.log(pi) + id[0]!
  const g0t = id[1]!
  const g0tt = id[2]!
  const gr = rs[0]!
  const grp = rs[1]!
  const grpp = rs[2]!
  const grt = rs[3]!
  const grtt = rs[4]!
  const grpt = rs[5]!
  const RT = R * T
  const piGp = 1 + pi * grp // pi (g0_pi + gr_pi), with pi g0_pi = 1
  const v = (RT * piGp) / p / 1000
  const x = 1 + pi * grp - tau * pi * grpt
  const ttt = tau * tau * (g0tt + grtt)
  return {
    region: 2,
    p,
    T,
    v,
    rho: 1 / v,
    h: RT * tau * (g0t + grt),
    u: RT * (tau * (g0t + grt) - piGp),
    s: R * (tau * (g0t + grt) - (g0 + gr)),
    cp: -R * ttt,
    cv: R * (-ttt - (x * x) / (1 - pi * pi * grpp)),
    w: Math.sqrt((RT * 1000 * (1 + 2 * pi * grp + pi * pi * grp * grp)) / (1 - pi * pi * grpp + (x * x) / ttt)),
  }
}
