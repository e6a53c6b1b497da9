/**
 * The two-stage (flash chamber) and cascade vapour-compression templates for spec files:
 * { "template": "vapour-compression-two-stage" | "vapour-compression-cascade", "inputs": { … },
 * "convention"?: … }. Strings with units in; every quantity out as { value, unit } in SI, work
 * and heat of each device in the stated convention. Documented in docs/refrigeration.md.
 * Never throws (solveRefrigerationTemplate in ./refrigeration-template.ts dispatches here).
 *
 * Teaching tool: not design data; defer to the applicable codes, standards and licensed
 * engineering practice.
 */
import { isRecord } from '../json.ts'
import { CONVENTIONS } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { readValue } from '../spec.ts'
import type { TemplateInput } from '../templates/types.ts'
import type { Quantity } from '../units.ts'
import { REFRIGERANT_IDS, getRefrigerant } from './index.ts'
import { solveCascade, solveTwoStage } from './multi-stage.ts'
import type { CascadeInput, CascadeResult, TwoStageInput, TwoStageResult } from './multi-stage.ts'
import type { FluidState, Refrigerant } from './types.ts'
import { TON_OF_REFRIGERATION } from './vapour-compression.ts'
import type { SaturationGiven } from './vapour-compression.ts'

export const TWO_STAGE_ID = 'vapour-compression-two-stage'
export const CASCADE_ID = 'vapour-compression-cascade'

const q = (value: number, unit: string): Quantity => ({ value, unit })
const opt = (
  name: string,
  dimension: TemplateInput['dimension'],
  unit: string,
  description: string,
): TemplateInput => ({ name, dimension, unit, description, required: false })
const req = (name: string, description: string): TemplateInput => ({
  name,
  dimension: 'dimensionless',
  unit: '',
  description,
  required: true,
})
const satInputs = (prefix: string, what: string): TemplateInput[] => [
  opt(`${prefix}Temperature`, 'temperature', '°C or K', `saturation temperature ${what} (or ${prefix}Pressure)`),
  opt(`${prefix}Pressure`, 'pressure', 'kPa or MPa', `pressure ${what} (or ${prefix}Temperature)`),
]
const capacityInput = opt(
  'capacity',
  'dimensionless',
  'kW or tons',
  'refrigeration capacity, e.g. "10 kW" or "3 tons" (or a mass flow)',
)

export const TWO_STAGE_INPUTS: readonly TemplateInput[] = [
  req('refrigerant', `the refrigerant: ${REFRIGERANT_IDS.join(', ')}`),
  ...satInputs('evaporator', 'in the evaporator'),
  ...satInputs('condenser', 'in the condenser'),
  opt(
    'intermediatePressure',
    'pressure',
    'MPa',
    'flash chamber pressure, between the evaporator and condenser pressures (default √(p_evap·p_cond))',
  ),
  opt('compressorEfficiency', 'dimensionless', '', 'isentropic efficiency of both compressors (default 1)'),
  opt('lowStageCompressorEfficiency', 'dimensionless', '', 'low-stage compressor (default compressorEfficiency)'),
  opt('highStageCompressorEfficiency', 'dimensionless', '', 'high-stage compressor (default compressorEfficiency)'),
  opt('superheat', 'dimensionless', 'K', 'superheat at the evaporator exit (default 0 K)'),
  opt('subcooling', 'dimensionless', 'K', 'subcooling at the condenser exit (default 0 K)'),
  opt('highStageMassFlow', 'dimensionless', 'kg/s', 'mass flow through the condenser and high-stage compressor'),
  opt('lowStageMassFlow', 'dimensionless', 'kg/s', 'mass flow through the evaporator and low-stage compressor'),
  capacityInput,
]

