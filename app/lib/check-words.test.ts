import { describe, expect, test } from 'vitest'
import { checkOfSweep, checkWords, needsOverride, overrideLabel, refusalText } from './check-words.ts'

describe('a version’s check in words', () => {
  test('only a finished sweep with no failure passes', () => {
    expect(checkOfSweep({ status: 'done', total: 500, checked: 500, failed: 0 })).toEqual({
      state: 'passed',
      total: 500,
      checked: 500,
      failed: 0,
    })
    expect(checkOfSweep({ status: 'done', total: 500, checked: 500, failed: 83 }).state).toBe('failed')
    expect(checkOfSweep({ status: 'failed', total: 500, checked: 12, failed: 0 }).state).toBe('broken')
    expect(checkOfSweep({ status: 'queued', total: 500, checked: 0, failed: 0 }).state).toBe('running')
    expect(checkOfSweep({ status: 'running', total: 500, checked: 40, failed: 3 }).state).toBe('running')
    expect(checkOfSweep(undefined)).toEqual({ state: 'never' })
    expect(needsOverride(checkOfSweep({ status: 'done', total: 500, checked: 500, failed: 0 }))).toBe(false)
    for (const s of ['failed', 'broken', 'running', 'never'] as const)
      expect(needsOverride(s === 'never' ? { state: s } : { state: s, total: 1, checked: 1, failed: 1 })).toBe(true)
  })

  test('the words say the numbers, singular or plural', () => {
    expect(checkWords({ state: 'passed', total: 500, checked: 500, failed: 0 })).toBe(
      'Checked: 500 of 500 variants passed',
    )
    expect(checkWords({ state: 'failed', total: 500, checked: 500, failed: 83 })).toBe(
      'Check failed: 83 of 500 variants',
    )
    expect(checkWords({ state: 'running', total: 1, checked: 0, failed: 0 })).toBe(
      'Check running: 0 of 1 variant so far',
    )
    expect(checkWords({ state: 'never' })).toBe('Never checked')
    expect(checkWords({ state: 'broken', total: 500, checked: 3, failed: 0 })).toBe('Check could not run')
    expect(overrideLabel({ state: 'failed', total: 500, checked: 500, failed: 83 })).toBe(
      'Assign although the check failed (83 of 500 variants)',
    )
    expect(refusalText({ state: 'never' })).toBe(
      'Never checked. Choose a version whose check passed, or tick “Assign although the version was never checked” to assign it anyway.',
    )
  })
})

describe('the audit log', () => {
  test('an override reads as the versions assigned over their check, with the check’s words', async () => {
    const { describeAuditEntry } = await import('./audit-words.ts')
    const entry = {
      kind: 'assignment-check-overridden',
      before: {},
      after: { items: [{ position: 2, versionId: 9, check: 'Check failed: 83 of 500 variants' }] },
      note: 'Problem 2 assigned although: Check failed: 83 of 500 variants',
      subject: null,
      assignmentTitle: 'Week 9',
      assignmentDueAt: null,
      question: null,
      maxScore: null,
      regrade: null,
    }
    const d = describeAuditEntry(entry as never, { timeZone: 'UTC' } as never)
    expect(d.what).toBe('“Week 9”: a version assigned although the check did not pass')
    expect(d.change).toBe('problem 2: Check failed: 83 of 500 variants')
  })
})
