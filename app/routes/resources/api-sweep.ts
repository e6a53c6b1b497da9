import { apiIdParam, jsonError, requireApiBankUser } from '#app/server/api-guard.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { bankViewerFor, getVersionForViewer } from '#app/server/problems.server.ts'
import { getSweep } from '#app/server/sweeps.server.ts'
import type { Route } from './+types/api-sweep'

/** GET /api/sweeps/:sweepId — a sweep's progress and failures (the problem page polls it). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireApiBankUser(request)
  const sweepId = apiIdParam(params.sweepId, 'check')
  const sweep = await getSweep(db(), sweepId)
  const viewer = await bankViewerFor(db(), user)
  if (!sweep || !(await getVersionForViewer(db(), viewer, sweep.versionId)))
    return jsonError(404, 'There is no such check.')
  return Response.json(sweep, { headers: { 'Cache-Control': 'no-store' } })
}
