/**
 * The combined-cycle template for spec files: { "template": "combined-cycle", "inputs": { …
 * strings with units … }, "convention"?: … }. Inputs are read with the shared unit reader, the
 * cycle is solved by solveCombinedCycle, and the result is JSON-ready with every quantity as
 * { value, unit } in SI, per kilogram of gas through the gas turbine, in the stated sign
 * convention. The steam (bottoming) cycle is formatted as the Rankine templates format theirs,
 * per kilogram of steam. Documented in docs/combined-cycle.md. Never throws.
 *
 * Teaching tool: not design data; defer to the applicable codes and licensed engineering practice.
 */
import { isRecord } from '../json.ts'
import { CONVENTIONS } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { parseGas, readValue } from '../spec.ts'
import { formatRankine } from '../steam/rankine-template.ts'
import type { FormattedRankine } from '../steam/rankine-template.ts'
import type { RankineInput } from '../steam/rankine.ts'
import type { DimensionInput, GasInput } from '../templates/types.ts'
import type { Quantity } from '../units.ts'
import { solveCombinedCycle } from './combined-cycle.ts'
import type { CombinedInput, CombinedResult } from './combined-cycle.ts'

const q = (value: number, unit: string): Quantity => ({ value, unit })
const opt = (i: DimensionInput): DimensionInput => ({ ...i, required: false })

export const COMBINED_INPUTS: readonly (GasInput | DimensionInput)[] = [
  {
    name: 'gas',
    dimension: 'gas',
    unit: '',
    description:
      'gas of the topping cycle: preset id (air, nasa:dry-air, …) or constants; default nasa:dry-air (cp varying with T)',
    required: false,
  },
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
    description: 'gas-turbine inlet temperature',
    required: true,
  },
  opt({
    name: 'compressorEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of the compressor (default 1)',
    required: false,
  }),
  opt({
    name: 'gasTurbineEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of the gas turbine (default 1)',
    required: false,
  }),
  {
    name: 'boilerPressure',
    dimension: 'pressure',
    unit: 'MPa',
    description: 'steam pressure in the heat-recovery steam generator (pump exit, steam-turbine inlet)',
    required: true,
  },
  {
    name: 'condenserPressure',
    dimension: 'pressure',
    unit: 'kPa',
    description: 'condenser pressure; its exit is saturated liquid',
    required: true,
  },
  {
    name: 'steamTemperature',
    dimension: 'temperature',
    unit: '°C or K',
    description: 'steam leaving the heat-recovery steam generator (steam-turbine inlet)',
    required: true,
  },
  opt({
    name: 'pumpEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of the feed pump (default 1)',
    required: false,
  }),
  opt({
    name: 'steamTurbineEfficiency',
    dimension: 'dimensionless',
    unit: '',
    description: 'isentropic efficiency of the steam turbine (default 1)',
    required: false,
  }),
  opt({
    name: 'stackTemperature',
    dimension: 'temperature',
    unit: 'K',
    description: 'gas temperature leaving the heat-recovery steam generator (or pinchDifference)',
    required: false,
  }),
  opt({
    name: 'pinchDifference',
    dimension: 'dimensionless',
    unit: 'K',
    description:
      'pinch point: gas temperature minus the saturation temperature where the water starts to boil (instead of stackTemperature)',
    required: false,
  }),
  opt({
    name: 'gasMassFlow',
    dimension: 'dimensionless',
    unit: 'kg/s',
    description: 'gas mass flow rate, for the power (optional)',
    required: false,
  }),
]

export const COMBINED_TEMPLATES = [
  {
    id: 'combined-cycle',
    title: 'Combined gas–steam cycle (gas-turbine topping, Rankine bottoming)',
    description:
      'A Brayton gas turbine (1→2 compressor, 2→3 combustor, 3→4 turbine) whose exhaust 4→5 raises steam in a heat-recovery steam generator for a Rankine cycle (pump, HRSG, steam turbine, condenser). Give the stack temperature or the pinch-point difference; results per kg of gas.',
    inputs: COMBINED_INPUTS,
  },
] as const

export function isCombinedTemplate(id: unknown): boolean {
  return COMBINED_TEMPLATES.some((t) => t.id === id)
}

export interface CombinedFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

export interface FormattedCombinedGasState {
  readonly name: string
  readonly description: string
  readonly p: Quantity
  readonly T: Quantity
  readonly h: Quantity
  readonly s: Quantity
  readonly v: Quantity
}

