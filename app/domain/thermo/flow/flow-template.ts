/**
 * The steady-flow templates for spec files, with the kinetic energy in the energy balance:
 *   { "template": "nozzle" | "diffuser" | "turbojet", "inputs": { … strings with units … },
 *     "convention"?: "chemistry" | "engineering" }
 * Inputs are read with the shared unit reader (velocities in m/s or km/h, flow rates in kg/s,
 * areas in m² or cm², heat rates in kW), solved by nozzle-diffuser.ts or turbojet.ts, and the
 * result is JSON-ready with every quantity as { value, unit } in SI (W for powers, N for
 * forces), per kilogram of gas and, with a flow rate, as rates. Work and heat of each device
 * are signed in the stated convention. Every result carries family: 'steady-flow' (bank problems
 * refuse it). Documented in docs/steady-flow.md. Never throws.
 *
 * Teaching tool: not design data for engines or nozzles; defer to the applicable codes and
 * licensed engineering practice.
 */
import { isRecord } from '../json.ts'
import { CONVENTIONS } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { parseGas, readValue } from '../spec.ts'
import type { DimensionInput, GasInput } from '../templates/types.ts'
import type { Dimension, Quantity } from '../units.ts'
import { perKilogram } from './flow-gas.ts'
import { solveDuct } from './nozzle-diffuser.ts'
import type { DuctDevice, DuctInput, DuctResult, DuctState, NozzleShape } from './nozzle-diffuser.ts'
import { solveTurbojet } from './turbojet.ts'
import type { TurbojetInput, TurbojetResult } from './turbojet.ts'

export const STEADY_FLOW_FAMILY = 'steady-flow'

const q = (value: number, unit: string): Quantity => ({ value, unit })
const qn = (value: number | null, unit: string): Quantity | null => (value === null ? null : { value, unit })

const input = (
  name: string,
  dimension: Dimension,
  unit: string,
  description: string,
  required = false,
): DimensionInput => ({ name, dimension, unit, description, required })

/** A template's inputs: the gas, then quantities. */
type FlowInputs = readonly (GasInput | DimensionInput)[]

const GAS_INPUT: GasInput = {
  name: 'gas',
  dimension: 'gas',
  unit: '',
  description:
    'preset id (air, nasa:dry-air, …) or constants; default air (cp = 1.005 kJ/(kg·K)); per-mole gases need a molar mass',
  required: false,
}

function ductInputs(device: DuctDevice): FlowInputs {
  const nozzle = device === 'nozzle'
  return [
    GAS_INPUT,
    input('p1', 'pressure', 'kPa', 'inlet pressure', true),
    input('T1', 'temperature', 'K or °C', 'inlet temperature', true),
    input('V1', 'velocity', 'm/s', nozzle ? 'inlet velocity (0 for a large inlet)' : 'inlet velocity (> 0)', true),
    input('p2', 'pressure', 'kPa', 'exit pressure (or give T2 or V2)'),
    input('T2', 'temperature', 'K or °C', 'exit temperature (instead of p2 or V2, or with p2 to find the efficiency)'),
    input(
      'V2',
      'velocity',
      'm/s',
      'exit velocity (instead of p2 or T2, or with p2 to find the efficiency)' + (nozzle ? '' : '; 0 for at rest'),
    ),
    input(
      'efficiency',
      'dimensionless',
      '',
      nozzle
        ? 'isentropic efficiency η_N = (h1 − h2)/(h1 − h2s), default 1'
        : 'isentropic efficiency η_D = (h2s − h1)/(h2 − h1), 2s at the exit pressure; default 1',
    ),
    input(
      'heatLoss',
      'specificEnergy',
      'kJ/kg or kW',
      'heat lost to the surroundings, per kg or as a rate (default 0)',
    ),
    input('massFlow', 'massFlow', 'kg/s', 'mass flow rate, for the areas and rates (or inletArea)'),
    input('inletArea', 'area', 'm^2 or cm^2', 'inlet cross-section, instead of massFlow'),
    ...(nozzle
      ? [
          input(
            'shape',
            'dimensionless',
            '',
            '"converging" (default: the exit chokes at M = 1) or "converging-diverging" (the exit may be supersonic)',
          ),
        ]
      : []),
  ]
}

export const NOZZLE_INPUTS: FlowInputs = ductInputs('nozzle')
export const DIFFUSER_INPUTS: FlowInputs = ductInputs('diffuser')

