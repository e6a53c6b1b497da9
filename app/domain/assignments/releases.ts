/**
 * When an instructor may release an assignment's key (manual release) or its grades. Pure:
 * the server reads the facts (the rules, the active students' extensions, what is released)
 * and both the page's offer and the server's refusal come from `releaseChecks`.
 *
 * - Nothing is released before the assignment opens.
 * - The key (manual release) only once every student's window has closed: the due date plus
 *   the late days, each extension included. Before then the page says when that will be.
 * - Grades may be released once the assignment is open; while some students can still
 *   answer, the release must say so explicitly (`early`).
 */
import { lastAcceptedAt, submissionWindow, type AssignmentRules, type StudentExtension } from './policy.ts'

export type ReleaseFacts = {
  rules: AssignmentRules
  /** one entry per active (not dropped) student: their extension, or null */
  students: readonly (StudentExtension | null)[]
  keyReleasedAt: Date | null
  gradesReleasedAt: Date | null
}

export type ReleaseChecks = {
  studentCount: number
  /** the last moment any student's answer is accepted (extensions included), ignoring a manual key release */
  closesAt: Date
  /** active students who may still submit now */
  stillAnswering: number
  key:
    | { state: 'not-manual' }
    | { state: 'released'; at: Date }
    | { state: 'not-yet'; availableAfter: Date; reason: string }
    | { state: 'offered' }
  grades: { state: 'released'; at: Date } | { state: 'not-yet'; reason: string } | { state: 'offered'; early: boolean }
}

export function releaseChecks(
  facts: ReleaseFacts,
  now: Date,
  format: (d: Date) => string = (d) => d.toISOString(),
): ReleaseChecks {
  const { rules } = facts
  let closesAt = lastAcceptedAt(rules, null)
  for (const ext of facts.students) {
    const last = lastAcceptedAt(rules, ext)
    if (last.getTime() > closesAt.getTime()) closesAt = last
  }
  const notOpen = now.getTime() < rules.opensAt.getTime()
  const stillAnswering = facts.students.filter((ext) => {
    const w = submissionWindow({ ...rules, keyReleasedAt: facts.keyReleasedAt }, ext, now)
    return w.state === 'open' || w.state === 'late'
  }).length

  let key: ReleaseChecks['key']
  if (rules.keyRelease !== 'manual') key = { state: 'not-manual' }
  else if (facts.keyReleasedAt) key = { state: 'released', at: facts.keyReleasedAt }
  else if (now.getTime() <= closesAt.getTime()) {
    key = {
      state: 'not-yet',
      availableAfter: closesAt,
      reason: `The key can be released once every student’s window has closed, after ${format(closesAt)} (late days and extensions included).`,
    }
  } else key = { state: 'offered' }

  let grades: ReleaseChecks['grades']
  if (facts.gradesReleasedAt) grades = { state: 'released', at: facts.gradesReleasedAt }
  else if (notOpen)
    grades = {
      state: 'not-yet',
      reason: `The grades can be released once the assignment has opened (${format(rules.opensAt)}).`,
    }
  else grades = { state: 'offered', early: stillAnswering > 0 }

  return { studentCount: facts.students.length, closesAt, stillAnswering, key, grades }
}

export function studentsWord(n: number): string {
  return `${n} student${n === 1 ? '' : 's'}`
}

/** What releasing the grades will do, in one sentence for the confirmation. */
export function gradesReleaseSentence(title: string, studentCount: number): string {
  return `E-mails ${studentsWord(studentCount)} their score for ${title}; this cannot be undone.`
}

/** What releasing the key will do, in one sentence for the confirmation. */
export function keyReleaseSentence(title: string, studentCount: number): string {
  return `Shows the key and worked solutions of ${title} to ${studentCount === 1 ? 'its 1 student' : `all ${studentCount} students`}; this cannot be undone.`
}

/** The early-release checkbox's label. */
export function earlyReleaseLabel(stillAnswering: number): string {
  return `Release before every student’s window closes — ${studentsWord(stillAnswering)} can still answer`
}

/** What deleting an assignment removes, for the confirmation. */
export function deletionSentence(s: { title: string; items: number; extensions: number }): string {
  const parts = [`its ${s.items} problem${s.items === 1 ? '' : 's'} (the bank keeps them)`]
  if (s.extensions > 0) parts.push(`${s.extensions} extension${s.extensions === 1 ? '' : 's'}`)
  return `Deletes “${s.title}” with ${parts.join(' and ')}; this cannot be undone.`
}
