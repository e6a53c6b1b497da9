import { renderToStaticMarkup } from 'react-dom/server'
import { describe, expect, test } from 'vitest'
import { disputeOutcome } from '#app/components/answer-form.tsx'
import { DisputeStatusBadge } from '#app/components/dispute-status.tsx'
import type { MyDispute } from '#app/server/disputes.server.ts'
import { disputeStatus, jobStatus, submissionStatus, sweepStatus, verdict } from '#app/server/db/schema.server.ts'
import { GRADEBOOK_STATUSES } from '#app/server/gradebook.server.ts'
import { describeAuditEntry } from './audit-words.ts'
import { disputeResolutionMail, disputeResolvedHistoryText } from './dispute-resolution.ts'
import {
  answerResultLabel,
  DISPUTE_STATUS_LABELS,
  DISPUTE_STATUS_MEANINGS,
  DISPUTE_STATUS_TONES,
  inSentence,
  REGRADE_STATUS_LABELS,
  STUDENT_STATUS_LABELS,
  SUBMISSION_STATUS_LABELS,
  SWEEP_STATUS_LABELS,
  TONE_CLASSES,
  verdictLabel,
  VERDICT_LABELS,
  VERDICT_TONES,
  type DisputeOutcome,
} from './labels.ts'

/** Each record has exactly the enum's values as keys, each with words. */
function expectWordsFor(record: Readonly<Record<string, string>>, values: readonly string[]) {
  expect(Object.keys(record).sort()).toEqual([...values].sort())
  for (const v of values) expect(record[v]?.trim().length, `words for ${v}`).toBeGreaterThan(0)
}

/** The text a badge shows, without its markup. */
function badgeText(status: keyof typeof DISPUTE_STATUS_LABELS): string {
  return renderToStaticMarkup(<DisputeStatusBadge status={status} />).replace(/<[^>]+>/g, '')
}

const OUTCOMES = disputeStatus.enumValues.filter((s): s is DisputeOutcome => s !== 'open')

describe('every value of every enum has its words', () => {
  test('verdicts, grading, disputes, regrades and checks (the database enums)', () => {
    expectWordsFor(VERDICT_LABELS, verdict.enumValues)
    expectWordsFor(VERDICT_TONES, verdict.enumValues)
    expectWordsFor(SUBMISSION_STATUS_LABELS, submissionStatus.enumValues)
    expectWordsFor(DISPUTE_STATUS_LABELS, disputeStatus.enumValues)
    expectWordsFor(DISPUTE_STATUS_MEANINGS, disputeStatus.enumValues)
    expectWordsFor(DISPUTE_STATUS_TONES, disputeStatus.enumValues)
    expectWordsFor(REGRADE_STATUS_LABELS, jobStatus.enumValues)
    expectWordsFor(SWEEP_STATUS_LABELS, sweepStatus.enumValues)
  })

  test('where a student stands (the gradebook filter less "all" and the "late" flag)', () => {
    expectWordsFor(
      STUDENT_STATUS_LABELS,
      GRADEBOOK_STATUSES.filter((s) => s !== 'all' && s !== 'late'),
    )
  })

  test('each tone is a colour of the theme', () => {
    for (const tone of [...Object.values(VERDICT_TONES), ...Object.values(DISPUTE_STATUS_TONES)])
      expect(TONE_CLASSES[tone]).toMatch(/^border-\S+ bg-\S+ text-\S+$/)
  })

  test('no two values of one enum share a word', () => {
    for (const record of [
      VERDICT_LABELS,
      SUBMISSION_STATUS_LABELS,
      DISPUTE_STATUS_LABELS,
      STUDENT_STATUS_LABELS,
      REGRADE_STATUS_LABELS,
      SWEEP_STATUS_LABELS,
    ]) {
      const words = Object.values(record)
      expect(new Set(words).size).toBe(words.length)
    }
  })
})

