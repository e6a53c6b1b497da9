// Bank problems on the vapour Carnot cycle (template 'steam-carnot') and the throttling
// calorimeter ('steam-throttling-calorimeter'): keys, senses, worked solution, diagrams and the
// sweep, with every expected number recomputed from Debian's python3-iapws (IAPWS97) through
// tests/support/iapws-reference.ts. If the reference is missing the tests FAIL with the install
// hint; they never skip. The relations are the textbook ones (common practice): a Carnot cycle
// inside the dome takes in q_H = T_H (s_g − s_f) and has η = 1 − T_L/T_H; a throttling
// calorimeter keeps h, so x_1 = (h(p2, T2) − h_f(p1)) / h_fg(p1).
import { beforeAll, describe, expect, test } from 'vitest'
import type { Convention } from '#app/domain/thermo/conventions.ts'
import type { Find, Given, ProblemDefinition, Variant } from '#app/domain/authoring/definition.ts'
import { cycleDiagrams } from '#app/domain/authoring/diagrams.ts'
import { describePlot } from '#app/domain/authoring/diagram-plot.ts'
import { lintDefinition } from '#app/domain/authoring/lint.ts'
import { solutionKind } from '#app/domain/authoring/solution-kind.ts'
import { sweepVariants } from '#app/domain/authoring/sweep.ts'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { n4, renderWorkedSolution, workedSolution } from '#app/domain/authoring/worked-solution.ts'
import { solveBankSpec } from '#app/domain/thermo/solve-spec.ts'
import { referenceAvailable, referenceStates, REFERENCE_MISSING_MESSAGE } from '#tests/support/iapws-reference.ts'
import type { RefState } from '#tests/support/iapws-reference.ts'

const find = (name: string, path: string, unit: string, extra: Partial<Find> = {}): Find => ({
  name,
  label: name,
  source: { kind: 'output', path },
  unit,
  points: 1,
  tolerance: { kind: 'relative', value: 0.01 },
  pitfalls: [],
  ...extra,
})
const choice = (name: string, unit: string, values: number[]): Given => ({
  name,
  label: name,
  unit,
  rule: { kind: 'choice', values },
})

function problem(template: string, givens: Given[], inputs: Record<string, string>, finds: Find[]): ProblemDefinition {
  return {
    format: 2,
    title: `${template} test problem`,
    tags: { topics: ['steam'], difficulty: 'standard', level: 'second-year' },
    convention: 'course',
    prompt: 'Steam.',
    givens,
    constraints: [],
    physics: { kind: 'template', template, inputs },
    finds,
  }
}

function drawn(def: ProblemDefinition, convention: Convention = 'engineering', seed = 1): Variant {
  const r = drawVariant(def, seed, { convention })
  if (!r.ok) throw new Error(r.error.message)
  return r.variant
}
const keyOf = (v: Variant, name: string) => {
  const k = v.key.find((x) => x.name === name)
  if (!k) throw new Error(`no key ${name}`)
  return k.value
}
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-12)

// Carnot between 260 °C and 45 °C; calorimeter 2 MPa line, 100 kPa and 120 °C (invented numbers).
const TH = 260 + 273.15
const TL = 45 + 273.15
const P1 = 2e6
const P2 = 1e5
const T2 = 120 + 273.15

const carnot = problem(
  'steam-carnot',
  [choice('TH', '°C', [260]), choice('TL', '°C', [45])],
  { hotTemperature: 'TH', coldTemperature: 'TL' },
  [
    find('qH', 'totals.heatIn', 'kJ/kg', { sense: 'heat-into-system' }),
    find('wNet', 'totals.netWork', 'kJ/kg', { sense: 'work-by-system' }),
    find('x3', 'states.3.x', ''),
    find('eta', 'totals.efficiency', ''),
    find('wTurbine', 'steps.2.w', 'kJ/kg'),
  ],
)
const calorimeter = problem(
  'steam-throttling-calorimeter',
  [choice('p1', 'MPa', [2]), choice('p2', 'kPa', [100]), choice('T2', '°C', [120])],
  { linePressure: 'p1', calorimeterPressure: 'p2', calorimeterTemperature: 'T2' },
  [
    find('h1', 'totals.enthalpy', 'kJ/kg'),
    find('x1', 'totals.quality', ''),
    find('xmin', 'totals.lowestMeasurableQuality', ''),
  ],
)

