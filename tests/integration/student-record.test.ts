/**
 * One student's page for staff, against PostgreSQL with real Requests and session cookies: a
 * student who answered (one right, one wrong with a pitfall), has an extension and raised a
 * dispute — the page shows their own variant's givens and key (the same numbers the grader
 * used), every answer as typed with its verdict, the extension and the dispute with a link,
 * times in the course's zone. Refused: the student, a classmate, another course's staff; a
 * user who is not a student of the course is a 404.
 */
import { eq } from 'drizzle-orm'
import { createElement } from 'react'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { afterAll, describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { formatInZone } from '#app/lib/dates.ts'
import StudentRecordRoute, { loader } from '#app/routes/courses/students/$userId.tsx'
import { setExtension } from '#app/server/assignments.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { assignments, users } from '#app/server/db/schema.server.ts'
import { raiseDispute } from '#app/server/disputes.server.ts'
import { gradeSubmission } from '#app/server/grading.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { submitAnswers } from '#app/server/submissions.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { addMember, createCourseWithAssignment, createUser, drawnVariant } from '#tests/support/factories.ts'
import { args, getRequest, settle } from '#tests/support/requests.ts'
import { loginAs } from '#tests/support/login.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition
const ZONE = 'America/Chicago'

afterAll(async () => {
  await stopBoss()
})

function statusOf(thrown: unknown): number {
  return thrown instanceof Response ? thrown.status : (thrown as { init: { status: number } }).init.status
}

async function setUp() {
  const made = await createCourseWithAssignment(db(), [ottoV1], { students: 2, timeZone: ZONE })
  const [student, classmate] = made.students as [(typeof made.students)[0], (typeof made.students)[0]]
  await db()
    .update(users)
    .set({ studentNumber: `S${student.id}77`, familyName: 'Okafor', givenName: 'Ada' })
    .where(eq(users.id, student.id))
  const item = made.items[0]!
  const variant = drawnVariant(made, ottoV1, { student, item })
  const key = Object.fromEntries(variant.key.map((k) => [k.name, k]))
  const typed = { T2: `${key.T2!.value} K`, wNet: `${-key.wNet!.value} kJ/kg`, eta: '' }
  const ref = { courseId: made.course.id, assignmentId: made.assignment.id, position: 1, userId: student.id }
  const sent = await submitAnswers(db(), { ...ref, answers: typed })
  if (!sent.ok) throw new Error('the answers were refused')
  expect(await gradeSubmission(db(), sent.receipt.submissionId)).toBe('graded')

  const ext = await setExtension(db(), {
    courseId: made.course.id,
    assignmentId: made.assignment.id,
    actorId: made.instructor.id,
    input: { userId: student.id, dueAt: '2099-03-10T17:00', extraAttempts: 1, reason: 'Away for a field trip.' },
  })
  expect(ext.ok).toBe(true)

  await db()
    .update(assignments)
    .set({ gradesReleasedAt: new Date(Date.now() - 60_000) })
    .where(eq(assignments.id, made.assignment.id))
  const raised = await raiseDispute(db(), {
    ...ref,
    findName: 'wNet',
    reason: 'My net work has the right size; the sign follows our notes.',
  })
  if (!raised.ok) throw new Error('the dispute was refused')

  const ta = await createUser(db(), { name: 'Course TA', password: null })
  await addMember(db(), ta.id, made.course.id, 'ta')
  const other = await createCourseWithAssignment(db(), [ottoV1], { students: 1 })
  const stranger = await createUser(db(), { name: 'Not Enrolled', password: null })
  return {
    ...made,
    student,
    classmate,
    ta,
    other,
    stranger,
    drawn: variant,
    typed,
    disputeId: raised.disputeId,
    params: { courseId: String(made.course.id), userId: String(student.id) },
  }
}

type Setup = Awaited<ReturnType<typeof setUp>>

const pathOf = (s: Setup, userId = s.student.id, courseId = s.course.id) => `/courses/${courseId}/students/${userId}`

async function renderPage(s: Setup, headers: Record<string, string>): Promise<string> {
  const loaderData = await loader(args(getRequest(pathOf(s), headers), s.params))
  const Stub = createRoutesStub([
    {
      path: '/courses/:courseId/students/:userId',
      Component: StudentRecordRoute as never,
      loader: () => loaderData,
      HydrateFallback: () => null,
    },
  ])
  return renderToString(
    createElement(Stub, { initialEntries: [pathOf(s)], hydrationData: { loaderData: { 0: loaderData } } }),
  ).replaceAll('<!-- -->', '')
}

describe('a student’s page', () => {
  test('shows who they are, their variant with its givens and key, every answer, the extension and the dispute', async () => {
    const s = await setUp()
    const { record } = await loader(args(getRequest(pathOf(s), await loginAs(s.instructor)), s.params))

    expect(record.student).toMatchObject({
      id: s.student.id,
      name: s.student.name,
      email: s.student.email,
      studentNumber: `S${s.student.id}77`,
      familyName: 'Okafor',
      givenName: 'Ada',
      section: 'A',
      droppedAt: null,
    })
    expect(record.course.timeZone).toBe(ZONE)

    const [a] = record.assignments
    expect(a!.id).toBe(s.assignment.id)
    const item = a!.items[0]!
    // The variant is the student's own: the grader's numbers, givens with their units.
    if (!item.variant.ok) throw new Error(item.variant.message)
    expect(item.variant.key.map((k) => [k.name, k.value])).toEqual(s.drawn.key.map((k) => [k.name, k.value]))
    expect(item.variant.key.find((k) => k.name === 'wNet')!.unit).toBe('kJ/kg')
    const p1 = s.drawn.givens.find((g) => g.name === 'p1')!
    expect(item.variant.givens.find((g) => g.name === 'p1')!.text).toBe(`${p1.value}\u00a0kPa`)
    expect(item.variant.givens.find((g) => g.name === 'T1')!.text).toMatch(/°C$/)

    const byName = Object.fromEntries(item.finds.map((f) => [f.name, f]))
    expect(byName.T2!.answers).toEqual([
      expect.objectContaining({ attempt: 1, answer: s.typed.T2, verdict: 'correct', daysLate: 0, latePenalty: 0 }),
    ])
    expect(byName.T2!.best).toBeCloseTo(byName.T2!.share, 9)
    expect(byName.wNet!.answers).toEqual([
      expect.objectContaining({ attempt: 1, answer: s.typed.wNet, verdict: 'incorrect', score: 0 }),
    ])
    expect(byName.wNet!.answers[0]!.pitfall).toMatchObject({ id: 'sign-convention-flipped' })
    expect(byName.wNet!.label).toBe('Net work per kg of air')
    // A blank field uses no attempt: nothing to show.
    expect(byName.eta!.answers).toEqual([])

    expect(a!.extension).toMatchObject({
      extraAttempts: 1,
      reason: 'Away for a field trip.',
      grantedBy: s.instructor.name,
    })
    expect(formatInZone(a!.extension!.dueAt!, ZONE, { withZone: false })).toBe('Tue 10 Mar 2099, 17:00')

    expect(record.disputes).toEqual([
      expect.objectContaining({
        id: s.disputeId,
        findName: 'wNet',
        findLabel: 'Net work per kg of air',
        status: 'open',
        position: 1,
        assignmentTitle: s.assignment.title,
      }),
    ])
  })

  test('the page’s HTML: givens and key with units, answers with verdicts, the dispute linked, times in the course zone, empty states', async () => {
    const s = await setUp()
    const html = await renderPage(s, await loginAs(s.ta))
    expect(html).toContain(`S${s.student.id}77`)
    expect(html).toContain('Givens of this student’s variant')
    expect(html).toContain('Key of this student’s variant')
    expect(html).toContain('Net work per kg of air')
    expect(html).toContain(s.typed.wNet)
    expect(html).toContain('Correct')
    expect(html).toContain('Incorrect')
    expect(html).toContain(`href="/courses/${s.course.id}/disputes/${s.disputeId}"`)
    expect(html).toContain('No answers yet.')
    expect(html).toContain('Due Tue 10 Mar 2099, 17:00')
    expect(html).toContain(`Times in ${ZONE}`)
    // Every table scrolls in its own box (a 390 px phone): none stands outside an overflow wrapper.
    const tables = html.split('<table').length - 1
    const wrapped = (html.match(/overflow-x-auto[^>]*>\s*<table/g) ?? []).length
    expect(tables).toBeGreaterThan(3)
    expect(wrapped).toBe(tables)
  })

  test('a student with nothing yet: no answers, no extension, no disputes', async () => {
    const s = await setUp()
    const { record } = await loader(
      args(getRequest(pathOf(s, s.classmate.id), await loginAs(s.instructor)), {
        ...s.params,
        userId: String(s.classmate.id),
      }),
    )
    expect(record.student.section).toBe('B')
    expect(record.assignments[0]!.answered).toBe(0)
    expect(record.assignments[0]!.extension).toBeNull()
    expect(record.disputes).toEqual([])
    expect(record.assignments[0]!.items[0]!.finds.every((f) => f.answers.length === 0 && f.best === null)).toBe(true)
  })

  test('refused to the student, a classmate and another course’s instructor; a 404 for anyone who is not a student of the course', async () => {
    const s = await setUp()
    for (const who of [s.student, s.classmate, s.other.instructor, s.other.students[0]!]) {
      const r = await settle(loader(args(getRequest(pathOf(s), await loginAs(who)), s.params)))
      expect('thrown' in r && statusOf(r.thrown)).toBe(403)
    }
    const staff = await loginAs(s.instructor)
    for (const userId of [s.stranger.id, s.other.students[0]!.id, s.instructor.id, s.ta.id, 999_999_999]) {
      const r = await settle(
        loader(args(getRequest(pathOf(s, userId), staff), { ...s.params, userId: String(userId) })),
      )
      expect('thrown' in r && statusOf(r.thrown)).toBe(404)
    }
    // Another course's instructor asking in their own course for this student: not theirs.
    const r = await settle(
      loader(
        args(getRequest(pathOf(s, s.student.id, s.other.course.id), await loginAs(s.other.instructor)), {
          courseId: String(s.other.course.id),
          userId: String(s.student.id),
        }),
      ),
    )
    expect('thrown' in r && statusOf(r.thrown)).toBe(404)
    const bad = await settle(
      loader(args(getRequest(`/courses/${s.course.id}/students/abc`, staff), { ...s.params, userId: 'abc' })),
    )
    expect('thrown' in bad && statusOf(bad.thrown)).toBe(404)
    // Signed out: to the sign-in page.
    const out = await settle(loader(args(getRequest(pathOf(s)), s.params)))
    expect('thrown' in out && out.thrown instanceof Response && out.thrown.headers.get('Location')).toMatch(
      /^\/sign-in/,
    )
  })
})
