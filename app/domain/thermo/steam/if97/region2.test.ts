// Region 2 against the release's computer-program verification values.
// Source: IAPWS R7-97(2012), Table 15 (region 2, Eq. (15)): 9 significant digits, compared to a
// relative error of 1e-8. (Typed from the editor's memory of the release.)
import { describe, expect, test } from 'vitest'
import { region2 } from './region2.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('IAPWS-IF97 region 2, Table 15', () => {
  // [T K, p MPa, v, h, u, s, cp, w] — Table 15
  test.each([
    [300, 0.0035, 0.394913866e2, 0.254991145e4, 0.24116916e4, 0.852238967e1, 0.191300162e1, 0.427920172e3],
    [700, 0.0035, 0.923015898e2, 0.333568375e4, 0.301262819e4, 0.101749996e2, 0.208141274e1, 0.644289068e3],
    [700, 30, 0.542946619e-2, 0.263149474e4, 0.246861076e4, 0.517540298e1, 0.103505092e2, 0.480386523e3],
  ])('T = %d K, p = %d MPa (IAPWS R7-97(2012) Table 15)', (T, p, v, h, u, s, cp, w) => {
    const r = region2(p, T)
    expect(rel(r.v, v)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.h, h)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.u, u)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.s, s)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.cp, cp)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.w, w)).toBeLessThanOrEqual(1e-8)
  })
})
