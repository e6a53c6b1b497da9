import { describe, expect, test } from 'vitest'
import type { ProblemDefinition, SweepFailure, SweepSummary } from '#app/domain/authoring/definition.ts'
import type { Db } from '#app/server/db/client.server.ts'
import { PermanentJobError } from '#app/server/queue.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { handleProblemSweep, SWEEP_KEEP_FAILURES } from './problem-sweep.ts'

type Row = { status: 'queued' | 'running' | 'done' | 'failed'; total: number; versionId?: number; definition: unknown }

/** Just enough of Drizzle for the handler: one select of the sweep, and updates recorded in order. */
function fakeDatabase(row: Row | null) {
  const updates: Record<string, unknown>[] = []
  const database = {
    select: () => ({ from: () => ({ innerJoin: () => ({ where: async () => (row ? [row] : []) }) }) }),
    update: () => ({
      set: (values: Record<string, unknown>) => ({
        where: async () => {
          updates.push(values)
        },
      }),
    }),
  } as unknown as Db
  return { database, updates }
}

// A real bank document (the handler reads it through the stored-definition check), in the
// course's convention.
const definition: ProblemDefinition = { ...DEMO_PROBLEMS[0]!.definition, convention: 'course' }

/** A sweep that fails every seed divisible by 3 and records what it was asked. */
function fakeSweep() {
  const calls: { seeds: number[]; convention: string; keep: number | undefined }[] = []
  const sweep = (
    _def: ProblemDefinition,
    options: { seeds: readonly number[]; convention: 'chemistry' | 'engineering'; keep?: number },
  ): SweepSummary => {
    calls.push({ seeds: [...options.seeds], convention: options.convention, keep: options.keep })
    const failures: SweepFailure[] = options.seeds
      .filter((s) => s % 3 === 0)
      .map((seed) => ({ seed, code: 'solve-error', message: `seed ${seed}` }))
    return { checked: options.seeds.length, failed: failures.length, failures: failures.slice(0, options.keep ?? 200) }
  }
  return { sweep, calls }
}

