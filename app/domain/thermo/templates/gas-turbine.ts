/**
 * Gas-turbine template: Brayton cycle with two-stage intercooled compression and two-stage
 * expansion with reheat, with an optional regenerator. Built on the general solver like the
 * templates in ./ideal-gas.ts; the back-work ratio comes from the solver's flow totals.
 *
 * State numbering (without regenerator):
 *   1 →(LP compressor)→ 2 →(intercooler)→ 3 →(HP compressor)→ 4 →(combustor)→ 5
 *     →(HP turbine)→ 6 →(reheater)→ 7 →(LP turbine)→ 8 →(heat rejection)→ 1
 * With a regenerator, 4 →(regenerator, cold side)→ 5 is inserted after the HP compressor and
 * 9 →(regenerator, hot side)→ 10 after the LP turbine, so the combustor is 5→6 and so on.
 */
import type { StateSpec, StepSpec } from '../cycle.ts'
import type { HeatRole } from './second-law-inputs.ts'
import { SECOND_LAW_INPUTS, withSecondLaw } from './second-law-inputs.ts'
import type { BuildResult, TemplateDef, TemplateInput, TemplateValues } from './types.ts'
import { defineTemplate } from './types.ts'

const bad = (message: string, property?: string): BuildResult => ({
  ok: false,
  error: { code: 'invalid-input', message, property },
})

