/**
 * Sign-in and password-reset throttling, counted in PostgreSQL (`sign_in_attempts`) so that
 * every web process sees the same counts.
 *
 * Sign-in. Lock-out should cost the attacker, not the owner, so failures are counted mainly
 * per (e-mail, client address) pair:
 * - pair: SIGNIN_MAX_ATTEMPTS failures are free; after the f-th failure (f ≥ that) the next
 *   try from the same pair waits 2^(f − max + 1) seconds after that failure, at most
 *   SIGNIN_WINDOW_MINUTES. Failures count since the pair's last success, over a day at most.
 *   The owner signing in from another address is not slowed at all.
 * - address, across accounts: SIGNIN_ADDRESS_MAX_FAILURES failures in the window (generous:
 *   a lab or lecture hall shares one address).
 * - account, across addresses: only past SIGNIN_ACCOUNT_MAX_FAILURES failures in the window
 *   (a spread-out attack) is the account slowed for every address, the owner's included.
 *
 * Check and record are one step (`beginSignInAttempt`): under advisory locks on the e-mail
 * and the address it counts, and if the try may go ahead, records it as a failure at once;
 * a right password then marks the row a success. So parallel tries each see the others and
 * at most the allowed number get a password check.
 *
 * Reset requests (kind 'reset') are limited per e-mail and per address in an hour; the
 * page answers the same either way.
 */
import { and, count, desc, eq, gt, lt, max, min, sql } from 'drizzle-orm'
import type { Db, Tx } from './db/client.server.ts'
import { signInAttempts } from './db/schema.server.ts'
import { env } from './env.server.ts'

/** How far back a pair's failures count (unless the pair has succeeded since). */
export const PAIR_LOOKBACK_MS = 24 * 60 * 60_000
/** The window of reset-request counts. */
export const RESET_WINDOW_MS = 60 * 60_000
/** Rows older than this (or than the sign-in window, if longer) count for nothing and are purged. */
export const ATTEMPT_RETENTION_MS = Math.max(PAIR_LOOKBACK_MS, RESET_WINDOW_MS)

export type RateDecision = { allowed: true } | { allowed: false; retryInSeconds: number }
export type SignInGate = { allowed: true; attemptId: number } | { allowed: false; retryInSeconds: number }

/** The wait after the f-th failure of a pair, in seconds (0 while failures are still free). */
export function pairDelaySeconds(failures: number, free: number, capSeconds: number): number {
  if (failures < free) return 0
  const exponent = failures - free + 1
  return exponent >= 31 ? capSeconds : Math.min(2 ** exponent, capSeconds)
}

/** "8 seconds", "1 minute", "15 minutes": how long to wait, for the message. */
export function waitInWords(seconds: number): string {
  const s = Math.max(1, Math.ceil(seconds))
  if (s < 60) return `${s} second${s === 1 ? '' : 's'}`
  const m = Math.ceil(s / 60)
  return `${m} minute${m === 1 ? '' : 's'}`
}

const asDate = (d: Date | string | null | undefined) => (d === null || d === undefined ? null : new Date(d))

