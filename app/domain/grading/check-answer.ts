// Checking one answer against the key: read it (read-answer.ts), compare within the
// tolerance, then apply the optional significant-figures rule.
//
// Tolerance (both kinds inclusive, compared in the expected unit):
//   relative  correct iff |a − e| ≤ t·|e|
//   absolute  correct iff |a − e| ≤ t, t given in tolerance.unit (default: the expected
//             unit). A tolerance is a difference: "2 °C" as a tolerance is 2 K.
//   Round-off allowance: the bound is widened by 1e-9 of itself plus 1e-12 of the larger of
//   |a| and |e|, so answers exactly on the edge (0.4 vs 0.3 ± 0.1, 12.5 kJ vs 12500 J)
//   are not lost to binary floating point. It is far below any sensible tolerance.
//   Expected value 0 with a relative tolerance: the bound is 0, so only an exact zero is
//   correct (validateCheckRule reports the note 'relative-tolerance-zero-expected'; use an
//   absolute tolerance for such finds).
//   Absolute temperatures in °C or °F with a RELATIVE tolerance are compared on the
//   absolute scale (K, °R): 1 % of 27 °C is 3.0 K, not 0.27 K (a relative tolerance on the
//   Celsius number is meaningless near 0 °C). Note 'relative-tolerance-on-absolute-scale'.
// Significant figures (sig-figs.ts): checked only when the value is within tolerance. A
// correct value with the wrong number of figures gets verdict 'incorrect', a message about
// precision, and detail.code 'sig-figs' with detail.withinTolerance true, so a grader may
// give partial credit. When a find has a sig-fig rule, a calculation ("2*6.25 kJ") instead of
// a typed number is 'unreadable' (code 'needs-plain-number'): there are no figures to count.
// Bare numbers: allowed only with rule.allowBareNumber (or for a pure-number find); else a
// bare number gets 'wrong-dimension' with code 'missing-unit' and a message to add a unit.
//
// checkAnswer never throws: any failure, including a broken rule, gives a result.

import { mathCore, prefixName } from './math-instance.ts'
import {
  CORRECT_MESSAGE,
  OUTSIDE_RANGE_MESSAGE,
  sigFigMessage,
  temperatureLabelMessage,
  unreadableMessage,
} from './messages.ts'
import type { AnswerErrorCode, TemperatureLabelSlip } from './messages.ts'
import { readAnswer } from './read-answer.ts'
import type { AnswerForm } from './read-answer.ts'
import { isObjectLike, propertyOf } from './plain-data.ts'
import { checkSignificantFigures, countSignificantFigures, isSigFigRule, sigFigRuleProblem } from './sig-figs.ts'
import type { SigFigCount, SigFigRule } from './sig-figs.ts'
import { differenceFactor, isDimensionName, referenceUnitOf, resolveExpectedUnit } from './units.ts'
import type { DimensionName, ExpectedUnit } from './units.ts'

export type Verdict = 'correct' | 'incorrect' | 'unreadable' | 'wrong-dimension'

export type Tolerance =
  | { readonly kind: 'relative'; readonly value: number }
  | { readonly kind: 'absolute'; readonly value: number; readonly unit?: string }

export interface CheckRule {
  readonly tolerance: Tolerance
  readonly sigFigs?: SigFigRule
  /** The dimension the answer must have; must agree with expected.unit. */
  readonly dimension?: DimensionName
  /** Read a number without a unit in the expected unit (default false). */
  readonly allowBareNumber?: boolean
  /** The find is a temperature difference: °C and °F carry no offset. Implied by
   *  dimension 'temperature-difference'. */
  readonly isDifference?: boolean
}

export interface ExpectedQuantity {
  readonly value: number
  /** "kJ", "kJ/(kg·K)", "°C", "%", "" (pure number). */
  readonly unit: string
}

export interface CheckAnswerInput {
  readonly expected: ExpectedQuantity
  readonly answer: string
  readonly rule: CheckRule
}

export type CheckNote = 'relative-tolerance-zero-expected' | 'relative-tolerance-on-absolute-scale'

export type CheckCode = 'within-tolerance' | 'outside-tolerance' | 'sig-figs' | AnswerErrorCode

export interface CheckDetail {
  readonly code: CheckCode
  readonly expectedUnit: string
  /** How we understood the answer ("12.5 kJ"). */
  readonly readAs?: string
  readonly form?: AnswerForm
  /** answer − expected, in the expected unit. */
  readonly difference?: number
  /** The largest |difference| accepted, in the expected unit (before round-off allowance). */
  readonly allowedDifference?: number
  readonly withinTolerance?: boolean
  readonly sigFigs?: { readonly counted: SigFigCount | null; readonly rule: SigFigRule; readonly ok: boolean }
  readonly notes?: readonly CheckNote[]
  /** For 'invalid-rule': what is wrong, for the instructor (never shown to students). */
  readonly ruleProblem?: string
  /** An incorrect temperature whose number is right on the other scale ("300 K" for 573.15 K). */
  readonly temperatureLabel?: TemperatureLabelSlip
}

