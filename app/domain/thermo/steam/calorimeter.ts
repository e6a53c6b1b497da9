// Throttling calorimeter: the quality of wet steam in a line, from a small sample throttled
// (isenthalpic: adiabatic, no work, negligible kinetic-energy change) to a lower pressure where
// it is superheated, so that the calorimeter's pressure and temperature fix its enthalpy:
//   h_line = h(p_cal, T_cal),  x_line = (h_line - h_f(p_line)) / (h_g(p_line) - h_f(p_line)).
// The method needs the throttled steam to be superheated; a calorimeter reading at or below
// the saturation temperature is refused with a message (the line steam is too wet for it).
//
// Units SI (Pa, K, J/kg). Errors: SteamResult, never a throw for bad input.
// Spec template: { "template": "steam-throttling-calorimeter", "inputs": { "linePressure":
// "2 MPa", "calorimeterPressure": "100 kPa", "calorimeterTemperature": "120 °C" } }. Its result
// is not a cycle, so it has its own format (FormattedCalorimeter) and entry points
// (solveCalorimeterTemplate / solveCalorimeterSpec); isRankineTemplate does not cover it.
//
// Teaching tool: not design data; defer to the applicable codes and licensed engineering practice.
import { isRecord } from '../json.ts'
import { CONVENTIONS, isConvention } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { readValue } from '../spec.ts'
import type { DimensionInput } from '../templates/types.ts'
import type { Quantity } from '../units.ts'
import { fail, ok } from './errors.ts'
import type { SteamError, SteamResult } from './errors.ts'
import { STEAM_LIMITS, saturationAtP, stateFromPT, stateFromPx } from './properties.ts'
import type { SteamState } from './properties.ts'

export const CALORIMETER_CAUTION =
  'Teaching tool: an idealised throttling-calorimeter analysis with IAPWS-IF97 properties, not design data or a measurement procedure. Defer to the applicable codes and licensed engineering practice.'

export interface CalorimeterInput {
  /** Pressure of the wet steam in the line, Pa. */
  linePressure: number
  /** Pressure in the calorimeter after the throttle, Pa. */
  calorimeterPressure: number
  /** Temperature read in the calorimeter, K. */
  calorimeterTemperature: number
}

export interface CalorimeterResult {
  /** Quality of the line steam. */
  quality: number
  /** Line steam (wet) and calorimeter steam (superheated), SI. */
  line: SteamState
  calorimeter: SteamState
  /** Saturation temperature at the calorimeter pressure, K, and the degree of superheat, K. */
  calorimeterSaturationTemperature: number
  superheat: number
  /** The lowest line quality this calorimeter pressure could measure (throttled to saturated vapour). */
  lowestMeasurableQuality: number
  /** Throttling: q = 0, w = 0, so h is unchanged (steady flow, first law). */
  heat: 0
  work: 0
  caution: string
}

function bad(message: string, property: string): SteamResult<never> {
  const e: SteamError = { code: 'invalid-input', message, property }
  return fail(e)
}

const kPa = (p: number) => `${+(p / 1000).toPrecision(6)} kPa`

