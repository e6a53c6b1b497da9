/**
 * The one mathjs instance of the thermo package, and the edge where quantities typed as
 * strings ("300 K", "1 bar", "2.5 L", "27 °C") become SI numbers. The solver core never
 * calls mathjs: everything past this module works on plain numbers (Pa, m³, K, J, mol, kg),
 * which is what keeps a solved variant in the microsecond range.
 */
import { create, all } from 'mathjs'
import type { Unit } from 'mathjs'

/** The single mathjs instance of app/domain/thermo (do not create others in this folder). */
export const math = create(all ?? {}, {})

/** Dimensions a spec value may have. The SI unit of each is in SI_UNIT. */
export type Dimension =
  | 'temperature'
  | 'pressure'
  | 'volume'
  | 'specificVolume' // m³/kg
  | 'molarVolume' // m³/mol
  | 'mass'
  | 'amount' // mol
  | 'energy'
  | 'specificEnergy' // J/kg
  | 'molarEnergy' // J/mol
  | 'entropy' // J/K
  | 'specificHeat' // J/(kg·K)
  | 'molarHeat' // J/(mol·K)
  | 'molarMass' // kg/mol
  | 'velocity' // m/s
  | 'area' // m²
  | 'massFlow' // kg/s
  | 'molarFlow' // mol/s
  | 'power' // W
  | 'force' // N
  | 'dimensionless'

export const SI_UNIT: Record<Dimension, string> = {
  temperature: 'K',
  pressure: 'Pa',
  volume: 'm^3',
  specificVolume: 'm^3/kg',
  molarVolume: 'm^3/mol',
  mass: 'kg',
  amount: 'mol',
  energy: 'J',
  specificEnergy: 'J/kg',
  molarEnergy: 'J/mol',
  entropy: 'J/K',
  specificHeat: 'J/(kg K)',
  molarHeat: 'J/(mol K)',
  molarMass: 'kg/mol',
  velocity: 'm/s',
  area: 'm^2',
  massFlow: 'kg/s',
  molarFlow: 'mol/s',
  power: 'W',
  force: 'N',
  dimensionless: '',
}

// Exponent vectors in mathjs order: mass, length, time, current, temperature, luminous
// intensity, amount of substance, angle, bit.
const DIMS: Record<Exclude<Dimension, 'dimensionless'>, readonly number[]> = {
  temperature: [0, 0, 0, 0, 1, 0, 0, 0, 0],
  pressure: [1, -1, -2, 0, 0, 0, 0, 0, 0],
  volume: [0, 3, 0, 0, 0, 0, 0, 0, 0],
  specificVolume: [-1, 3, 0, 0, 0, 0, 0, 0, 0],
  molarVolume: [0, 3, 0, 0, 0, 0, -1, 0, 0],
  mass: [1, 0, 0, 0, 0, 0, 0, 0, 0],
  amount: [0, 0, 0, 0, 0, 0, 1, 0, 0],
  energy: [1, 2, -2, 0, 0, 0, 0, 0, 0],
  specificEnergy: [0, 2, -2, 0, 0, 0, 0, 0, 0],
  molarEnergy: [1, 2, -2, 0, 0, 0, -1, 0, 0],
  entropy: [1, 2, -2, 0, -1, 0, 0, 0, 0],
  specificHeat: [0, 2, -2, 0, -1, 0, 0, 0, 0],
  molarHeat: [1, 2, -2, 0, -1, 0, -1, 0, 0],
  molarMass: [1, 0, 0, 0, 0, 0, -1, 0, 0],
  velocity: [0, 1, -1, 0, 0, 0, 0, 0, 0],
  area: [0, 2, 0, 0, 0, 0, 0, 0, 0],
  massFlow: [1, 0, -1, 0, 0, 0, 0, 0, 0],
  molarFlow: [0, 0, -1, 0, 0, 0, 1, 0, 0],
  power: [1, 2, -3, 0, 0, 0, 0, 0, 0],
  force: [1, 1, -2, 0, 0, 0, 0, 0, 0],
}

export interface ParsedQuantity {
  /** Value in SI (K for temperatures, absolute). */
  readonly value: number
  readonly dimension: Dimension
  /** The number as typed, before conversion (27 for "27 degC"). */
  readonly typedNumber: number
  /** The unit as typed after normalisation ('degC', 'kJ/kg', '' for a bare number). */
  readonly typedUnit: string
  readonly text: string
}

export type ParseResult =
  | { ok: true; value: ParsedQuantity }
  | { ok: false; error: { code: 'unreadable' | 'wrong-dimension' | 'not-finite'; message: string } }

