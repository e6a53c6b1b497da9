/**
 * Grading one typed answer to one find of a student's variant, as the grading job and the
 * regrade preview both do it: checkAnswer against the key, the late penalty and the find's
 * share of the item's points, and — for a wrong answer — the first of the find's own
 * pitfalls whose slip reproduces the student's number. Pure and never throws.
 */
import type { Find, KeyEntry, Variant } from '#app/domain/authoring/definition.ts'
import { checkRuleOf, FIND_SENSE_WORDS } from '#app/domain/authoring/definition.ts'
import { convertFromSI, unitAtPath } from '#app/domain/authoring/variant.ts'
import { checkAnswer, type CheckDetail, type Tolerance, type Verdict } from '#app/domain/grading/index.ts'
import { evaluateWithPitfall, PITFALLS, type PitfallId } from '#app/domain/grading/pitfalls.ts'
import { answerScore } from './scoring.ts'

export interface AnswerGrade {
  readonly verdict: Verdict
  /** The answer in the find's unit, when it could be read. */
  readonly value: number | null
  /** Points earned after the late penalty. */
  readonly score: number
  readonly message: string
  readonly pitfall: { readonly id: PitfallId; readonly feedback: string } | null
  readonly detail: CheckDetail | null
}

export interface GradeAnswerInput {
  readonly find: Find
  readonly variant: Variant
  readonly answer: string
  /** Replaces the find's tolerance (an assignment item's override). */
  readonly tolerance?: Tolerance
  /** This find's share of the item's points. */
  readonly share: number
  /** 0…1, from the submission's lateness. */
  readonly latePenalty: number
}

/** How close a slip's value must be to the student's to name it (1 %, the checker's default). */
const PITFALL_MATCH = 0.01

// What each slip gives for a quantity of a variant, kept while the variant object lives:
// the server caches variants per student, and a student's wrong answers to the same find
// need the same re-solves each time.
const slippedValues = new WeakMap<object, Map<string, number[]>>()

function valuesWithPitfall(spec: Readonly<Record<string, unknown>>, path: string, id: PitfallId): number[] {
  let memo = slippedValues.get(spec)
  if (!memo) {
    memo = new Map()
    slippedValues.set(spec, memo)
  }
  const key = `${id}|${path}`
  let values = memo.get(key)
  if (!values) {
    values = evaluateWithPitfall(spec, path, id)
    memo.set(key, values)
  }
  return values
}

const close = (a: number, b: number, rel: number) => Math.abs(a - b) <= rel * Math.max(Math.abs(a), Math.abs(b))

export function gradeAnswer(input: GradeAnswerInput): AnswerGrade {
  const key = input.variant.key.find((k) => k.name === input.find.name)
  if (!key || !Number.isFinite(key.value)) {
    return {
      verdict: 'incorrect',
      value: null,
      score: 0,
      message: 'This question could not be graded; your teacher has been told.',
      pitfall: null,
      detail: null,
    }
  }
  const rule = { ...checkRuleOf(input.find), ...(input.tolerance ? { tolerance: input.tolerance } : {}) }
  const result = checkAnswer({ expected: { value: key.value, unit: key.unit }, answer: input.answer, rule })
  const value =
    typeof result.valueInExpectedUnit === 'number' && Number.isFinite(result.valueInExpectedUnit)
      ? result.valueInExpectedUnit
      : null
  const pitfall =
    result.verdict === 'incorrect' && value !== null ? findPitfall(input.find, key, input.variant, value) : null
  return {
    verdict: result.verdict,
    value,
    score: answerScore(result.verdict, input.latePenalty, input.share),
    message: result.message,
    pitfall,
    detail: result.detail ?? null,
  }
}

/** The first of the find's pitfalls whose slip gives the student's value (and not the right one). */
function findPitfall(find: Find, key: KeyEntry, variant: Variant, valueInFindUnit: number): AnswerGrade['pitfall'] {
  if (!key.path || find.pitfalls.length === 0) return null
  const siUnit = unitAtPath(variant.solution, key.path)
  if (siUnit === null) return null
  // A key negated for the find's stated sense is compared on the solver's sign, as the slips are.
  const sign = key.flipped ? -1 : 1
  const studentSI = convertFromSI(sign * valueInFindUnit, find.unit, siUnit, find.isDifference)
  const correctSI = convertFromSI(sign * key.value, find.unit, siUnit, find.isDifference)
  if (typeof studentSI !== 'number' || typeof correctSI !== 'number') return null
  for (const id of find.pitfalls) {
    const pitfall = PITFALLS.find((p) => p.id === id)
    if (!pitfall) continue
    let values: number[]
    try {
      values = valuesWithPitfall(variant.spec, key.path, id)
    } catch {
      continue
    }
    for (const v of values) {
      if (!Number.isFinite(v) || close(v, correctSI, PITFALL_MATCH)) continue
      if (close(v, studentSI, PITFALL_MATCH)) return { id, feedback: pitfallFeedback(find, id, pitfall.feedback) }
    }
  }
  return null
}

/**
 * A find that states its sense keeps that sign in both conventions, so a wrong sign there is
 * not about the course's convention: the feedback names the sense the question counts positive.
 */
export function pitfallFeedback(find: Find, id: PitfallId, general: string): string {
  if (id !== 'sign-convention-flipped' || !find.sense) return general
  return `Your number has the right size but the wrong sign. This question counts the ${FIND_SENSE_WORDS[find.sense]} as positive, whatever the course's sign convention.`
}

export type Precheck =
  | { readonly ok: true }
  | { readonly ok: false; readonly verdict: 'unreadable' | 'wrong-dimension'; readonly message: string }

/**
 * Whether an answer can be graded at all, before it uses an attempt: it must read as a number
 * with a unit of the find's dimension (or a bare number where the find allows one). Needs no
 * variant: the unit is the find's. A blank answer is for the caller to skip.
 */
export function precheckAnswer(find: Find, answer: string): Precheck {
  // The expected value does not matter for these two verdicts; 1 stands in for it.
  const result = checkAnswer({ expected: { value: 1, unit: find.unit }, answer, rule: checkRuleOf(find) })
  if (result.verdict === 'unreadable' || result.verdict === 'wrong-dimension')
    return { ok: false, verdict: result.verdict, message: result.message }
  return { ok: true }
}
