import { describe, expect, test } from 'vitest'
import type { Db } from '#app/server/db/client.server.ts'
import type { buildTermExport } from '#app/server/exports.server.ts'
import { PermanentJobError } from '#app/server/queue.server.ts'
import { handleExportGrades } from './export-grades.ts'

const database = {} as Db

function fakeBuild(outcome: Awaited<ReturnType<typeof buildTermExport>> = 'done') {
  const calls: { database: Db; exportId: number; lastAttempt: boolean | undefined }[] = []
  const build: typeof buildTermExport = async (db, exportId, options = {}) => {
    calls.push({ database: db, exportId, lastAttempt: options.lastAttempt })
    return outcome
  }
  return { build, calls }
}

describe('handleExportGrades', () => {
  test('builds the export named in the payload and returns what the build says', async () => {
    const { build, calls } = fakeBuild('already-done')
    expect(await handleExportGrades({ v: 1, exportId: 42 }, { database, attempt: { number: 1, of: 3 }, build })).toBe(
      'already-done',
    )
    expect(calls).toEqual([{ database, exportId: 42, lastAttempt: false }])
  })

  test.each([
    [1, 3, false],
    [2, 3, false],
    [3, 3, true],
  ])('attempt %i of %i: last attempt %s', async (number, of, last) => {
    const { build, calls } = fakeBuild()
    await handleExportGrades({ v: 1, exportId: 7 }, { database, attempt: { number, of }, build })
    expect(calls[0]?.lastAttempt).toBe(last)
  })

  test.each([
    ['nothing', null],
    ['no id', { v: 1 }],
    ['a zero id', { v: 1, exportId: 0 }],
    ['a text id', { v: 1, exportId: '7' }],
    ['another version', { v: 2, exportId: 7 }],
  ])('a malformed payload (%s) fails for good without building', async (_what, payload) => {
    const { build, calls } = fakeBuild()
    await expect(
      handleExportGrades(payload, { database, attempt: { number: 1, of: 3 }, build }),
    ).rejects.toBeInstanceOf(PermanentJobError)
    expect(calls).toEqual([])
  })

  test('a failing build is thrown on, so the worker retries or dead-letters it', async () => {
    const error = new Error('connection terminated')
    const build: typeof buildTermExport = async () => {
      throw error
    }
    await expect(
      handleExportGrades({ v: 1, exportId: 7 }, { database, attempt: { number: 1, of: 3 }, build }),
    ).rejects.toBe(error)
  })
})
