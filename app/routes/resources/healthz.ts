import { sql } from 'drizzle-orm'
import { db } from '#app/server/db/client.server.ts'

/** For load balancers: 200 when this process can reach PostgreSQL. */
export async function loader() {
  try {
    await db().execute(sql`select 1`)
    return Response.json({ ok: true })
  } catch {
    return Response.json({ ok: false, reason: 'database unreachable' }, { status: 503 })
  }
}
