import { describe, expect, test } from 'vitest'
import { disputeDeadline, disputeWindow, sameAnswerValue, sameGivens } from './disputes.ts'

const released = new Date('2026-11-20T12:00:00Z')
const at = (iso: string) => new Date(iso)

describe('dispute window', () => {
  test.each([
    ['grades not released yet: open, no end', null, 7, true, false, '2026-11-01T00:00:00Z', true],
    ['at the release instant', released, 7, true, false, '2026-11-20T12:00:00Z', true],
    ['a second before the end', released, 7, true, false, '2026-11-27T11:59:59Z', true],
    ['at the end (excluded)', released, 7, true, false, '2026-11-27T12:00:00Z', false],
    ['a day after the end', released, 7, true, false, '2026-11-28T12:00:00Z', false],
    ['zero days: closed at the release', released, 0, true, false, '2026-11-20T12:00:00Z', false],
    ['zero days: open before the release', null, 0, true, false, '2026-11-20T12:00:00Z', true],
    ['sixty days', released, 60, true, false, '2027-01-18T11:59:00Z', true],
    ['no graded answer', null, 7, false, false, '2026-11-21T00:00:00Z', false],
    ['an open dispute already', released, 7, true, true, '2026-11-21T00:00:00Z', false],
  ] as const)('%s', (_name, gradesReleasedAt, disputeDays, graded, hasOpenDispute, now, allowed) => {
    expect(disputeWindow({ gradesReleasedAt, disputeDays, graded, hasOpenDispute, now: at(now) }).allowed).toBe(allowed)
  })

  test('the end is disputeDays after the release; null while unreleased', () => {
    expect(disputeDeadline(released, 7)).toEqual(at('2026-11-27T12:00:00Z'))
    expect(disputeDeadline(null, 7)).toBeNull()
    const w = disputeWindow({
      gradesReleasedAt: released,
      disputeDays: 7,
      graded: true,
      hasOpenDispute: false,
      now: at('2026-11-21T00:00:00Z'),
    })
    expect(w).toEqual({ allowed: true, until: at('2026-11-27T12:00:00Z') })
    expect(
      disputeWindow({ gradesReleasedAt: null, disputeDays: 7, graded: true, hasOpenDispute: false, now: released }),
    ).toEqual({ allowed: true, until: null })
  })

  test.each([
    [
      'not graded',
      { graded: false, hasOpenDispute: false, now: '2026-11-21T00:00:00Z' },
      'not-graded',
      /no graded answer yet/,
    ],
    [
      'open dispute',
      { graded: true, hasOpenDispute: true, now: '2026-11-21T00:00:00Z' },
      'open-dispute',
      /already have an open dispute/,
    ],
    [
      'closed',
      { graded: true, hasOpenDispute: false, now: '2026-12-01T00:00:00Z' },
      'closed',
      /closed on FMT\(2026-11-27T12:00:00.000Z\), 7 days after/,
    ],
  ] as const)('the reason in words: %s', (_name, facts, code, reason) => {
    const w = disputeWindow({
      gradesReleasedAt: released,
      disputeDays: 7,
      ...facts,
      now: at(facts.now),
      format: (d) => `FMT(${d.toISOString()})`,
    })
    expect(w.allowed).toBe(false)
    if (w.allowed) return
    expect(w.code).toBe(code)
    expect(w.reason).toMatch(reason)
  })

  test('not graded wins over an open dispute and a closed window (the first thing to fix is said first)', () => {
    const w = disputeWindow({
      gradesReleasedAt: released,
      disputeDays: 0,
      graded: false,
      hasOpenDispute: true,
      now: at('2027-01-01T00:00:00Z'),
    })
    expect(w).toMatchObject({ allowed: false, code: 'not-graded' })
  })

  test('one day is said in the singular, zero days says the release closed it', () => {
    const one = disputeWindow({
      gradesReleasedAt: released,
      disputeDays: 1,
      graded: true,
      hasOpenDispute: false,
      now: at('2026-11-22T00:00:00Z'),
    })
    expect(one.allowed ? '' : one.reason).toMatch(/1 day after/)
    const zero = disputeWindow({
      gradesReleasedAt: released,
      disputeDays: 0,
      graded: true,
      hasOpenDispute: false,
      now: released,
    })
    expect(zero.allowed ? '' : zero.reason).toBe('Disputes for this assignment closed when its grades were released.')
  })
})

