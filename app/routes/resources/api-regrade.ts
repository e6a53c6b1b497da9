import { canSeeCourseAsStaff } from '#app/domain/permissions.ts'
import { apiIdParam, jsonError } from '#app/server/api-guard.server.ts'
import { getUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getRegradeProgress } from '#app/server/regrades.server.ts'
import { toActor } from '#app/server/users.server.ts'
import type { Route } from './+types/api-regrade'

/** GET /api/regrades/:regradeId — a regrade's progress (the regrade page polls it); staff of its course only. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await getUser(request)
  if (!user) return jsonError(401, 'Sign in to see this regrade.')
  const regradeId = apiIdParam(params.regradeId, 'regrade')
  const progress = await getRegradeProgress(db(), regradeId)
  if (!progress) return jsonError(404, 'There is no such regrade.')
  if (!canSeeCourseAsStaff(toActor(user), progress.courseId))
    return jsonError(403, 'Regrades are for the course’s instructors and teaching assistants.')
  return Response.json(progress, { headers: { 'Cache-Control': 'no-store' } })
}
