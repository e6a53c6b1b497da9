// Bank problems on steam plants with a heater list (rankine-feedwater, rankine-cogeneration):
// the definition's heater list through the schema, the lint and the editor's form; the worked
// solution of a plant with every kind of heater (a closed heater pumped forward, a deaerator, a
// closed heater trapped to the condenser, reheat and process steam) checked against the heater
// balances written out by hand on the solution's own states (textbook balances, Cengel & Boles,
// "Thermodynamics: An Engineering Approach", 7th ed., Section 10-6, from memory); quantity names,
// senses, diagrams and the fallback for an unexpected shape. The properties themselves are
// checked against python3-iapws in tests/reference/steam-plant-bank-problems.test.ts.
import { describe, expect, test } from 'vitest'
import { definitionFromForm, editorStateWithoutHeater, formValuesFromDefinition } from '#app/lib/problem-form.ts'
import { parseDefinition } from '#app/lib/problem-schema.ts'
import type { FormattedRankine } from '#app/domain/thermo/steam/rankine-template.ts'
import type { HeaterInput, ProblemDefinition, Variant } from './definition.ts'
import { cycleDiagrams } from './diagrams.ts'
import { lintDefinition } from './lint.ts'
import { quantityAtPath } from './quantities.ts'
import { outputSense } from './sense.ts'
import { plantLayout } from './steam-plant-layout.ts'
import { drawVariant } from './variant.ts'
import { n4, workedSolution } from './worked-solution.ts'

const HEATERS: HeaterInput[] = [
  { kind: 'closed', pressure: 'pHi', ttd: '3 K', drains: 'forward', name: 'HP heater' },
  { kind: 'open', pressure: '0.5 MPa', name: 'deaerator' },
  { kind: 'closed', pressure: '100 kPa', ttd: 'TTD' },
]

function plant(heaters: readonly HeaterInput[] = HEATERS, extra: Record<string, string> = {}): ProblemDefinition {
  return {
    format: 2,
    title: 'A plant with three heaters',
    tags: { topics: ['rankine'], difficulty: 'challenging', level: 'upper-level' },
    convention: 'engineering',
    prompt: 'Find the bleed fractions.',
    givens: [
      { name: 'pHi', label: 'high heater pressure', unit: 'MPa', rule: { kind: 'choice', values: [2] } },
      { name: 'TTD', label: 'low heater TTD', unit: 'K', rule: { kind: 'choice', values: [2] } },
    ],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'rankine-cogeneration',
      inputs: {
        boilerPressure: '7 MPa',
        condenserPressure: '10 kPa',
        turbineInletTemperature: '500 °C',
        processPressure: '500 kPa',
        processFraction: '0.3',
        reheatPressure: '1 MPa',
        reheatTemperature: '480 °C',
        turbineEfficiency: '0.9',
        pumpEfficiency: '0.85',
        heaters,
        ...extra,
      },
    },
    finds: [
      {
        name: 'y1',
        label: 'Bleed to the HP heater',
        source: { kind: 'output', path: 'heaters.1.bleedFraction' },
        unit: '',
        points: 1,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: [],
      },
      {
        name: 'epsU',
        label: 'Utilisation factor',
        source: { kind: 'output', path: 'totals.utilisationFactor' },
        unit: '',
        points: 1,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: [],
      },
    ],
  }
}

function draw(def: ProblemDefinition): Variant {
  const r = drawVariant(def, 1, { convention: 'engineering' })
  if (!r.ok) throw new Error(r.error.message)
  return r.variant
}

