import { apiIdParam, jsonError, requireApiBankUser } from '#app/server/api-guard.server.ts'
import { latestChecks, NEVER_CHECKED } from '#app/server/assignment-items.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { bankViewerFor, getVersionForViewer, unreadableVersionMessage } from '#app/server/problems.server.ts'
import type { Route } from './+types/api-version-check'

/**
 * GET /api/versions/:versionId/check — a version's latest check in the picker's terms
 * (`{ check: VersionCheck }`); the assignment picker polls it while a check is running.
 * A version whose stored document fails the definition check answers 422 with `{ error }`.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireApiBankUser(request)
  const versionId = apiIdParam(params.versionId, 'version')
  const viewer = await bankViewerFor(db(), user)
  // Not visible and not there look the same, so ids reveal nothing.
  const found = await getVersionForViewer(db(), viewer, versionId)
  if (!found) return jsonError(404, 'There is no such version.')
  // Its stored document fails the definition check: no check result says anything about it.
  if (found.version.unreadable) return jsonError(422, unreadableVersionMessage(found.version.number, 'used'))
  const check = (await latestChecks(db(), [versionId])).get(versionId) ?? NEVER_CHECKED
  return Response.json({ check }, { headers: { 'Cache-Control': 'no-store' } })
}
