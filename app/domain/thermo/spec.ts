/**
 * The edge: specs written as JSON with quantities as strings ("300 K", "1 bar", "27 °C") are
 * parsed once into SI numbers and a Gas; after this, the solver core never sees a string.
 * Formats are documented in docs/spec-format.md.
 */
import { R_MOLAR } from './constants.ts'
import { isOneOf } from './json.ts'
import type { CycleSpec, StateSpec, StepSpec, ProcessKind } from './cycle.ts'
import { PROCESS_KINDS } from './cycle.ts'
import type { Slips } from './slips.ts'
import { constantCpGas } from './substances/constant-cp.ts'
import type { Basis, Gas } from './substances/gas.ts'
import { gasPreset } from './substances/presets.ts'
import { polynomialCpGas } from './substances/polynomial-cp.ts'
import { swapCpCv, swapMonatomicDiatomic, switchBasisNumbers, withLog10 } from './substances/slipped.ts'
import { parseQuantity } from './units.ts'
import type { Dimension } from './units.ts'

export interface SpecError {
  readonly code:
    'invalid-spec' | 'invalid-gas' | 'unreadable' | 'wrong-dimension' | 'not-finite' | 'slip-not-applicable'
  readonly message: string
  readonly property?: string
}
export type Parsed<T> = { ok: true; value: T } | { ok: false; error: SpecError }

const err = (code: SpecError['code'], message: string, property?: string): { ok: false; error: SpecError } => ({
  ok: false,
  error: { code, message, property },
})

export interface ReadValue {
  readonly value: number
  readonly dimension: Dimension
  readonly text: string
}

/** parseQuantity plus the slips that act on how a given is read. */
export function readValue(
  text: unknown,
  dims: readonly Dimension[],
  where: string,
  slips: Slips = {},
): Parsed<ReadValue> {
  const r = parseQuantity(text, dims)
  if (!r.ok) return err(r.error.code, `${where}: ${r.error.message}`, where)
  let value = r.value.value
  if (slips.celsiusForKelvin && r.value.dimension === 'temperature' && r.value.typedUnit === 'degC')
    value = r.value.typedNumber
  if (slips.kiloFactor === 'input-kJ-as-J' && /^kJ\b/.test(r.value.typedUnit)) value /= 1000
  return { ok: true, value: { value, dimension: r.value.dimension, text: r.value.text } }
}

function isObj(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x)
}

/** Does the spec contain any temperature typed in °C, or any given in kJ? (slip applicability) */
export function specMentions(raw: unknown, what: 'celsius' | 'kJ'): boolean {
  const re = what === 'celsius' ? /(°\s*C|degC|℃)/ : /\bkJ\b/
  const walk = (x: unknown): boolean =>
    typeof x === 'string'
      ? re.test(x)
      : Array.isArray(x)
        ? x.some(walk)
        : isObj(x)
          ? Object.values(x).some(walk)
          : false
  return walk(raw)
}

/**
 * A gas from its spec: a preset id ("air", "monatomic", "nasa:dry-air", …) or an object
 * { preset?, basis?: 'mole' | 'mass', molarMass?, R?, cp?, cv?, gamma? } with strings with units.
 * or { cpPolynomial: { a, b, c, d, unit, Tmin, Tmax }, molarMass?, R?, basis? } (see parseCpPolynomial).
 */
