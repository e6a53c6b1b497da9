/**
 * The teaching loop on the server, against real PostgreSQL and a real pg-boss worker:
 * submit → stored at once with a receipt → graded in the background → results; a duplicated
 * job counted once; attempts, late policy and extensions.
 */
import { and, eq, sql } from 'drizzle-orm'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { loader as gradebookLoader } from '#app/routes/resources/api-assignment-gradebook.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAssignmentStatistics, type AssignmentGradebook } from '#app/server/gradebook.server.ts'
import { args, getRequest } from '#tests/support/requests.ts'
import { extensions, partResults, submissions } from '#app/server/db/schema.server.ts'
import {
  gradeSubmission,
  gradeSubmissions,
  listAssignmentTotals,
  listFindScores,
  studentVariant,
} from '#app/server/grading.server.ts'
import { enqueue, stopBoss } from '#app/server/queue.server.ts'
import { getMyResults, getStudentProblem, submitAnswers } from '#app/server/submissions.server.ts'
import { handleGradeSubmission } from '#jobs/handlers/grade-submission.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { createCourseWithAssignment, drawnVariant } from '#tests/support/factories.ts'
import { sessionCookie } from '#tests/support/login.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition

let worker: RunningWorker
const workerErrors: string[] = []

beforeAll(async () => {
  worker = await startWorker({ log: () => {}, logError: (line) => workerErrors.push(line), gradingLoops: 1 })
})

afterAll(async () => {
  await worker.stop()
  await stopBoss()
})

async function until<T>(what: string, read: () => Promise<T>, done: (v: T) => boolean, ms = 20_000): Promise<T> {
  const end = Date.now() + ms
  for (;;) {
    const v = await read()
    if (done(v)) return v
    if (Date.now() > end) throw new Error(`Timed out waiting for ${what}: ${JSON.stringify(v)}`)
    await new Promise((r) => setTimeout(r, 100))
  }
}

async function setUp(options: Parameters<typeof createCourseWithAssignment>[2] = {}) {
  const made = await createCourseWithAssignment(db(), [ottoV1], { students: 2, ...options })
  const student = made.students[0]!
  const item = made.items[0]!
  const ref = { courseId: made.course.id, assignmentId: made.assignment.id, position: 1, userId: student.id }
  const variant = drawnVariant(made, ottoV1, { student, item })
  const key = Object.fromEntries(variant.key.map((k) => [k.name, k]))
  return { ...made, student, item, ref, key }
}

