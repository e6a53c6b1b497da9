/**
 * The vapour-compression template for spec files: { "template": "vapour-compression",
 * "inputs": { … strings with units … }, "convention"?: … }. Per kilogram of refrigerant, every
 * quantity { value, unit } in SI, work and heat in the stated convention. Documented in
 * docs/refrigeration.md. Never throws.
 *
 * Teaching tool: not design data; defer to the applicable codes, standards and licensed
 * engineering practice.
 */
import { isRecord } from '../json.ts'
import { CONVENTIONS } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { readValue } from '../spec.ts'
import type { DimensionInput } from '../templates/types.ts'
import type { Dimension, Quantity } from '../units.ts'
import { REFRIGERANT_IDS, getRefrigerant } from './index.ts'
import { TON_OF_REFRIGERATION, solveVapourCompression } from './vapour-compression.ts'
import {
  CASCADE_ID,
  CASCADE_INPUTS,
  TWO_STAGE_ID,
  TWO_STAGE_INPUTS,
  solveMultiStageTemplate,
} from './multi-stage-template.ts'
import type { FormattedCascade, FormattedTwoStage } from './multi-stage-template.ts'
import type { SaturationGiven, VapourCompressionInput, VapourCompressionResult } from './vapour-compression.ts'

const q = (value: number, unit: string): Quantity => ({ value, unit })
const opt = (name: string, dimension: Dimension, unit: string, description: string): DimensionInput => ({
  name,
  dimension,
  unit,
  description,
  required: false,
})

export const VAPOUR_COMPRESSION_INPUTS: readonly DimensionInput[] = [
  {
    name: 'refrigerant',
    dimension: 'dimensionless',
    unit: '',
    description: `the refrigerant: ${REFRIGERANT_IDS.join(', ')}`,
    required: true,
  },
  opt('purpose', 'dimensionless', '', '"refrigerator" (default) or "heat pump"'),
  opt(
    'evaporatorTemperature',
    'temperature',
    '°C or K',
    'saturation temperature in the evaporator (or evaporatorPressure)',
  ),
  opt('evaporatorPressure', 'pressure', 'kPa', 'evaporator pressure (or evaporatorTemperature)'),
  opt(
    'condenserTemperature',
    'temperature',
    '°C or K',
    'saturation temperature in the condenser (or condenserPressure, or a gas cooler)',
  ),
  opt('condenserPressure', 'pressure', 'MPa', 'condenser pressure'),
  opt(
    'gasCoolerPressure',
    'pressure',
    'MPa',
    'transcritical cycles (R-744): the gas-cooler pressure, above the critical pressure',
  ),
  opt(
    'gasCoolerExitTemperature',
    'temperature',
    '°C or K',
    'transcritical cycles: the temperature leaving the gas cooler',
  ),
  opt('superheat', 'dimensionless', 'K', 'superheat at the evaporator exit (default 0 K)'),
  opt('subcooling', 'dimensionless', 'K', 'subcooling at the condenser exit (default 0 K)'),
  opt('compressorEfficiency', 'dimensionless', '', 'compressor isentropic efficiency (default 1)'),
  opt('massFlow', 'dimensionless', 'kg/s', 'refrigerant mass flow rate (or capacity)'),
  opt('capacity', 'dimensionless', 'kW or tons', 'refrigeration capacity, e.g. "10 kW" or "3 tons" (or massFlow)'),
]

