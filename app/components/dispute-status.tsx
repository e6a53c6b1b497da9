/**
 * A dispute's status in words, for staff and students alike. The badge always carries the
 * word itself, so colour is never the only signal.
 */
import { cn } from '#app/lib/cn.ts'
import {
  DISPUTE_STATUS_LABELS,
  DISPUTE_STATUS_MEANINGS,
  DISPUTE_STATUS_TONES,
  TONE_CLASSES,
  type DisputeStatus,
} from '#app/lib/labels.ts'
import { formatPoints } from '#app/lib/points.ts'

export type DisputeStatusValue = DisputeStatus

/** Short words for a badge or a select option (app/lib/labels.ts). */
export const DISPUTE_STATUS_WORDS: Readonly<Record<DisputeStatusValue, string>> = DISPUTE_STATUS_LABELS

/** What the status means, in a sentence a student understands. */
export const DISPUTE_STATUS_MEANING: Readonly<Record<DisputeStatusValue, string>> = DISPUTE_STATUS_MEANINGS

export function DisputeStatusBadge({ status, className }: { status: DisputeStatusValue; className?: string }) {
  return (
    <span
      className={cn(
        'inline-block rounded border px-1.5 py-0.5 text-xs font-semibold whitespace-nowrap',
        TONE_CLASSES[DISPUTE_STATUS_TONES[status]],
        className,
      )}
    >
      {DISPUTE_STATUS_LABELS[status]}
    </span>
  )
}

/** "2 → 3 points", "kept at 1 point", or nothing while the dispute is open. */
export function disputeOutcomeText(d: {
  status: DisputeStatusValue
  scoreBefore: number | null
  scoreAfter: number | null
}): string | null {
  if (d.status === 'open') return null
  if (d.scoreBefore === null || d.scoreAfter === null) return DISPUTE_STATUS_WORDS[d.status]
  const unit = (n: number) => (n === 1 ? 'point' : 'points')
  if (d.scoreBefore === d.scoreAfter) return `Kept at ${formatPoints(d.scoreAfter)} ${unit(d.scoreAfter)}`
  return `${formatPoints(d.scoreBefore)} → ${formatPoints(d.scoreAfter)} ${unit(d.scoreAfter)}`
}
