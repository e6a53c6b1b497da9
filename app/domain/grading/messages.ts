// Every text a student sees from the checker, in one place. Short, kind, specific, our own
// wording. Messages never contain library names, error text from mathjs or stack details;
// they quote back only a short plain name the student typed (a mistyped unit) or a single
// printable ASCII character.

import { isMathjsName } from './math-instance.ts'
import { ALLOWED_FUNCTIONS } from './restricted-math.ts'

/** Why an answer could not be used. `verdict` says which verdict each code gives. */
export type AnswerErrorCode =
  | 'not-text'
  | 'empty'
  | 'too-long'
  | 'decimal-comma'
  | 'bad-character'
  | 'equals-sign'
  | 'syntax'
  | 'assignment'
  | 'multiple-expressions'
  | 'function-not-allowed'
  | 'wrong-argument-count'
  | 'unknown-symbol'
  | 'unknown-unit'
  | 'unsupported-syntax'
  | 'not-a-number'
  | 'out-of-range'
  | 'not-real'
  | 'incompatible-units'
  | 'bad-exponent'
  | 'no-number'
  | 'percent-with-unit'
  | 'needs-plain-number'
  | 'missing-unit'
  | 'wrong-dimension'
  | 'invalid-expected-unit'
  | 'invalid-rule'
  | 'invalid-variable'
  | 'internal'

export interface MessageContext {
  /** The expected unit as shown, e.g. "kJ", "°C", "" for a pure number, "%" for percent. */
  readonly expectedDisplay: string
  /** A name to quote back (unknown-unit), if safe. */
  readonly symbol?: string
  /** A suggestion for a mistyped unit ("kJ"). */
  readonly suggestion?: string | null
  /** A character to quote back (bad-character), if printable ASCII. */
  readonly char?: string
  readonly maxLength?: number
}

/** "12.5 kJ" with the expected unit, or "0.42" for a pure number. */
export function exampleAnswer(expectedDisplay: string): string {
  if (expectedDisplay === '') return '0.42'
  if (expectedDisplay === '%') return '42 %'
  return `12.5 ${expectedDisplay}`
}

const SAFE_SYMBOL = /^[A-Za-z][A-Za-z0-9_]{0,15}$/

/** Whether a name the student typed may be quoted back in a message. */
export function isQuotableSymbol(name: string | undefined): name is string {
  return typeof name === 'string' && SAFE_SYMBOL.test(name) && !isMathjsName(name)
}

export function unreadableMessage(code: AnswerErrorCode, ctx: MessageContext): string {
  const example = exampleAnswer(ctx.expectedDisplay)
  const typeLike = `Type a number${ctx.expectedDisplay === '' ? '' : ' and a unit'}, like ${example}.`
  switch (code) {
    case 'not-text':
    case 'empty':
      return `Please type an answer, for example ${example}.`
    case 'too-long':
      return `This answer is too long (more than ${ctx.maxLength ?? 200} characters). Type just the number${ctx.expectedDisplay === '' ? '' : ' and its unit'}.`
    case 'decimal-comma':
      return 'Please use a point for decimals (12.5, not 12,5) and no commas between thousands (12500, not 12,500).'
    case 'bad-character':
      return ctx.char
        ? `We could not read the character “${ctx.char}”. ${typeLike}`
        : `This answer contains a character we cannot read. ${typeLike}`
    case 'equals-sign':
    case 'assignment':
      return `Type only the value, without “=”: for example ${example}.`
    case 'multiple-expressions':
      return `Please type one value only, on a single line. ${typeLike}`
    case 'function-not-allowed':
      return `Only these functions can be used in an answer: ${ALLOWED_FUNCTIONS.join(', ')} (ln and log are both the natural logarithm).`
    case 'wrong-argument-count':
      return 'Each function takes one value in brackets, like sqrt(2).'
    case 'unknown-unit':
    case 'unknown-symbol':
      if (isQuotableSymbol(ctx.symbol)) {
        const hint = ctx.suggestion ? ` Did you mean ${ctx.suggestion}? Units are case-sensitive.` : ''
        return `We don't recognise “${ctx.symbol}” as a unit.${hint}`
      }
      return `This answer contains a word we cannot use here. ${typeLike}`
    case 'syntax':
    case 'unsupported-syntax':
    case 'not-a-number':
      return `We could not read this answer. ${typeLike}`
    case 'out-of-range':
      return 'This number is too large or too small to work with (or it divides by zero). Please check it.'
    case 'not-real':
      return 'This calculation has no real value (for example the square root or logarithm of a negative number).'
    case 'incompatible-units':
      return 'Parts of this answer have units that do not fit together (for example kJ + kg).'
    case 'bad-exponent':
      return 'A power must be a plain number, like m^3.'
    case 'no-number':
      return `We found a unit but no number. ${typeLike}`
    case 'percent-with-unit':
      return 'A percentage cannot have a unit as well. Write, for example, 42 %.'
    case 'needs-plain-number':
      return `This question checks significant figures, so please type a single number, not a calculation: for example ${example}.`
    case 'invalid-expected-unit':
    case 'invalid-rule':
    case 'invalid-variable':
      return 'This question could not be checked automatically. Your answer was kept; please let your instructor know.'
    case 'missing-unit':
    case 'wrong-dimension':
    case 'internal':
    default:
      return `We could not read this answer. Please check it and try again. ${typeLike}`
  }
}

