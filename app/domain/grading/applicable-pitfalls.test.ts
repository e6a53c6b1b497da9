import { describe, expect, test } from 'vitest'
import type { Find, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { readQuantity, solveBankSpec } from '#app/domain/thermo/index.ts'
import { TEMPLATE_CATALOG } from '#app/domain/thermo/catalog.ts'
import { TEMPLATES_WITHOUT_SLIPS } from './applicable-pitfalls.ts'
import { applicablePitfalls, evaluateWithPitfall, whyPitfallCannotFire } from './pitfalls.ts'

const SOLVER_SLIP_IDS = [
  'celsius-for-kelvin',
  'cp-cv-swapped',
  'gamma-monatomic-diatomic-swapped',
  'log10-for-ln',
  'per-mole-vs-per-kg',
] as const

const out = (name: string, path: string, unit: string): Find => ({
  name,
  label: name,
  source: { kind: 'output', path },
  unit,
  points: 1,
  tolerance: { kind: 'relative', value: 0.01 },
  pitfalls: [],
})
const otto = (T1unit: string, T1input = 'T1', heatIn = '800 kJ/kg'): ProblemDefinition => ({
  format: 2,
  title: 'Otto',
  tags: { topics: [], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: '',
  givens: [
    { name: 'T1', label: 'intake temperature', unit: T1unit, rule: { kind: 'range', min: 20, max: 40, step: 5 } },
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'otto',
    inputs: { gas: 'air', p1: '100 kPa', T1: T1input, compressionRatio: '8', heatIn },
  },
  finds: [
    out('T2', 'states.2.T', 'K'),
    out('wnet', 'totals.netWork', 'kJ/kg'),
    out('qin', 'totals.heatIn', 'kJ/kg'),
    out('eta', 'totals.efficiency', ''),
    { ...out('x', 'x', 'K'), source: { kind: 'expression', expression: 'T1' } },
  ],
})

test('°C for K: offered only when a temperature in °C reaches the solver', () => {
  expect(applicablePitfalls(otto('degC'), 0)).toContain('celsius-for-kelvin')
  expect(applicablePitfalls(otto('°C'), 0)).toContain('celsius-for-kelvin')
  expect(applicablePitfalls(otto('K'), 0)).not.toContain('celsius-for-kelvin')
  // a °C written into an input, or named through @{…} in a longer text
  expect(applicablePitfalls(otto('K', '25 degC'), 0)).toContain('celsius-for-kelvin')
  expect(applicablePitfalls(otto('degC', '@{T1}'), 0)).toContain('celsius-for-kelvin')
  expect(whyPitfallCannotFire(otto('K'), 0, 'celsius-for-kelvin')).toMatch(/no temperature in °C reaches the solver/)
})

test('the sign slip: only where the convention decides the key’s sign', () => {
  const d = otto('K')
  expect(applicablePitfalls(d, 1)).toContain('sign-convention-flipped') // totals.netWork
  expect(applicablePitfalls(d, 2)).not.toContain('sign-convention-flipped') // heat in, a size
  expect(applicablePitfalls(d, 3)).not.toContain('sign-convention-flipped') // efficiency
})

test('the factor of 1000: an energy answer or a kJ input', () => {
  expect(applicablePitfalls(otto('K'), 3)).toContain('kilo-factor') // 800 kJ/kg reaches the solver
  expect(applicablePitfalls(otto('K', 'T1', '800000 J/kg'), 3)).not.toContain('kilo-factor')
  expect(applicablePitfalls(otto('K', 'T1', '800000 J/kg'), 1)).toContain('kilo-factor') // kJ/kg answer
})

test('an expression find can have no pitfall; the problem as a whole offers the union in the grader’s order', () => {
  expect(applicablePitfalls(otto('degC'), 4)).toEqual([])
  expect(whyPitfallCannotFire(otto('degC'), 4, 'kilo-factor')).toMatch(/not an expression/)
  expect(applicablePitfalls(otto('K'))).toEqual([
    'sign-convention-flipped',
    'cp-cv-swapped',
    'gamma-monatomic-diatomic-swapped',
    'kilo-factor',
    'log10-for-ln',
    'per-mole-vs-per-kg',
  ])
})

test('a half-typed draft does not throw', () => {
  expect(applicablePitfalls({ finds: [{}] } as unknown as ProblemDefinition, 0)).toEqual([])
  expect(applicablePitfalls({} as unknown as ProblemDefinition)).toEqual([])
})

describe('templates whose solver takes no slips (steam, refrigerants)', () => {
  test('are exactly the bank templates outside the ideal-gas family (the catalog’s word)', () => {
    const expected = TEMPLATE_CATALOG.filter((e) => e.bank && e.family !== 'ideal-gas').map((e) => e.id)
    expect([...TEMPLATES_WITHOUT_SLIPS].sort()).toEqual(expected.sort())
  })

  // The claim behind the list: re-solving with any of the solver's slips gives the same number,
  // so such a pitfall could never be recognised. A °C temperature and kJ inputs are written in
  // so that the °C and kJ slips would have something to act on.
  const specs: [string, unknown][] = [
    [
      'vapour-compression',
      {
        template: 'vapour-compression',
        inputs: {
          refrigerant: 'R134a',
          evaporatorTemperature: '-10 °C',
          condenserPressure: '0.8 MPa',
          massFlow: '0.05 kg/s',
        },
      },
    ],
    [
      'rankine',
      {
        template: 'rankine',
        inputs: { boilerPressure: '3 MPa', turbineInletTemperature: '350 °C', condenserPressure: '10 kPa' },
      },
    ],
  ]
  test.each(specs)('%s: no solver slip changes a key', (_id, spec) => {
    const sol = solveBankSpec(spec)
    expect(sol.ok).toBe(true)
    for (const path of ['states.2.T', 'states.2.h', 'states.1.s']) {
      const correct = sol.ok ? readQuantity(sol, path) : null
      expect(correct, path).not.toBeNull()
      for (const id of SOLVER_SLIP_IDS) {
        for (const v of evaluateWithPitfall(spec, path, id)) expect(v, `${path} with ${id}`).toBe(correct)
      }
    }
  })

  test('offer only the sign slip and a factor of 1000 on an energy, and say why the others cannot fire', () => {
    const def: ProblemDefinition = {
      ...otto('°C'),
      physics: {
        kind: 'template',
        template: 'vapour-compression',
        inputs: { refrigerant: 'R134a', evaporatorTemperature: 'T1', condenserPressure: '800 kJ/kg' },
      },
      finds: [out('w', 'devices.1.w', 'kJ/kg'), out('T2', 'states.2.T', 'K')],
    }
    expect(applicablePitfalls(def, 0)).toEqual(['sign-convention-flipped', 'kilo-factor'])
    expect(applicablePitfalls(def, 1)).toEqual([])
    expect(whyPitfallCannotFire(def, 1, 'celsius-for-kelvin')).toMatch(/cannot make this slip/)
    expect(whyPitfallCannotFire(def, 1, 'kilo-factor')).toMatch(/not an energy/)
    // The same finds on an ideal-gas template keep the solver's slips.
    expect(applicablePitfalls(otto('°C'), 0)).toContain('celsius-for-kelvin')
  })
})
