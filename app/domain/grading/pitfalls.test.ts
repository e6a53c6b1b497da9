import { describe, expect, test } from 'vitest'
import { R_MOLAR, readQuantity, solveSpec } from '#app/domain/thermo/index.ts'
import type { FormattedSolution } from '#app/domain/thermo/index.ts'
import { diagnosePitfall, evaluateWithPitfall, PITFALLS } from './pitfalls.ts'

function sol(spec: unknown): FormattedSolution {
  const r = solveSpec(spec)
  if (!r.ok) throw new Error(r.error.message)
  return r as FormattedSolution
}

const carnot = {
  template: 'carnot-engine',
  convention: 'chemistry',
  inputs: { gas: 'monatomic', amount: '1 mol', Th: '327 °C', Tc: '27 °C', p1: '1000 kPa', expansionRatio: 2 },
}
const ottoKJ = {
  template: 'otto',
  convention: 'engineering',
  inputs: { gas: 'air', p1: '100 kPa', T1: '300 K', compressionRatio: 8, heatIn: '800 kJ/kg' },
}
const ottoT3 = {
  template: 'otto',
  convention: 'engineering',
  inputs: { gas: 'air', p1: '100 kPa', T1: '300 K', compressionRatio: 8, T3: '1800 K' },
}
const ottoMono = {
  template: 'otto',
  convention: 'engineering',
  inputs: { gas: 'monatomic', p1: '100 kPa', T1: '300 K', compressionRatio: 8, T3: '1800 K' },
}
const diesel = {
  template: 'diesel',
  convention: 'engineering',
  inputs: { gas: 'air', p1: '100 kPa', T1: '300 K', compressionRatio: 18, cutoffRatio: 2 },
}

test('the catalogue has stable ids and feedback for every slip of the issue', () => {
  expect(PITFALLS.map((p) => p.id)).toEqual([
    'sign-convention-flipped',
    'celsius-for-kelvin',
    'cp-cv-swapped',
    'gamma-monatomic-diatomic-swapped',
    'kilo-factor',
    'log10-for-ln',
    'per-mole-vs-per-kg',
  ])
  for (const p of PITFALLS) expect(p.feedback.length).toBeGreaterThan(40)
})