export interface FormattedCombined {
  readonly ok: true
  readonly template: 'combined-cycle'
  readonly substance: string
  readonly basis: 'per kg of gas through the gas turbine'
  readonly convention: ConventionStatement & { readonly statement: string }
  readonly gasStates: readonly FormattedCombinedGasState[]
  /** the steam cycle, per kg of steam, as the Rankine templates report it */
  readonly bottoming: FormattedRankine
  /** per kg of gas, in the stated convention's sign */
  readonly devices: readonly { readonly device: string; readonly q: Quantity; readonly w: Quantity }[]
  readonly totals: {
    readonly steamPerGas: Quantity
    readonly compressorWork: Quantity
    readonly gasTurbineWork: Quantity
    readonly heatIn: Quantity
    readonly gasNetWork: Quantity
    readonly steamNetWork: Quantity
    readonly netWork: Quantity
    readonly netWorkSigned: Quantity
    readonly hrsgHeat: Quantity
    readonly stackLoss: Quantity
    readonly condenserHeat: Quantity
    readonly efficiency: Quantity
    readonly gasEfficiency: Quantity
    readonly steamEfficiency: Quantity
    readonly stackTemperature: Quantity
    readonly pinchDifference: Quantity | null
    readonly hotEndDifference: Quantity
    readonly coldEndDifference: Quantity
    readonly power: Quantity | null
  }
  readonly notice: string
}

type Parsed = { ok: true; value: CombinedInput } | CombinedFailure

const NUMBER = String.raw`([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)`
const DIFFERENCE_RE = new RegExp(String.raw`^\s*${NUMBER}\s*(?:K|°C|degC)?\s*$`)
const FLOW_RE = new RegExp(String.raw`^\s*${NUMBER}\s*(kg/s|kg/h|t/h)?\s*$`)
const FLOW_FACTOR: Record<string, number> = { 'kg/s': 1, 'kg/h': 1 / 3600, 't/h': 1000 / 3600 }

/** A temperature difference: a number of kelvins, or "3 K" / "3 °C" (a difference of 3 K either way). */
function readDifference(x: unknown, where: string): { ok: true; value: number } | CombinedFailure {
  if (typeof x === 'number' && Number.isFinite(x)) return { ok: true, value: x }
  const m = typeof x === 'string' ? DIFFERENCE_RE.exec(x) : null
  if (!m)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `${where}: give a temperature difference such as "10 K" (a difference in °C is the same number of kelvins), not ${JSON.stringify(x)}`,
        property: where,
      },
    }
  return { ok: true, value: Number(m[1]) }
}

/** A mass flow rate in kg/s (a bare number), or "12 kg/s", "4000 kg/h", "36 t/h". */
function readMassFlow(x: unknown, where: string): { ok: true; value: number } | CombinedFailure {
  if (typeof x === 'number' && Number.isFinite(x)) return { ok: true, value: x }
  const m = typeof x === 'string' ? FLOW_RE.exec(x) : null
  if (!m)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `${where}: give a mass flow rate such as "12 kg/s", "4000 kg/h" or "36 t/h", not ${JSON.stringify(x)}`,
        property: where,
      },
    }
  return { ok: true, value: Number(m[1]) * FLOW_FACTOR[m[2] ?? 'kg/s']! }
}

/** Template inputs (strings with units) → numbers in SI. Never throws. */
export function parseCombinedInputs(raw: unknown): Parsed {
  if (!isRecord(raw))
    return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object', property: 'inputs' } }
  const r = raw
  const known = new Set(COMBINED_INPUTS.map((i) => i.name))
  for (const key of Object.keys(r)) {
    if (!known.has(key))
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `unknown input "${key}"; this template takes ${[...known].join(', ')}`,
          property: key,
        },
      }
  }
  const gas = parseGas(r.gas ?? 'nasa:dry-air')
  if (!gas.ok) return gas
  const num: Record<string, number> = {}
  for (const inp of COMBINED_INPUTS) {
    if (inp.dimension === 'gas') continue
    const x = r[inp.name]
    if (x === undefined) {
      if (inp.required)
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `input "${inp.name}" is required: ${inp.description}`,
            property: inp.name,
          },
        }
      continue
    }
    if (inp.name === 'pinchDifference' || inp.name === 'gasMassFlow') {
      const v = inp.name === 'pinchDifference' ? readDifference(x, inp.name) : readMassFlow(x, inp.name)
      if (!v.ok) return v
      num[inp.name] = v.value
      continue
    }
    const v = readValue(
      typeof x === 'number' && inp.dimension === 'dimensionless' ? String(x) : x,
      [inp.dimension],
      inp.name,
    )
    if (!v.ok) return v
    num[inp.name] = v.value.value
  }
  const steam: RankineInput = {
    boilerPressure: num.boilerPressure!,
    condenserPressure: num.condenserPressure!,
    turbineInletTemperature: num.steamTemperature!,
    ...(num.pumpEfficiency !== undefined ? { pumpEfficiency: num.pumpEfficiency } : {}),
    ...(num.steamTurbineEfficiency !== undefined ? { turbineEfficiency: num.steamTurbineEfficiency } : {}),
  }
  return {
    ok: true,
    value: {
      gas: gas.value,
      p1: num.p1!,
      T1: num.T1!,
      pressureRatio: num.pressureRatio!,
      turbineInletT: num.turbineInletT!,
      ...(num.compressorEfficiency !== undefined ? { compressorEfficiency: num.compressorEfficiency } : {}),
      ...(num.gasTurbineEfficiency !== undefined ? { gasTurbineEfficiency: num.gasTurbineEfficiency } : {}),
      steam,
      ...(num.stackTemperature !== undefined ? { stackTemperature: num.stackTemperature } : {}),
      ...(num.pinchDifference !== undefined ? { pinchDifference: num.pinchDifference } : {}),
      ...(num.gasMassFlow !== undefined ? { gasMassFlow: num.gasMassFlow } : {}),
    },
  }
}

