import { expect, test } from 'vitest'
import { readQuantity, solveSpec } from '#app/domain/thermo/index.ts'
import type { Find, FindSource, Given, Physics, ProblemDefinition, ProblemConvention, Variant } from './definition.ts'
import { drawVariant, resolveConvention, solverErrorPath } from './variant.ts'

const find = (name: string, source: FindSource, unit: string, extra: Partial<Find> = {}): Find => ({
  name,
  label: name,
  source,
  unit,
  points: 1,
  tolerance: { kind: 'relative', value: 0.01 },
  pitfalls: [],
  ...extra,
})
const out = (path: string): FindSource => ({ kind: 'output', path })
const expr = (expression: string): FindSource => ({ kind: 'expression', expression })

function problem(
  givens: Given[],
  physics: Physics,
  finds: Find[],
  convention: ProblemConvention = 'course',
): ProblemDefinition {
  return {
    format: 2,
    title: 'Test',
    tags: { topics: [], difficulty: 'standard', level: 'second-year' },
    convention,
    prompt: '',
    givens,
    constraints: [],
    physics,
    finds,
  }
}

function variant(
  def: ProblemDefinition,
  seed: number,
  convention: 'engineering' | 'chemistry' = 'engineering',
): Variant {
  const r = drawVariant(def, seed, { convention })
  if (!r.ok) throw new Error(JSON.stringify(r.error))
  return r.variant
}
const keyOf = (v: Variant, name: string): number => v.key.find((k) => k.name === name)!.value
const givenOf = (v: Variant, name: string): number => v.givens.find((g) => g.name === name)!.value

// An air-standard Otto cycle on a gas with R and γ = 1.4 given outright, as a general cycle.
const otto = problem(
  [
    { name: 'T1', label: 'intake temperature', unit: 'K', rule: { kind: 'range', min: 280, max: 320, step: 5 } },
    { name: 'p1', label: 'intake pressure', unit: 'kPa', rule: { kind: 'range', min: 90, max: 110, step: 5 } },
    { name: 'r', label: 'compression ratio', unit: '', rule: { kind: 'range', min: 6, max: 12, step: 0.5 } },
    { name: 'qin', label: 'heat added', unit: 'kJ/kg', rule: { kind: 'range', min: 600, max: 1200, step: 50 } },
  ],
  {
    kind: 'cycle',
    cycle: {
      gas: { R: '287 J/(kg K)', gamma: 1.4 },
      system: 'closed',
      states: [{ p: 'p1', T: 'T1' }, {}, {}, {}],
      steps: [
        { process: 'isentropic', compressionRatio: 'r' },
        { process: 'isochoric', heat: 'qin' },
        { process: 'isentropic' },
        { process: 'isochoric' },
      ],
    },
  },
  [
    find('eta', out('totals.efficiency'), ''),
    find('etaPct', out('totals.efficiency'), '%'),
    find('wnet', out('totals.netWork'), 'kJ/kg'),
    find('T1C', out('states.1.T'), 'degC'),
    find('p2', out('states.2.p'), 'kPa'),
    find('qout', expr('qin - wnet'), 'kJ/kg'),
    find('wJ', expr('wnet'), 'J/kg'),
  ],
)

test.each([1, 2, 3, 42, 1000])(
  'Otto, seed %d: η = 1 − r^(1−γ) and w_net = η·q_in in kJ/kg (Çengel & Boles, Otto cycle relations, from memory)',
  (seed) => {
    const v = variant(otto, seed)
    const r = givenOf(v, 'r')
    const eta = 1 - r ** (1 - 1.4)
    expect(keyOf(v, 'eta')).toBeCloseTo(eta, 9)
    expect(keyOf(v, 'etaPct')).toBeCloseTo(100 * eta, 7)
    expect(keyOf(v, 'wnet')).toBeCloseTo(eta * givenOf(v, 'qin'), 6)
    // isentropic compression of an ideal gas: p2 = p1·r^γ (same source)
    expect(keyOf(v, 'p2')).toBeCloseTo(givenOf(v, 'p1') * r ** 1.4, 6)
    // 0 °C = 273.15 K (SI Brochure, from memory)
    expect(keyOf(v, 'T1C')).toBeCloseTo(givenOf(v, 'T1') - 273.15, 9)
    // first law over the cycle: q_out = q_in − w_net (common practice)
    expect(keyOf(v, 'qout')).toBeCloseTo(givenOf(v, 'qin') * (1 - eta), 6)
    expect(keyOf(v, 'wJ')).toBeCloseTo(1000 * keyOf(v, 'wnet'), 3)
    expect(v.key.map((k) => [k.name, k.unit, k.path])).toEqual([
      ['eta', '', 'totals.efficiency'],
      ['etaPct', '%', 'totals.efficiency'],
      ['wnet', 'kJ/kg', 'totals.netWork'],
      ['T1C', 'degC', 'states.1.T'],
      ['p2', 'kPa', 'states.2.p'],
      ['qout', 'kJ/kg', null],
      ['wJ', 'J/kg', null],
    ])
  },
)

