import { expect, test, vi } from 'vitest'
import type { Db } from '#app/server/db/client.server.ts'
import { PermanentJobError } from '#app/server/queue.server.ts'
import { handleGradeSubmission } from './grade-submission.ts'

const database = {} as Db

test('grades the submission named by the payload', async () => {
  const grade = vi.fn(async () => 'graded' as const)
  await expect(handleGradeSubmission({ v: 1, submissionId: 42 }, { database, grade })).resolves.toBe('graded')
  expect(grade).toHaveBeenCalledWith(database, 42)
})

test.each([[{ v: 1 }], [{ v: 2, submissionId: 1 }], [{ v: 1, submissionId: -3 }], ['42'], [null]])(
  'a malformed payload %j fails for good',
  async (payload) => {
    const grade = vi.fn()
    await expect(handleGradeSubmission(payload, { database, grade })).rejects.toBeInstanceOf(PermanentJobError)
    expect(grade).not.toHaveBeenCalled()
  },
)

test('a database failure is thrown, so pg-boss retries the job', async () => {
  const grade = vi.fn(async () => {
    throw new Error('connection reset')
  })
  await expect(handleGradeSubmission({ v: 1, submissionId: 7 }, { database, grade })).rejects.toThrow(
    'connection reset',
  )
})
