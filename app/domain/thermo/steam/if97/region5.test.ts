// Region 5 against the release's computer-program verification values.
// Source: IAPWS R7-97(2012), Table 42 (region 5, Eq. (32)): 9 significant digits, compared to
// a relative error of 1e-8. (Typed from the editor's memory of the release; python3-iapws's
// _Region5 docstring carries the same numbers.)
import { describe, expect, test } from 'vitest'
import { region5, region5HS } from './region5.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('IAPWS-IF97 region 5, Table 42', () => {
  // [T K, p MPa, v, h, u, s, cp, w] — Table 42
  test.each([
    [1500, 0.5, 0.13845509e1, 0.521976855e4, 0.45274931e4, 0.965408875e1, 0.261609445e1, 0.91706869e3],
    [1500, 30, 0.230761299e-1, 0.516723514e4, 0.447495124e4, 0.772970133e1, 0.272724317e1, 0.928548002e3],
    [2000, 30, 0.311385219e-1, 0.657122604e4, 0.563707038e4, 0.853640523e1, 0.288569882e1, 0.106736948e4],
  ])('T = %d K, p = %d MPa (IAPWS R7-97(2012) Table 42)', (T, p, v, h, u, s, cp, w) => {
    const r = region5(p, T)
    expect(r.region).toBe(5)
    expect(rel(r.v, v)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.h, h)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.u, u)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.s, s)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.cp, cp)).toBeLessThanOrEqual(1e-8)
    expect(rel(r.w, w)).toBeLessThanOrEqual(1e-8)
  })

  test('the fast h, s path equals the full equation (closed form: same sums)', () => {
    const out = new Float64Array(2)
    for (const [p, T] of [
      [0.5, 1500],
      [30, 2000],
      [50, 1073.2],
      [0.001, 2273.15],
    ] as const) {
      region5HS(p, T, out)
      const r = region5(p, T)
      expect(rel(out[0]!, r.h)).toBeLessThan(1e-14)
      expect(rel(out[1]!, r.s)).toBeLessThan(1e-14)
    }
  })

  test('cv from the closed-form identity cp - cv = T v alpha^2 / kappa_T (closed form)', () => {
    const p = 20
    const T = 1600
    const d = 1e-3
    const r = region5(p, T)
    const alpha = (region5(p, T + d).v - region5(p, T - d).v) / (2 * d) / r.v
    const kappa = -(region5(p + d, T).v - region5(p - d, T).v) / (2 * d) / r.v
    expect(rel(r.cp - r.cv, ((T * r.v * alpha * alpha) / kappa) * 1000)).toBeLessThan(1e-5)
  })
})
