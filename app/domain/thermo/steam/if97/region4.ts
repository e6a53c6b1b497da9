// Region 4: the saturation line.
// Source: IAPWS R7-97(2012), Section 8: saturation-pressure equation Eq. (30) and
// saturation-temperature equation Eq. (31) from the quadratic Eq. (29); coefficients Table 34.
// Valid from the triple point (273.15 K, 611.213 Pa) to the critical point (647.096 K, 22.064 MPa).
import { REGION4_N } from './coefficients.ts'

const n1 = REGION4_N[0]!
const n2 = REGION4_N[1]!
const n3 = REGION4_N[2]!
const n4 = REGION4_N[3]!
const n5 = REGION4_N[4]!
const n6 = REGION4_N[5]!
const n7 = REGION4_N[6]!
const n8 = REGION4_N[7]!
const n9 = REGION4_N[8]!
const n10 = REGION4_N[9]!

/** Saturation pressure p_s(T) in MPa for T in K, Eq. (30). No range check here. */
export function pSat(T: number): number {
  const th = T + n9 / (T - n10)
  const A = th * th + n1 * th + n2
  const B = n3 * th * th + n4 * th + n5
  const C = n6 * th * th + n7 * th + n8
  const r = (2 * C) / (-B + Math.sqrt(B * B - 4 * A * C))
  const r2 = r * r
  return r2 * r2
}

/** Saturation temperature T_s(p) in K for p in MPa, Eq. (31). No range check here. */
export function tSat(p: number): number {
  const beta = Math.sqrt(Math.sqrt(p))
  const E = beta * beta + n3 * beta + n6
  const F = n1 * beta * beta + n4 * beta + n7
  const G = n2 * beta * beta + n5 * beta + n8
  const D = (2 * G) / (-F - Math.sqrt(F * F - 4 * E * G))
  const a = n10 + D
  return (a - Math.sqrt(a * a - 4 * (n9 + n10 * D))) / 2
}

/** p_s(273.15 K) in MPa: the lowest saturation pressure of the formulation. */
export const P_SAT_MIN = pSat(273.15)
/** p_s(623.15 K) in MPa: where the saturation line meets region 3. */
export const P_SAT_623 = pSat(623.15)
