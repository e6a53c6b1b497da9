import { expect, test } from 'vitest'
import type { Constraint, Given, GivenRule, ProblemDefinition } from './definition.ts'
import { MAX_DRAW_ATTEMPTS, drawGivens } from './givens.ts'

const given = (name: string, unit: string, rule: GivenRule, display?: Given['display']): Given => ({
  name,
  label: name,
  unit,
  rule,
  ...(display ? { display } : {}),
})

function problem(givens: Given[], constraints: Constraint[] = []): ProblemDefinition {
  return {
    format: 2,
    title: 'Test',
    tags: { topics: [], difficulty: 'standard', level: 'second-year' },
    convention: 'engineering',
    prompt: '',
    givens,
    constraints,
    physics: { kind: 'template', template: 'otto', inputs: {} },
    finds: [],
  }
}

function draw(def: ProblemDefinition, seed: number) {
  const r = drawGivens(def, seed)
  if (!r.ok) throw new Error(JSON.stringify(r.error))
  return r.givens
}

const seeds = (n: number) => Array.from({ length: n }, (_, i) => i + 1)

test('the same seed gives the same givens; different seeds usually differ', () => {
  const def = problem([
    given('T1', 'K', { kind: 'range', min: 280, max: 320, step: 1 }),
    given('r', '', { kind: 'range', min: 6, max: 12, step: 0.1 }),
    given('gas', '', { kind: 'choice', values: ['air', 'monatomic'] }),
  ])
  expect(draw(def, 12345)).toEqual(draw(def, 12345))
  // A fresh but equal definition object (nothing cached by identity changes the numbers).
  expect(draw(structuredClone(def), 12345)).toEqual(draw(def, 12345))
  const distinct = new Set(seeds(50).map((s) => JSON.stringify(draw(def, s))))
  expect(distinct.size).toBeGreaterThan(45)
})

test.each([
  { min: 290, max: 320, step: 5, decimals: 0 },
  { min: 0.8, max: 0.9, step: 0.01, decimals: 2 },
  { min: 1, max: 2, step: 0.3, decimals: 1 },
  { min: 101.325, max: 101.325, step: 1, decimals: 3 },
  { min: 0.1, max: 0.7, step: 0.1, decimals: 1 },
  { min: -20, max: 40, step: 2.5, decimals: 1 },
])(
  'range $min to $max by $step: 1,000 draws on the grid, within bounds, every grid value seen, no float noise',
  ({ min, max, step, decimals }) => {
    const def = problem([given('x', 'kPa', { kind: 'range', min, max, step })])
    const gridSize = Math.floor((max - min) / step + 1e-9) + 1
    const seen = new Set<number>()
    for (const s of seeds(1000)) {
      const g = draw(def, s)[0]!
      expect(g.value).toBeGreaterThanOrEqual(min)
      expect(g.value).toBeLessThanOrEqual(max)
      const k = (g.value - min) / step
      expect(Math.abs(k - Math.round(k))).toBeLessThan(1e-9)
      expect(String(g.value).replace(/^-/, '').split('.')[1]?.length ?? 0).toBeLessThanOrEqual(decimals)
      expect(g.text).toBe(`${g.value} kPa`)
      seen.add(g.value)
    }
    expect(seen.size).toBe(gridSize)
  },
)

test('a choice covers every value; a text choice has value NaN and its text', () => {
  const def = problem([
    given('gas', '', { kind: 'choice', values: ['air', 'monatomic', 'diatomic'] }),
    given('r', '', { kind: 'choice', values: [8, 9.5, 10] }),
  ])
  const gases = new Set<string>()
  const ratios = new Set<number>()
  for (const s of seeds(300)) {
    const [gas, r] = draw(def, s)
    expect(gas!.value).toBeNaN()
    gases.add(gas!.text)
    ratios.add(r!.value)
    expect(r!.text).toBe(String(r!.value))
  }
  expect([...gases].sort()).toEqual(['air', 'diatomic', 'monatomic'])
  expect([...ratios].sort((a, b) => a - b)).toEqual([8, 9.5, 10])
})

