/**
 * Exactly-once grading across a worker that dies: a real worker (jobs/worker.ts in a child
 * process) grades one problem's submissions, is SIGKILLed while it is in the middle of grading
 * the next problem's, and a new worker finishes the job within the grading queue's short
 * expiry. Every submission ends graded once: one set of part_results each, attempt numbers as
 * stored, the answers graded before the kill left untouched.
 *
 * To kill it mid-batch deterministically, the test holds a row lock on the second problem's
 * assignment item (as a regrade does): the worker's grading transaction for those submissions
 * waits on it, so at the kill the first problem is graded, the second's jobs are active (and
 * maybe some still waiting), and its transaction is open. The lock is released after the kill;
 * the dead worker's transaction then dies with its connection and writes nothing.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { asc, eq, inArray, sql } from 'drizzle-orm'
import pg from 'pg'
import { afterAll, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { db } from '#app/server/db/client.server.ts'
import { partResults, submissions } from '#app/server/db/schema.server.ts'
import { studentVariant } from '#app/server/grading.server.ts'
import {
  GRADE_EXPIRE_SECONDS,
  MAINTENANCE_INTERVAL_SECONDS,
  PGBOSS_SCHEMA,
  stopBoss,
} from '#app/server/queue.server.ts'
import { submitAnswers } from '#app/server/submissions.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { createCourseWithAssignment } from '#tests/support/factories.ts'

const repoRoot = fileURLToPath(new URL('../..', import.meta.url))
const definition = (title: string): ProblemDefinition =>
  DEMO_PROBLEMS.find((p) => p.definition.title === title)!.definition
const first = definition('Air-standard Otto cycle')
const second = definition('Gas-turbine (Brayton) cycle with component efficiencies')
const STUDENTS = 40

type Worker = { child: ChildProcess; output: string[]; exited: Promise<number | null> }
const started: Worker[] = []

/**
 * jobs/worker.ts as `npm run worker` runs it, in its own process on this file's database. Node
 * with tsx's loader (`node --import tsx`), not the tsx command: that one runs the script in a
 * second process, which a SIGKILL of the first would leave running.
 */