async function lock(tx: Tx, scope: string, key: string) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${scope}), hashtext(${key}))`)
}

/** Runs the decision on the caller's transaction (already holding the locks). */
async function decideSignIn(tx: Db | Tx, email: string, clientAddress: string, now: Date): Promise<RateDecision> {
  const e = env()
  const windowMs = e.SIGNIN_WINDOW_MINUTES * 60_000
  const windowStart = new Date(now.getTime() - windowMs)
  const signIn = eq(signInAttempts.kind, 'sign-in')
  const failed = and(signIn, eq(signInAttempts.succeeded, false))
  const waits: number[] = []

  // The pair: failures since its last success (within the lookback), each one doubling the wait.
  const pair = and(signIn, eq(signInAttempts.email, email), eq(signInAttempts.clientAddress, clientAddress))
  const lookbackStart = new Date(now.getTime() - PAIR_LOOKBACK_MS)
  const [lastSuccess] = await tx
    .select({ at: max(signInAttempts.createdAt) })
    .from(signInAttempts)
    .where(and(pair, eq(signInAttempts.succeeded, true), gt(signInAttempts.createdAt, lookbackStart)))
  const successAt = asDate(lastSuccess?.at)
  const since = successAt && successAt > lookbackStart ? successAt : lookbackStart
  const [pairFailures] = await tx
    .select({ n: count(), last: max(signInAttempts.createdAt) })
    .from(signInAttempts)
    .where(and(pair, eq(signInAttempts.succeeded, false), gt(signInAttempts.createdAt, since)))
  const delay = pairDelaySeconds(pairFailures?.n ?? 0, e.SIGNIN_MAX_ATTEMPTS, e.SIGNIN_WINDOW_MINUTES * 60)
  const lastFailure = asDate(pairFailures?.last)
  if (delay > 0 && lastFailure) waits.push(lastFailure.getTime() + delay * 1000 - now.getTime())

  // The address, across accounts (a lab shares one): a plain window count.
  const [byAddress] = await tx
    .select({ n: count(), first: min(signInAttempts.createdAt) })
    .from(signInAttempts)
    .where(and(failed, eq(signInAttempts.clientAddress, clientAddress), gt(signInAttempts.createdAt, windowStart)))
  const addressFirst = asDate(byAddress?.first)
  if ((byAddress?.n ?? 0) >= e.SIGNIN_ADDRESS_MAX_FAILURES && addressFirst)
    waits.push(addressFirst.getTime() + windowMs - now.getTime())

  // The account, across addresses: only a very high count slows it for everyone.
  const [byAccount] = await tx
    .select({ n: count(), first: min(signInAttempts.createdAt) })
    .from(signInAttempts)
    .where(and(failed, eq(signInAttempts.email, email), gt(signInAttempts.createdAt, windowStart)))
  const accountFirst = asDate(byAccount?.first)
  if ((byAccount?.n ?? 0) >= e.SIGNIN_ACCOUNT_MAX_FAILURES && accountFirst)
    waits.push(accountFirst.getTime() + windowMs - now.getTime())

  const wait = Math.max(0, ...waits)
  if (wait <= 0) return { allowed: true }
  return { allowed: false, retryInSeconds: Math.max(1, Math.ceil(wait / 1000)) }
}

/**
 * Decides whether this sign-in may check a password and, when it may, records it (as a
 * failure until `markSignInSucceeded`), all under locks on the e-mail and the address, so
 * that parallel tries are counted one after another. Blocked tries are not recorded: they
 * checked no password.
 */
export async function beginSignInAttempt(
  database: Db,
  email: string,
  clientAddress: string,
  now = new Date(),
): Promise<SignInGate> {
  return database.transaction(async (tx) => {
    // Always e-mail first, then address: one order, so two tries never wait on each other in a circle.
    await lock(tx, 'sign-in-email', email)
    await lock(tx, 'sign-in-address', clientAddress)
    const decision = await decideSignIn(tx, email, clientAddress, now)
    if (!decision.allowed) return decision
    const [row] = await tx
      .insert(signInAttempts)
      .values({ email, clientAddress, succeeded: false, kind: 'sign-in', createdAt: now })
      .returning({ id: signInAttempts.id })
    return { allowed: true as const, attemptId: row!.id }
  })
}

export async function markSignInSucceeded(database: Db, attemptId: number) {
  await database.update(signInAttempts).set({ succeeded: true }).where(eq(signInAttempts.id, attemptId))
}

/** Only the decision, recording nothing (for tests and diagnostics). */
export async function checkSignInRate(
  database: Db,
  email: string,
  clientAddress: string,
  now = new Date(),
): Promise<RateDecision> {
  return decideSignIn(database, email, clientAddress, now)
}

/**
 * A password-reset request: allowed at most RESET_MAX_PER_EMAIL times per e-mail and
 * RESET_MAX_PER_ADDRESS times per client address in an hour. An allowed request is recorded
 * (whether or not the address has an account, so the counts reveal nothing); a refused one
 * is not, so the limit lifts an hour after the requests that filled it.
 */
export async function claimResetRequest(
  database: Db,
  email: string,
  clientAddress: string,
  now = new Date(),
): Promise<RateDecision> {
  const e = env()
  return database.transaction(async (tx) => {
    await lock(tx, 'reset-email', email)
    await lock(tx, 'reset-address', clientAddress)
    const since = new Date(now.getTime() - RESET_WINDOW_MS)
    const recent = and(eq(signInAttempts.kind, 'reset'), gt(signInAttempts.createdAt, since))
    const waits: number[] = []
    for (const [where, limit] of [
      [eq(signInAttempts.email, email), e.RESET_MAX_PER_EMAIL],
      [eq(signInAttempts.clientAddress, clientAddress), e.RESET_MAX_PER_ADDRESS],
    ] as const) {
      const rows = await tx
        .select({ at: signInAttempts.createdAt })
        .from(signInAttempts)
        .where(and(recent, where))
        .orderBy(desc(signInAttempts.createdAt))
        .limit(limit)
      // Full when `limit` requests are in the window; free again when the oldest of them leaves it.
      if (rows.length >= limit) waits.push(new Date(rows[limit - 1]!.at).getTime() + RESET_WINDOW_MS - now.getTime())
    }
    const wait = Math.max(0, ...waits)
    if (wait > 0) return { allowed: false as const, retryInSeconds: Math.ceil(wait / 1000) }
    await tx.insert(signInAttempts).values({ email, clientAddress, succeeded: true, kind: 'reset', createdAt: now })
    return { allowed: true as const }
  })
}

/** Attempts older than the longest lookback no longer count for anything; returns how many went. */
export async function clearOldAttempts(database: Db, now = new Date()): Promise<number> {
  const keepMs = Math.max(ATTEMPT_RETENTION_MS, env().SIGNIN_WINDOW_MINUTES * 60_000)
  const deleted = await database
    .delete(signInAttempts)
    .where(lt(signInAttempts.createdAt, new Date(now.getTime() - keepMs)))
  return deleted.rowCount ?? 0
}
