// Rankine templates for spec files: { "template": "rankine" | "rankine-reheat" |
// "rankine-regenerative", "inputs": { ... strings with units ... }, "convention"?: ... }.
// Inputs are read once with the shared unit reader (../spec.ts readValue, as the ideal-gas
// templates do), then solved by solveRankine; the output is JSON-ready with every quantity
// as { value, unit } in SI and the sign convention stated. Documented in docs/steam.md.
//
// Why not a TemplateDef in ../templates/index.ts: TemplateDef.solve returns the ideal-gas
// CycleResult that ../format.ts formats; a steam cycle has no Gas and different results, so
// the spec entry point must dispatch "rankine*" ids here (see solveRankineTemplate).
//
// Teaching tool: not design data; defer to the applicable codes and licensed engineering practice.
import { CONVENTIONS, isConvention } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { readValue } from '../spec.ts'
import type { TemplateInput } from '../templates/types.ts'
import type { Dimension, Quantity } from '../units.ts'
import { RANKINE_CAUTION, solveRankine } from './rankine.ts'
import type { RankineInput, RankineResult } from './rankine.ts'

const q = (value: number, unit: string): Quantity => ({ value, unit })

const BOILER: TemplateInput = { name: 'boilerPressure', dimension: 'pressure', unit: 'MPa', description: 'boiler (high) pressure; pump exit and turbine inlet', required: true }
const CONDENSER: TemplateInput = { name: 'condenserPressure', dimension: 'pressure', unit: 'kPa', description: 'condenser (low) pressure; the condenser exit is saturated liquid', required: true }
const T_IN: TemplateInput = { name: 'turbineInletTemperature', dimension: 'temperature', unit: '°C or K', description: 'turbine inlet temperature (omit for saturated vapour at the boiler pressure)', required: false }
const ETA_P: TemplateInput = { name: 'pumpEfficiency', dimension: 'dimensionless', unit: '', description: 'pump isentropic efficiency, 0 < eta <= 1 (default 1), e.g. "0.85" or "85 %"', required: false }
const ETA_T: TemplateInput = { name: 'turbineEfficiency', dimension: 'dimensionless', unit: '', description: 'turbine isentropic efficiency, 0 < eta <= 1 (default 1), applied to each turbine section', required: false }
const RH_P: TemplateInput = { name: 'reheatPressure', dimension: 'pressure', unit: 'MPa', description: 'pressure at which the steam leaves the high-pressure turbine and is reheated', required: true }
const RH_T: TemplateInput = { name: 'reheatTemperature', dimension: 'temperature', unit: '°C or K', description: 'temperature after reheating (low-pressure turbine inlet)', required: true }
const FWH_P: TemplateInput = { name: 'feedwaterHeaterPressure', dimension: 'pressure', unit: 'MPa', description: 'pressure of the one open feedwater heater (steam bled from the turbine; heater exit saturated liquid)', required: true }
const opt = (i: TemplateInput): TemplateInput => ({ ...i, required: false })

export interface RankineTemplate {
  readonly id: string
  readonly title: string
  readonly description: string
  readonly inputs: readonly TemplateInput[]
}

export const RANKINE_TEMPLATES: readonly RankineTemplate[] = [
  {
    id: 'rankine',
    title: 'Rankine cycle (water/steam, IAPWS-IF97)',
    description:
      '1 saturated liquid at the condenser pressure → 2 pump to the boiler pressure → 3 boiler exit (superheated or saturated vapour) → 4 turbine exit → condenser. Ideal by default; give pumpEfficiency / turbineEfficiency for a non-ideal cycle. Optional reheat or one open feedwater heater.',
    inputs: [BOILER, CONDENSER, T_IN, ETA_P, ETA_T, opt(RH_P), opt(RH_T), opt(FWH_P)],
  },
  {
    id: 'rankine-reheat',
    title: 'Rankine cycle with reheat (water/steam, IAPWS-IF97)',
    description: 'As "rankine", with the steam expanded to reheatPressure, reheated to reheatTemperature and expanded to the condenser pressure.',
    inputs: [BOILER, CONDENSER, T_IN, RH_P, RH_T, ETA_P, ETA_T, opt(FWH_P)],
  },
  {
    id: 'rankine-regenerative',
    title: 'Regenerative Rankine cycle with one open feedwater heater (water/steam, IAPWS-IF97)',
    description: 'As "rankine", with a fraction y of the steam bled at feedwaterHeaterPressure into an open heater whose exit is saturated liquid; two pumps.',
    inputs: [BOILER, CONDENSER, T_IN, FWH_P, ETA_P, ETA_T, opt(RH_P), opt(RH_T)],
  },
]