describe('the heater list in a definition', () => {
  test('the schema takes a list of heaters of texts and refuses other shapes with plain words', () => {
    expect(parseDefinition(plant()).ok).toBe(true)
    const bad = (heaters: unknown) => {
      const d = plant()
      const r = parseDefinition({ ...d, physics: { ...d.physics, inputs: { boilerPressure: '7 MPa', heaters } } })
      if (r.ok) throw new Error('expected issues')
      return r.issues
    }
    expect(bad([{ kind: 'open' }])).toContainEqual(
      expect.objectContaining({
        path: 'physics.inputs.heaters.0.pressure',
        message: expect.stringMatching(/pressure/),
      }),
    )
    expect(bad([{ kind: 'open', pressure: '1 MPa', colour: 'red' }])).toContainEqual(
      expect.objectContaining({ path: 'physics.inputs.heaters.0', message: expect.stringContaining('not colour') }),
    )
    expect(bad([])[0]!.message).toMatch(/at least one heater/)
    expect(bad(5)[0]!.message).toMatch(/as text, or the heaters as a list/)
    expect(bad(Array.from({ length: 13 }, () => ({ kind: 'open', pressure: '1 MPa' })))[0]!.message).toMatch(
      /at most 12/,
    )
  })

  test('the lint checks kinds, drains, open heaters and which input takes a list', () => {
    expect(lintDefinition(plant())).toEqual([])
    const paths = (d: ProblemDefinition) => lintDefinition(d).map((f) => f.path)
    expect(paths(plant([{ kind: 'shut', pressure: '1 MPa' }]))).toContain('physics.inputs.heaters.0.kind')
    expect(paths(plant([{ kind: 'closed', pressure: '1 MPa', drains: 'up' }]))).toContain(
      'physics.inputs.heaters.0.drains',
    )
    expect(paths(plant([{ kind: 'open', pressure: '1 MPa', ttd: '3 K' }]))).toContain('physics.inputs.heaters.0.ttd')
    const d = plant()
    const asText = {
      ...d,
      physics: { ...d.physics, inputs: { ...(d.physics as { inputs: object }).inputs, heaters: 'x' } },
    }
    expect(paths(asText as ProblemDefinition)).toContain('physics.inputs.heaters')
    const listForText = {
      ...d,
      physics: { ...d.physics, inputs: { ...(d.physics as { inputs: object }).inputs, boilerPressure: HEATERS } },
    }
    expect(paths(listForText as ProblemDefinition)).toContain('physics.inputs.boilerPressure')
  })

  test('a heater field that names a given takes its value, as any input', () => {
    const v = draw(plant())
    const heaters = (v.spec.inputs as { heaters: Record<string, string>[] }).heaters
    expect(heaters[0]!.pressure).toBe('2 MPa')
    expect(heaters[2]!.ttd).toBe('2 K')
  })

  test('the editor form round-trips the heater list, drops blank rows and renumbers after a removal', () => {
    const def = plant()
    const values = formValuesFromDefinition(def)
    expect(values['physics.inputs.heaters.1.name']).toBe('deaerator')
    const form = new FormData()
    for (const [k, v] of Object.entries(values)) form.append(k, v)
    form.append('physics.inputs.heaters.3.kind', 'open') // the blank row the editor always shows
    form.append('physics.inputs.heaters.3.drains', '')
    const back = definitionFromForm(form).draft as ProblemDefinition
    expect(back.physics).toEqual(def.physics)
    const without = editorStateWithoutHeater(form, 'heaters', 0)
    expect(without.values['physics.inputs.heaters.0.name']).toBe('deaerator')
    expect(without.values['physics.inputs.heaters.1.ttd']).toBe('TTD')
    expect(without.values['physics.inputs.heaters.2.kind']).toBeUndefined()
    expect(without.heaterRows).toBe(3)
  })
})

