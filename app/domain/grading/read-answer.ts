// Reading one student answer into a number in the expected unit.
//
// Accepted forms (after typography normalisation, see typography.ts):
//   quantity    "12.5 kJ", "12500 J", "1.25e4 J", "1.25×10^4 J", "1.2E4 J", "12.5kJ",
//               "−5 °C", "0.5 kJ/kg·K", "3 m³", "42 %"
//   bare        "12.5" — a number without any unit; read in the expected unit when the
//               find allows it (allowBareNumber), or always for a pure-number find
//   expression  "2*6.25 kJ", "sqrt(2) kPa", "(300 - 273.15) K": numbers, units, + − × ÷ ^,
//               brackets and the function allow-list; no significant figures can be counted
// Digit groups of three separated by spaces (also thin spaces) are joined: "12 500 J".
// Decimal commas are REFUSED with a clear message ("12,5" and "12,500" alike): a comma is
// a decimal mark in some countries and a thousands separator in others, and guessing wrong
// would be a factor of 1000. Students are told to write 12.5 and 12500.
// Percent: a trailing % divides by 100 ("42 %" = 0.42). For an expected unit '' a bare
// 0.42 and 42 % are the same answer; for an expected unit '%' a bare number is in percent
// (42 = 42 %), and 0.42 means 0.42 %.
// Temperatures: absolute by default (27 °C = 300.15 K); as a difference (option
// temperatureDifference, or dimension 'temperature-difference') °C and °F have no offset
// (10 °C = 10 K, 18 °F = 10 K).
//
// readAnswer never throws; failures come back with verdict 'unreadable' or 'wrong-dimension'.

import type { Unit } from 'mathjs'
import { isOneOf } from '#app/domain/thermo/json.ts'
import { isValueless, mathCore } from './math-instance.ts'
import {
  ALLOWED_CONSTANTS,
  ALLOWED_FUNCTIONS,
  MAX_EXPRESSION_LENGTH,
  MAX_EXPRESSION_LENGTH_CAP,
  RestrictedError,
  evaluateTree,
  isUnit,
  isUnitNameFor,
  parseRestrictedText,
  toRestrictedError,
} from './restricted-math.ts'
import type { Value } from './restricted-math.ts'
import { normalizeTypography } from './typography.ts'
import {
  DIMENSIONS,
  describeDimension,
  formatUnitForDisplay,
  isDimensionName,
  referenceUnitOf,
  resolveExpectedUnit,
  sameDimension,
  suggestUnit,
} from './units.ts'
import type { DimensionName, ExpectedUnit } from './units.ts'
import { dimensionHint, missingUnitMessage, unreadableMessage, wrongDimensionMessage } from './messages.ts'
import type { AnswerErrorCode } from './messages.ts'

export interface ReadAnswerOptions {
  /** The unit the value is wanted in: "kJ", "kJ/(kg·K)", "°C", "%", or "" for a pure number. */
  readonly expectedUnit: string
  /** Read a number typed without a unit in the expected unit (default false; always true
   *  for a pure-number find). */
  readonly allowBareNumber?: boolean
  /** Read °C/°F as temperature differences. Implied by dimension 'temperature-difference'. */
  readonly temperatureDifference?: boolean
  /** The dimension the find needs; must agree with expectedUnit. Used for wording, too. */
  readonly dimension?: DimensionName
  /** Longest accepted answer (default 200, at most 2000). */
  readonly maxLength?: number
}

export type AnswerForm = 'quantity' | 'bare' | 'percent' | 'expression'

export interface ReadAnswerSuccess {
  readonly ok: true
  /** The answer in `unit` (the expected unit). */
  readonly value: number
  /** The expected unit, as given in the options. */
  readonly unit: string
  /** Exactly what the student typed. */
  readonly raw: string
  /** The text after typography normalisation (what the parser read). */
  readonly normalized: string
  readonly form: AnswerForm
  /** The typed number ("1.20e4", "-0.0042") for quantity/bare/percent forms; null for expressions. */
  readonly literal: string | null
  /** The unit part as typed (normalised, e.g. "kJ/(kg*K)"); null for bare numbers and percent. */
  readonly studentUnit: string | null
  /** How we understood it, for feedback: "12.5 kJ", "42 %". */
  readonly readAs: string
}

