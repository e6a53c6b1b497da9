import { textParamProblem } from '#app/lib/query-params.ts'
import { apiIdParam, jsonError } from '#app/server/api-guard.server.ts'
import { requireApiAssignmentStaff } from '#app/server/course-api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getFindAnswers } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/api-find-answers'

/** GET /api/assignments/:assignmentId/problems/:position/answers?find=name — every answer to one find, for course staff. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const assignmentId = apiIdParam(params.assignmentId, 'assignment')
  const position = apiIdParam(params.position, 'problem')
  const { courseId } = await requireApiAssignmentStaff(request, db(), assignmentId)
  const search = new URL(request.url).searchParams
  const odd = textParamProblem(search, { find: 'the question' })
  if (odd) return jsonError(400, odd.message)
  const findName = search.get('find')?.slice(0, 100) ?? undefined
  const answers = await getFindAnswers(db(), { assignmentId, position, findName, courseId })
  if (!answers) return jsonError(404, 'This assignment has no problem at that position.')
  if (!answers.find) return jsonError(404, `Problem ${position} has no question named “${findName}”.`)
  return Response.json(answers, { headers: { 'Cache-Control': 'no-store' } })
}
