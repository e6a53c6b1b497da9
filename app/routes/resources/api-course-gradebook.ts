import { apiIdParam, jsonError } from '#app/server/api-guard.server.ts'
import { requireApiCourseStaff } from '#app/server/course-api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getCourseGradebook, gradebookViewProblem, readGradebookView } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/api-course-gradebook'

/** GET /api/courses/:courseId/gradebook?section=&status=&q=&sort=&dir= — students × assignments, for course staff. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = apiIdParam(params.courseId, 'course')
  await requireApiCourseStaff(request, courseId)
  const url = new URL(request.url)
  const odd = gradebookViewProblem(url)
  if (odd) return jsonError(400, odd.message)
  const gradebook = await getCourseGradebook(db(), courseId, readGradebookView(url))
  if (!gradebook) return jsonError(404, 'There is no such course.')
  return Response.json(gradebook, { headers: { 'Cache-Control': 'no-store' } })
}