describe('the same answer on the same variant', () => {
  test.each([
    ['equal', 431.2, 431.2, true],
    ['within 1e-9 relative', 1000, 1000 * (1 + 5e-10), true],
    ['beyond 1e-9 relative', 1000, 1000 * (1 + 2e-9), false],
    ['both zero', 0, 0, true],
    ['zero and tiny', 0, 1e-300, false],
    ['other sign', -520.5, 520.5, false],
    ['not a number', Number.NaN, Number.NaN, false],
  ] as const)('%s', (_name, a, b, same) => {
    expect(sameAnswerValue(a, b)).toBe(same)
    expect(sameAnswerValue(b, a)).toBe(same)
  })

  test('givens compare by name and text, in any order', () => {
    const a = [
      { name: 'p1', text: '100 kPa' },
      { name: 'T1', text: '20 °C' },
    ]
    expect(sameGivens(a, [...a].reverse())).toBe(true)
    expect(
      sameGivens(a, [
        { name: 'p1', text: '100 kPa' },
        { name: 'T1', text: '25 °C' },
      ]),
    ).toBe(false)
    expect(sameGivens(a, [{ name: 'p1', text: '100 kPa' }])).toBe(false)
  })
})

describe('what can be disputed (the answer itself)', () => {
  const base = {
    gradesReleasedAt: null,
    disputeDays: 7,
    graded: true,
    hasOpenDispute: false,
    now: at('2026-11-21T00:00:00Z'),
  }
  test.each([
    [
      'correct with full points',
      {
        latest: { verdict: 'correct', score: 2, maxScore: 2, disputeResolved: false },
        attemptsLeft: 2,
        canStillAnswer: true,
      },
      'full-points',
    ],
    [
      'correct with full points, no attempts left',
      {
        latest: { verdict: 'correct', score: 2, maxScore: 2, disputeResolved: false },
        attemptsLeft: 0,
        canStillAnswer: false,
      },
      'full-points',
    ],
    [
      'correct below full points while attempts remain and the assignment is open',
      {
        latest: { verdict: 'correct', score: 1.6, maxScore: 2, disputeResolved: false },
        attemptsLeft: 2,
        canStillAnswer: true,
      },
      'answer-again',
    ],
    [
      'the latest answer’s dispute was resolved',
      {
        latest: { verdict: 'incorrect', score: 0, maxScore: 2, disputeResolved: true },
        attemptsLeft: 0,
        canStillAnswer: false,
      },
      'already-disputed',
    ],
    [
      'dropped from the course',
      {
        dropped: true,
        latest: { verdict: 'incorrect', score: 0, maxScore: 2, disputeResolved: false },
        attemptsLeft: 0,
        canStillAnswer: false,
      },
      'dropped',
    ],
  ] as const)('refused: %s', (_name, facts, code) => {
    expect(disputeWindow({ ...base, ...facts })).toMatchObject({ allowed: false, code })
  })

  test.each([
    [
      'correct below full points (a late penalty), the assignment closed',
      {
        latest: { verdict: 'correct', score: 1.6, maxScore: 2, disputeResolved: false },
        attemptsLeft: 2,
        canStillAnswer: false,
      },
    ],
    [
      'incorrect while attempts remain',
      {
        latest: { verdict: 'incorrect', score: 0, maxScore: 2, disputeResolved: false },
        attemptsLeft: 2,
        canStillAnswer: true,
      },
    ],
    [
      'incorrect with no attempts left',
      {
        latest: { verdict: 'incorrect', score: 0, maxScore: 2, disputeResolved: false },
        attemptsLeft: 0,
        canStillAnswer: true,
      },
    ],
    [
      'incorrect, attempts left but the assignment closed',
      {
        latest: { verdict: 'incorrect', score: 0, maxScore: 2, disputeResolved: false },
        attemptsLeft: 2,
        canStillAnswer: false,
      },
    ],
  ] as const)('offered: %s', (_name, facts) => {
    expect(disputeWindow({ ...base, ...facts }).allowed).toBe(true)
  })
})