/** Work done BY the plant is positive in the engineering convention and negative in the chemistry one. */
const sign = (convention: Convention, workBy: number) => (convention === 'engineering' ? workBy : -workBy)

export function formatCombined(r: CombinedResult, gasLabel: string, convention: Convention): FormattedCombined {
  const J = 'J/kg'
  const c = CONVENTIONS[convention]
  const y = r.steamPerGas
  const devices = [
    { device: 'compressor', q: q(0, J), w: q(sign(convention, -r.compressorWork), J) },
    { device: 'combustor', q: q(r.heatIn, J), w: q(0, J) },
    { device: 'gas turbine', q: q(0, J), w: q(sign(convention, r.gasTurbineWork), J) },
    { device: 'heat-recovery steam generator, gas side', q: q(-r.hrsgHeat, J), w: q(0, J) },
    { device: 'heat-recovery steam generator, steam side', q: q(r.hrsgHeat, J), w: q(0, J) },
    { device: 'steam turbine', q: q(0, J), w: q(sign(convention, y * r.steam.turbineWork), J) },
    { device: 'condenser', q: q(-r.condenserHeat, J), w: q(0, J) },
    { device: 'feed pump', q: q(0, J), w: q(sign(convention, -y * r.steam.pumpWork), J) },
    { device: 'stack (exhaust to the surroundings)', q: q(-r.stackLoss, J), w: q(0, J) },
  ]
  return {
    ok: true,
    template: 'combined-cycle',
    substance: `${gasLabel} (topping); water, IAPWS-IF97 (bottoming)`,
    basis: 'per kg of gas through the gas turbine',
    convention: { ...c, statement: `${c.flowEquation}; ${c.work}; ${c.heat}` },
    gasStates: r.gasStates.map((s) => ({
      name: s.name,
      description: s.description,
      p: q(s.p, 'Pa'),
      T: q(s.T, 'K'),
      h: q(s.h, J),
      s: q(s.s, 'J/(kg K)'),
      v: q(s.v, 'm^3/kg'),
    })),
    bottoming: formatRankine('rankine', r.steam, convention),
    devices,
    totals: {
      steamPerGas: q(y, ''),
      compressorWork: q(r.compressorWork, J),
      gasTurbineWork: q(r.gasTurbineWork, J),
      heatIn: q(r.heatIn, J),
      gasNetWork: q(r.gasNetWork, J),
      steamNetWork: q(r.steamNetWork, J),
      netWork: q(r.netWork, J),
      netWorkSigned: q(sign(convention, r.netWork), J),
      hrsgHeat: q(r.hrsgHeat, J),
      stackLoss: q(r.stackLoss, J),
      condenserHeat: q(r.condenserHeat, J),
      efficiency: q(r.efficiency, ''),
      gasEfficiency: q(r.gasEfficiency, ''),
      steamEfficiency: q(r.steamEfficiency, ''),
      stackTemperature: q(r.stackTemperature, 'K'),
      pinchDifference: r.pinchDifference === null ? null : q(r.pinchDifference, 'K'),
      hotEndDifference: q(r.hotEndDifference, 'K'),
      coldEndDifference: q(r.coldEndDifference, 'K'),
      power: r.power === null ? null : q(r.power, 'W'),
    },
    notice: r.caution,
  }
}

/** The solver's names for the steam inputs → the template's input names. */
const SPEC_NAMES: Readonly<Record<string, string>> = {
  'steam.turbineInletTemperature': 'steamTemperature',
  'steam.boilerPressure': 'boilerPressure',
  'steam.condenserPressure': 'condenserPressure',
  'steam.pumpEfficiency': 'pumpEfficiency',
  'steam.turbineEfficiency': 'steamTurbineEfficiency',
}

export function solveCombinedTemplate(
  id: string,
  inputs: unknown,
  convention: Convention = 'engineering',
): FormattedCombined | CombinedFailure {
  try {
    if (!isCombinedTemplate(id))
      return {
        ok: false,
        error: { code: 'invalid-spec', message: `unknown combined-cycle template "${id}"`, property: 'template' },
      }
    const p = parseCombinedInputs(inputs)
    if (!p.ok) return p
    const r = solveCombinedCycle(p.value)
    if (!r.ok) {
      const property = r.error.property ? (SPEC_NAMES[r.error.property] ?? r.error.property) : undefined
      return { ok: false, error: { code: r.error.code, message: r.error.message, ...(property ? { property } : {}) } }
    }
    return formatCombined(r.value, p.value.gas.label, convention)
  } catch (e) {
    return {
      ok: false,
      error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` },
    }
  }
}
