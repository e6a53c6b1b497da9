/**
 * A version's latest check (sweep) in words, for the assignment picker and the server's
 * refusal (issue #15). Pure: app/server/assignment-items.server.ts reads the checks.
 */
import { isRecord } from '#app/lib/guards.ts'

export type VersionCheck =
  | { state: 'passed'; total: number; checked: number; failed: 0 }
  | { state: 'failed'; total: number; checked: number; failed: number }
  | { state: 'broken'; total: number; checked: number; failed: number }
  | { state: 'running'; total: number; checked: number; failed: number }
  | { state: 'never' }

export const NEVER_CHECKED: VersionCheck = { state: 'never' }

/** Whether a value read from JSON (the version-check route's answer) is a check result. */
export function isVersionCheck(x: unknown): x is VersionCheck {
  if (!isRecord(x)) return false
  if (x.state === 'never') return true
  const counts = [x.total, x.checked, x.failed].every((n) => typeof n === 'number' && Number.isFinite(n))
  if (x.state === 'passed') return counts && x.failed === 0
  return counts && (x.state === 'failed' || x.state === 'broken' || x.state === 'running')
}

type SweepRow = { status: 'queued' | 'running' | 'done' | 'failed'; total: number; checked: number; failed: number }

/** A sweep row as a check result: done with no failure is the only pass. */
export function checkOfSweep(s: SweepRow | undefined): VersionCheck {
  if (!s) return NEVER_CHECKED
  if (s.status === 'queued' || s.status === 'running')
    return { state: 'running', total: s.total, checked: s.checked, failed: s.failed }
  if (s.status === 'failed') return { state: 'broken', total: s.total, checked: s.checked, failed: s.failed }
  if (s.failed > 0) return { state: 'failed', total: s.total, checked: s.checked, failed: s.failed }
  return { state: 'passed', total: s.total, checked: s.checked, failed: 0 }
}

const variants = (n: number) => `${n} variant${n === 1 ? '' : 's'}`

/** The check result as the picker says it. */
export function checkWords(c: VersionCheck): string {
  switch (c.state) {
    case 'passed':
      return `Checked: ${c.checked} of ${variants(c.total)} passed`
    case 'failed':
      return `Check failed: ${c.failed} of ${variants(c.checked)}`
    case 'broken':
      return 'Check could not run'
    case 'running':
      return `Check running: ${c.checked} of ${variants(c.total)} so far`
    case 'never':
      return 'Never checked'
  }
}

/** Only a finished check with no failure lets a version be assigned without an override. */
export function needsOverride(c: VersionCheck): boolean {
  return c.state !== 'passed'
}

/** The override checkbox's label, naming the reason. */
export function overrideLabel(c: VersionCheck): string {
  switch (c.state) {
    case 'passed':
      return ''
    case 'failed':
      return `Assign although the check failed (${c.failed} of ${variants(c.checked)})`
    case 'broken':
      return 'Assign although the check could not run'
    case 'running':
      return 'Assign although the check has not finished'
    case 'never':
      return 'Assign although the version was never checked'
  }
}

/** The refusal next to the row's field. */
export function refusalText(c: VersionCheck): string {
  return `${checkWords(c)}. Choose a version whose check passed, or tick “${overrideLabel(c)}” to assign it anyway.`
}