export const CASCADE_INPUTS: readonly TemplateInput[] = [
  req('lowerRefrigerant', `the lower (cold) cycle's refrigerant: ${REFRIGERANT_IDS.join(', ')}`),
  req('upperRefrigerant', `the upper (warm) cycle's refrigerant: ${REFRIGERANT_IDS.join(', ')}`),
  ...satInputs('evaporator', "in the lower cycle's evaporator"),
  ...satInputs('lowerCondenser', 'at which the lower cycle condenses in the cascade heat exchanger'),
  ...satInputs('upperEvaporator', 'at which the upper cycle evaporates in the cascade heat exchanger'),
  ...satInputs('condenser', "in the upper cycle's condenser"),
  opt('compressorEfficiency', 'dimensionless', '', 'isentropic efficiency of both compressors (default 1)'),
  opt('lowerCompressorEfficiency', 'dimensionless', '', 'lower-cycle compressor (default compressorEfficiency)'),
  opt('upperCompressorEfficiency', 'dimensionless', '', 'upper-cycle compressor (default compressorEfficiency)'),
  opt('superheat', 'dimensionless', 'K', "superheat at the lower cycle's evaporator exit (default 0 K)"),
  opt('subcooling', 'dimensionless', 'K', "subcooling at the upper cycle's condenser exit (default 0 K)"),
  opt('lowerMassFlow', 'dimensionless', 'kg/s', 'mass flow in the lower cycle'),
  opt('upperMassFlow', 'dimensionless', 'kg/s', 'mass flow in the upper cycle'),
  capacityInput,
]

export interface MultiStageFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

const fail = (message: string, property?: string, code = 'invalid-spec'): MultiStageFailure => ({
  ok: false,
  error: { code, message, ...(property ? { property } : {}) },
})

// ---- reading inputs

const NUMBER = String.raw`([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)`
const UNIT_RE = (units: string) => new RegExp(String.raw`^\s*${NUMBER}\s*(${units})?\s*$`)
const FLOW = UNIT_RE('kg/s|kg/h')
const KELVINS = UNIT_RE('K')
const POWER = UNIT_RE('W|kW|MW|tons?|TR')
const POWER_FACTOR: Record<string, number> = {
  W: 1,
  kW: 1e3,
  MW: 1e6,
  ton: TON_OF_REFRIGERATION,
  tons: TON_OF_REFRIGERATION,
  TR: TON_OF_REFRIGERATION,
}

type Read<T> = { ok: true; value: T } | MultiStageFailure

