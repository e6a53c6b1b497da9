import { eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, expect, onTestFinished, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { db } from '#app/server/db/client.server.ts'
import { problems, problemSweeps, problemVersions } from '#app/server/db/schema.server.ts'
import {
  DEAD_LETTER_QUEUE,
  enqueue,
  getBoss,
  PermanentJobError,
  stopBoss,
  withJobTransaction,
} from '#app/server/queue.server.ts'
import {
  clampSweepTotal,
  getSweep,
  latestSweepForVersion,
  startSweep,
  type SweepView,
} from '#app/server/sweeps.server.ts'
import { handleProblemSweep } from '#jobs/handlers/problem-sweep.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import { createUser } from '#tests/support/factories.ts'

// Carnot engine on air, TH 500..900 K, TL 280..400 K: every draw has TH > TL, so every
// variant solves (inputs as docs/examples/carnot-engine.json).
const carnot: ProblemDefinition = {
  format: 2,
  title: 'Carnot check',
  tags: { topics: [], difficulty: 'standard', level: 'first-year' },
  convention: 'engineering',
  prompt: 'A Carnot engine runs between @{TH} and @{TL}.',
  givens: [
    {
      name: 'TH',
      label: 'hot reservoir temperature',
      unit: 'K',
      rule: { kind: 'range', min: 500, max: 900, step: 50 },
    },
    {
      name: 'TL',
      label: 'cold reservoir temperature',
      unit: 'K',
      rule: { kind: 'range', min: 280, max: 400, step: 10 },
    },
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'carnot-engine',
    inputs: { gas: 'air', Th: 'TH', Tc: 'TL', p1: '100 kPa', expansionRatio: '2' },
  },
  finds: [
    {
      name: 'efficiency',
      label: 'Thermal efficiency',
      source: { kind: 'output', path: 'totals.efficiency' },
      unit: '',
      points: 1,
      tolerance: { kind: 'relative', value: 0.01 },
      pitfalls: [],
    },
  ],
}

// TL never exceeds TH in the ranges above, so this constraint can never be met.
const impossible: ProblemDefinition = {
  ...carnot,
  title: 'Impossible check',
  constraints: [{ left: 'TL', op: '>', right: 'TH' }],
}

let worker: RunningWorker
const workerErrors: string[] = []

beforeAll(async () => {
  worker = await startWorker({ log: () => {}, logError: (line) => workerErrors.push(line) })
})

afterAll(async () => {
  await worker.stop()
  await stopBoss()
})

async function makeVersion(definition: ProblemDefinition) {
  const owner = await createUser(db())
  const [problem] = await db()
    .insert(problems)
    .values({
      ownerId: owner.id,
      title: definition.title,
      cycle: 'carnot-engine',
      difficulty: 'standard',
      level: 'first-year',
    })
    .returning()
  const [version] = await db()
    .insert(problemVersions)
    .values({ problemId: problem!.id, number: 1, definition, createdBy: owner.id })
    .returning()
  return { ownerId: owner.id, versionId: version!.id }
}

async function waitUntilFinished(sweepId: number, ms = 30_000): Promise<SweepView> {
  const until = Date.now() + ms
  for (;;) {
    const view = await getSweep(db(), sweepId)
    if (view && (view.status === 'done' || view.status === 'failed')) return view
    if (Date.now() > until)
      throw new Error(`sweep ${sweepId} did not finish within ${ms / 1000} s: ${JSON.stringify(view)}`)
    await new Promise((r) => setTimeout(r, 200))
  }
}

async function sweepRow(sweepId: number) {
  const [row] = await db().select().from(problemSweeps).where(eq(problemSweeps.id, sweepId))
  return row!
}

test('a sweep started from the server is run by the worker: 60 variants checked, none failing', async () => {
  const { ownerId, versionId } = await makeVersion(carnot)
  const { sweepId } = await startSweep(db(), { versionId, requestedBy: ownerId, total: 60 })
  expect((await getSweep(db(), sweepId))?.total).toBe(60)

  const view = await waitUntilFinished(sweepId)
  expect(view).toMatchObject({
    id: sweepId,
    versionId,
    status: 'done',
    total: 60,
    checked: 60,
    failed: 0,
    failures: [],
    error: null,
  })
  expect(view.startedAt).not.toBeNull()
  expect(Date.parse(view.finishedAt!)).toBeGreaterThanOrEqual(Date.parse(view.startedAt!))
  expect((await latestSweepForVersion(db(), versionId))?.id).toBe(sweepId)
})

test('a problem whose constraint can never be met finishes with every variant failed, each with its seed', async () => {
  const { ownerId, versionId } = await makeVersion(impossible)
  const { sweepId } = await startSweep(db(), { versionId, requestedBy: ownerId, total: 60 })
  const view = await waitUntilFinished(sweepId)
  expect(view).toMatchObject({ status: 'done', checked: 60, failed: 60, error: null })
  expect(view.failures).toHaveLength(60)
  expect(view.failures.map((f) => f.seed).sort((a, b) => a - b)).toEqual(Array.from({ length: 60 }, (_, i) => i + 1))
  for (const f of view.failures) expect(f.code).toBe('constraint-never-met')
})

test('the number of variants is kept between 10 and 5000, 500 when not given', async () => {
  expect([
    clampSweepTotal(3),
    clampSweepTotal(1_000_000),
    clampSweepTotal(undefined),
    clampSweepTotal(Number.NaN),
    clampSweepTotal(120),
  ]).toEqual([10, 5000, 500, 500, 120])
  const { ownerId, versionId } = await makeVersion(carnot)
  const { sweepId } = await startSweep(db(), { versionId, requestedBy: ownerId, total: 3 })
  expect(await waitUntilFinished(sweepId)).toMatchObject({ status: 'done', total: 10, checked: 10 })
})

test('running the job twice on one sweep does not count twice', async () => {
  const { ownerId, versionId } = await makeVersion(impossible)
  // Inserted without a job, so only the calls below run it.
  const [row] = await db()
    .insert(problemSweeps)
    .values({ problemVersionId: versionId, requestedBy: ownerId, total: 30 })
    .returning()
  expect(await handleProblemSweep({ v: 1, sweepId: row!.id }, { database: db() })).toBe('done')
  const first = await sweepRow(row!.id)
  expect(await handleProblemSweep({ v: 1, sweepId: row!.id }, { database: db() })).toBe('already-done')
  expect(await sweepRow(row!.id)).toEqual(first)
  expect(first).toMatchObject({ status: 'done', checked: 30, failed: 30 })
})

test('a sweep left running by a worker that died starts again from the first seed', async () => {
  const { ownerId, versionId } = await makeVersion(impossible)
  const [row] = await db()
    .insert(problemSweeps)
    .values({
      problemVersionId: versionId,
      requestedBy: ownerId,
      total: 30,
      status: 'running',
      checked: 25,
      failed: 25,
      startedAt: new Date(),
    })
    .returning()
  expect(await handleProblemSweep({ v: 1, sweepId: row!.id }, { database: db() })).toBe('done')
  const after = await sweepRow(row!.id)
  expect(after).toMatchObject({ status: 'done', checked: 30, failed: 30 })
  expect(after.failures).toHaveLength(30)
})

test('a malformed payload is refused without touching any sweep', async () => {
  const before = await db().execute(sql`select coalesce(json_agg(s order by id), '[]') as rows from problem_sweeps s`)
  await expect(handleProblemSweep({ v: 1, sweepId: 'one' }, { database: db() })).rejects.toBeInstanceOf(
    PermanentJobError,
  )
  await expect(handleProblemSweep({ sweepId: 1 }, { database: db() })).rejects.toBeInstanceOf(PermanentJobError)
  await expect(handleProblemSweep(null, { database: db() })).rejects.toBeInstanceOf(PermanentJobError)
  const after = await db().execute(sql`select coalesce(json_agg(s order by id), '[]') as rows from problem_sweeps s`)
  expect(after.rows).toEqual(before.rows)
})

test('the worker fails a malformed job at once, without retries, into the dead-letter queue', async () => {
  const boss = await getBoss()
  const deadBefore = await boss.getQueueSize(DEAD_LETTER_QUEUE)
  // Sent around enqueue(), which would refuse it.
  const jobId = await boss.send('problem-sweep', { v: 2, sweepId: 1 }, { singletonKey: 'malformed-test' })
  expect(jobId).not.toBeNull()
  const until = Date.now() + 30_000
  let job = await boss.getJobById('problem-sweep', jobId!)
  while (job?.state !== 'failed' && Date.now() < until) {
    await new Promise((r) => setTimeout(r, 200))
    job = await boss.getJobById('problem-sweep', jobId!)
  }
  expect(job).toMatchObject({ state: 'failed', retryCount: 0 })
  expect(workerErrors).toContainEqual(
    expect.stringContaining(`${jobId} failed for good: problem-sweep payload is malformed`),
  )
  expect(await boss.getQueueSize(DEAD_LETTER_QUEUE)).toBe(deadBefore + 1)
})

test('between a failed attempt and its retry the sweep says a retry is coming; after the last attempt it is failed', async () => {
  const { ownerId, versionId } = await makeVersion(carnot)
  // A database that refuses to mark this sweep running makes every attempt throw (a stand-in
  // for an outage in the middle of a check); the handler's own writes of the outcome still pass.
  await db().execute(
    sql.raw(`create function refuse_running() returns trigger language plpgsql as $$
      begin
        if new.status = 'running' then raise exception 'refused for the test'; end if;
        return new;
      end $$`),
  )
  await db().execute(
    sql.raw(
      `create trigger refuse_running before update on problem_sweeps for each row execute function refuse_running()`,
    ),
  )
  onTestFinished(async () => {
    await db().execute(sql.raw('drop trigger refuse_running on problem_sweeps; drop function refuse_running()'))
  })
  const [row] = await db()
    .insert(problemSweeps)
    .values({ problemVersionId: versionId, requestedBy: ownerId, total: 10 })
    .returning()
  const boss = await getBoss()
  // Sent around enqueue() for a quick retry: one retry, a second after the first failure.
  const jobId = await boss.send(
    'problem-sweep',
    { v: 1, sweepId: row!.id },
    { retryLimit: 1, retryDelay: 1, retryBackoff: false },
  )
  expect(jobId).not.toBeNull()

  const waiting = new Set<string>()
  const until = Date.now() + 30_000
  let view = await getSweep(db(), row!.id)
  while (view?.status !== 'failed' && Date.now() < until) {
    if (view?.status === 'queued' && view.error !== null) waiting.add(view.error)
    await new Promise((r) => setTimeout(r, 50))
    view = await getSweep(db(), row!.id)
  }
  expect([...waiting]).toEqual([expect.stringMatching(/^Attempt 1 of 2 stopped \(.+\); trying again shortly\.$/)])
  expect(view).toMatchObject({
    status: 'failed',
    error: expect.stringMatching(/^The check stopped after 2 attempts: .+/),
  })
  expect(view!.finishedAt).not.toBeNull()
  // The handler writes the row before it rethrows; pg-boss records the failure a moment later.
  await expect
    .poll(async () => boss.getJobById('problem-sweep', jobId!), { timeout: 10_000 })
    .toMatchObject({ state: 'failed', retryCount: 1 })
  await expect.poll(() => workerErrors.length, { timeout: 10_000 }).toBeGreaterThanOrEqual(2)
  expect(workerErrors).toContainEqual(expect.stringContaining(`${jobId} failed (attempt 1 of 2)`))
  expect(workerErrors).toContainEqual(expect.stringContaining(`${jobId} failed (attempt 2 of 2)`))
})

test('a stored definition that fails the definition check fails the check at once, with the reason, and is not retried', async () => {
  const { ownerId, versionId } = await makeVersion(carnot)
  await db().execute(sql`update problem_versions set definition = 'null'::jsonb where id = ${versionId}`)
  const [row] = await db()
    .insert(problemSweeps)
    .values({ problemVersionId: versionId, requestedBy: ownerId, total: 10 })
    .returning()
  const boss = await getBoss()
  const jobId = await boss.send('problem-sweep', { v: 1, sweepId: row!.id }, { retryLimit: 3, retryDelay: 1 })
  expect(jobId).not.toBeNull()
  await expect.poll(async () => (await getSweep(db(), row!.id))?.status, { timeout: 30_000 }).toBe('failed')
  const view = await getSweep(db(), row!.id)
  expect(view?.error).toMatch(/version/i)
  expect(view?.checked).toBe(0)
  await expect
    .poll(async () => boss.getJobById('problem-sweep', jobId!), { timeout: 10_000 })
    .toMatchObject({ state: 'completed', retryCount: 0 })
})

test('a job enqueued inside a transaction that rolls back is never sent', async () => {
  const jobsFor = async (key: string) =>
    (await db().execute(sql`select count(*)::int as n from pgboss.job where singleton_key = ${key}`)).rows[0]!.n
  const { ownerId, versionId } = await makeVersion(carnot)
  await expect(
    withJobTransaction(db(), async (tx, jobs) => {
      const [row] = await tx
        .insert(problemSweeps)
        .values({ problemVersionId: versionId, requestedBy: ownerId, total: 10 })
        .returning()
      await enqueue('problem-sweep', { v: 1, sweepId: row!.id }, { connection: jobs })
      expect(await jobsFor(`sweep-${row!.id}`)).toBe(0)
      throw new Error('changed my mind')
    }),
  ).rejects.toThrow('changed my mind')
  expect(await latestSweepForVersion(db(), versionId)).toBeNull()
  const { sweepId } = await startSweep(db(), { versionId, requestedBy: ownerId, total: 10 })
  expect(await jobsFor(`sweep-${sweepId}`)).toBe(1)
  await waitUntilFinished(sweepId)
})

test('enqueue refuses a payload that does not match its queue', async () => {
  await expect(enqueue('problem-sweep', { v: 1, sweepId: 0 })).rejects.toThrow(
    'Job payload for problem-sweep is not valid',
  )
})
