import { apiIdParam, jsonError } from '#app/server/api-guard.server.ts'
import { requireApiAssignmentStaff } from '#app/server/course-api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAssignmentGradebook, gradebookViewProblem, readGradebookView } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/api-assignment-gradebook'

/**
 * GET /api/assignments/:assignmentId/gradebook?section=&status=&q=&sort=&dir= — the assignment
 * gradebook as JSON for course staff; the page polls it while answers are being graded.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const assignmentId = apiIdParam(params.assignmentId, 'assignment')
  const { courseId } = await requireApiAssignmentStaff(request, db(), assignmentId)
  const url = new URL(request.url)
  const odd = gradebookViewProblem(url)
  if (odd) return jsonError(400, odd.message)
  const gradebook = await getAssignmentGradebook(db(), { assignmentId, courseId, view: readGradebookView(url) })
  if (!gradebook) return jsonError(404, 'There is no such assignment.')
  return Response.json(gradebook, { headers: { 'Cache-Control': 'no-store' } })
}
