import { readFileSync } from 'node:fs'
import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { PITFALLS } from '#app/domain/grading/pitfalls.ts'
import { bankTemplateIds } from '#app/domain/thermo/catalog.ts'
import {
  BANK_FORMAT_ID,
  BANK_FORMAT_VERSION,
  definitionIssues,
  parseDefinition,
  PITFALL_IDS,
  readBankDocument,
  TEMPLATE_IDS,
} from './problem-schema.ts'

// Demo data: a Carnot engine whose reservoir temperatures are drawn per student.
function carnot(): ProblemDefinition {
  return {
    format: 2,
    title: 'Carnot engine efficiency',
    tags: { topics: ['carnot', 'second law'], difficulty: 'introductory', level: 'first-year' },
    convention: 'course',
    prompt: 'A Carnot engine runs between [TH] and [TL]. Find its thermal efficiency.',
    givens: [
      {
        name: 'TH',
        label: 'hot reservoir temperature',
        unit: 'K',
        rule: { kind: 'range', min: 600, max: 1200, step: 50 },
      },
      {
        name: 'TL',
        label: 'cold reservoir temperature',
        unit: 'K',
        rule: { kind: 'range', min: 280, max: 350, step: 10 },
      },
    ],
    constraints: [{ left: 'TH', op: '>', right: 'TL + 100 K', message: 'TH must exceed TL by 100 K' }],
    physics: {
      kind: 'template',
      template: 'carnot-engine',
      inputs: { Th: 'TH', Tc: 'TL', p1: '100 kPa', expansionRatio: '3' },
    },
    finds: [
      {
        name: 'eta',
        label: 'Thermal efficiency',
        source: { kind: 'output', path: 'totals.efficiency' },
        unit: '',
        points: 10,
        tolerance: { kind: 'relative', value: 0.01 },
        sigFigs: { min: 2, max: 4 },
        pitfalls: ['celsius-for-kelvin'],
      },
    ],
  }
}

/** A copy of the fixture changed by `edit`, as plain JSON would arrive. */
function edited(edit: (d: any) => void): unknown {
  const d = structuredClone(carnot()) as any
  edit(d)
  return d
}

