import { data } from 'react-router'
import { requireBankUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { BankExportError, ProblemAccessError, bankViewerFor, exportBank } from '#app/server/problems.server.ts'
import type { Route } from './+types/bank-export'

/**
 * GET /bank/export?ids=3,7 (selected problems) or /bank/export (every problem you own):
 * the bank document (docs/bank-format.md) as a download.
 */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireBankUser(request)
  const url = new URL(request.url)
  const raw = url.searchParams
    .getAll('ids')
    .flatMap((s) => s.split(','))
    .map((s) => s.trim())
    .filter(Boolean)
  if (raw.some((s) => !/^\d{1,9}$/.test(s)))
    throw data('The problems to export are named by number, like ?ids=3,7.', { status: 400 })
  if (raw.length > 500) throw data('Export at most 500 problems at a time.', { status: 400 })
  const ids = [...new Set(raw.map(Number))]
  const viewer = await bankViewerFor(db(), user)
  try {
    const doc = await exportBank(db(), viewer, ids.length > 0 ? ids : 'own')
    const day = new Date().toISOString().slice(0, 10)
    return new Response(JSON.stringify(doc, null, 2) + '\n', {
      headers: {
        'Content-Type': 'application/json; charset=utf-8',
        'Content-Disposition': `attachment; filename="cyclewright-bank-${day}.json"`,
        'Cache-Control': 'no-store',
      },
    })
  } catch (e) {
    if (e instanceof ProblemAccessError)
      throw data('One of those problems is not in your bank or shared with you.', { status: 404 })
    if (e instanceof BankExportError) throw data(e.message, { status: 400 })
    throw e
  }
}
