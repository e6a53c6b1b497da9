import { expect, test } from 'vitest'
import { cycleChoices, cycleName, shortLabel, TEMPLATE_CATALOG, templateEntry } from './catalog.ts'
import { solveSpec } from './solve-spec.ts'

test('every template id is listed once', () => {
  const ids = TEMPLATE_CATALOG.map((e) => e.id)
  expect(new Set(ids).size).toBe(ids.length)
  expect(ids.length).toBeGreaterThanOrEqual(13)
})

test('every listed template is one the spec entry point knows (it may refuse the empty inputs, but not the id)', () => {
  for (const e of TEMPLATE_CATALOG) {
    const r = solveSpec({ template: e.id, inputs: {} })
    if (!r.ok) expect(r.error.message, e.id).not.toMatch(/unknown template/i)
  }
})

test('bank templates solve for bank problems; the others are refused there with a plain reason', async () => {
  const { solveBankSpec, NOT_IN_BANK } = await import('./solve-spec.ts')
  for (const e of TEMPLATE_CATALOG) {
    const r = solveBankSpec({ template: e.id, inputs: {} })
    if (e.bank) expect(r.ok || r.error.code !== NOT_IN_BANK, e.id).toBe(true)
    else expect(!r.ok && r.error.code === NOT_IN_BANK, e.id).toBe(true)
  }
  // Water written out in full in the general cycle format is open to bank problems too (a general
  // cycle whose substance is water, authoring/substitute.ts).
  const water = solveBankSpec({
    steamCycle: {
      system: 'closed',
      states: [
        { name: '1', p: '1 MPa', x: 0.5 },
        { name: '2', T: '300 °C' },
      ],
      steps: [{ process: 'isobaric' }],
    },
  })
  expect(water.ok).toBe(true)
})

test('short labels come from the titles', () => {
  expect(shortLabel('Otto cycle (air-standard spark ignition)')).toBe('Otto')
  expect(shortLabel('Brayton cycle with regenerator')).toBe('Brayton with regenerator')
  expect(shortLabel('Rankine cycle with reheat (water/steam, IAPWS-IF97)')).toBe('Rankine with reheat')
  expect(shortLabel('Carnot heat pump')).toBe('Carnot heat pump')
  expect(templateEntry('otto')?.label).toBe('Otto')
})

test('the bank filters list every template and the general cycle, labelled', () => {
  const choices = cycleChoices()
  expect(choices.map(([id]) => id)).toEqual([...TEMPLATE_CATALOG.filter((e) => e.bank).map((e) => e.id), 'general'])
  expect(cycleName('general')).toBe('General cycle')
  expect(cycleName('rankine-reheat')).toBe('Rankine with reheat')
  expect(cycleName('no-such-cycle')).toBe('no-such-cycle')
})