describe('handleProblemSweep', () => {
  test('checks seeds 1..total in chunks and writes the running totals after each chunk', async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 60, definition })
    const { sweep, calls } = fakeSweep()
    expect(await handleProblemSweep({ v: 1, sweepId: 7 }, { database, sweep, chunk: 25 })).toBe('done')

    expect(calls.map((c) => [c.seeds[0], c.seeds.at(-1), c.seeds.length])).toEqual([
      [1, 25, 25],
      [26, 50, 25],
      [51, 60, 10],
    ])
    // 'course' has no course to take a convention from in the bank.
    expect(calls.every((c) => c.convention === 'engineering')).toBe(true)

    expect(updates[0]).toMatchObject({
      status: 'running',
      checked: 0,
      failed: 0,
      failures: [],
      error: null,
      finishedAt: null,
    })
    expect(updates[0]!.startedAt).toBeInstanceOf(Date)
    expect(updates.slice(1, 4).map((u) => [u.checked, u.failed])).toEqual([
      [25, 8],
      [50, 16],
      [60, 20],
    ])
    expect((updates[3]!.failures as SweepFailure[]).map((f) => f.seed)).toEqual(
      Array.from({ length: 20 }, (_, i) => 3 * (i + 1)),
    )
    expect(updates[4]).toMatchObject({ status: 'done' })
    expect(updates[4]!.finishedAt).toBeInstanceOf(Date)
    expect(updates).toHaveLength(5)
  })

  test('a chemistry problem is checked in the chemistry convention', async () => {
    const { database } = fakeDatabase({
      status: 'queued',
      total: 10,
      definition: { ...definition, convention: 'chemistry' },
    })
    const { sweep, calls } = fakeSweep()
    await handleProblemSweep({ v: 1, sweepId: 1 }, { database, sweep })
    expect(calls.map((c) => c.convention)).toEqual(['chemistry'])
  })

  test(`keeps only the first ${SWEEP_KEEP_FAILURES} failures but counts them all`, async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 900, definition })
    const { sweep, calls } = fakeSweep()
    await handleProblemSweep({ v: 1, sweepId: 1 }, { database, sweep, chunk: 100 })
    const last = updates.at(-2)!
    expect(last.failed).toBe(300)
    expect((last.failures as SweepFailure[]).length).toBe(SWEEP_KEEP_FAILURES)
    expect((last.failures as SweepFailure[]).at(-1)!.seed).toBe(600)
    // Asks for no more than there is room for.
    expect(calls.map((c) => c.keep).slice(0, 3)).toEqual([200, 167, 134])
    expect(calls.at(-1)!.keep).toBe(0)
  })

  test('a finished sweep is not run again', async () => {
    const { database, updates } = fakeDatabase({ status: 'done', total: 60, definition })
    const { sweep, calls } = fakeSweep()
    expect(await handleProblemSweep({ v: 1, sweepId: 7 }, { database, sweep })).toBe('already-done')
    expect(calls).toEqual([])
    expect(updates).toEqual([])
  })

  test('a sweep that no longer exists is skipped', async () => {
    const { database, updates } = fakeDatabase(null)
    expect(await handleProblemSweep({ v: 1, sweepId: 7 }, { database, sweep: fakeSweep().sweep })).toBe('missing')
    expect(updates).toEqual([])
  })

  test('a malformed payload throws a permanent error before touching the database', async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 60, definition })
    for (const payload of [null, {}, { v: 2, sweepId: 1 }, { v: 1, sweepId: -1 }, { v: 1, sweepId: '1' }]) {
      await expect(handleProblemSweep(payload, { database, sweep: fakeSweep().sweep })).rejects.toBeInstanceOf(
        PermanentJobError,
      )
    }
    expect(updates).toEqual([])
  })

  /** A sweep whose second chunk throws, with a stack under the message. */
  function failingSweep(error: Error = new Error('solver blew up\n    at somewhere.ts:1')) {
    let n = 0
    return (_d: ProblemDefinition, o: { seeds: readonly number[] }): SweepSummary => {
      if (++n === 2) throw error
      return { checked: o.seeds.length, failed: 0, failures: [] }
    }
  }

  test('an attempt that fails with retries left puts the sweep back in the queue and says a retry is coming', async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 60, definition })
    await expect(
      handleProblemSweep(
        { v: 1, sweepId: 7 },
        { database, sweep: failingSweep(), chunk: 25, attempt: { number: 1, of: 3 } },
      ),
    ).rejects.toThrow('solver blew up')
    expect(updates.map((u) => u.status ?? 'progress')).toEqual(['running', 'progress', 'queued'])
    expect(updates.at(-1)).toEqual({
      status: 'queued',
      finishedAt: null,
      error: 'Attempt 1 of 3 stopped (solver blew up); trying again shortly.',
    })
  })

  test('the next-to-last attempt still waits for the last one', async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 60, definition })
    await expect(
      handleProblemSweep(
        { v: 1, sweepId: 7 },
        { database, sweep: failingSweep(), chunk: 25, attempt: { number: 2, of: 3 } },
      ),
    ).rejects.toThrow()
    expect(updates.at(-1)).toMatchObject({
      status: 'queued',
      error: 'Attempt 2 of 3 stopped (solver blew up); trying again shortly.',
    })
  })

  test('the last attempt marks the sweep failed, saying how many attempts were made', async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 60, definition })
    await expect(
      handleProblemSweep(
        { v: 1, sweepId: 7 },
        { database, sweep: failingSweep(), chunk: 25, attempt: { number: 3, of: 3 } },
      ),
    ).rejects.toThrow('solver blew up')
    expect(updates.map((u) => u.status ?? 'progress')).toEqual(['running', 'progress', 'failed'])
    expect(updates.at(-1)!.error).toBe('The check stopped after 3 attempts: solver blew up')
    expect(updates.at(-1)!.finishedAt).toBeInstanceOf(Date)
  })

  test('a permanent error marks the sweep failed even with retries left', async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 60, definition })
    const sweep = failingSweep(new PermanentJobError('this version can never be checked'))
    await expect(
      handleProblemSweep({ v: 1, sweepId: 7 }, { database, sweep, chunk: 25, attempt: { number: 1, of: 3 } }),
    ).rejects.toBeInstanceOf(PermanentJobError)
    expect(updates.at(-1)).toMatchObject({
      status: 'failed',
      error: 'The check stopped: this version can never be checked',
    })
  })

  test('without attempt numbers an error is taken as final: failed, with a one-line message, thrown again', async () => {
    const { database, updates } = fakeDatabase({ status: 'queued', total: 60, definition })
    let n = 0
    const sweep = (_d: ProblemDefinition, o: { seeds: readonly number[] }): SweepSummary => {
      if (++n === 2) throw new Error('solver blew up\n    at somewhere.ts:1')
      return { checked: o.seeds.length, failed: 0, failures: [] }
    }
    await expect(handleProblemSweep({ v: 1, sweepId: 7 }, { database, sweep, chunk: 25 })).rejects.toThrow(
      'solver blew up',
    )
    expect(updates.map((u) => u.status ?? 'progress')).toEqual(['running', 'progress', 'failed'])
    expect(updates.at(-1)!.error).toBe('The check stopped: solver blew up')
  })
})

describe('handleProblemSweep with a stored document that fails the definition check', () => {
  test('marks the check failed with a plain reason, sweeps nothing and is not retried', async () => {
    const { database, updates } = fakeDatabase({
      status: 'queued',
      total: 60,
      versionId: 41,
      definition: { format: 2, title: 'changed by hand', finds: 'none' },
    })
    const { sweep, calls } = fakeSweep()
    expect(await handleProblemSweep({ v: 1, sweepId: 7 }, { database, sweep })).toBe('unreadable')
    expect(calls).toEqual([])
    expect(updates).toHaveLength(1)
    expect(updates[0]).toMatchObject({ status: 'failed' })
    expect(String(updates[0]!.error)).not.toMatch(/\bat \w+ \(|node_modules/)
    expect(String(updates[0]!.error).length).toBeGreaterThan(10)
  })
})