class Reader {
  readonly r: Record<string, unknown>
  constructor(
    raw: Record<string, unknown>,
    readonly inputs: readonly TemplateInput[],
  ) {
    this.r = raw
  }
  unknownKey(): MultiStageFailure | null {
    const known = new Set(this.inputs.map((i) => i.name))
    for (const key of Object.keys(this.r))
      if (!known.has(key)) return fail(`unknown input "${key}"; this template takes ${[...known].join(', ')}`, key)
    return null
  }
  refrigerant(name: string): Read<Refrigerant> {
    const raw = this.r[name]
    const id = typeof raw === 'string' ? raw.trim().replace(/^R-/i, 'R') : ''
    const refId = REFRIGERANT_IDS.find((x) => x.toLowerCase() === id.toLowerCase())
    if (!refId) return fail(`${name} must be one of ${REFRIGERANT_IDS.join(', ')} (got ${JSON.stringify(raw)})`, name)
    return { ok: true, value: getRefrigerant(refId) }
  }
  quantity(name: string, dim: 'temperature' | 'pressure'): Read<number | undefined> {
    if (this.r[name] === undefined) return { ok: true, value: undefined }
    const v = readValue(this.r[name], [dim], name)
    return v.ok ? { ok: true, value: v.value.value } : v
  }
  ratio(name: string): Read<number | undefined> {
    const x = this.r[name]
    if (x === undefined) return { ok: true, value: undefined }
    const v = readValue(typeof x === 'number' ? String(x) : x, ['dimensionless'], name)
    return v.ok ? { ok: true, value: v.value.value } : v
  }
  matched(name: string, re: RegExp, factor: (unit: string | undefined) => number, example: string) {
    const x = this.r[name]
    if (x === undefined) return { ok: true as const, value: undefined }
    if (typeof x === 'number' && Number.isFinite(x)) return { ok: true as const, value: x }
    const m = typeof x === 'string' ? re.exec(x) : null
    if (!m) return fail(`${name}: give a value such as ${example}, not ${JSON.stringify(x)}`, name)
    return { ok: true as const, value: Number(m[1]) * factor(m[2]) }
  }
  /** a temperature difference in K (a bare number is kelvins) */
  kelvins(name: string): Read<number | undefined> {
    return this.matched(name, KELVINS, () => 1, '"5 K"')
  }
  flow(name: string): Read<number | undefined> {
    return this.matched(name, FLOW, (u) => (u === 'kg/h' ? 1 / 3600 : 1), '"0.05 kg/s"')
  }
  capacity(): Read<number | undefined> {
    return this.matched('capacity', POWER, (u) => POWER_FACTOR[u ?? 'W']!, '"10 kW" or "3 tons"')
  }
  saturation(prefix: string, required: boolean): Read<SaturationGiven | undefined> {
    const T = this.quantity(`${prefix}Temperature`, 'temperature')
    if (!T.ok) return T
    const p = this.quantity(`${prefix}Pressure`, 'pressure')
    if (!p.ok) return p
    if (T.value !== undefined && p.value !== undefined)
      return fail(`give ${prefix}Temperature or ${prefix}Pressure, not both`, `${prefix}Pressure`)
    if (T.value === undefined && p.value === undefined)
      return required
        ? fail(`give ${prefix}Temperature or ${prefix}Pressure`, `${prefix}Temperature`)
        : { ok: true, value: undefined }
    return { ok: true, value: T.value !== undefined ? { T: T.value } : { p: p.value! } }
  }
}

function reader(raw: unknown, inputs: readonly TemplateInput[]): Read<Reader> {
  if (!isRecord(raw)) return fail('inputs must be an object', 'inputs')
  const rd = new Reader(raw, inputs)
  const u = rd.unknownKey()
  return u ?? { ok: true, value: rd }
}

/**
 * Drops the keys whose value is undefined, so an input left out is absent from the parsed
 * input, not present as undefined. Returns the same (fresh) object.
 */
function withoutUndefined<T extends object>(o: T): T {
  for (const [key, v] of Object.entries(o)) if (v === undefined) Reflect.deleteProperty(o, key)
  return o
}

// Each field read in turn, stopping at the first failure.

export function parseTwoStageInputs(raw: unknown): Read<TwoStageInput> {
  const rd = reader(raw, TWO_STAGE_INPUTS)
  if (!rd.ok) return rd
  const r = rd.value
  const refrigerant = r.refrigerant('refrigerant')
  if (!refrigerant.ok) return refrigerant
  const evaporator = r.saturation('evaporator', true)
  if (!evaporator.ok) return evaporator
  const condenser = r.saturation('condenser', true)
  if (!condenser.ok) return condenser
  const intermediatePressure = r.quantity('intermediatePressure', 'pressure')
  if (!intermediatePressure.ok) return intermediatePressure
  const eta = r.ratio('compressorEfficiency')
  if (!eta.ok) return eta
  const etaLow = r.ratio('lowStageCompressorEfficiency')
  if (!etaLow.ok) return etaLow
  const etaHigh = r.ratio('highStageCompressorEfficiency')
  if (!etaHigh.ok) return etaHigh
  const superheat = r.kelvins('superheat')
  if (!superheat.ok) return superheat
  const subcooling = r.kelvins('subcooling')
  if (!subcooling.ok) return subcooling
  const highStageMassFlow = r.flow('highStageMassFlow')
  if (!highStageMassFlow.ok) return highStageMassFlow
  const lowStageMassFlow = r.flow('lowStageMassFlow')
  if (!lowStageMassFlow.ok) return lowStageMassFlow
  const capacity = r.capacity()
  if (!capacity.ok) return capacity
  return {
    ok: true,
    value: withoutUndefined({
      refrigerant: refrigerant.value,
      evaporator: evaporator.value!,
      condenser: condenser.value!,
      intermediatePressure: intermediatePressure.value,
      lowStageEfficiency: etaLow.value ?? eta.value,
      highStageEfficiency: etaHigh.value ?? eta.value,
      superheat: superheat.value,
      subcooling: subcooling.value,
      highStageMassFlow: highStageMassFlow.value,
      lowStageMassFlow: lowStageMassFlow.value,
      capacity: capacity.value,
    }),
  }
}