export const TURBOJET_INPUTS: FlowInputs = [
  GAS_INPUT,
  input('flightSpeed', 'velocity', 'm/s or km/h', 'flight speed (air enters the diffuser at it)', true),
  input('ambientPressure', 'pressure', 'kPa', 'ambient pressure (also the nozzle exit pressure)', true),
  input('ambientTemperature', 'temperature', 'K or °C', 'ambient temperature', true),
  input('pressureRatio', 'dimensionless', '', 'compressor pressure ratio p3/p2 > 1', true),
  input('turbineInletT', 'temperature', 'K or °C', 'turbine inlet (burner exit) temperature', true),
  input('massFlow', 'massFlow', 'kg/s', 'air mass flow rate, for thrust and powers'),
  input('diffuserEfficiency', 'dimensionless', '', 'diffuser (ram) efficiency, default 1'),
  input('compressorEfficiency', 'dimensionless', '', 'compressor isentropic efficiency, default 1'),
  input('turbineEfficiency', 'dimensionless', '', 'turbine isentropic efficiency, default 1'),
  input('nozzleEfficiency', 'dimensionless', '', 'nozzle isentropic efficiency, default 1'),
  input('burnerPressureRatio', 'dimensionless', '', 'p4/p3 across the burner, default 1 (no pressure loss)'),
  input('fuelHeatingValue', 'specificEnergy', 'kJ/kg', 'fuel heating value, for the fuel flow (optional)'),
  input('burnerEfficiency', 'dimensionless', '', 'burner (combustion) efficiency, default 1'),
]

export const STEADY_FLOW_TEMPLATES = [
  {
    id: 'nozzle',
    title: 'Nozzle (adiabatic steady flow of an ideal gas)',
    description:
      'Gas accelerates from inlet state 1 (p1, T1, V1) to exit state 2, with the kinetic energy in the energy balance: exit temperature, velocity, Mach numbers, stagnation state, and areas when the flow rate is known. A converging nozzle chokes at M = 1.',
    inputs: NOZZLE_INPUTS,
  },
  {
    id: 'diffuser',
    title: 'Diffuser (adiabatic steady flow of an ideal gas)',
    description:
      'Gas slows from inlet state 1 (p1, T1, V1) to exit state 2, raising its pressure: exit temperature, pressure, velocity, Mach numbers, stagnation state, and areas when the flow rate is known.',
    inputs: DIFFUSER_INPUTS,
  },
  {
    id: 'turbojet',
    title: 'Turbojet (ideal jet-propulsion cycle)',
    label: 'Turbojet',
    description:
      'Diffuser, compressor, burner, a turbine that drives the compressor, and a nozzle expanding to ambient pressure, with optional component efficiencies: every state, exit velocity, thrust, propulsive power, and propulsive, thermal and overall efficiencies.',
    inputs: TURBOJET_INPUTS,
  },
] as const

export function isSteadyFlowTemplate(id: unknown): boolean {
  return STEADY_FLOW_TEMPLATES.some((t) => t.id === id)
}

export interface FlowFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}
type Parsed<T> = { ok: true; value: T } | FlowFailure

const bad = (code: string, message: string, property?: string): FlowFailure => ({
  ok: false,
  error: { code, message, ...(property ? { property } : {}) },
})

export interface FormattedFlowState {
  readonly name: string
  readonly description: string
  readonly p: Quantity
  readonly T: Quantity
  readonly V: Quantity
  readonly mach: Quantity
  readonly soundSpeed: Quantity
  readonly h: Quantity
  readonly s: Quantity
  readonly density: Quantity
  readonly T0: Quantity
  readonly p0: Quantity
}

export interface FormattedFlowDevice {
  readonly device: string
  /** per kg, heat into the gas */
  readonly q: Quantity
  /** per kg, in the stated convention's sign */
  readonly w: Quantity
  readonly qRate: Quantity | null
  readonly wRate: Quantity | null
}

interface FormattedFlowBase {
  readonly ok: true
  readonly family: typeof STEADY_FLOW_FAMILY
  readonly substance: string
  readonly basis: 'per kg of gas flowing; rates with the mass flow rate'
  readonly convention: ConventionStatement & { readonly statement: string }
  readonly states: readonly FormattedFlowState[]
  readonly devices: readonly FormattedFlowDevice[]
  readonly notes: readonly string[]
  readonly notice: string
}

