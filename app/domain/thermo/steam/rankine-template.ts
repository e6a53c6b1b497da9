// Rankine templates for spec files: { "template": "rankine" | "rankine-reheat" |
// "rankine-regenerative" | "rankine-feedwater" | "rankine-cogeneration", "inputs": { ...
// strings with units ... }, "convention"?: ... }. The last two (steam plants with a list of
// feedwater heaters, and cogeneration; solved by ./plant.ts) take a heater list (the editor
// shows it as rows, components/problem-editor/heater-list-input.tsx), and are kept in
// STEAM_PLANT_TEMPLATES rather than RANKINE_TEMPLATES; isRankineTemplate and
// solveRankineTemplate cover both lists.
// Inputs are read once with the shared unit reader (../spec.ts readValue, as the ideal-gas
// templates do), then solved by solveRankine; the output is JSON-ready with every quantity
// as { value, unit } in SI and the sign convention stated. Documented in docs/steam.md.
//
// Why not a TemplateDef in ../templates/index.ts: TemplateDef.solve returns the ideal-gas
// CycleResult that ../format.ts formats; a steam cycle has no Gas and different results, so
// the spec entry point must dispatch "rankine*" ids here (see solveRankineTemplate).
//
// Teaching tool: not design data; defer to the applicable codes and licensed engineering practice.
import { isRecord } from '../json.ts'
import { CONVENTIONS, isConvention } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { readValue } from '../spec.ts'
import type { DimensionInput } from '../templates/types.ts'
import type { Dimension, Quantity } from '../units.ts'
import { solveSteamPlant } from './plant.ts'
import type { FeedwaterHeaterInput, PlantInput, PlantResult } from './plant.ts'
import { RANKINE_CAUTION, solveRankine } from './rankine.ts'
import type { RankineInput, RankineResult } from './rankine.ts'

const q = (value: number, unit: string): Quantity => ({ value, unit })

const BOILER: DimensionInput = {
  name: 'boilerPressure',
  dimension: 'pressure',
  unit: 'MPa',
  description: 'boiler (high) pressure; pump exit and turbine inlet',
  required: true,
}
const CONDENSER: DimensionInput = {
  name: 'condenserPressure',
  dimension: 'pressure',
  unit: 'kPa',
  description: 'condenser (low) pressure; the condenser exit is saturated liquid',
  required: true,
}
const T_IN: DimensionInput = {
  name: 'turbineInletTemperature',
  dimension: 'temperature',
  unit: '°C or K',
  description: 'turbine inlet temperature (omit for saturated vapour at the boiler pressure)',
  required: false,
}
const X_IN: DimensionInput = {
  name: 'turbineInletQuality',
  dimension: 'dimensionless',
  unit: '',
  description:
    'turbine inlet quality 0 < x <= 1 for wet steam leaving the boiler (instead of turbineInletTemperature; below the critical pressure)',
  required: false,
}
const ETA_P: DimensionInput = {
  name: 'pumpEfficiency',
  dimension: 'dimensionless',
  unit: '',
  description: 'pump isentropic efficiency, 0 < eta <= 1 (default 1), e.g. "0.85" or "85 %"',
  required: false,
}
const ETA_T: DimensionInput = {
  name: 'turbineEfficiency',
  dimension: 'dimensionless',
  unit: '',
  description: 'turbine isentropic efficiency, 0 < eta <= 1 (default 1), applied to each turbine section',
  required: false,
}
const RH_P: DimensionInput = {
  name: 'reheatPressure',
  dimension: 'pressure',
  unit: 'MPa',
  description: 'pressure at which the steam leaves the high-pressure turbine and is reheated',
  required: true,
}
const RH_T: DimensionInput = {
  name: 'reheatTemperature',
  dimension: 'temperature',
  unit: '°C or K',
  description: 'temperature after reheating (low-pressure turbine inlet)',
  required: true,
}
const FWH_P: DimensionInput = {
  name: 'feedwaterHeaterPressure',
  dimension: 'pressure',
  unit: 'MPa',
  description: 'pressure of the one open feedwater heater (steam bled from the turbine; heater exit saturated liquid)',
  required: true,
}
const opt = (i: DimensionInput): DimensionInput => ({ ...i, required: false })

