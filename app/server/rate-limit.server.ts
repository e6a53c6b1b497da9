/**
 * Sign-in rate limiting, counted in PostgreSQL so that every web process sees the same
 * counts. Failed attempts are limited per e-mail address and, more loosely (a lab or
 * lecture hall shares one address), per client address.
 */
import { and, count, eq, gt, lt, min } from 'drizzle-orm'
import type { Db } from './db/client.server.ts'
import { signInAttempts } from './db/schema.server.ts'
import { env } from './env.server.ts'

/** How many times the per-e-mail limit a single client address may fail. */
const CLIENT_FACTOR = 4

export type RateDecision = { allowed: true } | { allowed: false; retryInMinutes: number }

export async function checkSignInRate(database: Db, email: string, clientAddress: string, now = new Date()): Promise<RateDecision> {
  const { SIGNIN_MAX_ATTEMPTS: max, SIGNIN_WINDOW_MINUTES: windowMin } = env()
  const since = new Date(now.getTime() - windowMin * 60_000)
  const failed = and(eq(signInAttempts.succeeded, false), gt(signInAttempts.createdAt, since))
  const [byEmail] = await database
    .select({ n: count(), first: min(signInAttempts.createdAt) })
    .from(signInAttempts)
    .where(and(failed, eq(signInAttempts.email, email)))
  const [byClient] = await database
    .select({ n: count(), first: min(signInAttempts.createdAt) })
    .from(signInAttempts)
    .where(and(failed, eq(signInAttempts.clientAddress, clientAddress)))
  const blockedBy = [
    byEmail && byEmail.n >= max ? byEmail.first : null,
    byClient && byClient.n >= max * CLIENT_FACTOR ? byClient.first : null,
  ]
    .filter((d) => d !== null && d !== undefined)
    .map((d) => new Date(d as Date | string))
  if (blockedBy.length === 0) return { allowed: true }
  const freeAt = Math.max(...blockedBy.map((d) => d.getTime() + windowMin * 60_000))
  return { allowed: false, retryInMinutes: Math.max(1, Math.ceil((freeAt - now.getTime()) / 60_000)) }
}

export async function recordSignInAttempt(database: Db, email: string, clientAddress: string, succeeded: boolean) {
  await database.insert(signInAttempts).values({ email, clientAddress, succeeded })
}

/** Attempts older than two windows no longer count for anything. */
export async function clearOldAttempts(database: Db, now = new Date()) {
  const before = new Date(now.getTime() - 2 * env().SIGNIN_WINDOW_MINUTES * 60_000)
  await database.delete(signInAttempts).where(lt(signInAttempts.createdAt, before))
}
