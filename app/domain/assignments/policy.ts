/**
 * An assignment's rules for one student at one moment: when they may submit, how late an
 * answer is and what that costs, how many attempts each find allows, and whether the key
 * and worked solutions are theirs to see. Pure: the clock comes in as `now`.
 *
 * The rules, in one place:
 * - A student's due date is their extension's, else the assignment's. Their attempts per
 *   find are the assignment's plus the extension's extra attempts.
 * - Before opensAt nothing is accepted. Up to and including the due date an answer is on time.
 * - closed policy: nothing is accepted after the due date.
 * - penalty policy: answers are accepted for lateDaysAllowed days after the due date; each
 *   started day late costs latePenaltyPercentPerDay percent of the points (capped at 100 %).
 * - The key: 'after-due' shows it to a student once they can no longer submit (their due date,
 *   plus the late window under the penalty policy); 'manual' shows it once an instructor has
 *   released it. A student who can see the key can no longer submit.
 */

export type LatePolicyName = 'closed' | 'penalty'
export type KeyReleaseName = 'after-due' | 'manual'

export interface AssignmentRules {
  readonly opensAt: Date
  readonly dueAt: Date
  readonly attemptsPerFind: number
  readonly latePolicy: LatePolicyName
  readonly latePenaltyPercentPerDay: number
  readonly lateDaysAllowed: number
  readonly keyRelease: KeyReleaseName
  readonly keyReleasedAt: Date | null
}

/** The rules out of a row that has (at least) these columns, e.g. an assignments row. */
export function rulesOf(a: AssignmentRules): AssignmentRules {
  return {
    opensAt: a.opensAt,
    dueAt: a.dueAt,
    attemptsPerFind: a.attemptsPerFind,
    latePolicy: a.latePolicy,
    latePenaltyPercentPerDay: a.latePenaltyPercentPerDay,
    lateDaysAllowed: a.lateDaysAllowed,
    keyRelease: a.keyRelease,
    keyReleasedAt: a.keyReleasedAt,
  }
}

/** A per-student accommodation; null or undefined when the student has none. */
export interface StudentExtension {
  readonly dueAt: Date | null
  readonly extraAttempts: number
}

export const DAY_MS = 24 * 60 * 60 * 1000

export function studentDueAt(rules: AssignmentRules, ext?: StudentExtension | null): Date {
  return ext?.dueAt ?? rules.dueAt
}

export function attemptsAllowed(rules: AssignmentRules, ext?: StudentExtension | null): number {
  return rules.attemptsPerFind + Math.max(0, ext?.extraAttempts ?? 0)
}

/** The last moment an answer is accepted from this student. */
export function lastAcceptedAt(rules: AssignmentRules, ext?: StudentExtension | null): Date {
  const due = studentDueAt(rules, ext)
  if (rules.latePolicy === 'closed') return due
  return new Date(due.getTime() + Math.max(0, rules.lateDaysAllowed) * DAY_MS)
}

/** Whole days late, counting a started day as a day: 1 minute late is 1 day late. 0 when on time. */
export function daysLate(rules: AssignmentRules, ext: StudentExtension | null | undefined, at: Date): number {
  const over = at.getTime() - studentDueAt(rules, ext).getTime()
  return over <= 0 ? 0 : Math.ceil(over / DAY_MS)
}

/** The share of points a late answer loses, 0…1. */
export function latePenalty(rules: AssignmentRules, ext: StudentExtension | null | undefined, at: Date): number {
  if (rules.latePolicy !== 'penalty') return 0
  const days = daysLate(rules, ext, at)
  return Math.min(1, Math.max(0, (days * rules.latePenaltyPercentPerDay) / 100))
}

export function isKeyReleased(rules: AssignmentRules, ext: StudentExtension | null | undefined, now: Date): boolean {
  if (rules.keyRelease === 'manual')
    return rules.keyReleasedAt !== null && rules.keyReleasedAt.getTime() <= now.getTime()
  return now.getTime() > lastAcceptedAt(rules, ext).getTime()
}

export type SubmissionWindow =
  | { readonly state: 'not-open'; readonly opensAt: Date }
  | { readonly state: 'open'; readonly dueAt: Date }
  | {
      readonly state: 'late'
      readonly dueAt: Date
      readonly until: Date
      readonly daysLate: number
      readonly penalty: number
    }
  | { readonly state: 'closed'; readonly reason: 'past-due' | 'key-released'; readonly dueAt: Date }

/** Whether this student may submit now, and on what terms. */
export function submissionWindow(
  rules: AssignmentRules,
  ext: StudentExtension | null | undefined,
  now: Date,
): SubmissionWindow {
  const dueAt = studentDueAt(rules, ext)
  if (now.getTime() < rules.opensAt.getTime()) return { state: 'not-open', opensAt: rules.opensAt }
  if (rules.keyRelease === 'manual' && isKeyReleased(rules, ext, now))
    return { state: 'closed', reason: 'key-released', dueAt }
  if (now.getTime() <= dueAt.getTime()) return { state: 'open', dueAt }
  const until = lastAcceptedAt(rules, ext)
  if (now.getTime() > until.getTime()) return { state: 'closed', reason: 'past-due', dueAt }
  return { state: 'late', dueAt, until, daysLate: daysLate(rules, ext, now), penalty: latePenalty(rules, ext, now) }
}

/** A sentence for the student about the window (times are formatted by the caller). */
export function windowMessage(w: SubmissionWindow, format: (d: Date) => string): string {
  switch (w.state) {
    case 'not-open':
      return `This assignment opens ${format(w.opensAt)}.`
    case 'open':
      return `Due ${format(w.dueAt)}.`
    case 'late': {
      const pct = Math.round(w.penalty * 1000) / 10
      return `The due date (${format(w.dueAt)}) has passed. Answers are accepted until ${format(w.until)}; they are ${w.daysLate} day${w.daysLate === 1 ? '' : 's'} late now and lose ${pct} % of their points.`
    }
    case 'closed':
      return w.reason === 'key-released'
        ? 'The key has been released, so this assignment no longer accepts answers.'
        : `This assignment closed on ${format(w.dueAt)} and no longer accepts answers.`
  }
}
