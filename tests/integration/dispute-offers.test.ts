/**
 * Where a verdict can be disputed, as the problem page offers it and as the server accepts it
 * (one rule, disputeWindow): not on a correct answer with full points, not on a wrong one while
 * attempts remain, not twice for the same answer, only inside the window; and dropped students
 * read their work but neither submit nor dispute (a clear message, not a 404).
 */
import { and, eq } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { loader as problemLoader, action as problemAction } from '#app/routes/courses/assignments/problem.tsx'
import { loader as disputeLoader } from '#app/routes/courses/assignments/dispute.tsx'
import { db } from '#app/server/db/client.server.ts'
import { disputes, memberships, submissions } from '#app/server/db/schema.server.ts'
import { raiseDispute, resolveDispute } from '#app/server/disputes.server.ts'
import { gradeSubmission, studentVariant } from '#app/server/grading.server.ts'
import { DROPPED_SUBMIT_MESSAGE } from '#app/server/membership-state.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { submitAnswers } from '#app/server/submissions.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import {
  addMember,
  createCourseWithAssignment,
  createUser,
  type AssignmentOverrides,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { sessionCookie } from '#tests/support/login.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition
const DAY = 86_400_000

async function setUp(assignment: AssignmentOverrides = {}) {
  const made = await createCourseWithAssignment(db(), [ottoV1], { students: 2, assignment })
  const ta = await createUser(db(), { name: 'Tara Assistant', password: null })
  await addMember(db(), ta.id, made.course.id, 'ta')
  const item = made.items[0]!
  const me = made.students[0]!
  const keyOf = (userId: number) => {
    const drawn = studentVariant({
      versionId: item.problemVersionId,
      definition: ottoV1,
      assignmentId: made.assignment.id,
      problemId: item.problemId,
      userId,
      courseConvention: made.course.signConvention,
    })
    if (!drawn.ok) throw new Error(drawn.error.message)
    return Object.fromEntries(drawn.variant.key.map((k) => [k.name, k.value]))
  }
  const ref = { courseId: made.course.id, assignmentId: made.assignment.id, position: 1, userId: me.id }
  const answer = async (answers: Record<string, string>) => {
    const r = await submitAnswers(db(), { ...ref, answers })
    if (!r.ok) throw new Error(r.formError)
    expect(await gradeSubmission(db(), r.receipt.submissionId)).toBe('graded')
  }
  const path = `/courses/${made.course.id}/assignments/${made.assignment.id}/problems/1`
  const params = { courseId: String(made.course.id), assignmentId: String(made.assignment.id), position: '1' }
  const cookie = await sessionCookie(me)
  const offers = async () =>
    (
      (await problemLoader(args(getRequest(path, { Cookie: cookie }), params))) as Extract<
        Awaited<ReturnType<typeof problemLoader>>,
        { notOpen: null }
      >
    ).offers
  const raise = (findName: string) =>
    raiseDispute(db(), { ...ref, findName, reason: 'I think the verdict on this answer is wrong.' })
  return { ...made, ta, me, keyOf, ref, answer, path, params, cookie, offers, raise }
}