export function parseGas(raw: unknown, slips: Slips = {}): Parsed<Gas> {
  let gas: Gas
  if (raw === undefined) raw = 'air'
  if (typeof raw === 'string') {
    const r = gasPreset(raw)
    if (!r.ok) return err('invalid-gas', r.error.message, 'gas')
    gas = r.gas
  } else if (isObj(raw)) {
    const basisRaw = raw.basis
    let basis: Basis | undefined
    if (basisRaw !== undefined) {
      if (basisRaw === 'mole' || basisRaw === 'per-mole' || basisRaw === 'mol') basis = 'mole'
      else if (basisRaw === 'mass' || basisRaw === 'per-kg' || basisRaw === 'kg') basis = 'mass'
      else return err('invalid-gas', `gas.basis must be "mole" or "mass"`, 'gas.basis')
    }
    let M: number | undefined
    if (raw.molarMass !== undefined) {
      const r = readValue(raw.molarMass, ['molarMass'], 'gas.molarMass')
      if (!r.ok) return r
      M = r.value.value
    }
    if (raw.cpPolynomial !== undefined) {
      const r = parseCpPolynomial(raw, basis, M)
      if (!r.ok) return r
      gas = r.value
    } else if (typeof raw.preset === 'string') {
      const r = gasPreset(raw.preset, basis, M)
      if (!r.ok) return err('invalid-gas', r.error.message, 'gas.preset')
      gas = r.gas
    } else {
      const consts: Record<string, number> = {}
      let inferred: Basis | undefined
      for (const key of ['R', 'cp', 'cv'] as const) {
        if (raw[key] === undefined) continue
        const r = readValue(raw[key], ['specificHeat', 'molarHeat'], `gas.${key}`)
        if (!r.ok) return r
        const b: Basis = r.value.dimension === 'molarHeat' ? 'mole' : 'mass'
        inferred ??= b
        const target = basis ?? inferred
        let x = r.value.value
        if (b !== target) {
          if (M === undefined)
            return err(
              'invalid-gas',
              `gas.${key} is per ${b === 'mole' ? 'mole' : 'kilogram'} but the gas is per ${target === 'mole' ? 'mole' : 'kilogram'}: give gas.molarMass`,
              `gas.${key}`,
            )
          x = b === 'mole' ? x / M : x * M
        }
        consts[key] = x
      }
      basis ??= inferred ?? 'mole'
      if (raw.gamma !== undefined) {
        const r = readValue(raw.gamma, ['dimensionless'], 'gas.gamma')
        if (!r.ok) return r
        consts.gamma = r.value.value
      }
      if (consts.R === undefined && M !== undefined) consts.R = basis === 'mole' ? R_MOLAR : R_MOLAR / M
      if (consts.R === undefined && basis === 'mole' && (consts.cp === undefined) !== (consts.cv === undefined))
        consts.R = R_MOLAR
      const r = constantCpGas({
        basis,
        R: consts.R,
        cp: consts.cp,
        cv: consts.cv,
        gamma: consts.gamma,
        molarMass: M,
        label: typeof raw.label === 'string' ? raw.label : undefined,
      })
      if (!r.ok) return err('invalid-gas', `gas: ${r.error.message}`, `gas.${r.error.property ?? ''}`)
      gas = r.gas
    }
  } else {
    return err('invalid-gas', 'gas must be a preset name or an object with constants', 'gas')
  }
  return applyGasSlips(gas, slips)
}

/**
 * { cpPolynomial: { a, b?, c?, d?, unit, Tmin, Tmax }, molarMass?, R?, basis?, label? }:
 * cp = a + bT + cT² + dT³ with T in K and cp in `unit` (per mol or per kg), valid Tmin–Tmax.
 */
