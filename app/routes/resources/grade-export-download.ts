import { data } from 'react-router'
import { requireIdParam } from '#app/lib/params.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { fileSlug, getExportDownload } from '#app/server/exports.server.ts'
import type { Route } from './+types/grade-export-download'

/** GET /admin/exports/:exportId: a finished term export's CSV, for department admins. */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireAdmin(request)
  const exportId = requireIdParam(params.exportId, 'export')
  const file = await getExportDownload(db(), exportId)
  if (!file) throw data('There is no finished export with that number. It may still be building: see Grade exports.', { status: 404 })
  // The stored name is already a slug; cleaned again so a header can never be broken by it.
  const name = `${fileSlug(file.fileName.replace(/\.csv$/, ''), 'grades')}.csv`
  return new Response(file.csv, {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${name}"`,
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
    },
  })
}
