import { expect, test } from 'vitest'
import type { Find, Given, ProblemDefinition, TemplateInputValue } from './definition.ts'
import { lintDefinition, lintWarnings } from './lint.ts'

const rel = { kind: 'relative', value: 0.01 } as const
const good: ProblemDefinition = {
  format: 2,
  title: 'Otto cycle',
  tags: { topics: ['otto'], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: 'Air enters at [T1] and [p1]; the compression ratio is [r]. Find the efficiency.',
  givens: [
    { name: 'T1', label: 'intake temperature', unit: 'K', rule: { kind: 'range', min: 280, max: 320, step: 5 } },
    { name: 'p1', label: 'intake pressure', unit: 'kPa', rule: { kind: 'range', min: 90, max: 110, step: 5 } },
    { name: 'r', label: 'compression ratio', unit: '', rule: { kind: 'range', min: 6, max: 12, step: 0.5 } },
    { name: 'T1C', label: 'intake temperature in °C', unit: 'degC', rule: { kind: 'expression', expression: 'T1' } },
  ],
  constraints: [{ left: 'T1', op: '>', right: '275 K' }],
  physics: {
    kind: 'template',
    template: 'otto',
    inputs: { gas: 'air', p1: 'p1', T1: 'T1C', compressionRatio: 'r', heatIn: '800 kJ/kg' },
  },
  finds: [
    {
      name: 'eta',
      label: 'efficiency',
      source: { kind: 'output', path: 'totals.efficiency' },
      unit: '%',
      points: 2,
      tolerance: rel,
      pitfalls: [],
    },
    {
      name: 'wnet',
      label: 'net work',
      source: { kind: 'output', path: 'totals.netWork' },
      unit: 'kJ/kg',
      points: 2,
      tolerance: rel,
      pitfalls: [],
    },
    {
      name: 'qout',
      label: 'heat out',
      source: { kind: 'expression', expression: '800 kJ/kg - wnet' },
      unit: 'kJ/kg',
      points: 1,
      tolerance: rel,
      pitfalls: [],
    },
  ],
}

type Edit = (d: ProblemDefinition) => ProblemDefinition
const givenAt = (d: ProblemDefinition, i: number, g: Partial<Given>): ProblemDefinition => ({
  ...d,
  givens: d.givens.map((x, j) => (j === i ? { ...x, ...g } : x)),
})
const findAt = (d: ProblemDefinition, i: number, f: Partial<Find>): ProblemDefinition => ({
  ...d,
  finds: d.finds.map((x, j) => (j === i ? { ...x, ...f } : x)),
})
const inputs = (d: ProblemDefinition, change: Record<string, string | undefined>): ProblemDefinition => {
  if (d.physics.kind !== 'template') throw new Error('template expected')
  const next: Record<string, TemplateInputValue> = {}
  for (const [k, v] of Object.entries({ ...d.physics.inputs, ...change })) if (v !== undefined) next[k] = v
  return { ...d, physics: { ...d.physics, inputs: next } }
}

test('a sound problem has no findings', () => {
  expect(lintDefinition(good)).toEqual([])
})

test.each<[string, string, Edit, RegExp]>([
  ['a duplicate given name', 'givens.1.name', (d) => givenAt(d, 1, { name: 'T1' }), /already used by given 1/],
  ['a find named like a given', 'finds.0.name', (d) => findAt(d, 0, { name: 'r' }), /already used by given 3/],
  ['a name that is not an identifier', 'givens.2.name', (d) => givenAt(d, 2, { name: '2r' }), /not a usable name/],
  [
    'a zero step',
    'givens.0.rule.step',
    (d) => givenAt(d, 0, { rule: { kind: 'range', min: 280, max: 320, step: 0 } }),
    /greater than 0/,
  ],
  [
    'max below min',
    'givens.0.rule.max',
    (d) => givenAt(d, 0, { rule: { kind: 'range', min: 320, max: 280, step: 5 } }),
    /below min/,
  ],
  [
    'an empty choice',
    'givens.2.rule.values',
    (d) => givenAt(d, 2, { rule: { kind: 'choice', values: [] } }),
    /at least one/,
  ],
  [
    'an expression that does not compile',
    'givens.3.rule.expression',
    (d) => givenAt(d, 3, { rule: { kind: 'expression', expression: 'T1 *' } }),
    /could not be read/,
  ],
  [
    'an expression over a later given',
    'givens.0.rule.expression',
    (d) => givenAt(d, 0, { rule: { kind: 'expression', expression: 'T1C' } }),
    /"T1C" before it is defined/,
  ],
  [
    'an expression over an unknown name',
    'givens.3.rule.expression',
    (d) => givenAt(d, 3, { rule: { kind: 'expression', expression: 'T9 + 1 K' } }),
    /"T9"/,
  ],
  ['a given unit we cannot read', 'givens.1.unit', (d) => givenAt(d, 1, { unit: 'kPaa' }), /"kPaa"/],
  [
    'a constraint side that does not compile',
    'constraints.0.left',
    (d) => ({ ...d, constraints: [{ left: 'T1 +', op: '>', right: '275 K' }] }),
    /could not be read/,
  ],
  [
    'a constraint over an unknown name',
    'constraints.0.right',
    (d) => ({ ...d, constraints: [{ left: 'T1', op: '>', right: 'Tlow' }] }),
    /"Tlow"/,
  ],
  [
    'a template that does not exist',
    'physics.template',
    (d) => ({ ...d, physics: { kind: 'template', template: 'ottoo', inputs: {} } }),
    /no template "ottoo"/,
  ],
  [
    'an input the template does not take',
    'physics.inputs.cutoffRatio',
    (d) => inputs(d, { cutoffRatio: '2' }),
    /has no input "cutoffRatio"/,
  ],
  [
    'a required input missing',
    'physics.inputs.compressionRatio',
    (d) => inputs(d, { compressionRatio: undefined }),
    /needs "compressionRatio"/,
  ],
  [
    'a Rankine required input missing',
    'physics.inputs.reheatPressure',
    (d) => ({
      ...d,
      physics: {
        kind: 'template',
        template: 'rankine-reheat',
        inputs: { boilerPressure: '10 MPa', condenserPressure: '10 kPa', reheatTemperature: '500 degC' },
      },
    }),
    /needs "reheatPressure"/,
  ],
  [
    'a Rankine input that is not one',
    'physics.inputs.T1',
    (d) => ({
      ...d,
      physics: {
        kind: 'template',
        template: 'rankine',
        inputs: { boilerPressure: '10 MPa', condenserPressure: '10 kPa', T1: 'T1' },
      },
    }),
    /has no input "T1"/,
  ],
  [
    'an @{name} in the physics that names no given',
    'physics.inputs.heatIn',
    (d) => inputs(d, { heatIn: '@{q} ' }),
    /@\{q\} names no given/,
  ],
  ['a find unit we cannot read', 'finds.1.unit', (d) => findAt(d, 1, { unit: 'kJ/kgg' }), /"kJ\/kgg"/],
  [
    'a find expression over a later find',
    'finds.1.source.expression',
    (d) => findAt(d, 1, { source: { kind: 'expression', expression: 'qout * 2' } }),
    /"qout" before it is defined/,
  ],
  [
    'a find expression that does not compile',
    'finds.2.source.expression',
    (d) => findAt(d, 2, { source: { kind: 'expression', expression: '800 kJ/kg - - ' } }),
    /could not be read/,
  ],
  [
    'a negative tolerance',
    'finds.0.tolerance.value',
    (d) => findAt(d, 0, { tolerance: { kind: 'relative', value: -0.01 } }),
    /≥ 0/,
  ],
  [
    'a tolerance unit that does not fit',
    'finds.1.tolerance.unit',
    (d) => findAt(d, 1, { tolerance: { kind: 'absolute', value: 1, unit: 'K' } }),
    /does not fit/,
  ],
  [
    'a placeholder in the prompt naming no given',
    'prompt',
    (d) => ({ ...d, prompt: 'Heat [q23] is added at [T1].' }),
    /placeholder \[q23\] names no given \(the givens are T1, /,
  ],
  [
    'an output path that is not in the solution',
    'finds.0.source.path',
    (d) => findAt(d, 0, { source: { kind: 'output', path: 'totals.efficency' } }),
    /no number at "totals\.efficency"/,
  ],
  [
    'an output path past the last state',
    'finds.0.source.path',
    (d) => findAt(d, 0, { source: { kind: 'output', path: 'states.7.T' }, unit: 'K' }),
    /states\.7\.T/,
  ],
  [
    'an output in a unit of another dimension',
    'finds.1.unit',
    (d) => findAt(d, 1, { unit: 'K' }),
    /cannot be stated in "K"/,
  ],
  [
    'a relative tolerance on a key of zero',
    'finds.2.tolerance',
    (d) => findAt(d, 2, { source: { kind: 'expression', expression: 'wnet - wnet' } }),
    /use an absolute tolerance/,
  ],
  [
    'a relative tolerance on a °C value',
    'finds.3.tolerance',
    (d) => ({
      ...d,
      finds: [
        ...d.finds,
        {
          name: 'T1out',
          label: 'T1',
          source: { kind: 'output', path: 'states.1.T' },
          unit: 'degC',
          points: 1,
          tolerance: rel,
          pitfalls: [],
        },
      ],
    }),
    /absolute scale/,
  ],
  [
    'an expression given with no real value in the trial',
    'givens.3.rule.expression',
    (d) => givenAt(d, 3, { rule: { kind: 'expression', expression: 'T1 + sqrt(200 K^2 - T1^2) / 1' } }),
    /no real value/,
  ],
  ['a trial variant that does not solve', 'physics', (d) => inputs(d, { heatIn: '-5000 kJ/kg' }), /does not solve/],
  // r = V_max/V_min > 1 by definition (Çengel & Boles, Otto cycle, from memory)
  [
    'a compression ratio the solver refuses',
    'physics.inputs.compressionRatio',
    (d) => inputs(d, { compressionRatio: '0.5' }),
    /does not solve: compressionRatio must exceed 1/,
  ],
  [
    'a gas the solver does not know',
    'physics.inputs.gas',
    (d) => inputs(d, { gas: 'unobtainium' }),
    /unknown gas "unobtainium"/,
  ],
  // heat is rejected at the lower of the two pressures (Çengel & Boles, Rankine cycle, from memory)
  [
    'a Rankine condenser pressure above the boiler pressure',
    'physics.inputs.condenserPressure',
    (d) => ({
      ...d,
      physics: {
        kind: 'template',
        template: 'rankine',
        inputs: { boilerPressure: '10 MPa', condenserPressure: '12 MPa', turbineInletTemperature: '500 degC' },
      },
    }),
    /condenserPressure must be below boilerPressure/,
  ],
  [
    'a general cycle that does not solve',
    'physics.cycle',
    (d) => ({
      ...d,
      physics: {
        kind: 'cycle',
        cycle: {
          gas: 'air',
          system: 'closed',
          states: [{ p: 'p1', T: '-3 K' }, {}, {}, {}],
          steps: [
            { process: 'isentropic', compressionRatio: 'r' },
            { process: 'isochoric', heat: '800 kJ/kg' },
            { process: 'isentropic' },
            { process: 'isochoric' },
          ],
        },
      },
    }),
    /does not solve/,
  ],
  [
    'a constraint never met in the trial',
    'constraints.0',
    (d) => ({ ...d, constraints: [{ left: 'T1', op: '>', right: '400 K', message: 'T1 must exceed 400 K' }] }),
    /T1 must exceed 400 K/,
  ],
  [
    '°C-for-K ticked where no °C reaches the solver',
    'finds.0.pitfalls',
    (d) => findAt(givenAt(d, 3, { unit: 'K' }), 0, { pitfalls: ['celsius-for-kelvin'] }),
    /"celsius-for-kelvin" can never be recognised here: no temperature in °C reaches the solver/,
  ],
  [
    'a pitfall ticked on an expression find',
    'finds.2.pitfalls',
    (d) => findAt(d, 2, { pitfalls: ['kilo-factor'] }),
    /only on a find that comes from a solver output/,
  ],
  [
    'the sign pitfall ticked on an efficiency',
    'finds.0.pitfalls',
    (d) => findAt(d, 0, { pitfalls: ['sign-convention-flipped'] }),
    /"totals\.efficiency" does not depend on the convention/,
  ],
  [
    'a sense on an output that is neither work nor heat',
    'finds.0.sense',
    (d) => findAt(d, 0, { sense: 'work-by-system' }),
    /"totals\.efficiency" is neither/,
  ],
  [
    'a heat sense on a work output',
    'finds.1.sense',
    (d) => findAt(d, 1, { sense: 'heat-into-system' }),
    /"totals\.netWork" is a work output, but the sense says heat into the system/,
  ],
])('%s is reported at %s', (_what, path, edit, message) => {
  const findings = lintDefinition(edit(good))
  const at = findings.filter((f) => f.path === path)
  expect(at.length, JSON.stringify(findings)).toBeGreaterThan(0)
  expect(
    at.some((f) => message.test(f.message)),
    JSON.stringify(at),
  ).toBe(true)
  for (const f of findings) expect(f.message).toMatch(/^[A-Z@"].*[.]$/)
})

test('a definition broken past its types gives a finding, not a throw', () => {
  expect(lintDefinition({ ...good, finds: null } as unknown as ProblemDefinition).length).toBeGreaterThan(0)
})

test('a °C given that reaches the solver lets the °C-for-K pitfall be ticked, and the net work takes the sign pitfall', () => {
  // good's T1 input is the given T1C, in degC.
  expect(
    lintDefinition(
      findAt(findAt(good, 0, { pitfalls: ['celsius-for-kelvin'] }), 1, {
        pitfalls: ['sign-convention-flipped', 'kilo-factor'],
      }),
    ),
  ).toEqual([])
})

// ---- Warnings: the question's words against the key's sign ----------------------------

const worded = (
  label: string,
  extra: Partial<Find> = {},
  convention: ProblemDefinition['convention'] = 'course',
): ProblemDefinition => ({ ...findAt(good, 1, { label, ...extra }), convention })
const warningsAt = (d: ProblemDefinition, visibility?: 'private' | 'department' | 'installation') =>
  lintWarnings(d, visibility ? { visibility } : {}).filter((f) => f.path === 'finds.1.sense')

test.each([
  [
    '"work done by the air (positive)" with no sense, course convention',
    worded('Work done by the air (positive)'),
    /"by the air" \(work done by the system\), but in a chemistry-convention course the key is the work done on the system/,
  ],
  [
    '"work done by the gas" with no sense, chemistry convention fixed',
    worded('Net work done by the gas', {}, 'chemistry'),
    /in the chemistry convention this problem uses the key is the work done on the system/,
  ],
  [
    '"work done on the working fluid" with no sense, course convention',
    worded('Work done on the working fluid'),
    /"done on the working fluid" \(work done on the system\), but in an engineering-convention course the key is the work done by the system/,
  ],
  [
    '"work done by the air" with the sense "on"',
    worded('Work done by the air', { sense: 'work-on-system' }),
    /the find's sense is work done on the system, so the key has the opposite sign to the words/,
  ],
  [
    '"heat rejected" on the heat of a step (heat into the system)',
    { ...worded('Heat rejected in 4→1', { source: { kind: 'output', path: 'steps.4.q' } }) },
    /"rejected" \(heat out of the system\), but the key \("steps\.4\.q"\) is the heat into the system in every convention, with the opposite sign/,
  ],
  [
    '"heat added" with the sense "out of"',
    worded('Heat added in 2→3', { source: { kind: 'output', path: 'steps.2.q' }, sense: 'heat-out-of-system' }),
    /"added" \(heat into the system\), but the find's sense is heat out of the system/,
  ],
])('warns: %s', (_what, def, message) => {
  const w = warningsAt(def)
  expect(w.length, JSON.stringify(w)).toBe(1)
  expect(w[0]!.message).toMatch(message)
  expect(lintDefinition(def).filter((f) => f.path === 'finds.1.sense')).toEqual([]) // a warning, not a refusal
})

test.each([
  [
    '"work done by the air" with the sense "by"',
    worded('Work done by the air (positive)', { sense: 'work-by-system' }),
  ],
  [
    '"work done by the gas" in a problem fixed to the engineering convention',
    worded('Work done by the gas', {}, 'engineering'),
  ],
  [
    '"work done on the gas" in a problem fixed to the chemistry convention',
    worded('Work done on the gas', {}, 'chemistry'),
  ],
  [
    '"heat rejected" on the heat out (a size)',
    worded('Heat rejected per kilogram', { source: { kind: 'output', path: 'totals.heatOut' } }),
  ],
  [
    '"heat rejected" on a step stated "out of"',
    worded('Heat rejected in 4→1', { source: { kind: 'output', path: 'steps.4.q' }, sense: 'heat-out-of-system' }),
  ],
  ['a question that says neither way', worded('Net work per kilogram of air')],
  ['a question that says both ways', worded('Work done by the gas, or on the gas?')],
])('no warning: %s', (_what, def) => {
  expect(warningsAt(def)).toEqual([])
})

test('a work or heat find with no sense is flagged only when the problem is shared with other courses', () => {
  const plain = worded('Net work per kilogram of air')
  expect(warningsAt(plain, 'private')).toEqual([])
  for (const visibility of ['department', 'installation'] as const) {
    const [w] = warningsAt(plain, visibility)
    expect(w?.message).toMatch(
      /shared with other courses, and this find's key changes sign with the course's convention/,
    )
  }
  expect(warningsAt(worded('Net work per kilogram of air', { sense: 'work-by-system' }), 'department')).toEqual([])
  // An efficiency is neither work nor heat: nothing to state.
  expect(lintWarnings(good, { visibility: 'installation' }).filter((f) => f.path === 'finds.0.sense')).toEqual([])
  // A heat size is flagged too, in other words, so every shared key's sign is written down.
  const heat = worded('Heat supplied', { source: { kind: 'output', path: 'totals.heatIn' } })
  expect(warningsAt(heat, 'department')[0]?.message).toMatch(/state this heat find's sense/)
})
