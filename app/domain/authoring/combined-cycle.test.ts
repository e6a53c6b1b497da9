// Bank problems on the combined gas–steam cycle: variant keys, senses, the worked solution, the
// diagrams, the sweep and the path names. The cycle's own physics is checked in
// app/domain/thermo/combined/combined-cycle.test.ts (Çengel & Boles' chapter-10 example, from
// memory, and the HRSG balance); here the authoring layer must give back the solver's numbers,
// in the find's unit and with the sign its sense promises, and explain them with the same numbers.
import { describe, expect, test } from 'vitest'
import type { Convention } from '#app/domain/thermo/conventions.ts'
import type { FormattedCombined } from '#app/domain/thermo/combined/combined-template.ts'
import { solveSpec } from '#app/domain/thermo/solve-spec.ts'
import type { Find, FindSense, Given, ProblemDefinition, Variant } from './definition.ts'
import { describePlot, diagramPlots } from './diagram-plot.ts'
import { cycleDiagrams } from './diagrams.ts'
import { lintDefinition } from './lint.ts'
import { quantityAtPath } from './quantities.ts'
import { outputSense } from './sense.ts'
import { isCombinedSolution, isRankineSolution, solutionKind } from './solution-kind.ts'
import { sweepVariants } from './sweep.ts'
import { drawVariant } from './variant.ts'
import { n4, renderWorkedSolution, workedSolution } from './worked-solution.ts'

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

// The inputs of docs/examples/combined-cycle.json (Çengel & Boles' chapter-10 plant, from memory).
const INPUTS = {
  p1: '100 kPa',
  T1: '300 K',
  pressureRatio: 'rp',
  turbineInletT: '1300 K',
  compressorEfficiency: '80 %',
  gasTurbineEfficiency: '85 %',
  boilerPressure: '7 MPa',
  condenserPressure: '5 kPa',
  steamTemperature: '500 °C',
  stackTemperature: 'Tstack',
}

function problem(finds: Find[], stack = 450, extra: Record<string, string> = {}): ProblemDefinition {
  return {
    format: 2,
    title: 'combined-cycle test problem',
    tags: { topics: ['combined cycle'], difficulty: 'standard', level: 'upper-level' },
    convention: 'course',
    prompt: 'A combined plant.',
    givens: [choice('rp', '', [8]), choice('Tstack', 'K', [stack])],
    constraints: [],
    physics: { kind: 'template', template: 'combined-cycle', inputs: { ...INPUTS, ...extra } },
    finds,
  }
}

function drawn(def: ProblemDefinition, convention: Convention = 'engineering'): Variant {
  const r = drawVariant(def, 1, { convention })
  if (!r.ok) throw new Error(r.error.message)
  return r.variant
}
const keyOf = (v: Variant, name: string) => {
  const k = v.key.find((x) => x.name === name)
  if (!k) throw new Error(`no key ${name}`)
  return k.value
}
function solved(convention: Convention): FormattedCombined {
  const r = solveSpec({
    template: 'combined-cycle',
    inputs: { ...INPUTS, pressureRatio: '8', stackTemperature: '450 K' },
    convention,
  })
  if (!r.ok || !('gasStates' in r)) throw new Error('the combined example does not solve')
  return r
}

const finds = [
  find('y', 'totals.steamPerGas', ''),
  find('wNet', 'totals.netWork', 'kJ/kg', { sense: 'work-by-system' }),
  find('wc', 'devices.1.w', 'kJ/kg'),
  find('wcIn', 'devices.1.w', 'kJ/kg', { sense: 'work-on-system' }),
  find('eta', 'totals.efficiency', ''),
  find('qStack', 'totals.stackLoss', 'kJ/kg', { sense: 'heat-out-of-system' }),
  find('x4', 'bottoming.states.4.x', ''),
  find('T4', 'gasStates.4.T', 'K'),
]

