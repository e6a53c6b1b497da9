/**
 * When a student may dispute the verdict on one find (issue #7). Pure: the server reads the
 * facts (release date, graded answer, open dispute) and this decides.
 *
 * - Only a find with a graded answer can be disputed (there is no verdict to dispute before).
 * - One open dispute per find: a second waits until the first is resolved.
 * - While the grades are not released the window is open (a student who sees a verdict early
 *   may already ask); once released it stays open for `disputeDays` days, the end excluded.
 * - When the server knows about the latest graded answer (`latest`), also: a dropped student
 *   disputes nothing; an answer whose dispute was resolved is not disputed again (a new answer
 *   may be); a correct answer with full points has nothing to dispute (one below full points,
 *   e.g. after a late penalty, may be disputed, but not while the student still has attempts
 *   and the assignment takes answers).
 *
 * The problem page's offer and the server's refusal both come from this function.
 */

const DAY_MS = 86_400_000

export type DisputeWindowInput = {
  gradesReleasedAt: Date | null
  /** days after the release during which disputes are accepted (0: none after the release) */
  disputeDays: number
  /** the student has at least one graded answer to this find */
  graded: boolean
  hasOpenDispute: boolean
  now: Date
  /** how a date is shown in the reason (the server passes one that shows the course's zone) */
  format?: (d: Date) => string
  /** the student was dropped from the course */
  dropped?: boolean
  /** the latest graded answer to the find: its verdict and score, and whether a dispute on it was resolved */
  latest?: { verdict: string; score: number; maxScore: number; disputeResolved: boolean }
  /** attempts the student has left on the find and whether the assignment still accepts their answers */
  attemptsLeft?: number
  canStillAnswer?: boolean
}

export type DisputeWindowCode =
  'dropped' | 'not-graded' | 'open-dispute' | 'already-disputed' | 'full-points' | 'answer-again' | 'closed'

export type DisputeWindow =
  /** until: when the window closes; null while the grades are not released */
  { allowed: true; until: Date | null } | { allowed: false; code: DisputeWindowCode; reason: string; closedAt?: Date }

/** When disputes close for an assignment: disputeDays after the release; null while unreleased. */
export function disputeDeadline(gradesReleasedAt: Date | null, disputeDays: number): Date | null {
  if (gradesReleasedAt === null) return null
  return new Date(gradesReleasedAt.getTime() + Math.max(0, disputeDays) * DAY_MS)
}

export function disputeWindow(input: DisputeWindowInput): DisputeWindow {
  const format = input.format ?? ((d: Date) => d.toISOString())
  if (input.dropped) {
    return {
      allowed: false,
      code: 'dropped',
      reason:
        'You have been dropped from this course, so you can no longer dispute a grade. Your past work stays here for you to read.',
    }
  }
  if (!input.graded) {
    return {
      allowed: false,
      code: 'not-graded',
      reason: 'This question has no graded answer yet, so there is no verdict to dispute.',
    }
  }
  if (input.hasOpenDispute) {
    return {
      allowed: false,
      code: 'open-dispute',
      reason: 'You already have an open dispute on this question. You can raise another once it has been resolved.',
    }
  }
  const latest = input.latest
  if (latest?.disputeResolved) {
    return {
      allowed: false,
      code: 'already-disputed',
      reason: 'Your dispute on this answer has been resolved, so it cannot be disputed again. A new answer could be.',
    }
  }
  if (latest && latest.verdict === 'correct' && latest.score >= latest.maxScore - 1e-9) {
    return {
      allowed: false,
      code: 'full-points',
      reason: 'This answer is correct with full points, so there is nothing to dispute.',
    }
  }
  if (latest && latest.verdict === 'correct' && input.canStillAnswer && (input.attemptsLeft ?? 0) > 0) {
    return {
      allowed: false,
      code: 'answer-again',
      reason:
        'This answer is correct, and the assignment is still open with attempts left; its score can be disputed once the assignment no longer takes your answers.',
    }
  }
  const until = disputeDeadline(input.gradesReleasedAt, input.disputeDays)
  if (until !== null && input.now.getTime() >= until.getTime()) {
    const reason =
      input.disputeDays <= 0
        ? 'Disputes for this assignment closed when its grades were released.'
        : `Disputes for this assignment closed on ${format(until)}, ${input.disputeDays} day${input.disputeDays === 1 ? '' : 's'} after the grades were released.`
    return { allowed: false, code: 'closed', reason, closedAt: until }
  }
  return { allowed: true, until }
}

/** Two answers are the same when their values agree to 1e-9 relative (what accepting "the same answer" means). */
export function sameAnswerValue(a: number, b: number): boolean {
  if (!Number.isFinite(a) || !Number.isFinite(b)) return false
  if (a === b) return true
  return Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b))
}

/** Two variants are the same when every given reads the same (name and text as the solver got it). */
export function sameGivens(
  a: readonly { name: string; text: string }[],
  b: readonly { name: string; text: string }[],
): boolean {
  if (a.length !== b.length) return false
  const other = new Map(b.map((g) => [g.name, g.text]))
  return a.every((g) => other.get(g.name) === g.text)
}
