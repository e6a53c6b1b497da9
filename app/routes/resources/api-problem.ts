import { apiIdParam, jsonError, requireApiBankUser } from '#app/server/api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { bankViewerFor, getProblemDetail } from '#app/server/problems.server.ts'
import type { Route } from './+types/api-problem'

/** GET /api/problems/:problemId — one problem with its versions, if the viewer may see it. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireApiBankUser(request)
  const problemId = apiIdParam(params.problemId, 'problem')
  const viewer = await bankViewerFor(db(), user)
  const detail = await getProblemDetail(db(), viewer, problemId)
  // Not visible and not there look the same, so ids reveal nothing.
  if (!detail) return jsonError(404, 'There is no such problem.')
  return Response.json(detail, { headers: { 'Cache-Control': 'no-store' } })
}