export interface FormattedDuct extends FormattedFlowBase {
  readonly template: 'nozzle' | 'diffuser'
  readonly totals: {
    readonly exitTemperature: Quantity
    readonly exitPressure: Quantity
    readonly exitVelocity: Quantity
    readonly inletMach: Quantity
    readonly exitMach: Quantity
    readonly efficiency: Quantity
    readonly kineticEnergyChange: Quantity
    readonly enthalpyChange: Quantity
    readonly heatIn: Quantity
    readonly entropyChange: Quantity
    readonly stagnationTemperature: Quantity
    readonly stagnationPressure: Quantity
    readonly exitStagnationPressure: Quantity
    readonly stagnationPressureRatio: Quantity
    readonly isentropicExitTemperature: Quantity
    readonly criticalPressure: Quantity
    readonly criticalPressureRatio: Quantity
    readonly criticalTemperature: Quantity
    readonly shape: NozzleShape | null
    readonly choked: boolean
    readonly backPressure: Quantity | null
    readonly areaRatio: Quantity | null
    readonly massFlow: Quantity | null
    readonly inletArea: Quantity | null
    readonly exitArea: Quantity | null
    readonly kineticEnergyRate: Quantity | null
    readonly heatRate: Quantity | null
  }
}

export interface FormattedTurbojet extends FormattedFlowBase {
  readonly template: 'turbojet'
  readonly totals: {
    readonly exitVelocity: Quantity
    readonly specificThrust: Quantity
    readonly thrust: Quantity | null
    readonly propulsivePower: Quantity | null
    readonly heatRate: Quantity | null
    readonly compressorPower: Quantity | null
    readonly massFlow: Quantity | null
    readonly heatIn: Quantity
    readonly compressorWork: Quantity
    readonly turbineWork: Quantity
    /** net shaft work of the engine (0: the turbine only drives the compressor), signed */
    readonly netShaftWork: Quantity
    readonly kineticEnergyGain: Quantity
    readonly propulsiveWork: Quantity
    readonly propulsiveEfficiency: Quantity
    readonly thermalEfficiency: Quantity
    readonly overallEfficiency: Quantity
    readonly flightMach: Quantity
    readonly exitMach: Quantity
    readonly fuelAirRatio: Quantity | null
    readonly fuelFlow: Quantity | null
    readonly tsfc: Quantity | null
  }
}

export type FormattedFlow = FormattedDuct | FormattedTurbojet

const NOTICE =
  'Teaching tool: an idealised textbook model (ideal gas, one-dimensional steady flow). Not design data for engines, nozzles or diffusers; defer to the applicable codes and licensed engineering practice.'

/** Read the inputs of one template into SI numbers; unknown and missing inputs are refused. */
function readInputs(
  list: FlowInputs,
  raw: unknown,
): Parsed<{ num: Record<string, number>; gas: unknown; shape: unknown; heatDim: Dimension | null }> {
  if (!isRecord(raw)) return bad('invalid-spec', 'inputs must be an object', 'inputs')
  const r = raw
  const known = new Set(list.map((i) => i.name))
  for (const key of Object.keys(r))
    if (!known.has(key))
      return bad('invalid-spec', `unknown input "${key}"; this template takes ${[...known].join(', ')}`, key)
  const num: Record<string, number> = {}
  let heatDim: Dimension | null = null
  for (const inp of list) {
    if (inp.dimension === 'gas' || inp.name === 'shape') continue
    const x = r[inp.name]
    if (x === undefined) {
      if (inp.required) return bad('invalid-spec', `input "${inp.name}" is required: ${inp.description}`, inp.name)
      continue
    }
    const dims: Dimension[] = inp.name === 'heatLoss' ? ['specificEnergy', 'power'] : [inp.dimension]
    const v = readValue(typeof x === 'number' && inp.dimension === 'dimensionless' ? String(x) : x, dims, inp.name)
    if (!v.ok) return bad(v.error.code, v.error.message, inp.name)
    num[inp.name] = v.value.value
    if (inp.name === 'heatLoss') heatDim = v.value.dimension
  }
  return { ok: true, value: { num, gas: r.gas, shape: r.shape, heatDim } }
}

function readGas(raw: unknown) {
  const g = parseGas(raw ?? 'air')
  if (!g.ok) return bad(g.error.code, g.error.message, g.error.property ?? 'gas')
  const f = perKilogram(g.value)
  if ('error' in f) return bad('invalid-gas', f.error, 'gas')
  return { ok: true as const, value: f }
}

