/**
 * The words of a resolved dispute, as the student reads them in the e-mail and as staff read
 * them in the dispute's history. The outcome is said with the same label as the dispute's
 * badge on every page (app/lib/labels.ts DISPUTE_STATUS_LABELS). Pure and isomorphic.
 */
import { DISPUTE_STATUS_LABELS, inSentence, type DisputeOutcome } from './labels.ts'
import { formatPoints, formatPointsWord } from './points.ts'

export type ResolutionMailFacts = {
  outcome: DisputeOutcome
  studentName: string
  courseCode: string
  courseTitle: string
  assignmentTitle: string
  position: number
  findLabel: string
  scoreBefore: number
  scoreAfter: number
  /** the find's share of the problem's points */
  share: number
  comment: string | null
}

/** The e-mail's subject and paragraphs (linkMail adds the link and the signature). */
export function disputeResolutionMail(f: ResolutionMailFacts): { subject: string; lines: string[] } {
  const of = `of ${formatPoints(f.share)}`
  const score =
    f.outcome === 'rejected'
      ? `Your score for this question stays at ${formatPointsWord(f.scoreAfter)} ${of}.`
      : f.outcome === 'adjusted'
        ? `Your score for this question was changed from ${formatPointsWord(f.scoreBefore)} to ${formatPointsWord(f.scoreAfter)} ${of}.`
        : `Your answer now counts as correct; your score for this question is ${formatPointsWord(f.scoreAfter)} ${of}.`
  return {
    subject: `${f.courseCode}: your dispute on ${f.assignmentTitle}, problem ${f.position}: ${inSentence(DISPUTE_STATUS_LABELS[f.outcome])}`,
    lines: [
      `Hello ${f.studentName},`,
      `Your dispute about “${f.findLabel}” in problem ${f.position} of ${f.assignmentTitle} (${f.courseCode} ${f.courseTitle}) has been reviewed.`,
      `Outcome: ${DISPUTE_STATUS_LABELS[f.outcome]}. ${score}`,
      ...(f.comment ? [`Comment from the reviewer: ${f.comment}`] : []),
    ],
  }
}

/** The history's last line: "Resolved: score kept; the find's score stays at 1 point." */
export function disputeResolvedHistoryText(d: {
  outcome: DisputeOutcome
  scoreBefore: number
  scoreAfter: number
  comment: string | null
}): string {
  const score =
    d.scoreBefore === d.scoreAfter
      ? `the find's score stays at ${formatPointsWord(d.scoreAfter)}`
      : `the find's score went from ${formatPointsWord(d.scoreBefore)} to ${formatPointsWord(d.scoreAfter)}`
  return `Resolved: ${inSentence(DISPUTE_STATUS_LABELS[d.outcome])}; ${score}.${d.comment ? ` Comment: ${d.comment}` : ''}`
}
