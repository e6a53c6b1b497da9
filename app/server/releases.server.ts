/**
 * Releasing an assignment's key (manual release) and its grades. Both cannot be undone, so
 * both need `confirmed` (the page's second submit carries confirm=yes) and both follow
 * `releaseChecks` (app/domain/assignments/releases.ts), the same rule the page's offer uses:
 * nothing before the assignment opens; the key once every active student's window has closed;
 * grades before then only with `early`. The grade release queues one e-mail per active student
 * in the transaction that records it, so it is sent once. Each release writes an audit row.
 */
import { and, eq, inArray, isNull } from 'drizzle-orm'
import { rulesOf } from '#app/domain/assignments/policy.ts'
import { releaseChecks, studentsWord, type ReleaseChecks } from '#app/domain/assignments/releases.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { formatScore } from '#app/lib/points.ts'
import { AssignmentPermissionError, courseZone, findAssignment, requireInstructor } from './assignment-access.server.ts'
import type { Db, Tx } from './db/client.server.ts'
import { assignments, auditEvents, extensions, memberships, users, type Assignment } from './db/schema.server.ts'
import { linkMail } from './email.server.ts'
import { appUrl } from './env.server.ts'
import { orErrorPage, PageError } from './error-page.server.ts'
import { listAssignmentTotals } from './grading.server.ts'
import { enqueue, withJobTransaction } from './queue.server.ts'

type Database = Db | Tx

/** A release the rules do not allow now, or one not confirmed: a 400 with the reason. */
export class ReleaseRefusedError extends PageError {
  constructor(message: string) {
    super(message, 400)
    this.name = 'ReleaseRefusedError'
  }
}

export const NOT_CONFIRMED =
  'Nothing was released: a release cannot be undone, so it needs the confirmation step. Use the button on the assignment page and confirm.'

/** The active (not dropped) students of the course, each with their extension on this assignment. */
async function activeStudents(database: Database, a: Assignment) {
  return database
    .select({ userId: memberships.userId, dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts })
    .from(memberships)
    .leftJoin(extensions, and(eq(extensions.userId, memberships.userId), eq(extensions.assignmentId, a.id)))
    .where(and(eq(memberships.courseId, a.courseId), eq(memberships.role, 'student'), isNull(memberships.droppedAt)))
}

async function checksFor(
  database: Database,
  a: Assignment,
  timeZone: string,
  now: Date,
): Promise<ReleaseChecks & { studentIds: number[] }> {
  const students = await activeStudents(database, a)
  const checks = releaseChecks(
    {
      rules: rulesOf(a),
      students: students.map((s) =>
        s.dueAt === null && s.extraAttempts === null ? null : { dueAt: s.dueAt, extraAttempts: s.extraAttempts ?? 0 },
      ),
      keyReleasedAt: a.keyReleasedAt,
      gradesReleasedAt: a.gradesReleasedAt,
    },
    now,
    (d) => formatInZone(d, timeZone),
  )
  return { ...checks, studentIds: students.map((s) => s.userId) }
}

/** What the assignment page may offer now: the same checks the releases below apply. */
export async function getReleaseChecks(
  database: Database,
  opts: { courseId: number; assignmentId: number; now?: Date },
): Promise<ReleaseChecks> {
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const { studentIds: _ids, ...checks } = await checksFor(database, a, timeZone, opts.now ?? new Date())
  return checks
}

export type ReleaseResult = { released: boolean; at: Date }

/**
 * Releases the key and worked solutions now (manual release only), once every student's window
 * has closed and the release is confirmed. Releasing again changes nothing.
 */
export async function releaseKey(
  database: Db,
  opts: { courseId: number; assignmentId: number; actorId: number; confirmed: boolean; now?: Date },
): Promise<ReleaseResult> {
  await requireInstructor(database, opts.actorId, opts.courseId)
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  if (a.keyRelease !== 'manual')
    throw new AssignmentPermissionError(
      'This assignment releases its key after the due date; change that setting to release it by hand.',
    )
  const now = opts.now ?? new Date()
  if (a.keyReleasedAt) return { released: false, at: a.keyReleasedAt }
  const { timeZone } = await courseZone(database, opts.courseId)
  const checks = await checksFor(database, a, timeZone, now)
  if (checks.key.state === 'not-yet') throw new ReleaseRefusedError(`Nothing was released. ${checks.key.reason}`)
  if (!opts.confirmed) throw new ReleaseRefusedError(NOT_CONFIRMED)
  return database.transaction(async (tx) => {
    const [row] = await tx
      .update(assignments)
      .set({ keyReleasedAt: now })
      .where(and(eq(assignments.id, a.id), isNull(assignments.keyReleasedAt)))
      .returning({ at: assignments.keyReleasedAt })
    if (!row) return { released: false, at: a.keyReleasedAt ?? now }
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      assignmentId: a.id,
      kind: 'key-released',
      before: { keyReleasedAt: null },
      after: { keyReleasedAt: now.toISOString() },
    })
    return { released: true, at: now }
  })
}