describe('the worked solution of a plant with every kind of heater, reheat and process steam', () => {
  const def = plant()
  const v = draw(def)
  const sol = v.solution as FormattedRankine
  const layout = plantLayout(sol)!
  const lines = workedSolution(v, def).sections.flatMap((s) => s.lines)
  const text = lines.map((l) => `${l.tex} ${l.note ?? ''}`).join('\n')

  test('the layout finds every heater, the process heater and the turbine path', () => {
    expect(layout).not.toBeNull()
    expect(layout.heaters.map((h) => h.heater.kind)).toEqual(['closed', 'open', 'closed'])
    expect(layout.heaters[0]!.mixed).not.toBeNull()
    expect(layout.process).not.toBeNull()
    expect(layout.path.filter((s) => s.description.startsWith('reheater exit'))).toHaveLength(1)
  })

  test('each heater balance, written out by hand on the solution’s states, closes and gives its bleed fraction', () => {
    const [hp, da, lp] = layout.heaters as [
      (typeof layout.heaters)[0],
      (typeof layout.heaters)[0],
      (typeof layout.heaters)[0],
    ]
    // HP heater, drain pumped forward: y (hb − hd) = m_tube (hout − hin), m_tube = F − y.
    const yHp = hp.heater.bleedFraction.value
    const mTube = hp.mixed!.massFraction - yHp
    expect(yHp * (hp.bleed.h.value - hp.drain!.h.value)).toBeCloseTo(mTube * (hp.exit.h.value - hp.feedIn.h.value), 6)
    // …and the pumped drain mixes into the feedwater after it.
    expect(hp.mixed!.h.value * hp.mixed!.massFraction).toBeCloseTo(
      mTube * hp.exit.h.value + yHp * hp.drainPumpExit!.h.value,
      6,
    )
    // Deaerator: y hb + m_in hin = F hf, y + m_in = F.
    const yDa = da.heater.bleedFraction.value
    const F = da.exit.massFraction
    expect(yDa * da.bleed.h.value + (F - yDa) * da.feedIn.h.value).toBeCloseTo(F * da.exit.h.value, 6)
    // LP heater, trapped to the condenser; the feedwater leaves at T_sat − TTD.
    const yLp = lp.heater.bleedFraction.value
    expect(yLp * (lp.bleed.h.value - lp.drain!.h.value)).toBeCloseTo(
      lp.heater.feedwaterFlow.value * (lp.exit.h.value - lp.feedIn.h.value),
      6,
    )
    expect(lp.drain!.T.value - lp.exit.T.value).toBeCloseTo(2, 9)
    // The lines show each bleed fraction the key holds.
    for (const [i, y] of [yHp, yDa, yLp].entries()) expect(text).toContain(`y_{${i + 1}} = ${n4(y)}`)
    expect(text).toContain(`= ${n4(yHp)}`)
    expect(v.key[0]!.value).toBe(yHp)
  })

  test('the device lines add up to the totals the key holds', () => {
    const t = sol.totals
    expect(text).toContain(`= ${n4(t.turbineWork.value / 1000)}\\,\\mathrm{kJ}`)
    expect(text).toContain(`= ${n4(t.pumpWork.value / 1000)}\\,\\mathrm{kJ}`)
    expect(text).toContain(`= ${n4(t.heatIn.value / 1000)}\\,\\mathrm{kJ}`) // boiler + reheater
    expect(text).toContain(`= ${n4(t.heatOut.value / 1000)}\\,\\mathrm{kJ}`) // condenser with the trapped drains
    expect(text).toContain(`= ${n4(t.processHeat!.value / 1000)}\\,\\mathrm{kJ}`)
    expect(text).toContain(`= ${n4(t.utilisationFactor!.value)}`)
    // sections: the flow through each one is the turbine state's mass fraction
    const sections = lines.filter((l) => /^W_\{\\mathrm\{T\d,out\}\}/.test(l.tex))
    expect(sections).toHaveLength(5)
    const sum = layout.path.concat(layout.turbineExit).reduce(
      (acc, s) => {
        if (s.description.startsWith('reheater exit')) return { w: acc.w, prev: s }
        return { w: acc.w + s.massFraction * (acc.prev.h.value - s.h.value), prev: s }
      },
      { w: 0, prev: layout.boilerExit },
    ).w
    expect(sum).toBeCloseTo(t.turbineWork.value, 6)
    // the drain pump of the HP heater is among the pumps
    expect(text).toContain('drain pump of HP heater')
    expect(text).not.toContain('steady-flow energy balance with the enthalpies and mass fractions above')
  })

  test('an unexpected shape falls back to the devices’ magnitudes', () => {
    const broken: FormattedRankine = { ...sol, states: sol.states.slice(1) }
    const w = workedSolution({ ...v, solution: broken }, def)
    expect(w.sections.find((s) => s.title.startsWith('Devices'))!.lines[0]!.note).toMatch(/steady-flow energy balance/)
  })

  test('the diagrams draw each bleed, the drain pump and the process heater, and never throw', () => {
    const d = cycleDiagrams(sol)
    const processes = d.ts.curves.map((c) => c.process)
    expect(processes.filter((p) => p.startsWith('bleed steam'))).toHaveLength(3)
    expect(processes).toContain('process heater (isobaric cooling)')
    expect(processes).toContain('reheater (isobaric heating)')
    expect(processes.some((p) => p.startsWith('drain pump of HP heater'))).toBe(true)
    expect(processes).toContain('drains of closed feedwater heater 3 trapped to the condenser')
    expect(d.ts.dome).toBeDefined()
    const broken = cycleDiagrams({ ...sol, states: sol.states.slice(2) })
    expect(broken.ts.curves.length).toBeGreaterThan(0)
  })
})

