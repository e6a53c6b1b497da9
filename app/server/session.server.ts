/**
 * Sessions: a signed, httpOnly, SameSite=Lax cookie that carries only a session id. The
 * session itself is a row in PostgreSQL with an expiry, so signing out and revoking are
 * real: a deleted row ends the session on every device and web process at once.
 */
import { and, eq, gt, lt } from 'drizzle-orm'
import { nanoid } from 'nanoid'
import { createCookieSessionStorage } from 'react-router'
import type { Db } from './db/client.server.ts'
import { sessions } from './db/schema.server.ts'
import { env } from './env.server.ts'

type CookieData = { sid?: string }
type FlashData = { notice?: string }

let storage: ReturnType<typeof createCookieSessionStorage<CookieData, FlashData>> | undefined

export function sessionStorage() {
  if (storage) return storage
  const e = env()
  storage = createCookieSessionStorage<CookieData, FlashData>({
    cookie: {
      name: '__cyclewright',
      httpOnly: true,
      sameSite: 'lax',
      path: '/',
      secure: (e.APP_URL ?? '').startsWith('https://'),
      secrets: e.SESSION_SECRET.split(',')
        .map((s) => s.trim())
        .filter(Boolean),
      maxAge: e.SESSION_DAYS * 24 * 60 * 60,
    },
  })
  return storage
}

export function getCookieSession(request: Request) {
  return sessionStorage().getSession(request.headers.get('Cookie'))
}

export async function createSessionRow(database: Db, userId: number, now = new Date()) {
  const id = nanoid(32)
  const expiresAt = new Date(now.getTime() + env().SESSION_DAYS * 24 * 60 * 60 * 1000)
  await database.insert(sessions).values({ id, userId, expiresAt })
  return { id, expiresAt }
}

export async function findLiveSession(database: Db, id: string, now = new Date()) {
  const rows = await database
    .select({ id: sessions.id, userId: sessions.userId, expiresAt: sessions.expiresAt })
    .from(sessions)
    .where(and(eq(sessions.id, id), gt(sessions.expiresAt, now)))
    .limit(1)
  return rows[0] ?? null
}

export async function deleteSessionRow(database: Db, id: string) {
  await database.delete(sessions).where(eq(sessions.id, id))
}

export async function deleteSessionsOfUser(database: Db, userId: number) {
  await database.delete(sessions).where(eq(sessions.userId, userId))
}

/** Deletes session rows past their expiry; returns how many. */
export async function purgeExpiredSessions(database: Db, now = new Date()): Promise<number> {
  const deleted = await database.delete(sessions).where(lt(sessions.expiresAt, now))
  return deleted.rowCount ?? 0
}
