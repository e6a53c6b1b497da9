import { expect, test } from 'vitest'
import { solveBankSpec, solveSpec } from './solve-spec.ts'

// Each family's own checks are in its folder; these only check that the one spec entry point
// reaches every family, and that bank problems are offered only the ones the authoring layer
// can key and draw.
const calorimeter = {
  template: 'steam-throttling-calorimeter',
  inputs: { linePressure: '1 MPa', calorimeterPressure: '100 kPa', calorimeterTemperature: '120 °C' },
}
const vapourCarnot = { template: 'steam-carnot', inputs: { hotTemperature: '250 °C', coldTemperature: '40 °C' } }

test.each([
  ['the throttling calorimeter', calorimeter],
  ['the vapour Carnot cycle', vapourCarnot],
])('%s solves through solveSpec, in the convention asked for', (_name, spec) => {
  const eng = solveSpec(spec)
  expect(eng.ok, JSON.stringify(eng)).toBe(true)
  const chem = solveSpec({ ...spec, convention: 'chemistry' })
  expect(chem.ok && chem.convention.name).toBe('chemistry')
})

test.each([
  ['the throttling calorimeter', calorimeter],
  ['the vapour Carnot cycle', vapourCarnot],
])('%s solves for bank problems too', (_name, spec) => {
  expect(solveBankSpec(spec).ok).toBe(true)
})

test('water written out in full in the general cycle format solves for bank problems', () => {
  const r = solveBankSpec({
    steamCycle: {
      system: 'flow',
      states: [
        { name: '1', p: '1 MPa', x: 0 },
        { name: '2', x: 1 },
      ],
      steps: [{ process: 'isobaric' }],
    },
  })
  expect(r.ok, JSON.stringify(r)).toBe(true)
})

test('ideal-gas and Rankine templates stay open to bank problems', () => {
  expect(
    solveBankSpec({ template: 'otto', inputs: { p1: '100 kPa', T1: '300 K', compressionRatio: '8', T3: '1800 K' } }).ok,
  ).toBe(true)
  expect(
    solveBankSpec({
      template: 'rankine',
      inputs: { boilerPressure: '8 MPa', condenserPressure: '10 kPa', turbineInletTemperature: '480 °C' },
    }).ok,
  ).toBe(true)
})
