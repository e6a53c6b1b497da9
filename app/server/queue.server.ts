/**
 * The job queue contract shared by the web process and jobs/worker.ts: the queue names,
 * the payload schema of each, and one producer-only PgBoss per process on DATABASE_URL
 * (schema `pgboss`). The web process only sends; workers are registered in jobs/worker.ts.
 *
 * pg-boss 10 wants every queue created before `send` or `work` (../shared/STACK.md), so
 * starting a boss here also creates all the queues listed below.
 */
import { drizzle } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import PgBoss from 'pg-boss'
import { z } from 'zod'
import type { Db } from './db/client.server.ts'
import { isUniqueViolation } from './db/pg-errors.server.ts'
import * as schema from './db/schema.server.ts'
import { env } from './env.server.ts'

export const PGBOSS_SCHEMA = 'pgboss'

/**
 * Queue name → payload schema. Every payload carries `v` so that a job queued by an older
 * release can be told apart once a payload changes shape.
 */
const payloadSchemas = {
  'problem-sweep': z.object({ v: z.literal(1), sweepId: z.number().int().positive() }),
  /** Grade one stored submission (jobs/handlers/grade-submission.ts); idempotent on the id. */
  'grade-submission': z.object({ v: z.literal(1), submissionId: z.number().int().positive() }),
  /** Apply a previewed regrade of one assignment item (jobs/handlers/regrade.ts). */
  regrade: z.object({ v: z.literal(1), regradeId: z.number().int().positive() }),
  /** One e-mail, composed when it was queued (jobs/handlers/send-mail.ts). */
  'send-mail': z.object({
    v: z.literal(1),
    to: z.string().email(),
    subject: z.string().min(1).max(300),
    text: z.string().max(100_000),
    html: z.string().max(200_000).optional(),
  }),
  /** Build a large grade export (a term's courses) into grade_exports (jobs/handlers/export-grades.ts). */
  'export-grades': z.object({ v: z.literal(1), exportId: z.number().int().positive() }),
  /** Delete expired sessions and sign-in attempts too old to count (jobs/handlers/purge-expired.ts); scheduled by the worker. */
  'purge-expired': z.object({ v: z.literal(1) }),
} as const

export type QueueName = keyof typeof payloadSchemas
export type QueuePayload<N extends QueueName> = z.infer<(typeof payloadSchemas)[N]>
/** The same map typed per queue, so that parsing with `queuePayloads[name]` for a generic name gives that queue's payload. */
export const queuePayloads: { readonly [N in QueueName]: z.ZodType<QueuePayload<N>> } = payloadSchemas
function isQueueName(name: string): name is QueueName {
  return Object.hasOwn(payloadSchemas, name)
}
export const queueNames: readonly QueueName[] = Object.keys(payloadSchemas).filter(isQueueName)

/** Where pg-boss moves a job whose retries are used up, or that can never succeed. */
export const DEAD_LETTER_QUEUE = 'dead-letter'

type QueueSettings<N extends QueueName> = {
  options: Omit<PgBoss.Queue, 'name'>
  /** Two sends with the same key while the first still waits make one job. */
  singletonKey?: (payload: QueuePayload<N>) => string
}

/** How long a fetched grading job may stay active before pg-boss takes it as abandoned (its worker died). */
export const GRADE_EXPIRE_SECONDS = 15

/**
 * How often pg-boss's maintenance runs (it is what fails expired jobs so they are retried;
 * pg-boss 10 defaults to 120 s). One process runs it per interval across all workers.
 */
export const MAINTENANCE_INTERVAL_SECONDS = 3