// A piston–cylinder problem: 2 kg of water at 200 kPa and x = 0.5 heated at constant pressure
// to 300 °C (invented numbers), written as a general cycle whose substance is water.
const PP = 2e5
const TP = 300 + 273.15
const piston: ProblemDefinition = {
  ...problem('steam-carnot', [choice('p1', 'kPa', [200]), choice('x1', '', [0.5]), choice('T2', '°C', [300])], {}, [
    find('w', 'steps.1.w', 'kJ/kg', { sense: 'work-by-system' }),
    find('q', 'steps.1.q', 'kJ/kg', { sense: 'heat-into-system' }),
    find('Q', 'steps.1.total.q', 'kJ'),
    find('dU', 'steps.1.dU', 'kJ/kg'),
    find('v2', 'states.2.v', 'm^3/kg'),
  ]),
  physics: {
    kind: 'cycle',
    cycle: {
      substance: 'water',
      system: 'closed',
      mass: '2 kg',
      states: [
        { name: '1', p: 'p1', x: 'x1' },
        { name: '2', T: 'T2' },
      ],
      steps: [{ process: 'isobaric', label: 'heating at constant pressure' }],
    },
  },
}

let available = false
let fH: RefState, gH: RefState, fL: RefState, gL: RefState, cal: RefState, f1: RefState, g1: RefState, g2: RefState
let w1: RefState, w2: RefState
beforeAll(() => {
  available = referenceAvailable()
  if (!available) return
  ;[fH, gH, fL, gL, cal, f1, g1, g2] = referenceStates([
    { kind: 'Tx', T: TH, x: 0 },
    { kind: 'Tx', T: TH, x: 1 },
    { kind: 'Tx', T: TL, x: 0 },
    { kind: 'Tx', T: TL, x: 1 },
    { kind: 'PT', p: P2, T: T2 },
    { kind: 'Px', p: P1, x: 0 },
    { kind: 'Px', p: P1, x: 1 },
    { kind: 'Px', p: P2, x: 1 },
  ]) as [RefState, RefState, RefState, RefState, RefState, RefState, RefState, RefState]
  ;[w1, w2] = referenceStates([
    { kind: 'Px', p: PP, x: 0.5 },
    { kind: 'PT', p: PP, T: TP },
  ]) as [RefState, RefState]
})

