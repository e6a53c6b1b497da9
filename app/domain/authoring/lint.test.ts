import { expect, test } from 'vitest'
import type { Find, Given, ProblemDefinition } from './definition.ts'
import { lintDefinition } from './lint.ts'

const rel = { kind: 'relative', value: 0.01 } as const
const good: ProblemDefinition = {
  format: 1,
  title: 'Otto cycle',
  tags: { topics: ['otto'], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: 'Air enters at @{T1} and @{p1}; the compression ratio is @{r}. Find the efficiency.',
  givens: [
    { name: 'T1', label: 'intake temperature', unit: 'K', rule: { kind: 'range', min: 280, max: 320, step: 5 } },
    { name: 'p1', label: 'intake pressure', unit: 'kPa', rule: { kind: 'range', min: 90, max: 110, step: 5 } },
    { name: 'r', label: 'compression ratio', unit: '', rule: { kind: 'range', min: 6, max: 12, step: 0.5 } },
    { name: 'T1C', label: 'intake temperature in °C', unit: 'degC', rule: { kind: 'expression', expression: 'T1' } },
  ],
  constraints: [{ left: 'T1', op: '>', right: '275 K' }],
  physics: { kind: 'template', template: 'otto', inputs: { gas: 'air', p1: 'p1', T1: 'T1C', compressionRatio: 'r', heatIn: '800 kJ/kg' } },
  finds: [
    { name: 'eta', label: 'efficiency', source: { kind: 'output', path: 'totals.efficiency' }, unit: '%', points: 2, tolerance: rel, pitfalls: [] },
    { name: 'wnet', label: 'net work', source: { kind: 'output', path: 'totals.netWork' }, unit: 'kJ/kg', points: 2, tolerance: rel, pitfalls: [] },
    { name: 'qout', label: 'heat out', source: { kind: 'expression', expression: '800 kJ/kg - wnet' }, unit: 'kJ/kg', points: 1, tolerance: rel, pitfalls: [] },
  ],
}

type Edit = (d: ProblemDefinition) => ProblemDefinition
const givenAt = (d: ProblemDefinition, i: number, g: Partial<Given>): ProblemDefinition => ({ ...d, givens: d.givens.map((x, j) => (j === i ? { ...x, ...g } : x)) })
const findAt = (d: ProblemDefinition, i: number, f: Partial<Find>): ProblemDefinition => ({ ...d, finds: d.finds.map((x, j) => (j === i ? { ...x, ...f } : x)) })
const inputs = (d: ProblemDefinition, change: Record<string, string | undefined>): ProblemDefinition => {
  if (d.physics.kind !== 'template') throw new Error('template expected')
  const next: Record<string, string> = {}
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
  ['a zero step', 'givens.0.rule.step', (d) => givenAt(d, 0, { rule: { kind: 'range', min: 280, max: 320, step: 0 } }), /greater than 0/],
  ['max below min', 'givens.0.rule.max', (d) => givenAt(d, 0, { rule: { kind: 'range', min: 320, max: 280, step: 5 } }), /below min/],
  ['an empty choice', 'givens.2.rule.values', (d) => givenAt(d, 2, { rule: { kind: 'choice', values: [] } }), /at least one/],
  ['an expression that does not compile', 'givens.3.rule.expression', (d) => givenAt(d, 3, { rule: { kind: 'expression', expression: 'T1 *' } }), /could not be read/],
  ['an expression over a later given', 'givens.0.rule.expression', (d) => givenAt(d, 0, { rule: { kind: 'expression', expression: 'T1C' } }), /"T1C" before it is defined/],
  ['an expression over an unknown name', 'givens.3.rule.expression', (d) => givenAt(d, 3, { rule: { kind: 'expression', expression: 'T9 + 1 K' } }), /"T9"/],
  ['a given unit we cannot read', 'givens.1.unit', (d) => givenAt(d, 1, { unit: 'kPaa' }), /"kPaa"/],
  ['a constraint side that does not compile', 'constraints.0.left', (d) => ({ ...d, constraints: [{ left: 'T1 +', op: '>', right: '275 K' }] }), /could not be read/],
  ['a constraint over an unknown name', 'constraints.0.right', (d) => ({ ...d, constraints: [{ left: 'T1', op: '>', right: 'Tlow' }] }), /"Tlow"/],
  ['a template that does not exist', 'physics.template', (d) => ({ ...d, physics: { kind: 'template', template: 'ottoo', inputs: {} } }), /no template "ottoo"/],
  ['an input the template does not take', 'physics.inputs.cutoffRatio', (d) => inputs(d, { cutoffRatio: '2' }), /has no input "cutoffRatio"/],
  ['a required input missing', 'physics.inputs.compressionRatio', (d) => inputs(d, { compressionRatio: undefined }), /needs "compressionRatio"/],
  ['a Rankine required input missing', 'physics.inputs.reheatPressure', (d) => ({ ...d, physics: { kind: 'template', template: 'rankine-reheat', inputs: { boilerPressure: '10 MPa', condenserPressure: '10 kPa', reheatTemperature: '500 degC' } } }), /needs "reheatPressure"/],
  ['a Rankine input that is not one', 'physics.inputs.T1', (d) => ({ ...d, physics: { kind: 'template', template: 'rankine', inputs: { boilerPressure: '10 MPa', condenserPressure: '10 kPa', T1: 'T1' } } }), /has no input "T1"/],
  ['an @{name} in the physics that names no given', 'physics.inputs.heatIn', (d) => inputs(d, { heatIn: '@{q} ' }), /@\{q\} names no given/],
  ['a find unit we cannot read', 'finds.1.unit', (d) => findAt(d, 1, { unit: 'kJ/kgg' }), /"kJ\/kgg"/],
  ['a find expression over a later find', 'finds.1.source.expression', (d) => findAt(d, 1, { source: { kind: 'expression', expression: 'qout * 2' } }), /"qout" before it is defined/],
  ['a find expression that does not compile', 'finds.2.source.expression', (d) => findAt(d, 2, { source: { kind: 'expression', expression: '800 kJ/kg - - ' } }), /could not be read/],
  ['a negative tolerance', 'finds.0.tolerance.value', (d) => findAt(d, 0, { tolerance: { kind: 'relative', value: -0.01 } }), /≥ 0/],
  ['a tolerance unit that does not fit', 'finds.1.tolerance.unit', (d) => findAt(d, 1, { tolerance: { kind: 'absolute', value: 1, unit: 'K' } }), /does not fit/],
  ['a placeholder in the prompt naming no given', 'prompt', (d) => ({ ...d, prompt: 'Heat @{q23} is added at @{T1}.' }), /@\{q23\} names no given/],
  ['an output path that is not in the solution', 'finds.0.source.path', (d) => findAt(d, 0, { source: { kind: 'output', path: 'totals.efficency' } }), /no number at "totals\.efficency"/],
  ['an output path past the last state', 'finds.0.source.path', (d) => findAt(d, 0, { source: { kind: 'output', path: 'states.7.T' }, unit: 'K' }), /states\.7\.T/],
  ['an output in a unit of another dimension', 'finds.1.unit', (d) => findAt(d, 1, { unit: 'K' }), /cannot be stated in "K"/],
  ['a relative tolerance on a key of zero', 'finds.2.tolerance', (d) => findAt(d, 2, { source: { kind: 'expression', expression: 'wnet - wnet' } }), /use an absolute tolerance/],
  ['a relative tolerance on a °C value', 'finds.3.tolerance', (d) => ({ ...d, finds: [...d.finds, { name: 'T1out', label: 'T1', source: { kind: 'output', path: 'states.1.T' }, unit: 'degC', points: 1, tolerance: rel, pitfalls: [] }] }), /absolute scale/],
  ['an expression given with no real value in the trial', 'givens.3.rule.expression', (d) => givenAt(d, 3, { rule: { kind: 'expression', expression: 'T1 + sqrt(200 K^2 - T1^2) / 1' } }), /no real value/],
  ['a trial variant that does not solve', 'physics', (d) => inputs(d, { heatIn: '-5000 kJ/kg' }), /does not solve/],
  // r = V_max/V_min > 1 by definition (Çengel & Boles, Otto cycle, from memory)
  ['a compression ratio the solver refuses', 'physics.inputs.compressionRatio', (d) => inputs(d, { compressionRatio: '0.5' }), /does not solve: compressionRatio must exceed 1/],
  ['a gas the solver does not know', 'physics.inputs.gas', (d) => inputs(d, { gas: 'unobtainium' }), /unknown gas "unobtainium"/],
  // heat is rejected at the lower of the two pressures (Çengel & Boles, Rankine cycle, from memory)
  ['a Rankine condenser pressure above the boiler pressure', 'physics.inputs.condenserPressure', (d) => ({ ...d, physics: { kind: 'template', template: 'rankine', inputs: { boilerPressure: '10 MPa', condenserPressure: '12 MPa', turbineInletTemperature: '500 degC' } } }), /condenserPressure must be below boilerPressure/],
  ['a general cycle that does not solve', 'physics.cycle', (d) => ({ ...d, physics: { kind: 'cycle', cycle: { gas: 'air', system: 'closed', states: [{ p: 'p1', T: '-3 K' }, {}, {}, {}], steps: [{ process: 'isentropic', compressionRatio: 'r' }, { process: 'isochoric', heat: '800 kJ/kg' }, { process: 'isentropic' }, { process: 'isochoric' }] } } }), /does not solve/],
  ['a constraint never met in the trial', 'constraints.0', (d) => ({ ...d, constraints: [{ left: 'T1', op: '>', right: '400 K', message: 'T1 must exceed 400 K' }] }), /T1 must exceed 400 K/],
])('%s is reported at %s', (_what, path, edit, message) => {
  const findings = lintDefinition(edit(good))
  const at = findings.filter((f) => f.path === path)
  expect(at.length, JSON.stringify(findings)).toBeGreaterThan(0)
  expect(at.some((f) => message.test(f.message)), JSON.stringify(at)).toBe(true)
  for (const f of findings) expect(f.message).toMatch(/^[A-Z@"].*[.]$/)
})

test('a definition broken past its types gives a finding, not a throw', () => {
  expect(lintDefinition({ ...good, finds: null } as unknown as ProblemDefinition).length).toBeGreaterThan(0)
})
