/**
 * Sweeps: checking one problem version over many sampled variants in the background
 * (jobs/handlers/problem-sweep.ts does the work). The callers (routes) check who may
 * start or read a sweep; these functions trust them, but limit how many run: one per
 * problem, and a few per person, so nobody can fill the queue.
 */
import { and, asc, desc, eq, gt, inArray, or, sql } from 'drizzle-orm'
import { data } from 'react-router'
import type { SweepFailure } from '#app/domain/authoring/definition.ts'
import type { Db } from './db/client.server.ts'
import { problemSweeps, problemVersions, type ProblemSweep } from './db/schema.server.ts'
import { enqueue, withJobTransaction } from './queue.server.ts'

export const SWEEP_DEFAULT_TOTAL = 500
export const SWEEP_MIN_TOTAL = 10
export const SWEEP_MAX_TOTAL = 5000

export type SweepStatus = ProblemSweep['status']

export type SweepView = {
  id: number
  versionId: number
  status: SweepStatus
  total: number
  checked: number
  failed: number
  failures: SweepFailure[]
  error: string | null
  createdAt: string
  startedAt: string | null
  finishedAt: string | null
}

export function clampSweepTotal(total: number | undefined): number {
  if (total === undefined || !Number.isFinite(total)) return SWEEP_DEFAULT_TOTAL
  return Math.min(SWEEP_MAX_TOTAL, Math.max(SWEEP_MIN_TOTAL, Math.round(total)))
}

/** Checks one person may have waiting or running at once, across all their problems. */
export const MAX_ACTIVE_SWEEPS_PER_USER = 3
/**
 * A check still "queued" or "running" after this long was lost (its worker stopped mid-way);
 * it no longer blocks new ones. A 5,000-variant check takes well under a minute.
 */
export const SWEEP_STALE_AFTER_MINUTES = 30
/** The advisory lock that makes "count the active checks, then insert" one step for every process. */
const SWEEP_START_LOCK = 0x73776565 // "swee"

export type StartedSweep = { sweepId: number; reused: boolean }

/**
 * Starts a check of a version, unless one is already waiting or running:
 * - on the same version: that one is given back (`reused`), so pressing twice checks once;
 * - on another version of the same problem: refused (409) until it finishes;
 * - and at most MAX_ACTIVE_SWEEPS_PER_USER per person (429).
 * Inserted as 'queued' with its job in one transaction, under an advisory lock so that
 * parallel starts cannot both pass the counts.
 */
export async function startSweep(
  database: Db,
  input: { versionId: number; requestedBy: number; total?: number },
): Promise<StartedSweep> {
  const total = clampSweepTotal(input.total)
  return withJobTransaction(database, async (tx, jobs) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${SWEEP_START_LOCK})`)
    const [version] = await tx
      .select({ problemId: problemVersions.problemId })
      .from(problemVersions)
      .where(eq(problemVersions.id, input.versionId))
    if (!version) throw data('There is no such problem version to check.', { status: 404 })
    const active = await tx
      .select({
        id: problemSweeps.id,
        versionId: problemSweeps.problemVersionId,
        number: problemVersions.number,
        problemId: problemVersions.problemId,
        requestedBy: problemSweeps.requestedBy,
      })
      .from(problemSweeps)
      .innerJoin(problemVersions, eq(problemVersions.id, problemSweeps.problemVersionId))
      .where(
        and(
          inArray(problemSweeps.status, ['queued', 'running']),
          gt(problemSweeps.createdAt, sql`now() - make_interval(mins => ${SWEEP_STALE_AFTER_MINUTES})`),
          or(eq(problemVersions.problemId, version.problemId), eq(problemSweeps.requestedBy, input.requestedBy)),
        ),
      )
      .orderBy(asc(problemSweeps.id))
    const sameProblem = active.filter((a) => a.problemId === version.problemId)
    const sameVersion = sameProblem.find((a) => a.versionId === input.versionId)
    if (sameVersion) return { sweepId: sameVersion.id, reused: true }
    if (sameProblem.length > 0) {
      throw data(
        `A check of version ${sameProblem[0]!.number} of this problem is still running. Start another once it has finished (usually within a minute).`,
        {
          status: 409,
        },
      )
    }
    const mine = active.filter((a) => a.requestedBy === input.requestedBy)
    if (mine.length >= MAX_ACTIVE_SWEEPS_PER_USER) {
      throw data(
        `You already have ${mine.length} checks waiting or running, the most at once. Start this one when one of them has finished (usually within a minute).`,
        {
          status: 429,
        },
      )
    }
    const [row] = await tx
      .insert(problemSweeps)
      .values({ problemVersionId: input.versionId, requestedBy: input.requestedBy, status: 'queued', total })
      .returning({ id: problemSweeps.id })
    await enqueue('problem-sweep', { v: 1, sweepId: row!.id }, { connection: jobs })
    return { sweepId: row!.id, reused: false }
  })
}

export function toSweepView(row: ProblemSweep): SweepView {
  return {
    id: row.id,
    versionId: row.problemVersionId,
    status: row.status,
    total: row.total,
    checked: row.checked,
    failed: row.failed,
    failures: Array.isArray(row.failures) ? row.failures : [],
    error: row.error,
    createdAt: row.createdAt.toISOString(),
    startedAt: row.startedAt?.toISOString() ?? null,
    finishedAt: row.finishedAt?.toISOString() ?? null,
  }
}

export async function getSweep(database: Db, sweepId: number): Promise<SweepView | null> {
  const [row] = await database.select().from(problemSweeps).where(eq(problemSweeps.id, sweepId))
  return row ? toSweepView(row) : null
}

export async function latestSweepForVersion(database: Db, versionId: number): Promise<SweepView | null> {
  const [row] = await database
    .select()
    .from(problemSweeps)
    .where(eq(problemSweeps.problemVersionId, versionId))
    .orderBy(desc(problemSweeps.createdAt), desc(problemSweeps.id))
    .limit(1)
  return row ? toSweepView(row) : null
}
