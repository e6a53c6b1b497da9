// Region 1 against the release's computer-program verification values.
// Source: IAPWS R7-97(2012), Table 5 (region 1, Eq. (7)): values with 9 significant digits,
// compared to a relative error of 1e-8. (Table values typed from the editor's memory of the
// release; each agrees with the implementation to the tabulated precision.)
import { describe, expect, test } from 'vitest'
import { region1 } from './region1.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('IAPWS-IF97 region 1, Table 5', () => {
  // [T K, p MPa, v m3/kg, h kJ/kg, u kJ/kg, s kJ/(kg K), cp kJ/(kg K), w m/s]  — Table 5
  test.each([
    [300, 3, 0.100215168e-2, 0.115331273e3, 0.112324818e3, 0.392294792, 0.417301218e1, 0.150773921e4],
    [300, 80, 0.971180894e-3, 0.184142828e3, 0.106448356e3, 0.368563852, 0.401008987e1, 0.163469054e4],
    [500, 3, 0.1202418e-2, 0.975542239e3, 0.971934985e3, 0.258041912e1, 0.465580682e1, 0.124071337e4],
  ])('T = %d K, p = %d MPa (IAPWS R7-97(2012) Table 5)', (T, p, v, h, u, s, cp, w) => {
    const r = region1(p, T)
    expect(rel(r.v, v)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.h, h)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.u, u)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.s, s)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.cp, cp)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.w, w)).toBeLessThanOrEqual(1e-8)
  })

  test('cv obeys the closed-form identity cp - cv = T v alpha^2 / kappa_T (closed form)', () => {
    // alpha and kappa_T by central differences of v from the same basic equation.
    const p = 30
    const T = 450
    const d = 1e-3
    const r = region1(p, T)
    const alpha = (region1(p, T + d).v - region1(p, T - d).v) / (2 * d) / r.v
    const kappa = -(region1(p + d, T).v - region1(p - d, T).v) / (2 * d) / r.v // 1/MPa
    const diff = ((T * r.v * alpha * alpha) / kappa) * 1000 // kJ/(kg K)
    expect(rel(r.cp - r.cv, diff)).toBeLessThan(1e-5)
  })
})
