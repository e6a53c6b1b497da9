// Units for grading: the named dimensions a rule can require, the expected unit of a find
// (parsed once and cached), conversions, and the words used to talk about them.
//
// Unit definitions come from mathjs 15 (checked in units.test.ts against their legal
// definitions), plus cal and Btu added in math-instance.ts:
//   1 bar = 1e5 Pa and 1 atm = 101325 Pa exactly (SI Brochure, 9th ed., 2019, Table 8)
//   1 psi: mathjs uses 6894.75729276459 Pa; the exact value is 0.45359237 kg × 9.80665 m/s²
//          / (0.0254 m)² = 6894.757293168361 Pa (relative difference 6e-11, harmless)
//   1 cal = 4.184 J (thermochemical calorie, NIST SP 811 B.8); mathjs itself has no cal
//   1 BTU = 1 Btu = 1055.05585262 J (International Table Btu, NIST SP 811 B.8)
//   1 Wh = 3600 J, so 1 kWh = 3.6 MJ
//   torr and mmHg are both 133.322 Pa in mathjs (rounded: 101325/760 = 133.3224 Pa)
// Temperatures: K, degC, degF, degR (also kelvin, celsius, fahrenheit, rankine). An
// absolute reading uses the offsets (27 degC = 300.15 K, 212 degF = 373.15 K); a
// difference reading maps degC → K and degF → degR (10 degC = 10 K, 9 degF = 5 K).
// Offset units inside compound units (kJ/(kg·degC)) are always differences (mathjs).

import type { Unit } from 'mathjs'
import { mathCore, prefixValue } from './math-instance.ts'
import { isKnownUnitName, isUnit, parseUnitString } from './restricted-math.ts'

export interface DimensionInfo {
  /** A unit with this dimension ('' for a pure number). */
  readonly reference: string
  /** How we name it to a student: "an energy". */
  readonly label: string
}

/** The dimensions a CheckRule may require. */
export const DIMENSIONS = {
  energy: { reference: 'J', label: 'an energy' },
  power: { reference: 'W', label: 'a power' },
  pressure: { reference: 'Pa', label: 'a pressure' },
  temperature: { reference: 'K', label: 'a temperature' },
  'temperature-difference': { reference: 'K', label: 'a temperature difference' },
  volume: { reference: 'm^3', label: 'a volume' },
  'specific-volume': { reference: 'm^3/kg', label: 'a specific volume (volume per mass)' },
  mass: { reference: 'kg', label: 'a mass' },
  amount: { reference: 'mol', label: 'an amount of substance' },
  'specific-energy': { reference: 'J/kg', label: 'a specific energy (energy per mass)' },
  'molar-energy': { reference: 'J/mol', label: 'a molar energy (energy per mole)' },
  entropy: { reference: 'J/K', label: 'an entropy (energy per kelvin)' },
  'specific-entropy': {
    reference: 'J/(kg K)',
    label: 'a specific entropy or heat capacity (energy per mass and kelvin)',
  },
  'molar-entropy': { reference: 'J/(mol K)', label: 'a molar entropy or heat capacity (energy per mole and kelvin)' },
  'mass-flow-rate': { reference: 'kg/s', label: 'a mass flow rate' },
  'volume-flow-rate': { reference: 'm^3/s', label: 'a volume flow rate' },
  density: { reference: 'kg/m^3', label: 'a density' },
  length: { reference: 'm', label: 'a length' },
  area: { reference: 'm^2', label: 'an area' },
  time: { reference: 's', label: 'a time' },
  force: { reference: 'N', label: 'a force' },
  dimensionless: { reference: '', label: 'a pure number (no unit)' },
} as const satisfies Record<string, DimensionInfo>

export type DimensionName = keyof typeof DIMENSIONS

export function isDimensionName(name: unknown): name is DimensionName {
  return typeof name === 'string' && Object.hasOwn(DIMENSIONS, name)
}

/** Extra names used only to describe what a student typed ("We read this as …"). */
const DESCRIPTIVE_DIMENSIONS: ReadonlyArray<readonly [string, string]> = [
  ['m/s', 'a speed'],
  ['C', 'an electric charge'],
  ['F', 'an electric capacitance'],
  ['A', 'an electric current'],
  ['V', 'a voltage'],
  ['rad', 'an angle'],
  ['Hz', 'a frequency'],
]