describe('keys of a combined-cycle bank problem', () => {
  test.each(['engineering', 'chemistry'] as const)(
    'are the solver’s numbers in the finds’ units, with the senses the words promise (%s)',
    (convention) => {
      const v = drawn(problem(finds), convention)
      const s = solved(convention)
      expect(isCombinedSolution(v.solution)).toBe(true)
      expect(isRankineSolution(v.solution)).toBe(false)
      expect(solutionKind(v.solution)).toBe('combined')
      expect(keyOf(v, 'y')).toBeCloseTo(s.totals.steamPerGas.value, 12)
      expect(keyOf(v, 'wNet')).toBeCloseTo(s.totals.netWork.value / 1000, 9)
      expect(keyOf(v, 'wNet')).toBeGreaterThan(0)
      // The compressor's device work keeps the convention's sign unless the find states a sense.
      expect(Math.sign(keyOf(v, 'wc'))).toBe(convention === 'engineering' ? -1 : 1)
      expect(keyOf(v, 'wcIn')).toBeCloseTo(s.totals.compressorWork.value / 1000, 9)
      expect(keyOf(v, 'qStack')).toBeGreaterThan(0)
      expect(keyOf(v, 'x4')).toBeCloseTo(s.bottoming.states[3]!.x!, 12)
      expect(keyOf(v, 'T4')).toBeCloseTo(s.gasStates[3]!.T.value, 9)
    },
  )

  test('the steam per kg of gas of the textbook plant (Çengel & Boles ch. 10 example, from memory: 0.131), within 1 %', () => {
    const v = drawn(problem([find('y', 'totals.steamPerGas', '')]))
    expect(Math.abs(keyOf(v, 'y') - 0.131) / 0.131).toBeLessThan(0.01)
  })

  test('the states close the balances the worked solution writes: HRSG, gas turbine, plant', () => {
    const s = solved('engineering')
    const [g1, g2, g3, g4, g5] = s.gasStates.map((g) => g.h.value) as [number, number, number, number, number]
    const feed = s.bottoming.states[1]!.h.value
    const out = s.bottoming.states[2]!.h.value
    const t = s.totals
    expect(t.steamPerGas.value).toBeCloseTo((g4 - g5) / (out - feed), 9)
    expect(t.gasNetWork.value).toBeCloseTo(g3 - g4 - (g2 - g1), 6)
    expect(t.efficiency.value).toBeCloseTo((t.gasNetWork.value + t.steamNetWork.value) / (g3 - g2), 9)
    expect(t.heatIn.value).toBeCloseTo(t.netWork.value + t.stackLoss.value + t.condenserHeat.value, 3)
  })
})

describe('senses and names of the combined cycle’s paths', () => {
  test.each([
    ['totals.netWork', 'work-by-system'],
    ['totals.power', 'work-by-system'],
    ['totals.compressorWork', 'work-on-system'],
    ['totals.heatIn', 'heat-into-system'],
    ['totals.stackLoss', 'heat-out-of-system'],
    ['totals.condenserHeat', 'heat-out-of-system'],
    ['bottoming.totals.pumpWork', 'work-on-system'],
  ] as [string, FindSense][])('%s is a size with the sense %s', (path, sense) => {
    expect(outputSense(path, 'combined-cycle')).toEqual({ kind: 'fixed', sense })
  })

  test('device works and the signed net work are in the convention’s sign; efficiencies have no sense', () => {
    expect(outputSense('devices.3.w', 'combined-cycle')).toEqual({ kind: 'convention-work' })
    expect(outputSense('totals.netWorkSigned', 'combined-cycle')).toEqual({ kind: 'convention-work' })
    expect(outputSense('totals.efficiency', 'combined-cycle')).toBeNull()
  })

  test('paths read as symbols and words, per kg of gas or of steam', () => {
    const ctx = { convention: 'engineering' as const, combined: true }
    expect(quantityAtPath('totals.steamPerGas', ctx)?.name).toBe('steam raised per kg of gas')
    expect(quantityAtPath('totals.compressorWork', ctx)?.name).toMatch(/per kg of gas/)
    expect(quantityAtPath('gasStates.4.T', ctx)).toEqual({ tex: 'T_{4}', name: 'temperature of the gas at state 4' })
    expect(quantityAtPath('bottoming.states.4.x', ctx)?.tex).toBe('x_{4,\\text{steam}}')
    expect(quantityAtPath('bottoming.totals.turbineExitQuality', ctx)?.name).toMatch(/steam cycle, per kg of steam/)
    expect(quantityAtPath('totals.noSuchThing', ctx)).toBeNull()
  })

  test('a problem with these finds passes the authoring checks', () => {
    expect(lintDefinition(problem(finds))).toEqual([])
  })
})

