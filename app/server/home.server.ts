/**
 * What the home page tells each person to do next, per course:
 * - students: what is due and when (next due first), their score so far, the time left, in
 *   the course's zone, late ones flagged; and what opens next;
 * - TAs: the open disputes waiting in the review queue (count, oldest first);
 * - instructors: open disputes, assignments past due whose grades are not released, pending
 *   invitations, and checks of their bank problems that failed.
 * Times in words are made here, with one `now`, so the page and its hydration agree.
 */
import { and, asc, eq, gt, inArray, isNull, sql } from 'drizzle-orm'
import { formatInZone } from '#app/lib/dates.ts'
import { formatScore } from '#app/lib/points.ts'
import { listAssignmentsForCourse } from './assignments.server.ts'
import type { Db, Tx } from './db/client.server.ts'
import {
  accessTokens,
  assignments,
  disputes,
  memberships,
  problems,
  problemSweeps,
  problemVersions,
} from './db/schema.server.ts'
import type { SignedInUser } from './users.server.ts'

type Database = Db | Tx

export type DueRow = {
  assignmentId: number
  title: string
  href: string
  dueText: string
  /** "3 days 4 hours left", or for a late one "late: accepted for 1 more day" */
  timeLeft: string
  late: boolean
  progress: string
  dueAt: string
}

export type StudentCourseHome = {
  courseId: number
  code: string
  title: string
  timeZone: string
  due: DueRow[]
  opening: { title: string; opensText: string }[]
  dropped: boolean
}
export type StaffCourseHome = {
  courseId: number
  code: string
  title: string
  role: 'ta' | 'instructor'
  openDisputes: number
  oldestDisputeText: string | null
  reviewHref: string
  /** instructors only */
  unreleased: { assignmentId: number; title: string; href: string; dueText: string }[]
  pendingInvitations: number
}
export type FailedCheck = { problemId: number; title: string; failed: number; total: number; status: string }

export type HomeData = { student: StudentCourseHome[]; staff: StaffCourseHome[]; failedChecks: FailedCheck[] }

/** "2 days 3 hours", "5 hours 10 minutes", "12 minutes": the two largest units. */
export function durationText(ms: number): string {
  const minutes = Math.max(0, Math.floor(ms / 60_000))
  const days = Math.floor(minutes / 1440)
  const hours = Math.floor((minutes % 1440) / 60)
  const mins = minutes % 60
  const unit = (n: number, w: string) => `${n} ${w}${n === 1 ? '' : 's'}`
  if (days > 0) return hours > 0 ? `${unit(days, 'day')} ${unit(hours, 'hour')}` : unit(days, 'day')
  if (hours > 0) return mins > 0 ? `${unit(hours, 'hour')} ${unit(mins, 'minute')}` : unit(hours, 'hour')
  return mins > 0 ? unit(mins, 'minute') : 'less than a minute'
}

async function studentCourse(
  database: Database,
  user: SignedInUser,
  c: SignedInUser['courses'][number],
  dropped: boolean,
  now: Date,
): Promise<StudentCourseHome> {
  const base = { courseId: c.id, code: c.code, title: c.title, timeZone: c.timeZone, dropped }
  if (dropped) return { ...base, due: [], opening: [] }
  const list = await listAssignmentsForCourse(database, { courseId: c.id, role: 'student', userId: user.id, now })
  const due: DueRow[] = []
  for (const a of list) {
    const w = a.mine?.window
    if (!w || (w.state !== 'open' && w.state !== 'late')) continue
    const late = w.state === 'late'
    due.push({
      assignmentId: a.id,
      title: a.title,
      href: `/courses/${c.id}/assignments/${a.id}`,
      dueText: formatInZone(a.dueAt, c.timeZone),
      timeLeft: late
        ? `late: accepted for ${durationText(w.until.getTime() - now.getTime())} more, with a penalty`
        : `${durationText(a.dueAt.getTime() - now.getTime())} left`,
      late,
      progress: `${formatScore(a.mine!.score, a.maxScore)} points so far${a.mine!.pending > 0 ? ' (some answers are being graded)' : ''}`,
      dueAt: a.dueAt.toISOString(),
    })
  }
  due.sort((x, y) => x.dueAt.localeCompare(y.dueAt))
  const upcoming = await database
    .select({ title: assignments.title, opensAt: assignments.opensAt })
    .from(assignments)
    .where(and(eq(assignments.courseId, c.id), gt(assignments.opensAt, now)))
    .orderBy(asc(assignments.opensAt))
    .limit(3)
  return {
    ...base,
    due,
    opening: upcoming.map((u) => ({ title: u.title, opensText: formatInZone(u.opensAt, c.timeZone) })),
  }
}

