/**
 * Ideal-gas templates: Carnot (engine, refrigerator, heat pump), Otto, Diesel, dual, Brayton
 * (simple with optional component efficiencies; regenerative with effectiveness), Stirling and
 * Ericsson with ideal regenerators. State numbering follows the usual textbook figures (state 1
 * at the start of compression for piston and gas-turbine cycles).
 */
import type { StateSpec, StepSpec } from '../cycle.ts'
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
  description: 'working gas: preset id (air, monatomic, diatomic, nasa:dry-air, nasa:N2, …) or constants; default air',
  required: false,
}
const AMOUNT: TemplateInput = {
  name: 'amount',
  dimension: 'amount',
  unit: 'kg or mol',
  description: 'amount of gas (optional: without it results are per kg or per mol)',
  required: false,
}
const V1: TemplateInput = {
  name: 'V1',
  dimension: 'volume',
  unit: 'L or m^3',
  description: 'total volume at state 1 (optional; fixes the amount)',
  required: false,
}
const RES_HOT: TemplateInput = {
  name: 'reservoirHot',
  dimension: 'temperature',
  unit: 'K',
  description: 'hot reservoir temperature (optional, for the entropy generated)',
  required: false,
}
const RES_COLD: TemplateInput = {
  name: 'reservoirCold',
  dimension: 'temperature',
  unit: 'K',
  description: 'cold reservoir temperature (optional, for the entropy generated)',
  required: false,
}
const P1: TemplateInput = {
  name: 'p1',
  dimension: 'pressure',
  unit: 'kPa',
  description: 'pressure at state 1',
  required: true,
}
const T1: TemplateInput = {
  name: 'T1',
  dimension: 'temperature',
  unit: 'K',
  description: 'temperature at state 1 (start of compression)',
  required: true,
}
const R_C: TemplateInput = {
  name: 'compressionRatio',
  dimension: 'dimensionless',
  unit: '',
  description: 'compression ratio r = Vmax/Vmin > 1',
  required: true,
}
const COMMON_TAIL = [AMOUNT, V1, RES_HOT, RES_COLD, ...SECOND_LAW_INPUTS]

function reservoirs(v: TemplateValues) {
  const hot = v.num.reservoirHot
  const cold = v.num.reservoirCold
  return hot === undefined && cold === undefined ? undefined : { hot, cold }
}

function ratioAbove1(v: TemplateValues, name: string): BuildResult | null {
  const x = v.num[name]
  if (x !== undefined && !(x > 1)) return bad(`${name} must exceed 1 (got ${x})`, name)
  return null
}

function state1(v: TemplateValues, T: number | undefined): StateSpec {
  return { p: v.num.p1, T, V: v.num.V1 }
}

const otto = defineTemplate({
  id: 'otto',
  title: 'Otto cycle (air-standard spark ignition)',
  description:
    '1→2 isentropic compression (ratio r), 2→3 heat addition at constant volume, 3→4 isentropic expansion, 4→1 heat rejection at constant volume. Give one of T3, heatIn or p3.',
  inputs: [
    GAS,
    P1,
    T1,
    R_C,
    { name: 'T3', dimension: 'temperature', unit: 'K', description: 'peak temperature', required: false },
    { name: 'heatIn', dimension: 'heat', unit: 'kJ/kg or kJ', description: 'heat added 2→3', required: false },
    { name: 'p3', dimension: 'pressure', unit: 'kPa', description: 'peak pressure', required: false },
    ...COMMON_TAIL,
  ],
  build(v) {
    const e = ratioAbove1(v, 'compressionRatio')
    if (e) return e
    const r = v.num.compressionRatio!
    const { T3, p3 } = v.num
    const q = v.heat.heatIn
    if ([T3, p3, q].filter((x) => x !== undefined).length !== 1)
      return bad('give exactly one of T3, heatIn or p3', 'T3')
    const steps: StepSpec[] = [
      { process: 'isentropic', volumeRatio: 1 / r, label: 'compression' },
      { process: 'isochoric', expectHeat: 'in', label: 'heat addition', ...q },
      { process: 'isentropic', label: 'expansion' },
      { process: 'isochoric', label: 'heat rejection' },
    ]
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'closed',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [state1(v, v.num.T1), {}, { T: T3, p: p3 }, {}],
        steps,
        labels: v.labels,
      },
      [null, 'source', null, 'sink'],
    )
  },
})

