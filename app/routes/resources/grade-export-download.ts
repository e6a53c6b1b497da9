import { data } from 'react-router'
import { isOneOf } from '#app/lib/guards.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getExportDownload, TERM_EXPORT_FILES } from '#app/server/exports.server.ts'
import type { Route } from './+types/grade-export-download'

/**
 * GET /admin/exports/:exportId?file=assignments|course-totals: one CSV of a finished term
 * export, for department admins. The assignment rows and the course totals are separate files
 * (a grade system imports one table per file); without ?file the assignment rows (or an older
 * export's single file) are sent.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireAdmin(request)
  const exportId = requireIdParam(params.exportId, 'export')
  const asked = new URL(request.url).searchParams.get('file')
  if (asked !== null && !isOneOf(TERM_EXPORT_FILES, asked)) {
    throw data(
      'An export has two files: ?file=assignments for the assignment rows, ?file=course-totals for the course totals.',
      { status: 404 },
    )
  }
  const file = await getExportDownload(db(), exportId, isOneOf(TERM_EXPORT_FILES, asked) ? asked : null)
  if (!file)
    throw data('There is no finished export with that number and file. It may still be building: see Grade exports.', {
      status: 404,
    })
  return new Response(file.csv, {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      // termExportFileName makes a slug, so the header cannot be broken by the stored name.
      'Content-Disposition': `attachment; filename="${file.fileName}"`,
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
    },
  })
}
