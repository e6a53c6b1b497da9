import { expect, test } from 'vitest'
import { R_MOLAR } from '../constants.ts'
import { constantCpGas } from './constant-cp.ts'
import { gasPreset } from './presets.ts'

// closed forms: cp − cv = R, γ = cp/cv (Mayer's relation for an ideal gas)
test.each([
  [{ basis: 'mass' as const, R: 287, cv: 717.5 }],
  [{ basis: 'mass' as const, R: 287, cp: 1004.5 }],
  [{ basis: 'mass' as const, R: 287, gamma: 1.4 }],
  [{ basis: 'mass' as const, cp: 1004.5, cv: 717.5 }],
])('any consistent pair gives the same gas (%#)', (p) => {
  const r = constantCpGas(p)
  expect(r.ok).toBe(true)
  if (!r.ok) return
  expect(r.gas.R).toBeCloseTo(287, 9)
  expect(r.gas.cv(300)).toBeCloseTo(717.5, 9)
  expect(r.gas.gamma(300)).toBeCloseTo(1.4, 12)
})

test('inconsistent or incomplete constants give an error, not a throw', () => {
  expect(constantCpGas({ basis: 'mass', R: 287, cp: 1005, gamma: 1.67 }).ok).toBe(false)
  expect(constantCpGas({ basis: 'mass', R: 287 }).ok).toBe(false)
  expect(constantCpGas({ basis: 'mass', cp: 700, cv: 800 }).ok).toBe(false)
})

test('presets: monatomic cv = 3/2 R, diatomic 5/2 R (equipartition, common practice); air per Çengel & Boles Table A-2 (from memory)', () => {
  const m = gasPreset('monatomic')
  const d = gasPreset('diatomic')
  const a = gasPreset('air')
  if (!m.ok || !d.ok || !a.ok) throw new Error('preset')
  expect(m.gas.cv(300)).toBeCloseTo(1.5 * R_MOLAR, 12)
  expect(d.gas.gamma(300)).toBeCloseTo(1.4, 12)
  expect(a.gas.cp(300)).toBe(1005)
  expect(a.gas.R).toBe(287)
  expect(a.gas.gamma(300)).toBeCloseTo(1.4, 3)
  expect(gasPreset('nope').ok).toBe(false)
})