export const queueSettings: { [N in QueueName]: QueueSettings<N> } = {
  'problem-sweep': {
    // 'short': at most one waiting job per singleton key.
    options: {
      policy: 'short',
      retryLimit: 2,
      retryDelay: 10,
      retryBackoff: true,
      expireInSeconds: 30 * 60,
      deadLetter: DEAD_LETTER_QUEUE,
    },
    singletonKey: (p) => `sweep-${p.sweepId}`,
  },
  'grade-submission': {
    // No singleton key: a duplicate job is harmless (the handler skips a graded submission),
    // and submissions arrive in bursts that 'short' would throttle.
    // Expiry: a fetched batch of 100 takes under 1 s to grade (≈ 2.3 s on the one-by-one
    // fallback, measured cold), so 15 s is ample for a live worker, and a dead worker's jobs
    // are retried about 15–25 s after they were fetched (docs/grading.md, "A worker that dies").
    options: {
      policy: 'standard',
      retryLimit: 3,
      retryDelay: 1,
      retryBackoff: true,
      expireInSeconds: GRADE_EXPIRE_SECONDS,
      deadLetter: DEAD_LETTER_QUEUE,
    },
  },
  regrade: {
    options: {
      policy: 'short',
      retryLimit: 2,
      retryDelay: 10,
      retryBackoff: true,
      expireInSeconds: 30 * 60,
      deadLetter: DEAD_LETTER_QUEUE,
    },
    singletonKey: (p) => `regrade-${p.regradeId}`,
  },
  'send-mail': {
    // 'standard': many mails wait at once ('short' keeps one per key, and no key is a key).
    // Duplicates are prevented where mail is queued: in the transaction that records why.
    options: {
      policy: 'standard',
      retryLimit: 5,
      retryDelay: 30,
      retryBackoff: true,
      expireInSeconds: 5 * 60,
      deadLetter: DEAD_LETTER_QUEUE,
    },
  },
  'export-grades': {
    options: {
      policy: 'short',
      retryLimit: 2,
      retryDelay: 10,
      retryBackoff: true,
      expireInSeconds: 30 * 60,
      deadLetter: DEAD_LETTER_QUEUE,
    },
    singletonKey: (p) => `export-${p.exportId}`,
  },
  'purge-expired': {
    // 'short' with one key: a run that is still waiting absorbs the next schedule's.
    options: {
      policy: 'short',
      retryLimit: 2,
      retryDelay: 60,
      retryBackoff: true,
      expireInSeconds: 10 * 60,
      deadLetter: DEAD_LETTER_QUEUE,
    },
    singletonKey: () => 'purge-expired',
  },
}

/** A job that can never succeed (a malformed payload): the worker fails it without retries. */
export class PermanentJobError extends Error {
  override name = 'PermanentJobError'
}

/** Runs pg-boss's SQL on a connection of ours, so a job is sent inside our transaction. */
export type JobConnection = PgBoss.Db

/** Creates (or brings up to date) the dead-letter queue and every queue of the map. */
export async function ensureQueues(boss: PgBoss) {
  const wanted: [string, Omit<PgBoss.Queue, 'name'>][] = [
    [DEAD_LETTER_QUEUE, { policy: 'standard' }],
    ...queueNames.map((n): [string, Omit<PgBoss.Queue, 'name'>] => [n, queueSettings[n].options]),
  ]
  for (const [name, options] of wanted) {
    if (await boss.getQueue(name)) {
      await boss.updateQueue(name, { name, ...options })
      continue
    }
    try {
      await boss.createQueue(name, { name, ...options })
    } catch (e) {
      // Another process created it between our look and our insert.
      if (!isUniqueViolation(e)) throw e
    }
  }
}

/**
 * pg-boss options shared by the producer here and the worker in jobs/worker.ts. In pg-boss
 * 10 an expired job is only noticed by maintenance (every maintenanceIntervalSeconds, in the
 * processes that supervise: the workers), so its interval bounds how late a dead worker's job
 * is retried; the producer passes `supervise: false` and runs none.
 */
export function bossOptions(
  connectionString: string,
  extra: PgBoss.ConstructorOptions = {},
): PgBoss.ConstructorOptions {
  return {
    connectionString,
    schema: PGBOSS_SCHEMA,
    application_name: 'cyclewright-jobs',
    maintenanceIntervalSeconds: MAINTENANCE_INTERVAL_SECONDS,
    ...extra,
  }
}

