import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import {
  definitionFromForm,
  describeField,
  editorStateFromDefinition,
  editorStateFromForm,
  fieldPathForIssue,
  formValuesFromDefinition,
  GENERAL_CYCLE,
  editorStateWithout,
  keepTemplateInputs,
  mergeIssues,
  readRemoveIntent,
  removeIntent,
} from './problem-form.ts'

// Invented demo problems: they exercise every field of the form, not the physics.
const ottoProblem: ProblemDefinition = {
  format: 2,
  title: 'Otto cycle: net work and efficiency',
  tags: { topics: ['otto', 'air standard'], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: 'Air at [p1 in kPa] and [T1] is compressed with ratio [r].\n\nFind $w_{net}$ and $\\eta$.',
  givens: [
    { name: 'T1', label: 'inlet temperature', unit: 'K', rule: { kind: 'range', min: 290, max: 310, step: 5 } },
    {
      name: 'p1',
      label: 'inlet pressure',
      unit: 'kPa',
      rule: { kind: 'choice', values: [95, 100, 105] },
      display: { decimals: 0 },
    },
    {
      name: 'r',
      label: 'compression ratio',
      unit: '',
      rule: { kind: 'range', min: 7, max: 10, step: 0.5 },
      display: { sigFigs: 2 },
    },
    { name: 'gas', label: 'working gas', unit: '', rule: { kind: 'choice', values: ['air', 'diatomic'] } },
    { name: 'q', label: 'heat added', unit: 'kJ/kg', rule: { kind: 'expression', expression: '2.5 * r * 100 kJ/kg' } },
  ],
  constraints: [
    { left: 'T1', op: '<', right: '400 K', message: 'T1 must stay below 400 K' },
    { left: 'r', op: '>=', right: '7' },
  ],
  physics: {
    kind: 'template',
    template: 'otto',
    inputs: { gas: 'gas', p1: 'p1', T1: 'T1', compressionRatio: 'r', heatIn: 'q' },
  },
  finds: [
    {
      name: 'wnet',
      label: 'Net work per kilogram',
      source: { kind: 'output', path: 'totals.netWork' },
      unit: 'kJ/kg',
      points: 2,
      tolerance: { kind: 'relative', value: 0.01 },
      sigFigs: { min: 3 },
      allowBareNumber: true,
      pitfalls: ['kilo-factor', 'sign-convention-flipped'],
      sense: 'work-by-system',
    },
    {
      name: 'dT',
      label: 'Temperature rise in compression',
      source: { kind: 'expression', expression: 'T1 * (r^0.4 - 1)' },
      unit: 'K',
      points: 1.5,
      tolerance: { kind: 'absolute', value: 2, unit: 'K' },
      sigFigs: { min: 2, max: 4 },
      isDifference: true,
      pitfalls: [],
    },
  ],
}

const cycleProblem: ProblemDefinition = {
  format: 2,
  title: 'Three-step cycle',
  tags: { topics: [], difficulty: 'challenging', level: 'upper-level' },
  convention: 'chemistry',
  prompt: 'Two moles go round [pB].',
  givens: [{ name: 'pB', label: 'pressure at B', unit: 'bar', rule: { kind: 'range', min: 2, max: 4, step: 1 } }],
  constraints: [],
  physics: {
    kind: 'cycle',
    cycle: {
      gas: { basis: 'mole', cv: '12.47 J/(mol K)' },
      system: 'closed',
      amount: '2 mol',
      states: [
        { name: 'A', p: '1 bar', V: '40 L' },
        { name: 'B', p: 'pB' },
        { name: 'C', V: '40 L' },
      ],
      steps: [{ process: 'polytropic', n: 1.3 }, { process: 'isobaric' }, { process: 'isochoric' }],
    },
  },
  finds: [
    {
      name: 'W',
      label: 'Net work on the gas',
      source: { kind: 'output', path: 'totals.total.netWork' },
      unit: 'kJ',
      points: 1,
      tolerance: { kind: 'relative', value: 0.02 },
      pitfalls: ['sign-convention-flipped'],
    },
  ],
}

/** A browser's submission of the editor: every value, checkbox groups as repeated fields. */
function toFormData(values: Record<string, string>): FormData {
  const fd = new FormData()
  for (const [k, v] of Object.entries(values)) {
    if (k.endsWith('.pitfalls')) for (const p of v.split(',')) fd.append(k, p)
    else fd.append(k, v)
  }
  return fd
}

/** The blank row the editor shows at the end of each table, as a browser sends it. */
function appendBlankRows(fd: FormData, counts: { givens: number; constraints: number; finds: number }) {
  fd.append(`givens.${counts.givens}.name`, '')
  fd.append(`givens.${counts.givens}.rule.kind`, 'range')
  fd.append(`givens.${counts.givens}.rule.min`, '')
  fd.append(`constraints.${counts.constraints}.left`, '')
  fd.append(`constraints.${counts.constraints}.op`, '<')
  fd.append(`finds.${counts.finds}.name`, '')
  fd.append(`finds.${counts.finds}.source.kind`, 'output')
  fd.append(`finds.${counts.finds}.tolerance.kind`, 'relative')
}

describe('round trip definition → form → definition', () => {
  test.each([
    ['a template problem', ottoProblem],
    ['a general cycle problem', cycleProblem],
  ])('%s comes back unchanged', (_, def) => {
    const fd = toFormData({ ...formValuesFromDefinition(def), visibility: 'department' })
    appendBlankRows(fd, { givens: def.givens.length, constraints: def.constraints.length, finds: def.finds.length })
    const { draft, visibility, formIssues } = definitionFromForm(fd)
    expect(formIssues).toEqual([])
    expect(visibility).toBe('department')
    expect(draft).toEqual(def)
    // No undefined members: the draft is what JSON would carry.
    expect(JSON.parse(JSON.stringify(draft))).toEqual(draft)
  })

  test('a find\'s sense comes back from its select; "No sense stated" (an empty choice) leaves it out', () => {
    const values = formValuesFromDefinition(ottoProblem)
    expect(values['finds.0.sense']).toBe('work-by-system')
    expect(values['finds.1.sense']).toBeUndefined()
    const fd = toFormData({ ...values, 'finds.0.sense': '', 'finds.1.sense': 'heat-out-of-system' })
    const { draft } = definitionFromForm(fd)
    const finds = (draft as ProblemDefinition).finds
    expect(finds[0]).not.toHaveProperty('sense')
    expect(finds[1]!.sense).toBe('heat-out-of-system')
  })

  test('a general cycle is chosen through the physics select', () => {
    const values = formValuesFromDefinition(cycleProblem)
    expect(values['physics.template']).toBe(GENERAL_CYCLE)
    expect(JSON.parse(values['physics.cycle']!)).toEqual((cycleProblem.physics as { cycle: unknown }).cycle)
  })

  test('the editor for a definition shows one blank row after each table', () => {
    expect(editorStateFromDefinition(ottoProblem, 'private').rows).toEqual({ givens: 6, constraints: 3, finds: 3 })
  })
})

describe('rows', () => {
  test('blank rows are dropped wherever they are, and the rest renumbered', () => {
    const fd = new FormData()
    fd.append('givens.0.name', '')
    fd.append('givens.0.rule.kind', 'range')
    fd.append('givens.1.name', 'T1')
    fd.append('givens.1.rule.kind', 'range')
    fd.append('givens.1.rule.min', '300')
    fd.append('givens.1.rule.max', '320')
    fd.append('givens.1.rule.step', '10')
    const { draft } = definitionFromForm(fd)
    expect((draft as ProblemDefinition).givens).toEqual([
      { name: 'T1', label: '', unit: '', rule: { kind: 'range', min: 300, max: 320, step: 10 } },
    ])
    const state = editorStateFromForm(fd)
    expect(state.values['givens.0.name']).toBe('T1')
    expect(state.values['givens.0.rule.min']).toBe('300')
    expect(state.values['givens.1.name']).toBeUndefined()
    expect(state.rows.givens).toBe(2)
  })

  test('a row with its remove box ticked is dropped even when filled', () => {
    const values = formValuesFromDefinition(ottoProblem)
    const fd = toFormData(values)
    fd.append('givens.1._remove', 'on')
    fd.append('finds.0._remove', 'on')
    const { draft } = definitionFromForm(fd)
    const def = draft as ProblemDefinition
    expect(def.givens.map((g) => g.name)).toEqual(['T1', 'r', 'gas', 'q'])
    expect(def.finds.map((f) => f.name)).toEqual(['dT'])
    const state = editorStateFromForm(fd)
    expect(state.values['givens.1.name']).toBe('r')
    expect(state.values['finds.0.name']).toBe('dT')
    expect(Object.keys(state.values).some((k) => k.endsWith('._remove'))).toBe(false)
  })

  test('a "Remove" button names its row; the state without it is renumbered and keeps the rest as typed', () => {
    expect(readRemoveIntent(removeIntent('givens', 3))).toEqual({ table: 'givens', index: 3 })
    expect(readRemoveIntent('remove:finds:0')).toEqual({ table: 'finds', index: 0 })
    for (const bad of ['remove:givens', 'remove:people:1', 'remove:givens:-1', 'save', null, 'remove:givens:99999'])
      expect(readRemoveIntent(bad)).toBeNull()
    const fd = toFormData(formValuesFromDefinition(ottoProblem))
    fd.set('intent', removeIntent('givens', 0))
    fd.set('givens.2.label', 'typed but not saved')
    const state = editorStateWithout(fd, 'givens', 0)
    expect(state.values['givens.0.name']).toBe('p1')
    expect(state.values['givens.1.label']).toBe('typed but not saved')
    expect(state.values.intent).toBeUndefined()
    expect(state.rows.givens).toBe(ottoProblem.givens.length - 1 + 1)
    expect(state.values.prompt).toBe(ottoProblem.prompt)
  })

  test('"add a given" shows one more blank row than was sent; other tables keep one', () => {
    const fd = toFormData(formValuesFromDefinition(ottoProblem))
    appendBlankRows(fd, { givens: 5, constraints: 2, finds: 2 })
    expect(editorStateFromForm(fd, 'givens').rows).toEqual({ givens: 7, constraints: 3, finds: 3 })
    expect(editorStateFromForm(fd).rows).toEqual({ givens: 6, constraints: 3, finds: 3 })
  })

  test('checked pitfalls come back as one value for refilling', () => {
    const fd = toFormData(formValuesFromDefinition(ottoProblem))
    expect(editorStateFromForm(fd).values['finds.0.pitfalls']).toBe('kilo-factor,sign-convention-flipped')
  })
})

describe('bad input gives issues by field, never a throw', () => {
  test('a non-numeric range bound', () => {
    const fd = new FormData()
    fd.append('givens.0.name', 'T1')
    fd.append('givens.0.rule.kind', 'range')
    fd.append('givens.0.rule.min', 'three hundred')
    fd.append('givens.0.rule.max', '320')
    fd.append('givens.0.rule.step', '')
    const { draft, formIssues } = definitionFromForm(fd)
    expect(formIssues).toEqual([{ path: 'givens.0.rule.min', message: expect.stringContaining('not a number') }])
    // The raw text stays, so the shape check refuses the draft as well; blank is left out.
    expect((draft as ProblemDefinition).givens[0]!.rule).toEqual({ kind: 'range', min: 'three hundred', max: 320 })
  })

  test('a cycle that is not JSON', () => {
    const fd = new FormData()
    fd.append('physics.template', GENERAL_CYCLE)
    fd.append('physics.cycle', '{ "states": [ }')
    const { formIssues } = definitionFromForm(fd)
    expect(formIssues).toHaveLength(1)
    expect(formIssues[0]!.path).toBe('physics.cycle')
    expect(formIssues[0]!.message).toMatch(/not valid JSON/)
  })

  test('an empty form reads as an empty draft', () => {
    const { draft, formIssues } = definitionFromForm(new FormData())
    expect(formIssues).toEqual([])
    expect(draft).toMatchObject({
      title: '',
      givens: [],
      constraints: [],
      finds: [],
      physics: { kind: 'template', template: '', inputs: {} },
    })
  })

  test('a bad percentage', () => {
    const fd = new FormData()
    fd.append('finds.0.name', 'x')
    fd.append('finds.0.tolerance.kind', 'relative')
    fd.append('finds.0.tolerance.value', 'lots %')
    expect(definitionFromForm(fd).formIssues.map((i) => i.path)).toEqual(['finds.0.tolerance.value'])
  })
})

describe('reading numbers', () => {
  test.each([
    ['1 %', 0.01],
    ['2.5%', 0.025],
    ['0.01', 0.01],
  ])('relative tolerance %s is the fraction %s', (typed, fraction) => {
    const fd = new FormData()
    fd.append('finds.0.name', 'x')
    fd.append('finds.0.tolerance.kind', 'relative')
    fd.append('finds.0.tolerance.value', typed)
    const def = definitionFromForm(fd).draft as ProblemDefinition
    expect(def.finds[0]!.tolerance.value).toBeCloseTo(fraction, 12)
  })

  test('digit groups and a typographic minus are read', () => {
    const fd = new FormData()
    fd.append('givens.0.name', 'p')
    fd.append('givens.0.rule.kind', 'range')
    fd.append('givens.0.rule.min', '101 325')
    fd.append('givens.0.rule.max', '−40')
    fd.append('givens.0.rule.step', '1e3')
    const def = definitionFromForm(fd).draft as ProblemDefinition
    expect(def.givens[0]!.rule).toEqual({ kind: 'range', min: 101325, max: -40, step: 1000 })
  })

  test('choice values stay texts unless every one is a number', () => {
    const fd = new FormData()
    fd.append('givens.0.name', 'g')
    fd.append('givens.0.rule.kind', 'choice')
    fd.append('givens.0.rule.values', 'air, 2, monatomic')
    const def = definitionFromForm(fd).draft as ProblemDefinition
    expect(def.givens[0]!.rule).toEqual({ kind: 'choice', values: ['air', '2', 'monatomic'] })
  })

  test('the prompt keeps its lines as typed, with the browser’s CRLF made LF', () => {
    const fd = new FormData()
    fd.append('prompt', 'Line one\r\n\r\nLine two ')
    expect((definitionFromForm(fd).draft as ProblemDefinition).prompt).toBe('Line one\n\nLine two ')
  })
})

describe('issues and fields', () => {
  test.each([
    ['givens.0.rule.min', 'givens.0.rule.min'],
    ['givens.0.rule', 'givens.0.rule.kind'],
    ['givens.2', 'givens.2.name'],
    ['givens.1.rule.values.3', 'givens.1.rule.values'],
    ['finds.0.tolerance', 'finds.0.tolerance.kind'],
    ['finds.1.pitfalls.0', 'finds.1.pitfalls'],
    ['finds.1.sigFigs', 'finds.1.sigFigs.min'],
    ['constraints.0.op', 'constraints.0.op'],
    ['physics.cycle.states.1.p', 'physics.cycle'],
    ['physics.kind', 'physics.template'],
    ['physics.inputs.T1', 'physics.inputs.T1'],
    ['tags.topics.2', 'tags.topics'],
    ['givens', 'givens'],
    ['title', 'title'],
  ])('%s is shown at %s', (path, field) => {
    expect(fieldPathForIssue(path)).toBe(field)
  })

  test('a later issue about a field already reported is left out', () => {
    const merged = mergeIssues(
      [{ path: 'givens.0.rule.min', message: 'not a number' }],
      [
        { path: 'givens.0.rule.min', message: 'Expected a number' },
        { path: 'title', message: 'Give the problem a title.' },
      ],
    )
    expect(merged.map((i) => i.message)).toEqual(['not a number', 'Give the problem a title.'])
  })

  test('changing the template keeps only the inputs the new one takes', () => {
    const kept = keepTemplateInputs({ title: 't', 'physics.inputs.T1': 'T1', 'physics.inputs.heatIn': 'q' }, [
      'T1',
      'p1',
    ])
    expect(kept).toEqual({ title: 't', 'physics.inputs.T1': 'T1' })
  })
})

test.each([
  ['givens.1.rule.step', 'Given 2, step'],
  ['finds.0.tolerance', 'Find 1, tolerance kind'],
  ['physics.inputs.T1', 'Template input T1'],
  ['physics.cycle.steps.0', 'Cycle description (JSON)'],
  ['title', 'Title'],
])('the summary names %s as “%s”', (path, words) => {
  expect(describeField(path)).toBe(words)
})