export function parseCascadeInputs(raw: unknown): Read<CascadeInput> {
  const rd = reader(raw, CASCADE_INPUTS)
  if (!rd.ok) return rd
  const r = rd.value
  const lowerRefrigerant = r.refrigerant('lowerRefrigerant')
  if (!lowerRefrigerant.ok) return lowerRefrigerant
  const upperRefrigerant = r.refrigerant('upperRefrigerant')
  if (!upperRefrigerant.ok) return upperRefrigerant
  const evaporator = r.saturation('evaporator', true)
  if (!evaporator.ok) return evaporator
  const lowerCondenser = r.saturation('lowerCondenser', true)
  if (!lowerCondenser.ok) return lowerCondenser
  const upperEvaporator = r.saturation('upperEvaporator', true)
  if (!upperEvaporator.ok) return upperEvaporator
  const condenser = r.saturation('condenser', true)
  if (!condenser.ok) return condenser
  const eta = r.ratio('compressorEfficiency')
  if (!eta.ok) return eta
  const etaLower = r.ratio('lowerCompressorEfficiency')
  if (!etaLower.ok) return etaLower
  const etaUpper = r.ratio('upperCompressorEfficiency')
  if (!etaUpper.ok) return etaUpper
  const superheat = r.kelvins('superheat')
  if (!superheat.ok) return superheat
  const subcooling = r.kelvins('subcooling')
  if (!subcooling.ok) return subcooling
  const lowerMassFlow = r.flow('lowerMassFlow')
  if (!lowerMassFlow.ok) return lowerMassFlow
  const upperMassFlow = r.flow('upperMassFlow')
  if (!upperMassFlow.ok) return upperMassFlow
  const capacity = r.capacity()
  if (!capacity.ok) return capacity
  return {
    ok: true,
    value: withoutUndefined({
      lowerRefrigerant: lowerRefrigerant.value,
      upperRefrigerant: upperRefrigerant.value,
      evaporator: evaporator.value!,
      lowerCondenser: lowerCondenser.value!,
      upperEvaporator: upperEvaporator.value!,
      condenser: condenser.value!,
      lowerEfficiency: etaLower.value ?? eta.value,
      upperEfficiency: etaUpper.value ?? eta.value,
      superheat: superheat.value,
      subcooling: subcooling.value,
      lowerMassFlow: lowerMassFlow.value,
      upperMassFlow: upperMassFlow.value,
      capacity: capacity.value,
    }),
  }
}

// ---- formatting

const J = 'J/kg'
const TONS = 'ton of refrigeration'

export interface FormattedState {
  readonly name: string
  readonly description: string
  readonly p: Quantity
  readonly T: Quantity
  readonly h: Quantity
  readonly s: Quantity
  readonly v: Quantity
  readonly x: number | null
  readonly phase: string
}

export interface FormattedDevice {
  readonly device: string
  readonly q: Quantity
  readonly w: Quantity
}

const stateOut = (name: string, description: string, s: FluidState): FormattedState => ({
  name,
  description,
  p: q(s.p, 'Pa'),
  T: q(s.T, 'K'),
  h: q(s.h, J),
  s: q(s.s, 'J/(kg K)'),
  v: q(s.v, 'm^3/kg'),
  x: s.x,
  phase: s.phase,
})