/** Quality of wet line steam from a throttling calorimeter. Never throws. */
export function solveThrottlingCalorimeter(input: CalorimeterInput): SteamResult<CalorimeterResult> {
  // No input at all (a caller from JSON): every field is missing, and refused below as not a finite number.
  const given = input ?? { linePressure: NaN, calorimeterPressure: NaN, calorimeterTemperature: NaN }
  const { linePressure: p1, calorimeterPressure: p2, calorimeterTemperature: T2 } = given
  for (const [name, v] of [
    ['linePressure', p1],
    ['calorimeterPressure', p2],
    ['calorimeterTemperature', T2],
  ] as const) {
    if (typeof v !== 'number' || !Number.isFinite(v)) return bad(`${name} must be a finite number`, name)
  }
  if (!(p1 < STEAM_LIMITS.P_CRIT))
    return bad(
      'the line pressure must be below the critical pressure 22.064 MPa: above it there is no wet steam',
      'linePressure',
    )
  if (!(p2 > 0)) return bad('the calorimeter pressure must be positive', 'calorimeterPressure')
  if (!(p2 < p1))
    return bad(
      `the calorimeter pressure (${kPa(p2)}) must be below the line pressure (${kPa(p1)}): the sample is throttled to a lower pressure`,
      'calorimeterPressure',
    )
  const sat1 = saturationAtP(p1)
  if (!sat1.ok) return { ok: false, error: { ...sat1.error, property: 'linePressure' } }
  const sat2 = saturationAtP(p2)
  if (!sat2.ok) return { ok: false, error: { ...sat2.error, property: 'calorimeterPressure' } }
  const Ts2 = sat2.value.T
  if (!(T2 > Ts2 + 1e-9))
    return bad(
      `the calorimeter reads ${T2.toFixed(2)} K at ${kPa(p2)}, not above the saturation temperature ${Ts2.toFixed(2)} K there: the throttled steam is not superheated, so its pressure and temperature do not fix its enthalpy and a throttling calorimeter cannot give the quality. The line steam is too wet for this method (a separating calorimeter ahead of the throttling one is the usual remedy), or the calorimeter pressure is too high.`,
      'calorimeterTemperature',
    )
  const cal = stateFromPT(p2, T2)
  if (!cal.ok)
    return {
      ok: false,
      error: { ...cal.error, property: cal.error.property === 'p' ? 'calorimeterPressure' : 'calorimeterTemperature' },
    }
  const hf = sat1.value.liquid.h
  const hg = sat1.value.vapour.h
  const h = cal.value.h
  const x = (h - hf) / (hg - hf)
  if (x > 1)
    return bad(
      `the calorimeter enthalpy ${(h / 1000).toFixed(2)} kJ/kg is above that of saturated vapour at the line pressure (${(hg / 1000).toFixed(2)} kJ/kg): the line steam would be superheated, not wet, so there is no quality to measure (check the readings)`,
      'calorimeterTemperature',
    )
  if (x < 0)
    return bad(
      'the calorimeter enthalpy is below that of saturated liquid at the line pressure: check the readings',
      'calorimeterTemperature',
    )
  const lineState = stateFromPx(p1, x)
  if (!lineState.ok) return lineState
  const line = lineState.value
  return ok({
    quality: x,
    line,
    calorimeter: cal.value,
    calorimeterSaturationTemperature: Ts2,
    superheat: T2 - Ts2,
    lowestMeasurableQuality: (sat2.value.vapour.h - hf) / (hg - hf),
    heat: 0,
    work: 0,
    caution: CALORIMETER_CAUTION,
  })
}

// --- spec template ------------------------------------------------------------------------------

const CALORIMETER_INPUTS: readonly DimensionInput[] = [
  {
    name: 'linePressure',
    dimension: 'pressure',
    unit: 'MPa',
    description: 'pressure of the wet steam in the line (below 22.064 MPa)',
    required: true,
  },
  {
    name: 'calorimeterPressure',
    dimension: 'pressure',
    unit: 'kPa',
    description: 'pressure in the calorimeter after the throttle (below the line pressure)',
    required: true,
  },
  {
    name: 'calorimeterTemperature',
    dimension: 'temperature',
    unit: '°C or K',
    description: 'temperature read in the calorimeter (must be above the saturation temperature there)',
    required: true,
  },
]

export const CALORIMETER_TEMPLATE = {
  id: 'steam-throttling-calorimeter',
  title: 'Throttling calorimeter: quality of wet steam (water/steam, IAPWS-IF97)',
  description:
    'A sample of wet line steam is throttled (h constant) into a calorimeter where it is superheated; its pressure and temperature fix h, and the line quality is x = (h − h_f) / h_fg at the line pressure. Refused when the calorimeter steam is not superheated.',
  inputs: CALORIMETER_INPUTS,
} as const

export function isCalorimeterTemplate(id: unknown): boolean {
  return id === CALORIMETER_TEMPLATE.id
}

export interface FormattedCalorimeterState {
  readonly name: string
  readonly description: string
  readonly p: Quantity
  readonly T: Quantity
  readonly h: Quantity
  readonly u: Quantity
  readonly s: Quantity
  readonly v: Quantity
  readonly x: number | null
  readonly phase: string
}