describe('vapour Carnot bank problem against python3-iapws', () => {
  test('the template is let into the bank and its result is recognised as water in the cycle format', () => {
    const r = solveBankSpec({
      template: 'steam-carnot',
      inputs: { hotTemperature: '200 °C', coldTemperature: '40 °C' },
    })
    expect(r.ok).toBe(true)
    if (r.ok) expect(solutionKind(r)).toBe('steam-cycle')
  })

  test.each(['engineering', 'chemistry'] as const)('keys in the %s convention', (convention) => {
    if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
    const v = drawn(carnot, convention)
    const qH = TH * (gH.s - fH.s)
    expect(rel(keyOf(v, 'qH') * 1000, qH)).toBeLessThan(1e-6)
    expect(rel(keyOf(v, 'qH') * 1000, gH.h - fH.h)).toBeLessThan(1e-5) // q = Δh at constant p, too
    // Work done by the water: positive in both conventions, because the find states its sense.
    expect(rel(keyOf(v, 'wNet') * 1000, qH * (1 - TL / TH))).toBeLessThan(1e-5)
    expect(rel(keyOf(v, 'x3'), (gH.s - fL.s) / (gL.s - fL.s))).toBeLessThan(1e-6)
    expect(rel(keyOf(v, 'eta'), 1 - TL / TH)).toBeLessThan(1e-6)
    // A step's work keeps the convention's sign: the turbine's is done BY the water.
    const turbine = keyOf(v, 'wTurbine')
    expect(Math.sign(turbine)).toBe(convention === 'engineering' ? 1 : -1)
  })

  test('worked solution: the boiler heat as T Δs, the turbine exit quality and both efficiencies, with the numbers of the key', () => {
    if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
    const v = drawn(carnot, 'engineering')
    const ws = workedSolution(v, carnot)
    const all = ws.sections.flatMap((s) => s.lines)
    const tex = all.map((l) => l.tex).join('\n')
    expect(ws.sections.map((s) => s.title)).toContain('Processes (per kg of water, steady flow)')
    expect(tex).toContain(`x_{3} = \\frac{s_{3} - s_f}{s_{fg}}`)
    expect(tex).toContain(n4((gH.s - fL.s) / (gL.s - fL.s)))
    expect(tex).toContain(`Q_{12} = T\\,\\Delta s`)
    expect(tex).toContain(n4((TH * (gH.s - fH.s)) / 1000))
    expect(tex).toContain(`\\eta_{\\text{Carnot}} = 1 - \\frac{T_L}{T_H}`)
    expect(tex).toContain(n4(1 - TL / TH))
    expect(ws.caution).toMatch(/not design data/)
    const html = renderWorkedSolution(ws)
    expect(html).not.toContain('katex-error')
    // No internal path reaches the student.
    expect(html).not.toMatch(/totals\.|states\.\d/)
  })

  test('diagrams: two isotherms at T_H and T_L and two vertical isentropes, inside the dome', () => {
    const v = drawn(carnot, 'engineering')
    const d = cycleDiagrams(v.solution)
    expect(d.ts.dome?.points.length ?? 0).toBeGreaterThan(10)
    expect(d.ts.curves).toHaveLength(4)
    const [boiler, turbine, condenser, compressor] = d.ts.curves as [
      (typeof d.ts.curves)[number],
      (typeof d.ts.curves)[number],
      (typeof d.ts.curves)[number],
      (typeof d.ts.curves)[number],
    ]
    for (const [c, T] of [
      [boiler, TH],
      [condenser, TL],
    ] as const)
      for (const [, y] of c.points) expect(Math.abs(y - T)).toBeLessThan(1e-6 * T)
    for (const c of [turbine, compressor]) {
      const s0 = c.points[0]![0]
      for (const [x] of c.points) expect(Math.abs(x - s0)).toBeLessThan(1e-9 * Math.abs(s0) + 1e-9)
    }
    expect(describePlot(d.ts)).toMatch(/vapour Carnot cycle/)
  })
})