export interface CheckAnswerResult {
  readonly verdict: Verdict
  readonly valueInExpectedUnit?: number
  readonly message: string
  readonly detail?: CheckDetail
}

export type RuleValidation =
  | { readonly ok: true; readonly notes: readonly CheckNote[] }
  | {
      readonly ok: false
      readonly error: { readonly code: 'invalid-rule'; readonly message: string; readonly property: string }
    }

const ROUND_OFF_OF_BOUND = 1e-9
const ROUND_OFF_OF_VALUE = 1e-12

interface Prepared {
  readonly expected: ExpectedUnit
  /** The expected unit read as a difference (for tolerance units). */
  readonly expectedAsDifference: ExpectedUnit
  readonly isDifference: boolean
  readonly notes: CheckNote[]
}

function invalid(property: string, message: string): RuleValidation & { ok: false } {
  return { ok: false, error: { code: 'invalid-rule', message, property } }
}

function prepare(
  expected: unknown,
  rule: unknown,
): { ok: true; prepared: Prepared; expected: ExpectedQuantity; rule: CheckRule } | (RuleValidation & { ok: false }) {
  if (!isObjectLike(expected)) return invalid('expected', 'expected must be { value, unit }')
  const { value, unit } = expected
  if (typeof value !== 'number' || !Number.isFinite(value))
    return invalid('expected.value', 'expected.value must be a finite number')
  if (typeof unit !== 'string') return invalid('expected.unit', 'expected.unit must be a string')
  if (!isObjectLike(rule)) return invalid('rule', 'rule must be an object')
  const { dimension, allowBareNumber, isDifference: differenceFlag, sigFigs, tolerance: t } = rule
  if (dimension !== undefined && !isDimensionName(dimension)) return invalid('rule.dimension', 'unknown dimension')
  if (allowBareNumber !== undefined && typeof allowBareNumber !== 'boolean') {
    return invalid('rule.allowBareNumber', 'allowBareNumber must be true or false')
  }
  if (differenceFlag !== undefined && typeof differenceFlag !== 'boolean') {
    return invalid('rule.isDifference', 'isDifference must be true or false')
  }
  const isDifference = differenceFlag === true || dimension === 'temperature-difference'
  const exp = resolveExpectedUnit(unit, isDifference)
  if (exp === null) return invalid('expected.unit', `expected.unit "${unit}" is not a unit we can read`)
  const expDiff = resolveExpectedUnit(unit, true)
  if (expDiff === null) return invalid('expected.unit', `expected.unit "${unit}" is not a unit we can read`)
  if (dimension !== undefined) {
    const ref = referenceUnitOf(dimension)
    const fits = exp.kind === 'dimensionless' ? ref === 1 : ref !== 1 && exp.unit.equalBase(ref)
    if (!fits) return invalid('rule.dimension', `expected.unit "${unit}" is not ${String(dimension)}`)
  }
  const sigProblem = sigFigRuleProblem(sigFigs)
  if (sigProblem) return invalid('rule.sigFigs', sigProblem)

  const notes: CheckNote[] = []
  if (!isObjectLike(t)) return invalid('rule.tolerance', 'tolerance must be { kind, value }')
  const { kind: tKind, value: tValue, unit: tUnit } = t
  if (typeof tValue !== 'number' || !Number.isFinite(tValue) || tValue < 0) {
    return invalid('rule.tolerance.value', 'tolerance.value must be a finite number ≥ 0')
  }
  let tolerance: Tolerance
  if (tKind === 'relative') {
    if (tUnit !== undefined) return invalid('rule.tolerance.unit', 'a relative tolerance has no unit')
    if (value === 0) notes.push('relative-tolerance-zero-expected')
    if (exp.kind === 'unit' && exp.absoluteTwin) notes.push('relative-tolerance-on-absolute-scale')
    tolerance = { kind: 'relative', value: tValue }
  } else if (tKind === 'absolute') {
    if (tUnit !== undefined) {
      if (typeof tUnit !== 'string') return invalid('rule.tolerance.unit', 'tolerance.unit must be a string')
      const tu = resolveExpectedUnit(tUnit, true)
      const fits =
        tu !== null &&
        (tu.kind === 'dimensionless'
          ? expDiff.kind === 'dimensionless'
          : expDiff.kind === 'unit' && tu.unit.equalBase(expDiff.unit))
      if (!fits) return invalid('rule.tolerance.unit', `tolerance.unit "${tUnit}" does not fit expected.unit "${unit}"`)
    }
    tolerance =
      tUnit === undefined ? { kind: 'absolute', value: tValue } : { kind: 'absolute', value: tValue, unit: tUnit }
  } else {
    return invalid('rule.tolerance.kind', "tolerance.kind must be 'relative' or 'absolute'")
  }
  // The rule as read: the checks above are exactly what CheckRule promises.
  const checked: CheckRule = {
    tolerance,
    ...(isSigFigRule(sigFigs) ? { sigFigs } : {}),
    ...(dimension !== undefined ? { dimension } : {}),
    ...(allowBareNumber !== undefined ? { allowBareNumber } : {}),
    ...(differenceFlag !== undefined ? { isDifference: differenceFlag } : {}),
  }
  return {
    ok: true,
    prepared: { expected: exp, expectedAsDifference: expDiff, isDifference, notes },
    expected: { value, unit },
    rule: checked,
  }
}