export type GradeReleaseResult = { released: boolean; at: Date; mailed: number }

/**
 * Releases the grades and, in the same transaction, queues one e-mail per active student with
 * their score and a link. Refused before the assignment opens, without `confirmed`, and while
 * students can still answer unless `early`. Only the first release sends: the update matches
 * while gradesReleasedAt is still null, so a second (or concurrent) release queues nothing.
 */
export async function releaseGrades(
  database: Db,
  opts: {
    courseId: number
    assignmentId: number
    actorId: number
    confirmed: boolean
    early?: boolean
    baseUrl?: string
    now?: Date
  },
): Promise<GradeReleaseResult> {
  await requireInstructor(database, opts.actorId, opts.courseId)
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const course = await courseZone(database, opts.courseId)
  const now = opts.now ?? new Date()
  if (a.gradesReleasedAt) return { released: false, at: a.gradesReleasedAt, mailed: 0 }
  const checks = await checksFor(database, a, course.timeZone, now)
  if (checks.grades.state === 'not-yet') throw new ReleaseRefusedError(`Nothing was released. ${checks.grades.reason}`)
  if (!opts.confirmed) throw new ReleaseRefusedError(NOT_CONFIRMED)
  if (checks.stillAnswering > 0 && !opts.early) {
    throw new ReleaseRefusedError(
      `Nothing was released: ${studentsWord(checks.stillAnswering)} can still answer. To release anyway, tick “Release before every student’s window closes”.`,
    )
  }
  const link = `${(opts.baseUrl ?? appUrl()).replace(/\/$/, '')}/courses/${opts.courseId}/assignments/${a.id}`
  const active = new Set(checks.studentIds)
  return withJobTransaction(database, async (tx, jobs) => {
    const [row] = await tx
      .update(assignments)
      .set({ gradesReleasedAt: now })
      .where(and(eq(assignments.id, a.id), isNull(assignments.gradesReleasedAt)))
      .returning({ id: assignments.id })
    if (!row) return { released: false, at: a.gradesReleasedAt ?? now, mailed: 0 }
    const totals = (await listAssignmentTotals(tx, { courseIds: [opts.courseId], assignmentIds: [a.id] })).filter((t) =>
      active.has(t.userId),
    )
    const people = totals.length
      ? await tx
          .select({ id: users.id, email: users.email, name: users.name })
          .from(users)
          .where(
            inArray(
              users.id,
              totals.map((t) => t.userId),
            ),
          )
      : []
    const byId = new Map(people.map((p) => [p.id, p]))
    let mailed = 0
    for (const t of totals) {
      const person = byId.get(t.userId)
      if (!person) continue
      const mail = linkMail({
        to: person.email,
        subject: `${course.code}: grades released for ${a.title}`,
        lines: [
          `Hello ${person.name},`,
          `The grades for ${a.title} in ${course.code} ${course.title} have been released.`,
          `Your score: ${formatScore(t.score, t.maxScore)} points.`,
          ...(t.pending > 0
            ? [
                `${t.pending} of your answers were still being graded when the grades were released; the page shows the final score.`,
              ]
            : []),
        ],
        link,
        linkLabel: 'See the assignment',
      })
      await enqueue('send-mail', { v: 1, ...mail }, { connection: jobs })
      mailed++
    }
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      assignmentId: a.id,
      kind: 'grades-released',
      before: { gradesReleasedAt: null },
      after: { gradesReleasedAt: now.toISOString(), mailed, early: checks.stillAnswering > 0 },
    })
    return { released: true, at: now, mailed }
  })
}

/** Awaits `work`, turning a refused release (400) and the assignment module's errors (403/404) into the error page. */
export const orReleaseErrorPage = orErrorPage