export interface RankineTemplate {
  readonly id: string
  readonly title: string
  readonly description: string
  readonly inputs: readonly DimensionInput[]
}

export const RANKINE_TEMPLATES: readonly RankineTemplate[] = [
  {
    id: 'rankine',
    title: 'Rankine cycle (water/steam, IAPWS-IF97)',
    description:
      '1 saturated liquid at the condenser pressure → 2 pump to the boiler pressure → 3 boiler exit (superheated or saturated vapour) → 4 turbine exit → condenser. Ideal by default; give pumpEfficiency / turbineEfficiency for a non-ideal cycle. Optional reheat or one open feedwater heater.',
    inputs: [BOILER, CONDENSER, T_IN, ETA_P, ETA_T, opt(RH_P), opt(RH_T), opt(FWH_P), X_IN],
  },
  {
    id: 'rankine-reheat',
    title: 'Rankine cycle with reheat (water/steam, IAPWS-IF97)',
    description:
      'As "rankine", with the steam expanded to reheatPressure, reheated to reheatTemperature and expanded to the condenser pressure.',
    inputs: [BOILER, CONDENSER, T_IN, RH_P, RH_T, ETA_P, ETA_T, opt(FWH_P), X_IN],
  },
  {
    id: 'rankine-regenerative',
    title: 'Regenerative Rankine cycle with one open feedwater heater (water/steam, IAPWS-IF97)',
    description:
      'As "rankine", with a fraction y of the steam bled at feedwaterHeaterPressure into an open heater whose exit is saturated liquid; two pumps.',
    inputs: [BOILER, CONDENSER, T_IN, FWH_P, ETA_P, ETA_T, opt(RH_P), opt(RH_T), X_IN],
  },
]

/** One input of a steam-plant template: a quantity, or the list of feedwater heaters. */
export interface PlantTemplateInput {
  readonly name: string
  readonly dimension: Dimension | 'heater list'
  readonly unit: string
  readonly description: string
  readonly required: boolean
}

export interface PlantTemplate {
  readonly id: string
  readonly title: string
  readonly description: string
  readonly inputs: readonly PlantTemplateInput[]
}

const HEATERS: PlantTemplateInput = {
  name: 'heaters',
  dimension: 'heater list',
  unit: '',
  description:
    'feedwater heaters from the highest pressure to the lowest, each { "kind": "open" | "closed", "pressure": "0.5 MPa", "name"?: "deaerator", and for a closed heater "ttd"?: "3 K" (terminal temperature difference, default 0 K), "drains"?: "backward" (through a trap to the next lower heater or the condenser, default) | "forward" (pumped into the feedwater line) }',
  required: false,
}
const PROC_P: PlantTemplateInput = {
  name: 'processPressure',
  dimension: 'pressure',
  unit: 'kPa',
  description: 'pressure at which steam is extracted to the process heater (which returns saturated liquid)',
  required: true,
}
const PROC_F: PlantTemplateInput = {
  name: 'processFraction',
  dimension: 'dimensionless',
  unit: '',
  description: 'fraction of the boiler flow extracted to the process heater, 0 < f < 1, e.g. "0.7" or "70 %"',
  required: true,
}

export const STEAM_PLANT_TEMPLATES: readonly PlantTemplate[] = [
  {
    id: 'rankine-feedwater',
    title: 'Regenerative Rankine cycle with feedwater heaters (water/steam, IAPWS-IF97)',
    description:
      'As "rankine", with any number of open (direct-contact, e.g. a deaerator) and closed (tube-and-shell) feedwater heaters fed by steam bled from the turbine; closed-heater drains cascade backward through traps or are pumped forward. The bleed fractions come from the heater balances.',
    inputs: [BOILER, CONDENSER, T_IN, X_IN, HEATERS, ETA_P, ETA_T, opt(RH_P), opt(RH_T)],
  },
  {
    id: 'rankine-cogeneration',
    title: 'Cogeneration plant with process heat (water/steam, IAPWS-IF97)',
    description:
      'A Rankine cycle in which a fraction of the steam is extracted at processPressure to a process heater, returning as saturated liquid pumped to the boiler pressure; reports the process heat, the net power and the utilisation factor (W_net + Q_process) / Q_in. Optional feedwater heaters and reheat.',
    inputs: [BOILER, CONDENSER, T_IN, X_IN, PROC_P, PROC_F, HEATERS, ETA_P, ETA_T, opt(RH_P), opt(RH_T)],
  },
]