/**
 * Checks an expected value and rule before use (for authoring screens); lists notes
 * worth showing the instructor. Never throws.
 */
export function validateCheckRule(expected: ExpectedQuantity, rule: CheckRule): RuleValidation {
  try {
    const p = prepare(expected, rule)
    return p.ok ? { ok: true, notes: p.prepared.notes } : p
  } catch {
    return invalid('rule', 'the rule could not be read')
  }
}

/** The allowed |a − e| for an absolute tolerance, in the expected unit. */
function absoluteBound(tol: { value: number; unit?: string }, p: Prepared): number {
  if (tol.unit === undefined) return tol.value
  const tu = resolveExpectedUnit(tol.unit, true)
  const eu = p.expectedAsDifference
  if (tu === null) throw new Error('tolerance unit vanished')
  if (tu.kind === 'dimensionless' && eu.kind === 'dimensionless') return (tol.value * tu.scale) / eu.scale
  if (tu.kind === 'unit' && eu.kind === 'unit') return tol.value * differenceFactor(tu.unit, eu.unit)
  throw new Error('tolerance unit does not fit')
}

/** Checks a student's answer; see the header for the rules. Never throws. */
export function checkAnswer(input: CheckAnswerInput): CheckAnswerResult {
  try {
    return checkUnsafe(input)
  } catch {
    return {
      verdict: 'unreadable',
      message: unreadableMessage('internal', { expectedDisplay: '' }),
      detail: { code: 'internal', expectedUnit: safeUnit(input) },
    }
  }
}

function safeUnit(input: unknown): string {
  const u = propertyOf(propertyOf(input, 'expected'), 'unit')
  return typeof u === 'string' ? u : ''
}