function parseCpPolynomial(raw: Record<string, unknown>, basis: Basis | undefined, M: number | undefined): Parsed<Gas> {
  const poly = raw.cpPolynomial
  const where = 'gas.cpPolynomial'
  if (!isObj(poly)) return err('invalid-gas', `${where} must be an object { a, b, c, d, unit, Tmin, Tmax }`, where)
  for (const key of Object.keys(poly))
    if (!['a', 'b', 'c', 'd', 'unit', 'Tmin', 'Tmax'].includes(key))
      return err(
        'invalid-gas',
        `${where}: unknown key "${key}" (it takes a, b, c, d, unit, Tmin, Tmax)`,
        `${where}.${key}`,
      )
  if (typeof poly.unit !== 'string')
    return err(
      'invalid-gas',
      `${where}.unit must name the unit of cp, e.g. "kJ/(kmol K)" or "kJ/(kg K)"`,
      `${where}.unit`,
    )
  const u = readValue(`1 ${poly.unit}`, ['specificHeat', 'molarHeat'], `${where}.unit`)
  if (!u.ok) return u
  const own: Basis = u.value.dimension === 'molarHeat' ? 'mole' : 'mass'
  const target = basis ?? own
  let scale = u.value.value
  if (own !== target) {
    if (M === undefined)
      return err(
        'invalid-gas',
        `${where} is per ${own === 'mole' ? 'mole' : 'kilogram'} but the gas is per ${target === 'mole' ? 'mole' : 'kilogram'}: give gas.molarMass`,
        'gas.molarMass',
      )
    scale = own === 'mole' ? scale / M : scale * M
  }
  const coeffs: [number, number, number, number] = [0, 0, 0, 0]
  for (const [i, key] of (['a', 'b', 'c', 'd'] as const).entries()) {
    const x = poly[key] ?? (key === 'a' ? undefined : 0)
    if (typeof x !== 'number' || !Number.isFinite(x))
      return err(
        'invalid-gas',
        `${where}.${key} must be a number (cp = a + bT + cT² + dT³, T in K, cp in ${poly.unit})${key === 'a' ? '' : '; leave it out for 0'}`,
        `${where}.${key}`,
      )
    coeffs[i] = x * scale
  }
  const range: number[] = []
  for (const key of ['Tmin', 'Tmax'] as const) {
    if (poly[key] === undefined)
      return err(
        'invalid-gas',
        `${where}.${key} is required: the polynomial's validity range, e.g. "273 K" to "1800 K"`,
        `${where}.${key}`,
      )
    const r = readValue(poly[key], ['temperature'], `${where}.${key}`)
    if (!r.ok) return r
    range.push(r.value.value)
  }
  let R: number | undefined
  if (raw.R !== undefined) {
    const r = readValue(raw.R, ['specificHeat', 'molarHeat'], 'gas.R')
    if (!r.ok) return r
    const b: Basis = r.value.dimension === 'molarHeat' ? 'mole' : 'mass'
    if (b !== target && M === undefined)
      return err(
        'invalid-gas',
        `gas.R is per ${b === 'mole' ? 'mole' : 'kilogram'} but the gas is per ${target === 'mole' ? 'mole' : 'kilogram'}: give gas.molarMass`,
        'gas.R',
      )
    R = b === target ? r.value.value : b === 'mole' ? r.value.value / M! : r.value.value * M!
  }
  const g = polynomialCpGas({
    basis: target,
    coeffs,
    Tmin: range[0]!,
    Tmax: range[1]!,
    R,
    molarMass: M,
    label: typeof raw.label === 'string' ? raw.label : undefined,
  })
  if (!g.ok) return err('invalid-gas', `gas: ${g.error.message}`, `${where}.${g.error.property ?? ''}`)
  return { ok: true, value: g.gas }
}

export function applyGasSlips(gas: Gas, slips: Slips): Parsed<Gas> {
  let g = gas
  if (slips.cpCvSwapped) g = swapCpCv(g)
  if (slips.gammaSwapped) {
    const s = swapMonatomicDiatomic(g)
    if (!s) return err('slip-not-applicable', 'the gas is neither monatomic nor diatomic', 'gas')
    g = s
  }
  if (slips.log10ForLn) g = withLog10(g)
  if (slips.perMoleVsPerKg) {
    const s = switchBasisNumbers(g)
    if (!s) return err('slip-not-applicable', 'the molar mass of the gas is unknown', 'gas')
    g = s
  }
  return { ok: true, value: g }
}

/** Amount "2 mol" / "1.5 kg" on the gas's basis. */
export function readAmount(raw: unknown, gas: Gas, where: string, slips: Slips): Parsed<number> {
  const r = readValue(raw, ['amount', 'mass'], where, slips)
  if (!r.ok) return r
  const b: Basis = r.value.dimension === 'amount' ? 'mole' : 'mass'
  if (b === gas.basis) return { ok: true, value: r.value.value }
  const M = gas.molarMass
  if (M === undefined)
    return err(
      'invalid-spec',
      `${where}: the gas is counted per ${gas.basis === 'mole' ? 'mole' : 'kilogram'} and has no molar mass to convert ${r.value.text}`,
      where,
    )
  return { ok: true, value: b === 'mole' ? r.value.value * M : r.value.value / M }
}

/** Specific volume "0.8 m^3/kg" or "0.024 m^3/mol" on the gas's basis. */
export function readSpecificVolume(raw: unknown, gas: Gas, where: string, slips: Slips): Parsed<number> {
  const r = readValue(raw, ['specificVolume', 'molarVolume'], where, slips)
  if (!r.ok) return r
  const b: Basis = r.value.dimension === 'molarVolume' ? 'mole' : 'mass'
  if (b === gas.basis) return { ok: true, value: r.value.value }
  const M = gas.molarMass
  if (M === undefined)
    return err('invalid-spec', `${where}: cannot convert ${r.value.text} without a molar mass`, where)
  return { ok: true, value: b === 'mole' ? r.value.value / M : r.value.value * M }
}

