// Backward equations T(p,h) and T(p,s) for regions 1 and 2, and the B2bc boundary.
// Source: IAPWS R7-97(2012):
//  - region 1: T(p,h) Eq. (11), Table 6; T(p,s) Eq. (13), Table 8 (Section 5.2);
//  - region 2: subregion boundaries (Section 6.3.1): 2a for p <= 4 MPa; 2b/2c split by the
//    B2bc equation Eqs. (20)/(21), Table 19, for T(p,h), and by s = 5.85 kJ/(kg K) for T(p,s);
//    T(p,h) Eqs. (22)-(24), Tables 20-22; T(p,s) Eqs. (25)-(27), Tables 25-27.
// These return the release's backward-equation value (consistent with the basic equations
// within the release's tolerances, e.g. |dT| <= 25 mK in region 1, 10 mK in region 2). The
// public functions in ../properties.ts polish them to the basic equation by iteration.
// Units: p in MPa, h in kJ/kg, s in kJ/(kg K), T in K.
import {
  B2BC_N,
  BACKWARD1_TPH_I,
  BACKWARD1_TPH_J,
  BACKWARD1_TPH_N,
  BACKWARD1_TPS_I,
  BACKWARD1_TPS_J,
  BACKWARD1_TPS_N,
  BACKWARD2A_TPH_I,
  BACKWARD2A_TPH_J,
  BACKWARD2A_TPH_N,
  BACKWARD2A_TPS_I,
  BACKWARD2A_TPS_J,
  BACKWARD2A_TPS_N,
  BACKWARD2B_TPH_I,
  BACKWARD2B_TPH_J,
  BACKWARD2B_TPH_N,
  BACKWARD2B_TPS_I,
  BACKWARD2B_TPS_J,
  BACKWARD2B_TPS_N,
  BACKWARD2C_TPH_I,
  BACKWARD2C_TPH_J,
  BACKWARD2C_TPH_N,
  BACKWARD2C_TPS_I,
  BACKWARD2C_TPS_J,
  BACKWARD2C_TPS_N,
} from './coefficients.ts'

/** sum_i n_i a^I_i b^J_i (generic, Math.pow; used for the backward equations only). */
function series(I: readonly number[], J: readonly number[], n: Float64Array, a: number, b: number): number {
  let sum = 0
  for (let k = 0; k < n.length; k++) sum += n[k]! * Math.pow(a, I[k]!) * Math.pow(b, J[k]!)
  return sum
}

/** Region 1 T(p,h), Eq. (11): p* = 1 MPa, h* = 2500 kJ/kg, T* = 1 K. */
export function t1ph(p: number, h: number): number {
  return series(BACKWARD1_TPH_I, BACKWARD1_TPH_J, BACKWARD1_TPH_N, p, h / 2500 + 1)
}

/** Region 1 T(p,s), Eq. (13): p* = 1 MPa, s* = 1 kJ/(kg K), T* = 1 K. */
export function t1ps(p: number, s: number): number {
  return series(BACKWARD1_TPS_I, BACKWARD1_TPS_J, BACKWARD1_TPS_N, p, s + 2)
}

/** B2bc boundary p(h) in MPa, Eq. (20). */
export function pB2bc(h: number): number {
  return B2BC_N[0]! + B2BC_N[1]! * h + B2BC_N[2]! * h * h
}

/** B2bc boundary h(p) in kJ/kg, Eq. (21). */
export function hB2bc(p: number): number {
  return B2BC_N[3]! + Math.sqrt((p - B2BC_N[4]!) / B2BC_N[2]!)
}

export type Subregion2 = '2a' | '2b' | '2c'

/** Subregion of region 2 for T(p,h) (Section 6.3.1). */
export function subregion2ph(p: number, h: number): Subregion2 {
  if (p <= 4) return '2a'
  // Below 6.546699678 MPa the B2bc line is not defined (h_2bc > h'' there): all 2b.
  if (p < 6.546699678) return '2b'
  return h >= hB2bc(p) ? '2b' : '2c'
}

/** Subregion of region 2 for T(p,s) (Section 6.3.2). */
export function subregion2ps(p: number, s: number): Subregion2 {
  if (p <= 4) return '2a'
  return s >= 5.85 ? '2b' : '2c'
}

/** Region 2 T(p,h), Eqs. (22)-(24): h* = 2000 kJ/kg. */
export function t2ph(p: number, h: number, sub: Subregion2 = subregion2ph(p, h)): number {
  const eta = h / 2000
  if (sub === '2a') return series(BACKWARD2A_TPH_I, BACKWARD2A_TPH_J, BACKWARD2A_TPH_N, p, eta - 2.1)
  if (sub === '2b') return series(BACKWARD2B_TPH_I, BACKWARD2B_TPH_J, BACKWARD2B_TPH_N, p - 2, eta - 2.6)
  return series(BACKWARD2C_TPH_I, BACKWARD2C_TPH_J, BACKWARD2C_TPH_N, p + 25, eta - 1.8)
}

/** Region 2 T(p,s), Eqs. (25)-(27): s* = 2, 0.7853, 2.9251 kJ/(kg K) for 2a, 2b, 2c. */
export function t2ps(p: number, s: number, sub: Subregion2 = subregion2ps(p, s)): number {
  if (sub === '2a') return series(BACKWARD2A_TPS_I, BACKWARD2A_TPS_J, BACKWARD2A_TPS_N, p, s / 2 - 2)
  if (sub === '2b') return series(BACKWARD2B_TPS_I, BACKWARD2B_TPS_J, BACKWARD2B_TPS_N, p, 10 - s / 0.7853)
  return series(BACKWARD2C_TPS_I, BACKWARD2C_TPS_J, BACKWARD2C_TPS_N, p, 2 - s / 2.9251)
}
