// Bank problems on the two-stage (flash chamber) and cascade vapour-compression templates: the
// keys recomputed here by hand from the refrigerants' equation-of-state states (energy balances
// of each device written out again, not the solver's), textbook numbers (Çengel & Boles, FROM
// MEMORY, as in app/domain/thermo/refrigerants/multi-stage.test.ts), senses in both
// conventions, the worked solution, the diagrams, the sweep and the lint.
import { createElement } from 'react'
import { renderToStaticMarkup } from 'react-dom/server'
import { describe, expect, test } from 'vitest'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { TEMPLATES_WITHOUT_SLIPS } from '#app/domain/grading/applicable-pitfalls.ts'
import { TEMPLATE_CATALOG } from '#app/domain/thermo/catalog.ts'
import type { Convention } from '#app/domain/thermo/conventions.ts'
import { getRefrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import type { FluidState, Refrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import type { FormattedCascade, FormattedTwoStage } from '#app/domain/thermo/refrigerants/multi-stage-template.ts'
import { solveBankSpec } from '#app/domain/thermo/solve-spec.ts'
import { TEMPLATE_IDS } from '#app/lib/problem-schema.ts'
import type { DrawResult, Find, FindSense, Given, ProblemDefinition, Variant } from './definition.ts'
import { describePlot, diagramPlots } from './diagram-plot.ts'
import type { Plot } from './diagram-plot.ts'
import { cycleDiagrams } from './diagrams.ts'
import { lintDefinition } from './lint.ts'
import { quantityAtPath } from './quantities.ts'
import { outputSense } from './sense.ts'
import { solutionKind } from './solution-kind.ts'
import { checkVariantSanity, sweepVariants } from './sweep.ts'
import { drawVariant } from './variant.ts'
import { renderWorkedSolution, workedSolution } from './worked-solution.ts'

const r134a = getRefrigerant('R134a')
const r717 = getRefrigerant('R717')
const r744 = getRefrigerant('R744')
const TWO = 'vapour-compression-two-stage'
const CASCADE = 'vapour-compression-cascade'

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
    tags: { topics: ['refrigeration'], difficulty: 'standard', level: 'second-year' },
    convention: 'course',
    prompt: 'A refrigerator.',
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
const ok = <T>(r: { ok: true; value: T } | { ok: false; error: { message: string } }): T => {
  if (!r.ok) throw new Error(r.error.message)
  return r.value
}
const relErr = (x: number, ref: number) => Math.abs(x - ref) / Math.abs(ref)

// ---- The hand calculation ------------------------------------------------------------------
// States from the equation of state (saturation, (p, s) and (p, h) flashes), then each device's
// energy balance written out again: the solver's own code is not used.

/** A compressor from `a` to pressure p with isentropic efficiency eta: h = h_a + (h_s − h_a)/η. */
function compressed(f: Refrigerant, a: FluidState, p: number, eta: number): FluidState {
  const hs = ok(f.statePS(p, a.s)).h
  return ok(f.statePH(p, a.h + (hs - a.h) / eta))
}

function twoStageByHand(f: Refrigerant, pL: number, pI: number, pH: number, etaL: number, etaH: number, mHigh: number) {
  const s1 = ok(f.statePx(pL, 1))
  const s5 = ok(f.statePx(pH, 0))
  const s7 = ok(f.statePx(pI, 0))
  const s9 = ok(f.statePx(pI, 1))
  const h6 = s5.h // high-pressure valve
  const x6 = (h6 - s7.h) / (s9.h - s7.h) // flash chamber: 1 kg at h6 = x6 at h9 + (1 − x6) at h7
  const h8 = s7.h // low-pressure valve
  const s2 = compressed(f, s1, pI, etaL)
  const h3 = x6 * s9.h + (1 - x6) * s2.h // mixing chamber
  const s3 = ok(f.statePH(pI, h3))
  const s4 = compressed(f, s3, pH, etaH)
  const qL = (1 - x6) * (s1.h - h8)
  const wLow = (1 - x6) * (s2.h - s1.h)
  const wHigh = s4.h - h3
  const qH = s4.h - s5.h
  return { x6, h2: s2.h, h3, h4: s4.h, qL, wLow, wHigh, w: wLow + wHigh, qH, cop: qL / (wLow + wHigh), mHigh }
}

function cascadeByHand(
  fl: Refrigerant,
  fu: Refrigerant,
  [pL, pX, pY, pH]: [number, number, number, number],
  etaB: number,
  etaA: number,
) {
  const s1 = ok(fl.statePx(pL, 1))
  const s2 = compressed(fl, s1, pX, etaB)
  const s3 = ok(fl.statePx(pX, 0))
  const h4 = s3.h
  const s5 = ok(fu.statePx(pY, 1))
  const s6 = compressed(fu, s5, pH, etaA)
  const s7 = ok(fu.statePx(pH, 0))
  const h8 = s7.h
  const ratio = (s2.h - s3.h) / (s5.h - h8) // exchanger: ṁ_A (h5 − h8) = ṁ_B (h2 − h3)
  const qL = s1.h - h4
  const wB = s2.h - s1.h
  const wA = ratio * (s6.h - s5.h)
  const qH = ratio * (s6.h - s7.h)
  return { ratio, qL, wB, wA, w: wA + wB, qH, cop: qL / (wA + wB) }
}

// ---- Into the bank -----------------------------------------------------------------------------

describe('the two-stage and cascade templates in the bank', () => {
  test('catalog, the browser’s template list and the slip-free list agree', () => {
    for (const id of [TWO, CASCADE]) {
      expect(TEMPLATE_CATALOG.find((e) => e.id === id)?.bank, id).toBe(true)
      expect((TEMPLATE_IDS as readonly string[]).includes(id), id).toBe(true)
      expect(TEMPLATES_WITHOUT_SLIPS.has(id), id).toBe(true)
    }
  })

  test('solveBankSpec accepts both and solution-kind tells the shapes apart', () => {
    const two = solveBankSpec({
      template: TWO,
      inputs: { refrigerant: 'R134a', evaporatorTemperature: '-30 °C', condenserTemperature: '40 °C' },
    })
    const cas = solveBankSpec({
      template: CASCADE,
      inputs: {
        lowerRefrigerant: 'R744',
        upperRefrigerant: 'R717',
        evaporatorTemperature: '-45 °C',
        lowerCondenserTemperature: '-5 °C',
        upperEvaporatorTemperature: '-10 °C',
        condenserTemperature: '35 °C',
      },
    })
    const one = solveBankSpec({
      template: 'vapour-compression',
      inputs: { refrigerant: 'R134a', evaporatorTemperature: '-30 °C', condenserTemperature: '40 °C' },
    })
    if (!two.ok || !cas.ok || !one.ok) throw new Error('did not solve')
    expect(solutionKind(two)).toBe('two-stage-refrigeration')
    expect(solutionKind(cas)).toBe('cascade-refrigeration')
    expect(solutionKind(one)).toBe('refrigeration')
  })
})

// ---- Keys: the textbook cycles ---------------------------------------------------------------

// Çengel & Boles, Thermodynamics: An Engineering Approach, 7th ed. (FROM MEMORY, not read from
// the book): the two-stage R-134a refrigerator with a flash chamber, 0.8 / 0.32 / 0.14 MPa, ideal
// compressors: x6 = 0.2049, q_L = 146.3 kJ/kg and w_in = 32.71 kJ/kg per kg through the
// condenser, COP_R = 4.46. Differences only (the book's tables have another zero), within 1 %.
describe('keys of the textbook two-stage refrigerator (Çengel & Boles 7th ed., from memory)', () => {
  const def = problem(
    TWO,
    [choice('pL', 'MPa', [0.14]), choice('pH', 'MPa', [0.8]), choice('pI', 'MPa', [0.32])],
    {
      refrigerant: 'R-134a',
      evaporatorPressure: 'pL',
      condenserPressure: 'pH',
      intermediatePressure: 'pI',
      highStageMassFlow: '0.05 kg/s',
    },
    [
      find('x6', 'totals.flashVapourFraction', ''),
      find('qL', 'totals.refrigerationEffect', 'kJ/kg'),
      find('w', 'totals.compressorWork', 'kJ/kg'),
      find('cop', 'totals.copRefrigerator', ''),
      find('mLow', 'totals.lowStageMassFlow', 'kg/s'),
      find('mHigh', 'totals.highStageMassFlow', 'kg/s'),
    ],
  )
  test.each(['engineering', 'chemistry'] as const)('%s course', (convention) => {
    const v = drawn(def, convention)
    expect(relErr(keyOf(v, 'x6'), 0.2049)).toBeLessThan(0.01)
    expect(relErr(keyOf(v, 'qL'), 146.3)).toBeLessThan(0.01)
    expect(relErr(keyOf(v, 'w'), 32.71)).toBeLessThan(0.01)
    expect(relErr(keyOf(v, 'cop'), 4.46)).toBeLessThan(0.01)
    // Mass: what passes the evaporator is what did not flash.
    expect(keyOf(v, 'mHigh')).toBeCloseTo(0.05, 12)
    expect(keyOf(v, 'mLow')).toBeCloseTo(0.05 * (1 - keyOf(v, 'x6')), 12)
  })
})

// The same book's R-134a cascade (FROM MEMORY): 0.8 / 0.32 (both sides of the exchanger) / 0.14
// MPa, ideal cycles, 0.05 kg/s in the upper cycle: ṁ_lower = 0.039 kg/s, Q_L = 7.18 kW,
// W_in = 1.61 kW, COP = 4.46 (ṁ_lower quoted to two figures: 1.5 %).
describe('keys of the textbook cascade (Çengel & Boles 7th ed., from memory)', () => {
  const def = problem(
    CASCADE,
    [],
    {
      lowerRefrigerant: 'R134a',
      upperRefrigerant: 'R134a',
      evaporatorPressure: '0.14 MPa',
      lowerCondenserPressure: '0.32 MPa',
      upperEvaporatorPressure: '0.32 MPa',
      condenserPressure: '0.8 MPa',
      upperMassFlow: '0.05 kg/s',
    },
    [
      find('mB', 'totals.lowerMassFlow', 'kg/s'),
      find('QL', 'totals.capacity', 'kW'),
      find('W', 'totals.compressorPower', 'kW'),
      find('cop', 'totals.copRefrigerator', ''),
    ],
  )
  test.each(['engineering', 'chemistry'] as const)('%s course', (convention) => {
    const v = drawn(def, convention)
    expect(relErr(keyOf(v, 'mB'), 0.039)).toBeLessThan(0.015)
    expect(relErr(keyOf(v, 'QL'), 7.18)).toBeLessThan(0.01)
    expect(relErr(keyOf(v, 'W'), 1.61)).toBeLessThan(0.01)
    expect(relErr(keyOf(v, 'cop'), 4.46)).toBeLessThan(0.01)
  })
})

// ---- Keys: recomputed by hand ----------------------------------------------------------------

describe('two-stage keys against the hand calculation from the equation of state', () => {
  // Invented numbers: R-134a, −28 °C / 36 °C, flash chamber at 0.3 MPa, η 0.78 and 0.84, 0.06 kg/s.
  const def = problem(
    TWO,
    [choice('TL', '°C', [-28]), choice('TH', '°C', [36]), choice('pI', 'kPa', [300])],
    {
      refrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      condenserTemperature: 'TH',
      intermediatePressure: 'pI',
      lowStageCompressorEfficiency: '0.78',
      highStageCompressorEfficiency: '0.84',
      highStageMassFlow: '0.06 kg/s',
    },
    [
      find('x6', 'totals.flashVapourFraction', ''),
      find('qL', 'totals.refrigerationEffect', 'kJ/kg'),
      find('wLow', 'totals.lowStageWork', 'kJ/kg'),
      find('wHigh', 'totals.highStageWork', 'kJ/kg'),
      find('w', 'totals.compressorWork', 'kJ/kg'),
      find('qH', 'totals.heatRejected', 'kJ/kg'),
      find('cop', 'totals.copRefrigerator', ''),
      find('h3', 'states.3.h', 'kJ/kg'),
      find('h4', 'states.4.h', 'kJ/kg'),
      find('QL', 'totals.capacity', 'kW'),
      find('Wlow', 'totals.lowStagePower', 'kW'),
      find('Whigh', 'totals.highStagePower', 'kW'),
      find('mLow', 'totals.lowStageMassFlow', 'g/s'),
      find('QH', 'totals.heatRejectionRate', 'kW'),
    ],
  )
  const pL = ok(r134a.saturationT(273.15 - 28)).p
  const pH = ok(r134a.saturationT(273.15 + 36)).p
  const hand = twoStageByHand(r134a, pL, 300e3, pH, 0.78, 0.84, 0.06)
  const expected: Record<string, number> = {
    x6: hand.x6,
    qL: hand.qL / 1e3,
    wLow: hand.wLow / 1e3,
    wHigh: hand.wHigh / 1e3,
    w: hand.w / 1e3,
    qH: hand.qH / 1e3,
    cop: hand.cop,
    h3: hand.h3 / 1e3,
    h4: hand.h4 / 1e3,
    QL: (0.06 * hand.qL) / 1e3,
    Wlow: (0.06 * hand.wLow) / 1e3,
    Whigh: (0.06 * hand.wHigh) / 1e3,
    mLow: 0.06 * (1 - hand.x6) * 1e3,
    QH: (0.06 * hand.qH) / 1e3,
  }
  test.each(['engineering', 'chemistry'] as const)('%s course: every key within 1e-6', (convention) => {
    const v = drawn(def, convention)
    for (const [name, value] of Object.entries(expected)) expect(relErr(keyOf(v, name), value), name).toBeLessThan(1e-6)
    // The first law over the whole cycle, from the keys.
    expect(keyOf(v, 'qH')).toBeCloseTo(keyOf(v, 'qL') + keyOf(v, 'w'), 9)
    expect(v.key.some((k) => k.flipped)).toBe(false)
  })
  test('the two-stage cycle beats the single-stage one between the same temperatures (the point of it)', () => {
    const single = drawn(
      problem(
        'vapour-compression',
        [],
        {
          refrigerant: 'R134a',
          evaporatorTemperature: '-28 °C',
          condenserTemperature: '36 °C',
          compressorEfficiency: '0.8',
        },
        [find('cop', 'totals.copRefrigerator', '')],
      ),
    )
    expect(keyOf(drawn(def), 'cop')).toBeGreaterThan(keyOf(single, 'cop'))
  })
})

describe('two-stage keys with superheat and subcooling, by hand', () => {
  // Invented numbers: R-717, −32 °C with 6 K of superheat, 34 °C with 4 K of subcooling, default
  // flash pressure √(p_evap·p_cond), ideal compressors.
  const def = problem(
    TWO,
    [choice('sh', 'K', [6]), choice('sc', 'K', [4])],
    {
      refrigerant: 'R717',
      evaporatorTemperature: '-32 °C',
      condenserTemperature: '34 °C',
      superheat: 'sh',
      subcooling: 'sc',
    },
    [
      find('T1', 'states.1.T', '°C'),
      find('T5', 'states.5.T', '°C'),
      find('x6', 'totals.flashVapourFraction', ''),
      find('qL', 'totals.refrigerationEffect', 'kJ/kg'),
      find('w', 'totals.compressorWork', 'kJ/kg'),
      find('cop', 'totals.copRefrigerator', ''),
    ],
  )
  const TL = 273.15 - 32
  const TH = 273.15 + 34
  const pL = ok(r717.saturationT(TL)).p
  const pH = ok(r717.saturationT(TH)).p
  const pI = Math.sqrt(pL * pH)
  // The hand calculation again, with the superheated evaporator exit and the subcooled liquid.
  const s1 = ok(r717.stateTP(TL + 6, pL))
  const s5 = ok(r717.stateTP(TH - 4, pH))
  const s7 = ok(r717.statePx(pI, 0))
  const s9 = ok(r717.statePx(pI, 1))
  const x6 = (s5.h - s7.h) / (s9.h - s7.h)
  const s2 = compressed(r717, s1, pI, 1)
  const h3 = x6 * s9.h + (1 - x6) * s2.h
  const s4 = compressed(r717, ok(r717.statePH(pI, h3)), pH, 1)
  const qL = (1 - x6) * (s1.h - s7.h)
  const w = (1 - x6) * (s2.h - s1.h) + (s4.h - h3)
  test.each(['engineering', 'chemistry'] as const)('%s course', (convention) => {
    const v = drawn(def, convention)
    expect(keyOf(v, 'T1')).toBeCloseTo(-26, 9)
    expect(keyOf(v, 'T5')).toBeCloseTo(30, 9)
    expect(relErr(keyOf(v, 'x6'), x6)).toBeLessThan(1e-6)
    expect(relErr(keyOf(v, 'qL'), qL / 1e3)).toBeLessThan(1e-6)
    expect(relErr(keyOf(v, 'w'), w / 1e3)).toBeLessThan(1e-6)
    expect(relErr(keyOf(v, 'cop'), qL / w)).toBeLessThan(1e-6)
  })
  test('the worked solution names the superheat and subcooling and keeps the Carnot COP between the saturation temperatures', () => {
    const v = drawn(def)
    const ws = workedSolution(v, def)
    const lines = ws.sections.flatMap((x) => x.lines)
    expect(lines.some((l) => /6 K of superheat/.test(l.note ?? ''))).toBe(true)
    expect(lines.some((l) => /4 K of subcooling/.test(l.note ?? ''))).toBe(true)
    const carnot = lines.find((l) => l.tex.startsWith('\\mathrm{COP}_{R,\\text{Carnot}}'))!.tex
    // T_L is the evaporating temperature (−32 °C), not the superheated exit's 247.15 K
    expect(carnot).toContain(`\\frac{${p4(TL)}}`)
    expect(lastNumber(carnot)).toBe(p4(TL / (TH - TL)))
    expect(renderWorkedSolution(ws)).not.toContain('math-error')
  })
})

describe('cascade keys against the hand calculation from the equation of state', () => {
  // Invented numbers: R-744 below R-717, −48 °C, −4 °C / −9 °C in the exchanger, 38 °C, η 0.8 / 0.75, 12 kW.
  const def = problem(
    CASCADE,
    [choice('TL', '°C', [-48]), choice('QL', 'kW', [12])],
    {
      lowerRefrigerant: 'R744',
      upperRefrigerant: 'R-717',
      evaporatorTemperature: 'TL',
      lowerCondenserTemperature: '-4 °C',
      upperEvaporatorTemperature: '-9 °C',
      condenserTemperature: '38 °C',
      lowerCompressorEfficiency: '0.8',
      upperCompressorEfficiency: '0.75',
      capacity: 'QL',
    },
    [
      find('ratio', 'totals.massFlowRatio', ''),
      find('qL', 'totals.refrigerationEffect', 'kJ/kg'),
      find('wB', 'totals.lowerCompressorWork', 'kJ/kg'),
      find('wA', 'totals.upperCompressorWork', 'kJ/kg'),
      find('qH', 'totals.heatRejected', 'kJ/kg'),
      find('cop', 'totals.copRefrigerator', ''),
      find('mB', 'totals.lowerMassFlow', 'kg/s'),
      find('mA', 'totals.upperMassFlow', 'kg/s'),
      find('W', 'totals.compressorPower', 'kW'),
      find('dT', 'totals.exchangerTemperatureDifference', 'K', { isDifference: true }),
    ],
  )
  const p = (f: Refrigerant, c: number) => ok(f.saturationT(273.15 + c)).p
  const hand = cascadeByHand(r744, r717, [p(r744, -48), p(r744, -4), p(r717, -9), p(r717, 38)], 0.8, 0.75)
  const mB = 12e3 / hand.qL
  const expected: Record<string, number> = {
    ratio: hand.ratio,
    qL: hand.qL / 1e3,
    wB: hand.wB / 1e3,
    wA: hand.wA / 1e3,
    qH: hand.qH / 1e3,
    cop: hand.cop,
    mB,
    mA: mB * hand.ratio,
    W: (mB * hand.w) / 1e3,
    dT: 5,
  }
  test.each(['engineering', 'chemistry'] as const)('%s course: every key within 1e-6', (convention) => {
    const v = drawn(def, convention)
    for (const [name, value] of Object.entries(expected)) expect(relErr(keyOf(v, name), value), name).toBeLessThan(1e-6)
    expect(keyOf(v, 'qH')).toBeCloseTo(keyOf(v, 'qL') + keyOf(v, 'wA') + keyOf(v, 'wB'), 9)
  })
  test('the cascade’s COP obeys 1/COP = 1/COP_B + 1/COP_A + 1/(COP_A·COP_B) (series refrigerators, closed form)', () => {
    const v = drawn({
      ...def,
      finds: [
        find('cop', 'totals.copRefrigerator', ''),
        find('a', 'totals.upperCycleCop', ''),
        find('b', 'totals.lowerCycleCop', ''),
      ],
    })
    const [a, b] = [keyOf(v, 'a'), keyOf(v, 'b')]
    expect(1 / keyOf(v, 'cop')).toBeCloseTo(1 / a + 1 / b + 1 / (a * b), 9)
  })
})

// ---- Senses ----------------------------------------------------------------------------------

describe('senses: compressor work is done ON the refrigerant, condenser heat leaves it', () => {
  const twoInputs = { refrigerant: 'R134a', evaporatorTemperature: '-30 °C', condenserTemperature: '35 °C' }
  const casInputs = {
    lowerRefrigerant: 'R744',
    upperRefrigerant: 'R134a',
    evaporatorTemperature: '-45 °C',
    lowerCondenserTemperature: '-5 °C',
    upperEvaporatorTemperature: '-10 °C',
    condenserTemperature: '35 °C',
  }
  type Case = [
    string,
    string,
    Record<string, string>,
    string,
    FindSense | undefined,
    'positive' | 'negative' | 'convention',
  ]
  const cases: Case[] = [
    ['two-stage low-stage compressor, on', TWO, twoInputs, 'devices.2.w', 'work-on-system', 'positive'],
    ['two-stage high-stage compressor, by', TWO, twoInputs, 'devices.4.w', 'work-by-system', 'negative'],
    ['two-stage high-stage compressor, no sense', TWO, twoInputs, 'devices.4.w', undefined, 'convention'],
    ['two-stage totals.lowStageWork, on', TWO, twoInputs, 'totals.lowStageWork', 'work-on-system', 'positive'],
    ['two-stage totals.highStageWork, by', TWO, twoInputs, 'totals.highStageWork', 'work-by-system', 'negative'],
    ['two-stage condenser (devices.5.q), out', TWO, twoInputs, 'devices.5.q', 'heat-out-of-system', 'positive'],
    ['two-stage condenser (devices.5.q), into', TWO, twoInputs, 'devices.5.q', 'heat-into-system', 'negative'],
    ['two-stage totals.heatRejected, out', TWO, twoInputs, 'totals.heatRejected', 'heat-out-of-system', 'positive'],
    ['two-stage evaporator (devices.1.q), into', TWO, twoInputs, 'devices.1.q', 'heat-into-system', 'positive'],
    ['cascade lower compressor, on', CASCADE, casInputs, 'devices.2.w', 'work-on-system', 'positive'],
    ['cascade upper compressor, no sense', CASCADE, casInputs, 'devices.6.w', undefined, 'convention'],
    [
      'cascade totals.upperCompressorWork, by',
      CASCADE,
      casInputs,
      'totals.upperCompressorWork',
      'work-by-system',
      'negative',
    ],
    ['cascade condenser (devices.7.q), out', CASCADE, casInputs, 'devices.7.q', 'heat-out-of-system', 'positive'],
    [
      'cascade exchanger lower side (devices.3.q), out',
      CASCADE,
      casInputs,
      'devices.3.q',
      'heat-out-of-system',
      'positive',
    ],
    ['cascade totals.heatRejected, into', CASCADE, casInputs, 'totals.heatRejected', 'heat-into-system', 'negative'],
  ]
  test.each(cases)('%s', (_name, template, inputs, path, sense, want) => {
    const def = problem(template, [], inputs, [find('k', path, 'kJ/kg', sense ? { sense } : {})])
    const eng = keyOf(drawn(def, 'engineering'), 'k')
    const chem = keyOf(drawn(def, 'chemistry'), 'k')
    expect(Math.abs(eng)).toBeGreaterThan(1)
    if (want === 'convention') {
      expect(eng).toBeLessThan(0) // engineering: W done BY the refrigerant, negative for a compressor
      expect(chem).toBeCloseTo(-eng, 9)
    } else {
      const sign = want === 'positive' ? 1 : -1
      expect(Math.sign(eng)).toBe(sign)
      expect(Math.sign(chem)).toBe(sign)
      expect(chem).toBeCloseTo(eng, 9)
    }
  })

  test('every compressor total and power is a work done on the refrigerant; the COP has no sense', () => {
    for (const [template, paths] of [
      [TWO, ['lowStageWork', 'highStageWork', 'compressorWork', 'lowStagePower', 'highStagePower', 'compressorPower']],
      [CASCADE, ['lowerCompressorWork', 'upperCompressorWork', 'lowerCompressorPower', 'upperCompressorPower']],
    ] as const)
      for (const p of paths)
        expect(outputSense(`totals.${p}`, template), p).toEqual({ kind: 'fixed', sense: 'work-on-system' })
    expect(outputSense('totals.copRefrigerator', TWO)).toBeNull()
    expect(outputSense('totals.flashVapourFraction', TWO)).toBeNull()
    expect(outputSense('totals.massFlowRatio', CASCADE)).toBeNull()
    expect(outputSense('totals.capacity', CASCADE)).toEqual({ kind: 'fixed', sense: 'heat-into-system' })
  })

  test('symbols and names of the new totals', () => {
    expect(quantityAtPath('totals.flashVapourFraction', { convention: 'engineering' })?.tex).toBe('x_{6}')
    expect(quantityAtPath('totals.lowStageWork', { convention: 'chemistry' })?.tex).toBe('w_{\\text{low,in}}')
    expect(quantityAtPath('totals.highStageWork', { convention: 'engineering' })?.tex).toBe('W_{\\text{high,in}}')
    expect(quantityAtPath('totals.massFlowRatio', { convention: 'engineering' })?.name).toMatch(/upper cycle \(A\)/)
    expect(quantityAtPath('totals.upperCompressorWork', { convention: 'chemistry' })?.tex).toBe('w_{\\text{A,in}}')
  })
})

// ---- Worked solutions ----------------------------------------------------------------------------

const lastNumber = (tex: string) => Number((tex.split('=').pop() ?? '').trim().split('\\,')[0])
const p4 = (x: number) => Number(x.toPrecision(4))

describe('worked solution of the two-stage cycle', () => {
  const def = problem(
    TWO,
    [choice('TL', '°C', [-26]), choice('TH', '°C', [38])],
    {
      refrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      condenserTemperature: 'TH',
      intermediatePressure: '0.33 MPa',
      compressorEfficiency: '0.82',
      capacity: '8 kW',
    },
    [
      find('x6', 'totals.flashVapourFraction', '', { label: 'Fraction that flashes' }),
      find('Win', 'totals.compressorWork', 'kJ/kg', { label: 'Compressor work input', sense: 'work-on-system' }),
      find('cop', 'totals.copRefrigerator', '', { label: 'COP' }),
    ],
  )
  const v = drawn(def)
  const sol = v.solution as FormattedTwoStage
  const ws = workedSolution(v, def)
  const lines = ws.sections.flatMap((s) => s.lines)
  const line = (start: string) => {
    const l = lines.find((x) => x.tex.startsWith(start))
    if (!l) throw new Error(`no line starting ${start}`)
    return l.tex
  }
  const h = (i: number) => sol.states[i - 1]!.h.value / 1000

  test('sections in order, with the caution', () => {
    expect(ws.sections.map((s) => s.title)).toEqual([
      'Given',
      'Sign convention',
      'Refrigerant',
      'States (R-134a)',
      'Devices (per kg through the condenser)',
      'In the course convention',
      'Performance',
      'Answers',
    ])
    expect(ws.caution).toMatch(/not design data/)
  })

  test('throttling h6 = h5 and h8 = h7; the flash chamber’s x6 from h6, h7, h9', () => {
    expect(lastNumber(line('h_{6} = h_{5}'))).toBe(p4(h(5)))
    expect(lastNumber(line('h_{8} = h_{7}'))).toBe(p4(h(7)))
    const x6 = line('x_{6} = \\frac{h_{6} - h_{7}}{h_{9} - h_{7}}')
    expect(lastNumber(x6)).toBe(p4(sol.totals.flashVapourFraction.value))
    // The substituted numbers give the same x6 by hand (to the 4 figures shown).
    expect((h(6) - h(7)) / (h(9) - h(7))).toBeCloseTo(lastNumber(x6), 3)
  })

  test('the mixing chamber balance h3 = x6 h9 + (1 − x6) h2, and each compressor from its efficiency', () => {
    const x6 = sol.totals.flashVapourFraction.value
    expect(lastNumber(line('h_{3} = x_{6}\\,h_{9}'))).toBe(p4(h(3)))
    expect(x6 * h(9) + (1 - x6) * h(2)).toBeCloseTo(h(3), 9)
    const low = line('h_{2} = h_{1} + \\frac{h_{2s} - h_{1}}{\\eta_{\\text{low}}}')
    const high = line('h_{4} = h_{3} + \\frac{h_{4s} - h_{3}}{\\eta_{\\text{high}}}')
    expect(low).toContain('{0.8200}')
    expect(lastNumber(low)).toBe(p4(h(2)))
    expect(lastNumber(high)).toBe(p4(h(4)))
    // h2s is the isentropic state at the flash chamber pressure: (h2 − h1) η = h2s − h1.
    const h2s = ok(r134a.statePS(sol.states[1]!.p.value, sol.states[0]!.s.value)).h / 1000
    expect((h(2) - h(1)) * 0.82).toBeCloseTo(h2s - h(1), 6)
  })

  test('q_L, both works, q_H and the COP are the solver’s totals; the flow from the capacity', () => {
    const t = sol.totals
    expect(lastNumber(line('Q_{L} = (1 - x_{6})(h_{1} - h_{8})'))).toBe(p4(t.refrigerationEffect.value / 1000))
    expect(lastNumber(line('W_{\\text{low,in}} = (1 - x_{6})'))).toBe(p4(t.lowStageWork.value / 1000))
    expect(lastNumber(line('W_{\\text{high,in}} = h_{4} - h_{3}'))).toBe(p4(t.highStageWork.value / 1000))
    expect(lastNumber(line('W_{\\text{in}} = W_{\\text{low,in}} + W_{\\text{high,in}}'))).toBe(
      p4(t.compressorWork.value / 1000),
    )
    expect(lastNumber(line('Q_{H} = h_{4} - h_{5}'))).toBe(p4(t.heatRejected.value / 1000))
    expect(lastNumber(line('\\mathrm{COP}_R ='))).toBe(p4(t.copRefrigerator.value))
    expect(lastNumber(line('\\mathrm{COP}_{R,\\text{Carnot}}'))).toBe(p4(t.carnotCopRefrigerator.value))
    expect(lastNumber(line('\\dot m_{\\text{high}} = \\frac{\\dot Q_L}'))).toBe(p4(t.highStageMassFlow!.value))
    expect(t.capacity!.value).toBeCloseTo(8000, 6)
  })

  test('chemistry symbols are lower case, the compressors’ w positive; rendered without TeX errors or paths', () => {
    const chem = workedSolution(drawn(def, 'chemistry'), def)
    const all = chem.sections.flatMap((s) => s.lines).map((l) => l.tex)
    expect(all.some((t) => t.startsWith('q_{L} = (1 - x_{6})'))).toBe(true)
    expect(all.find((t) => t.startsWith('\\text{low-stage compressor}'))).toMatch(/w = [0-9]/)
    for (const w of [ws, chem]) {
      const html = renderWorkedSolution(w)
      expect(html).not.toContain('math-error')
      expect(html).not.toMatch(/totals\.|devices\.|states\./)
    }
  })
})

describe('worked solution of the cascade', () => {
  const def = problem(
    CASCADE,
    [],
    {
      lowerRefrigerant: 'R744',
      upperRefrigerant: 'R717',
      evaporatorTemperature: '-45 °C',
      lowerCondenserTemperature: '-5 °C',
      upperEvaporatorTemperature: '-10 °C',
      condenserTemperature: '35 °C',
      compressorEfficiency: '0.8',
      upperMassFlow: '0.02 kg/s',
    },
    [find('ratio', 'totals.massFlowRatio', '', { label: 'Mass flow ratio' })],
  )
  const v = drawn(def)
  const sol = v.solution as FormattedCascade
  const ws = workedSolution(v, def)
  const lines = ws.sections.flatMap((s) => s.lines)
  const line = (start: string) => {
    const l = lines.find((x) => x.tex.startsWith(start))
    if (!l) throw new Error(`no line starting ${start}`)
    return l.tex
  }
  const h = (i: number) => sol.states[i - 1]!.h.value / 1000

  test('sections: each cycle on its own refrigerant, then the exchanger', () => {
    expect(ws.sections.map((s) => s.title)).toEqual([
      'Given',
      'Sign convention',
      'Refrigerants',
      'Lower cycle B (R-744)',
      'Upper cycle A (R-717)',
      'Cascade heat exchanger',
      'Devices (per kg of the lower cycle’s refrigerant)',
      'In the course convention',
      'Performance',
      'Answers',
    ])
    const notes = ws.sections[2]!.lines.map((l) => l.note).join(' ')
    expect(notes).toMatch(/Span and Wagner \(1996\)/) // R-744's equation of state
  })

  test('the exchanger’s balance gives ṁ_A/ṁ_B = (h2 − h3)/(h5 − h8)', () => {
    const r = line('\\frac{\\dot m_A}{\\dot m_B} = \\frac{h_{2} - h_{3}}{h_{5} - h_{8}}')
    expect(lastNumber(r)).toBe(p4(sol.totals.massFlowRatio.value))
    expect((h(2) - h(3)) / (h(5) - h(8))).toBeCloseTo(sol.totals.massFlowRatio.value, 9)
    expect(lastNumber(line('h_{4} = h_{3}'))).toBe(p4(h(3)))
    expect(lastNumber(line('h_{8} = h_{7}'))).toBe(p4(h(7)))
  })

  test('each cycle’s work, the COP and the lower flow from the upper one', () => {
    const t = sol.totals
    expect(lastNumber(line('W_{\\text{B,in}} = h_{2} - h_{1}'))).toBe(p4(t.lowerCompressorWork.value / 1000))
    expect(lastNumber(line('W_{\\text{A,in}} = \\frac{\\dot m_A}{\\dot m_B}(h_{6} - h_{5})'))).toBe(
      p4(t.upperCompressorWork.value / 1000),
    )
    expect(lastNumber(line('\\mathrm{COP}_R ='))).toBe(p4(t.copRefrigerator.value))
    expect(lastNumber(line('\\dot m_B = \\frac{\\dot m_A}'))).toBe(p4(t.lowerMassFlow!.value))
    expect(t.upperMassFlow!.value).toBeCloseTo(0.02, 12)
    const html = renderWorkedSolution(ws)
    expect(html).not.toContain('math-error')
    expect(html).not.toMatch(/totals\.|devices\.|states\./)
  })
})

// ---- Diagrams ------------------------------------------------------------------------------------

/** x on a dome branch at pressure p (interpolated in log p); the branches split at the top. */
function domeAt(plot: Plot, p: number): { liquid: number; vapour: number } {
  const pts = plot.dome!.points
  const top = pts.reduce((k, pt, i) => (pt[1] > pts[k]![1] ? i : k), 0)
  const at = (branch: [number, number][]) => {
    const sorted = [...branch].sort((a, b) => a[1] - b[1])
    for (let i = 0; i + 1 < sorted.length; i++) {
      const [x0, y0] = sorted[i]!
      const [x1, y1] = sorted[i + 1]!
      if (p >= y0 && p <= y1) return x0 + ((x1 - x0) * Math.log(p / y0)) / Math.log(y1 / y0)
    }
    return Number.NaN
  }
  return { liquid: at(pts.slice(0, top + 1)), vapour: at(pts.slice(top)) }
}

describe('diagrams of the two-stage cycle', () => {
  const v = drawn(
    problem(TWO, [], { refrigerant: 'R134a', evaporatorPressure: '0.14 MPa', condenserPressure: '0.8 MPa' }, [
      find('cop', 'totals.copRefrigerator', ''),
    ]),
  )
  const sol = v.solution as FormattedTwoStage
  const d = cycleDiagrams(sol)

  test('p–h (log p), T–s and P–v, each with the R-134a dome and the ten paths', () => {
    expect(d.ph?.y.scale).toBe('log')
    expect(d.second).toBeUndefined()
    for (const plot of [d.ph!, d.ts, d.pv]) {
      expect(plot.dome?.fluid).toBe('R-134a')
      expect(plot.points.map((p) => p.label)).toEqual(['1', '2', '3', '4', '5', '6', '7', '8', '9'])
      expect(plot.curves.map((c) => `${c.from}→${c.to}`)).toEqual([
        '1→2',
        '2→3',
        '3→4',
        '4→5',
        '5→6',
        '6→7',
        '7→8',
        '8→1',
        '6→9',
        '9→3',
      ])
    }
    const styles = Object.fromEntries(d.ph!.curves.map((c) => [`${c.from}→${c.to}`, c.style]))
    expect(styles['1→2']).toBe('solid') // isentropic compressors
    expect(styles['3→4']).toBe('solid')
    expect(styles['5→6']).toBe('dashed') // valves
    expect(styles['7→8']).toBe('dashed')
    expect(styles['6→9']).toBe('dashed') // flash chamber separation, mixing
  })

  test('valves are vertical and the flash chamber horizontal on the p–h chart; T constant inside the dome', () => {
    const c = (from: string, to: string, plot: Plot) => plot.curves.find((x) => x.from === from && x.to === to)!
    for (const [a, b] of [
      ['5', '6'],
      ['7', '8'],
    ]) {
      const pts = c(a!, b!, d.ph!).points
      expect(pts[0]![0]).toBeCloseTo(pts.at(-1)![0], 9)
    }
    const pI = sol.totals.intermediatePressure.value / 1000
    for (const [a, b] of [
      ['6', '7'],
      ['6', '9'],
      ['2', '3'],
      ['9', '3'],
    ])
      for (const [, p] of c(a!, b!, d.ph!).points) expect(p).toBeCloseTo(pI, 6)
    const Tsat = ok(r134a.saturationP(sol.totals.intermediatePressure.value)).T
    for (const [, T] of c('6', '7', d.ts).points) expect(T).toBeCloseTo(Tsat, 6)
    // Isentropic compressors are vertical in T–s.
    for (const [s] of c('3', '4', d.ts).points) expect(s).toBeCloseTo(sol.states[2]!.s.value / 1000, 6)
  })

  test('each state on its side of the dome', () => {
    const ph = d.ph!
    const pt = (label: string) => ph.points.find((p) => p.label === label)!
    const at = (label: string) => domeAt(ph, pt(label).y)
    expect(pt('2').x).toBeGreaterThan(at('2').vapour) // superheated after the low stage
    expect(pt('4').x).toBeGreaterThan(at('4').vapour)
    expect(pt('6').x).toBeGreaterThan(at('6').liquid) // wet in the flash chamber
    expect(pt('6').x).toBeLessThan(at('6').vapour)
    expect(pt('8').x).toBeGreaterThan(at('8').liquid)
    expect(Math.abs(pt('7').x - at('7').liquid) / pt('7').x).toBeLessThan(0.01) // saturated liquid
    expect(Math.abs(pt('9').x - at('9').vapour) / pt('9').x).toBeLessThan(0.01) // saturated vapour
  })

  test('described for screen readers and drawn', () => {
    const text = describePlot(d.ph!)
    expect(text).toMatch(/^p–h diagram — two-stage cycle, R-134a, logarithmic pressure axis\./)
    expect(text).toMatch(/2 to 3, mixing chamber/)
    expect(text).toMatch(/6 to 9, flash chamber \(saturated vapour separated\), dashed/)
    expect(text).toMatch(/saturation dome of R-134a/)
    const html = renderToStaticMarkup(createElement(CycleDiagrams, { diagrams: d }))
    expect(html.match(/role="img"/g)).toHaveLength(3)
    expect(html.match(/data-dome=""/g)).toHaveLength(3)
  })

  test('a compressor below 100 % efficiency is dashed', () => {
    const real = cycleDiagrams(
      drawn(
        problem(
          TWO,
          [],
          {
            refrigerant: 'R717',
            evaporatorTemperature: '-30 °C',
            condenserTemperature: '35 °C',
            lowStageCompressorEfficiency: '0.8',
          },
          [find('cop', 'totals.copRefrigerator', '')],
        ),
      ).solution,
    )
    expect(real.ph!.curves[0]).toMatchObject({
      style: 'dashed',
      process: 'low-stage compressor (irreversible compression)',
    })
    expect(real.ph!.curves[2]).toMatchObject({
      style: 'solid',
      process: 'high-stage compressor (isentropic compression)',
    })
    expect(real.ph!.dome?.fluid).toBe('R-717')
  })
})

describe('diagrams of the cascade: each cycle on its own refrigerant’s dome', () => {
  const v = drawn(
    problem(
      CASCADE,
      [],
      {
        lowerRefrigerant: 'R744',
        upperRefrigerant: 'R717',
        evaporatorTemperature: '-45 °C',
        lowerCondenserTemperature: '-5 °C',
        upperEvaporatorTemperature: '-10 °C',
        condenserTemperature: '35 °C',
      },
      [find('cop', 'totals.copRefrigerator', '')],
    ),
  )
  const sol = v.solution as FormattedCascade
  const d = cycleDiagrams(sol)

  test('the lower cycle on R-744’s dome, the upper on R-717’s, beside each other plot by plot', () => {
    expect(d.second).toBeDefined()
    for (const plot of [d.ph!, d.ts, d.pv]) {
      expect(plot.dome?.fluid).toBe('R-744')
      expect(plot.title).toMatch(/lower cycle, R-744/)
      expect(plot.curves.map((c) => `${c.from}→${c.to}`)).toEqual(['1→2', '2→3', '3→4', '4→1'])
    }
    const up = d.second!
    for (const plot of [up.ph!, up.ts, up.pv]) {
      expect(plot.dome?.fluid).toBe('R-717')
      expect(plot.title).toMatch(/upper cycle, R-717/)
      expect(plot.curves.map((c) => `${c.from}→${c.to}`)).toEqual(['5→6', '6→7', '7→8', '8→5'])
    }
    expect(diagramPlots(d).map((p) => p.title.split(' — ')[0] + ' ' + p.dome?.fluid)).toEqual([
      'p–h diagram R-744',
      'p–h diagram R-717',
      'T–s diagram R-744',
      'T–s diagram R-717',
      'P–v diagram R-744',
      'P–v diagram R-717',
    ])
    // The two domes are different fluids' (R-744's critical point is 7.38 MPa, R-717's 11.3 MPa; from memory).
    const top = (p: Plot) => Math.max(...p.dome!.points.map(([, y]) => y))
    expect(top(d.ph!)).toBeGreaterThan(7.3e3)
    expect(top(d.ph!)).toBeLessThan(7.5e3)
    expect(top(up.ph!)).toBeGreaterThan(11.2e3)
    expect(top(up.ph!)).toBeLessThan(11.5e3)
  })

  test('the exchanger’s two sides are named, and the states sit on their sides of their own domes', () => {
    expect(d.ph!.curves[1]!.process).toMatch(/cascade heat exchanger, lower cycle condensing/)
    expect(d.second!.ph!.curves[3]!.process).toMatch(/cascade heat exchanger, upper cycle evaporating/)
    const side = (plot: Plot, label: string) => {
      const pt = plot.points.find((p) => p.label === label)!
      return { x: pt.x, ...domeAt(plot, pt.y) }
    }
    const s3 = side(d.ph!, '3')
    expect(Math.abs(s3.x - s3.liquid) / s3.x).toBeLessThan(0.01)
    const s4 = side(d.ph!, '4')
    expect(s4.x).toBeGreaterThan(s4.liquid)
    expect(s4.x).toBeLessThan(s4.vapour)
    const s6 = side(d.second!.ph!, '6')
    expect(s6.x).toBeGreaterThan(s6.vapour)
  })

  test('drawn as six titled, described figures', () => {
    const html = renderToStaticMarkup(createElement(CycleDiagrams, { diagrams: d }))
    expect(html.match(/role="img"/g)).toHaveLength(6)
    const titles = [...html.matchAll(/<title id="[^"]*">([^<]*)<\/title>/g)].map((m) => m[1])
    expect(new Set(titles).size).toBe(6)
    expect(describePlot(d.second!.ts)).toMatch(/^T–s diagram — upper cycle, R-717\./)
    expect(describePlot(d.second!.ts)).toMatch(/saturation dome of R-717/)
  })
})

// ---- Sweep and lint --------------------------------------------------------------------------------

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> }
function tamper<S>(base: DrawResult, edit: (s: Mutable<S>) => void): DrawResult {
  if (!base.ok) throw new Error(base.error.message)
  const copy = structuredClone(base.variant) as Mutable<Variant>
  edit(copy.solution as unknown as Mutable<S>)
  return { ok: true, variant: copy as Variant }
}

describe('sweep of the two-stage cycle', () => {
  const base = drawVariant(
    problem(TWO, [], { refrigerant: 'R134a', evaporatorTemperature: '-30 °C', condenserTemperature: '35 °C' }, [
      find('cop', 'totals.copRefrigerator', ''),
    ]),
    1,
    { convention: 'engineering' },
  )
  test('a sound variant has no findings', () => expect(checkVariantSanity(base)).toEqual([]))
  test.each<[string, (s: Mutable<FormattedTwoStage>) => void, string]>([
    [
      'a COP above the Carnot COP',
      (s) => void (s.totals.copRefrigerator.value = s.totals.carnotCopRefrigerator.value * 1.05),
      'efficiency-out-of-range',
    ],
    [
      'a cycle balance that does not close',
      (s) => void (s.totals.heatRejected.value *= 1.01),
      'efficiency-out-of-range',
    ],
    ['a flash chamber that does not balance', (s) => void (s.states[5]!.h.value *= 1.01), 'efficiency-out-of-range'],
    ['a mixing chamber that does not balance', (s) => void (s.states[2]!.h.value *= 1.01), 'efficiency-out-of-range'],
    ['a vapour fraction above 1', (s) => void (s.totals.flashVapourFraction.value = 1.2), 'quality-out-of-range'],
    ['a quality below 0', (s) => void (s.states[7]!.x = -0.1), 'quality-out-of-range'],
    ['a state below absolute zero', (s) => void (s.states[0]!.T.value = -3), 'temperature-not-positive'],
  ])('%s is reported', (_name, edit, code) => {
    expect(checkVariantSanity(tamper(base, edit)).map((f) => f.code)).toContain(code)
  })

  test('a drawn flash chamber pressure outside the evaporator–condenser range is found, with its givens', () => {
    const def = problem(
      TWO,
      [
        {
          name: 'pI',
          label: 'flash chamber pressure',
          unit: 'kPa',
          rule: { kind: 'range', min: 50, max: 450, step: 100 },
        },
      ],
      {
        refrigerant: 'R134a',
        evaporatorTemperature: '-30 °C',
        condenserTemperature: '35 °C',
        intermediatePressure: 'pI',
      },
      [find('cop', 'totals.copRefrigerator', '')],
    )
    const summary = sweepVariants(def, {
      seeds: Array.from({ length: 30 }, (_, i) => i + 1),
      convention: 'engineering',
    })
    expect(summary.failed).toBeGreaterThan(0)
    expect(summary.failed).toBeLessThan(30)
    const f = summary.failures[0]!
    expect(f.code).toBe('solve-error')
    expect(f.message).toMatch(/flash chamber's pressure/)
    expect(f.givens?.some((g) => g.startsWith('pI = 50'))).toBe(true)
  })
})

describe('sweep of the cascade', () => {
  const base = drawVariant(
    problem(
      CASCADE,
      [],
      {
        lowerRefrigerant: 'R744',
        upperRefrigerant: 'R134a',
        evaporatorTemperature: '-45 °C',
        lowerCondenserTemperature: '-5 °C',
        upperEvaporatorTemperature: '-10 °C',
        condenserTemperature: '35 °C',
      },
      [find('cop', 'totals.copRefrigerator', '')],
    ),
    1,
    { convention: 'chemistry' },
  )
  test('a sound variant has no findings', () => expect(checkVariantSanity(base)).toEqual([]))
  test.each<[string, (s: Mutable<FormattedCascade>) => void, string]>([
    [
      'an exchanger that does not balance',
      (s) => void (s.totals.massFlowRatio.value *= 1.02),
      'efficiency-out-of-range',
    ],
    [
      'heat flowing from the colder cycle',
      (s) => void (s.states[2]!.T.value = s.states[4]!.T.value - 2),
      'efficiency-out-of-range',
    ],
    ['a COP of zero', (s) => void (s.totals.copRefrigerator.value = 0), 'efficiency-out-of-range'],
    ['a quality above 1', (s) => void (s.states[3]!.x = 1.3), 'quality-out-of-range'],
  ])('%s is reported', (_name, edit, code) => {
    expect(checkVariantSanity(tamper(base, edit)).map((f) => f.code)).toContain(code)
  })

  test('an exchanger where the lower cycle condenses colder than the upper evaporates is refused by the solver', () => {
    const def = problem(
      CASCADE,
      [{ name: 'TX', label: 'lower condensing', unit: '°C', rule: { kind: 'range', min: -16, max: -4, step: 4 } }],
      {
        lowerRefrigerant: 'R744',
        upperRefrigerant: 'R134a',
        evaporatorTemperature: '-45 °C',
        lowerCondenserTemperature: 'TX',
        upperEvaporatorTemperature: '-10 °C',
        condenserTemperature: '35 °C',
      },
      [find('cop', 'totals.copRefrigerator', '')],
    )
    const summary = sweepVariants(def, {
      seeds: Array.from({ length: 30 }, (_, i) => i + 1),
      convention: 'engineering',
    })
    expect(summary.failed).toBeGreaterThan(0)
    expect(summary.failed).toBeLessThan(30)
    expect(summary.failures[0]!.message).toMatch(/heat cannot flow from the lower cycle to the upper one/)
  })
})

describe('lint', () => {
  const inputs = { refrigerant: 'R134a', evaporatorTemperature: '-30 °C', condenserTemperature: '35 °C' }
  test('a sound problem has no findings; a path of another cycle is answered with this cycle’s paths', () => {
    expect(lintDefinition(problem(TWO, [], inputs, [find('x6', 'totals.flashVapourFraction', '')]))).toEqual([])
    const wrong = lintDefinition(problem(TWO, [], inputs, [find('w', 'totals.netWork', 'kJ/kg')]))
    expect(wrong.map((f) => f.path)).toEqual(['finds.0.source.path'])
    expect(wrong[0]!.message).toMatch(/totals\.flashVapourFraction/)
  })
  test('a rate without a flow or capacity is named, with the inputs that would give it', () => {
    const rate = lintDefinition(problem(TWO, [], inputs, [find('W', 'totals.compressorPower', 'kW')]))
    expect(rate.map((f) => f.path)).toEqual(['finds.0.source.path'])
    expect(rate[0]!.message).toMatch(/need highStageMassFlow, lowStageMassFlow or capacity/)
    const cas = lintDefinition(
      problem(
        CASCADE,
        [],
        {
          lowerRefrigerant: 'R744',
          upperRefrigerant: 'R134a',
          evaporatorTemperature: '-45 °C',
          lowerCondenserTemperature: '-5 °C',
          upperEvaporatorTemperature: '-10 °C',
          condenserTemperature: '35 °C',
        },
        [find('m', 'totals.upperMassFlow', 'kg/s')],
      ),
    )
    expect(cas[0]!.message).toMatch(/need lowerMassFlow, upperMassFlow or capacity/)
  })
  test('an unknown input and a sense on a COP are refused', () => {
    expect(
      lintDefinition(
        problem(TWO, [], { ...inputs, superheatt: '5 K' }, [find('cop', 'totals.copRefrigerator', '')]),
      ).map((f) => f.path),
    ).toContain('physics.inputs.superheatt')
    expect(
      lintDefinition(
        problem(TWO, [], inputs, [find('cop', 'totals.copRefrigerator', '', { sense: 'work-on-system' })]),
      ).map((f) => f.path),
    ).toContain('finds.0.sense')
  })
})