/** Heat: "1800 kJ/kg" (per unit amount) or "500 J" (total). */
export function readHeat(
  raw: unknown,
  gas: Gas,
  where: string,
  slips: Slips,
): Parsed<{ heat?: number; heatTotal?: number }> {
  const r = readValue(raw, ['energy', 'specificEnergy', 'molarEnergy'], where, slips)
  if (!r.ok) return r
  if (r.value.dimension === 'energy') return { ok: true, value: { heatTotal: r.value.value } }
  const b: Basis = r.value.dimension === 'molarEnergy' ? 'mole' : 'mass'
  if (b === gas.basis) return { ok: true, value: { heat: r.value.value } }
  const M = gas.molarMass
  if (M === undefined)
    return err('invalid-spec', `${where}: cannot convert ${r.value.text} without a molar mass`, where)
  return { ok: true, value: { heat: b === 'mole' ? r.value.value / M : r.value.value * M } }
}

/** Flow rate "2.5 kg/s" or "40 mol/s" on the gas's basis (per second). */
export function readFlowRate(raw: unknown, gas: Gas, where: string, slips: Slips): Parsed<number> {
  const r = readValue(raw, ['massFlow', 'molarFlow'], where, slips)
  if (!r.ok) return r
  const b: Basis = r.value.dimension === 'molarFlow' ? 'mole' : 'mass'
  if (b === gas.basis) return { ok: true, value: r.value.value }
  const M = gas.molarMass
  if (M === undefined)
    return err('invalid-spec', `${where}: cannot convert ${r.value.text} without a molar mass`, where)
  return { ok: true, value: b === 'mole' ? r.value.value * M : r.value.value / M }
}

function readNumber(raw: unknown, where: string): Parsed<number> {
  const r = readValue(raw, ['dimensionless'], where)
  if (!r.ok) return r
  return { ok: true, value: r.value.value }
}

/** Step fields copied from the JSON unchecked, for the solver to read. */
const PASSED_ON = ['device', 'path', 'expectHeat', 'label', 'side'] as const
type PassedOn = (typeof PASSED_ON)[number]

/** A step as read: process and numbers checked and in SI, the PASSED_ON fields as written. */
type StepDraft = { -readonly [K in Exclude<keyof StepSpec, PassedOn>]?: StepSpec[K] } & {
  process: ProcessKind
} & { [K in PassedOn]?: unknown }

/**
 * A general cycle from JSON. States and steps are numbered from 1 in the JSON; step k joins
 * state k to k+1 and the last step joins back to state 1. Regenerator partners are step numbers.
 */
