/**
 * Points: how an assignment item's points are shared among its finds, what one graded
 * answer earns, and a student's score on a find, an item and an assignment. Pure.
 *
 * - A find's share of an item is item.points × find.points / Σ find.points (an item whose
 *   finds are all worth 0 shares its points equally).
 * - A correct answer earns its find's share less the late penalty of its submission; any
 *   other verdict earns 0. (A value within tolerance with the wrong significant figures is
 *   'incorrect' and earns 0 — partial credit for figures is not offered yet.)
 * - A find's score is the best of its graded answers, so a later wrong attempt never takes
 *   away an earlier right one.
 */
import type { Verdict } from '#app/domain/grading/index.ts'

export function findShares(itemPoints: number, findPoints: readonly number[]): number[] {
  const total = findPoints.reduce((a, b) => a + Math.max(0, b), 0)
  if (findPoints.length === 0) return []
  if (total <= 0) return findPoints.map(() => itemPoints / findPoints.length)
  return findPoints.map((p) => (itemPoints * Math.max(0, p)) / total)
}

export function answerScore(verdict: Verdict, latePenalty: number, share: number): number {
  if (verdict !== 'correct') return 0
  const kept = 1 - Math.min(1, Math.max(0, latePenalty))
  return share * kept
}

/** For showing and exporting sums: 1e-6 of a point, so binary round-off (0.30000000000000004) never shows. */
export function roundScore(x: number): number {
  return Math.round(x * 1e6) / 1e6
}

export function bestScore(scores: readonly (number | null | undefined)[]): number {
  let best = 0
  for (const s of scores) if (typeof s === 'number' && s > best) best = s
  return best
}

export type FindState = 'not-started' | 'grading' | 'correct' | 'try-again' | 'out-of-attempts'

/** Where a student stands on a find: answered right, waiting, attempts left or none. */
export function findState(input: {
  attemptsUsed: number
  attemptsAllowed: number
  anyCorrect: boolean
  anyPending: boolean
}): FindState {
  if (input.anyCorrect) return 'correct'
  if (input.anyPending) return 'grading'
  if (input.attemptsUsed === 0) return 'not-started'
  return input.attemptsUsed >= input.attemptsAllowed ? 'out-of-attempts' : 'try-again'
}