export function isRankineTemplate(id: unknown): boolean {
  return typeof id === 'string' && RANKINE_TEMPLATES.some((t) => t.id === id)
}

export interface RankineFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

/** Template inputs (strings with units) -> numeric RankineInput (SI). Never throws. */
export function parseRankineInputs(id: string, raw: unknown): { ok: true; value: RankineInput } | RankineFailure {
  const t = RANKINE_TEMPLATES.find((x) => x.id === id)
  if (!t) return { ok: false, error: { code: 'invalid-spec', message: `unknown Rankine template "${id}": use one of ${RANKINE_TEMPLATES.map((x) => x.id).join(', ')}`, property: 'template' } }
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object', property: 'inputs' } }
  const r = raw as Record<string, unknown>
  const known = new Set(t.inputs.map((i) => i.name))
  for (const k of Object.keys(r)) {
    if (!known.has(k)) return { ok: false, error: { code: 'invalid-spec', message: `unknown input "${k}"; this template takes ${[...known].join(', ')}`, property: k } }
  }
  const num: Record<string, number> = {}
  for (const inp of t.inputs) {
    const x = r[inp.name]
    if (x === undefined) {
      if (inp.required) return { ok: false, error: { code: 'invalid-spec', message: `input "${inp.name}" is required: ${inp.description}`, property: inp.name } }
      continue
    }
    const v = readValue(typeof x === 'number' && inp.dimension === 'dimensionless' ? String(x) : x, [inp.dimension as Dimension], inp.name)
    if (!v.ok) return v
    num[inp.name] = v.value.value
  }
  const hasRhP = num.reheatPressure !== undefined
  const hasRhT = num.reheatTemperature !== undefined
  if (hasRhP !== hasRhT) return { ok: false, error: { code: 'invalid-spec', message: 'give both reheatPressure and reheatTemperature, or neither', property: hasRhP ? 'reheatTemperature' : 'reheatPressure' } }
  const input: RankineInput = { boilerPressure: num.boilerPressure!, condenserPressure: num.condenserPressure! }
  if (num.turbineInletTemperature !== undefined) input.turbineInletTemperature = num.turbineInletTemperature
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
    readonly bleedFraction: Quantity | null
  }
  readonly notice: string
}

/** JSON-ready result in one convention; quantities as { value, unit } in SI. */
export function formatRankine(id: string, r: RankineResult, convention: Convention): FormattedRankine {
  const c = r.conventions[convention]
  const J = 'J/kg'
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
    },
    notice: RANKINE_CAUTION,
  }
}

/** Solve a Rankine template from its inputs (strings with units). Never throws. */
export function solveRankineTemplate(id: string, inputs: unknown, convention: Convention = 'engineering'): FormattedRankine | RankineFailure {
  try {
    const p = parseRankineInputs(id, inputs)
    if (!p.ok) return p
    if (id === 'rankine-reheat' && !p.value.reheat) return { ok: false, error: { code: 'invalid-spec', message: 'rankine-reheat needs reheatPressure and reheatTemperature', property: 'reheatPressure' } }
    const r = solveRankine(p.value)
    if (!r.ok) return { ok: false, error: { code: r.error.code, message: r.error.message, ...(r.error.property ? { property: r.error.property } : {}) } }
    return formatRankine(id, r.value, convention)
  } catch (e) {
    return { ok: false, error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` } }
  }
}

/**
 * A whole spec object { template: "rankine…", inputs, convention? } (what `npm run solve`
 * reads). Never throws.
 */
export function solveRankineSpec(raw: unknown): FormattedRankine | RankineFailure {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return { ok: false, error: { code: 'invalid-spec', message: 'a spec must be a JSON object with "template"' } }
  const r = raw as Record<string, unknown>
  const conv = r.convention ?? 'engineering'
  if (!isConvention(conv)) return { ok: false, error: { code: 'invalid-spec', message: `convention must be "chemistry" or "engineering", not ${JSON.stringify(conv)}`, property: 'convention' } }
  if (typeof r.template !== 'string' || !isRankineTemplate(r.template)) return { ok: false, error: { code: 'invalid-spec', message: `template must be one of ${RANKINE_TEMPLATES.map((t) => t.id).join(', ')}`, property: 'template' } }
  return solveRankineTemplate(r.template, r.inputs ?? {}, conv)
}