describe('the dispute offer on the problem page is the server’s rule', () => {
  test('a correct answer with full points: no offer, and the server refuses', async () => {
    const s = await setUp({ attemptsPerFind: 3 })
    const key = s.keyOf(s.me.id)
    await s.answer({ T2: `${key.T2} K` })
    const offers = await s.offers()
    expect(offers.T2).toMatchObject({ allowed: false, code: 'full-points' })
    expect(await s.raise('T2')).toMatchObject({
      ok: false,
      formError: expect.stringMatching(/correct with full points/),
    })
  })

  test('a wrong answer may be disputed, once: not while its dispute is open, not again once resolved', async () => {
    const s = await setUp({ attemptsPerFind: 2 })
    await s.answer({ T2: '1 K' })
    expect((await s.offers()).T2).toMatchObject({ allowed: true })
    const raised = await s.raise('T2')
    expect(raised.ok).toBe(true)
    // One open already: not offered again.
    expect((await s.offers()).T2).toMatchObject({ allowed: false, code: 'open-dispute' })
    if (!raised.ok) return
    await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: raised.disputeId,
      actor: { id: s.ta.id, isAdmin: false, role: 'ta' },
      decision: 'reject',
      comment: 'The key stands.',
    })
    // Resolved on this very answer: not disputed twice.
    expect((await s.offers()).T2).toMatchObject({ allowed: false, code: 'already-disputed' })
    expect(await s.raise('T2')).toMatchObject({ ok: false })
    expect(await db().select({ id: disputes.id }).from(disputes).where(eq(disputes.userId, s.me.id))).toHaveLength(1)
  })

  test('a wrong answer after the assignment closed may be disputed, until the window after the release ends', async () => {
    const s = await setUp({ attemptsPerFind: 3 })
    await s.answer({ T2: '1 K' })
    const { assignments } = await import('#app/server/db/schema.server.ts')
    await db()
      .update(assignments)
      .set({ dueAt: new Date(Date.now() - DAY), opensAt: new Date(Date.now() - 9 * DAY) })
      .where(eq(assignments.id, s.assignment.id))
    expect((await s.offers()).T2).toMatchObject({ allowed: true })
    await db()
      .update(assignments)
      .set({ gradesReleasedAt: new Date(Date.now() - 8 * DAY), disputeDays: 7 })
      .where(eq(assignments.id, s.assignment.id))
    expect((await s.offers()).T2).toMatchObject({ allowed: false, code: 'closed' })
    expect(await s.raise('T2')).toMatchObject({
      ok: false,
      formError: expect.stringMatching(/Disputes for this assignment closed/),
    })
  })
})

describe('a dropped student', () => {
  test('reads the problem page with their past work, but cannot submit or dispute: a clear message, not a 404', async () => {
    const s = await setUp({ attemptsPerFind: 1 })
    await s.answer({ T2: '1 K' })
    await db()
      .update(memberships)
      .set({ droppedAt: new Date() })
      .where(and(eq(memberships.userId, s.me.id), eq(memberships.courseId, s.course.id)))
    const page = (await problemLoader(args(getRequest(s.path, { Cookie: s.cookie }), s.params))) as Extract<
      Awaited<ReturnType<typeof problemLoader>>,
      { notOpen: null }
    >
    expect(page.dropped).toBe(true)
    expect(page.problem.results.finds.find((f) => f.name === 'T2')!.last).toMatchObject({ answer: '1 K' })
    expect(page.offers.T2).toMatchObject({ allowed: false, code: 'dropped' })

    const before = await db().select({ id: submissions.id }).from(submissions).where(eq(submissions.userId, s.me.id))
    const out = await settle(
      problemAction(args(formRequest(s.path, { 'answer.wNet': '100 kJ/kg' }, { Cookie: s.cookie }), s.params)),
    )
    const body = 'value' in out ? (out.value as { data: { formError: string }; init: { status: number } }) : null
    expect(body?.init.status).toBe(400)
    expect(body?.data.formError).toBe(DROPPED_SUBMIT_MESSAGE)
    expect(await db().select({ id: submissions.id }).from(submissions).where(eq(submissions.userId, s.me.id))).toEqual(
      before,
    )

    expect(await s.raise('T2')).toMatchObject({
      ok: false,
      formError: expect.stringMatching(/dropped from this course/),
    })
    const disputePage = (await disputeLoader(
      args(getRequest(`${s.path}/dispute?find=T2`, { Cookie: s.cookie }), s.params),
    )) as { allowance: { allowed: boolean; reason?: string } }
    expect(disputePage.allowance).toMatchObject({ allowed: false, reason: expect.stringMatching(/dropped/) })
  })
})
