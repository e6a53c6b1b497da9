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
import { handleProblemSweep } from './handlers/problem-sweep.ts'

export type RunningWorker = { stop: () => Promise<void> }

/**
 * pg-boss 10 retries every failure until the queue's retryLimit. A job that can never
 * succeed gets its limit lowered to the retries already spent, so this failure is its last
 * and pg-boss moves it to the dead-letter queue.
 */
async function failForGood(boss: PgBoss, job: PgBoss.Job<unknown>) {
  await boss.getDb().executeSql(`update ${PGBOSS_SCHEMA}.job set retry_limit = retry_count where name = $1 and id = $2`, [job.name, job.id])
}

export type WorkerOptions = {
  /** Defaults to DATABASE_URL. */
  databaseUrl?: string
  log?: (line: string) => void
  /** Where a failed job is reported; a thrown job is also retried or failed by pg-boss. */
  logError?: (line: string) => void
}

export async function startWorker(opts: WorkerOptions = {}): Promise<RunningWorker> {
  const log = opts.log ?? console.log
  const logError = opts.logError ?? console.error
  const url = opts.databaseUrl ?? env().DATABASE_URL
  // Given a URL, the handlers write through a pool on that URL too, not the process's
  // db() (which follows DATABASE_URL), so jobs and their rows stay in one database.
  const ownPool = opts.databaseUrl ? new pg.Pool({ connectionString: url, max: 3 }) : undefined
  ownPool?.on('error', (e) => logError(`PostgreSQL pool error (worker): ${e.message}`))
  const database: Db = ownPool ? drizzle(ownPool, { schema, casing: 'snake_case' }) : db()

  const boss = new PgBoss(bossOptions(url, { max: 4 }))
  boss.on('error', (e) => logError(`Job queue error: ${e.message}`))
  await boss.start()
  await ensureQueues(boss)

  // With its metadata a job says which try this is: pg-boss counts retries from 0 and
  // allows retryLimit of them after the first run.
  await boss.work<unknown>('problem-sweep', { batchSize: 1, includeMetadata: true }, async (jobs) => {
    for (const job of jobs) {
      const attempt = { number: job.retryCount + 1, of: job.retryLimit + 1 }
      try {
        await handleProblemSweep(job.data, { database, attempt })
      } catch (e) {
        const permanent = e instanceof PermanentJobError
        if (permanent) await failForGood(boss, job)
        logError(`Job ${job.name} ${job.id} failed${permanent ? ' for good' : ` (attempt ${attempt.number} of ${attempt.of})`}: ${e instanceof Error ? e.message : String(e)}`)
        throw e
      }
    }
  })
  log(`Job worker started on queue problem-sweep (pg-boss schema ${PGBOSS_SCHEMA}).`)

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