const diesel = defineTemplate({
  id: 'diesel',
  title: 'Diesel cycle (air-standard compression ignition)',
  description:
    '1→2 isentropic compression (ratio r), 2→3 heat addition at constant pressure (cutoff ratio rc = V3/V2), 3→4 isentropic expansion, 4→1 heat rejection at constant volume. Give one of cutoffRatio, T3 or heatIn.',
  inputs: [
    GAS,
    P1,
    T1,
    R_C,
    {
      name: 'cutoffRatio',
      dimension: 'dimensionless',
      unit: '',
      description: 'cutoff ratio rc = V3/V2 > 1',
      required: false,
    },
    {
      name: 'T3',
      dimension: 'temperature',
      unit: 'K',
      description: 'temperature at the end of heat addition',
      required: false,
    },
    { name: 'heatIn', dimension: 'heat', unit: 'kJ/kg or kJ', description: 'heat added 2→3', required: false },
    ...COMMON_TAIL,
  ],
  build(v) {
    const e = ratioAbove1(v, 'compressionRatio') ?? ratioAbove1(v, 'cutoffRatio')
    if (e) return e
    const r = v.num.compressionRatio!
    const rc = v.num.cutoffRatio
    const q = v.heat.heatIn
    if ([rc, v.num.T3, q].filter((x) => x !== undefined).length !== 1)
      return bad('give exactly one of cutoffRatio, T3 or heatIn', 'cutoffRatio')
    if (rc !== undefined && !(rc < r))
      return bad(
        `cutoffRatio must be below the compression ratio ${r}: heat addition ends at V3 = rc·V2, which must stay below V1 = r·V2 (got rc = ${rc})`,
        'cutoffRatio',
      )
    const steps: StepSpec[] = [
      { process: 'isentropic', volumeRatio: 1 / r, label: 'compression' },
      { process: 'isobaric', volumeRatio: rc, expectHeat: 'in', label: 'heat addition', ...q },
      { process: 'isentropic', label: 'expansion' },
      { process: 'isochoric', label: 'heat rejection' },
    ]
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'closed',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [state1(v, v.num.T1), {}, { T: v.num.T3 }, {}],
        steps,
      },
      [null, 'source', null, 'sink'],
    )
  },
})

const dual = defineTemplate({
  id: 'dual',
  title: 'Dual (limited-pressure) cycle',
  description:
    '1→2 isentropic compression (r), 2→3 heat at constant volume (pressure ratio rp = p3/p2, or peak pressure p3), 3→4 heat at constant pressure (cutoff ratio rc = V4/V3, or peak temperature T4), 4→5 isentropic expansion, 5→1 rejection at constant volume.',
  inputs: [
    GAS,
    P1,
    T1,
    R_C,
    { name: 'pressureRatio', dimension: 'dimensionless', unit: '', description: 'rp = p3/p2 ≥ 1', required: false },
    {
      name: 'p3',
      dimension: 'pressure',
      unit: 'kPa',
      description: 'peak pressure (instead of pressureRatio)',
      required: false,
    },
    { name: 'cutoffRatio', dimension: 'dimensionless', unit: '', description: 'rc = V4/V3 ≥ 1', required: false },
    {
      name: 'T4',
      dimension: 'temperature',
      unit: 'K',
      description: 'peak temperature (instead of cutoffRatio)',
      required: false,
    },
    ...COMMON_TAIL,
  ],
  build(v) {
    const e = ratioAbove1(v, 'compressionRatio')
    if (e) return e
    const { pressureRatio: rp, cutoffRatio: rc, p3, T4 } = v.num
    if ((rp === undefined) === (p3 === undefined))
      return bad('give exactly one of pressureRatio or p3', 'pressureRatio')
    if ((rc === undefined) === (T4 === undefined)) return bad('give exactly one of cutoffRatio or T4', 'cutoffRatio')
    if (rp !== undefined && !(rp >= 1)) return bad('pressureRatio must be at least 1', 'pressureRatio')
    if (rc !== undefined && !(rc >= 1)) return bad('cutoffRatio must be at least 1', 'cutoffRatio')
    if (rc !== undefined && !(rc < v.num.compressionRatio!))
      return bad(
        `cutoffRatio must be below the compression ratio ${v.num.compressionRatio}: heat addition ends at V4 = rc·V3, which must stay below V1 = r·V3 (got rc = ${rc})`,
        'cutoffRatio',
      )
    const r = v.num.compressionRatio!
    const steps: StepSpec[] = [
      { process: 'isentropic', volumeRatio: 1 / r, label: 'compression' },
      { process: 'isochoric', pressureRatio: rp, label: 'heat addition at constant volume' },
      { process: 'isobaric', volumeRatio: rc, label: 'heat addition at constant pressure' },
      { process: 'isentropic', label: 'expansion' },
      { process: 'isochoric', label: 'heat rejection' },
    ]
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'closed',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [state1(v, v.num.T1), {}, { p: p3 }, { T: T4 }, {}],
        steps,
      },
      [null, 'source', 'source', null, 'sink'],
    )
  },
})

