import { apiIdParam, jsonError } from '#app/server/api-guard.server.ts'
import { getUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { findAssignmentCourseId, getMyResults } from '#app/server/submissions.server.ts'
import type { Route } from './+types/api-my-results'

/**
 * GET /api/assignments/:assignmentId/problems/:position/mine — the signed-in student's own
 * results on one problem (MyResults), polled by the problem page while grading runs.
 *
 * The URL names no course: the assignment's course comes from the database, and only a
 * student of that course gets an answer. Any other assignment — missing, of a course the
 * person is not a student in, or not open yet — answers 404 and says nothing about whether
 * it exists.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await getUser(request)
  if (!user) return jsonError(401, 'Sign in to see your results.')
  const assignmentId = apiIdParam(params.assignmentId, 'assignment')
  const position = apiIdParam(params.position, 'problem')
  if (!user.courses.some((c) => c.role === 'student')) return jsonError(403, 'Only students have results to show here.')
  const courseId = await findAssignmentCourseId(db(), assignmentId)
  const course = user.courses.find((c) => c.id === courseId && c.role === 'student')
  if (course) {
    const results = await getMyResults(db(), { courseId: course.id, assignmentId, position, userId: user.id })
    if (results) return Response.json(results, { headers: { 'Cache-Control': 'no-store' } })
  }
  return jsonError(404, 'There is no such problem in your courses.')
}