describe('submit, grade, read back', () => {
  test('a submission is stored at once, graded by the worker, and its verdicts come back per find', async () => {
    const s = await setUp()
    const answers = { T2: `${s.key.T2!.value} K`, wNet: `${-s.key.wNet!.value} kJ/kg`, eta: 'about half' }
    const result = await submitAnswers(db(), { ...s.ref, answers })
    expect(result.ok).toBe(true)
    if (!result.ok) return
    // The receipt: stored now, attempt 1 of 3 for the two readable answers, the unreadable one refused without using an attempt.
    expect(result.receipt.status).toBe('queued')
    expect(result.receipt.parts.map((p) => [p.findName, p.attempt, p.of])).toEqual([
      ['T2', 1, 3],
      ['wNet', 1, 3],
    ])
    expect(result.fieldErrors.eta).toMatch(/did not use an attempt/)
    expect(result.values.eta).toBe('about half')

    const graded = await until(
      'grading',
      () => getMyResults(db(), s.ref),
      (r) => r !== null && !r.pending,
    )
    const byName = Object.fromEntries(graded!.finds.map((f) => [f.name, f]))
    expect(byName.T2).toMatchObject({ state: 'correct', attemptsUsed: 1 })
    expect(byName.T2!.score).toBeCloseTo(10 * (2 / 7), 9)
    expect(byName.wNet).toMatchObject({ state: 'try-again', attemptsUsed: 1, score: 0 })
    expect(byName.wNet!.last?.verdict).toBe('incorrect')
    expect(byName.wNet!.last?.pitfallFeedback).toMatch(/sign/)
    expect(byName.eta).toMatchObject({ state: 'not-started', attemptsUsed: 0 })
    expect(graded!.receipts[0]!.status).toBe('graded')
    expect(workerErrors).toEqual([])
  })

  test('the variant is the same on every load and differs between students', async () => {
    const s = await setUp()
    const a = await getStudentProblem(db(), s.ref)
    const b = await getStudentProblem(db(), s.ref)
    const other = await getStudentProblem(db(), { ...s.ref, userId: s.students[1]!.id })
    expect(a!.promptHtml).toBe(b!.promptHtml)
    expect(a!.promptHtml).not.toBe(other!.promptHtml)
    expect(a!.key).toBeNull()
  })

  test('a duplicated grading job counts once', async () => {
    const s = await setUp()
    const result = await submitAnswers(db(), { ...s.ref, answers: { T2: `${s.key.T2!.value} K` } })
    if (!result.ok) throw new Error(result.formError)
    const id = result.receipt.submissionId
    await enqueue('grade-submission', { v: 1, submissionId: id })
    await enqueue('grade-submission', { v: 1, submissionId: id })
    await until(
      'grading',
      () => getMyResults(db(), s.ref),
      (r) => r !== null && !r.pending,
    )
    const [first] = await db()
      .select({ gradedAt: submissions.gradedAt })
      .from(submissions)
      .where(eq(submissions.id, id))
    // Let the duplicates run, then grade once more by hand: nothing changes.
    await until(
      'the duplicate jobs',
      async () =>
        (
          await db().execute<{ n: number }>(
            sql`select count(*)::int as n from pgboss.job where name = 'grade-submission' and data->>'submissionId' = ${String(id)} and state in ('created', 'active', 'retry')`,
          )
        ).rows[0]!.n,
      (n) => n === 0,
    )
    expect(await gradeSubmission(db(), id)).toBe('already-graded')
    const [after] = await db()
      .select({ gradedAt: submissions.gradedAt })
      .from(submissions)
      .where(eq(submissions.id, id))
    expect(after!.gradedAt).toEqual(first!.gradedAt)
    const parts = await db().select().from(partResults).where(eq(partResults.submissionId, id))
    expect(parts).toHaveLength(1)
    const scores = await listFindScores(db(), { assignmentIds: [s.assignment.id], userId: s.student.id })
    expect(scores).toEqual([expect.objectContaining({ findName: 'T2', attempts: 1, correct: true })])
    expect(scores[0]!.score).toBeCloseTo(10 * (2 / 7), 9)
  })

  test('a batch grades each submission once, whatever else it holds', async () => {
    await worker.stop()
    try {
      const s = await setUp()
      const a = await submitAnswers(db(), { ...s.ref, answers: { T2: `${s.key.T2!.value} K` } })
      const b = await submitAnswers(db(), { ...s.ref, userId: s.students[1]!.id, answers: { wNet: '1 kJ/kg' } })
      if (!a.ok || !b.ok) throw new Error('not stored')
      const [ida, idb] = [a.receipt.submissionId, b.receipt.submissionId]
      expect(await gradeSubmission(db(), ida)).toBe('graded')
      // ida again (already graded), idb twice (a duplicated job in the same fetch), and an id that does not exist.
      const outcomes = await gradeSubmissions(db(), [ida, idb, idb, 999_999])
      expect(Object.fromEntries(outcomes)).toEqual({ [ida]: 'already-graded', [idb]: 'graded', 999999: 'missing' })
      const parts = await db()
        .select({ verdict: partResults.verdict, gradedAt: partResults.gradedAt })
        .from(partResults)
        .where(eq(partResults.submissionId, idb))
      expect(parts).toEqual([{ verdict: 'incorrect', gradedAt: expect.any(Date) }])
    } finally {
      worker = await startWorker({ log: () => {}, logError: (line) => workerErrors.push(line), gradingLoops: 1 })
    }
  })

  test('a submission another transaction holds is retried, not completed: graded once that transaction ends', async () => {
    const s = await setUp()
    // Stored without a job first, so the running worker cannot take it before the lock below.
    const [sub] = await db()
      .insert(submissions)
      .values({
        assignmentId: s.assignment.id,
        itemId: s.item.id,
        userId: s.student.id,
        answers: { T2: `${s.key.T2!.value} K` },
      })
      .returning({ id: submissions.id })
    await db()
      .insert(partResults)
      .values({
        submissionId: sub!.id,
        assignmentId: s.assignment.id,
        itemId: s.item.id,
        userId: s.student.id,
        findName: 'T2',
        answer: `${s.key.T2!.value} K`,
        attempt: 1,
        maxScore: 20 / 7,
      })
    const holder = new pg.Client({ connectionString: process.env.DATABASE_URL })
    await holder.connect()
    try {
      await holder.query('begin')
      await holder.query('select id from submissions where id = $1 for update', [sub!.id])
      expect(Object.fromEntries(await gradeSubmissions(db(), [sub!.id]))).toEqual({ [sub!.id]: 'busy' })
      await expect(handleGradeSubmission({ v: 1, submissionId: sub!.id }, { database: db() })).rejects.toThrow(
        /another transaction/,
      )
      // Through the worker: its batch finds the row held, runs the job alone, and pg-boss retries it.
      await enqueue('grade-submission', { v: 1, submissionId: sub!.id })
      await until(
        'the worker to find the submission held',
        async () => workerErrors.filter((e) => e.includes(`submission ${sub!.id} is being graded`)).length,
        (n) => n > 0,
      )
      await holder.query('rollback')
    } finally {
      await holder.end()
    }
    await until(
      'the retried job to grade it',
      async () =>
        (await db().select({ status: submissions.status }).from(submissions).where(eq(submissions.id, sub!.id)))[0]!
          .status,
      (st) => st === 'graded',
    )
    const parts = await db()
      .select({ verdict: partResults.verdict })
      .from(partResults)
      .where(eq(partResults.submissionId, sub!.id))
    expect(parts).toEqual([{ verdict: 'correct' }])
    workerErrors.length = 0
  })

  test('attempts run out per find, and two quick presses get different attempt numbers', async () => {
    const s = await setUp({ assignment: { attemptsPerFind: 2 } })
    const wrong = { wNet: `${s.key.wNet!.value * 1.5} kJ/kg` }
    const [a, b] = await Promise.all([
      submitAnswers(db(), { ...s.ref, answers: wrong }),
      submitAnswers(db(), { ...s.ref, answers: wrong }),
    ])
    const attempts = [a, b].map((r) => (r.ok ? r.receipt.parts[0]!.attempt : 0)).sort()
    expect(attempts).toEqual([1, 2])
    const third = await submitAnswers(db(), { ...s.ref, answers: wrong })
    expect(third.ok).toBe(false)
    expect(third.fieldErrors.wNet).toMatch(/used all 2 attempts/)
    expect(third.values.wNet).toBe(wrong.wNet)
  })

  test('a correct find is not graded again', async () => {
    const s = await setUp()
    const first = await submitAnswers(db(), { ...s.ref, answers: { T2: `${s.key.T2!.value} K` } })
    if (!first.ok) throw new Error(first.formError)
    await until(
      'grading',
      () => getMyResults(db(), s.ref),
      (r) => r !== null && !r.pending,
    )
    const again = await submitAnswers(db(), { ...s.ref, answers: { T2: '1 K' } })
    expect(again).toMatchObject({ ok: false, formError: expect.stringMatching(/already correct/) })
  })
})

