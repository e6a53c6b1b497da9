// The demo bank (seed/problems.ts) is invented demo data; these checks hold it to what the
// product itself asks of any problem: the shape (app/lib/problem-schema.ts), the semantic
// checks authors see (lintDefinition), and a sweep of 100 variants per convention with no
// unphysical variant. The physical sanity limits are the sweep's own (common practice:
// T > 0 K, p > 0, 0 < η < 1, 0 ≤ x ≤ 1).
import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { cycleOf } from '#app/domain/authoring/definition.ts'
import { lintDefinition } from '#app/domain/authoring/lint.ts'
import { renderPrompt } from '#app/domain/authoring/prompt.ts'
import { sweepVariants } from '#app/domain/authoring/sweep.ts'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { bankTemplateIds } from '#app/domain/thermo/catalog.ts'
import { definitionIssues } from '#app/lib/problem-schema.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'

const SEEDS = Array.from({ length: 100 }, (_, i) => i + 1)

/** Every version of every demo problem, labelled "title v2". */
const versions: [string, ProblemDefinition][] = DEMO_PROBLEMS.flatMap((p) => {
  const all = [...(p.earlierVersions ?? []), p.definition]
  return all.map((d, i): [string, ProblemDefinition] => [`${p.definition.title} v${i + 1}`, d])
})

describe.each(versions)('%s', (_label, def) => {
  test('has the shape of a problem definition', () => {
    expect(definitionIssues(def)).toEqual([])
  })

  test('passes the authoring checks', () => {
    expect(lintDefinition(def)).toEqual([])
  })

  test('its prompt renders without errors, asking each find on a line of its own', () => {
    const drawn = drawVariant(def, 1, { convention: 'engineering' })
    if (!drawn.ok) throw new Error(drawn.error.message)
    const displays = Object.fromEntries(def.givens.filter((g) => g.display).map((g) => [g.name, g.display!]))
    const { html, errors } = renderPrompt(def.prompt, drawn.variant.givens, displays)
    expect(errors).toEqual([])
    // Some prompts also list the cycle's steps, so at least one item per find.
    expect(html.match(/<li>/g)?.length ?? 0).toBeGreaterThanOrEqual(def.finds.length)
  })

  test.each(['engineering', 'chemistry'] as const)(
    '100 variants in the %s convention are all physical',
    (convention) => {
      const summary = sweepVariants(def, { seeds: SEEDS, convention })
      expect(summary.failures).toEqual([])
      expect(summary.failed).toBe(0)
      expect(summary.checked).toBe(SEEDS.length)
    },
  )
})

test('every cycle template of the solver and a general cycle appear in the demo bank', () => {
  const wanted = [...bankTemplateIds(), 'general'].sort()
  const covered = new Set(DEMO_PROBLEMS.map((p) => cycleOf(p.definition.physics)))
  expect(wanted.filter((id) => !covered.has(id))).toEqual([])
  expect(wanted.length).toBeGreaterThanOrEqual(14)
})

test('titles are unique, so seeding by owner and title finds each problem again', () => {
  const titles = DEMO_PROBLEMS.map((p) => p.definition.title)
  expect(new Set(titles).size).toBe(titles.length)
})

test('a copy names a problem listed before it, and earlier versions keep the title of the current one', () => {
  DEMO_PROBLEMS.forEach((p, i) => {
    if (p.copiedFrom !== undefined)
      expect(DEMO_PROBLEMS.slice(0, i).map((q) => q.definition.title)).toContain(p.copiedFrom)
    for (const earlier of p.earlierVersions ?? []) {
      expect(earlier.title).toBe(p.definition.title)
      expect(earlier).not.toEqual(p.definition)
    }
  })
  expect(DEMO_PROBLEMS.some((p) => p.copiedFrom !== undefined)).toBe(true)
  expect(DEMO_PROBLEMS.some((p) => (p.earlierVersions?.length ?? 0) > 0)).toBe(true)
})

test('both instructors own problems, and the conventions differ: a course-convention work find changes sign between the two', () => {
  expect(new Set(DEMO_PROBLEMS.map((p) => p.owner))).toEqual(new Set(['tobias', 'amara']))
  const otto = DEMO_PROBLEMS.find(
    (p) => p.definition.physics.kind === 'template' && p.definition.physics.template === 'otto',
  )!.definition
  const eng = drawVariant(otto, 7, { convention: 'engineering' })
  const chem = drawVariant(otto, 7, { convention: 'chemistry' })
  if (!eng.ok || !chem.ok) throw new Error('the Otto problem should draw seed 7')
  const w = (v: typeof eng.variant) => v.key.find((k) => k.name === 'wNet')!.value
  // Engineering W is work by the gas, chemistry w work on it (docs/spec-format.md): same size, opposite sign.
  expect(w(eng.variant)).toBeGreaterThan(0)
  expect(w(chem.variant)).toBeCloseTo(-w(eng.variant), 6)
})
