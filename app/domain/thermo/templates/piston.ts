/**
 * Over-expanded piston cycles (air-standard, closed system), built on the general solver.
 *
 * Atkinson: 1→2 isentropic compression (compression ratio rc = V1/V2), 2→3 heat addition at
 * constant volume, 3→4 isentropic expansion all the way down to p1 (expansion ratio
 * re = V4/V3 > rc), 4→1 heat rejection at constant pressure.
 *
 * Miller (the over-expanded cycle of Pulkrabek, Engineering Fundamentals of the Internal
 * Combustion Engine, 2nd ed., §3-8, air-standard form; from memory): 1→2 isentropic compression
 * (rc = V1/V2), 2→3 heat addition at constant volume, 3→4 isentropic expansion with
 * re = V4/V3 > rc, 4→5 heat rejection at constant volume (blowdown) down to p1, 5→1 heat
 * rejection at constant pressure back to V1. At the full-expansion point (p4 = p1) it is the
 * Atkinson cycle; with re = rc it is the Otto cycle.
 *
 * Both use, exactly for any ideal gas, that the state at p1 with volume re·V2 = (re/rc)·V1 has
 * T = T1·re/rc (pv = RT at equal pressure).
 */
import type { StepSpec } from '../cycle.ts'
import { SECOND_LAW_INPUTS, withSecondLaw } from './second-law-inputs.ts'
import type { BuildResult, TemplateDef, TemplateInput, TemplateValues } from './types.ts'
import { defineTemplate } from './types.ts'

const bad = (message: string, property?: string): BuildResult => ({
  ok: false,
  error: { code: 'invalid-input', message, property },
})

const GAS: TemplateInput = {
  name: 'gas',
  dimension: 'gas',
  unit: '',
  description: 'working gas: preset id (air, nasa:dry-air, …) or constants; default air',
  required: false,
}
const P1: TemplateInput = {
  name: 'p1',
  dimension: 'pressure',
  unit: 'kPa',
  description: 'pressure at state 1 (start of compression)',
  required: true,
}
const T1: TemplateInput = {
  name: 'T1',
  dimension: 'temperature',
  unit: 'K',
  description: 'temperature at state 1 (start of compression)',
  required: true,
}
const RC: TemplateInput = {
  name: 'compressionRatio',
  dimension: 'dimensionless',
  unit: '',
  description: 'compression ratio rc = V1/V2 > 1',
  required: true,
}
const T3: TemplateInput = {
  name: 'T3',
  dimension: 'temperature',
  unit: 'K',
  description: 'peak temperature (end of heat addition)',
  required: false,
}
const HEAT: TemplateInput = {
  name: 'heatIn',
  dimension: 'heat',
  unit: 'kJ/kg or kJ',
  description: 'heat added at constant volume 2→3',
  required: false,
}
const TAIL: TemplateInput[] = [
  {
    name: 'amount',
    dimension: 'amount',
    unit: 'kg or mol',
    description: 'amount of gas (optional: without it results are per kg or per mol)',
    required: false,
  },
  {
    name: 'V1',
    dimension: 'volume',
    unit: 'L or m^3',
    description: 'total volume at state 1 (optional; fixes the amount)',
    required: false,
  },
  {
    name: 'reservoirHot',
    dimension: 'temperature',
    unit: 'K',
    description: 'hot reservoir temperature (optional, for the entropy generated)',
    required: false,
  },
  {
    name: 'reservoirCold',
    dimension: 'temperature',
    unit: 'K',
    description: 'cold reservoir temperature (optional, for the entropy generated)',
    required: false,
  },
  ...SECOND_LAW_INPUTS,
]

function reservoirs(v: TemplateValues) {
  const hot = v.num.reservoirHot
  const cold = v.num.reservoirCold
  return hot === undefined && cold === undefined ? undefined : { hot, cold }
}

