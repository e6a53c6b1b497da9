import { eq, inArray, sql } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import { db } from '#app/server/db/client.server.ts'
import { sessions, signInAttempts } from '#app/server/db/schema.server.ts'
import { PermanentJobError, stopBoss } from '#app/server/queue.server.ts'
import { PAIR_LOOKBACK_MS } from '#app/server/rate-limit.server.ts'
import { handlePurgeExpired } from '#jobs/handlers/purge-expired.ts'
import { PURGE_CRON, startWorker } from '#jobs/worker.ts'
import { createUser } from '#tests/support/factories.ts'

afterAll(async () => {
  await stopBoss()
})

describe('purge-expired', () => {
  test('deletes expired sessions and attempts too old to count, and keeps everything else', async () => {
    const now = new Date('2026-12-03T12:00:00Z')
    const user = await createUser(db())
    await db()
      .insert(sessions)
      .values([
        { id: 'purge-expired-a', userId: user.id, expiresAt: new Date(now.getTime() - 1000) },
        { id: 'purge-expired-b', userId: user.id, expiresAt: new Date(now.getTime() - 86_400_000) },
        { id: 'purge-live', userId: user.id, expiresAt: new Date(now.getTime() + 1000) },
      ])
    const old = new Date(now.getTime() - PAIR_LOOKBACK_MS - 60_000)
    const recent = new Date(now.getTime() - 60_000)
    const inserted = await db()
      .insert(signInAttempts)
      .values([
        { email: 'purge@test.example', clientAddress: '10.90.0.1', succeeded: false, kind: 'sign-in', createdAt: old },
        { email: 'purge@test.example', clientAddress: '10.90.0.1', succeeded: true, kind: 'reset', createdAt: old },
        {
          email: 'purge@test.example',
          clientAddress: '10.90.0.1',
          succeeded: false,
          kind: 'sign-in',
          createdAt: recent,
        },
        { email: 'purge@test.example', clientAddress: '10.90.0.1', succeeded: true, kind: 'reset', createdAt: recent },
      ])
      .returning({ id: signInAttempts.id, createdAt: signInAttempts.createdAt })

    expect(await handlePurgeExpired({ v: 1 }, { database: db(), now })).toEqual({ sessions: 2, attempts: 2 })
    const left = await db().select({ id: sessions.id }).from(sessions).where(eq(sessions.userId, user.id))
    expect(left.map((r) => r.id)).toEqual(['purge-live'])
    const attempts = await db()
      .select({ createdAt: signInAttempts.createdAt })
      .from(signInAttempts)
      .where(
        inArray(
          signInAttempts.id,
          inserted.map((r) => r.id),
        ),
      )
    expect(attempts.map((r) => r.createdAt.getTime())).toEqual([recent.getTime(), recent.getTime()])

    // A second run finds nothing more.
    expect(await handlePurgeExpired({ v: 1 }, { database: db(), now })).toEqual({ sessions: 0, attempts: 0 })
  })

  test.each([
    ['nothing', null],
    ['another version', { v: 2 }],
  ])('a malformed payload (%s) fails for good', async (_what, payload) => {
    await expect(handlePurgeExpired(payload, { database: db() })).rejects.toBeInstanceOf(PermanentJobError)
  })

  test('the worker schedules it', async () => {
    const worker = await startWorker({ log: () => {} })
    try {
      const rows = await db().execute(sql`select name, cron, data from pgboss.schedule where name = 'purge-expired'`)
      expect(rows.rows).toEqual([{ name: 'purge-expired', cron: PURGE_CRON, data: { v: 1 } }])
    } finally {
      await worker.stop()
    }
  })
})