interface ReferenceUnit {
  readonly label: string
  readonly unit: Unit | 1
}

const REFERENCES: readonly ReferenceUnit[] = [
  ...Object.keys(DIMENSIONS)
    .filter(isDimensionName)
    .filter((d) => d !== 'temperature-difference')
    .map((d) => ({ label: DIMENSIONS[d].label, unit: parseUnitString(DIMENSIONS[d].reference, false) })),
  ...DESCRIPTIVE_DIMENSIONS.map(([ref, label]) => ({ label, unit: parseUnitString(ref, false) })),
].filter((r): r is ReferenceUnit => r.unit !== null)

/** "an energy", "a pressure", … for a quantity, or null when none of our names fits. */
export function describeDimension(q: Unit | number): string | null {
  if (typeof q === 'number') return DIMENSIONS.dimensionless.label
  for (const r of REFERENCES) {
    if (r.unit !== 1 && q.equalBase(r.unit)) return r.label
  }
  return null
}

/** The valueless reference unit of a named dimension (1 for dimensionless). */
export function referenceUnitOf(dimension: DimensionName): Unit | 1 {
  const u = parseUnitString(DIMENSIONS[dimension].reference, false)
  return u ?? 1
}

// ---------------------------------------------------------------------------------------
// The expected unit of a find

/** A parsed expected unit. */
export type ExpectedUnit =
  | {
      readonly kind: 'dimensionless'
      readonly text: string
      /** What 1 of the expected unit is as a fraction: 1 for '' or '1', 0.01 for '%'. */
      readonly scale: number
      readonly display: string
    }
  | {
      readonly kind: 'unit'
      readonly text: string
      /** Valueless; already mapped to K/degR when read as a difference. */
      readonly unit: Unit
      /** For a single offset unit read as absolute (degC, degF): its absolute twin (K, degR). */
      readonly absoluteTwin: Unit | null
      readonly display: string
    }

const DIMENSIONLESS_TEXTS: Readonly<Record<string, number>> = {
  '': 1,
  '1': 1,
  '-': 1,
  '%': 0.01,
  percent: 0.01,
}

const expectedCache = new Map<string, ExpectedUnit | null>()
const EXPECTED_CACHE_LIMIT = 500

/**
 * Parses an expected unit string ("kJ", "kJ/(kg·K)", "°C", "%", ""), cached. With
 * `temperatureDifference`, °C/°F become K/degR. Returns null when it is not a unit.
 */
export function resolveExpectedUnit(text: string, temperatureDifference: boolean): ExpectedUnit | null {
  if (typeof text !== 'string') return null
  const key = `${temperatureDifference ? 'd' : 'a'}|${text}`
  const hit = expectedCache.get(key)
  if (hit !== undefined) return hit
  const resolved = resolveUncached(text, temperatureDifference)
  if (expectedCache.size >= EXPECTED_CACHE_LIMIT) expectedCache.clear()
  expectedCache.set(key, resolved)
  return resolved
}

function resolveUncached(text: string, temperatureDifference: boolean): ExpectedUnit | null {
  const t = text.trim()
  const scale = DIMENSIONLESS_TEXTS[t]
  if (scale !== undefined && Object.hasOwn(DIMENSIONLESS_TEXTS, t)) {
    return { kind: 'dimensionless', text: t, scale, display: scale === 1 ? '' : '%' }
  }
  const u = parseUnitString(t, temperatureDifference)
  if (u === null) return null
  if (u === 1) return { kind: 'dimensionless', text: t, scale: 1, display: '' }
  if (u.dimensions.every((d) => d === 0)) return null // kJ/J and the like
  return {
    kind: 'unit',
    text: t,
    unit: u,
    absoluteTwin: absoluteTwinOf(u),
    display: formatUnitForDisplay(u.formatUnits()),
  }
}

const ABSOLUTE_TWIN: Readonly<Record<string, string>> = { degC: 'K', celsius: 'K', degF: 'degR', fahrenheit: 'degR' }

function absoluteTwinOf(u: Unit): Unit | null {
  const comps = u.units
  const only = comps[0]
  if (comps.length !== 1 || !only || only.power !== 1 || only.unit.offset === 0) return null
  const twin = ABSOLUTE_TWIN[only.unit.name]
  if (twin === undefined) return null
  const p = parseUnitString(twin, false)
  return p === null || p === 1 ? null : p
}