describe('the gradebook follows the worker', () => {
  test('submit → graded by the worker → the staff gradebook JSON shows the score', async () => {
    const s = await setUp()
    const cookie = await sessionCookie(s.instructor)
    const read = async () => {
      const res = await gradebookLoader(
        args(getRequest(`/api/assignments/${s.assignment.id}/gradebook?expand=1`, { Cookie: cookie }), {
          assignmentId: String(s.assignment.id),
        }),
      )
      expect(res.status).toBe(200)
      return (await res.json()) as AssignmentGradebook
    }
    const before = await read()
    expect(before.students.find((x) => x.userId === s.student.id)?.total).toBe(0)

    const result = await submitAnswers(db(), {
      ...s.ref,
      answers: { T2: `${s.key.T2!.value} K`, wNet: `${s.key.wNet!.value} kJ/kg`, eta: `${s.key.eta!.value * 1.2}` },
    })
    if (!result.ok) throw new Error(result.formError)
    const graded = await until(
      'the gradebook',
      read,
      (g) => g.pendingCount === 0 && g.students.some((x) => x.userId === s.student.id && x.total > 0),
    )
    const row = graded.students.find((x) => x.userId === s.student.id)!
    // T2 (2 points of 7) and wNet (3 of 7) right, eta (2 of 7) wrong: 5/7 of the problem's 10 points.
    expect(row.total).toBeCloseTo((10 * 5) / 7, 6)
    expect(row.items[0]!.finds.map((f) => [f.name, f.correct, f.attempts])).toEqual([
      ['T2', true, 1],
      ['wNet', true, 1],
      ['eta', false, 1],
    ])
    expect(graded.students.find((x) => x.userId === s.students[1]!.id)?.total).toBe(0)
  })
})

test('statistics group the same slip on different numbers: the other sign convention is × −1 for both students', async () => {
  const s = await setUp()
  const other = s.students[1]!
  const otherKey = studentVariant({
    versionId: s.item.problemVersionId,
    definition: ottoV1,
    assignmentId: s.assignment.id,
    problemId: s.item.problemId,
    userId: other.id,
    courseConvention: s.course.signConvention,
  })
  if (!otherKey.ok) throw new Error(otherKey.error.message)
  const otherWNet = otherKey.variant.key.find((k) => k.name === 'wNet')!.value
  expect(otherWNet).not.toBeCloseTo(s.key.wNet!.value, 3)
  await submitAnswers(db(), { ...s.ref, answers: { wNet: `${-s.key.wNet!.value} kJ/kg` } })
  await submitAnswers(db(), { ...s.ref, userId: other.id, answers: { wNet: `${-otherWNet} kJ/kg` } })
  await until(
    'grading',
    () => getMyResults(db(), { ...s.ref, userId: other.id }),
    (r) => r !== null && !r.pending,
  )
  await until(
    'grading',
    () => getMyResults(db(), s.ref),
    (r) => r !== null && !r.pending,
  )
  const stats = await getAssignmentStatistics(db(), s.assignment.id)
  const wNet = stats!.items[0]!.finds.find((f) => f.name === 'wNet')!
  expect(wNet.wrongMultiples.map((g) => [g.value, g.count, g.pitfall?.id, g.pitfall?.count])).toEqual([
    [-1, 2, 'sign-convention-flipped', 2],
  ])
  // By value they are two groups of one: the students' numbers differ.
  expect(wNet.wrongAnswers.map((g) => g.count)).toEqual([1, 1])
})

