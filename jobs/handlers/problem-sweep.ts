/**
 * The 'problem-sweep' job: checks one problem version over seeds 1..total with the pure
 * sweep of app/domain/authoring and stores the progress on the problem_sweeps row, which
 * the version page reads.
 *
 * A re-run (a retry, or a worker that died mid-sweep) starts again from seed 1 and
 * overwrites the counts: the sweep is deterministic per seed, so this is simple and
 * correct, and only a finished ('done') sweep is skipped. Between a failed attempt and its
 * retry the row is 'queued' again, with the reason in `error`; 'failed' means no retry is left.
 */
import { eq } from 'drizzle-orm'
import type { SweepFailure } from '#app/domain/authoring/definition.ts'
import { sweepVariants } from '#app/domain/authoring/sweep.ts'
import type { Convention } from '#app/domain/thermo/index.ts'
import type { Db } from '#app/server/db/client.server.ts'
import { problemSweeps, problemVersions } from '#app/server/db/schema.server.ts'
import { tryReadDefinition } from '#app/server/definitions.server.ts'
import { PermanentJobError, queuePayloads } from '#app/server/queue.server.ts'

/** Failures stored per sweep; `failed` still counts all of them. */
export const SWEEP_KEEP_FAILURES = 200
export const SWEEP_CHUNK = 25

export type ProblemSweepDeps = {
  database: Db
  sweep?: typeof sweepVariants
  /** Variants checked between two progress writes. */
  chunk?: number
  /**
   * This run's place among the job's tries (pg-boss: retryCount + 1 of retryLimit + 1).
   * A failure before the last try leaves the sweep 'queued' for the retry; without
   * `attempt` every failure is taken as the last.
   */
  attempt?: SweepAttempt
}

export type SweepAttempt = { readonly number: number; readonly of: number }

export type ProblemSweepOutcome = 'done' | 'already-done' | 'missing' | 'unreadable'

/** The first line of an error, short and without a stack, since authors read it. */
function reason(e: unknown): string {
  const message = e instanceof Error ? e.message : String(e)
  const line = message.split('\n')[0]!.trim() || 'unknown error'
  return line.length > 300 ? `${line.slice(0, 297)}…` : line
}

/** Whether pg-boss will run the job again after this failure. */
function willRetry(e: unknown, attempt: SweepAttempt | undefined): boolean {
  return !(e instanceof PermanentJobError) && attempt !== undefined && attempt.number < attempt.of
}

/** The row's error text while a retry waits, and once the check has stopped for good. */
export function sweepErrorText(e: unknown, attempt: SweepAttempt | undefined): string {
  if (attempt !== undefined && willRetry(e, attempt))
    return `Attempt ${attempt.number} of ${attempt.of} stopped (${reason(e)}); trying again shortly.`
  const tries =
    attempt !== undefined && attempt.of > 1 && !(e instanceof PermanentJobError) ? ` after ${attempt.of} attempts` : ''
  return `The check stopped${tries}: ${reason(e)}`
}

/** Throws PermanentJobError for a malformed payload (no retries); other errors are retried. */
export async function handleProblemSweep(payload: unknown, deps: ProblemSweepDeps): Promise<ProblemSweepOutcome> {
  const parsed = queuePayloads['problem-sweep'].safeParse(payload)
  if (!parsed.success) {
    throw new PermanentJobError(
      `problem-sweep payload is malformed: ${parsed.error.issues.map((i) => `${i.path.join('.') || '(payload)'}: ${i.message}`).join('; ')}`,
    )
  }
  const { sweepId } = parsed.data
  const { database } = deps
  const sweep = deps.sweep ?? sweepVariants
  const chunk = Math.max(1, Math.floor(deps.chunk ?? SWEEP_CHUNK))

  const [row] = await database
    .select({
      status: problemSweeps.status,
      total: problemSweeps.total,
      versionId: problemVersions.id,
      definition: problemVersions.definition,
    })
    .from(problemSweeps)
    .innerJoin(problemVersions, eq(problemVersions.id, problemSweeps.problemVersionId))
    .where(eq(problemSweeps.id, sweepId))
  // The version (and its sweeps with it) was deleted after the job was queued.
  if (!row) return 'missing'
  if (row.status === 'done') return 'already-done'

  const where = eq(problemSweeps.id, sweepId)
  // A stored document that fails the definition check can never be swept: say so on the row
  // (the author reads it in the picker and the check panel) instead of retrying.
  const read = tryReadDefinition(row.definition, row.versionId)
  if (!read.ok) {
    await database
      .update(problemSweeps)
      .set({ status: 'failed', finishedAt: new Date(), error: read.error.message })
      .where(where)
    return 'unreadable'
  }
  const definition = read.definition
  try {
    await database
      .update(problemSweeps)
      .set({
        status: 'running',
        startedAt: new Date(),
        finishedAt: null,
        error: null,
        checked: 0,
        failed: 0,
        failures: [],
      })
      .where(where)
    // A bank problem belongs to no course, so 'course' has none to take; the check does
    // not depend on the convention except for signs, and engineering is the common one.
    const convention: Convention = definition.convention === 'chemistry' ? 'chemistry' : 'engineering'
    let checked = 0
    let failed = 0
    const failures: SweepFailure[] = []
    // Chunks give progress to show, and let a web server in the same process answer
    // requests between them (the sweep itself is synchronous).
    for (let first = 1; first <= row.total; first += chunk) {
      const last = Math.min(row.total, first + chunk - 1)
      const seeds = Array.from({ length: last - first + 1 }, (_, i) => first + i)
      const room = SWEEP_KEEP_FAILURES - failures.length
      const summary = sweep(definition, { seeds, convention, keep: room })
      checked += summary.checked
      failed += summary.failed
      failures.push(...summary.failures.slice(0, room))
      await database.update(problemSweeps).set({ checked, failed, failures }).where(where)
    }
    await database.update(problemSweeps).set({ status: 'done', finishedAt: new Date() }).where(where)
    return 'done'
  } catch (e) {
    try {
      // The row tells the author what will happen next: a retry is coming, or nothing is.
      const next = willRetry(e, deps.attempt)
        ? { status: 'queued' as const, finishedAt: null }
        : { status: 'failed' as const, finishedAt: new Date() }
      await database
        .update(problemSweeps)
        .set({ ...next, error: sweepErrorText(e, deps.attempt) })
        .where(where)
    } catch (writeError) {
      console.error(
        `problem-sweep ${sweepId}: could not record the failure:`,
        writeError instanceof Error ? writeError.message : writeError,
      )
    }
    throw e
  }
}