async function startWorkerProcess(): Promise<Worker> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'jobs/worker.ts'], {
    cwd: repoRoot,
    env: { ...process.env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  const output: string[] = []
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)))
  const worker = { child, output, exited }
  started.push(worker)
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the worker did not start:\n${output.join('')}`)), 30_000)
    const onData = (chunk: Buffer) => {
      output.push(chunk.toString())
      if (output.join('').includes('Job worker started')) {
        clearTimeout(timer)
        resolve()
      }
    }
    child.stdout!.on('data', onData)
    child.stderr!.on('data', (chunk: Buffer) => output.push(chunk.toString()))
    void exited.then((code) => reject(new Error(`the worker exited (${code}) before it started:\n${output.join('')}`)))
  })
  return worker
}

afterAll(async () => {
  for (const w of started) {
    if (w.child.exitCode === null && w.child.signalCode === null) {
      w.child.kill('SIGTERM')
      const stopped = await Promise.race([
        w.exited.then(() => true),
        new Promise((r) => setTimeout(() => r(false), 15_000)),
      ])
      if (!stopped) w.child.kill('SIGKILL')
    }
  }
  await stopBoss()
})

async function until<T>(what: string, read: () => Promise<T>, done: (v: T) => boolean, ms: number): Promise<T> {
  const end = Date.now() + ms
  for (;;) {
    const v = await read()
    if (done(v)) return v
    if (Date.now() > end)
      throw new Error(
        `Timed out after ${ms} ms waiting for ${what}: ${JSON.stringify(v)}\nworkers said:\n${started.map((w) => w.output.join('')).join('\n---\n')}`,
      )
    await new Promise((r) => setTimeout(r, 100))
  }
}

async function statusCounts(itemId: number) {
  const rows = await db()
    .select({ status: submissions.status, n: sql<number>`count(*)::int` })
    .from(submissions)
    .where(eq(submissions.itemId, itemId))
    .groupBy(submissions.status)
  return Object.fromEntries(rows.map((r) => [r.status, r.n])) as Partial<Record<'queued' | 'graded' | 'failed', number>>
}

async function gradeJobs(submissionIds: number[]) {
  const result = await db().execute<{ state: string; retry_count: number }>(
    sql`select state::text as state, retry_count from ${sql.raw(PGBOSS_SCHEMA)}.job where name = 'grade-submission' and (data->>'submissionId')::int in (${sql.join(
      submissionIds.map((id) => sql`${id}`),
      sql`, `,
    )})`,
  )
  return result.rows
}

async function partsOf(itemId: number) {
  return db().select().from(partResults).where(eq(partResults.itemId, itemId)).orderBy(asc(partResults.id))
}

test('a worker killed mid-batch: a new worker grades every submission exactly once, within the grading expiry', async () => {
  const made = await createCourseWithAssignment(db(), [first, second], { students: STUDENTS })
  const [itemA, itemB] = made.items as [(typeof made.items)[0], (typeof made.items)[0]]
  // Each student answers every find of a problem with their key (any readable answers would do).
  const submit = async (position: number, def: ProblemDefinition, item: typeof itemA) => {
    for (const s of made.students) {
      const drawn = studentVariant({
        versionId: item.problemVersionId,
        definition: def,
        assignmentId: made.assignment.id,
        problemId: item.problemId,
        userId: s.id,
        courseConvention: 'engineering',
      })
      if (!drawn.ok) throw new Error(drawn.error.message)
      const answers = Object.fromEntries(
        drawn.variant.key.map((k) => [k.name, `${k.value} ${def.finds.find((f) => f.name === k.name)!.unit}`.trim()]),
      )
      const r = await submitAnswers(db(), {
        courseId: made.course.id,
        assignmentId: made.assignment.id,
        position,
        userId: s.id,
        answers,
      })
      if (!r.ok) throw new Error(r.formError)
    }
  }

  const w1 = await startWorkerProcess()
  await submit(1, first, itemA)
  await until(
    'the first problem graded by the first worker',
    () => statusCounts(itemA.id),
    (c) => c.graded === STUDENTS,
    20_000,
  )

  // The second problem's item locked, as a regrade would: the worker's grading waits on it.
  const holder = new pg.Client({ connectionString: process.env.DATABASE_URL })
  await holder.connect()
  let killedAt: number
  try {
    await holder.query('begin')
    // NO KEY UPDATE: it blocks the grader's FOR SHARE but not the foreign-key checks of new submissions.
    await holder.query('select id from assignment_items where id = $1 for no key update', [itemB.id])
    await submit(2, second, itemB)
    const bIds = (
      await db().select({ id: submissions.id }).from(submissions).where(eq(submissions.itemId, itemB.id))
    ).map((r) => r.id)
    expect(bIds).toHaveLength(STUDENTS)
    // Mid-batch: the worker has taken second-problem jobs and its grading transaction waits on the lock.
    await until(
      'the worker grading the second problem, stuck on the lock',
      async () => {
        const active = (await gradeJobs(bIds)).filter((j) => j.state === 'active').length
        const waiting = await db().execute(
          sql`select 1 from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock' and pid <> ${sql.raw(String((holder as unknown as { processID: number }).processID))}`,
        )
        return { active, waiting: waiting.rows.length }
      },
      (v) => v.active > 0 && v.waiting > 0,
      20_000,
    )
    expect(await statusCounts(itemB.id)).toEqual({ queued: STUDENTS })

    w1.child.kill('SIGKILL')
    killedAt = Date.now()
    await w1.exited
    expect(w1.child.signalCode).toBe('SIGKILL')
  } finally {
    await holder.query('rollback').catch(() => {})
    await holder.end()
  }

  const aBefore = await partsOf(itemA.id)
  const bBefore = await partsOf(itemB.id)
  expect(aBefore.every((p) => p.verdict !== null && p.gradedAt !== null)).toBe(true)
  expect(bBefore.every((p) => p.verdict === null)).toBe(true)

  // The dead worker's jobs are still 'active': only their expiry gives them to another worker.
  const w2 = await startWorkerProcess()
  await until(
    'every second-problem submission graded by the new worker',
    () => statusCounts(itemB.id),
    (c) => c.graded === STUDENTS,
    45_000,
  )
  const elapsed = (Date.now() - killedAt!) / 1000
  console.info(`FAULT-TIMING graded ${elapsed.toFixed(1)} s after the kill`)
  // Expiry from the fetch (before the kill), then maintenance (up to two of its intervals),
  // the first retry's delay (1–2 s) and a poll: about 15–25 s; 30 s is the promise.
  expect(elapsed).toBeLessThanOrEqual(30)
  expect(GRADE_EXPIRE_SECONDS + 2 * MAINTENANCE_INTERVAL_SECONDS + 2 + 1).toBeLessThanOrEqual(30)

  // Exactly once: one part per counted answer, attempts as stored, nothing graded twice.
  const all = await db()
    .select()
    .from(submissions)
    .where(inArray(submissions.itemId, [itemA.id, itemB.id]))
  expect(all).toHaveLength(2 * STUDENTS)
  expect(all.every((s) => s.status === 'graded' && s.error === null)).toBe(true)
  const aAfter = await partsOf(itemA.id)
  const bAfter = await partsOf(itemB.id)
  expect(aAfter).toEqual(aBefore)
  expect(bAfter.map((p) => [p.id, p.submissionId, p.findName, p.answer, p.attempt])).toEqual(
    bBefore.map((p) => [p.id, p.submissionId, p.findName, p.answer, p.attempt]),
  )
  expect(bAfter).toHaveLength(STUDENTS * second.finds.length)
  expect(new Set(bAfter.map((p) => `${p.submissionId}|${p.findName}`)).size).toBe(bAfter.length)
  expect(
    bAfter.every(
      (p) => p.attempt === 1 && p.verdict !== null && p.gradedAt !== null && p.gradedAt.getTime() >= killedAt! - 1000,
    ),
  ).toBe(true)
  // The jobs the dead worker held were retried (pg-boss counted the retry), and none failed for good.
  const jobs = await gradeJobs(all.map((s) => s.id))
  expect(jobs.some((j) => j.retry_count >= 1)).toBe(true)
  expect(jobs.filter((j) => j.state === 'failed')).toEqual([])

  // The new worker stops cleanly on SIGTERM, as `npm run worker` does.
  w2.child.kill('SIGTERM')
  expect(await w2.exited).toBe(0)
}, 90_000)
