/**
 * One set of outcome words for the whole product: a verdict, a submission's grading status, a
 * dispute's status, a regrade's or a problem check's progress, and where a student stands on an
 * assignment, each said the same way on every page and in every e-mail.
 *
 * Isomorphic: only type imports from the schema and the server (erased at build time), so page
 * components, server modules and e-mails all read these records. Each record `satisfies` a
 * Record over its enum, so a new enum value fails the typecheck until it has its words.
 *
 * - `*_LABELS`: the word as a badge, a table cell or a select option shows it ("Score kept").
 * - `inSentence(label)`: the same word inside a sentence ("your dispute …: score kept").
 * - `*_TONES`: where a page shows a badge, its colours (the word is always there too, so colour
 *   is never the only signal).
 */
import type { Verdict } from '#app/domain/grading/index.ts'
import type { disputeStatus, jobStatus, submissionStatus, sweepStatus } from '#app/server/db/schema.server.ts'
import type { StudentStatus } from '#app/server/gradebook.server.ts'
import { isKeyOf } from './guards.ts'

export type { Verdict }
export type SubmissionStatus = (typeof submissionStatus.enumValues)[number]
export type DisputeStatus = (typeof disputeStatus.enumValues)[number]
export type DisputeOutcome = Exclude<DisputeStatus, 'open'>
/** A regrade's status (the job_status enum). */
export type RegradeStatus = (typeof jobStatus.enumValues)[number]
/** A problem check's status (the sweep_status enum). */
export type SweepStatus = (typeof sweepStatus.enumValues)[number]
export type { StudentStatus }

/** A badge's colours, as Tailwind classes of the theme. */
export type Tone = 'ok' | 'danger' | 'warn' | 'accent' | 'muted'

export const TONE_CLASSES = {
  ok: 'border-ok/30 bg-ok-soft text-ok',
  danger: 'border-danger/30 bg-danger-soft text-danger',
  warn: 'border-warn/30 bg-warn-soft text-warn',
  accent: 'border-accent/30 bg-accent-soft text-accent-strong',
  muted: 'border-line bg-paper text-muted',
} as const satisfies Record<Tone, string>

/** The same colour for text alone (a verdict beside an answer). */
export const TONE_TEXT = {
  ok: 'text-ok',
  danger: 'text-danger',
  warn: 'text-warn',
  accent: 'text-accent-strong',
  muted: 'text-muted',
} as const satisfies Record<Tone, string>

/** "Score kept" → "score kept", for a word inside a sentence. */
export function inSentence(label: string): string {
  return label.length > 0 ? label[0]!.toLowerCase() + label.slice(1) : label
}

// ---- Verdicts ------------------------------------------------------------------------------

export const VERDICT_LABELS = {
  correct: 'Correct',
  incorrect: 'Incorrect',
  unreadable: 'Could not be read',
  'wrong-dimension': 'Wrong kind of unit',
} as const satisfies Record<Verdict, string>

export const VERDICT_TONES = {
  correct: 'ok',
  incorrect: 'danger',
  unreadable: 'danger',
  'wrong-dimension': 'danger',
} as const satisfies Record<Verdict, Tone>

/** A regrade's pseudo-verdict for an answer to a find the new version no longer asks. */
export const REMOVED_FIND_LABEL = 'No longer asked'

// ---- Submissions (grading) -----------------------------------------------------------------

export const SUBMISSION_STATUS_LABELS = {
  queued: 'Being graded',
  graded: 'Graded',
  failed: 'Grading failed',
} as const satisfies Record<SubmissionStatus, string>

/**
 * An answer's result in a table: its verdict once graded, else its submission's status
 * ("Being graded", "Grading failed"). A verdict of 'removed' (a regrade's) is "No longer asked".
 */
export function answerResultLabel(a: {
  verdict: Verdict | 'removed' | null
  status?: SubmissionStatus | null
}): string {
  if (a.verdict === 'removed') return REMOVED_FIND_LABEL
  if (a.verdict) return VERDICT_LABELS[a.verdict]
  return SUBMISSION_STATUS_LABELS[a.status === 'failed' ? 'failed' : 'queued']
}

/** The same for a verdict that may come from stored JSON (audit rows, dispute history). */
export function verdictLabel(v: unknown): string {
  if (v === null || v === undefined) return 'Not graded'
  if (v === 'removed') return REMOVED_FIND_LABEL
  return isKeyOf(VERDICT_LABELS, v) ? VERDICT_LABELS[v] : String(v)
}

// ---- Disputes ------------------------------------------------------------------------------

export const DISPUTE_STATUS_LABELS = {
  open: 'Open',
  upheld: 'Answer accepted',
  adjusted: 'Score adjusted',
  rejected: 'Score kept',
} as const satisfies Record<DisputeStatus, string>

/** What the status means, in a sentence a student understands. */
export const DISPUTE_STATUS_MEANINGS = {
  open: 'Waiting for a teaching assistant or instructor to review it.',
  upheld: 'Your answer was accepted as correct.',
  adjusted: 'The score of this find was changed by hand.',
  rejected: 'The verdict stands; the score was kept.',
} as const satisfies Record<DisputeStatus, string>

export const DISPUTE_STATUS_TONES = {
  open: 'warn',
  upheld: 'ok',
  adjusted: 'accent',
  rejected: 'muted',
} as const satisfies Record<DisputeStatus, Tone>

// ---- Where a student stands on an assignment -----------------------------------------------

export const STUDENT_STATUS_LABELS = {
  'not-started': 'Not started',
  'in-progress': 'In progress',
  finished: 'Finished',
  'being-graded': SUBMISSION_STATUS_LABELS.queued,
} as const satisfies Record<StudentStatus, string>

/** The flag beside a late student or answer. */
export const LATE_LABEL = 'Late'

// ---- Background work: regrades and problem checks ------------------------------------------

export const REGRADE_STATUS_LABELS = {
  queued: 'Waiting for a worker',
  running: 'Regrading',
  done: 'Done',
  failed: 'Stopped',
} as const satisfies Record<RegradeStatus, string>

export const SWEEP_STATUS_LABELS = {
  queued: 'Waiting for a worker',
  running: 'Checking',
  done: 'Done',
  failed: 'Stopped',
} as const satisfies Record<SweepStatus, string>