const BRAYTON_INPUTS: TemplateInput[] = [
  GAS,
  { name: 'p1', dimension: 'pressure', unit: 'kPa', description: 'compressor inlet pressure', required: true },
  { name: 'T1', dimension: 'temperature', unit: 'K', description: 'compressor inlet temperature', required: true },
  {
    name: 'pressureRatio',
    dimension: 'dimensionless',
    unit: '',
    description: 'compressor pressure ratio rp = p2/p1 > 1',
    required: true,
  },
  {
    name: 'turbineInletT',
    dimension: 'temperature',
    unit: 'K',
    description: 'turbine inlet temperature (or heatIn)',
    required: false,
  },
  {
    name: 'heatIn',
    dimension: 'heat',
    unit: 'kJ/kg',
    description: 'heat added in the combustor (instead of turbineInletT)',
    required: false,
  },
  {
    name: 'compressorEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of the compressor (default 1)',
    required: false,
  },
  {
    name: 'turbineEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of the turbine (default 1)',
    required: false,
  },
]

function braytonMachines(v: TemplateValues): { comp: StepSpec; turb: StepSpec } | BuildResult {
  const e = ratioAbove1(v, 'pressureRatio')
  if (e) return e
  for (const k of ['compressorEfficiency', 'turbineEfficiency']) {
    const x = v.num[k]
    if (x !== undefined && !(x > 0 && x <= 1)) return bad(`${k} must be in (0, 1]`, k)
  }
  const rp = v.num.pressureRatio!
  const ec = v.num.compressorEfficiency
  const et = v.num.turbineEfficiency
  return {
    comp:
      ec === undefined || ec === 1
        ? { process: 'isentropic', pressureRatio: rp, label: 'compressor' }
        : { process: 'adiabatic', device: 'compressor', efficiency: ec, pressureRatio: rp, label: 'compressor' },
    turb:
      et === undefined || et === 1
        ? { process: 'isentropic', label: 'turbine' }
        : { process: 'adiabatic', device: 'turbine', efficiency: et, label: 'turbine' },
  }
}

const brayton = defineTemplate({
  id: 'brayton',
  title: 'Brayton cycle (simple gas turbine)',
  description:
    'Steady flow, per unit of gas: 1→2 compressor (pressure ratio rp, isentropic or with efficiency ηc), 2→3 combustor at constant pressure, 3→4 turbine (isentropic or ηt) back to p1, 4→1 heat rejection at constant pressure.',
  inputs: [...BRAYTON_INPUTS, AMOUNT, RES_HOT, RES_COLD, ...SECOND_LAW_INPUTS],
  build(v) {
    const m = braytonMachines(v)
    if ('ok' in m) return m
    const q = v.heat.heatIn
    if ((v.num.turbineInletT === undefined) === (q === undefined))
      return bad('give exactly one of turbineInletT or heatIn', 'turbineInletT')
    const steps: StepSpec[] = [
      m.comp,
      { process: 'isobaric', expectHeat: 'in', label: 'combustor', ...q },
      m.turb,
      { process: 'isobaric', label: 'heat rejection' },
    ]
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'flow',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [{ p: v.num.p1, T: v.num.T1 }, {}, { T: v.num.turbineInletT }, {}],
        steps,
      },
      [null, 'source', null, 'sink'],
    )
  },
})