describe('one word per concept', () => {
  test('an answer waiting for the grader is "Being graded" in a table, in the gradebook and on the assignment page', () => {
    expect(answerResultLabel({ verdict: null, status: 'queued' })).toBe('Being graded')
    expect(STUDENT_STATUS_LABELS['being-graded']).toBe(SUBMISSION_STATUS_LABELS.queued)
    expect(answerResultLabel({ verdict: null, status: 'failed' })).toBe(SUBMISSION_STATUS_LABELS.failed)
    expect(answerResultLabel({ verdict: 'incorrect', status: 'graded' })).toBe('Incorrect')
    expect(answerResultLabel({ verdict: 'removed' })).toBe('No longer asked')
  })

  test('a verdict from stored JSON reads as the page reads it; an unknown one is shown as it is', () => {
    for (const v of verdict.enumValues) expect(verdictLabel(v)).toBe(VERDICT_LABELS[v])
    expect(verdictLabel(null)).toBe('Not graded')
    expect(verdictLabel('something-new')).toBe('something-new')
  })

  test('the audit log says a verdict with the same word, inside its sentence', () => {
    for (const v of verdict.enumValues) {
      const other = v === 'correct' ? 'incorrect' : 'correct'
      const w = describeAuditEntry(
        {
          kind: 'regrade',
          before: { verdict: other, score: 0 },
          after: { verdict: v, score: 0 },
          note: '',
          subject: 'Ada',
          assignmentTitle: 'Week 9',
          assignmentDueAt: null,
          question: null,
          maxScore: 3,
          regrade: null,
        },
        { timeZone: 'UTC' },
      )
      expect(w.change).toContain(`→ ${inSentence(VERDICT_LABELS[v])};`)
    }
  })
})

describe('a resolved dispute: the e-mail, the badge, the student’s page, the history and the audit log agree', () => {
  const facts = {
    studentName: 'Ada Okafor',
    courseCode: 'ENG 2040',
    courseTitle: 'Thermodynamics',
    assignmentTitle: 'Week 9',
    position: 2,
    findLabel: 'Net work per unit mass',
    scoreBefore: 1,
    scoreAfter: 3,
    share: 3,
    comment: null,
  }

  test.each(OUTCOMES)('%s', (outcome) => {
    const word = badgeText(outcome)
    expect(word).toBe(DISPUTE_STATUS_LABELS[outcome])

    const mail = disputeResolutionMail({ ...facts, outcome, scoreAfter: outcome === 'rejected' ? 1 : 3 })
    expect(mail.subject.endsWith(`: ${inSentence(word)}`)).toBe(true)
    expect(mail.lines.some((l) => l.startsWith(`Outcome: ${word}. `))).toBe(true)

    const mine: MyDispute = {
      id: 1,
      findName: 'wNet',
      status: outcome,
      comment: null,
      scoreBefore: 1,
      scoreAfter: outcome === 'rejected' ? 1 : 3,
      createdAt: '2026-12-01T08:00:00.000Z',
      resolvedAt: '2026-12-02T08:00:00.000Z',
    }
    expect(disputeOutcome(mine).startsWith(word)).toBe(true)

    expect(disputeResolvedHistoryText({ outcome, scoreBefore: 1, scoreAfter: 3, comment: null })).toMatch(
      new RegExp(`^Resolved: ${inSentence(word)};`),
    )

    const audit = describeAuditEntry(
      {
        kind: 'dispute-resolved',
        before: { status: 'open', score: 1 },
        after: { status: outcome, score: 3, changed: 1 },
        note: '',
        subject: 'Ada Okafor',
        assignmentTitle: 'Week 9',
        assignmentDueAt: null,
        question: { label: 'Net work per unit mass', position: 2 },
        maxScore: 3,
        regrade: null,
      },
      { timeZone: 'UTC' },
    )
    expect(audit.what.endsWith(`resolved: ${inSentence(word)}`)).toBe(true)
  })

  test('the e-mail says the scores and the reviewer’s comment', () => {
    const kept = disputeResolutionMail({
      ...facts,
      outcome: 'rejected',
      scoreAfter: 1,
      comment: 'The sign is part of the answer.',
    })
    expect(kept.subject).toBe('ENG 2040: your dispute on Week 9, problem 2: score kept')
    expect(kept.lines).toEqual([
      'Hello Ada Okafor,',
      'Your dispute about “Net work per unit mass” in problem 2 of Week 9 (ENG 2040 Thermodynamics) has been reviewed.',
      'Outcome: Score kept. Your score for this question stays at 1 point of 3.',
      'Comment from the reviewer: The sign is part of the answer.',
    ])
    const adjusted = disputeResolutionMail({ ...facts, outcome: 'adjusted', scoreAfter: 2.5 })
    expect(adjusted.lines[2]).toBe(
      'Outcome: Score adjusted. Your score for this question was changed from 1 point to 2.5 points of 3.',
    )
    expect(adjusted.lines).toHaveLength(3)
  })
})