const rate = (x: number | null, unit: string) => (x === null ? null : q(x, unit))
const statement = (convention: Convention) => {
  const c = CONVENTIONS[convention]
  return { ...c, statement: `${c.flowEquation}; ${c.work}; ${c.heat}` }
}
/** work done BY the refrigerant, in the convention's sign */
const workOut = (convention: Convention, workBy: number) => q(convention === 'engineering' ? workBy : -workBy, J)

export interface FormattedTwoStage {
  readonly ok: true
  readonly template: typeof TWO_STAGE_ID
  readonly substance: string
  readonly basis: 'per kg of refrigerant through the condenser'
  readonly convention: ConventionStatement & { readonly statement: string }
  /** massFraction: kg through this state per kg through the condenser */
  readonly states: readonly (FormattedState & { readonly massFraction: Quantity })[]
  readonly devices: readonly FormattedDevice[]
  readonly totals: {
    readonly intermediatePressure: Quantity
    readonly flashVapourFraction: Quantity
    readonly lowToHighMassRatio: Quantity
    readonly refrigerationEffectPerKgEvaporator: Quantity
    readonly refrigerationEffect: Quantity
    readonly lowStageWork: Quantity
    readonly highStageWork: Quantity
    readonly compressorWork: Quantity
    readonly heatRejected: Quantity
    readonly copRefrigerator: Quantity
    readonly copHeatPump: Quantity
    readonly carnotCopRefrigerator: Quantity
    readonly carnotCopHeatPump: Quantity
    readonly highStageMassFlow: Quantity | null
    readonly lowStageMassFlow: Quantity | null
    readonly capacity: Quantity | null
    readonly capacityTons: Quantity | null
    readonly lowStagePower: Quantity | null
    readonly highStagePower: Quantity | null
    readonly compressorPower: Quantity | null
    readonly heatRejectionRate: Quantity | null
  }
  readonly notes: readonly string[]
  readonly notice: string
}

export function formatTwoStage(r: TwoStageResult, substance: string, convention: Convention): FormattedTwoStage {
  const x6 = r.flashVapourFraction
  const m = r.lowToHighMassRatio
  const fraction: Record<string, number> = { '1': m, '2': m, '7': m, '8': m, '9': x6 }
  const h = (name: string) => r.states.find((s) => s.name === name)!.state.h
  return {
    ok: true,
    template: TWO_STAGE_ID,
    substance,
    basis: 'per kg of refrigerant through the condenser',
    convention: statement(convention),
    states: r.states.map((s) => ({
      ...stateOut(s.name, s.description, s.state),
      massFraction: q(fraction[s.name] ?? 1, ''),
    })),
    devices: [
      { device: 'evaporator', q: q(r.refrigerationEffect, J), w: q(0, J) },
      { device: 'low-stage compressor', q: q(0, J), w: workOut(convention, -r.lowStageWork) },
      { device: 'mixing chamber', q: q(0, J), w: q(0, J) },
      { device: 'high-stage compressor', q: q(0, J), w: workOut(convention, -r.highStageWork) },
      { device: 'condenser', q: q(h('5') - h('4'), J), w: q(0, J) },
      { device: 'high-pressure valve', q: q(0, J), w: q(0, J) },
      { device: 'flash chamber', q: q(0, J), w: q(0, J) },
      { device: 'low-pressure valve', q: q(0, J), w: q(0, J) },
    ],
    totals: {
      intermediatePressure: q(r.intermediatePressure, 'Pa'),
      flashVapourFraction: q(x6, ''),
      lowToHighMassRatio: q(m, ''),
      refrigerationEffectPerKgEvaporator: q(r.refrigerationEffectPerKgEvaporator, J),
      refrigerationEffect: q(r.refrigerationEffect, J),
      lowStageWork: q(r.lowStageWork, J),
      highStageWork: q(r.highStageWork, J),
      compressorWork: q(r.compressorWork, J),
      heatRejected: q(r.heatRejected, J),
      copRefrigerator: q(r.copRefrigerator, ''),
      copHeatPump: q(r.copHeatPump, ''),
      carnotCopRefrigerator: q(r.carnotCopRefrigerator, ''),
      carnotCopHeatPump: q(r.carnotCopHeatPump, ''),
      highStageMassFlow: rate(r.highStageMassFlow, 'kg/s'),
      lowStageMassFlow: rate(r.lowStageMassFlow, 'kg/s'),
      capacity: rate(r.capacity, 'W'),
      capacityTons: rate(r.capacityTons, TONS),
      lowStagePower: rate(r.lowStagePower, 'W'),
      highStagePower: rate(r.highStagePower, 'W'),
      compressorPower: rate(r.compressorPower, 'W'),
      heatRejectionRate: rate(r.heatRejectionRate, 'W'),
    },
    notes: [
      'Work, heat and the refrigeration effect are per kg through the condenser; 1 − x6 of it passes the evaporator (refrigerationEffectPerKgEvaporator is per kg there).',
      ...(r.intermediatePressureDefaulted
        ? ['The flash chamber pressure was not given: √(p_evap·p_cond), a common rule of thumb, not an optimum.']
        : []),
    ],
    notice: r.caution,
  }
}

