import { expect, test } from 'vitest'
import { gasPreset } from './presets.ts'
import { swapCpCv, switchBasisNumbers, withLog10 } from './slipped.ts'

function air() {
  const r = gasPreset('air')
  if (!r.ok) throw new Error('air preset')
  return r.gas
}

// What a slip does is fixed by its definition (slipped.ts): cp and cv trade places; log10
// replaces ln; per-kg numbers used per mole scale the constants by M. Checked here: a second
// slip keeps the first instead of rebuilding the gas from its original constants.
test('cp–cv swap then log10: the heat capacities stay swapped', () => {
  const a = air()
  const g = withLog10(swapCpCv(a))
  expect(g.cp(300)).toBeCloseTo(a.cv(300), 9)
  expect(g.cv(300)).toBeCloseTo(a.cp(300), 9)
  expect(g.ln(100)).toBeCloseTo(2, 12)
})

test('basis switch then log10: the constants stay scaled', () => {
  const a = air()
  const switched = switchBasisNumbers(a)
  expect(switched).not.toBeNull()
  const g = withLog10(switched!)
  expect(g.R / a.R).toBeCloseTo(switched!.R / a.R, 12)
  expect(g.R).not.toBeCloseTo(a.R, 3)
  expect(g.ln(1000)).toBeCloseTo(3, 12)
})

test('log10 alone on a constant-cp gas keeps its constants', () => {
  const a = air()
  const g = withLog10(a)
  expect(g.cp(300)).toBeCloseTo(a.cp(300), 12)
  expect(g.ln(10)).toBeCloseTo(1, 12)
})