const braytonRegen = defineTemplate({
  id: 'brayton-regenerative',
  title: 'Brayton cycle with regenerator',
  description:
    'As the simple Brayton cycle, with a counter-flow regenerator: 2→3 compressed air heated by the turbine exhaust (effectiveness ε, default 1 = ideal), 3→4 combustor, 4→5 turbine, 5→6 exhaust cooled in the regenerator, 6→1 heat rejection.',
  inputs: [
    ...BRAYTON_INPUTS,
    {
      name: 'regeneratorEffectiveness',
      dimension: 'dimensionless',
      unit: '',
      description: 'regenerator effectiveness ε in [0, 1] (default 1, ideal)',
      required: false,
    },
    AMOUNT,
    RES_HOT,
    RES_COLD,
    ...SECOND_LAW_INPUTS,
  ],
  build(v) {
    const m = braytonMachines(v)
    if ('ok' in m) return m
    const q = v.heat.heatIn
    if ((v.num.turbineInletT === undefined) === (q === undefined))
      return bad('give exactly one of turbineInletT or heatIn', 'turbineInletT')
    const eps = v.num.regeneratorEffectiveness
    if (eps !== undefined && !(eps >= 0 && eps <= 1))
      return bad('regeneratorEffectiveness must be in [0, 1]', 'regeneratorEffectiveness')
    const steps: StepSpec[] = [
      m.comp,
      { process: 'regenerator', path: 'isobaric', partner: 4, effectiveness: eps, label: 'regenerator (cold side)' },
      { process: 'isobaric', expectHeat: 'in', label: 'combustor', ...q },
      m.turb,
      { process: 'regenerator', path: 'isobaric', partner: 1, label: 'regenerator (hot side)' },
      { process: 'isobaric', label: 'heat rejection' },
    ]
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'flow',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [{ p: v.num.p1, T: v.num.T1 }, {}, {}, { T: v.num.turbineInletT }, {}, {}],
        steps,
      },
      [null, null, 'source', null, null, 'sink'],
    )
  },
})

const TH: TemplateInput = {
  name: 'Th',
  dimension: 'temperature',
  unit: 'K',
  description: 'hot (upper) temperature of the gas',
  required: true,
}
const TC: TemplateInput = {
  name: 'Tc',
  dimension: 'temperature',
  unit: 'K',
  description: 'cold (lower) temperature of the gas',
  required: true,
}

function checkTemps(v: TemplateValues): BuildResult | null {
  if (!(v.num.Th! > v.num.Tc!)) return bad(`Th (${v.num.Th} K) must exceed Tc (${v.num.Tc} K)`, 'Th')
  return null
}

function carnot(id: string, purpose: 'engine' | 'refrigerator' | 'heat-pump', title: string): TemplateDef {
  const engine = purpose === 'engine'
  return defineTemplate({
    id,
    title,
    description: engine
      ? '1→2 isothermal expansion at Th (heat in), 2→3 isentropic expansion to Tc, 3→4 isothermal compression at Tc (heat out), 4→1 isentropic compression. Give p1 and the isothermal expansion ratio V2/V1 (or p2).'
      : '1→2 isothermal expansion at Tc (heat taken from the cold space), 2→3 isentropic compression to Th, 3→4 isothermal compression at Th (heat delivered), 4→1 isentropic expansion. Give p1 and the isothermal expansion ratio V2/V1 (or p2).',
    inputs: [
      GAS,
      TH,
      TC,
      {
        name: 'p1',
        dimension: 'pressure',
        unit: 'kPa',
        description: `pressure at state 1 (start of the isothermal expansion at ${engine ? 'Th' : 'Tc'})`,
        required: true,
      },
      {
        name: 'expansionRatio',
        dimension: 'dimensionless',
        unit: '',
        description: 'V2/V1 of the isothermal expansion (> 1)',
        required: false,
      },
      {
        name: 'p2',
        dimension: 'pressure',
        unit: 'kPa',
        description: 'pressure at the end of the isothermal expansion (instead of expansionRatio)',
        required: false,
      },
      ...COMMON_TAIL,
    ],
    build(v) {
      const e = checkTemps(v) ?? ratioAbove1(v, 'expansionRatio')
      if (e) return e
      const er = v.num.expansionRatio
      const p2 = v.num.p2
      if ((er === undefined) === (p2 === undefined))
        return bad('give exactly one of expansionRatio or p2', 'expansionRatio')
      if (p2 !== undefined && !(p2 < v.num.p1!)) return bad('p2 must be below p1 (the isothermal step expands)', 'p2')
      const [Ta, Tb] = engine ? [v.num.Th, v.num.Tc] : [v.num.Tc, v.num.Th]
      const steps: StepSpec[] = [
        {
          process: 'isothermal',
          volumeRatio: er,
          expectHeat: 'in',
          label: `isothermal expansion at ${engine ? 'Th' : 'Tc'}`,
        },
        { process: 'isentropic', label: engine ? 'isentropic expansion' : 'isentropic compression' },
        { process: 'isothermal', expectHeat: 'out', label: `isothermal compression at ${engine ? 'Tc' : 'Th'}` },
        { process: 'isentropic', label: engine ? 'isentropic compression' : 'isentropic expansion' },
      ]
      return withSecondLaw(
        v,
        {
          gas: v.gas,
          amount: v.amount,
          system: 'closed',
          purpose,
          reservoirs: reservoirs(v),
          states: [{ ...state1(v, Ta) }, { T: Ta, p: p2 }, { T: Tb }, { T: Tb }],
          steps,
        },
        ['source', null, 'sink', null],
      )
    },
  })
}