describe('worked solution of a combined-cycle variant', () => {
  test('gas turbine, HRSG balance, the steam cycle and the plant totals, with the key’s numbers', () => {
    const def = problem(finds)
    const v = drawn(def, 'chemistry')
    const s = v.solution as FormattedCombined
    const ws = workedSolution(v, def)
    const titles = ws.sections.map((x) => x.title)
    expect(titles).toEqual(
      expect.arrayContaining([
        'Gas turbine (per kg of gas)',
        'Heat-recovery steam generator',
        'Steam cycle — states (water/steam, IAPWS-IF97)',
        'Plant totals (per kg of gas)',
      ]),
    )
    const tex = ws.sections.flatMap((x) => x.lines.map((l) => l.tex)).join('\n')
    expect(tex).toContain(`= ${n4(s.totals.steamPerGas.value)}`)
    expect(tex).toContain(n4(s.totals.efficiency.value))
    expect(tex).toContain(n4(s.totals.netWork.value / 1000))
    // The steam cycle's pump line uses the plant's own pump efficiency (default 1) in v Δp form.
    expect(tex).toMatch(/v_\{1\}\(p_\{2\} - p_\{1\}\)/)
    const html = renderWorkedSolution(ws)
    expect(html).not.toContain('katex-error')
    expect(html).not.toMatch(/totals\.|gasStates\.|bottoming\./)
    expect(ws.caution).toMatch(/design/)
  })
})

describe('diagrams of a combined-cycle variant', () => {
  test('the gas turbine’s P–v and T–s, with the steam cycle beside them on the dome', () => {
    const v = drawn(problem(finds))
    const d = cycleDiagrams(v.solution)
    expect(d.ts.points.map((p) => p.label)).toEqual(['1', '2', '3', '4', '5'])
    expect(d.ts.curves).toHaveLength(5)
    const byFrom = new Map(d.ts.curves.map((c) => [c.from, c]))
    // η_c = 0.8 and η_t = 0.85: the compressor and turbine are irreversible, dashed.
    expect(byFrom.get('1')!.style).toBe('dashed')
    expect(byFrom.get('3')!.style).toBe('dashed')
    expect(byFrom.get('2')!.style).toBe('solid')
    // Each curve runs from its start state to its end state.
    const s = v.solution as FormattedCombined
    for (const c of d.ts.curves) {
      const a = s.gasStates.find((g) => g.name === c.from)!
      const b = s.gasStates.find((g) => g.name === c.to)!
      expect(c.points[0]![1]).toBeCloseTo(a.T.value, 6)
      expect(c.points.at(-1)![1]).toBeCloseTo(b.T.value, 6)
    }
    expect(d.second?.ts.dome?.fluid).toBe('water')
    expect(d.second?.ts.points).toHaveLength(4)
    expect(diagramPlots(d)).toHaveLength(4)
    expect(describePlot(d.ts)).toMatch(/gas-turbine topping cycle/)
    expect(describePlot(d.second!.ts)).toMatch(/steam bottoming cycle/)
  })
})

describe('the sweep of a combined-cycle problem', () => {
  test('names a variant whose exhaust would be colder than the boiling water at the pinch', () => {
    // A stack at 360 K asks the exhaust to boil 7 MPa water down to a gas colder than 559 K.
    const summary = sweepVariants(problem([find('y', 'totals.steamPerGas', '')], 360), {
      seeds: [1, 2],
      convention: 'engineering',
    })
    expect(summary.failed).toBe(2)
    expect(summary.failures[0]!.message).toMatch(/pinch/)
  })

  test('finds nothing wrong with the textbook plant', () => {
    const summary = sweepVariants(problem(finds), { seeds: [1, 2, 3], convention: 'chemistry' })
    expect(summary.failures).toEqual([])
  })
})