test('an expression given in °C computed from one in K: offset conversion, printed without noise (0 °C = 273.15 K, SI Brochure, from memory)', () => {
  const def = problem([
    given('T1', 'K', { kind: 'range', min: 290, max: 310, step: 1 }),
    given('T1C', 'degC', { kind: 'expression', expression: 'T1' }),
  ])
  for (const s of seeds(30)) {
    const [t1, t1c] = draw(def, s)
    expect(t1c!.value).toBeCloseTo(t1!.value - 273.15, 9)
    expect(t1c!.text).toBe(`${Number((t1!.value - 273.15).toFixed(2))} degC`)
  }
})

test.each([
  // 1 bar = 100 kPa (SI Brochure, 9th ed., Table 8, from memory)
  { unit: 'kPa', from: ['p1', 'bar', 2], expression: 'p1 * 4', expected: 800 },
  // a temperature rise in K added to a °C temperature: absolute result 20 °C + 30 K = 50 °C
  { unit: 'degC', from: ['Ta', 'degC', 20], expression: 'Ta + 30 K', expected: 50 },
  // the difference of two °C temperatures is a plain difference, 80 °C − 20 °C = 60 K
  { unit: 'K', from: ['Ta', 'degC', 20], expression: '(Ta + 60 K) - Ta', expected: 60 },
  { unit: '', from: ['r', '', 8], expression: 'r ^ 0.4', expected: 8 ** 0.4 },
])('expression "$expression" into "$unit"', ({ unit, from, expression, expected }) => {
  const [name, u, v] = from as [string, string, number]
  const def = problem([
    given(name, u, { kind: 'choice', values: [v] }),
    given('y', unit, { kind: 'expression', expression }),
  ])
  expect(draw(def, 1)[1]!.value).toBeCloseTo(expected, 9)
})

test('an expression given is rounded to its display rule, so the prompt shows what the solver uses', () => {
  const def = problem([
    given('r', '', { kind: 'choice', values: [8] }),
    given('T2', 'K', { kind: 'expression', expression: '300 K * r ^ 0.4' }, { decimals: 1 }),
  ])
  const t2 = draw(def, 1)[1]!
  expect(t2.value).toBe(Number((300 * 8 ** 0.4).toFixed(1)))
  expect(t2.text).toBe(`${t2.value} K`)
})

test.each([
  ['a wrong dimension', 'kPa', 'T1', /T2.*kPa/],
  ['a later given', 'K', 'T3', /"T3"/],
  ['a name that is nothing', 'K', 'T1 + Tfoo', /"Tfoo"/],
  ['no real value', 'K', 'sqrt(T1 - 1000 K) * sqrt(1 K)', /no real value/],
  ['a syntax slip', 'K', 'T1 *', /could not be read/],
])('an expression given with %s fails with an error naming the given', (_what, unit, expression, message) => {
  const def = problem([
    given('T1', 'K', { kind: 'range', min: 300, max: 310, step: 1 }),
    given('T2', unit, { kind: 'expression', expression }),
    given('T3', 'K', { kind: 'choice', values: [500] }),
  ])
  const r = drawGivens(def, 1)
  expect(r.ok).toBe(false)
  if (r.ok) return
  expect(r.error.code).toBe('given-error')
  expect(r.error.property).toBe('T2')
  expect(r.error.message).toContain('"T2"')
  expect(r.error.message).toMatch(message)
})