export interface FormattedCascade {
  readonly ok: true
  readonly template: typeof CASCADE_ID
  readonly substance: string
  readonly basis: "per kg of the lower cycle's refrigerant"
  readonly convention: ConventionStatement & { readonly statement: string }
  readonly states: readonly (FormattedState & {
    readonly cycle: 'lower' | 'upper'
    readonly refrigerant: string
    /** kg through this state per kg in the lower cycle */
    readonly massFraction: Quantity
  })[]
  readonly devices: readonly FormattedDevice[]
  readonly totals: {
    readonly massFlowRatio: Quantity
    readonly exchangerTemperatureDifference: Quantity
    readonly refrigerationEffect: Quantity
    readonly lowerCompressorWork: Quantity
    readonly upperCompressorWork: Quantity
    readonly compressorWork: Quantity
    readonly heatRejected: Quantity
    readonly copRefrigerator: Quantity
    readonly copHeatPump: Quantity
    readonly carnotCopRefrigerator: Quantity
    readonly carnotCopHeatPump: Quantity
    readonly lowerCycleCop: Quantity
    readonly upperCycleCop: Quantity
    readonly lowerMassFlow: Quantity | null
    readonly upperMassFlow: Quantity | null
    readonly capacity: Quantity | null
    readonly capacityTons: Quantity | null
    readonly lowerCompressorPower: Quantity | null
    readonly upperCompressorPower: Quantity | null
    readonly compressorPower: Quantity | null
    readonly heatRejectionRate: Quantity | null
  }
  readonly notes: readonly string[]
  readonly notice: string
}

