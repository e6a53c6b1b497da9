/**
 * Guards for the course staff's JSON routes under /api/ (gradebooks, statistics, answers):
 * the page rules (instructor or TA of the course) answered as JSON 401/403/404, so a
 * client-side query can show a plain message instead of a sign-in page.
 */
import { eq } from 'drizzle-orm'
import { canSeeCourseAsStaff } from '#app/domain/permissions.ts'
import { jsonError } from './api-guard.server.ts'
import { getUser } from './auth.server.ts'
import type { Db } from './db/client.server.ts'
import { assignments } from './db/schema.server.ts'
import { toActor, type SignedInUser } from './users.server.ts'

export type StaffCourse = SignedInUser['courses'][number]

/** The signed-in instructor or TA of `courseId` and the course, or a thrown JSON 401/403. */
export async function requireApiCourseStaff(
  request: Request,
  courseId: number,
): Promise<{ user: SignedInUser; course: StaffCourse }> {
  const user = await getUser(request)
  if (!user) throw jsonError(401, 'Sign in to see this course’s grades.')
  return { user, course: staffCourse(user, courseId) }
}

function staffCourse(user: SignedInUser, courseId: number): StaffCourse {
  const course = user.courses.find((c) => c.id === courseId)
  if (!course || !canSeeCourseAsStaff(toActor(user), courseId))
    throw jsonError(403, 'Only the course’s instructors and teaching assistants can see its grades.')
  return course
}

/**
 * The staff member and the course of an assignment, or a thrown JSON 401/404/403. Signing in
 * comes first so that nobody learns which assignments exist without an account.
 */
export async function requireApiAssignmentStaff(request: Request, database: Db, assignmentId: number) {
  const user = await getUser(request)
  if (!user) throw jsonError(401, 'Sign in to see this course’s grades.')
  const [row] = await database
    .select({ courseId: assignments.courseId })
    .from(assignments)
    .where(eq(assignments.id, assignmentId))
    .limit(1)
  if (!row) throw jsonError(404, 'There is no such assignment.')
  return { user, course: staffCourse(user, row.courseId), courseId: row.courseId }
}