describe('closed heaters cascading their drains backward into each other', () => {
  const def = plant(
    [
      { kind: 'closed', pressure: '3 MPa', name: 'HP' },
      { kind: 'closed', pressure: '1 MPa', ttd: '4 K', name: 'IP' },
      { kind: 'closed', pressure: '200 kPa', name: 'LP' },
    ],
    { processPressure: '1 MPa' },
  )
  const v = draw(def)
  const sol = v.solution as FormattedRankine
  const layout = plantLayout(sol)!
  const text = workedSolution(v, def)
    .sections.flatMap((s) => s.lines.map((l) => `${l.tex} ${l.note ?? ''}`))
    .join('\n')

  test('each heater below takes the drains of the one above, and its balance counts them', () => {
    const [hp, ip, lp] = layout.heaters as [
      (typeof layout.heaters)[0],
      (typeof layout.heaters)[0],
      (typeof layout.heaters)[0],
    ]
    expect(ip.drainsFrom).toBe(hp.drain)
    expect(lp.drainsFrom).toBe(ip.drain)
    for (const h of [ip, lp]) {
      const y = h.heater.bleedFraction.value
      const D = h.heater.drainsIn.value
      // y (hb − hd) + D (hD − hd) = F (hout − hin): the drains arriving flash to the shell's saturated liquid
      expect(y * (h.bleed.h.value - h.drain!.h.value) + D * (h.drainsFrom!.h.value - h.drain!.h.value)).toBeCloseTo(
        h.heater.feedwaterFlow.value * (h.exit.h.value - h.feedIn.h.value),
        6,
      )
      expect(h.drain!.massFraction).toBeCloseTo(y + D, 12)
    }
    expect(text).toContain('D_{2}(h_{')
    expect(text).toContain('D_{3}(h_{')
    expect(text).toContain(`y_{3} = \\frac{`)
    expect(text).toContain('trap to the condenser')
    // the condenser takes the turbine exhaust and the LP heater's drains
    const drains = layout.condenserExit.massFraction - layout.turbineExit.massFraction
    expect(drains).toBeCloseTo(lp.drain!.massFraction, 12)
    const qOut =
      layout.turbineExit.massFraction * (layout.turbineExit.h.value - layout.condenserExit.h.value) +
      drains * (lp.drain!.h.value - layout.condenserExit.h.value)
    expect(qOut).toBeCloseTo(sol.totals.heatOut.value, 6)
    expect(text).toContain(`= ${n4(sol.totals.heatOut.value / 1000)}\\,\\mathrm{kJ}`)
  })
})

describe('names and senses of the new outputs', () => {
  test('quantity names', () => {
    const ctx = { convention: 'engineering' as const, steam: true }
    expect(quantityAtPath('totals.bleedFractions.2', ctx)?.tex).toBe('y_{2}')
    expect(quantityAtPath('heaters.1.bleedFraction', ctx)?.name).toMatch(/heater 1/)
    expect(quantityAtPath('heaters.3.heatTransferred', ctx)?.tex).toContain('FWH3')
    expect(quantityAtPath('totals.processHeat', ctx)?.name).toMatch(/process/)
    expect(quantityAtPath('totals.utilisationFactor', ctx)?.tex).toBe('\\varepsilon_{u}')
    expect(quantityAtPath('heaters.1.nothing', ctx)).toBeNull()
  })

  test('the process heat leaves the water in every convention; bleed fractions have no sense', () => {
    expect(outputSense('totals.processHeat', 'rankine-cogeneration')).toEqual({
      kind: 'fixed',
      sense: 'heat-out-of-system',
    })
    expect(outputSense('totals.netWork', 'rankine-feedwater')).toEqual({ kind: 'fixed', sense: 'work-by-system' })
    expect(outputSense('heaters.1.bleedFraction', 'rankine-feedwater')).toBeNull()
  })
})
