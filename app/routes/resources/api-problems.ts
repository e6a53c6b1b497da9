import { requireApiBankUser } from '#app/server/api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { BankQuerySchema, bankViewerFor, listBankProblems } from '#app/server/problems.server.ts'
import type { Route } from './+types/api-problems'

/** GET /api/problems?q=&cycle=&difficulty=&level=&scope=&sort=&dir=&page=&pageSize= — the bank as the viewer may see it. */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireApiBankUser(request)
  const query = BankQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams))
  const viewer = await bankViewerFor(db(), user)
  return Response.json(await listBankProblems(db(), viewer, query), { headers: { 'Cache-Control': 'no-store' } })
}