export function formatCascade(
  r: CascadeResult,
  lower: Refrigerant,
  upper: Refrigerant,
  convention: Convention,
): FormattedCascade {
  const ratio = r.massFlowRatio
  const L = r.lower
  const U = r.upper
  return {
    ok: true,
    template: CASCADE_ID,
    substance: lower.id === upper.id ? lower.name : `${lower.name} (lower cycle), ${upper.name} (upper cycle)`,
    basis: "per kg of the lower cycle's refrigerant",
    convention: statement(convention),
    states: r.states.map((s) => ({
      ...stateOut(s.name, s.description, s.state),
      cycle: s.cycle,
      refrigerant: s.refrigerant,
      massFraction: q(s.cycle === 'lower' ? 1 : ratio, ''),
    })),
    devices: [
      { device: 'evaporator (lower cycle)', q: q(r.refrigerationEffect, J), w: q(0, J) },
      { device: 'lower-cycle compressor', q: q(0, J), w: workOut(convention, -r.lowerCompressorWork) },
      // the exchanger as a whole is adiabatic: the lower cycle's rejection is the upper cycle's intake
      { device: 'cascade heat exchanger, lower side', q: q(-L.heatRejected, J), w: q(0, J) },
      { device: 'lower-cycle valve', q: q(0, J), w: q(0, J) },
      { device: 'cascade heat exchanger, upper side', q: q(ratio * U.refrigerationEffect, J), w: q(0, J) },
      { device: 'upper-cycle compressor', q: q(0, J), w: workOut(convention, -r.upperCompressorWork) },
      { device: 'condenser (upper cycle)', q: q(-r.heatRejected, J), w: q(0, J) },
      { device: 'upper-cycle valve', q: q(0, J), w: q(0, J) },
    ],
    totals: {
      massFlowRatio: q(ratio, ''),
      exchangerTemperatureDifference: q(r.exchangerTemperatureDifference, 'K'),
      refrigerationEffect: q(r.refrigerationEffect, J),
      lowerCompressorWork: q(r.lowerCompressorWork, J),
      upperCompressorWork: q(r.upperCompressorWork, J),
      compressorWork: q(r.compressorWork, J),
      heatRejected: q(r.heatRejected, J),
      copRefrigerator: q(r.copRefrigerator, ''),
      copHeatPump: q(r.copHeatPump, ''),
      carnotCopRefrigerator: q(r.carnotCopRefrigerator, ''),
      carnotCopHeatPump: q(r.carnotCopHeatPump, ''),
      lowerCycleCop: q(L.copRefrigerator, ''),
      upperCycleCop: q(U.copRefrigerator, ''),
      lowerMassFlow: rate(r.lowerMassFlow, 'kg/s'),
      upperMassFlow: rate(r.upperMassFlow, 'kg/s'),
      capacity: rate(r.capacity, 'W'),
      capacityTons: rate(r.capacityTons, TONS),
      lowerCompressorPower: rate(r.lowerCompressorPower, 'W'),
      upperCompressorPower: rate(r.upperCompressorPower, 'W'),
      compressorPower: rate(r.compressorPower, 'W'),
      heatRejectionRate: rate(r.heatRejectionRate, 'W'),
    },
    notes: [
      "Work and heat are per kg of the lower cycle's refrigerant; massFlowRatio = ṁ_upper/ṁ_lower from the cascade heat exchanger's energy balance (adiabatic exchanger).",
    ],
    notice: r.caution,
  }
}

const PROPERTY_NAMES: Readonly<Record<string, string>> = {
  evaporator: 'evaporatorTemperature',
  condenser: 'condenserTemperature',
  lowerCondenser: 'lowerCondenserTemperature',
  upperEvaporator: 'upperEvaporatorTemperature',
  lowStageEfficiency: 'lowStageCompressorEfficiency',
  highStageEfficiency: 'highStageCompressorEfficiency',
  lowerEfficiency: 'lowerCompressorEfficiency',
  upperEfficiency: 'upperCompressorEfficiency',
}

function refused(e: MultiStageFailure['error']): MultiStageFailure {
  const property = e.property ? (PROPERTY_NAMES[e.property] ?? e.property) : undefined
  return { ok: false, error: { code: e.code, message: e.message, ...(property ? { property } : {}) } }
}

export function solveMultiStageTemplate(
  id: string,
  inputs: unknown,
  convention: Convention,
): FormattedTwoStage | FormattedCascade | MultiStageFailure {
  if (id === TWO_STAGE_ID) {
    const p = parseTwoStageInputs(inputs)
    if (!p.ok) return p
    const r = solveTwoStage(p.value)
    return r.ok ? formatTwoStage(r.value, p.value.refrigerant.name, convention) : refused(r.error)
  }
  if (id === CASCADE_ID) {
    const p = parseCascadeInputs(inputs)
    if (!p.ok) return p
    const r = solveCascade(p.value)
    return r.ok
      ? formatCascade(r.value, p.value.lowerRefrigerant, p.value.upperRefrigerant, convention)
      : refused(r.error)
  }
  return fail(`unknown refrigeration template "${id}"`, 'template')
}