const atkinson = defineTemplate({
  id: 'atkinson',
  title: 'Atkinson cycle (air-standard, full expansion)',
  description:
    '1→2 isentropic compression (rc = V1/V2), 2→3 heat addition at constant volume, 3→4 isentropic expansion down to p1 (re = V4/V3 > rc), 4→1 heat rejection at constant pressure. Give one of expansionRatio, T3 or heatIn.',
  inputs: [
    GAS,
    P1,
    T1,
    RC,
    {
      name: 'expansionRatio',
      dimension: 'dimensionless',
      unit: '',
      description: 're = V4/V3, larger than the compression ratio',
      required: false,
    },
    T3,
    HEAT,
    ...TAIL,
  ],
  build(v) {
    const rc = v.num.compressionRatio!
    if (!(rc > 1)) return bad(`compressionRatio must exceed 1 (got ${rc})`, 'compressionRatio')
    const re = v.num.expansionRatio
    const q = v.heat.heatIn
    if ([re, v.num.T3, q].filter((x) => x !== undefined).length !== 1)
      return bad('give exactly one of expansionRatio, T3 or heatIn', 'expansionRatio')
    if (re !== undefined && !(re > rc))
      return bad(
        `expansionRatio (${re}) must be larger than compressionRatio (${rc}) in the Atkinson cycle; with equal ratios use the Otto cycle`,
        'expansionRatio',
      )
    const steps: StepSpec[] = [
      { process: 'isentropic', volumeRatio: 1 / rc, label: 'compression' },
      { process: 'isochoric', expectHeat: 'in', label: 'heat addition', ...q },
      { process: 'isentropic', label: 'expansion to p1' },
      { process: 'isobaric', expectHeat: 'out', label: 'heat rejection' },
    ]
    const s4 = re === undefined ? {} : { T: (v.num.T1! * re) / rc }
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'closed',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [{ p: v.num.p1, T: v.num.T1, V: v.num.V1 }, {}, { T: v.num.T3 }, s4],
        steps,
        labels: v.labels,
      },
      [null, 'source', null, 'sink'],
    )
  },
})

const miller = defineTemplate({
  id: 'miller',
  title: 'Miller cycle (air-standard, over-expanded)',
  description:
    '1→2 isentropic compression (rc = V1/V2), 2→3 heat addition at constant volume, 3→4 isentropic expansion (re = V4/V3 > rc), 4→5 heat rejection at constant volume down to p1, 5→1 heat rejection at constant pressure. Give one of T3 or heatIn.',
  inputs: [
    GAS,
    P1,
    T1,
    RC,
    {
      name: 'expansionRatio',
      dimension: 'dimensionless',
      unit: '',
      description: 're = V4/V3, larger than the compression ratio',
      required: true,
    },
    T3,
    HEAT,
    ...TAIL,
  ],
  build(v) {
    const rc = v.num.compressionRatio!
    const re = v.num.expansionRatio!
    if (!(rc > 1)) return bad(`compressionRatio must exceed 1 (got ${rc})`, 'compressionRatio')
    if (!(re > rc))
      return bad(
        `expansionRatio (${re}) must be larger than compressionRatio (${rc}) in the Miller cycle; with equal ratios use the Otto cycle`,
        'expansionRatio',
      )
    const q = v.heat.heatIn
    if ((v.num.T3 === undefined) === (q === undefined)) return bad('give exactly one of T3 or heatIn', 'T3')
    const steps: StepSpec[] = [
      { process: 'isentropic', volumeRatio: 1 / rc, label: 'compression' },
      { process: 'isochoric', expectHeat: 'in', label: 'heat addition', ...q },
      { process: 'isentropic', label: 'expansion' },
      { process: 'isochoric', expectHeat: 'out', label: 'blowdown (heat rejection at constant volume)' },
      { process: 'isobaric', expectHeat: 'out', label: 'heat rejection at constant pressure' },
    ]
    const T5 = (v.num.T1! * re) / rc
    // Over-expansion check with the gas's own functions (any ideal gas): p4/p1 = T4/T5 since
    // V4 = V5. Skipped when a temperature is out of the data's range (the solver says so then).
    const T2 = v.gas.isentropicTfromV(v.num.T1!, rc, 1)
    const T3 = v.num.T3 ?? (q?.heat !== undefined ? v.gas.TfromU(v.gas.u(T2) + q.heat) : NaN)
    const T4 = v.gas.isentropicTfromV(T3, 1, re)
    if (Number.isFinite(T4) && T4 < T5) {
      const p4 = (v.num.p1! * T4) / T5
      return bad(
        `with expansionRatio ${re} the expansion ends at ${+(p4 / 1000).toPrecision(4)} kPa, below p1 (${+(v.num.p1! / 1000).toPrecision(4)} kPa), so there is no blowdown to reject heat: lower expansionRatio, or use the atkinson template for expansion down to p1`,
        'expansionRatio',
      )
    }
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'closed',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [{ p: v.num.p1, T: v.num.T1, V: v.num.V1 }, {}, { T: v.num.T3 }, {}, { p: v.num.p1, T: T5 }],
        steps,
        labels: v.labels,
      },
      [null, 'source', null, 'sink', 'sink'],
    )
  },
})

export const PISTON_TEMPLATES: readonly TemplateDef[] = [atkinson, miller]
