import { apiIdParam, jsonError } from '#app/server/api-guard.server.ts'
import { requireApiAssignmentStaff } from '#app/server/course-api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAssignmentStatistics } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/api-assignment-statistics'

/** GET /api/assignments/:assignmentId/statistics — per problem and per find, for course staff. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const assignmentId = apiIdParam(params.assignmentId, 'assignment')
  const { courseId } = await requireApiAssignmentStaff(request, db(), assignmentId)
  const statistics = await getAssignmentStatistics(db(), assignmentId, courseId)
  if (!statistics) return jsonError(404, 'There is no such assignment.')
  return Response.json(statistics, { headers: { 'Cache-Control': 'no-store' } })
}
