// Region 4 (saturation line) and the B23 boundary against the release's verification values.
// Source: IAPWS R7-97(2012), Table 35 (p_s(T), Eq. (30)), Table 36 (T_s(p), Eq. (31)), and the
// B23 check values of Section 4 (T = 0.62315e3 K <-> p = 0.165291643e2 MPa), 9 significant
// digits, relative error 1e-8. (Typed from the editor's memory of the release.)
import { describe, expect, test } from 'vitest'
import { pB23, tB23 } from './b23.ts'
import { pSat, tSat } from './region4.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('IAPWS-IF97 region 4', () => {
  test.each([
    [300, 0.353658941e-2],
    [500, 0.263889776e1],
    [600, 0.123443146e2],
  ])('p_s(%d K) (IAPWS R7-97(2012) Table 35)', (T, p) => {
    expect(rel(pSat(T), p)).toBeLessThanOrEqual(1e-8)
  })

  test.each([
    [0.1, 0.372755919e3],
    [1, 0.453035632e3],
    [10, 0.584149488e3],
  ])('T_s(%d MPa) (IAPWS R7-97(2012) Table 36)', (p, T) => {
    expect(rel(tSat(p), T)).toBeLessThanOrEqual(1e-8)
  })

  test('Eqs. (30) and (31) invert each other (closed form: both solve the quadratic Eq. (29))', () => {
    for (let T = 273.15; T <= 647.09; T += 7.3) expect(rel(tSat(pSat(T)), T)).toBeLessThan(1e-12)
  })
})

describe('IAPWS-IF97 B23 boundary, Section 4 check values', () => {
  test('p_B23(623.15 K) = 0.165291643e2 MPa (IAPWS R7-97(2012) Section 4)', () => {
    expect(rel(pB23(623.15), 0.165291643e2)).toBeLessThanOrEqual(1e-8)
  })
  test('T_B23(16.5291643 MPa) = 0.62315e3 K (IAPWS R7-97(2012) Section 4)', () => {
    expect(rel(tB23(0.165291643e2), 0.62315e3)).toBeLessThanOrEqual(1e-8)
  })
})