export async function getHomeData(database: Database, user: SignedInUser, now = new Date()): Promise<HomeData> {
  const courseIds = user.courses.map((c) => c.id)
  const droppedRows = courseIds.length
    ? await database
        .select({ courseId: memberships.courseId, droppedAt: memberships.droppedAt })
        .from(memberships)
        .where(and(eq(memberships.userId, user.id), inArray(memberships.courseId, courseIds)))
    : []
  const droppedIn = new Set(droppedRows.filter((r) => r.droppedAt !== null).map((r) => r.courseId))

  const student: StudentCourseHome[] = []
  for (const c of user.courses.filter((x) => x.role === 'student'))
    student.push(await studentCourse(database, user, c, droppedIn.has(c.id), now))
  // The course with the next due date first; courses with nothing due after.
  student.sort(
    (a, b) => (a.due[0]?.dueAt ?? '9999').localeCompare(b.due[0]?.dueAt ?? '9999') || a.code.localeCompare(b.code),
  )

  const staffCourses = user.courses.filter(
    (c): c is typeof c & { role: 'ta' | 'instructor' } => c.role === 'ta' || c.role === 'instructor',
  )
  const staff: StaffCourseHome[] = []
  for (const c of staffCourses) {
    const [open] = await database
      .select({ n: sql<number>`count(*)::int`, oldest: sql<Date | null>`min(${disputes.createdAt})` })
      .from(disputes)
      .where(and(eq(disputes.courseId, c.id), eq(disputes.status, 'open')))
    const oldest = open?.oldest ? new Date(open.oldest) : null
    let unreleased: StaffCourseHome['unreleased'] = []
    let pendingInvitations = 0
    if (c.role === 'instructor') {
      const rows = await database
        .select({ id: assignments.id, title: assignments.title, dueAt: assignments.dueAt })
        .from(assignments)
        .where(
          and(
            eq(assignments.courseId, c.id),
            isNull(assignments.gradesReleasedAt),
            sql`${assignments.dueAt} < ${now.toISOString()}`,
          ),
        )
        .orderBy(asc(assignments.dueAt))
      unreleased = rows.map((r) => ({
        assignmentId: r.id,
        title: r.title,
        href: `/courses/${c.id}/assignments/${r.id}`,
        dueText: formatInZone(r.dueAt, c.timeZone),
      }))
      const [inv] = await database
        .select({ n: sql<number>`count(*)::int` })
        .from(accessTokens)
        .where(
          and(
            eq(accessTokens.courseId, c.id),
            eq(accessTokens.purpose, 'invitation'),
            isNull(accessTokens.usedAt),
            isNull(accessTokens.revokedAt),
            gt(accessTokens.expiresAt, now),
          ),
        )
      pendingInvitations = inv?.n ?? 0
    }
    staff.push({
      courseId: c.id,
      code: c.code,
      title: c.title,
      role: c.role,
      openDisputes: open?.n ?? 0,
      oldestDisputeText: oldest ? `the oldest waiting since ${formatInZone(oldest, c.timeZone)}` : null,
      reviewHref: `/courses/${c.id}/disputes`,
      unreleased,
      pendingInvitations,
    })
  }

  // Checks of the instructor's own bank problems: the latest check of each problem's newest version, when it found failures.
  let failedChecks: FailedCheck[] = []
  if (staffCourses.some((c) => c.role === 'instructor') || user.isAdmin) {
    const r = await database.execute<{
      problem_id: number
      title: string
      failed: number
      total: number
      status: string
    }>(sql`
      select distinct on (p.id) p.id as problem_id, p.title, s.failed, s.total, s.status
      from ${problems} p
      join ${problemVersions} v on v.problem_id = p.id
      join ${problemSweeps} s on s.problem_version_id = v.id
      where p.owner_id = ${user.id} and p.archived_at is null
        and v.number = (select max(v2.number) from ${problemVersions} v2 where v2.problem_id = p.id)
      order by p.id, s.id desc`)
    failedChecks = r.rows
      .filter((x) => x.status === 'failed' || (x.status === 'done' && Number(x.failed) > 0))
      .map((x) => ({
        problemId: Number(x.problem_id),
        title: x.title,
        failed: Number(x.failed),
        total: Number(x.total),
        status: x.status,
      }))
  }
  return { student, staff, failedChecks }
}