test('the same seed gives an identical variant; different seeds usually differ', () => {
  expect(variant(otto, 77)).toEqual(variant(otto, 77))
  const keys = new Set(Array.from({ length: 20 }, (_, i) => JSON.stringify(variant(otto, i + 1).key)))
  expect(keys.size).toBeGreaterThan(15)
})

test('the variant carries the spec it solved: solving that spec again gives the same solution', () => {
  const v = variant(otto, 5)
  expect(solveSpec(v.spec)).toEqual(v.solution)
  expect(v.spec.convention).toBe('engineering')
})

test('Rankine: the turbine exit quality of the key equals solveSpec of the same spec', () => {
  const def = problem(
    [
      { name: 'pb', label: 'boiler pressure', unit: 'MPa', rule: { kind: 'range', min: 3, max: 15, step: 0.5 } },
      {
        name: 'Tin',
        label: 'turbine inlet temperature',
        unit: 'degC',
        rule: { kind: 'range', min: 400, max: 600, step: 25 },
      },
    ],
    {
      kind: 'template',
      template: 'rankine',
      inputs: { boilerPressure: 'pb', condenserPressure: '10 kPa', turbineInletTemperature: 'Tin' },
    },
    [
      find('x4', out('totals.turbineExitQuality'), ''),
      find('eta', out('totals.efficiency'), '%'),
      find('h1', out('states.1.h'), 'kJ/kg'),
    ],
  )
  for (const seed of [1, 2, 3]) {
    const v = variant(def, seed)
    expect(v.spec).toEqual({
      template: 'rankine',
      inputs: {
        boilerPressure: `${givenOf(v, 'pb')} MPa`,
        condenserPressure: '10 kPa',
        turbineInletTemperature: `${givenOf(v, 'Tin')} degC`,
      },
      convention: 'engineering',
    })
    const direct = solveSpec({
      template: 'rankine',
      inputs: {
        boilerPressure: `${givenOf(v, 'pb')} MPa`,
        condenserPressure: '10 kPa',
        turbineInletTemperature: `${givenOf(v, 'Tin')} °C`,
      },
    })
    if (!direct.ok) throw new Error(direct.error.message)
    expect(keyOf(v, 'x4')).toBe(readQuantity(direct, 'totals.turbineExitQuality'))
    expect(keyOf(v, 'x4')).toBeGreaterThan(0.7)
    expect(keyOf(v, 'x4')).toBeLessThan(1)
    expect(keyOf(v, 'eta')).toBeCloseTo(100 * readQuantity(direct, 'totals.efficiency')!, 9)
    // saturated liquid at 10 kPa: h_f ≈ 191.8 kJ/kg (Çengel & Boles, Table A-5, from memory)
    expect(keyOf(v, 'h1')).toBeCloseTo(191.8, 0)
  }
})

test.each([
  ['engineering', 'course', 'chemistry', -1],
  ['engineering', 'course', 'engineering', 1],
  ['chemistry', 'engineering', 'chemistry', -1],
  ['chemistry', 'chemistry', 'engineering', 1],
] as const)('a %s key vs a problem fixed to %s, course %s: net work sign ×%d', (refConv, problemConv, course, sign) => {
  const ref = variant({ ...otto, convention: refConv }, 9, refConv)
  const v = variant({ ...otto, convention: problemConv }, 9, course)
  expect(v.convention).toBe(resolveConvention({ ...otto, convention: problemConv }, course))
  expect(keyOf(v, 'wnet')).toBeCloseTo(sign * keyOf(ref, 'wnet'), 9)
  expect(keyOf(v, 'eta')).toBeCloseTo(keyOf(ref, 'eta'), 12)
})