const stirling = defineTemplate({
  id: 'stirling',
  title: 'Stirling cycle (ideal regenerator)',
  description:
    '1→2 isothermal compression at Tc (ratio r = V1/V2), 2→3 constant-volume heating by the regenerator, 3→4 isothermal expansion at Th, 4→1 constant-volume cooling in the regenerator. The regenerator heat stays inside the cycle.',
  inputs: [
    GAS,
    TH,
    TC,
    {
      name: 'p1',
      dimension: 'pressure',
      unit: 'kPa',
      description: 'pressure at state 1 (Tc, largest volume)',
      required: true,
    },
    R_C,
    ...COMMON_TAIL,
  ],
  build(v) {
    const e = checkTemps(v) ?? ratioAbove1(v, 'compressionRatio')
    if (e) return e
    const steps: StepSpec[] = [
      {
        process: 'isothermal',
        volumeRatio: 1 / v.num.compressionRatio!,
        expectHeat: 'out',
        label: 'isothermal compression at Tc',
      },
      { process: 'regenerator', path: 'isochoric', partner: 3, label: 'regenerative heating' },
      { process: 'isothermal', expectHeat: 'in', label: 'isothermal expansion at Th' },
      { process: 'regenerator', path: 'isochoric', partner: 1, label: 'regenerative cooling' },
    ]
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'closed',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [state1(v, v.num.Tc), { T: v.num.Tc }, { T: v.num.Th }, { T: v.num.Th }],
        steps,
      },
      ['sink', null, 'source', null],
    )
  },
})

const ericsson = defineTemplate({
  id: 'ericsson',
  title: 'Ericsson cycle (ideal regenerator)',
  description:
    'Steady flow: 1→2 isothermal compression at Tc (pressure ratio rp = p2/p1), 2→3 constant-pressure heating by the regenerator, 3→4 isothermal expansion at Th, 4→1 constant-pressure cooling in the regenerator.',
  inputs: [
    GAS,
    TH,
    TC,
    { name: 'p1', dimension: 'pressure', unit: 'kPa', description: 'low pressure (state 1, at Tc)', required: true },
    { name: 'pressureRatio', dimension: 'dimensionless', unit: '', description: 'rp = p2/p1 > 1', required: true },
    AMOUNT,
    RES_HOT,
    RES_COLD,
    ...SECOND_LAW_INPUTS,
  ],
  build(v) {
    const e = checkTemps(v) ?? ratioAbove1(v, 'pressureRatio')
    if (e) return e
    const steps: StepSpec[] = [
      {
        process: 'isothermal',
        pressureRatio: v.num.pressureRatio,
        expectHeat: 'out',
        label: 'isothermal compression at Tc',
      },
      { process: 'regenerator', path: 'isobaric', partner: 3, label: 'regenerative heating' },
      { process: 'isothermal', expectHeat: 'in', label: 'isothermal expansion at Th' },
      { process: 'regenerator', path: 'isobaric', partner: 1, label: 'regenerative cooling' },
    ]
    return withSecondLaw(
      v,
      {
        gas: v.gas,
        amount: v.amount,
        system: 'flow',
        purpose: 'engine',
        reservoirs: reservoirs(v),
        states: [{ p: v.num.p1, T: v.num.Tc }, { T: v.num.Tc }, { T: v.num.Th }, { T: v.num.Th }],
        steps,
      },
      ['sink', null, 'source', null],
    )
  },
})

export const IDEAL_GAS_TEMPLATES: readonly TemplateDef[] = [
  carnot('carnot-engine', 'engine', 'Carnot engine'),
  carnot('carnot-refrigerator', 'refrigerator', 'Carnot refrigerator'),
  carnot('carnot-heat-pump', 'heat-pump', 'Carnot heat pump'),
  otto,
  diesel,
  dual,
  brayton,
  braytonRegen,
  stirling,
  ericsson,
]
