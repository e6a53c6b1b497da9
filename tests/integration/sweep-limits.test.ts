/**
 * Limits on checks (sweeps) against PostgreSQL, started in parallel as double presses and
 * several tabs would: one waiting-or-running check per problem, at most three per person.
 * No worker runs here, so every check started stays queued.
 */
import { eq, inArray, sql } from 'drizzle-orm'
import { afterAll, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { db } from '#app/server/db/client.server.ts'
import { problems, problemSweeps, problemVersions } from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { MAX_ACTIVE_SWEEPS_PER_USER, startSweep } from '#app/server/sweeps.server.ts'
import { createUser } from '#tests/support/factories.ts'

afterAll(async () => {
  await stopBoss()
})

const definition = { format: 1, title: 'Limit check' } as unknown as ProblemDefinition

async function makeProblem(ownerId: number, versions = 1) {
  const [problem] = await db()
    .insert(problems)
    .values({ ownerId, title: 'Limit check', cycle: 'carnot-engine', difficulty: 'standard', level: 'first-year' })
    .returning()
  const rows = await db()
    .insert(problemVersions)
    .values(
      Array.from({ length: versions }, (_, i) => ({
        problemId: problem!.id,
        number: i + 1,
        definition,
        createdBy: ownerId,
      })),
    )
    .returning()
  return { problemId: problem!.id, versionIds: rows.map((r) => r.id) }
}

async function outcome(p: Promise<{ sweepId: number; reused: boolean }>) {
  try {
    return { ok: true as const, ...(await p) }
  } catch (e) {
    const thrown = e as { init?: { status?: number }; data?: unknown }
    if (thrown.init?.status) return { ok: false as const, status: thrown.init.status, message: String(thrown.data) }
    throw e
  }
}

async function sweepsOf(versionIds: number[]) {
  return db().select().from(problemSweeps).where(inArray(problemSweeps.problemVersionId, versionIds))
}

test('six parallel starts on one version make one check, and every press gets that one back', async () => {
  const owner = await createUser(db())
  const { versionIds } = await makeProblem(owner.id)
  const results = await Promise.all(
    Array.from({ length: 6 }, () =>
      outcome(startSweep(db(), { versionId: versionIds[0]!, requestedBy: owner.id, total: 5000 })),
    ),
  )
  const rows = await sweepsOf(versionIds)
  expect(rows).toHaveLength(1)
  expect(results.every((r) => r.ok && r.sweepId === rows[0]!.id)).toBe(true)
  expect(results.filter((r) => r.ok && !r.reused)).toHaveLength(1)
})

test('while a check of one version runs, another version of the same problem is refused with a clear message', async () => {
  const owner = await createUser(db())
  const colleague = await createUser(db())
  const { versionIds } = await makeProblem(owner.id, 2)
  const [a, b] = await Promise.all([
    outcome(startSweep(db(), { versionId: versionIds[0]!, requestedBy: owner.id })),
    outcome(startSweep(db(), { versionId: versionIds[1]!, requestedBy: colleague.id })),
  ])
  expect([a, b].filter((r) => r.ok)).toHaveLength(1)
  const refused = [a, b].find((r) => !r.ok)!
  expect(refused).toMatchObject({
    ok: false,
    status: 409,
    message: expect.stringMatching(/check of version [12] of this problem is still running/),
  })
  expect(await sweepsOf(versionIds)).toHaveLength(1)
})

test(`one person gets at most ${MAX_ACTIVE_SWEEPS_PER_USER} checks at once, even started together on five problems`, async () => {
  const owner = await createUser(db())
  const made = await Promise.all(Array.from({ length: 5 }, () => makeProblem(owner.id)))
  const versionIds = made.map((m) => m.versionIds[0]!)
  const results = await Promise.all(
    versionIds.map((versionId) => outcome(startSweep(db(), { versionId, requestedBy: owner.id }))),
  )
  expect(results.filter((r) => r.ok)).toHaveLength(MAX_ACTIVE_SWEEPS_PER_USER)
  for (const r of results.filter((r) => !r.ok))
    expect(r).toMatchObject({ status: 429, message: expect.stringMatching(/already have 3 checks waiting or running/) })
  expect(await sweepsOf(versionIds)).toHaveLength(MAX_ACTIVE_SWEEPS_PER_USER)
  // Another person is not held back by them.
  const other = await createUser(db())
  const mine = await makeProblem(other.id)
  expect(await outcome(startSweep(db(), { versionId: mine.versionIds[0]!, requestedBy: other.id }))).toMatchObject({
    ok: true,
    reused: false,
  })
})

test('finished checks and lost ones (still queued after half an hour) no longer count', async () => {
  const owner = await createUser(db())
  const { versionIds } = await makeProblem(owner.id)
  const first = await startSweep(db(), { versionId: versionIds[0]!, requestedBy: owner.id })
  await db()
    .update(problemSweeps)
    .set({ status: 'done', finishedAt: new Date() })
    .where(eq(problemSweeps.id, first.sweepId))
  const second = await startSweep(db(), { versionId: versionIds[0]!, requestedBy: owner.id })
  expect(second).toMatchObject({ reused: false })
  expect(second.sweepId).not.toBe(first.sweepId)
  await db()
    .update(problemSweeps)
    .set({ createdAt: sql`now() - interval '31 minutes'` })
    .where(eq(problemSweeps.id, second.sweepId))
  const third = await startSweep(db(), { versionId: versionIds[0]!, requestedBy: owner.id })
  expect(third.reused).toBe(false)
  expect(new Set([first.sweepId, second.sweepId, third.sweepId]).size).toBe(3)
})