export interface ReadAnswerFailure {
  readonly ok: false
  readonly verdict: 'unreadable' | 'wrong-dimension'
  readonly message: string
  readonly error: { readonly code: AnswerErrorCode; readonly message: string }
  readonly raw: string
}

export type ReadAnswerResult = ReadAnswerSuccess | ReadAnswerFailure

const ALLOWED_CHARS = /^[A-Za-z0-9_ \t.+\-*/^()%]*$/
const HEX_LIKE = /(?<![A-Za-z0-9_.])0[xXbBoO][0-9A-Za-z]/
const PLAIN = /^([+-]?)\s*(\d+\.?\d*|\.\d+)((?:[eE][+-]?\d+)?)(?![\d.])\s*(.*)$/s
const DIGIT_GROUPS = /(?<![\d.eE])\d{1,3}(?: \d{3})+(?!\d)/g
const NO_VARIABLES: ReadonlySet<string> = new Set()

class AnswerError extends Error {
  readonly code: AnswerErrorCode
  readonly verdict: 'unreadable' | 'wrong-dimension'
  readonly detailMessage: string | undefined
  constructor(code: AnswerErrorCode, verdict: 'unreadable' | 'wrong-dimension' = 'unreadable', message?: string) {
    super(code)
    this.code = code
    this.verdict = verdict
    this.detailMessage = message
  }
}

interface Ctx {
  readonly raw: string
  readonly expected: ExpectedUnit
  readonly expectedDisplay: string
  readonly expectedLabel: string | null
  readonly expectedIsTemperature: boolean
  readonly temperatureDifference: boolean
  readonly allowBare: boolean
  readonly maxLength: number
}

/** Reads a student's answer; see the header for the accepted forms. Never throws. */
export function readAnswer(text: unknown, options: ReadAnswerOptions): ReadAnswerResult {
  const raw = typeof text === 'string' ? text : ''
  let ctx: Ctx | null = null
  try {
    const prepared = prepareContext(raw, options)
    if ('fail' in prepared) return prepared.fail
    ctx = prepared.ctx
    if (typeof text !== 'string') throw new AnswerError('not-text')
    return readWith(ctx)
  } catch (e) {
    const display = ctx?.expectedDisplay ?? ''
    if (e instanceof AnswerError) {
      return failure(
        raw,
        e.code,
        e.verdict,
        e.detailMessage ?? unreadableMessage(e.code, { expectedDisplay: display, maxLength: ctx?.maxLength }),
      )
    }
    const r = toRestrictedError(e)
    return restrictedFailure(raw, r, display, ctx?.maxLength)
  }
}

function failure(
  raw: string,
  code: AnswerErrorCode,
  verdict: 'unreadable' | 'wrong-dimension',
  message: string,
): ReadAnswerFailure {
  return { ok: false, verdict, message, error: { code, message }, raw }
}

function restrictedFailure(
  raw: string,
  r: RestrictedError,
  expectedDisplay: string,
  maxLength?: number,
): ReadAnswerFailure {
  const code: AnswerErrorCode =
    r.code === 'unknown-symbol' ? 'unknown-unit' : r.code === 'wrong-dimension' ? 'internal' : r.code
  const message = unreadableMessage(code, {
    expectedDisplay,
    symbol: r.symbol,
    suggestion: r.symbol ? suggestUnit(r.symbol) : null,
    maxLength,
  })
  return failure(raw, code, 'unreadable', message)
}

