import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { courseCsvFileName, courseGradeXlsx, XLSX_CONTENT_TYPE } from '#app/server/exports.server.ts'
import type { Route } from './+types/course-gradebook-xlsx'

/** GET /courses/:courseId/gradebook.xlsx: the course gradebook as a workbook, for its staff (columns in exports.server.ts). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const body = await courseGradeXlsx(db(), courseId)
  return new Response(new Uint8Array(body), {
    headers: {
      'Content-Type': XLSX_CONTENT_TYPE,
      'Content-Disposition': `attachment; filename="${courseCsvFileName(course.code, course.timeZone, new Date(), 'xlsx')}"`,
      'Content-Length': String(body.byteLength),
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
    },
  })
}
