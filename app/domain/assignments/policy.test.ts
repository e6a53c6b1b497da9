import { describe, expect, test } from 'vitest'
import {
  attemptsAllowed,
  type AssignmentRules,
  daysLate,
  isKeyReleased,
  lastAcceptedAt,
  latePenalty,
  studentDueAt,
  submissionWindow,
  windowMessage,
} from './policy.ts'

const opensAt = new Date('2026-03-01T12:00:00Z')
const dueAt = new Date('2026-03-08T23:59:00Z')
const closed: AssignmentRules = {
  opensAt,
  dueAt,
  attemptsPerFind: 3,
  latePolicy: 'closed',
  latePenaltyPercentPerDay: 0,
  lateDaysAllowed: 0,
  keyRelease: 'after-due',
  keyReleasedAt: null,
}
const penalty: AssignmentRules = { ...closed, latePolicy: 'penalty', latePenaltyPercentPerDay: 10, lateDaysAllowed: 3 }
const at = (iso: string) => new Date(iso)

describe('submission window', () => {
  test.each([
    ['before it opens', closed, '2026-03-01T11:59:59Z', 'not-open'],
    ['at the opening instant', closed, '2026-03-01T12:00:00Z', 'open'],
    ['at the due instant (inclusive)', closed, '2026-03-08T23:59:00Z', 'open'],
    ['a second after due, closed policy', closed, '2026-03-08T23:59:01Z', 'closed'],
    ['a second after due, penalty policy', penalty, '2026-03-08T23:59:01Z', 'late'],
    ['at the end of the late window', penalty, '2026-03-11T23:59:00Z', 'late'],
    ['after the late window', penalty, '2026-03-11T23:59:01Z', 'closed'],
  ] as const)('%s', (_name, rules, now, state) => {
    expect(submissionWindow(rules, null, at(now)).state).toBe(state)
  })

  test('an extension moves the due date for that student only', () => {
    const ext = { dueAt: at('2026-03-10T23:59:00Z'), extraAttempts: 0 }
    expect(submissionWindow(closed, ext, at('2026-03-09T12:00:00Z')).state).toBe('open')
    expect(submissionWindow(closed, null, at('2026-03-09T12:00:00Z')).state).toBe('closed')
    expect(studentDueAt(closed, ext)).toEqual(ext.dueAt)
    expect(studentDueAt(closed, { dueAt: null, extraAttempts: 2 })).toEqual(dueAt)
  })

  test('a manually released key closes submissions even before the due date', () => {
    const rules: AssignmentRules = { ...closed, keyRelease: 'manual', keyReleasedAt: at('2026-03-05T00:00:00Z') }
    const w = submissionWindow(rules, null, at('2026-03-06T00:00:00Z'))
    expect(w).toMatchObject({ state: 'closed', reason: 'key-released' })
    expect(submissionWindow(rules, null, at('2026-03-04T00:00:00Z')).state).toBe('open')
  })
})

describe('late penalty', () => {
  test.each([
    ['on time', '2026-03-08T23:59:00Z', 0, 0],
    ['one minute late counts as a day', '2026-03-09T00:00:00Z', 1, 0.1],
    ['exactly one day late', '2026-03-09T23:59:00Z', 1, 0.1],
    ['one day and a second', '2026-03-09T23:59:01Z', 2, 0.2],
    ['three days', '2026-03-11T23:59:00Z', 3, 0.3],
  ])('%s', (_name, when, days, share) => {
    expect(daysLate(penalty, null, at(when))).toBe(days)
    expect(latePenalty(penalty, null, at(when))).toBeCloseTo(share, 12)
  })

  test('is capped at the whole of the points', () => {
    const steep: AssignmentRules = { ...penalty, latePenaltyPercentPerDay: 60, lateDaysAllowed: 5 }
    expect(latePenalty(steep, null, at('2026-03-10T23:59:00Z'))).toBe(1)
  })

  test('the closed policy never charges (nothing late is accepted)', () => {
    expect(latePenalty({ ...closed, latePenaltyPercentPerDay: 50 }, null, at('2026-03-09T23:59:00Z'))).toBe(0)
  })

  test('counts from the extended due date', () => {
    const ext = { dueAt: at('2026-03-10T23:59:00Z'), extraAttempts: 0 }
    expect(daysLate(penalty, ext, at('2026-03-10T23:59:00Z'))).toBe(0)
    expect(daysLate(penalty, ext, at('2026-03-11T00:00:00Z'))).toBe(1)
  })
})

describe('attempts and key', () => {
  test('extra attempts add to the assignment’s', () => {
    expect(attemptsAllowed(closed, null)).toBe(3)
    expect(attemptsAllowed(closed, { dueAt: null, extraAttempts: 2 })).toBe(5)
    expect(attemptsAllowed(closed, { dueAt: null, extraAttempts: -4 })).toBe(3)
  })

  test('after-due releases the key once the late window is over', () => {
    expect(lastAcceptedAt(penalty, null)).toEqual(at('2026-03-11T23:59:00Z'))
    expect(isKeyReleased(penalty, null, at('2026-03-10T00:00:00Z'))).toBe(false)
    expect(isKeyReleased(penalty, null, at('2026-03-12T00:00:00Z'))).toBe(true)
    expect(isKeyReleased(closed, null, at('2026-03-09T00:00:00Z'))).toBe(true)
  })

  test('a student with an extension does not see the key before their own due date', () => {
    const ext = { dueAt: at('2026-03-12T23:59:00Z'), extraAttempts: 0 }
    expect(isKeyReleased(closed, ext, at('2026-03-10T00:00:00Z'))).toBe(false)
  })

  test('manual release waits for the instructor', () => {
    const manual: AssignmentRules = { ...closed, keyRelease: 'manual' }
    expect(isKeyReleased(manual, null, at('2027-01-01T00:00:00Z'))).toBe(false)
    expect(
      isKeyReleased({ ...manual, keyReleasedAt: at('2026-03-09T00:00:00Z') }, null, at('2026-03-09T00:00:01Z')),
    ).toBe(true)
  })
})

test('window messages state the terms in words', () => {
  const fmt = (d: Date) => d.toISOString().slice(0, 16)
  expect(windowMessage(submissionWindow(penalty, null, at('2026-03-09T06:00:00Z')), fmt)).toBe(
    'The due date (2026-03-08T23:59) has passed. Answers are accepted until 2026-03-11T23:59; they are 1 day late now and lose 10 % of their points.',
  )
  expect(windowMessage(submissionWindow(closed, null, at('2026-03-09T06:00:00Z')), fmt)).toBe(
    'This assignment closed on 2026-03-08T23:59 and no longer accepts answers.',
  )
})
