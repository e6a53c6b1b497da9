// Region 5 (high-temperature steam, 1073.15 K < T <= 2273.15 K, p <= 50 MPa): basic equation
// g(p,T). Source: IAPWS R7-97(2012), Section 7 ("Basic equation for region 5"), Eq. (32) =
// ideal-gas part Eq. (33) (Table 37) + residual part Eq. (34) (Table 38); property relations
// as Table 12 (the same relations as region 2, Table 39 in the release), derivatives Tables
// 40, 41. Reducing quantities p* = 1 MPa, T* = 1000 K.
import { REGION5_IDEAL_J, REGION5_IDEAL_N, REGION5_RES_I, REGION5_RES_J, REGION5_RES_N } from './coefficients.ts'
import { R } from './constants.ts'
import type { If97Props } from './types.ts'

const N0 = REGION5_IDEAL_N.length
const NR = REGION5_RES_N.length

/** [g0 - ln pi, g0_tau, g0_tautau] of Eq. (33) at tau = 1000 K / T. */
function ideal(tau: number, out: Float64Array): void {
  let g = 0
  let gt = 0
  let gtt = 0
  for (let k = 0; k < N0; k++) {
    const j = REGION5_IDEAL_J[k]!
    const n = REGION5_IDEAL_N[k]!
    g += n * Math.pow(tau, j)
    gt += n * j * Math.pow(tau, j - 1)
    gtt += n * j * (j - 1) * Math.pow(tau, j - 2)
  }
  out[0] = g
  out[1] = gt
  out[2] = gtt
}

/** [gr, gr_pi, gr_pipi, gr_tau, gr_tautau, gr_pitau] of Eq. (34). */
function residual(pi: number, tau: number, out: Float64Array): void {
  let g = 0
  let gp = 0
  let gpp = 0
  let gt = 0
  let gtt = 0
  let gpt = 0
  for (let k = 0; k < NR; k++) {
    const i = REGION5_RES_I[k]!
    const j = REGION5_RES_J[k]!
    const n = REGION5_RES_N[k]!
    const pI = Math.pow(pi, i)
    const tJ = Math.pow(tau, j)
    g += n * pI * tJ
    gp += n * i * Math.pow(pi, i - 1) * tJ
    gpp += n * i * (i - 1) * Math.pow(pi, i - 2) * tJ
    gt += n * j * pI * Math.pow(tau, j - 1)
    gtt += n * j * (j - 1) * pI * Math.pow(tau, j - 2)
    gpt += n * i * j * Math.pow(pi, i - 1) * Math.pow(tau, j - 1)
  }
  out[0] = g
  out[1] = gp
  out[2] = gpp
  out[3] = gt
  out[4] = gtt
  out[5] = gpt
}

const id = new Float64Array(3)
const rs = new Float64Array(6)

/** h (kJ/kg) into out[0] and s (kJ/(kg K)) into out[1]; p in MPa, T in K. No range check. */
export function region5HS(p: number, T: number, out: Float64Array): void {
  const tau = 1000 / T
  ideal(tau, id)
  residual(p, tau, rs)
  const gTau = id[1]! + rs[3]!
  out[0] = R * T * tau * gTau
  out[1] = R * (tau * gTau - (Math.log(p) + id[0]! + rs[0]!))
}

/** All properties of region 5 from (p MPa, T K). No range check here. */
export function region5(p: number, T: number): If97Props {
  const pi = p
  const tau = 1000 / T
  ideal(tau, id)
  residual(pi, tau, rs)
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
    region: 5,
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
