import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { courseCsvFileName, courseGradeCsv } from '#app/server/exports.server.ts'
import type { Route } from './+types/course-gradebook-csv'

/** GET /courses/:courseId/gradebook.csv: the course gradebook for its staff, streamed (columns in exports.server.ts). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const body = await courseGradeCsv(db(), courseId)
  return new Response(body, {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${courseCsvFileName(course.code, course.timeZone)}"`,
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
    },
  })
}