export function parseDuctInputs(device: DuctDevice, raw: unknown): Parsed<DuctInput> {
  const r = readInputs(device === 'nozzle' ? NOZZLE_INPUTS : DIFFUSER_INPUTS, raw)
  if (!r.ok) return r
  const gas = readGas(r.value.gas)
  if (!gas.ok) return gas
  const { num, shape, heatDim } = r.value
  if (shape !== undefined && shape !== 'converging' && shape !== 'converging-diverging')
    return bad(
      'invalid-spec',
      `shape must be "converging" or "converging-diverging", not ${JSON.stringify(shape)}`,
      'shape',
    )
  const pick = (k: string) => (num[k] !== undefined ? { [k]: num[k] } : {})
  return {
    ok: true,
    value: {
      device,
      gas: gas.value,
      p1: num.p1!,
      T1: num.T1!,
      V1: num.V1!,
      ...pick('p2'),
      ...pick('T2'),
      ...pick('V2'),
      ...pick('efficiency'),
      ...pick('massFlow'),
      ...pick('inletArea'),
      ...(num.heatLoss !== undefined
        ? heatDim === 'power'
          ? { heatLossRate: num.heatLoss }
          : { heatLoss: num.heatLoss }
        : {}),
      ...(shape !== undefined ? { shape } : {}),
    },
  }
}

export function parseTurbojetInputs(raw: unknown): Parsed<TurbojetInput> {
  const r = readInputs(TURBOJET_INPUTS, raw)
  if (!r.ok) return r
  const gas = readGas(r.value.gas)
  if (!gas.ok) return gas
  const { num } = r.value
  const opt = Object.fromEntries(
    [
      'massFlow',
      'diffuserEfficiency',
      'compressorEfficiency',
      'turbineEfficiency',
      'nozzleEfficiency',
      'burnerPressureRatio',
      'fuelHeatingValue',
      'burnerEfficiency',
    ]
      .filter((k) => num[k] !== undefined)
      .map((k) => [k, num[k]!]),
  )
  return {
    ok: true,
    value: {
      gas: gas.value,
      flightSpeed: num.flightSpeed!,
      ambientPressure: num.ambientPressure!,
      ambientTemperature: num.ambientTemperature!,
      pressureRatio: num.pressureRatio!,
      turbineInletT: num.turbineInletT!,
      ...opt,
    },
  }
}

/** Work done BY the gas is positive in the engineering convention and negative in the chemistry one. */
const sign = (convention: Convention, workBy: number) => (convention === 'engineering' ? workBy : -workBy)

function conventionOf(convention: Convention) {
  const c = CONVENTIONS[convention]
  const ke = convention === 'engineering' ? 'Δ(h + V²/2) = Q − W' : 'Δ(h + V²/2) = q + w'
  return { ...c, statement: `${c.flowEquation}; with kinetic energy, per kg: ${ke}; ${c.work}; ${c.heat}` }
}

function formatState(name: string, description: string, s: DuctState): FormattedFlowState {
  return {
    name,
    description,
    p: q(s.p, 'Pa'),
    T: q(s.T, 'K'),
    V: q(s.V, 'm/s'),
    mach: q(s.mach, ''),
    soundSpeed: q(s.a, 'm/s'),
    h: q(s.h, 'J/kg'),
    s: q(s.s, 'J/(kg K)'),
    density: q(s.rho, 'kg/m^3'),
    T0: q(s.T0, 'K'),
    p0: q(s.p0, 'Pa'),
  }
}

const device = (
  name: string,
  qPerKg: number,
  wByPerKg: number,
  m: number | null,
  convention: Convention,
): FormattedFlowDevice => ({
  device: name,
  q: q(qPerKg, 'J/kg'),
  w: q(sign(convention, wByPerKg), 'J/kg'),
  qRate: m === null ? null : q(m * qPerKg, 'W'),
  wRate: m === null ? null : q(sign(convention, m * wByPerKg), 'W'),
})

