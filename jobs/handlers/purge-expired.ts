/**
 * The 'purge-expired' job, run on a schedule by the worker (jobs/worker.ts): deletes
 * session rows past their expiry (a cookie naming one is already refused) and sign-in and
 * reset attempts too old to count for any limit (rate-limit.server.ts). Idempotent: a second
 * run finds nothing left to delete.
 */
import type { Db } from '#app/server/db/client.server.ts'
import { PermanentJobError, queuePayloads } from '#app/server/queue.server.ts'
import { clearOldAttempts } from '#app/server/rate-limit.server.ts'
import { purgeExpiredSessions } from '#app/server/session.server.ts'

export type PurgeOutcome = { sessions: number; attempts: number }

export async function handlePurgeExpired(payload: unknown, deps: { database: Db; now?: Date }): Promise<PurgeOutcome> {
  const parsed = queuePayloads['purge-expired'].safeParse(payload)
  if (!parsed.success)
    throw new PermanentJobError(`purge-expired payload is not valid: ${parsed.error.issues[0]?.message ?? 'unknown'}`)
  const now = deps.now ?? new Date()
  const sessions = await purgeExpiredSessions(deps.database, now)
  const attempts = await clearOldAttempts(deps.database, now)
  return { sessions, attempts }
}
