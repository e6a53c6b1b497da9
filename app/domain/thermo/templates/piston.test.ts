import { describe, expect, test } from 'vitest'
import { solveCycle } from '../cycle.ts'
import type { CycleSolution } from '../cycle.ts'
import { constantCpGas } from '../substances/constant-cp.ts'
import { gasPreset } from '../substances/presets.ts'
import type { Gas } from '../substances/gas.ts'
import type { TemplateValues } from './index.ts'
import { templates } from './index.ts'

function gasK(gamma: number, R = 287): Gas {
  const r = constantCpGas({ basis: 'mass', R, gamma })
  if (!r.ok) throw new Error(r.error.message)
  return r.gas
}
function run(
  id: string,
  gas: Gas,
  num: Record<string, number | undefined>,
  heat: TemplateValues['heat'] = {},
): CycleSolution {
  const b = templates[id]!.build({ gas, num, heat, labels: {} })
  if (!b.ok) throw new Error(b.error.message)
  const r = solveCycle(b.spec)
  if (!r.ok) throw new Error(r.error.message)
  return r
}
function energyBalance(s: CycleSolution) {
  // closed system, w done on the gas: Δu = q + w per step; Σq = −wNet over the cycle
  const scale = s.totals.qIn
  for (const st of s.steps) expect(Math.abs(st.du - st.q - st.w)).toBeLessThan(1e-9 * scale)
  expect(Math.abs(s.steps.reduce((a, st) => a + st.q, 0) + s.totals.wNet)).toBeLessThan(1e-9 * scale)
  expect(Math.abs(s.totals.dsCycle)).toBeLessThan(1e-9 * Math.max(1, Math.abs(s.steps[1]!.ds)))
}

describe('Atkinson cycle', () => {
  // η = 1 − γ (re − rc)/(re^γ − rc^γ) for constant cp (the standard air-standard result, from
  // memory; it follows from q_in = cv(T3 − T2), q_out = cp(T4 − T1), T4 = T1 re/rc, T3 = T4 re^(γ−1))
  test.each([
    [8, 12, 1.4],
    [10, 16, 1.4],
    [6, 7, 1.3],
    [12, 30, 5 / 3],
  ])('rc = %d, re = %d, γ = %d: closed-form efficiency', (rc, re, g) => {
    const s = run('atkinson', gasK(g), { p1: 100e3, T1: 300, compressionRatio: rc, expansionRatio: re })
    expect(s.totals.efficiency!).toBeCloseTo(1 - (g * (re - rc)) / (Math.pow(re, g) - Math.pow(rc, g)), 10)
    // state 4 at p1 and the expansion ratio V4/V3 as given
    expect(s.states[3]!.p).toBeCloseTo(100e3, 5)
    expect(s.states[3]!.v / s.states[2]!.v).toBeCloseTo(re, 9)
    expect(s.states[0]!.v / s.states[1]!.v).toBeCloseTo(rc, 9)
    energyBalance(s)
  })

  test('given T3 instead, the expansion goes to p1 and the closed form holds with the resulting re', () => {
    const g = 1.4
    const s = run('atkinson', gasK(g), { p1: 100e3, T1: 300, compressionRatio: 9, T3: 2000 })
    const rc = 9
    const re = s.states[3]!.v / s.states[2]!.v
    expect(re).toBeGreaterThan(rc)
    expect(s.states[3]!.p).toBeCloseTo(100e3, 5)
    expect(s.totals.efficiency!).toBeCloseTo(1 - (g * (re - rc)) / (Math.pow(re, g) - Math.pow(rc, g)), 10)
    // more efficient than the Otto cycle with the same compression ratio (1 − rc^(1−γ))
    expect(s.totals.efficiency!).toBeGreaterThan(1 - Math.pow(rc, 1 - g))
    energyBalance(s)
  })

  test('heatIn route and a NASA gas balance to 1e-9', () => {
    const nasa = gasPreset('nasa:dry-air', 'mass')
    if (!nasa.ok) throw new Error(nasa.error.message)
    const s = run('atkinson', nasa.gas, { p1: 100e3, T1: 300, compressionRatio: 8 }, { heatIn: { heat: 1200e3 } })
    expect(s.steps[1]!.q).toBeCloseTo(1200e3, 3)
    energyBalance(s)
  })
})