/** Longest text we hand to mathjs; spec values are short. */
const MAX_LENGTH = 80

/** Rewrite typographic forms mathjs does not know: °C → degC, m³ → m^3, · → *, − → -. */
export function normaliseUnitText(text: string): string {
  return text
    .trim()
    .replace(/°\s*C\b/g, 'degC')
    .replace(/°\s*F\b/g, 'degF')
    .replace(/℃/g, 'degC')
    .replace(/(?<=\d)\s*(?=degC|degF)/, ' ')
    .replace(/³/g, '^3')
    .replace(/²/g, '^2')
    .replace(/[·⋅×]/g, '*')
    .replace(/[−–]/g, '-')
}

/** Whether `name` is one of the dimensions with an exponent vector in DIMS. */
function isDimsName(name: string): name is keyof typeof DIMS {
  return Object.hasOwn(DIMS, name)
}

function dimensionOf(u: Unit): Dimension | null {
  const d = u.dimensions
  if (!u.units.length || d.every((x) => x === 0)) return 'dimensionless'
  for (const [name, vec] of Object.entries(DIMS)) {
    if (isDimsName(name) && vec.every((x, i) => x === (d[i] ?? 0))) return name
  }
  return null
}

/**
 * Parse "300 K", "1 bar", "27 °C", "85 %", "8" into a number in SI units.
 * Accepts one of `allowed` dimensions (the first is the default for a bare number only when
 * it is 'dimensionless'). Never throws.
 */
export function parseQuantity(text: unknown, allowed: readonly Dimension[]): ParseResult {
  if (typeof text === 'number') {
    if (!Number.isFinite(text))
      return { ok: false, error: { code: 'not-finite', message: `${text} is not a finite number` } }
    if (allowed.includes('dimensionless')) {
      return {
        ok: true,
        value: { value: text, dimension: 'dimensionless', typedNumber: text, typedUnit: '', text: String(text) },
      }
    }
    return {
      ok: false,
      error: {
        code: 'unreadable',
        message: `${text} has no unit: write it with one, e.g. "${text} ${SI_UNIT[allowed[0] ?? 'pressure']}"`,
      },
    }
  }
  if (typeof text !== 'string')
    return {
      ok: false,
      error: { code: 'unreadable', message: 'expected a quantity written as a string, e.g. "300 K"' },
    }
  if (text.length > MAX_LENGTH)
    return { ok: false, error: { code: 'unreadable', message: `"${text.slice(0, 20)}…" is too long for a quantity` } }
  let t = normaliseUnitText(text)
  let percent = false
  if (/%\s*$/.test(t)) {
    percent = true
    t = t.replace(/%\s*$/, '').trim()
  }
  // Only a number followed by a unit expression: letters, digits, ^ * / ( ) spaces. This keeps
  // function calls and other expressions away from mathjs even at the edge.
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?(\s*[A-Za-z_][A-Za-z0-9_^*/() .-]*)?$/.test(t)) {
    return { ok: false, error: { code: 'unreadable', message: `cannot read "${text}" as a number with a unit` } }
  }
  let u: Unit
  try {
    u = math.unit(t)
  } catch {
    return { ok: false, error: { code: 'unreadable', message: `cannot read "${text}": unknown unit` } }
  }
  const typedNumber = Number(t.match(/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?/)?.[0] ?? NaN)
  const typedUnit = t.replace(/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*/, '')
  const dim = dimensionOf(u)
  if (dim === null || !allowed.includes(dim)) {
    const want = allowed.map((a) => (a === 'dimensionless' ? 'a plain number' : SI_UNIT[a])).join(' or ')
    return {
      ok: false,
      error: { code: 'wrong-dimension', message: `"${text}" has the wrong dimension: expected ${want}` },
    }
  }
  let value: number
  if (dim === 'dimensionless') value = u.units.length ? u.toNumber('') : typedNumber
  else value = u.toNumber(SI_UNIT[dim])
  if (percent) {
    if (dim !== 'dimensionless')
      return { ok: false, error: { code: 'unreadable', message: `"${text}": % only applies to plain numbers` } }
    value /= 100
  }
  if (!Number.isFinite(value)) return { ok: false, error: { code: 'not-finite', message: `"${text}" is not finite` } }
  return { ok: true, value: { value, dimension: dim, typedNumber, typedUnit: percent ? '%' : typedUnit, text } }
}

/** A number in SI with its unit, as the JSON output writes every quantity. */
export interface Quantity {
  readonly value: number
  readonly unit: string
}

export function quantity(value: number, unit: string): Quantity {
  return { value, unit }
}
