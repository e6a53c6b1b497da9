/**
 * Sweeps: checking one problem version over many sampled variants in the background
 * (jobs/handlers/problem-sweep.ts does the work). The callers (routes) check who may
 * start or read a sweep; these functions trust them.
 */
import { desc, eq } from 'drizzle-orm'
import type { SweepFailure } from '#app/domain/authoring/definition.ts'
import type { Db } from './db/client.server.ts'
import { problemSweeps, type ProblemSweep } from './db/schema.server.ts'
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

/** Inserts the sweep as 'queued' and enqueues its job in the same transaction. */
export async function startSweep(database: Db, input: { versionId: number; requestedBy: number; total?: number }): Promise<{ sweepId: number }> {
  const total = clampSweepTotal(input.total)
  return withJobTransaction(database, async (tx, jobs) => {
    const [row] = await tx
      .insert(problemSweeps)
      .values({ problemVersionId: input.versionId, requestedBy: input.requestedBy, status: 'queued', total })
      .returning({ id: problemSweeps.id })
    await enqueue('problem-sweep', { v: 1, sweepId: row!.id }, { connection: jobs })
    return { sweepId: row!.id }
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
    failures: Array.isArray(row.failures) ? (row.failures as SweepFailure[]) : [],
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