test.each([
  ['course', 'chemistry', 'chemistry'],
  ['course', 'engineering', 'engineering'],
  ['engineering', 'chemistry', 'engineering'],
  ['chemistry', 'engineering', 'chemistry'],
] as const)('resolveConvention(%s, course %s) = %s', (own, course, expected) => {
  expect(resolveConvention({ ...otto, convention: own }, course)).toBe(expected)
})

test.each([
  ['a path to nothing', find('x', out('states.9.T'), 'K'), 'find-undefined', /"states\.9\.T"/],
  [
    'a null output (no COP for an engine)',
    find('x', out('totals.copRefrigerator'), ''),
    'find-undefined',
    /totals\.copRefrigerator/,
  ],
  ['an output in the wrong unit', find('x', out('totals.efficiency'), 'kPa'), 'invalid-definition', /kPa/],
  ['an expression of the wrong dimension', find('x', expr('T1 * 2'), 'kJ/kg'), 'invalid-definition', /kJ\/kg/],
  ['an expression over a later find', find('x', expr('later * 2'), 'K'), 'invalid-definition', /"later"/],
  ['an unreadable unit', find('x', out('states.1.T'), 'kelvinoids'), 'invalid-definition', /kelvinoids/],
] as const)('%s is an error naming the find', (_what, bad, code, message) => {
  const def = {
    ...otto,
    finds: [find('eta', out('totals.efficiency'), ''), bad, find('later', out('states.1.T'), 'K')],
  }
  const r = drawVariant(def, 1, { convention: 'engineering' })
  expect(r.ok).toBe(false)
  if (r.ok) return
  expect(r.seed).toBe(1)
  expect(r.error.code).toBe(code)
  expect(r.error.property).toBe('x')
  expect(r.error.message).toContain('Find "x"')
  expect(r.error.message).toMatch(message)
})

test('a Brayton variant whose turbine inlet is below the compressor exit is a solve-error with the solver message', () => {
  const def = problem(
    [{ name: 'TIT', label: 'turbine inlet temperature', unit: 'K', rule: { kind: 'choice', values: [450] } }],
    {
      kind: 'template',
      template: 'brayton',
      inputs: { gas: 'air', p1: '100 kPa', T1: '300 K', pressureRatio: '12', turbineInletT: 'TIT' },
    },
    [find('eta', out('totals.efficiency'), '')],
  )
  const r = drawVariant(def, 1, { convention: 'engineering' })
  expect(r.ok).toBe(false)
  if (!r.ok) {
    expect(r.error.code).toBe('solve-error')
    expect(r.error.message.length).toBeGreaterThan(10)
    // The solver blames state 3's temperature, which no input of the problem names as such.
    expect(r.error.property).toBe('physics')
  }
})

const ottoInputs = { gas: 'air', p1: '100 kPa', T1: '300 K', compressionRatio: '8', heatIn: '800 kJ/kg' }
const rankineInputs = { boilerPressure: '10 MPa', condenserPressure: '10 kPa', turbineInletTemperature: '500 degC' }

