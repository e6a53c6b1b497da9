/**
 * Who may do what to an assignment, and finding it: the errors the assignment pages answer
 * with (404, 403, 409; orErrorPage in error-page.server.ts turns them into the error page),
 * the course's zone, and an assignment of the course by id.
 */
import { and, eq } from 'drizzle-orm'
import type { CourseRole } from '#app/domain/permissions.ts'
import { formatInZone } from '#app/lib/dates.ts'
import type { Db, Tx } from './db/client.server.ts'
import { assignments, courses, memberships, type Assignment } from './db/schema.server.ts'
import { PageError } from './error-page.server.ts'

type Database = Db | Tx

/** The assignment does not exist in this course, or (for a student) has not opened yet. */
export class AssignmentNotFoundError extends PageError {
  constructor(message = 'There is no such assignment in this course.') {
    super(message, 404)
    this.name = 'AssignmentNotFoundError'
  }
}

/** A student asked for an assignment that has not opened yet: the message says when it opens. */
export class AssignmentNotOpenError extends AssignmentNotFoundError {
  constructor(readonly opening: NotOpenInfo) {
    super(notOpenSentence(opening))
    this.name = 'AssignmentNotOpenError'
  }
}

export type NotOpenInfo = { title: string; opensAt: Date; timeZone: string }

export function notOpenSentence(o: NotOpenInfo): string {
  return `“${o.title}” opens ${formatInZone(o.opensAt, o.timeZone)}. Its problems appear here then.`
}

/** The assignment's title and opening when it exists in the course and has not opened yet; null otherwise. */
export async function notYetOpen(
  database: Database,
  opts: { courseId: number; assignmentId: number; now?: Date },
): Promise<NotOpenInfo | null> {
  if (!Number.isInteger(opts.assignmentId) || opts.assignmentId <= 0) return null
  const [row] = await database
    .select({ title: assignments.title, opensAt: assignments.opensAt, timeZone: courses.timeZone })
    .from(assignments)
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .where(and(eq(assignments.id, opts.assignmentId), eq(assignments.courseId, opts.courseId)))
    .limit(1)
  if (!row || row.opensAt.getTime() <= (opts.now ?? new Date()).getTime()) return null
  return row
}

/** The person may not do this to the assignment (only instructors change assignments). */
export class AssignmentPermissionError extends PageError {
  constructor(message = 'Only the course’s instructors can change its assignments.') {
    super(message, 403)
    this.name = 'AssignmentPermissionError'
  }
}

/** The assignment cannot be deleted: somebody has answered it. */
export class AssignmentInUseError extends PageError {
  constructor(message: string, status: 400 | 409 = 409) {
    super(message, status)
    this.name = 'AssignmentInUseError'
  }
}

export async function roleInCourse(database: Database, userId: number, courseId: number): Promise<CourseRole | null> {
  const [row] = await database
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), eq(memberships.courseId, courseId)))
    .limit(1)
  return row?.role ?? null
}

export async function requireInstructor(database: Database, userId: number, courseId: number) {
  if ((await roleInCourse(database, userId, courseId)) !== 'instructor') throw new AssignmentPermissionError()
}

export async function courseZone(database: Database, courseId: number) {
  const [row] = await database
    .select({ timeZone: courses.timeZone, code: courses.code, title: courses.title })
    .from(courses)
    .where(eq(courses.id, courseId))
    .limit(1)
  if (!row) throw new AssignmentNotFoundError('There is no such course.')
  return row
}

export async function findAssignment(database: Database, courseId: number, assignmentId: number): Promise<Assignment> {
  if (!Number.isInteger(assignmentId) || assignmentId <= 0) throw new AssignmentNotFoundError()
  const [row] = await database
    .select()
    .from(assignments)
    .where(and(eq(assignments.id, assignmentId), eq(assignments.courseId, courseId)))
    .limit(1)
  if (!row) throw new AssignmentNotFoundError()
  return row
}