export const REFRIGERATION_TEMPLATES = [
  {
    id: 'vapour-compression',
    title: 'Vapour-compression refrigerator or heat pump (R-134a, R-1234yf, R-717, R-744)',
    description:
      '1 evaporator exit (saturated or superheated vapour) → 2 compressor (isentropic or with an efficiency) → 3 condenser exit (saturated or subcooled liquid) or gas-cooler exit (transcritical R-744) → 4 throttling valve (h4 = h3) → evaporator. Per kg of refrigerant; with a mass flow or a capacity also as rates.',
    inputs: VAPOUR_COMPRESSION_INPUTS,
  },
  {
    id: TWO_STAGE_ID,
    title: 'Two-stage vapour-compression refrigerator with a flash chamber (R-134a, R-1234yf, R-717, R-744)',
    description:
      'Two compressors in series with an open flash chamber at an intermediate pressure (default √(p_evap·p_cond)): the flash vapour mixes with the low-stage discharge before the high-stage compressor; the flash liquid feeds the evaporator through a second valve. States 1–9, per kg through the condenser.',
    inputs: TWO_STAGE_INPUTS,
  },
  {
    id: CASCADE_ID,
    title: 'Cascade vapour-compression refrigerator (two cycles, each its own refrigerant)',
    description:
      "A lower and an upper single-stage cycle coupled by a cascade heat exchanger (the lower cycle's condenser is the upper cycle's evaporator); the exchanger's energy balance gives the mass-flow ratio. States 1–4 lower, 5–8 upper, per kg of the lower cycle's refrigerant.",
    inputs: CASCADE_INPUTS,
  },
] as const

export function isRefrigerationTemplate(id: unknown): boolean {
  return REFRIGERATION_TEMPLATES.some((t) => t.id === id)
}

export interface RefrigerationFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

/** the two-stage and cascade templates' solutions (./multi-stage-template.ts) */
export type FormattedMultiStageRefrigeration = FormattedTwoStage | FormattedCascade

/** the single-stage 'vapour-compression' template's solution */
export interface FormattedRefrigeration {
  readonly ok: true
  readonly template: 'vapour-compression'
  readonly substance: string
  readonly basis: 'per kg of refrigerant'
  readonly convention: ConventionStatement & { readonly statement: string }
  readonly states: readonly {
    readonly name: string
    readonly description: string
    readonly p: Quantity
    readonly T: Quantity
    readonly h: Quantity
    readonly s: Quantity
    readonly v: Quantity
    readonly x: number | null
    readonly phase: string
  }[]
  readonly devices: readonly { readonly device: string; readonly q: Quantity; readonly w: Quantity }[]
  readonly totals: {
    readonly refrigerationEffect: Quantity
    readonly compressorWork: Quantity
    readonly heatRejected: Quantity
    readonly copRefrigerator: Quantity
    readonly copHeatPump: Quantity
    readonly carnotCop: Quantity
    readonly throttleQuality: Quantity
    readonly massFlow: Quantity | null
    readonly capacity: Quantity | null
    readonly compressorPower: Quantity | null
    readonly heatRejectionRate: Quantity | null
  }
  readonly notice: string
}

const NUMBER = String.raw`([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)`
const UNIT_RE = (units: string) => new RegExp(String.raw`^\s*${NUMBER}\s*(${units})?\s*$`)
const KELVINS = UNIT_RE('K|°C|degC')
const FLOW = UNIT_RE('kg/s|kg/h')
const POWER = UNIT_RE('W|kW|tons?|TR')
const POWER_FACTOR: Record<string, number> = {
  W: 1,
  kW: 1000,
  ton: TON_OF_REFRIGERATION,
  tons: TON_OF_REFRIGERATION,
  TR: TON_OF_REFRIGERATION,
}

function readMatch(
  x: unknown,
  re: RegExp,
  where: string,
  example: string,
): { ok: true; value: number; unit: string | undefined } | RefrigerationFailure {
  if (typeof x === 'number' && Number.isFinite(x)) return { ok: true, value: x, unit: undefined }
  const m = typeof x === 'string' ? re.exec(x) : null
  if (!m)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `${where}: give a value such as ${example}, not ${JSON.stringify(x)}`,
        property: where,
      },
    }
  return { ok: true, value: Number(m[1]), unit: m[2] }
}

type Parsed = { ok: true; value: VapourCompressionInput } | RefrigerationFailure