export function isRankineTemplate(id: unknown): boolean {
  return (
    typeof id === 'string' &&
    (RANKINE_TEMPLATES.some((t) => t.id === id) || STEAM_PLANT_TEMPLATES.some((t) => t.id === id))
  )
}

const TTD_RE = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(K|°C|degC|℃)?\s*$/

/** A temperature difference: a number of kelvins, or "3 K" / "3 °C" (a difference of 3 K either way). */
function readDifference(x: unknown, where: string): { ok: true; value: number } | RankineFailure {
  if (typeof x === 'number' && Number.isFinite(x)) return { ok: true, value: x }
  const m = typeof x === 'string' ? TTD_RE.exec(x) : null
  if (!m)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `${where}: give a temperature difference such as "3 K" (a difference in °C is the same number of kelvins), not ${JSON.stringify(x)}`,
        property: where,
      },
    }
  return { ok: true, value: Number(m[1]) }
}

function parseHeaters(raw: unknown): { ok: true; value: FeedwaterHeaterInput[] } | RankineFailure {
  if (!Array.isArray(raw))
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: 'heaters must be a list of { kind, pressure, ... } objects, highest pressure first',
        property: 'heaters',
      },
    }
  const out: FeedwaterHeaterInput[] = []
  const keys = new Set(['kind', 'pressure', 'ttd', 'drains', 'name'])
  for (let i = 0; i < raw.length; i++) {
    const h: unknown = raw[i]
    const where = `heaters.${i}`
    if (!isRecord(h))
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `heater ${i + 1} must be an object like { "kind": "open", "pressure": "0.5 MPa" }`,
          property: where,
        },
      }
    const r = h
    for (const k of Object.keys(r))
      if (!keys.has(k))
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `heater ${i + 1}: unknown field "${k}"; a heater takes ${[...keys].join(', ')}`,
            property: `${where}.${k}`,
          },
        }
    if (r.kind !== 'open' && r.kind !== 'closed')
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `heater ${i + 1}: kind must be "open" or "closed"`,
          property: `${where}.kind`,
        },
      }
    if (r.pressure === undefined)
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `heater ${i + 1}: pressure is required, e.g. "0.5 MPa"`,
          property: `${where}.pressure`,
        },
      }
    const p = readValue(r.pressure, ['pressure'], `${where}.pressure`)
    if (!p.ok) return p
    const heater: FeedwaterHeaterInput = { kind: r.kind, pressure: p.value.value }
    if (r.name !== undefined) {
      if (typeof r.name !== 'string' || r.name.trim() === '' || r.name.length > 60)
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `heater ${i + 1}: name must be a short text (at most 60 characters)`,
            property: `${where}.name`,
          },
        }
      heater.name = r.name.trim()
    }
    if (r.kind === 'open' && (r.ttd !== undefined || r.drains !== undefined))
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `heater ${i + 1} is open (direct contact): it takes no "ttd" or "drains"; its exit is saturated liquid`,
          property: `${where}.${r.ttd !== undefined ? 'ttd' : 'drains'}`,
        },
      }
    if (r.ttd !== undefined) {
      const t = readDifference(r.ttd, `${where}.ttd`)
      if (!t.ok) return t
      heater.terminalTemperatureDifference = t.value
    }
    if (r.drains !== undefined) {
      if (r.drains !== 'backward' && r.drains !== 'forward')
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `heater ${i + 1}: drains must be "backward" or "forward"`,
            property: `${where}.drains`,
          },
        }
      heater.drains = r.drains
    }
    out.push(heater)
  }
  return { ok: true, value: out }
}