export function parseCycleSpec(raw: unknown, slips: Slips = {}): Parsed<CycleSpec> {
  if (!isObj(raw)) return err('invalid-spec', 'the cycle must be an object with gas, states and steps', 'cycle')
  const g = parseGas(raw.gas, slips)
  if (!g.ok) return g
  const gas = g.value
  const system = raw.system ?? 'closed'
  if (system !== 'closed' && system !== 'flow')
    return err('invalid-spec', 'system must be "closed" or "flow"', 'system')
  let amount: number | undefined
  if (raw.amount !== undefined) {
    const r = readAmount(raw.amount, gas, 'amount', slips)
    if (!r.ok) return r
    amount = r.value
  }
  if (!Array.isArray(raw.states) || raw.states.length < 2)
    return err('invalid-spec', 'states must be a list of at least two states', 'states')
  if (!Array.isArray(raw.steps))
    return err(
      'invalid-spec',
      'steps must be a list (step k joins state k to state k+1; the last joins back to state 1)',
      'steps',
    )
  const labels: Record<string, string> = {}
  const states: StateSpec[] = []
  for (let i = 0; i < raw.states.length; i++) {
    const s: unknown = raw.states[i]
    const where = `states[${i + 1}]`
    if (!isObj(s)) return err('invalid-spec', `${where} must be an object`, where)
    const out: { name?: string; p?: number; T?: number; v?: number; V?: number } = {}
    if (s.name !== undefined) out.name = String(s.name)
    if (s.p !== undefined) {
      const r = readValue(s.p, ['pressure'], `${where}.p`, slips)
      if (!r.ok) return r
      out.p = r.value.value
      labels[`p${i + 1}`] = String(s.p)
    }
    if (s.T !== undefined) {
      const r = readValue(s.T, ['temperature'], `${where}.T`, slips)
      if (!r.ok) return r
      out.T = r.value.value
      labels[`T${i + 1}`] = String(s.T)
    }
    if (s.v !== undefined) {
      const r = readSpecificVolume(s.v, gas, `${where}.v`, slips)
      if (!r.ok) return r
      out.v = r.value
      labels[`v${i + 1}`] = String(s.v)
    }
    if (s.V !== undefined) {
      const r = readValue(s.V, ['volume'], `${where}.V`, slips)
      if (!r.ok) return r
      out.V = r.value.value
      labels[`V${i + 1}`] = String(s.V)
    }
    states.push(out)
  }
  const steps: StepSpec[] = []
  for (let k = 0; k < raw.steps.length; k++) {
    const s: unknown = raw.steps[k]
    const where = `steps[${k + 1}]`
    if (!isObj(s)) return err('invalid-spec', `${where} must be an object`, where)
    if (!isOneOf(PROCESS_KINDS, s.process)) {
      return err('invalid-spec', `${where}.process must be one of ${PROCESS_KINDS.join(', ')}`, `${where}.process`)
    }
    const out: StepDraft = { process: s.process }
    for (const key of [
      'n',
      'efficiency',
      'effectiveness',
      'pressureRatio',
      'volumeRatio',
      'temperatureRatio',
    ] as const) {
      if (s[key] === undefined) continue
      const r = readNumber(s[key], `${where}.${key}`)
      if (!r.ok) return r
      out[key] = r.value
    }
    if (s.compressionRatio !== undefined) {
      const r = readNumber(s.compressionRatio, `${where}.compressionRatio`)
      if (!r.ok) return r
      if (!(r.value > 0))
        return err('invalid-spec', `${where}.compressionRatio must be positive`, `${where}.compressionRatio`)
      out.volumeRatio = 1 / r.value
    }
    if (s.partner !== undefined) {
      if (typeof s.partner !== 'number' || !Number.isInteger(s.partner))
        return err('invalid-spec', `${where}.partner must be a step number`, `${where}.partner`)
      out.partner = s.partner - 1
    }
    for (const key of PASSED_ON) if (s[key] !== undefined) out[key] = s[key]
    if (s.boundaryTemperature !== undefined) {
      const r = readValue(s.boundaryTemperature, ['temperature'], `${where}.boundaryTemperature`, slips)
      if (!r.ok) return r
      out.boundaryTemperature = r.value.value
    }
    if (s.heat !== undefined) {
      const r = readHeat(s.heat, gas, `${where}.heat`, slips)
      if (!r.ok) return r
      Object.assign(out, r.value)
    }
    // The one assertion left: the PASSED_ON fields go to the solver as the author wrote them (it
    // checks side; device, path, expectHeat and label it reads as they are). Checking them here
    // would change which message a bad spec gets, so their type is taken on trust.
    // eslint-disable-next-line @typescript-eslint/consistent-type-assertions -- see the comment above
    steps.push(out as StepSpec)
  }
  let reservoirs: { hot?: number; cold?: number } | undefined
  if (isObj(raw.reservoirs)) {
    reservoirs = {}
    for (const key of ['hot', 'cold'] as const) {
      if (raw.reservoirs[key] === undefined) continue
      const r = readValue(raw.reservoirs[key], ['temperature'], `reservoirs.${key}`, slips)
      if (!r.ok) return r
      reservoirs[key] = r.value.value
    }
  }
  let deadState: { T: number; p: number } | undefined
  if (raw.deadState !== undefined) {
    const d = raw.deadState
    if (!isObj(d) || d.T === undefined || d.p === undefined)
      return err(
        'invalid-spec',
        'deadState must be an object { T, p }, e.g. { "T": "298.15 K", "p": "100 kPa" }',
        'deadState',
      )
    const T0 = readValue(d.T, ['temperature'], 'deadState.T', slips)
    if (!T0.ok) return T0
    const p0 = readValue(d.p, ['pressure'], 'deadState.p', slips)
    if (!p0.ok) return p0
    deadState = { T: T0.value.value, p: p0.value.value }
  }
  let flowRate: number | undefined
  if (raw.flowRate !== undefined) {
    const r = readFlowRate(raw.flowRate, gas, 'flowRate', slips)
    if (!r.ok) return r
    flowRate = r.value
  }
  const purpose = raw.purpose
  if (purpose !== undefined && purpose !== 'engine' && purpose !== 'refrigerator' && purpose !== 'heat-pump')
    return err('invalid-spec', 'purpose must be engine, refrigerator or heat-pump', 'purpose')
  return {
    ok: true,
    value: { gas, system, amount, states, steps, purpose, reservoirs, labels, deadState, flowRate },
  }
}