describe('ProblemDefinitionSchema', () => {
  test('a valid definition has no issues, and parsing trims and lower-cases topics', () => {
    expect(definitionIssues(carnot())).toEqual([])
    const r = parseDefinition(edited((d) => (d.tags.topics = ['  Carnot ', 'Second Law'])))
    expect(r.ok && r.value.tags.topics).toEqual(['carnot', 'second law'])
  })

  test('a general cycle takes any JSON object, but not a list', () => {
    expect(
      definitionIssues(edited((d) => (d.physics = { kind: 'cycle', cycle: { gas: 'air', states: [], steps: [] } }))),
    ).toEqual([])
    expect(definitionIssues(edited((d) => (d.physics = { kind: 'cycle', cycle: [1, 2] }))).map((i) => i.path)).toEqual([
      'physics.cycle',
    ])
  })

  test.each<[string, (d: any) => void, string]>([
    ['title too short', (d) => (d.title = 'ab'), 'title'],
    ['title too long', (d) => (d.title = 'x'.repeat(161)), 'title'],
    ['prompt too long', (d) => (d.prompt = 'x'.repeat(20_001)), 'prompt'],
    ['format from a newer release', (d) => (d.format = 3), 'format'],
    ['difficulty not in the list', (d) => (d.tags.difficulty = 'hard'), 'tags.difficulty'],
    ['level not in the list', (d) => (d.tags.level = 'phd'), 'tags.level'],
    ['convention not in the list', (d) => (d.convention = 'physics'), 'convention'],
    ['given name not an identifier', (d) => (d.givens[0].name = '1TH'), 'givens.0.name'],
    ['range bound not a number', (d) => (d.givens[0].rule.min = '600'), 'givens.0.rule.min'],
    ['range bound not finite', (d) => (d.givens[0].rule.min = Number.NaN), 'givens.0.rule.min'],
    ['range upside down', (d) => (d.givens[1].rule.max = 100), 'givens.1.rule.max'],
    ['step not positive', (d) => (d.givens[0].rule.step = 0), 'givens.0.rule.step'],
    ['unknown rule kind', (d) => (d.givens[0].rule = { kind: 'normal', mean: 1 }), 'givens.0.rule.kind'],
    ['empty choice', (d) => (d.givens[0].rule = { kind: 'choice', values: [] }), 'givens.0.rule.values'],
    ['unknown field in a given', (d) => (d.givens[0].colour = 'red'), 'givens.0.colour'],
    [
      'too many givens',
      (d) => (d.givens = Array.from({ length: 41 }, (_, i) => ({ ...d.givens[0], name: `g${i}` }))),
      'givens',
    ],
    ['constraint operator', (d) => (d.constraints[0].op = '=='), 'constraints.0.op'],
    [
      'too many constraints',
      (d) => (d.constraints = Array.from({ length: 21 }, () => d.constraints[0])),
      'constraints',
    ],
    ['unknown physics kind', (d) => (d.physics.kind = 'magic'), 'physics.kind'],
    ['unknown template', (d) => (d.physics.template = 'otto-turbo'), 'physics.template'],
    ['template input value not text', (d) => (d.physics.inputs.p1 = 100), 'physics.inputs.p1'],
    ['no finds', (d) => (d.finds = []), 'finds'],
    [
      'too many finds',
      (d) => (d.finds = Array.from({ length: 31 }, (_, i) => ({ ...d.finds[0], name: `f${i}` }))),
      'finds',
    ],
    ['find name used by a given', (d) => (d.finds[0].name = 'TH'), 'finds.0.name'],
    ['output path not dotted', (d) => (d.finds[0].source.path = 'totals..efficiency'), 'finds.0.source.path'],
    ['relative tolerance zero', (d) => (d.finds[0].tolerance.value = 0), 'finds.0.tolerance.value'],
    ['relative tolerance above 1', (d) => (d.finds[0].tolerance.value = 2), 'finds.0.tolerance.value'],
    [
      'absolute tolerance negative',
      (d) => (d.finds[0].tolerance = { kind: 'absolute', value: -1, unit: 'K' }),
      'finds.0.tolerance.value',
    ],
    ['points above 1000', (d) => (d.finds[0].points = 1001), 'finds.0.points'],
    ['points infinite', (d) => (d.finds[0].points = Number.POSITIVE_INFINITY), 'finds.0.points'],
    ['sig figs below 1', (d) => (d.finds[0].sigFigs = { min: 0 }), 'finds.0.sigFigs.min'],
    ['sig figs above 10', (d) => (d.finds[0].sigFigs = { max: 11 }), 'finds.0.sigFigs.max'],
    ['sig figs upside down', (d) => (d.finds[0].sigFigs = { min: 5, max: 3 }), 'finds.0.sigFigs.max'],
    ['unknown pitfall', (d) => (d.finds[0].pitfalls = ['forgot-coffee']), 'finds.0.pitfalls.0'],
    ['pitfall listed twice', (d) => (d.finds[0].pitfalls = ['kilo-factor', 'kilo-factor']), 'finds.0.pitfalls'],
    ['missing pitfalls list', (d) => delete d.finds[0].pitfalls, 'finds.0.pitfalls'],
    ['sense not one of ours', (d) => (d.finds[0].sense = 'positive'), 'finds.0.sense'],
  ])('%s → %s', (_, edit, path) => {
    const issues = definitionIssues(edited(edit))
    expect(issues.map((i) => i.path)).toContain(path)
    for (const i of issues) {
      // Addressed to an author: no zod jargon.
      expect(i.message).not.toMatch(/Invalid input|received|Unrecognized|discriminator/i)
      expect(i.message.length).toBeGreaterThan(5)
    }
  })

  test('a newer definition format says so', () => {
    const [issue] = definitionIssues(edited((d) => (d.format = 3)))
    expect(issue?.message).toMatch(/newer Cyclewright/)
  })

  test('not an object at all is one issue at the top', () => {
    expect(definitionIssues('hello')).toEqual([{ path: '', message: expect.any(String) }])
  })

  test('the template and pitfall lists match the solver and the grader', () => {
    // The browser's copy of the catalog's bank templates (kept light: no solver in the page).
    expect([...TEMPLATE_IDS].sort()).toEqual(bankTemplateIds().sort())
    expect([...PITFALL_IDS]).toEqual(PITFALLS.map((p) => p.id))
  })
})