type Holder = { boss?: Promise<PgBoss>; url?: string }
declare global {
  // On globalThis so that hot reloads in development do not start a second boss.
  var __cyclewrightBoss: Holder | undefined
}
const holder: Holder = (globalThis.__cyclewrightBoss ??= {})

/**
 * The process's producer boss, started on first use: it installs or migrates pg-boss's
 * schema and creates the queues. It runs no maintenance (the workers do) and no workers.
 */
export function getBoss(): Promise<PgBoss> {
  const url = env().DATABASE_URL
  if (holder.boss && holder.url === url) return holder.boss
  const starting = (async () => {
    const boss = new PgBoss(bossOptions(url, { max: 3, supervise: false, schedule: false }))
    boss.on('error', (e) => console.error('Job queue error:', e.message))
    await boss.start()
    await ensureQueues(boss)
    return boss
  })()
  holder.boss = starting
  holder.url = url
  // A failed start is not cached: the next call tries again.
  starting.catch(() => {
    if (holder.boss === starting) holder.boss = undefined
  })
  return starting
}

export async function stopBoss() {
  const starting = holder.boss
  holder.boss = undefined
  holder.url = undefined
  if (!starting) return
  const boss = await starting.catch(() => null)
  await boss?.stop({ graceful: true, timeout: 5000 })
}

/**
 * Checks the payload against the queue's schema and sends it. Returns the job id, or null
 * when a job with the same singleton key is already waiting. With `connection`, the job is
 * written through that connection, so it appears only if its transaction commits.
 */
export async function enqueue<N extends QueueName>(
  name: N,
  payload: QueuePayload<N>,
  options: { connection?: JobConnection; startAfter?: Date } = {},
): Promise<string | null> {
  const parsed = queuePayloads[name].safeParse(payload)
  if (!parsed.success)
    throw new Error(
      `Job payload for ${name} is not valid: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`,
    )
  const data: QueuePayload<N> = parsed.data
  const settings: QueueSettings<N> = queueSettings[name]
  const boss = await getBoss()
  const send: PgBoss.SendOptions = {}
  const key = settings.singletonKey?.(data)
  if (key) send.singletonKey = key
  if (options.startAfter) send.startAfter = options.startAfter
  if (options.connection) send.db = options.connection
  return boss.send(name, data, send)
}

// A Drizzle instance per pooled connection, made once: building one reads the whole schema's
// relations, which costs more than the queries of a short transaction.
const drizzleOfClient = new WeakMap<pg.PoolClient, Db>()
function drizzleOn(client: pg.PoolClient): Db {
  let tx = drizzleOfClient.get(client)
  if (!tx) {
    tx = drizzle(client, { schema, casing: 'snake_case' })
    drizzleOfClient.set(client, tx)
  }
  return tx
}

/**
 * Runs `work` in one database transaction and hands it a Drizzle instance and a job
 * connection on the same PostgreSQL connection: rows written and jobs enqueued commit or
 * roll back together (pg-boss 10 has no Drizzle adapter, STYLE 2.9).
 */
export async function withJobTransaction<T>(
  database: Db,
  work: (tx: Db, jobs: JobConnection) => Promise<T>,
): Promise<T> {
  const source = '$client' in database ? database.$client : undefined
  if (!(source instanceof pg.Pool)) throw new Error('withJobTransaction needs a database on a pg.Pool')
  // Started before the transaction: its first start installs pg-boss's schema and queues.
  await getBoss()
  const client = await source.connect()
  try {
    await client.query('begin')
    const tx = drizzleOn(client)
    const result = await work(tx, { executeSql: (text, values) => client.query(text, values) })
    await client.query('commit')
    return result
  } catch (e) {
    await client.query('rollback').catch(() => {})
    throw e
  } finally {
    client.release()
  }
}
