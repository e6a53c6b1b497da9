// Boundary between regions 2 and 3 (the B23 equation).
// Source: IAPWS R7-97(2012), Section 4, Eqs. (5) and (6), coefficients Table 1.
// Valid for 623.15 K <= T <= 863.15 K, 16.5292 MPa <= p <= 100 MPa.
import { B23_N } from './coefficients.ts'

const n1 = B23_N[0]!
const n2 = B23_N[1]!
const n3 = B23_N[2]!
const n4 = B23_N[3]!
const n5 = B23_N[4]!

/** p_B23(T) in MPa, Eq. (5); T in K. */
export function pB23(T: number): number {
  return n1 + n2 * T + n3 * T * T
}

/** T_B23(p) in K, Eq. (6); p in MPa. */
export function tB23(p: number): number {
  return n4 + Math.sqrt((p - n5) / n3)
}