const INPUTS: TemplateInput[] = [
  {
    name: 'gas',
    dimension: 'gas',
    unit: '',
    description: 'working gas: preset id (air, nasa:dry-air, …) or constants; default air',
    required: false,
  },
  {
    name: 'p1',
    dimension: 'pressure',
    unit: 'kPa',
    description: 'compressor inlet pressure (low pressure of the cycle)',
    required: true,
  },
  { name: 'T1', dimension: 'temperature', unit: 'K', description: 'compressor inlet temperature', required: true },
  {
    name: 'pressureRatio',
    dimension: 'dimensionless',
    unit: '',
    description: 'overall compressor pressure ratio rp = p_high/p1 > 1',
    required: true,
  },
  {
    name: 'turbineInletT',
    dimension: 'temperature',
    unit: 'K',
    description: 'temperature entering the high-pressure turbine',
    required: true,
  },
  {
    name: 'intercoolerPressure',
    dimension: 'pressure',
    unit: 'kPa',
    description: 'pressure between the compressor stages, in (p1, p_high); default √(p1·p_high)',
    required: false,
  },
  {
    name: 'intercoolerT',
    dimension: 'temperature',
    unit: 'K',
    description: 'temperature leaving the intercooler; default T1',
    required: false,
  },
  {
    name: 'reheatPressure',
    dimension: 'pressure',
    unit: 'kPa',
    description: 'pressure between the turbine stages, in (p1, p_high); default √(p1·p_high)',
    required: false,
  },
  {
    name: 'reheatT',
    dimension: 'temperature',
    unit: 'K',
    description: 'temperature leaving the reheater; default turbineInletT',
    required: false,
  },
  {
    name: 'regeneratorEffectiveness',
    dimension: 'dimensionless',
    unit: '',
    description: 'regenerator effectiveness ε in [0, 1]; leave out for no regenerator (1 = ideal)',
    required: false,
  },
  {
    name: 'compressorEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of each compressor stage (default 1)',
    required: false,
  },
  {
    name: 'turbineEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of each turbine stage (default 1)',
    required: false,
  },
  {
    name: 'amount',
    dimension: 'amount',
    unit: 'kg or mol',
    description: 'amount of gas (optional: without it results are per kg or per mol)',
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

function compressor(eta: number | undefined, ratio: number, label: string): StepSpec {
  return eta === undefined || eta === 1
    ? { process: 'isentropic', pressureRatio: ratio, label }
    : { process: 'adiabatic', device: 'compressor', efficiency: eta, pressureRatio: ratio, label }
}
function turbine(eta: number | undefined, ratio: number | undefined, label: string): StepSpec {
  return eta === undefined || eta === 1
    ? { process: 'isentropic', pressureRatio: ratio, label }
    : { process: 'adiabatic', device: 'turbine', efficiency: eta, pressureRatio: ratio, label }
}

function build(v: TemplateValues): BuildResult {
  const { p1, T1, pressureRatio: rp, turbineInletT: T5 } = v.num
  if (!(rp! > 1)) return bad(`pressureRatio must exceed 1 (got ${rp})`, 'pressureRatio')
  const pHigh = p1! * rp!
  const pMid = Math.sqrt(p1! * pHigh)
  const pic = v.num.intercoolerPressure ?? pMid
  const prh = v.num.reheatPressure ?? pMid
  const kPa = (p: number) => `${+(p / 1000).toPrecision(6)} kPa`
  for (const [name, p] of [
    ['intercoolerPressure', pic],
    ['reheatPressure', prh],
  ] as const) {
    if (!(p > p1! && p < pHigh))
      return bad(
        `${name} (${kPa(p)}) must lie between p1 (${kPa(p1!)}) and the high pressure p1·rp (${kPa(pHigh)})`,
        name,
      )
  }
  for (const k of ['compressorEfficiency', 'turbineEfficiency']) {
    const x = v.num[k]
    if (x !== undefined && !(x > 0 && x <= 1)) return bad(`${k} must be in (0, 1] (got ${x})`, k)
  }
  const eps = v.num.regeneratorEffectiveness
  if (eps !== undefined && !(eps >= 0 && eps <= 1))
    return bad(`regeneratorEffectiveness must be in [0, 1] (got ${eps})`, 'regeneratorEffectiveness')
  const Tic = v.num.intercoolerT ?? T1!
  const Trh = v.num.reheatT ?? T5!
  if (!(Tic > 0)) return bad('intercoolerT must be positive', 'intercoolerT')
  const ec = v.num.compressorEfficiency
  const et = v.num.turbineEfficiency
  const regen = eps !== undefined
  const states: StateSpec[] = [{ p: p1, T: T1 }, {}, { T: Tic }, {}]
  const steps: StepSpec[] = [
    compressor(ec, pic / p1!, 'low-pressure compressor'),
    { process: 'isobaric', expectHeat: 'out', label: 'intercooler' },
    compressor(ec, pHigh / pic, 'high-pressure compressor'),
  ]
  // what each step's heat is exchanged with, in step order (second-law-inputs.ts)
  const roles: HeatRole[] = [null, 'sink', null]
  // index (0-based) of the regenerator's cold-side step, if any
  const coldIdx = steps.length
  if (regen) {
    states.push({})
    steps.push({
      process: 'regenerator',
      path: 'isobaric',
      partner: coldIdx + 5,
      effectiveness: eps,
      label: 'regenerator (cold side)',
    })
    roles.push(null)
  }
  states.push({ T: T5 }, {}, { T: Trh }, {})
  steps.push(
    { process: 'isobaric', expectHeat: 'in', label: 'combustor' },
    turbine(et, prh / pHigh, 'high-pressure turbine'),
    { process: 'isobaric', expectHeat: 'in', label: 'reheater' },
    turbine(et, undefined, 'low-pressure turbine'),
  )
  roles.push('source', null, 'source', null)
  if (regen) {
    states.push({})
    steps.push({ process: 'regenerator', path: 'isobaric', partner: coldIdx, label: 'regenerator (hot side)' })
    roles.push(null)
  }
  steps.push({ process: 'isobaric', label: 'heat rejection' })
  roles.push('sink')
  const hot = v.num.reservoirHot
  const cold = v.num.reservoirCold
  const reservoirs = hot === undefined && cold === undefined ? undefined : { hot, cold }
  return withSecondLaw(
    v,
    { gas: v.gas, amount: v.amount, system: 'flow', purpose: 'engine', reservoirs, states, steps, labels: v.labels },
    roles,
  )
}

const braytonIntercoolReheat = defineTemplate({
  id: 'brayton-intercool-reheat',
  title: 'Brayton cycle with intercooling and reheat',
  description:
    'Steady flow, per unit of gas: two compressor stages with an intercooler between them (back to intercoolerT, default T1, at intercoolerPressure, default the geometric mean), combustor to turbineInletT, two turbine stages with a reheater between them (to reheatT, default turbineInletT, at reheatPressure, default the geometric mean), heat rejection at p1. Optional regenerator (give its effectiveness) and stage efficiencies.',
  inputs: INPUTS,
  build,
})

export const GAS_TURBINE_TEMPLATES: readonly TemplateDef[] = [braytonIntercoolReheat]