test('a constraint that is often unmet holds in every drawn variant, and the redraw was needed', () => {
  const givens = [
    given('TH', 'K', { kind: 'range', min: 300, max: 1000, step: 10 }),
    given('TL', 'K', { kind: 'range', min: 250, max: 600, step: 10 }),
  ]
  const free = problem(givens)
  const constrained = problem(givens, [{ left: 'TH', op: '>', right: 'TL + 100 K' }])
  let redrawn = 0
  for (const s of seeds(300)) {
    const [th, tl] = draw(constrained, s)
    expect(th!.value).toBeGreaterThan(tl!.value + 100)
    const [fth, ftl] = draw(free, s)
    if (!(fth!.value > ftl!.value + 100)) redrawn++
  }
  expect(redrawn).toBeGreaterThan(20)
})

test.each([
  { op: '<' as const, left: 'p1', right: '150 kPa', ok: (p: number) => p < 150 },
  { op: '<=' as const, left: 'p1', right: '1.5 bar', ok: (p: number) => p <= 150 },
  { op: '>=' as const, left: 'p1 * 2', right: '300 kPa', ok: (p: number) => p >= 150 },
  { op: '!=' as const, left: 'p1', right: '100 kPa', ok: (p: number) => p !== 100 },
  { op: '>' as const, left: 'p1', right: '0', ok: (p: number) => p > 0 },
])('constraint $left $op $right is compared in SI', ({ op, left, right, ok }) => {
  const def = problem([given('p1', 'kPa', { kind: 'range', min: 100, max: 200, step: 10 })], [{ left, op, right }])
  for (const s of seeds(100)) expect(ok(draw(def, s)[0]!.value)).toBe(true)
})

test('an impossible constraint gives constraint-never-met after the last draw, without hanging', () => {
  const def = problem(
    [
      given('TH', 'K', { kind: 'range', min: 300, max: 400, step: 10 }),
      given('TL', 'K', { kind: 'range', min: 350, max: 500, step: 10 }),
    ],
    [{ left: 'TH', op: '>', right: 'TL + 100 K' }],
  )
  const t0 = performance.now()
  const r = drawGivens(def, 7)
  expect(performance.now() - t0).toBeLessThan(2000)
  expect(r).toEqual({
    ok: false,
    error: {
      code: 'constraint-never-met',
      message: `TH > TL + 100 K was not met in ${MAX_DRAW_ATTEMPTS} draws; widen the ranges`,
      property: 'constraints.0',
    },
  })
  const withMessage = problem(def.givens as Given[], [
    { left: 'TH', op: '>', right: 'TL + 100 K', message: 'TH must exceed TL by 100 K' },
  ])
  const m = drawGivens(withMessage, 7)
  expect(!m.ok && m.error.message.startsWith('TH must exceed TL by 100 K')).toBe(true)
})

test.each([
  ['different kinds', 'TH', 'p1', /different kinds/],
  ['an unknown name', 'TH', 'TX + 1 K', /"TX"/],
])('a constraint with %s is an invalid definition naming the constraint', (_what, left, right, message) => {
  const def = problem(
    [
      given('TH', 'K', { kind: 'range', min: 300, max: 400, step: 10 }),
      given('p1', 'kPa', { kind: 'choice', values: [100] }),
    ],
    [{ left, op: '>', right }],
  )
  const r = drawGivens(def, 1)
  expect(r.ok).toBe(false)
  if (!r.ok) {
    expect(r.error.code).toBe('invalid-definition')
    expect(r.error.property).toMatch(/^constraints\.0/)
    expect(r.error.message).toMatch(message)
  }
})

test.each([
  ['a zero step', { kind: 'range', min: 1, max: 2, step: 0 }],
  ['max below min', { kind: 'range', min: 2, max: 1, step: 0.1 }],
  ['an empty choice', { kind: 'choice', values: [] }],
] as const)('a given with %s is a given-error, not a throw', (_what, rule) => {
  const r = drawGivens(problem([given('x', 'K', rule as GivenRule)]), 1)
  expect(r.ok).toBe(false)
  if (!r.ok) expect(r.error).toMatchObject({ code: 'given-error', property: 'x' })
})