describe('throttling calorimeter bank problem against python3-iapws', () => {
  test.each(['engineering', 'chemistry'] as const)('keys in the %s convention', (convention) => {
    if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
    const v = drawn(calorimeter, convention)
    expect(rel(keyOf(v, 'h1') * 1000, cal.h)).toBeLessThan(1e-7)
    expect(rel(keyOf(v, 'x1'), (cal.h - f1.h) / (g1.h - f1.h))).toBeLessThan(1e-6)
    expect(rel(keyOf(v, 'xmin'), (g2.h - f1.h) / (g1.h - f1.h))).toBeLessThan(1e-6)
  })

  test('worked solution: h2 from the calorimeter reading, h1 = h2, and the quality from the line saturation properties', () => {
    if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
    const v = drawn(calorimeter, 'engineering')
    const ws = workedSolution(v, calorimeter)
    const tex = ws.sections.flatMap((s) => s.lines.map((l) => l.tex)).join('\n')
    expect(tex).toContain('h_1 = h_2')
    expect(tex).toContain(`h_2 = h(p_2, T_2) = ${n4(cal.h / 1000)}`)
    expect(tex).toContain(`h_f = ${n4(f1.h / 1000)}`)
    expect(tex).toContain(n4((g1.h - f1.h) / 1000))
    expect(tex).toContain(n4((cal.h - f1.h) / (g1.h - f1.h)))
    expect(renderWorkedSolution(ws)).not.toContain('katex-error')
  })

  test('diagram: the wet line state inside the dome, the superheated calorimeter state outside, joined by a dashed throttle', () => {
    const v = drawn(calorimeter, 'engineering')
    const d = cycleDiagrams(v.solution)
    expect(d.ts.curves).toHaveLength(1)
    expect(d.ts.curves[0]!.style).toBe('dashed')
    expect(d.ts.points.map((p) => p.label)).toEqual(['1', '2'])
    expect(d.ts.points[1]!.x).toBeGreaterThan(d.ts.points[0]!.x) // throttling generates entropy
  })

  test('the sweep names a variant whose line steam is too wet for the calorimeter', () => {
    // At 10 MPa the wettest measurable steam has x ≈ 0.8x; a reading 1 K above saturation at
    // 100 kPa lies below it for every line pressure drawn here, and the solver refuses it.
    const wet = problem(
      'steam-throttling-calorimeter',
      [choice('p1', 'MPa', [10]), choice('p2', 'kPa', [100]), choice('T2', '°C', [99])],
      { linePressure: 'p1', calorimeterPressure: 'p2', calorimeterTemperature: 'T2' },
      [find('x1', 'totals.quality', '')],
    )
    const summary = sweepVariants(wet, { seeds: [1, 2, 3], convention: 'engineering' })
    expect(summary.failed).toBe(3)
    expect(summary.failures[0]!.message).toMatch(/not superheated/)
  })

  test('both problems pass the authoring checks', () => {
    expect(lintDefinition(carnot)).toEqual([])
    expect(lintDefinition(calorimeter)).toEqual([])
  })
})

describe('water written out as a general cycle in a bank problem, against python3-iapws', () => {
  test.each(['engineering', 'chemistry'] as const)('keys of a piston–cylinder heating (%s)', (convention) => {
    if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
    const v = drawn(piston, convention)
    expect(solutionKind(v.solution)).toBe('steam-cycle')
    // Closed system at constant pressure: W = p (v2 − v1), Q = ΔU + W = h2 − h1 (common practice).
    expect(rel(keyOf(v, 'w') * 1000, PP * (w2.v - w1.v))).toBeLessThan(1e-6)
    expect(rel(keyOf(v, 'q') * 1000, w2.h - w1.h)).toBeLessThan(1e-6)
    expect(rel(keyOf(v, 'Q') * 1000, 2 * (w2.h - w1.h))).toBeLessThan(1e-6)
    expect(rel(keyOf(v, 'dU') * 1000, w2.u - w1.u)).toBeLessThan(1e-6)
    expect(rel(keyOf(v, 'v2'), w2.v)).toBeLessThan(1e-7)
  })

  test('worked solution and diagrams: the boundary work p Δv and an isobar drawn through IF97 states', () => {
    if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
    const v = drawn(piston, 'engineering')
    const ws = workedSolution(v, piston)
    const tex = ws.sections.flatMap((s) => s.lines.map((l) => l.tex)).join('\n')
    expect(tex).toContain('p\\,(v_{2} - v_{1})')
    expect(tex).toContain(n4((PP * (w2.v - w1.v)) / 1000))
    expect(ws.sections.map((s) => s.title)).toContain('Processes (per kg of water)')
    // The answers name the working fluid: water, not gas.
    const answers = ws.sections
      .at(-1)!
      .lines.map((l) => l.note ?? '')
      .join('\n')
    expect(answers).toMatch(/work done by the water/)
    expect(answers).not.toMatch(/\bgas\b/)
    expect(renderWorkedSolution(ws)).not.toContain('katex-error')
    const d = cycleDiagrams(v.solution)
    expect(d.pv.curves).toHaveLength(1)
    for (const [, y] of d.pv.curves[0]!.points) expect(Math.abs(y - PP / 1000)).toBeLessThan(1e-6 * PP)
    expect(lintDefinition(piston)).toEqual([])
  })
})
