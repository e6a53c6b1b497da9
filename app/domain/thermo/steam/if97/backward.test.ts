// Backward equations against the release's check values and its consistency tolerances.
// Source: IAPWS R7-97(2012): Table 7 (T(p,h) region 1), Table 9 (T(p,s) region 1), Table 24
// (T(p,h) subregions 2a, 2b, 2c), Table 29 (T(p,s) subregions 2a, 2b, 2c), and the B2bc check
// value of Eqs. (20)/(21) (h = 0.3516004323e4 kJ/kg <-> p = 0.100000000e3 MPa). 9 significant
// digits, relative error 1e-8. The tolerated numerical inconsistencies of the backward
// equations with the basic equations are as the release states them: |dT|_tol = 25 mK in
// region 1 (confirmed in the release's Eq. (12) text); in region 2, 10 mK where
// s >= 5.85 kJ/(kg K) and 25 mK where s < 5.85 kJ/(kg K) (from the editor's memory).
// Check-table values typed from memory of the release.
import { describe, expect, test } from 'vitest'
import { hB2bc, pB2bc, subregion2ph, subregion2ps, t1ph, t1ps, t2ph, t2ps } from './backward.ts'
import { pB23 } from './b23.ts'
import { region1 } from './region1.ts'
import { region2 } from './region2.ts'
import { pSat } from './region4.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('region 1 backward equations', () => {
  test.each([
    [3, 500, 0.391798509e3],
    [80, 500, 0.378108626e3],
    [80, 1500, 0.611041229e3],
  ])('T(p = %d MPa, h = %d kJ/kg) (IAPWS R7-97(2012) Table 7)', (p, h, T) => {
    expect(rel(t1ph(p, h), T)).toBeLessThanOrEqual(1e-8)
  })
  test.each([
    [3, 0.5, 0.307842258e3],
    [80, 0.5, 0.309979785e3],
    [80, 3, 0.565899909e3],
  ])('T(p = %d MPa, s = %d kJ/(kg K)) (IAPWS R7-97(2012) Table 9)', (p, s, T) => {
    expect(rel(t1ps(p, s), T)).toBeLessThanOrEqual(1e-8)
  })
})

describe('region 2 backward equations', () => {
  test.each([
    ['2a', 0.001, 3000, 0.534433241e3],
    ['2a', 3, 3000, 0.57537337e3],
    ['2a', 3, 4000, 0.101077577e4],
    ['2b', 5, 3500, 0.801299102e3],
    ['2b', 5, 4000, 0.101531583e4],
    ['2b', 25, 3500, 0.875279054e3],
    ['2c', 40, 2700, 0.743056411e3],
    ['2c', 60, 2700, 0.791137067e3],
    ['2c', 60, 3200, 0.88275686e3],
  ] as const)('%s: T(p = %d MPa, h = %d kJ/kg) (IAPWS R7-97(2012) Table 24)', (sub, p, h, T) => {
    expect(subregion2ph(p, h)).toBe(sub)
    expect(rel(t2ph(p, h), T)).toBeLessThanOrEqual(1e-8)
  })
  test.each([
    ['2a', 0.1, 7.5, 0.399517097e3],
    ['2a', 0.1, 8, 0.514127081e3],
    ['2a', 2.5, 8, 0.103984917e4],
    ['2b', 8, 6, 0.60048404e3],
    ['2b', 8, 7.5, 0.106495556e4],
    ['2b', 90, 6, 0.103801126e4],
    ['2c', 20, 5.75, 0.697992849e3],
    ['2c', 80, 5.25, 0.854011484e3],
    ['2c', 80, 5.75, 0.949017998e3],
  ] as const)('%s: T(p = %d MPa, s = %d kJ/(kg K)) (IAPWS R7-97(2012) Table 29)', (sub, p, s, T) => {
    expect(subregion2ps(p, s)).toBe(sub)
    expect(rel(t2ps(p, s), T)).toBeLessThanOrEqual(1e-8)
  })
  test('B2bc: p(h = 0.3516004323e4) = 0.1e3 MPa and back (IAPWS R7-97(2012) Eqs. (20), (21))', () => {
    expect(rel(pB2bc(0.3516004323e4), 0.1e3)).toBeLessThanOrEqual(1e-8)
    expect(rel(hB2bc(0.1e3), 0.3516004323e4)).toBeLessThanOrEqual(1e-8)
  })
})

describe('numerical consistency of backward and basic equations (release tolerances)', () => {
  // Deterministic grid over each region; the release quotes |dT|_max for 10^7 random points.
  const grid1: [number, number][] = []
  for (let T = 274; T <= 623; T += 11.7)
    for (const p of [0.01, 0.1, 1, 5, 10, 20, 40, 60, 80, 100]) if (p >= pSat(T)) grid1.push([p, T])
  const grid2: [number, number][] = []
  for (let T = 280; T <= 1073; T += 13.1)
    for (const p of [0.001, 0.01, 0.1, 0.5, 1, 3, 4, 5, 7, 10, 16, 20, 30, 50, 80, 100]) {
      const top = T <= 623.15 ? pSat(T) : T <= 863.15 ? pB23(T) : 100
      if (p < top) grid2.push([p, T])
    }

  test(`region 1: |T(p,h) - T| and |T(p,s) - T| <= 25 mK over ${grid1.length} states (release Eq. (12)/(14) tolerance)`, () => {
    let worst = 0
    for (const [p, T] of grid1) {
      const r = region1(p, T)
      worst = Math.max(worst, Math.abs(t1ph(p, r.h) - T), Math.abs(t1ps(p, r.s) - T))
    }
    expect(worst).toBeLessThanOrEqual(0.025)
  })

  test(`region 2: |T(p,h) - T|, |T(p,s) - T| <= 10 mK (s >= 5.85) / 25 mK (s < 5.85) over ${grid2.length} states (release tolerance, from memory)`, () => {
    let worstHigh = 0
    let worstLow = 0
    for (const [p, T] of grid2) {
      const r = region2(p, T)
      const d = Math.max(Math.abs(t2ph(p, r.h) - T), Math.abs(t2ps(p, r.s) - T))
      if (r.s >= 5.85) worstHigh = Math.max(worstHigh, d)
      else worstLow = Math.max(worstLow, d)
    }
    expect(worstHigh).toBeLessThanOrEqual(0.01)
    expect(worstLow).toBeLessThanOrEqual(0.025)
    expect(worstLow).toBeGreaterThan(0) // the grid really reaches s < 5.85
  })
})