function prepareContext(raw: string, options: ReadAnswerOptions): { ctx: Ctx } | { fail: ReadAnswerFailure } {
  const opts: Partial<ReadAnswerOptions> = options ?? {}
  const invalid = (): { fail: ReadAnswerFailure } => ({
    fail: failure(
      raw,
      'invalid-expected-unit',
      'unreadable',
      unreadableMessage('invalid-expected-unit', { expectedDisplay: '' }),
    ),
  })
  if (opts.dimension !== undefined && !isDimensionName(opts.dimension)) return invalid()
  const temperatureDifference = opts.temperatureDifference === true || opts.dimension === 'temperature-difference'
  const expected = resolveExpectedUnit(
    typeof opts.expectedUnit === 'string' ? opts.expectedUnit : '\u0000',
    temperatureDifference,
  )
  if (expected === null) return invalid()
  if (opts.dimension !== undefined) {
    const ref = referenceUnitOf(opts.dimension)
    const ok = expected.kind === 'dimensionless' ? ref === 1 : ref !== 1 && expected.unit.equalBase(ref)
    if (!ok) return invalid()
  }
  const kelvin = referenceUnitOf('temperature')
  const expectedIsTemperature = expected.kind === 'unit' && kelvin !== 1 && expected.unit.equalBase(kelvin)
  const expectedLabel =
    opts.dimension !== undefined
      ? DIMENSIONS[opts.dimension].label
      : expected.kind === 'dimensionless'
        ? DIMENSIONS.dimensionless.label
        : temperatureDifference && expectedIsTemperature
          ? DIMENSIONS['temperature-difference'].label
          : describeDimension(expected.unit)
  const maxLength =
    typeof opts.maxLength === 'number' && Number.isFinite(opts.maxLength) && opts.maxLength > 0
      ? Math.min(Math.floor(opts.maxLength), MAX_EXPRESSION_LENGTH_CAP)
      : MAX_EXPRESSION_LENGTH
  return {
    ctx: {
      raw,
      expected,
      expectedDisplay: expected.display,
      expectedLabel,
      expectedIsTemperature,
      temperatureDifference,
      allowBare: opts.allowBareNumber === true || expected.kind === 'dimensionless',
      maxLength,
    },
  }
}