export interface DimensionWords {
  /** What we read, "a pressure", or null when we have no name for it. */
  readonly readLabel: string | null
  /** The unit we read, as shown ("kg", "kPa"). */
  readonly readDisplay: string
  /** What is needed: "an energy"; null when we have no name for it. */
  readonly expectedLabel: string | null
  readonly expectedDisplay: string
  /** An extra hint (C is coulomb, …), or null. */
  readonly hint: string | null
}

export function wrongDimensionMessage(w: DimensionWords): string {
  const needs =
    w.expectedLabel === null
      ? `a value in ${w.expectedDisplay}`
      : w.expectedDisplay === ''
        ? w.expectedLabel
        : `${w.expectedLabel} (${w.expectedDisplay})`
  const read = w.readLabel ?? (w.readDisplay === '' ? 'a quantity' : `a quantity in ${w.readDisplay}`)
  const base = `We read this as ${read}, but this answer needs ${needs}.`
  return w.hint ? `${base} ${w.hint}` : base
}

export function missingUnitMessage(expectedLabel: string, expectedDisplay: string): string {
  return `Please add a unit: this answer needs ${expectedLabel}, for example in ${expectedDisplay}.`
}

/** Hints for unit letters that mean something else than the student likely meant. */
export function dimensionHint(readUnitText: string, expectedIsTemperature: boolean): string | null {
  if (!expectedIsTemperature) return null
  const t = readUnitText.trim()
  if (t === 'C') return 'Note that C means coulomb (electric charge); for degrees Celsius write °C or degC.'
  if (t === 'F') return 'Note that F means farad; for degrees Fahrenheit write °F or degF.'
  if (t === 'deg') return 'A ° on its own is an angle; for a temperature write °C, °F or K.'
  return null
}

export const CORRECT_MESSAGE = 'Correct.'
export const OUTSIDE_RANGE_MESSAGE = 'Check the number: it is outside the accepted range.'

/** Which temperature label a number carries that belongs to the other scale. */
export type TemperatureLabelSlip = 'celsius-labelled-kelvin' | 'kelvin-labelled-celsius'

/** Plain numbers for messages: 573.15, not 573.1499999999999. */
function plainNumber(x: number): string {
  return String(Number(x.toPrecision(12)))
}

/**
 * A wrong answer whose number is the right temperature on the other scale ("300 K" for a key
 * of 573.15 K). `typed` is the student's number; the message converts it as it was meant.
 */
export function temperatureLabelMessage(slip: TemperatureLabelSlip, typed: number): string {
  return slip === 'celsius-labelled-kelvin'
    ? `This looks like the temperature in °C with a K label: ${plainNumber(typed)} °C is ${plainNumber(typed + 273.15)} K.`
    : `This looks like the temperature in K with a °C label: ${plainNumber(typed)} K is ${plainNumber(typed - 273.15)} °C.`
}

export function sigFigMessage(
  problem: 'too-few' | 'too-many',
  counted: { min: number; max: number },
  rule: { min?: number; max?: number },
): string {
  const ask =
    rule.min !== undefined && rule.max !== undefined
      ? rule.min === rule.max
        ? `exactly ${rule.min}`
        : `${rule.min} to ${rule.max}`
      : rule.min !== undefined
        ? `at least ${rule.min}`
        : `at most ${rule.max ?? ''}`
  const had =
    counted.min === counted.max
      ? `${counted.min} significant figure${counted.min === 1 ? '' : 's'}`
      : problem === 'too-few'
        ? `at most ${counted.max} significant figures`
        : `at least ${counted.min} significant figures`
  return `The value is within the accepted range, but it has ${had}; this question asks for ${ask}. Round it (or add zeros) and try again.`
}
