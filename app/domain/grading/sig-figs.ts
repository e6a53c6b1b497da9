// Significant figures, counted from the number as the student typed it.
//
// The rules (common practice in introductory science and engineering courses):
//  - Only the mantissa counts: in 1.200e3 (or 1.200×10^3) the figures are those of "1.200".
//  - Leading zeros never count: 0.0042 has 2.
//  - Zeros between other digits count: 1002 has 4.
//  - Trailing zeros after a decimal point count: 1.200 has 4, 12.50 has 4.
//  - A trailing decimal point makes an integer's trailing zeros count: "1200." has 4.
//  - Trailing zeros of an integer without a point are AMBIGUOUS: "1200" has 2, 3 or 4.
//    We give the benefit of the doubt: "1200" satisfies a rule if any of 2, 3 or 4 does.
//    Write 1.20e3 (or 1.20×10^3) to be explicit.
//  - A value of zero ("0", "0.00") has no meaningful count; a sig-fig rule is not applied.
//  - The sign and a trailing % do not matter.
// An answer that is a calculation (2*3.5 kJ, sqrt(2) kPa) has no typed number to count.

import { isObjectLike } from './plain-data.ts'

export type SigFigCount =
  { readonly kind: 'count'; readonly min: number; readonly max: number } | { readonly kind: 'zero' }

export interface SigFigRule {
  readonly min?: number
  readonly max?: number
}

const LITERAL = /^[+-]?(\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/

/** Counts the significant figures of one decimal literal ("1.200e3", "-0.0042"); null if it is not one. */
export function countSignificantFigures(literal: string): SigFigCount | null {
  if (typeof literal !== 'string') return null
  const m = LITERAL.exec(literal.trim())
  if (!m || m[1] === undefined) return null
  const mantissa = m[1]
  const hasPoint = mantissa.includes('.')
  const digits = mantissa.replace('.', '')
  const first = digits.search(/[1-9]/)
  if (first < 0) return { kind: 'zero' }
  const significant = digits.slice(first)
  if (hasPoint) return { kind: 'count', min: significant.length, max: significant.length }
  const withoutTrailingZeros = significant.replace(/0+$/, '')
  return { kind: 'count', min: withoutTrailingZeros.length, max: significant.length }
}

export type SigFigVerdict =
  | { readonly ok: true }
  | { readonly ok: false; readonly problem: 'too-few' | 'too-many'; readonly count: SigFigCount & { kind: 'count' } }

/**
 * Checks a count against a rule (inclusive bounds). An ambiguous count passes when any
 * reading in [count.min, count.max] lies within [rule.min, rule.max]. Zero always passes.
 */
export function checkSignificantFigures(count: SigFigCount, rule: SigFigRule): SigFigVerdict {
  if (count.kind === 'zero') return { ok: true }
  const lo = rule.min ?? 1
  const hi = rule.max ?? Number.POSITIVE_INFINITY
  if (count.max < lo) return { ok: false, problem: 'too-few', count }
  if (count.min > hi) return { ok: false, problem: 'too-many', count }
  return { ok: true }
}

/** Null when the rule is usable; otherwise what is wrong with it (for instructors). */
export function sigFigRuleProblem(rule: unknown): string | null {
  if (rule === undefined) return null
  if (!isObjectLike(rule)) return 'sigFigs must be an object { min?, max? }'
  const { min, max } = rule
  for (const [name, v] of [
    ['min', min],
    ['max', max],
  ] as const) {
    if (v !== undefined && (typeof v !== 'number' || !Number.isInteger(v) || v < 1 || v > 17)) {
      return `sigFigs.${name} must be a whole number from 1 to 17`
    }
  }
  if (min === undefined && max === undefined) return 'sigFigs needs min, max or both'
  if (typeof min === 'number' && typeof max === 'number' && min > max) return 'sigFigs.min is larger than sigFigs.max'
  return null
}

/** A usable sig-fig rule: one sigFigRuleProblem finds nothing wrong with (undefined is none). Pure. */
export function isSigFigRule(rule: unknown): rule is SigFigRule {
  return rule !== undefined && sigFigRuleProblem(rule) === null
}