/** Steam-plant template inputs (strings with units, and the heater list) -> numeric PlantInput (SI). Never throws. */
export function parsePlantInputs(id: string, raw: unknown): { ok: true; value: PlantInput } | RankineFailure {
  const t = STEAM_PLANT_TEMPLATES.find((x) => x.id === id)
  if (!t)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `unknown steam-plant template "${id}": use one of ${STEAM_PLANT_TEMPLATES.map((x) => x.id).join(', ')}`,
        property: 'template',
      },
    }
  if (!isRecord(raw))
    return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object', property: 'inputs' } }
  const r = raw
  const known = new Set(t.inputs.map((i) => i.name))
  for (const k of Object.keys(r)) {
    if (!known.has(k))
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `unknown input "${k}"; this template takes ${[...known].join(', ')}`,
          property: k,
        },
      }
  }
  const num: Record<string, number> = {}
  let heaters: FeedwaterHeaterInput[] | undefined
  for (const inp of t.inputs) {
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
    if (inp.dimension === 'heater list') {
      const h = parseHeaters(x)
      if (!h.ok) return h
      heaters = h.value
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
  const hasRhP = num.reheatPressure !== undefined
  const hasRhT = num.reheatTemperature !== undefined
  if (hasRhP !== hasRhT)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: 'give both reheatPressure and reheatTemperature, or neither',
        property: hasRhP ? 'reheatTemperature' : 'reheatPressure',
      },
    }
  if (id === 'rankine-feedwater' && (!heaters || heaters.length === 0))
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: 'rankine-feedwater needs at least one heater in "heaters"',
        property: 'heaters',
      },
    }
  const input: PlantInput = { boilerPressure: num.boilerPressure!, condenserPressure: num.condenserPressure! }
  if (num.turbineInletTemperature !== undefined) input.turbineInletTemperature = num.turbineInletTemperature
  if (num.turbineInletQuality !== undefined) input.turbineInletQuality = num.turbineInletQuality
  if (num.pumpEfficiency !== undefined) input.pumpEfficiency = num.pumpEfficiency
  if (num.turbineEfficiency !== undefined) input.turbineEfficiency = num.turbineEfficiency
  if (hasRhP) input.reheat = { pressure: num.reheatPressure!, temperature: num.reheatTemperature! }
  if (heaters) input.feedwaterHeaters = heaters
  if (num.processPressure !== undefined)
    input.process = { pressure: num.processPressure, fraction: num.processFraction! }
  return { ok: true, value: input }
}

/** Map a plant-solver error property (feedwaterHeaters.1.pressure) to the spec's name (heaters.1.pressure). */
function specProperty(p: string | undefined): string | undefined {
  if (!p) return p
  return p
    .replace(/^feedwaterHeaters/, 'heaters')
    .replace(/\.terminalTemperatureDifference$/, '.ttd')
    .replace(/^process\.pressure$/, 'processPressure')
    .replace(/^process\.fraction$/, 'processFraction')
}

export interface RankineFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

/** Template inputs (strings with units) -> numeric RankineInput (SI). Never throws. */
export function parseRankineInputs(id: string, raw: unknown): { ok: true; value: RankineInput } | RankineFailure {
  const t = RANKINE_TEMPLATES.find((x) => x.id === id)
  if (!t)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `unknown Rankine template "${id}": use one of ${RANKINE_TEMPLATES.map((x) => x.id).join(', ')}`,
        property: 'template',
      },
    }
  if (!isRecord(raw))
    return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object', property: 'inputs' } }
  const r = raw
  const known = new Set(t.inputs.map((i) => i.name))
  for (const k of Object.keys(r)) {
    if (!known.has(k))
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `unknown input "${k}"; this template takes ${[...known].join(', ')}`,
          property: k,
        },
      }
  }
  const num: Record<string, number> = {}
  for (const inp of t.inputs) {
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
    const v = readValue(
      typeof x === 'number' && inp.dimension === 'dimensionless' ? String(x) : x,
      [inp.dimension],
      inp.name,
    )
    if (!v.ok) return v
    num[inp.name] = v.value.value
  }
  const hasRhP = num.reheatPressure !== undefined
  const hasRhT = num.reheatTemperature !== undefined
  if (hasRhP !== hasRhT)
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: 'give both reheatPressure and reheatTemperature, or neither',
        property: hasRhP ? 'reheatTemperature' : 'reheatPressure',
      },
    }
  const input: RankineInput = { boilerPressure: num.boilerPressure!, condenserPressure: num.condenserPressure! }
  if (num.turbineInletTemperature !== undefined) input.turbineInletTemperature = num.turbineInletTemperature
  if (num.turbineInletQuality !== undefined) input.turbineInletQuality = num.turbineInletQuality
  if (num.pumpEfficiency !== undefined) input.pumpEfficiency = num.pumpEfficiency
  if (num.turbineEfficiency !== undefined) input.turbineEfficiency = num.turbineEfficiency
  if (hasRhP) input.reheat = { pressure: num.reheatPressure!, temperature: num.reheatTemperature! }
  if (num.feedwaterHeaterPressure !== undefined) input.openFeedwaterHeater = { pressure: num.feedwaterHeaterPressure }
  return { ok: true, value: input }
}

