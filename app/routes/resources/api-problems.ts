import { textParamProblem } from '#app/lib/query-params.ts'
import { jsonError, requireApiBankUser } from '#app/server/api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { bankViewerFor, listBankProblems, readBankSearch } from '#app/server/problems.server.ts'
import type { Route } from './+types/api-problems'

/** GET /api/problems?q=&cycle=&difficulty=&level=&scope=&sort=&dir=&page=&pageSize= — the bank as the viewer may see it. */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireApiBankUser(request)
  const search = new URL(request.url).searchParams
  const odd = textParamProblem(search, { q: 'the search' })
  if (odd) return jsonError(400, odd.message)
  const read = readBankSearch(search)
  if (!read.ok) return jsonError(400, read.problem.message)
  const viewer = await bankViewerFor(db(), user)
  return Response.json(await listBankProblems(db(), viewer, read.query), { headers: { 'Cache-Control': 'no-store' } })
}