export function parseVapourCompressionInputs(raw: unknown): Parsed {
  if (!isRecord(raw))
    return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object', property: 'inputs' } }
  const r = raw
  const known = new Set(VAPOUR_COMPRESSION_INPUTS.map((i) => i.name))
  for (const key of Object.keys(r))
    if (!known.has(key))
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `unknown input "${key}"; this template takes ${[...known].join(', ')}`,
          property: key,
        },
      }
  const id = typeof r.refrigerant === 'string' ? r.refrigerant.replace(/^R-/i, 'R').replace(/^r/, 'R') : ''
  const refId = REFRIGERANT_IDS.find((x) => x.toLowerCase() === id.toLowerCase())
  if (!refId)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `refrigerant must be one of ${REFRIGERANT_IDS.join(', ')} (got ${JSON.stringify(r.refrigerant)})`,
        property: 'refrigerant',
      },
    }
  const purpose =
    r.purpose === undefined || r.purpose === 'refrigerator'
      ? 'refrigerator'
      : r.purpose === 'heat pump' || r.purpose === 'heat-pump'
        ? 'heat-pump'
        : null
  if (!purpose)
    return {
      ok: false,
      error: { code: 'invalid-spec', message: 'purpose must be "refrigerator" or "heat pump"', property: 'purpose' },
    }
  const num: Record<string, number> = {}
  for (const name of [
    'evaporatorTemperature',
    'condenserTemperature',
    'gasCoolerExitTemperature',
    'evaporatorPressure',
    'condenserPressure',
    'gasCoolerPressure',
    'compressorEfficiency',
  ]) {
    if (r[name] === undefined) continue
    const inp = VAPOUR_COMPRESSION_INPUTS.find((i) => i.name === name)!
    const v = readValue(
      typeof r[name] === 'number' && inp.dimension === 'dimensionless' ? String(r[name]) : r[name],
      [inp.dimension],
      name,
    )
    if (!v.ok) return v
    num[name] = v.value.value
  }
  for (const name of ['superheat', 'subcooling']) {
    if (r[name] === undefined) continue
    const v = readMatch(r[name], KELVINS, name, '"5 K"')
    if (!v.ok) return v
    num[name] = v.value
  }
  if (r.massFlow !== undefined) {
    const v = readMatch(r.massFlow, FLOW, 'massFlow', '"0.05 kg/s"')
    if (!v.ok) return v
    num.massFlow = v.value / (v.unit === 'kg/h' ? 3600 : 1)
  }
  if (r.capacity !== undefined) {
    const v = readMatch(r.capacity, POWER, 'capacity', '"10 kW" or "3 tons"')
    if (!v.ok) return v
    num.capacity = v.value * POWER_FACTOR[v.unit ?? 'W']!
  }
  const sat = (
    T: number | undefined,
    p: number | undefined,
    what: string,
  ): SaturationGiven | RefrigerationFailure | undefined => {
    if (T !== undefined && p !== undefined)
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `give the ${what} temperature or its pressure, not both`,
          property: `${what}Pressure`,
        },
      }
    return T !== undefined ? { T } : p !== undefined ? { p } : undefined
  }
  const evaporator = sat(num.evaporatorTemperature, num.evaporatorPressure, 'evaporator')
  if (!evaporator)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: 'give evaporatorTemperature or evaporatorPressure',
        property: 'evaporatorTemperature',
      },
    }
  if ('ok' in evaporator) return evaporator
  const condenser = sat(num.condenserTemperature, num.condenserPressure, 'condenser')
  if (condenser && 'ok' in condenser) return condenser
  const hasGc = num.gasCoolerPressure !== undefined || num.gasCoolerExitTemperature !== undefined
  if (hasGc && (num.gasCoolerPressure === undefined || num.gasCoolerExitTemperature === undefined))
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: 'a gas cooler needs both gasCoolerPressure and gasCoolerExitTemperature',
        property: 'gasCoolerPressure',
      },
    }
  return {
    ok: true,
    value: {
      refrigerant: getRefrigerant(refId),
      purpose,
      evaporator,
      ...(condenser ? { condenser } : {}),
      ...(hasGc ? { gasCooler: { p: num.gasCoolerPressure!, exitT: num.gasCoolerExitTemperature! } } : {}),
      ...(num.superheat !== undefined ? { superheat: num.superheat } : {}),
      ...(num.subcooling !== undefined ? { subcooling: num.subcooling } : {}),
      ...(num.compressorEfficiency !== undefined ? { compressorEfficiency: num.compressorEfficiency } : {}),
      ...(num.massFlow !== undefined ? { massFlow: num.massFlow } : {}),
      ...(num.capacity !== undefined ? { capacity: num.capacity } : {}),
    },
  }
}

