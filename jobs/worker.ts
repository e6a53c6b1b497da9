/**
 * The job worker. `npm run worker` runs it on its own (start as many as the load needs,
 * on any machine that reaches the database); `npm start`, `npm run dev` and the e2e
 * set-up run one inside their process through `startWorker`.
 */
import { pathToFileURL } from 'node:url'
import { drizzle } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import PgBoss from 'pg-boss'
import { closeDb, db, type Db } from '#app/server/db/client.server.ts'
import * as schema from '#app/server/db/schema.server.ts'
import { env } from '#app/server/env.server.ts'
import { bossOptions, ensureQueues, PermanentJobError, PGBOSS_SCHEMA } from '#app/server/queue.server.ts'
import { handleExportGrades } from './handlers/export-grades.ts'
import { gradeSubmissions } from '#app/server/grading.server.ts'
import { handleGradeSubmission, splitGradeJobs } from './handlers/grade-submission.ts'
import { handleProblemSweep } from './handlers/problem-sweep.ts'
import { handleRegrade } from './handlers/regrade.ts'
import { handleSendMail } from './handlers/send-mail.ts'
import { handlePurgeExpired } from './handlers/purge-expired.ts'

export type RunningWorker = { stop: () => Promise<void> }

/** When the worker's schedule runs 'purge-expired' (jobs/handlers/purge-expired.ts): hourly. */
export const PURGE_CRON = '17 * * * *'

/**
 * pg-boss 10 retries every failure until the queue's retryLimit. A job that can never
 * succeed gets its limit lowered to the retries already spent, so this failure is its last
 * and pg-boss moves it to the dead-letter queue.
 */
async function failForGood(boss: PgBoss, job: PgBoss.Job<unknown>) {
  await boss
    .getDb()
    .executeSql(`update ${PGBOSS_SCHEMA}.job set retry_limit = retry_count where name = $1 and id = $2`, [
      job.name,
      job.id,
    ])
}

export type WorkerOptions = {
  /** Defaults to DATABASE_URL. */
  databaseUrl?: string
  log?: (line: string) => void
  /** Where a failed job is reported; a failed job is retried or dead-lettered by pg-boss. */
  logError?: (line: string) => void
  /** Fetch loops on the grading queue (default 3). */
  gradingLoops?: number
  /** Jobs one grading fetch takes and grades in one transaction (default 100). */
  gradingBatchSize?: number
}