test.each<[string, Given[], Physics, string, RegExp]>([
  // r = V_max/V_min > 1 by definition (Çengel & Boles, Otto cycle, from memory)
  [
    'an Otto compression ratio below 1, written as a literal',
    [],
    { kind: 'template', template: 'otto', inputs: { ...ottoInputs, compressionRatio: '0.5' } },
    'physics.inputs.compressionRatio',
    /compressionRatio must exceed 1/,
  ],
  [
    'an Otto compression ratio below 1, drawn from a given',
    [{ name: 'r', label: 'compression ratio', unit: '', rule: { kind: 'choice', values: [0.5] } }],
    { kind: 'template', template: 'otto', inputs: { ...ottoInputs, compressionRatio: 'r' } },
    'physics.inputs.compressionRatio',
    /exceed 1/,
  ],
  // heat is rejected at the lower of the two pressures (Çengel & Boles, Rankine cycle, from memory)
  [
    'a Rankine condenser pressure above the boiler pressure',
    [],
    { kind: 'template', template: 'rankine', inputs: { ...rankineInputs, condenserPressure: '12 MPa' } },
    'physics.inputs.condenserPressure',
    /below boilerPressure/,
  ],
  // the turbine inlet must be superheated vapour: T_sat(10 MPa) ≈ 311 °C (IAPWS-IF97 tables, from memory)
  [
    'a Rankine turbine inlet below saturation',
    [],
    { kind: 'template', template: 'rankine', inputs: { ...rankineInputs, turbineInletTemperature: '200 degC' } },
    'physics.inputs.turbineInletTemperature',
    /saturation/,
  ],
  [
    'an Otto input that cannot be read',
    [],
    { kind: 'template', template: 'otto', inputs: { ...ottoInputs, T1: 'warm' } },
    'physics.inputs.T1',
    /T1/,
  ],
  [
    'gas constants with a wrong basis (the solver says gas.basis)',
    [],
    { kind: 'template', template: 'otto', inputs: { ...ottoInputs, gas: { basis: 'volume' } as unknown as string } },
    'physics.inputs.gas',
    /gas\.basis/,
  ],
  [
    'a refusal about a state the template builds, not an input',
    [],
    { kind: 'template', template: 'otto', inputs: { ...ottoInputs, heatIn: '-5000 kJ/kg' } },
    'physics',
    /^State 3/,
  ],
  [
    'a solver message that opens with a plain word',
    [],
    { kind: 'template', template: 'otto', inputs: { ...ottoInputs, gas: 'unobtainium' } },
    'physics.inputs.gas',
    /^Unknown gas "unobtainium"/,
  ],
  [
    'a general cycle refused by the solver',
    otto.givens.slice(),
    {
      kind: 'cycle',
      cycle: { ...(otto.physics as { cycle: object }).cycle, states: [{ p: '100 kPa', T: '-3 K' }, {}, {}, {}] },
    },
    'physics.cycle',
    /T must be a positive number/,
  ],
])('%s is a solve-error about %s', (_what, givens, physics, property, message) => {
  const r = drawVariant(problem(givens, physics, [find('eta', out('totals.efficiency'), '')]), 1, {
    convention: 'engineering',
  })
  expect(r.ok).toBe(false)
  if (r.ok) return
  expect(r.error.code).toBe('solve-error')
  expect(r.error.property).toBe(property)
  expect(r.error.message).toMatch(message)
})

test.each([
  ['physics that is not an object', { kind: 'cycle', cycle: 42 }],
  ['an unknown template', { kind: 'template', template: 'no-such', inputs: {} }],
  [
    'a template given a number where text is expected',
    { kind: 'template', template: 'otto', inputs: { p1: { nested: true } } },
  ],
] as const)('%s gives an error result, never a throw', (_what, physics) => {
  const r = drawVariant(problem([], physics as unknown as Physics, []), 1, { convention: 'engineering' })
  expect(r.ok).toBe(false)
})

test('a definition broken past its types (givens not a list) gives invalid-definition, not a throw', () => {
  const r = drawVariant({ ...otto, givens: null } as unknown as ProblemDefinition, 3, { convention: 'engineering' })
  expect(r).toMatchObject({ ok: false, seed: 3, error: { code: 'invalid-definition' } })
})

// ---- A find states its sense -----------------------------------------------------------

test.each(['engineering', 'chemistry'] as const)(
  'Otto, %s course: net work with the sense "by the system" is +(q_in − q_out) (for a cycle, net work done by the gas = heat in − heat out, common practice)',
  (course) => {
    const def = {
      ...otto,
      finds: [
        find('wnet', out('totals.netWork'), 'kJ/kg', { sense: 'work-by-system' }),
        find('qin', out('totals.heatIn'), 'kJ/kg'),
        find('qout', out('totals.heatOut'), 'kJ/kg'),
      ],
    }
    for (const seed of [1, 2, 42]) {
      const v = variant(def, seed, course)
      expect(v.convention).toBe(course)
      const byGas = keyOf(v, 'qin') - keyOf(v, 'qout')
      expect(byGas).toBeGreaterThan(0)
      expect(keyOf(v, 'wnet')).toBeCloseTo(byGas, 6)
      expect(v.key[0]!.flipped === true).toBe(course === 'chemistry')
    }
  },
)

