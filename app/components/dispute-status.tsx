/**
 * A dispute's status in words, for staff and students alike. The badge always carries the
 * word itself, so colour is never the only signal.
 */
import { cn } from '#app/lib/cn.ts'
import { formatPoints } from '#app/lib/points.ts'

export type DisputeStatusValue = 'open' | 'upheld' | 'adjusted' | 'rejected'

/** Short words for a badge or a select option. */
export const DISPUTE_STATUS_WORDS: Record<DisputeStatusValue, string> = {
  open: 'Open',
  upheld: 'Upheld',
  adjusted: 'Score adjusted',
  rejected: 'Score kept',
}

/** What the status means, in a sentence a student understands. */
export const DISPUTE_STATUS_MEANING: Record<DisputeStatusValue, string> = {
  open: 'Waiting for a teaching assistant or instructor to review it.',
  upheld: 'Your answer was accepted as correct.',
  adjusted: 'The score of this find was changed by hand.',
  rejected: 'The verdict stands; the score was kept.',
}

const tones: Record<DisputeStatusValue, string> = {
  open: 'border-warn/30 bg-warn-soft text-warn',
  upheld: 'border-ok/30 bg-ok-soft text-ok',
  adjusted: 'border-accent/30 bg-accent-soft text-accent-strong',
  rejected: 'border-line bg-paper text-muted',
}

export function DisputeStatusBadge({ status, className }: { status: DisputeStatusValue; className?: string }) {
  return <span className={cn('inline-block rounded border px-1.5 py-0.5 text-xs font-semibold whitespace-nowrap', tones[status], className)}>{DISPUTE_STATUS_WORDS[status]}</span>
}


/** "2 → 3 points", "kept at 1 point", or nothing while the dispute is open. */
export function disputeOutcomeText(d: { status: DisputeStatusValue; scoreBefore: number | null; scoreAfter: number | null }): string | null {
  if (d.status === 'open') return null
  if (d.scoreBefore === null || d.scoreAfter === null) return DISPUTE_STATUS_WORDS[d.status]
  const unit = (n: number) => (n === 1 ? 'point' : 'points')
  if (d.scoreBefore === d.scoreAfter) return `Kept at ${formatPoints(d.scoreAfter)} ${unit(d.scoreAfter)}`
  return `${formatPoints(d.scoreBefore)} → ${formatPoints(d.scoreAfter)} ${unit(d.scoreAfter)}`
}
