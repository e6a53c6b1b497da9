import { SUBMISSION_STATUS_LABELS, verdictLabel } from '#app/lib/labels.ts'
import { formatPointsWord, formatScore } from '#app/lib/points.ts'

/** An answer's verdict in the shared words; an answer not graded yet is "queued". */
export function verdictText(verdict: string | null): string {
  return verdict === null ? SUBMISSION_STATUS_LABELS.queued : verdictLabel(verdict)
}

/** "—" for no score, "2 points", or "2 of 4" against a maximum. */
export function pointsText(n: number | null, max?: number): string {
  if (n === null) return '—'
  return max === undefined ? formatPointsWord(n) : formatScore(n, max)
}