export function formatDuct(r: DuctResult, gasLabel: string, convention: Convention): FormattedDuct {
  return {
    ok: true,
    template: r.device,
    family: STEADY_FLOW_FAMILY,
    substance: gasLabel,
    basis: 'per kg of gas flowing; rates with the mass flow rate',
    convention: conventionOf(convention),
    states: [formatState('1', `${r.device} inlet`, r.inlet), formatState('2', `${r.device} exit`, r.exit)],
    devices: [device(r.device, r.heat, 0, r.massFlow, convention)],
    totals: {
      exitTemperature: q(r.exit.T, 'K'),
      exitPressure: q(r.exit.p, 'Pa'),
      exitVelocity: q(r.exit.V, 'm/s'),
      inletMach: q(r.inlet.mach, ''),
      exitMach: q(r.exit.mach, ''),
      efficiency: q(r.efficiency, ''),
      kineticEnergyChange: q(r.kineticEnergyChange, 'J/kg'),
      enthalpyChange: q(r.enthalpyChange, 'J/kg'),
      heatIn: q(r.heat, 'J/kg'),
      entropyChange: q(r.entropyChange, 'J/(kg K)'),
      stagnationTemperature: q(r.inlet.T0, 'K'),
      stagnationPressure: q(r.inlet.p0, 'Pa'),
      exitStagnationPressure: q(r.exit.p0, 'Pa'),
      stagnationPressureRatio: q(r.stagnationPressureRatio, ''),
      isentropicExitTemperature: q(r.exitIsentropic.T, 'K'),
      criticalPressure: q(r.critical.p, 'Pa'),
      criticalPressureRatio: q(r.critical.pressureRatio, ''),
      criticalTemperature: q(r.critical.T, 'K'),
      shape: r.shape,
      choked: r.choked,
      backPressure: qn(r.backPressure, 'Pa'),
      areaRatio: qn(r.areaRatio, ''),
      massFlow: qn(r.massFlow, 'kg/s'),
      inletArea: qn(r.inletArea, 'm^2'),
      exitArea: qn(r.exitArea, 'm^2'),
      kineticEnergyRate: qn(r.kineticEnergyRate, 'W'),
      heatRate: qn(r.heatRate, 'W'),
    },
    notes: r.notes,
    notice: NOTICE,
  }
}

export function formatTurbojet(r: TurbojetResult, gasLabel: string, convention: Convention): FormattedTurbojet {
  const m = r.massFlow
  const s = r.states
  return {
    ok: true,
    template: 'turbojet',
    family: STEADY_FLOW_FAMILY,
    substance: gasLabel,
    basis: 'per kg of gas flowing; rates with the mass flow rate',
    convention: conventionOf(convention),
    states: s.map((x) => formatState(x.name, x.description, x)),
    devices: [
      device('diffuser 1→2', 0, 0, m, convention),
      device('compressor 2→3', 0, -r.compressorWork, m, convention),
      device('burner 3→4', r.heatIn, 0, m, convention),
      device('turbine 4→5', 0, r.turbineWork, m, convention),
      device('nozzle 5→6', 0, 0, m, convention),
    ],
    totals: {
      exitVelocity: q(r.exitVelocity, 'm/s'),
      specificThrust: q(r.specificThrust, 'N s/kg'),
      thrust: qn(r.thrust, 'N'),
      propulsivePower: qn(r.propulsivePower, 'W'),
      heatRate: qn(r.heatRate, 'W'),
      compressorPower: qn(r.compressorPower, 'W'),
      massFlow: qn(m, 'kg/s'),
      heatIn: q(r.heatIn, 'J/kg'),
      compressorWork: q(r.compressorWork, 'J/kg'),
      turbineWork: q(r.turbineWork, 'J/kg'),
      netShaftWork: q(sign(convention, r.turbineWork - r.compressorWork), 'J/kg'),
      kineticEnergyGain: q(r.kineticEnergyGain, 'J/kg'),
      propulsiveWork: q(r.propulsiveWork, 'J/kg'),
      propulsiveEfficiency: q(r.propulsiveEfficiency, ''),
      thermalEfficiency: q(r.thermalEfficiency, ''),
      overallEfficiency: q(r.overallEfficiency, ''),
      flightMach: q(s[0]!.mach, ''),
      exitMach: q(s[5]!.mach, ''),
      fuelAirRatio: qn(r.fuelAirRatio, ''),
      fuelFlow: qn(r.fuelFlow, 'kg/s'),
      tsfc: qn(r.tsfc, 'kg/(N s)'),
    },
    notes: r.notes,
    notice: NOTICE,
  }
}

export function solveSteadyFlowTemplate(
  id: string,
  inputs: unknown,
  convention: Convention = 'engineering',
): FormattedFlow | FlowFailure {
  try {
    if (id === 'nozzle' || id === 'diffuser') {
      const p = parseDuctInputs(id, inputs)
      if (!p.ok) return p
      const r = solveDuct(p.value)
      if (!r.ok) return { ok: false, error: r.error }
      return formatDuct(r.value, p.value.gas.label, convention)
    }
    if (id === 'turbojet') {
      const p = parseTurbojetInputs(inputs)
      if (!p.ok) return p
      const r = solveTurbojet(p.value)
      if (!r.ok) return { ok: false, error: r.error }
      return formatTurbojet(r.value, p.value.gas.label, convention)
    }
    return bad('invalid-spec', `unknown steady-flow template "${id}"`, 'template')
  } catch (e) {
    return bad('internal', `internal error: ${e instanceof Error ? e.message : String(e)}`)
  }
}