function bankDoc(problems: unknown[], over: Record<string, unknown> = {}) {
  return {
    format: BANK_FORMAT_ID,
    version: BANK_FORMAT_VERSION,
    exportedAt: '2026-12-02T09:30:00.000Z',
    problems,
    ...over,
  }
}

describe('readBankDocument', () => {
  test('a valid document gives its problems', () => {
    const r = readBankDocument(
      bankDoc([
        {
          title: 'Carnot engine efficiency',
          visibility: 'department',
          origin: { title: 'Carnot', author: 'A. Author' },
          definition: carnot(),
        },
      ]),
    )
    expect(r.ok).toBe(true)
    if (r.ok) expect(r.problems[0]?.definition).toEqual(carnot())
  })

  test('reads JSON text too', () => {
    expect(readBankDocument(JSON.stringify(bankDoc([{ title: 'x', definition: carnot() }]))).ok).toBe(true)
    const bad = readBankDocument('{"format": "cyclewright-bank", ')
    expect(bad).toEqual({
      ok: false,
      errors: [{ problem: 'The document', field: '', message: expect.stringMatching(/not valid JSON/) }],
    })
  })

  test('collects every error of every problem, naming the problem and the field', () => {
    const r = readBankDocument(
      bankDoc([
        { title: 'Carnot engine efficiency', definition: carnot() },
        {
          title: 'Otto cycle efficiency',
          definition: edited(
            (d) => ((d.title = 'Otto cycle efficiency'), (d.givens[0].rule.min = 'low'), (d.finds[0].points = -1)),
          ),
        },
        { title: 'Untitled', definition: edited((d) => (d.physics.template = 'nope')), visibility: 'everyone' },
        'not a problem',
      ]),
    )
    expect(r.ok).toBe(false)
    if (r.ok) return
    const seen = r.errors.map((e) => `${e.problem} | ${e.field}`)
    expect(seen).toEqual(
      expect.arrayContaining([
        'Problem 2 (Otto cycle efficiency) | definition.givens.0.rule.min',
        'Problem 2 (Otto cycle efficiency) | definition.finds.0.points',
        'Problem 3 (Carnot engine efficiency) | definition.physics.template',
        'Problem 3 (Carnot engine efficiency) | visibility',
        'Problem 4 | ',
      ]),
    )
    expect(seen.some((s) => s.startsWith('Problem 1 '))).toBe(false)
    expect(r.errors).toHaveLength(5)
  })

  test.each<[string, unknown, string, RegExp]>([
    ['another format', bankDoc([], { format: 'some-other-bank' }), 'format', /not a Cyclewright bank document/],
    [
      'a newer version',
      bankDoc([{ title: 'x', definition: carnot() }], { version: 3 }),
      'version',
      /newer Cyclewright/,
    ],
    ['a version that is not a number', bankDoc([], { version: 'one' }), 'version', /Set version to 2/],
    ['a list instead of an object', [carnot()], '', /one JSON object/],
    ['no problems', bankDoc([]), 'problems', /no problems/],
    [
      'more than 500 problems',
      bankDoc(Array.from({ length: 501 }, () => ({ title: 'x', definition: carnot() }))),
      'problems',
      /at most 500/,
    ],
    [
      'a bad export date',
      bankDoc([{ title: 'x', definition: carnot() }], { exportedAt: 'yesterday' }),
      'exportedAt',
      /date and time/,
    ],
    ['an unknown field', bankDoc([{ title: 'x', definition: carnot() }], { author: 'me' }), 'author', /not a field/],
  ])('the document: %s', (_, raw, field, message) => {
    const r = readBankDocument(raw)
    expect(r.ok).toBe(false)
    if (r.ok) return
    expect(r.errors[0]).toEqual({ problem: 'The document', field, message: expect.stringMatching(message) })
  })
})

test('the example in docs/bank-format.md is a valid bank document', () => {
  const md = readFileSync(new URL('../../docs/bank-format.md', import.meta.url), 'utf8')
  const example = md.split('## Example')[1]?.split('```json')[1]?.split('```')[0]
  expect(example).toBeTruthy()
  const r = readBankDocument(JSON.parse(example!))
  expect(r.ok ? [] : r.errors).toEqual([])
})