export interface FormattedRankineState {
  readonly name: string
  readonly description: string
  readonly p: Quantity
  readonly T: Quantity
  readonly h: Quantity
  readonly u: Quantity
  readonly s: Quantity
  readonly v: Quantity
  /** quality for two-phase and saturated states, null for single-phase */
  readonly x: number | null
  readonly phase: string
  readonly massFraction: number
}

export interface FormattedRankine {
  readonly ok: true
  readonly template: string
  readonly variant: string
  readonly substance: 'water (IAPWS-IF97)'
  readonly basis: string
  readonly convention: ConventionStatement & { readonly statement: string }
  readonly states: readonly FormattedRankineState[]
  readonly devices: readonly { readonly device: string; readonly q: Quantity; readonly w: Quantity }[]
  readonly totals: {
    readonly pumpWork: Quantity
    readonly turbineWork: Quantity
    readonly heatIn: Quantity
    readonly heatOut: Quantity
    readonly netWork: Quantity
    /** net work in the stated convention's sign (engineering: +; chemistry: −) */
    readonly netWorkSigned: Quantity
    readonly efficiency: Quantity
    readonly backWorkRatio: Quantity
    readonly turbineExitQuality: Quantity | null
    /** the bleed fraction; with several heaters (rankine-feedwater, rankine-cogeneration) the total bled to all heaters */
    readonly bleedFraction: Quantity | null
    /** steam plants only: the fraction bled to each heater, in the heaters' order */
    readonly bleedFractions?: readonly Quantity[]
    /** cogeneration only */
    readonly processFraction?: Quantity
    readonly processHeat?: Quantity
    /** (W_net + Q_process) / Q_in */
    readonly utilisationFactor?: Quantity
  }
  /** steam plants only: each feedwater heater's balance */
  readonly heaters?: readonly FormattedHeater[]
  readonly notice: string
}

export interface FormattedHeater {
  readonly name: string
  readonly kind: 'open' | 'closed'
  readonly drains: 'backward' | 'forward' | null
  readonly pressure: Quantity
  readonly bleedFraction: Quantity
  readonly bleedTemperature: Quantity
  readonly feedwaterInletEnthalpy: Quantity
  readonly feedwaterExitTemperature: Quantity
  readonly feedwaterExitEnthalpy: Quantity
  readonly feedwaterFlow: Quantity
  readonly drainsIn: Quantity
  readonly heatTransferred: Quantity
}

function isPlant(r: RankineResult): r is PlantResult {
  return 'heaters' in r && Array.isArray(r.heaters)
}