test.each(['engineering', 'chemistry'] as const)(
  'Otto, %s course: net work with the sense "on the system" is −(q_in − q_out)',
  (course) => {
    const def = {
      ...otto,
      finds: [
        find('wnet', out('totals.netWork'), 'kJ/kg', { sense: 'work-on-system' }),
        find('qin', out('totals.heatIn'), 'kJ/kg'),
        find('qout', out('totals.heatOut'), 'kJ/kg'),
      ],
    }
    const v = variant(def, 3, course)
    expect(keyOf(v, 'wnet')).toBeLessThan(0)
    expect(keyOf(v, 'wnet')).toBeCloseTo(-(keyOf(v, 'qin') - keyOf(v, 'qout')), 6)
  },
)

test('without a sense the convention decides the sign of the net work, as before', () => {
  const def = { ...otto, finds: [find('wnet', out('totals.netWork'), 'kJ/kg')] }
  const eng = keyOf(variant(def, 4, 'engineering'), 'wnet')
  const chem = keyOf(variant(def, 4, 'chemistry'), 'wnet')
  expect(eng).toBeGreaterThan(0)
  expect(chem).toBeCloseTo(-eng, 9)
})

test('heat senses: the heat of step 4→1 "out of the system" is positive, the heat out "into the system" negative, in both conventions', () => {
  const def = {
    ...otto,
    finds: [
      find('q41', out('steps.4.q'), 'kJ/kg', { sense: 'heat-out-of-system' }),
      find('qoutIn', out('totals.heatOut'), 'kJ/kg', { sense: 'heat-into-system' }),
      find('q41raw', out('steps.4.q'), 'kJ/kg'),
    ],
  }
  for (const course of ['engineering', 'chemistry'] as const) {
    const v = variant(def, 6, course)
    expect(keyOf(v, 'q41raw')).toBeLessThan(0) // heat into the system during heat rejection
    expect(keyOf(v, 'q41')).toBeCloseTo(-keyOf(v, 'q41raw'), 9)
    expect(keyOf(v, 'qoutIn')).toBeCloseTo(keyOf(v, 'q41raw'), 6)
  }
})

test.each(['engineering', 'chemistry'] as const)(
  'the Otto demo, %s course: net work stated "by the system" keys +(q_in − q_out), "on the system" −(q_in − q_out) (for a cycle, net work done by the gas = heat in − heat out, common practice)',
  async (course) => {
    const { DEMO_PROBLEMS } = await import('#seed/problems.ts')
    const demo = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition
    const withSense = (sense: 'work-by-system' | 'work-on-system'): ProblemDefinition => ({
      ...demo,
      finds: demo.finds.map((f) => (f.name === 'wNet' ? { ...f, sense } : f)),
    })
    for (const seed of [11, 4242]) {
      const by = variant(withSense('work-by-system'), seed, course)
      const sol = by.solution as { totals: { heatIn: { value: number }; heatOut: { value: number } } }
      const byGasKJ = (sol.totals.heatIn.value - sol.totals.heatOut.value) / 1000
      expect(byGasKJ).toBeGreaterThan(0)
      expect(keyOf(by, 'wNet')).toBeCloseTo(byGasKJ, 6)
      expect(keyOf(variant(withSense('work-on-system'), seed, course), 'wNet')).toBeCloseTo(-byGasKJ, 6)
    }
  },
)

test('a solver refusal about one heater is placed on that heater’s field, not on the whole list', () => {
  const physics: Physics = {
    kind: 'template',
    template: 'rankine-feedwater',
    inputs: {
      boilerPressure: '10 MPa',
      condenserPressure: '10 kPa',
      turbineInletTemperature: '500 °C',
      heaters: [
        { kind: 'open', pressure: '0.4 MPa' },
        { kind: 'closed', pressure: '2 MPa' },
      ],
    },
  }
  expect(solverErrorPath(physics, 'heaters.1.pressure')).toBe('physics.inputs.heaters.1.pressure')
  expect(solverErrorPath(physics, 'heaters.0')).toBe('physics.inputs.heaters.0')
  expect(solverErrorPath(physics, 'heaters.7.pressure')).toBe('physics.inputs.heaters')
  expect(solverErrorPath(physics, 'heaters')).toBe('physics.inputs.heaters')
  expect(solverErrorPath(physics, 'boilerPressure')).toBe('physics.inputs.boilerPressure')
  expect(solverErrorPath(physics, 'nothingLikeThis')).toBe('physics')
})