describe('Miller cycle', () => {
  test.each([
    [8, 10, 1.4, 1800],
    [10, 12, 1.4, 2200],
    [7, 9, 1.3, 1600],
  ])('rc = %d, re = %d, γ = %d, T3 = %d K: cold-air closed form', (rc, re, g, T3) => {
    const T1 = 300
    const gas = gasK(g)
    const cv = gas.cv(300)
    const cp = gas.cp(300)
    // 1→2: T2 = T1 rc^(γ−1); 3→4: T4 = T3 / re^(γ−1); 5 at p1 with V5 = (re/rc) V1: T5 = T1 re/rc
    const T2 = T1 * Math.pow(rc, g - 1)
    const T4 = T3 / Math.pow(re, g - 1)
    const T5 = (T1 * re) / rc
    const qin = cv * (T3 - T2)
    const qout = cv * (T4 - T5) + cp * (T5 - T1)
    const s = run('miller', gas, { p1: 100e3, T1, compressionRatio: rc, expansionRatio: re, T3 })
    expect(s.states).toHaveLength(5)
    expect(s.states[3]!.T).toBeCloseTo(T4, 8)
    expect(s.states[4]!.T).toBeCloseTo(T5, 8)
    expect(s.totals.efficiency!).toBeCloseTo(1 - qout / qin, 10)
    // between Otto (same rc) and the Atkinson limit
    expect(s.totals.efficiency!).toBeGreaterThan(1 - Math.pow(rc, 1 - g))
    energyBalance(s)
  })

  test('expansion beyond the full-expansion point is refused with a message', () => {
    // T3 = 1000 K, rc = 8, γ = 1.4: re = 20 expands below p1, so 4→5 would need heating at constant volume
    const gas = gasK(1.4)
    const b = templates.miller!.build({
      gas,
      num: { p1: 100e3, T1: 300, compressionRatio: 8, expansionRatio: 20, T3: 1000 },
      heat: {},
      labels: {},
    })
    expect(b.ok).toBe(false)
    // p4 = p3 / re^γ with p3 = p1 rc (T3/T1): 100 kPa · 8 · (1000/300) / 20^1.4
    const p4 = (100 * 8 * (1000 / 300)) / Math.pow(20, 1.4)
    if (!b.ok) expect(b.error.message).toContain(`the expansion ends at ${+p4.toPrecision(4)} kPa, below p1 (100 kPa)`)
    // the same through heatIn (cv (T3 − T2) with T2 = 300 · 8^0.4)
    const heat = gas.cv(300) * (1000 - 300 * Math.pow(8, 0.4))
    const h = templates.miller!.build({
      gas,
      num: { p1: 100e3, T1: 300, compressionRatio: 8, expansionRatio: 20 },
      heat: { heatIn: { heat } },
      labels: {},
    })
    expect(h.ok).toBe(false)
    if (!h.ok) expect(h.error.message).toMatch(/below p1/)
    // full expansion is at re = (rc T3/T1)^(1/γ) ≈ 10.43: just short of it the cycle solves, just beyond it is refused
    const reFull = Math.pow((8 * 1000) / 300, 1 / 1.4)
    expect(() =>
      run('miller', gas, { p1: 100e3, T1: 300, compressionRatio: 8, expansionRatio: reFull * 0.999, T3: 1000 }),
    ).not.toThrow()
    expect(
      templates.miller!.build({
        gas,
        num: { p1: 100e3, T1: 300, compressionRatio: 8, expansionRatio: reFull * 1.001, T3: 1000 },
        heat: {},
        labels: {},
      }).ok,
    ).toBe(false)
  })
})

describe('bad input gives messages, never a throw', () => {
  const base = { gas: 'air', p1: '100 kPa', T1: '300 K', compressionRatio: 8 }
  test.each([
    ['atkinson', { expansionRatio: 8 }, /expansionRatio \(8\) must be larger than compressionRatio \(8\)/],
    ['atkinson', { expansionRatio: 6 }, /must be larger than compressionRatio/],
    ['atkinson', { expansionRatio: 12, T3: '1800 K' }, /exactly one/],
    ['atkinson', {}, /exactly one/],
    ['miller', { expansionRatio: 7, T3: '1800 K' }, /must be larger than compressionRatio/],
    ['miller', { expansionRatio: 10 }, /exactly one of T3 or heatIn/],
    ['miller', { T3: '1800 K' }, /expansionRatio/],
    ['atkinson', { compressionRatio: 1, expansionRatio: 3 }, /compressionRatio must exceed 1/],
  ])('%s %o', (id, extra, msg) => {
    const r = templates[id]!.solve({ ...base, ...extra })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(msg)
  })
})