/** JSON-ready result in one convention; quantities as { value, unit } in SI. */
export function formatRankine(id: string, r: RankineResult, convention: Convention): FormattedRankine {
  const c = r.conventions[convention]
  const J = 'J/kg'
  const plant = isPlant(r) ? r : null
  const plantTotals = plant
    ? {
        bleedFractions: plant.heaters.map((h) => q(h.bleedFraction, '')),
        ...(plant.processFraction !== null ? { processFraction: q(plant.processFraction, '') } : {}),
        ...(plant.processHeat !== null ? { processHeat: q(plant.processHeat, J) } : {}),
        ...(plant.utilisationFactor !== null ? { utilisationFactor: q(plant.utilisationFactor, '') } : {}),
      }
    : {}
  const heaters = plant
    ? {
        heaters: plant.heaters.map((h): FormattedHeater => ({
          name: h.name,
          kind: h.kind,
          drains: h.drains,
          pressure: q(h.pressure, 'Pa'),
          bleedFraction: q(h.bleedFraction, ''),
          bleedTemperature: q(h.bleedTemperature, 'K'),
          feedwaterInletEnthalpy: q(h.feedwaterInletEnthalpy, J),
          feedwaterExitTemperature: q(h.feedwaterExitTemperature, 'K'),
          feedwaterExitEnthalpy: q(h.feedwaterExitEnthalpy, J),
          feedwaterFlow: q(h.feedwaterFlow, ''),
          drainsIn: q(h.drainsIn, ''),
          heatTransferred: q(h.heatTransferred, J),
        })),
      }
    : {}
  return {
    ok: true,
    template: id,
    variant: r.variant,
    substance: 'water (IAPWS-IF97)',
    basis: r.basis,
    convention: { ...CONVENTIONS[convention], statement: c.statement },
    states: r.states.map((s) => ({
      name: s.label,
      description: s.description,
      p: q(s.p, 'Pa'),
      T: q(s.T, 'K'),
      h: q(s.h, J),
      u: q(s.u, J),
      s: q(s.s, 'J/(kg K)'),
      v: q(s.v, 'm^3/kg'),
      x: s.x,
      phase: s.phase,
      massFraction: s.massFraction,
    })),
    devices: c.devices.map((d) => ({ device: d.device, q: q(d.heat, J), w: q(d.work, J) })),
    totals: {
      pumpWork: q(r.pumpWork, J),
      turbineWork: q(r.turbineWork, J),
      heatIn: q(r.heatIn, J),
      heatOut: q(r.heatOut, J),
      netWork: q(r.netWork, J),
      netWorkSigned: q(c.netWork, J),
      efficiency: q(r.thermalEfficiency, ''),
      backWorkRatio: q(r.backWorkRatio, ''),
      turbineExitQuality: r.turbineExitQuality === null ? null : q(r.turbineExitQuality, ''),
      bleedFraction: r.bleedFraction === null ? null : q(r.bleedFraction, ''),
      ...plantTotals,
    },
    ...heaters,
    notice: plant ? r.caution : RANKINE_CAUTION,
  }
}

/** Solve a Rankine template from its inputs (strings with units). Never throws. */
export function solveRankineTemplate(
  id: string,
  inputs: unknown,
  convention: Convention = 'engineering',
): FormattedRankine | RankineFailure {
  try {
    if (STEAM_PLANT_TEMPLATES.some((t) => t.id === id)) {
      const p = parsePlantInputs(id, inputs)
      if (!p.ok) return p
      const r = solveSteamPlant(p.value)
      if (!r.ok) {
        const property = specProperty(r.error.property)
        return { ok: false, error: { code: r.error.code, message: r.error.message, ...(property ? { property } : {}) } }
      }
      return formatRankine(id, r.value, convention)
    }
    const p = parseRankineInputs(id, inputs)
    if (!p.ok) return p
    if (id === 'rankine-reheat' && !p.value.reheat)
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: 'rankine-reheat needs reheatPressure and reheatTemperature',
          property: 'reheatPressure',
        },
      }
    const r = solveRankine(p.value)
    if (!r.ok)
      return {
        ok: false,
        error: {
          code: r.error.code,
          message: r.error.message,
          ...(r.error.property ? { property: r.error.property } : {}),
        },
      }
    return formatRankine(id, r.value, convention)
  } catch (e) {
    return {
      ok: false,
      error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` },
    }
  }
}

/**
 * A whole spec object { template: "rankine…", inputs, convention? } (what `npm run solve`
 * reads). Never throws.
 */
export function solveRankineSpec(raw: unknown): FormattedRankine | RankineFailure {
  if (!isRecord(raw))
    return { ok: false, error: { code: 'invalid-spec', message: 'a spec must be a JSON object with "template"' } }
  const r = raw
  const conv = r.convention ?? 'engineering'
  if (!isConvention(conv))
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `convention must be "chemistry" or "engineering", not ${JSON.stringify(conv)}`,
        property: 'convention',
      },
    }
  if (typeof r.template !== 'string' || !isRankineTemplate(r.template))
    return {
      ok: false,
      error: {
        code: 'invalid-spec',
        message: `template must be one of ${[...RANKINE_TEMPLATES, ...STEAM_PLANT_TEMPLATES].map((t) => t.id).join(', ')}`,
        property: 'template',
      },
    }
  return solveRankineTemplate(r.template, r.inputs ?? {}, conv)
}