export interface FormattedCalorimeter {
  readonly ok: true
  readonly template: 'steam-throttling-calorimeter'
  readonly substance: 'water (IAPWS-IF97)'
  readonly basis: 'per kg of steam sampled'
  readonly convention: ConventionStatement & { readonly statement: string }
  readonly states: readonly FormattedCalorimeterState[]
  readonly devices: readonly { readonly device: string; readonly q: Quantity; readonly w: Quantity }[]
  readonly totals: {
    readonly quality: Quantity
    readonly enthalpy: Quantity
    readonly lineTemperature: Quantity
    readonly calorimeterSaturationTemperature: Quantity
    readonly superheat: Quantity
    readonly lowestMeasurableQuality: Quantity
  }
  readonly notice: string
}

export interface CalorimeterFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

const q = (value: number, unit: string): Quantity => ({ value, unit })

function stateOut(name: string, description: string, s: SteamState): FormattedCalorimeterState {
  return {
    name,
    description,
    p: q(s.p, 'Pa'),
    T: q(s.T, 'K'),
    h: q(s.h, 'J/kg'),
    u: q(s.u, 'J/kg'),
    s: q(s.s, 'J/(kg K)'),
    v: q(s.v, 'm^3/kg'),
    x: s.x,
    phase: s.phase,
  }
}

/** Solve the calorimeter template from its inputs (strings with units). Never throws. */
export function solveCalorimeterTemplate(
  inputs: unknown,
  convention: Convention = 'engineering',
): FormattedCalorimeter | CalorimeterFailure {
  try {
    if (!isRecord(inputs))
      return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object', property: 'inputs' } }
    const r = inputs
    const known = new Set(CALORIMETER_TEMPLATE.inputs.map((i) => i.name))
    for (const k of Object.keys(r))
      if (!known.has(k))
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `unknown input "${k}"; this template takes ${[...known].join(', ')}`,
            property: k,
          },
        }
    const num: Record<string, number> = {}
    for (const inp of CALORIMETER_TEMPLATE.inputs) {
      const x = r[inp.name]
      if (x === undefined)
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `input "${inp.name}" is required: ${inp.description}`,
            property: inp.name,
          },
        }
      const v = readValue(x, [inp.dimension], inp.name)
      if (!v.ok) return v
      num[inp.name] = v.value.value
    }
    const res = solveThrottlingCalorimeter({
      linePressure: num.linePressure!,
      calorimeterPressure: num.calorimeterPressure!,
      calorimeterTemperature: num.calorimeterTemperature!,
    })
    if (!res.ok)
      return {
        ok: false,
        error: {
          code: res.error.code,
          message: res.error.message,
          ...(res.error.property ? { property: res.error.property } : {}),
        },
      }
    const c = res.value
    const statement =
      convention === 'engineering'
        ? 'ΔU = Q − W (steady flow: Δh = q − w): the throttle is adiabatic (Q = 0) and does no work (W = 0), so h is the same on both sides.'
        : 'ΔU = q + w (steady flow: Δh = q + w): the throttle is adiabatic (q = 0) and no work is done on the steam (w = 0), so h is the same on both sides.'
    return {
      ok: true,
      template: 'steam-throttling-calorimeter',
      substance: 'water (IAPWS-IF97)',
      basis: 'per kg of steam sampled',
      convention: { ...CONVENTIONS[convention], statement },
      states: [
        stateOut('1', 'line steam (wet), before the throttle', c.line),
        stateOut('2', 'calorimeter (superheated), after the throttle', c.calorimeter),
      ],
      devices: [{ device: 'throttling valve (isenthalpic)', q: q(0, 'J/kg'), w: q(0, 'J/kg') }],
      totals: {
        quality: q(c.quality, ''),
        enthalpy: q(c.line.h, 'J/kg'),
        lineTemperature: q(c.line.T, 'K'),
        calorimeterSaturationTemperature: q(c.calorimeterSaturationTemperature, 'K'),
        superheat: q(c.superheat, 'K'),
        lowestMeasurableQuality: q(c.lowestMeasurableQuality, ''),
      },
      notice: c.caution,
    }
  } catch (e) {
    return {
      ok: false,
      error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` },
    }
  }
}

/** A whole spec { template: "steam-throttling-calorimeter", inputs, convention? }. Never throws. */
export function solveCalorimeterSpec(raw: unknown): FormattedCalorimeter | CalorimeterFailure {
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
  if (!isCalorimeterTemplate(r.template))
    return {
      ok: false,
      error: { code: 'invalid-spec', message: `template must be "${CALORIMETER_TEMPLATE.id}"`, property: 'template' },
    }
  return solveCalorimeterTemplate(r.inputs ?? {}, conv)
}