const PROPERTY_NAMES: Readonly<Record<string, string>> = {
  evaporator: 'evaporatorTemperature',
  condenser: 'condenserTemperature',
  gasCooler: 'gasCoolerPressure',
}

export function formatVapourCompression(
  r: VapourCompressionResult,
  refrigerantName: string,
  convention: Convention,
): FormattedRefrigeration {
  const J = 'J/kg'
  const c = CONVENTIONS[convention]
  const byWork = (workBy: number) => (convention === 'engineering' ? workBy : -workBy)
  const rate = (x: number | null, unit: string) => (x === null ? null : q(x, unit))
  return {
    ok: true,
    template: 'vapour-compression',
    substance: refrigerantName,
    basis: 'per kg of refrigerant',
    convention: { ...c, statement: `${c.flowEquation}; ${c.work}; ${c.heat}` },
    states: r.states.map((s) => ({
      name: s.name,
      description: s.description,
      p: q(s.state.p, 'Pa'),
      T: q(s.state.T, 'K'),
      h: q(s.state.h, J),
      s: q(s.state.s, 'J/(kg K)'),
      v: q(s.state.v, 'm^3/kg'),
      x: s.state.x,
      phase: s.state.phase,
    })),
    devices: [
      { device: 'compressor', q: q(0, J), w: q(byWork(-r.compressorWork), J) },
      { device: r.transcritical ? 'gas cooler' : 'condenser', q: q(-r.heatRejected, J), w: q(0, J) },
      { device: 'throttling valve', q: q(0, J), w: q(0, J) },
      { device: 'evaporator', q: q(r.refrigerationEffect, J), w: q(0, J) },
    ],
    totals: {
      refrigerationEffect: q(r.refrigerationEffect, J),
      compressorWork: q(r.compressorWork, J),
      heatRejected: q(r.heatRejected, J),
      copRefrigerator: q(r.copRefrigerator, ''),
      copHeatPump: q(r.copHeatPump, ''),
      carnotCop: q(r.carnotCop, ''),
      throttleQuality: q(r.throttleQuality, ''),
      massFlow: rate(r.massFlow, 'kg/s'),
      capacity: rate(r.capacity, 'W'),
      compressorPower: rate(r.compressorPower, 'W'),
      heatRejectionRate: rate(r.heatRejectionRate, 'W'),
    },
    notice: r.caution,
  }
}

export function solveRefrigerationTemplate(
  id: string,
  inputs: unknown,
  convention: Convention = 'engineering',
): FormattedRefrigeration | FormattedMultiStageRefrigeration | RefrigerationFailure {
  try {
    if (!isRefrigerationTemplate(id))
      return {
        ok: false,
        error: { code: 'invalid-spec', message: `unknown refrigeration template "${id}"`, property: 'template' },
      }
    if (id === TWO_STAGE_ID || id === CASCADE_ID) return solveMultiStageTemplate(id, inputs, convention)
    const p = parseVapourCompressionInputs(inputs)
    if (!p.ok) return p
    const r = solveVapourCompression(p.value)
    if (!r.ok) {
      const property = r.error.property ? (PROPERTY_NAMES[r.error.property] ?? r.error.property) : undefined
      return { ok: false, error: { code: r.error.code, message: r.error.message, ...(property ? { property } : {}) } }
    }
    return formatVapourCompression(r.value, p.value.refrigerant.name, convention)
  } catch (e) {
    return {
      ok: false,
      error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` },
    }
  }
}