describe('late policy and extensions', () => {
  const day = 24 * 3600_000

  test('closed after due: refused, nothing stored, the typed answers come back', async () => {
    const s = await setUp({
      assignment: { opensAt: new Date(Date.now() - 10 * day), dueAt: new Date(Date.now() - day) },
    })
    const result = await submitAnswers(db(), { ...s.ref, answers: { T2: '500 K' } })
    expect(result).toMatchObject({
      ok: false,
      formError: expect.stringMatching(/due date has passed/),
      values: { T2: '500 K' },
    })
    const rows = await db().select().from(submissions).where(eq(submissions.assignmentId, s.assignment.id))
    expect(rows).toHaveLength(0)
  })

  test('penalty policy: accepted late with the share per day taken off the score', async () => {
    const s = await setUp({
      assignment: {
        opensAt: new Date(Date.now() - 10 * day),
        dueAt: new Date(Date.now() - 1.5 * day),
        latePolicy: 'penalty',
        latePenaltyPercentPerDay: 10,
        lateDaysAllowed: 3,
      },
    })
    const result = await submitAnswers(db(), { ...s.ref, answers: { T2: `${s.key.T2!.value} K` } })
    if (!result.ok) throw new Error(result.formError)
    // 1.5 days late counts as 2 started days: 20 % off.
    expect(result.receipt).toMatchObject({ daysLate: 2, latePenalty: 0.2 })
    const graded = await until(
      'grading',
      () => getMyResults(db(), s.ref),
      (r) => r !== null && !r.pending,
    )
    expect(graded!.finds[0]!.score).toBeCloseTo(10 * (2 / 7) * 0.8, 5)
    const totals = await listAssignmentTotals(db(), { courseIds: [s.course.id] })
    const mine = totals.find((t) => t.userId === s.student.id)!
    expect(mine).toMatchObject({ late: true, maxScore: 10, pending: 0 })
    expect(mine.score).toBeCloseTo(10 * (2 / 7) * 0.8, 5)
  })

  test('an extension makes the same moment on time, and adds attempts', async () => {
    const s = await setUp({
      assignment: { opensAt: new Date(Date.now() - 10 * day), dueAt: new Date(Date.now() - day), attemptsPerFind: 1 },
    })
    await db()
      .insert(extensions)
      .values({
        assignmentId: s.assignment.id,
        userId: s.student.id,
        dueAt: new Date(Date.now() + day),
        extraAttempts: 1,
        createdBy: s.instructor.id,
      })
    const wrong = { wNet: `${s.key.wNet!.value * 2} kJ/kg` }
    const a = await submitAnswers(db(), { ...s.ref, answers: wrong })
    const b = await submitAnswers(db(), { ...s.ref, answers: wrong })
    expect(a.ok && b.ok).toBe(true)
    if (a.ok) expect(a.receipt).toMatchObject({ daysLate: 0, latePenalty: 0, parts: [{ attempt: 1, of: 2 }] })
    const c = await submitAnswers(db(), { ...s.ref, answers: wrong })
    expect(c.ok).toBe(false)
    // The other student, without the extension, is closed out.
    const other = await submitAnswers(db(), { ...s.ref, userId: s.students[1]!.id, answers: wrong })
    expect(other).toMatchObject({ ok: false, formError: expect.stringMatching(/due date has passed/) })
  })

  test('the key is shown once the student can no longer submit', async () => {
    const s = await setUp({
      assignment: { opensAt: new Date(Date.now() - 10 * day), dueAt: new Date(Date.now() - day) },
    })
    const page = await getStudentProblem(db(), s.ref)
    expect(page!.window.state).toBe('closed')
    expect(page!.key?.entries.map((k) => k.name)).toEqual(['T2', 'wNet', 'eta'])
    expect(page!.key?.workedHtml).toContain('<')
    const count = await db()
      .select({ n: sql<number>`count(*)::int` })
      .from(submissions)
      .where(and(eq(submissions.userId, s.student.id)))
    expect(count[0]!.n).toBe(0)
  })
})