function checkUnsafe(input: CheckAnswerInput): CheckAnswerResult {
  const { expected, answer, rule }: Partial<CheckAnswerInput> = input ?? {}
  const prep = prepare(expected, rule)
  if (!prep.ok) {
    return {
      verdict: 'unreadable',
      message: unreadableMessage('invalid-rule', { expectedDisplay: '' }),
      detail: {
        code: 'invalid-rule',
        expectedUnit: safeUnit(input),
        ruleProblem: `${prep.error.property}: ${prep.error.message}`,
      },
    }
  }
  const p = prep.prepared
  const exp = prep.expected
  const r = prep.rule
  const notes = p.notes.length > 0 ? { notes: [...p.notes] } : {}

  const read = readAnswer(answer, {
    expectedUnit: exp.unit,
    allowBareNumber: r.allowBareNumber === true,
    temperatureDifference: p.isDifference,
    ...(r.dimension !== undefined ? { dimension: r.dimension } : {}),
  })
  if (!read.ok) {
    return {
      verdict: read.verdict,
      message: read.message,
      detail: { code: read.error.code, expectedUnit: exp.unit, ...notes },
    }
  }
  const a = read.value
  const e = exp.value
  const base = { expectedUnit: exp.unit, readAs: read.readAs, form: read.form, ...notes }

  if (r.sigFigs !== undefined && read.literal === null) {
    return {
      verdict: 'unreadable',
      valueInExpectedUnit: a,
      message: unreadableMessage('needs-plain-number', { expectedDisplay: p.expected.display }),
      detail: { ...base, code: 'needs-plain-number' },
    }
  }

  const { bound, within } = compare(a, e, p, r)
  const numbers = { difference: a - e, allowedDifference: bound, withinTolerance: within }

  let sigFigs: CheckDetail['sigFigs']
  let sigProblem: { problem: 'too-few' | 'too-many'; count: { min: number; max: number } } | null = null
  if (r.sigFigs !== undefined) {
    const counted = countSignificantFigures(read.literal ?? '')
    const verdict = counted ? checkSignificantFigures(counted, r.sigFigs) : { ok: true as const }
    sigFigs = { counted, rule: r.sigFigs, ok: verdict.ok }
    if (!verdict.ok) sigProblem = { problem: verdict.problem, count: verdict.count }
  }
  const sig = sigFigs ? { sigFigs } : {}

  if (!within) {
    // Still wrong, as a pitfall is; only the message names the slip.
    const slip =
      read.literal !== null && read.studentUnit !== null ? temperatureLabelSlip(a, e, p, r, read.studentUnit) : null
    const message = slip === null ? OUTSIDE_RANGE_MESSAGE : temperatureLabelMessage(slip, Number(read.literal))
    return {
      verdict: 'incorrect',
      valueInExpectedUnit: a,
      message,
      detail: { ...base, ...numbers, ...sig, code: 'outside-tolerance', ...(slip ? { temperatureLabel: slip } : {}) },
    }
  }
  if (sigProblem && r.sigFigs) {
    return {
      verdict: 'incorrect',
      valueInExpectedUnit: a,
      message: sigFigMessage(sigProblem.problem, sigProblem.count, r.sigFigs),
      detail: { ...base, ...numbers, ...sig, code: 'sig-figs' },
    }
  }
  return {
    verdict: 'correct',
    valueInExpectedUnit: a,
    message: CORRECT_MESSAGE,
    detail: { ...base, ...numbers, ...sig, code: 'within-tolerance' },
  }
}

/** |a − e|, the allowed difference, and whether a is accepted, under the rule's tolerance. */
function compare(a: number, e: number, p: Prepared, r: CheckRule): { diff: number; bound: number; within: boolean } {
  let diff: number
  let bound: number
  let scaleOfValues: number
  if (r.tolerance.kind === 'relative') {
    let aa = a
    let ee = e
    if (p.expected.kind === 'unit' && p.expected.absoluteTwin) {
      const twin = p.expected.absoluteTwin
      const unit = p.expected.unit
      aa = mathCore.numberIn(mathCore.scale(a, unit), twin)
      ee = mathCore.numberIn(mathCore.scale(e, unit), twin)
    }
    diff = Math.abs(aa - ee)
    bound = r.tolerance.value * Math.abs(ee)
    scaleOfValues = Math.max(Math.abs(aa), Math.abs(ee))
  } else {
    diff = Math.abs(a - e)
    bound = absoluteBound(r.tolerance, p)
    scaleOfValues = Math.max(Math.abs(a), Math.abs(e))
  }
  const within = diff <= bound * (1 + ROUND_OFF_OF_BOUND) + ROUND_OFF_OF_VALUE * scaleOfValues
  return { diff, bound, within }
}

/**
 * The commonest temperature slip: the right temperature on the other scale under the wrong
 * label ("300 K" typed for a key of 573.15 K, i.e. 300 °C; or 573.15 °C for 300 °C). Read as
 * meant, within the same tolerance, the number would be accepted. Absolute temperatures only.
 */
function temperatureLabelSlip(
  a: number,
  e: number,
  p: Prepared,
  r: CheckRule,
  studentUnit: string,
): TemperatureLabelSlip | null {
  if (p.isDifference || p.expected.kind !== 'unit') return null
  const kelvin = resolveExpectedUnit('K', false)
  if (kelvin === null || kelvin.kind !== 'unit' || !p.expected.unit.equalBase(kelvin.unit)) return null
  const typed = resolveExpectedUnit(studentUnit, false)
  if (typed === null || typed.kind !== 'unit') return null
  const comps = typed.unit.units
  const only = comps.length === 1 ? (comps[0] ?? null) : null
  if (only === null || only.power !== 1 || prefixName(only) !== '') return null
  const slip: TemperatureLabelSlip | null =
    only.unit.name === 'K'
      ? 'celsius-labelled-kelvin'
      : only.unit.name === 'degC' || only.unit.name === 'celsius'
        ? 'kelvin-labelled-celsius'
        : null
  if (slip === null) return null
  // 273.15 K as a difference, in the expected unit's steps (1.8 per K for °F).
  const shift = 273.15 * differenceFactor(kelvin.unit, p.expected.unit)
  const meant = slip === 'celsius-labelled-kelvin' ? a + shift : a - shift
  return compare(meant, e, p, r).within ? slip : null
}