describe('each pitfall reproduces its slip exactly on a known case', () => {
  test('sign convention: net work of the Carnot engine with the sign flipped', () => {
    const w = readQuantity(sol(carnot), 'totals.netWork')!
    expect(w).toBeLessThan(0) // chemistry: work done on the gas is negative for an engine
    expect(evaluateWithPitfall(carnot, 'totals.netWork', 'sign-convention-flipped')).toEqual([-w])
    expect(diagnosePitfall({ spec: carnot, quantity: 'totals.netWork', studentValueSI: -w })?.pitfall.id).toBe(
      'sign-convention-flipped',
    )
  })
  test('°C for K: Carnot efficiency becomes 1 − 27/327 (closed form with the °C numbers)', () => {
    const [v] = evaluateWithPitfall(carnot, 'totals.efficiency', 'celsius-for-kelvin')
    expect(v).toBeCloseTo(1 - 27 / 327, 12)
    expect(
      diagnosePitfall({ spec: carnot, quantity: 'totals.efficiency', studentValueSI: 1 - 27 / 327 })?.pitfall.id,
    ).toBe('celsius-for-kelvin')
  })
  test('cp/cv swapped: Diesel heat input becomes cv·(T3 − T2) instead of cp·(T3 − T2) (definitions)', () => {
    const s = sol(diesel)
    const dT = s.states[2]!.T.value - s.states[1]!.T.value
    expect(readQuantity(s, 'steps.2.q')).toBeCloseTo(1005 * dT, 6)
    const [v] = evaluateWithPitfall(diesel, 'steps.2.q', 'cp-cv-swapped')
    expect(v).toBeCloseTo(718 * dT, 6)
    expect(diagnosePitfall({ spec: diesel, quantity: 'steps.2.q', studentValueSI: 718 * dT })?.pitfall.id).toBe(
      'cp-cv-swapped',
    )
  })
  test('γ of the wrong kind: monatomic Otto evaluated with γ = 7/5 gives 1 − 8^(−0.4) (closed form)', () => {
    expect(readQuantity(sol(ottoMono), 'totals.efficiency')).toBeCloseTo(1 - Math.pow(8, -2 / 3), 12)
    const [v] = evaluateWithPitfall(ottoMono, 'totals.efficiency', 'gamma-monatomic-diatomic-swapped')
    expect(v).toBeCloseTo(1 - Math.pow(8, -0.4), 12)
    expect(
      diagnosePitfall({ spec: ottoMono, quantity: 'totals.efficiency', studentValueSI: 1 - Math.pow(8, -0.4) })?.pitfall
        .id,
    ).toBe('gamma-monatomic-diatomic-swapped')
  })
  test('kJ as J: 800 kJ/kg read as 800 J/kg gives w_net = η·800 J/kg; and the plain ×1000 on the answer', () => {
    const s = sol(ottoKJ)
    const eta = readQuantity(s, 'totals.efficiency')!
    const w = readQuantity(s, 'totals.netWork')!
    const vals = evaluateWithPitfall(ottoKJ, 'totals.netWork', 'kilo-factor')
    expect(vals[0]).toBeCloseTo(eta * 800, 9)
    expect(vals[1]).toBeCloseTo(w * 1000, 6)
    expect(diagnosePitfall({ spec: ottoKJ, quantity: 'totals.netWork', studentValueSI: eta * 800 })?.pitfall.id).toBe(
      'kilo-factor',
    )
    expect(diagnosePitfall({ spec: ottoKJ, quantity: 'totals.netWork', studentValueSI: w / 1000 })?.pitfall.id).toBe(
      'kilo-factor',
    )
  })
  test('log10 for ln: isothermal heat R·Th·log10 2 instead of R·Th·ln 2 (closed form)', () => {
    const Th = 600.15
    expect(readQuantity(sol(carnot), 'steps.1.q')).toBeCloseTo(R_MOLAR * Th * Math.LN2, 9)
    const [v] = evaluateWithPitfall(carnot, 'steps.1.q', 'log10-for-ln')
    expect(v).toBeCloseTo(R_MOLAR * Th * Math.log10(2), 9)
    expect(
      diagnosePitfall({ spec: carnot, quantity: 'steps.1.q', studentValueSI: R_MOLAR * Th * Math.log10(2) })?.pitfall
        .id,
    ).toBe('log10-for-ln')
  })
  test('per mole vs per kg: Otto work per kg with molar constants is w × M (M = 0.02897 kg/mol, Çengel & Boles Table A-1, from memory)', () => {
    const w = readQuantity(sol(ottoT3), 'totals.netWork')!
    const [v] = evaluateWithPitfall(ottoT3, 'totals.netWork', 'per-mole-vs-per-kg')
    expect(v).toBeCloseTo(w * 0.02897, 6)
    expect(diagnosePitfall({ spec: ottoT3, quantity: 'totals.netWork', studentValueSI: w * 0.02897 })?.pitfall.id).toBe(
      'per-mole-vs-per-kg',
    )
  })
})

test('a correct answer, an unexplained wrong one and a broken spec give null without throwing', () => {
  const w = readQuantity(sol(ottoT3), 'totals.netWork')!
  expect(diagnosePitfall({ spec: ottoT3, quantity: 'totals.netWork', studentValueSI: w * 1.001 })).toBeNull()
  expect(diagnosePitfall({ spec: ottoT3, quantity: 'totals.netWork', studentValueSI: w * 1.37 })).toBeNull()
  expect(diagnosePitfall({ spec: { template: 'nope' }, quantity: 'totals.netWork', studentValueSI: 1 })).toBeNull()
  expect(diagnosePitfall({ spec: ottoT3, quantity: 'totals.noSuch', studentValueSI: 1 })).toBeNull()
  expect(diagnosePitfall({ spec: ottoT3, quantity: 'totals.netWork', studentValueSI: Number.NaN })).toBeNull()
})
