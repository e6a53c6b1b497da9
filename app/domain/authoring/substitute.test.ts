import { expect, test } from 'vitest'
import type { DrawnGiven, Physics, ProblemDefinition } from './definition.ts'
import { buildSpec } from './substitute.ts'

const drawn: DrawnGiven[] = [
  { name: 'T1', label: 'inlet temperature', value: 350, unit: 'K', text: '350 K' },
  { name: 'p1', label: 'inlet pressure', value: 101.325, unit: 'kPa', text: '101.325 kPa' },
  { name: 'r', label: 'compression ratio', value: 8.5, unit: '', text: '8.5' },
  { name: 'gas', label: 'working gas', value: Number.NaN, unit: '', text: 'monatomic' },
]

const withPhysics = (physics: Physics): ProblemDefinition => ({
  format: 2,
  title: 'Test',
  tags: { topics: [], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: '',
  givens: [],
  constraints: [],
  physics,
  finds: [],
})

test('template: exact names become the given text, @{name} is replaced inside text, unknown names stay, the convention is stated', () => {
  const spec = buildSpec(
    withPhysics({
      kind: 'template',
      template: 'otto',
      inputs: {
        gas: 'gas',
        T1: 'T1',
        p1: '@{p1}',
        compressionRatio: 'r',
        heatIn: '800 kJ/kg',
        T3: '@{T1} + @{Tx}',
        p3: 'Tx',
      },
    }),
    drawn,
    'chemistry',
  )
  expect(spec).toEqual({
    template: 'otto',
    inputs: {
      gas: 'monatomic',
      T1: '350 K',
      p1: '101.325 kPa',
      compressionRatio: '8.5',
      heatIn: '800 kJ/kg',
      T3: '350 K + @{Tx}',
      p3: 'Tx',
    },
    convention: 'chemistry',
  })
})

test('a name inside a longer text without @{} is not replaced ("T1 max" is literal text)', () => {
  const spec = buildSpec(
    withPhysics({ kind: 'template', template: 'otto', inputs: { label: 'T1 max', spaced: '@{ T1 }' } }),
    drawn,
    'engineering',
  )
  expect(spec.inputs).toEqual({ label: 'T1 max', spaced: '350 K' })
})

test('cycle: substitution reaches every string however deep; numbers, booleans, null and keys pass through', () => {
  const cycle = {
    gas: { R: '287 J/(kg K)', gamma: 1.4, note: 'gas' },
    system: 'closed',
    T1: 'key named like a given stays a key',
    states: [{ name: '1', p: 'p1', T: 'T1' }, {}, { T: '@{T1}·4' }, { extra: [['r', 3, null, true]] }],
    steps: [
      { process: 'isentropic', compressionRatio: 'r' },
      { process: 'isochoric', heat: '800 kJ/kg' },
    ],
  }
  const before = structuredClone(cycle)
  const spec = buildSpec(withPhysics({ kind: 'cycle', cycle }), drawn, 'engineering')
  expect(spec).toEqual({
    cycle: {
      gas: { R: '287 J/(kg K)', gamma: 1.4, note: 'monatomic' },
      system: 'closed',
      T1: 'key named like a given stays a key',
      states: [{ name: '1', p: '101.325 kPa', T: '350 K' }, {}, { T: '350 K·4' }, { extra: [['8.5', 3, null, true]] }],
      steps: [
        { process: 'isentropic', compressionRatio: '8.5' },
        { process: 'isochoric', heat: '800 kJ/kg' },
      ],
    },
    convention: 'engineering',
  })
  expect(cycle).toEqual(before)
})
