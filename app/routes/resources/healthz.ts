import { sql } from 'drizzle-orm'
import { db } from '#app/server/db/client.server.ts'

/** A balancer waits a few seconds at most; a database that does not answer by then is down for it. */
const CHECK_TIMEOUT_MS = 2_000

/**
 * For load balancers: 200 when this process can reach PostgreSQL, else 503 (with
 * Retry-After, added by the HTTP server) within CHECK_TIMEOUT_MS even when the database
 * hangs instead of refusing.
 */
export async function loader() {
  let timer: NodeJS.Timeout | undefined
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error('timed out')), CHECK_TIMEOUT_MS)
  })
  try {
    await Promise.race([db().execute(sql`select 1`), timeout])
    return Response.json({ ok: true }, { headers: { 'Cache-Control': 'no-store' } })
  } catch {
    return Response.json(
      { ok: false, reason: 'database unreachable' },
      { status: 503, headers: { 'Cache-Control': 'no-store' } },
    )
  } finally {
    clearTimeout(timer)
  }
}
