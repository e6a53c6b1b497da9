import { describe, expect, test } from 'vitest'
import { solveCycle } from '../cycle.ts'
import { parseGas } from '../spec.ts'
import { templates } from './index.ts'

const base = { gas: 'air', p1: '100 kPa', T1: '300 K', compressionRatio: '16' }

describe('a Diesel or dual cutoff that would end heat addition beyond V1 is refused', () => {
  test('Diesel: a cutoff ratio at or above the compression ratio, naming the largest allowed', () => {
    const r = templates.diesel!.solve({ ...base, cutoffRatio: '20' })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(/cutoffRatio must be below the compression ratio 16/)
  })
  test('Dual: the same for its constant-pressure part', () => {
    const r = templates.dual!.solve({ ...base, pressureRatio: '1.5', cutoffRatio: '17' })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(/cutoffRatio must be below the compression ratio 16/)
  })
  test('Diesel: so much heat that the end of heat addition passes V1 is refused by the solver, not solved at absurd temperatures', () => {
    const r = templates.diesel!.solve({ ...base, heatIn: '20000 kJ/kg' })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(/would compress the gas|outside the range/)
  })
  test('a sensible Diesel cycle still solves', () => {
    expect(templates.diesel!.solve({ ...base, cutoffRatio: '2' }).ok).toBe(true)
  })
})

test('the general solver refuses a step labelled expansion that compresses', () => {
  const g = parseGas('air')
  if (!g.ok) throw new Error(g.error.message)
  const r = solveCycle({
    gas: g.value,
    system: 'closed',
    purpose: 'engine',
    // An Otto cycle whose first step, a compression by 8, is mislabelled an expansion.
    states: [{ p: 100e3, T: 300 }, {}, { T: 1800 }, {}],
    steps: [
      { process: 'isentropic', volumeRatio: 1 / 8, label: 'expansion' },
      { process: 'isochoric', label: 'heat addition' },
      { process: 'isentropic', label: 'power stroke' },
      { process: 'isochoric', label: 'heat rejection' },
    ],
  })
  expect(r.ok).toBe(false)
  if (!r.ok) expect(r.error.message).toMatch(/Step 1 \(expansion\) would compress the gas/)
})