/** Converts a valued quantity into a valueless target unit; throws on a dimension mismatch. */
export function convertTo(q: Unit, target: Unit): number {
  return mathCore.numberIn(q, target)
}

/** How many `to` are in one `from`, for differences (offsets ignored). Throws on mismatch. */
export function differenceFactor(from: Unit, to: Unit): number {
  const a = offsetFreeTwin(from)
  const b = offsetFreeTwin(to)
  if (!a.equalBase(b)) throw new Error('differenceFactor: units of different dimensions')
  return unitValueOf(a) / unitValueOf(b)
}

/** The SI value of 1 of a valueless unit, offsets ignored (e.g. 1000 for kJ, 1 for degC). */
function unitValueOf(u: Unit): number {
  let v = 1
  for (const c of u.units) v *= Math.pow(Number(c.unit.value.valueOf()) * prefixValue(c), c.power)
  return v
}

function offsetFreeTwin(u: Unit): Unit {
  return absoluteTwinOf(u) ?? u
}

/** Is this valued or valueless quantity the same dimension as the reference? */
export function sameDimension(q: Unit | number, ref: Unit | 1): boolean {
  if (ref === 1) return typeof q === 'number' || q.dimensions.every((d) => d === 0)
  return isUnit(q) && q.equalBase(ref)
}

// ---------------------------------------------------------------------------------------
// Words

/** A unit as we show it: degC → °C, kJ / (kg K) → kJ/(kg·K), m^3 → m³. */
export function formatUnitForDisplay(unitText: string): string {
  const sup: Readonly<Record<string, string>> = {
    '-': '⁻',
    '0': '⁰',
    '1': '¹',
    '2': '²',
    '3': '³',
    '4': '⁴',
    '5': '⁵',
    '6': '⁶',
    '7': '⁷',
    '8': '⁸',
    '9': '⁹',
  }
  return unitText
    .replace(/\bdegC\b/g, '°C')
    .replace(/\bdegF\b/g, '°F')
    .replace(/\bdegR\b/g, '°R')
    .replace(/\^\(?(-?\d+)\)?/g, (_m, e: string) => Array.from(e, (c) => sup[c] ?? c).join(''))
    .replace(/\s*\/\s*/g, '/')
    .replace(/\s*\*\s*/g, '·')
    .replace(/(?<=[A-Za-z0-9⁰¹²³⁴⁵⁶⁷⁸⁹°])\s+(?=[A-Za-z°])/g, '·')
}

/** Common units, for "did you mean …" suggestions on a mistyped unit. */
const COMMON_UNITS: readonly string[] = [
  'J',
  'kJ',
  'MJ',
  'GJ',
  'W',
  'kW',
  'MW',
  'Wh',
  'kWh',
  'Pa',
  'kPa',
  'MPa',
  'GPa',
  'bar',
  'atm',
  'psi',
  'K',
  'degC',
  'degF',
  'degR',
  'kg',
  'g',
  'mol',
  'kmol',
  'm',
  'cm',
  'mm',
  'L',
  'mL',
  's',
  'min',
  'h',
  'N',
  'kN',
  'cal',
  'kcal',
  'BTU',
  'Btu',
]

/**
 * A likely intended unit for a name we did not recognise: a case slip (KJ → kJ, kpa → kPa),
 * a missing power sign (m3 → m^3), or two units run together (kgK → kg·K). Null if none.
 */
export function suggestUnit(name: string): string | null {
  if (!/^[A-Za-z][A-Za-z0-9]{0,15}$/.test(name)) return null
  const lower = name.toLowerCase()
  const byCase = COMMON_UNITS.filter((u) => u.toLowerCase() === lower && u !== name)
  if (byCase.length === 1 && byCase[0] !== undefined) return formatUnitForDisplay(byCase[0])
  const power = /^([A-Za-z]+)([2-4])$/.exec(name)
  if (power && power[1] !== undefined && isKnownUnitName(power[1]))
    return formatUnitForDisplay(`${power[1]}^${power[2]}`)
  for (let i = 1; i < name.length; i++) {
    const a = name.slice(0, i)
    const b = name.slice(i)
    if (COMMON_UNITS.includes(a) && COMMON_UNITS.includes(b))
      return `${formatUnitForDisplay(a)}·${formatUnitForDisplay(b)}`
  }
  return null
}