export async function startWorker(opts: WorkerOptions = {}): Promise<RunningWorker> {
  const log = opts.log ?? console.log
  const logError = opts.logError ?? console.error
  const url = opts.databaseUrl ?? env().DATABASE_URL
  // Given a URL, the handlers write through a pool on that URL too, not the process's
  // db() (which follows DATABASE_URL), so jobs and their rows stay in one database.
  const ownPool = opts.databaseUrl ? new pg.Pool({ connectionString: url, max: 8 }) : undefined
  ownPool?.on('error', (e) => logError(`PostgreSQL pool error (worker): ${e.message}`))
  const database: Db = ownPool ? drizzle(ownPool, { schema, casing: 'snake_case' }) : db()

  const boss = new PgBoss(bossOptions(url, { max: 4 }))
  boss.on('error', (e) => logError(`Job queue error: ${e.message}`))
  await boss.start()
  await ensureQueues(boss)

  type Attempt = { number: number; of: number }
  type Handler = (payload: unknown, deps: { database: Db; attempt: Attempt }) => Promise<unknown>
  /**
   * Each queue: its handler, how many jobs one fetch takes, how many of them run at once and
   * how many fetch loops run side by side. pg-boss 10 waits its polling interval (0.5 s at
   * the least) between fetches of one loop, so grading takes big batches on several loops.
   */
  type Job = PgBoss.JobWithMetadata<unknown>
  type Queue = {
    name: string
    handle: Handler
    /** Handles a whole fetched batch at once; returns the jobs it could not take, which run one by one. */
    handleBatch?: (jobs: Job[]) => Promise<Job[]>
    batchSize: number
    concurrency: number
    loops: number
  }
  const queues: Queue[] = [
    {
      name: 'grade-submission',
      handle: handleGradeSubmission,
      // One transaction grades the whole batch; if it fails, each job is graded alone so a
      // bad one fails by itself and the rest still land.
      handleBatch: async (jobs) => {
        const { valid, invalid } = splitGradeJobs(jobs)
        if (valid.length === 0) return invalid
        try {
          const outcomes = await gradeSubmissions(
            database,
            valid.map((v) => v.submissionId),
          )
          // A submission another transaction holds is run again on its own (and retried if still held).
          return [...invalid, ...valid.filter((v) => outcomes.get(v.submissionId) === 'busy').map((v) => v.job)]
        } catch (e) {
          logError(
            `Grading a batch of ${valid.length} failed (${e instanceof Error ? e.message : String(e)}); grading them one by one.`,
          )
          return jobs
        }
      },
      batchSize: opts.gradingBatchSize ?? 100,
      concurrency: 4,
      loops: opts.gradingLoops ?? 3,
    },
    { name: 'problem-sweep', handle: handleProblemSweep, batchSize: 1, concurrency: 1, loops: 1 },
    { name: 'regrade', handle: handleRegrade, batchSize: 1, concurrency: 1, loops: 1 },
    { name: 'send-mail', handle: handleSendMail, batchSize: 10, concurrency: 2, loops: 1 },
    { name: 'export-grades', handle: handleExportGrades, batchSize: 1, concurrency: 1, loops: 1 },
    { name: 'purge-expired', handle: handlePurgeExpired, batchSize: 1, concurrency: 1, loops: 1 },
  ]

  // With its metadata a job says which try this is: pg-boss counts retries from 0 and
  // allows retryLimit of them after the first run. Each job of a batch succeeds or fails on
  // its own: a failed one is failed here, and pg-boss then completes only the jobs still active.
  const runOne = async (handle: Handler, job: Job) => {
    const attempt = { number: job.retryCount + 1, of: job.retryLimit + 1 }
    try {
      await handle(job.data, { database, attempt })
    } catch (e) {
      const permanent = e instanceof PermanentJobError
      const message = e instanceof Error ? e.message : String(e)
      logError(
        `Job ${job.name} ${job.id} failed${permanent ? ' for good' : ` (attempt ${attempt.number} of ${attempt.of})`}: ${message}`,
      )
      if (permanent) await failForGood(boss, job)
      await boss.fail(job.name, job.id, { message })
    }
  }
  for (const q of queues) {
    for (let loop = 0; loop < q.loops; loop++) {
      await boss.work<unknown>(
        q.name,
        { batchSize: q.batchSize, includeMetadata: true, pollingIntervalSeconds: 0.5 },
        async (fetched) => {
          const jobs = q.handleBatch ? await q.handleBatch(fetched) : fetched
          let next = 0
          const lane = async () => {
            while (next < jobs.length) await runOne(q.handle, jobs[next++]!)
          }
          await Promise.all(Array.from({ length: Math.min(q.concurrency, jobs.length) }, lane))
        },
      )
    }
  }
  // Hourly clean-up of expired sessions and old sign-in attempts. pg-boss keeps one schedule
  // per name, so every worker setting it is harmless, and its cron runs it once per slot.
  await boss.schedule('purge-expired', PURGE_CRON, { v: 1 }, { singletonKey: 'purge-expired' })
  log(`Job worker started on queues ${queues.map((q) => q.name).join(', ')} (pg-boss schema ${PGBOSS_SCHEMA}).`)

  return {
    stop: async () => {
      await boss.stop({ graceful: true, timeout: 10_000 })
      await ownPool?.end()
    },
  }
}

async function main() {
  if (!process.env.DATABASE_URL) {
    const { prepareLocalEnv } = await import('#scripts/local-env.ts')
    await prepareLocalEnv()
  }
  env()
  const worker = await startWorker()
  let stopping = false
  const stop = async () => {
    if (stopping) return
    stopping = true
    await worker.stop()
    await closeDb()
    process.exit(0)
  }
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((e) => {
    console.error('Could not start the job worker:', e instanceof Error ? e.message : e)
    process.exit(1)
  })
}
