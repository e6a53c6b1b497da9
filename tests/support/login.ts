/**
 * A signed-in session for tests that call loaders and actions directly: a real session row
 * and the cookie the browser would send, exactly as signing in makes them.
 */
import { db } from '#app/server/db/client.server.ts'
import { createSessionRow, sessionStorage } from '#app/server/session.server.ts'

/** The cookie pair (`name=value`) of a fresh session for `user`, for tests that build their own headers. */
export async function sessionCookie(user: { id: number }): Promise<string> {
  const row = await createSessionRow(db(), user.id)
  const session = await sessionStorage().getSession()
  session.set('sid', row.id)
  return (await sessionStorage().commitSession(session)).split(';')[0]!
}

/** The Cookie header of a fresh session for `user`; no header at all for `null` (signed out). */
export async function loginAs(user: { id: number } | null): Promise<Record<string, string>> {
  if (!user) return {}
  return { Cookie: await sessionCookie(user) }
}