function readWith(ctx: Ctx): ReadAnswerResult {
  const { raw } = ctx
  if (raw.length > ctx.maxLength) throw new AnswerError('too-long')
  if (raw.trim() === '') throw new AnswerError('empty')
  const isUnitName = (name: string): boolean => isUnitNameFor(name, NO_VARIABLES, true)
  let s = normalizeTypography(raw, { isUnitName })
  if (s === '') throw new AnswerError('empty')
  if (/[\r\n\v\f;]/.test(s)) throw new AnswerError('multiple-expressions')
  if (/\d,\d/.test(s)) throw new AnswerError('decimal-comma')
  if (s.includes('=')) throw new AnswerError('equals-sign')
  if (!ALLOWED_CHARS.test(s)) {
    const bad = Array.from(s).find((c) => !ALLOWED_CHARS.test(c)) ?? ''
    const quotable = /^[!#$&'*,:<>?@[\]\\{|}~`]$/.test(bad) ? bad : undefined
    throw new AnswerError(
      'bad-character',
      'unreadable',
      unreadableMessage('bad-character', { expectedDisplay: ctx.expectedDisplay, char: quotable }),
    )
  }
  if (HEX_LIKE.test(s)) throw new AnswerError('syntax')
  // SI digit grouping (SI Brochure 9th ed., 5.4.4): "12 500 J" is 12500 J. Only groups of
  // exactly three digits after the first group, and never after a decimal point.
  s = s.replace(DIGIT_GROUPS, (g) => g.replace(/ /g, ''))

  let percent = false
  if (s.endsWith('%')) {
    percent = true
    s = s.slice(0, -1).trim()
    if (s === '') throw new AnswerError('no-number')
  }
  if (s.includes('%')) throw new AnswerError('unsupported-syntax')

  const read = readPlain(s, ctx) ?? readExpression(s, ctx)
  if (percent && read.usesUnits) throw new AnswerError('percent-with-unit')
  return finish(read, percent, s, ctx)
}

interface Read {
  readonly value: Value
  readonly usesUnits: boolean
  readonly literal: string | null
  readonly unitText: string | null
}

/** "number [unit]": a single literal and an optional unit-only tail. Null when it is not that shape. */
function readPlain(s: string, ctx: Ctx): Read | null {
  const m = PLAIN.exec(s)
  if (!m) return null
  const sign = m[1] ?? ''
  const mantissa = m[2] ?? ''
  const exponent = m[3] ?? ''
  const literal = `${sign}${mantissa}${exponent}`
  const tail = (m[4] ?? '').replace(/^\*\s*/, '').trim()
  let value = Number(literal)
  if (!Number.isFinite(value) || Math.abs(value) > 1e300) throw new AnswerError('out-of-range')
  if (value === 0 && /[1-9]/.test(mantissa)) throw new AnswerError('out-of-range') // underflow, 1e-999
  if (Object.is(value, -0)) value = 0
  if (tail === '') return { value, usesUnits: false, literal, unitText: null }
  let unit: Value
  try {
    const parsed = parseRestrictedText(tail, {
      variables: NO_VARIABLES,
      allowConstants: false,
      unitsOnly: true,
      maxLength: Number.MAX_SAFE_INTEGER,
      alreadyNormalized: true,
    })
    unit = evaluateTree(parsed.tree, {
      scope: new Map(),
      allowConstants: false,
      temperatureDifference: ctx.temperatureDifference,
    })
  } catch (e) {
    if (e instanceof RestrictedError && e.code === 'unknown-symbol' && e.symbol !== undefined) {
      const isConstantOrFunction = Object.hasOwn(ALLOWED_CONSTANTS, e.symbol) || isOneOf(ALLOWED_FUNCTIONS, e.symbol)
      if (!isConstantOrFunction) throw e
    }
    return null // not "number unit": try the general reader
  }
  if (!isUnit(unit) || !isValueless(unit)) return null
  const q = mathCore.multiply(value, unit)
  return { value: q, usesUnits: true, literal, unitText: tail }
}

function readExpression(s: string, ctx: Ctx): Read {
  const parsed = parseRestrictedText(s, {
    variables: NO_VARIABLES,
    allowConstants: true,
    unitsOnly: false,
    maxLength: Number.MAX_SAFE_INTEGER,
    alreadyNormalized: true,
  })
  const value = evaluateTree(parsed.tree, {
    scope: new Map(),
    allowConstants: true,
    temperatureDifference: ctx.temperatureDifference,
  })
  return { value, usesUnits: parsed.facts.usesUnits, literal: null, unitText: null }
}

function finish(read: Read, percent: boolean, s: string, ctx: Ctx): ReadAnswerSuccess {
  const { expected } = ctx
  const v = read.value
  const form: AnswerForm = percent
    ? 'percent'
    : read.literal === null
      ? 'expression'
      : read.usesUnits
        ? 'quantity'
        : 'bare'
  const isBare = !percent && !read.usesUnits

  let value: number
  if (typeof v === 'number') {
    if (expected.kind === 'dimensionless') {
      value = isBare ? v : (percent ? v / 100 : v) / expected.scale
    } else if (isBare) {
      if (!ctx.allowBare) {
        const label = ctx.expectedLabel ?? `a value in ${ctx.expectedDisplay}`
        throw new AnswerError('missing-unit', 'wrong-dimension', missingUnitMessage(label, ctx.expectedDisplay))
      }
      value = v
    } else {
      throw wrongDimension(v, '', ctx)
    }
  } else {
    if (isValueless(v)) throw new AnswerError('no-number')
    if (expected.kind === 'dimensionless' || !sameDimension(v, expected.unit)) {
      throw wrongDimension(v, read.unitText ?? v.formatUnits(), ctx)
    }
    value = mathCore.numberIn(v, expected.unit)
  }
  if (!Number.isFinite(value) || Math.abs(value) > 1e300) throw new AnswerError('out-of-range')
  if (Object.is(value, -0)) value = 0

  const studentUnit = read.usesUnits ? (read.unitText ?? (isUnit(v) ? v.formatUnits() : null)) : null
  return {
    ok: true,
    value,
    unit: expected.text,
    raw: ctx.raw,
    normalized: percent ? `${s} %` : s,
    form,
    literal: read.literal,
    studentUnit: form === 'expression' ? null : studentUnit,
    readAs: describeReading(read, percent, value, ctx),
  }
}

function wrongDimension(v: Unit | number, unitText: string, ctx: Ctx): AnswerError {
  const message = wrongDimensionMessage({
    readLabel: describeDimension(v),
    readDisplay: formatUnitForDisplay(unitText),
    expectedLabel: ctx.expectedLabel,
    expectedDisplay: ctx.expectedDisplay,
    hint: dimensionHint(unitText, ctx.expectedIsTemperature),
  })
  return new AnswerError('wrong-dimension', 'wrong-dimension', message)
}

function formatNumber(x: number): string {
  return String(Number(x.toPrecision(12)))
}

function describeReading(read: Read, percent: boolean, value: number, ctx: Ctx): string {
  const withUnit = (n: string, unit: string): string => (unit === '' ? n : unit === '%' ? `${n} %` : `${n} ${unit}`)
  if (read.literal !== null) {
    if (percent) return `${read.literal} %`
    if (read.unitText !== null) return `${read.literal} ${formatUnitForDisplay(read.unitText)}`
    return withUnit(read.literal, ctx.expectedDisplay)
  }
  return withUnit(formatNumber(value), ctx.expectedDisplay)
}
