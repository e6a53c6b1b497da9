/**
 * Gradebooks, answers and statistics read through their /api/ routes with real Requests and
 * staff sessions, over graded rows written straight into submissions and part_results (the
 * grader itself is tested elsewhere; here the numbers come from rows we know by hand).
 *
 * The course: one Otto problem worth 7 points (finds T2 2 pts, wNet 3 pts, eta 2 pts, so
 * shares 2, 3 and 2), four students in sections A/B/A/B:
 * - S1: T2 wrong (310, °C for K) then right; wNet right; eta right, then wrong → 7 of 7, finished.
 * - S2: T2 right one day late with a 50 % penalty (1 point); wNet wrong twice (−412.3,
 *   −412.04, sign flipped) → 1 of 7, late, in progress.
 * - S3: T2 waiting for the grader → being graded.
 * - S4: nothing → not started.
 */
import { and, eq, sql } from 'drizzle-orm'
import { beforeAll, describe, expect, test } from 'vitest'
import { loader as assignmentGradebookLoader } from '#app/routes/resources/api-assignment-gradebook.ts'
import { loader as courseGradebookLoader } from '#app/routes/resources/api-course-gradebook.ts'
import { loader as statisticsLoader } from '#app/routes/resources/api-assignment-statistics.ts'
import { loader as answersLoader } from '#app/routes/resources/api-find-answers.ts'
import { db } from '#app/server/db/client.server.ts'
import {
  assignmentItems,
  assignments,
  memberships,
  partResults,
  submissions,
  users,
} from '#app/server/db/schema.server.ts'
import type {
  AssignmentGradebook,
  AssignmentStatistics,
  CourseGradebook,
  FindAnswers,
} from '#app/server/gradebook.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { addMember, createAssignment, createCourseWithAssignment, createUser } from '#tests/support/factories.ts'
import { args, getRequest, settle } from '#tests/support/requests.ts'
import { sessionCookie } from '#tests/support/login.ts'

// Version 1 of the demo Otto problem: three finds (version 2 adds a fourth).
const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.earlierVersions![0]!

type Setup = Awaited<ReturnType<typeof build>>
let world: Setup

async function build() {
  const made = await createCourseWithAssignment(db(), [otto], { students: 4 })
  const { course, assignment, students, instructor } = made
  const item = made.items[0]!
  await db().update(assignmentItems).set({ points: 7 }).where(eq(assignmentItems.id, item.id))
  const [s1, s2, s3, s4] = students as [
    (typeof students)[0],
    (typeof students)[0],
    (typeof students)[0],
    (typeof students)[0],
  ]
  await db().update(users).set({ email: 'zed.quiet@test.example' }).where(eq(users.id, s4.id))
  const ta = await createUser(db(), { name: 'Course TA', password: null })
  await addMember(db(), ta.id, course.id, 'ta')
  const outsider = await createUser(db(), { name: 'Other Instructor', password: null })

  const maxOf = { T2: 2, wNet: 3, eta: 2 } as const
  async function answer(
    userId: number,
    findName: keyof typeof maxOf,
    attempt: number,
    a: {
      text: string
      verdict: 'correct' | 'incorrect' | null
      value?: number
      score?: number
      pitfallId?: string
      daysLate?: number
      latePenalty?: number
    },
  ) {
    const [sub] = await db()
      .insert(submissions)
      .values({
        assignmentId: assignment.id,
        itemId: item.id,
        userId,
        answers: { [findName]: a.text },
        status: a.verdict === null ? 'queued' : 'graded',
        daysLate: a.daysLate ?? 0,
        latePenalty: a.latePenalty ?? 0,
      })
      .returning({ id: submissions.id })
    await db()
      .insert(partResults)
      .values({
        submissionId: sub!.id,
        assignmentId: assignment.id,
        itemId: item.id,
        userId,
        findName,
        answer: a.text,
        attempt,
        verdict: a.verdict,
        value: a.value ?? null,
        score: a.verdict === null ? null : (a.score ?? 0),
        maxScore: maxOf[findName],
        message: a.verdict === 'correct' ? 'Correct.' : a.verdict === 'incorrect' ? 'Not within tolerance.' : null,
        pitfallId: a.pitfallId ?? null,
        pitfallFeedback: a.pitfallId ? `Feedback for ${a.pitfallId}` : null,
      })
  }
  await answer(s1.id, 'T2', 1, { text: '310 K', verdict: 'incorrect', value: 310, pitfallId: 'celsius-for-kelvin' })
  await answer(s1.id, 'T2', 2, { text: '583 K', verdict: 'correct', value: 583, score: 2 })
  await answer(s1.id, 'wNet', 1, { text: '412 kJ/kg', verdict: 'correct', value: 412, score: 3 })
  await answer(s1.id, 'eta', 1, { text: '0.54', verdict: 'correct', value: 0.54, score: 2 })
  await answer(s1.id, 'eta', 2, { text: '0.6', verdict: 'incorrect', value: 0.6 })
  await answer(s2.id, 'T2', 1, {
    text: '600 K',
    verdict: 'correct',
    value: 600,
    score: 1,
    daysLate: 1,
    latePenalty: 0.5,
  })
  await answer(s2.id, 'wNet', 1, {
    text: '-412.3 kJ/kg',
    verdict: 'incorrect',
    value: -412.3,
    pitfallId: 'sign-convention-flipped',
  })
  await answer(s2.id, 'wNet', 2, {
    text: '-412.04',
    verdict: 'incorrect',
    value: -412.04,
    pitfallId: 'sign-convention-flipped',
  })
  await answer(s3.id, 'T2', 1, { text: '590 K', verdict: null })

  // A second assignment with nothing answered yet, for the course totals.
  const second = await createAssignment(
    db(),
    course.id,
    instructor.id,
    [{ problemId: item.problemId, versionId: item.problemVersionId, points: 10 }],
    {
      title: 'Later work',
      dueAt: new Date(Date.now() + 14 * 24 * 3600_000),
    },
  )
  return {
    course,
    assignment,
    second: second.assignment,
    s1,
    s2,
    s3,
    s4,
    cookies: {
      instructor: await sessionCookie(instructor),
      ta: await sessionCookie(ta),
      student: await sessionCookie(s1),
      outsider: await sessionCookie(outsider),
    },
  }
}

beforeAll(async () => {
  world = await build()
})

async function getJson<T>(
  loader: (a: never) => Promise<Response>,
  path: string,
  params: Record<string, string>,
  cookie?: string,
) {
  const out = await settle(loader(args(getRequest(path, cookie ? { Cookie: cookie } : {}), params)))
  const res = ('value' in out ? out.value : out.thrown) as Response
  return { status: res.status, body: (await res.json()) as T }
}

const gradebook = (query = '', cookie = world.cookies.instructor) =>
  getJson<AssignmentGradebook>(
    assignmentGradebookLoader,
    `/api/assignments/${world.assignment.id}/gradebook${query}`,
    { assignmentId: String(world.assignment.id) },
    cookie,
  )

describe('GET /api/assignments/:id/gradebook', () => {
  test('totals are the best score of each find summed, late penalties included; the late flag and pending answers show', async () => {
    const { status, body } = await gradebook()
    expect(status).toBe(200)
    expect(body.assignment.points).toBe(7)
    // Due in a week: open, so not yet in the course total (the page says so beside the due date).
    expect(body.assignment.stage).toBe('open')
    expect(body.items).toHaveLength(1)
    expect(body.items[0]!.finds.map((f) => [f.name, f.share])).toEqual([
      ['T2', 2],
      ['wNet', 3],
      ['eta', 2],
    ])
    const byId = new Map(body.students.map((s) => [s.userId, s]))
    const s1 = byId.get(world.s1.id)!
    const s2 = byId.get(world.s2.id)!
    const s3 = byId.get(world.s3.id)!
    const s4 = byId.get(world.s4.id)!
    expect([s1.total, s2.total, s3.total, s4.total]).toEqual([7, 1, 0, 0])
    expect(s1.maxScore).toBe(7)
    // Best of attempts: a wrong first T2 and a wrong second eta take nothing away.
    expect(s1.items[0]!.finds.map((f) => [f.name, f.score, f.attempts, f.correct])).toEqual([
      ['T2', 2, 2, true],
      ['wNet', 3, 1, true],
      ['eta', 2, 2, true],
    ])
    expect([s1.late, s2.late, s3.late, s4.late]).toEqual([false, true, false, false])
    expect([s1.status, s2.status, s3.status, s4.status]).toEqual([
      'finished',
      'in-progress',
      'being-graded',
      'not-started',
    ])
    expect(s3.pending).toBe(1)
    expect(body.pendingCount).toBe(1)
    expect(body.studentCount).toBe(4)
    expect(body.sections).toEqual(['A', 'B'])
  })

  test.each([
    ['?section=A', ['s1', 's3']],
    ['?section=B&status=late', ['s2']],
    ['?status=finished', ['s1']],
    ['?status=in-progress', ['s2']],
    ['?status=being-graded', ['s3']],
    ['?status=not-started', ['s4']],
    ['?q=student%20002', ['s2']],
    ['?q=ZED.QUIET', ['s4']],
    ['?sort=total&dir=desc', ['s1', 's2', 's3', 's4']],
    ['?sort=total&dir=asc', ['s3', 's4', 's2', 's1']],
    ['?sort=name&dir=desc', ['s4', 's3', 's2', 's1']],
    ['?sort=section', ['s1', 's3', 's2', 's4']],
    ['?sort=bogus&status=nonsense&dir=sideways', ['s1', 's2', 's3', 's4']],
  ])('the view %s lists %j', async (query, expected) => {
    const { status, body } = await gradebook(query)
    expect(status).toBe(200)
    const names = new Map([world.s1, world.s2, world.s3, world.s4].map((s, i) => [s.id, `s${i + 1}`]))
    expect(body.students.map((s) => names.get(s.userId))).toEqual(expected)
    // Filters narrow the rows, never the count of answers still being graded.
    expect(body.pendingCount).toBe(1)
  })

  test('a TA of the course may read it; a student, a stranger and nobody may not', async () => {
    expect((await gradebook('', world.cookies.ta)).status).toBe(200)
    const student = await gradebook('', world.cookies.student)
    expect(student.status).toBe(403)
    expect(student.body).toEqual({ error: expect.stringContaining('instructors and teaching assistants') })
    expect((await gradebook('', world.cookies.outsider)).status).toBe(403)
    expect(
      (
        await getJson(assignmentGradebookLoader, `/api/assignments/${world.assignment.id}/gradebook`, {
          assignmentId: String(world.assignment.id),
        })
      ).status,
    ).toBe(401)
  })

  test('an unknown or malformed assignment id is a JSON 404', async () => {
    expect(
      (
        await getJson(
          assignmentGradebookLoader,
          '/api/assignments/999999/gradebook',
          { assignmentId: '999999' },
          world.cookies.instructor,
        )
      ).status,
    ).toBe(404)
    const bad = await getJson<{ error: string }>(
      assignmentGradebookLoader,
      '/api/assignments/x/gradebook',
      { assignmentId: 'x' },
      world.cookies.instructor,
    )
    expect(bad.status).toBe(404)
    expect(bad.body.error).toMatch(/no such assignment/)
  })
})

describe('GET /api/courses/:id/gradebook', () => {
  const course = (query = '', cookie = world.cookies.instructor) =>
    getJson<CourseGradebook>(
      courseGradebookLoader,
      `/api/courses/${world.course.id}/gradebook${query}`,
      { courseId: String(world.course.id) },
      cookie,
    )

  test('students × assignments in due order; while nothing is due yet, every score is kept and no total counts it', async () => {
    const { status, body } = await course()
    expect(status).toBe(200)
    expect(body.assignments.map((a) => [a.id, a.points, a.stage, a.counted])).toEqual([
      [world.assignment.id, 7, 'open', false],
      [world.second.id, 10, 'open', false],
    ])
    expect(body.allPoints).toBe(17)
    expect(body.points).toBe(0)
    expect(body.rule).toContain('Totals count only assignments whose due date has passed')
    expect(body.rule).toContain('0 of 2 assignments are past their due date and counted (0 points)')
    const s1 = body.students.find((s) => s.userId === world.s1.id)!
    expect(s1.assignments.map((c) => [c.score, c.maxScore, c.counted, c.status])).toEqual([
      [7, 7, false, 'finished'],
      [0, 10, false, 'not-started'],
    ])
    expect(s1.total).toBe(0)
    expect(s1.status).toBe('in-progress')
    expect(body.students.find((s) => s.userId === world.s2.id)!.late).toBe(true)
    expect(body.pendingCount).toBe(1)
  })

  test('once an assignment’s due date has passed its scores count: the total is out of the counted points only', async () => {
    const [before] = await db()
      .select({ dueAt: assignments.dueAt })
      .from(assignments)
      .where(eq(assignments.id, world.assignment.id))
    await db()
      .update(assignments)
      .set({ dueAt: new Date(Date.now() - 3600_000) })
      .where(eq(assignments.id, world.assignment.id))
    try {
      const { body } = await course()
      expect(body.assignments.map((a) => [a.id, a.counted])).toEqual([
        [world.assignment.id, true],
        [world.second.id, false],
      ])
      expect(body.points).toBe(7)
      expect(body.rule).toContain(
        '1 of 2 assignments are past their due date and counted (7 points); the others are shown but not counted',
      )
      const totals = new Map(body.students.map((s) => [s.userId, [s.total, s.maxScore]]))
      expect([world.s1, world.s2, world.s3, world.s4].map((s) => totals.get(s.id))).toEqual([
        [7, 7],
        [1, 7],
        [0, 7],
        [0, 7],
      ])
    } finally {
      await db().update(assignments).set({ dueAt: before!.dueAt }).where(eq(assignments.id, world.assignment.id))
    }
  })

  test('filters and sorts like the assignment gradebook', async () => {
    const { body } = await course('?status=late')
    expect(body.students.map((s) => s.userId)).toEqual([world.s2.id])
    const sorted = await course('?sort=total&dir=desc&section=A')
    expect(sorted.body.students.map((s) => s.userId)).toEqual([world.s1.id, world.s3.id])
  })

  test('a TA may read it; a student gets 403', async () => {
    expect((await course('', world.cookies.ta)).status).toBe(200)
    expect((await course('', world.cookies.student)).status).toBe(403)
  })
})

describe('names and dropped students', () => {
  test('rows sort by family name, then given name, falling back to the display name; a dropped student is listed apart and in no total', async () => {
    const made = await createCourseWithAssignment(db(), [otto], { students: 5 })
    const [a, b, c, d, e] = made.students
    const names = async (
      id: number,
      familyName: string | null,
      givenName: string | null,
      studentNumber: string | null,
    ) => db().update(users).set({ familyName, givenName, studentNumber }).where(eq(users.id, id))
    await names(a!.id, 'Young', 'Amy', 'N-1')
    await names(b!.id, 'Baker', 'Zed', 'N-2')
    await names(c!.id, 'Baker', 'Al', 'N-3')
    await names(d!.id, null, null, null) // "Student 004": sorted by the display name
    await names(e!.id, 'Aardvark', 'Eve', 'N-5')
    await db()
      .update(memberships)
      .set({ droppedAt: new Date('2026-11-15T10:00:00Z') })
      .where(and(eq(memberships.userId, e!.id), eq(memberships.courseId, made.course.id)))
    const [sub] = await db()
      .insert(submissions)
      .values({
        assignmentId: made.assignment.id,
        itemId: made.items[0]!.id,
        userId: e!.id,
        answers: { T2: '1' },
        status: 'graded',
      })
      .returning({ id: submissions.id })
    await db().insert(partResults).values({
      submissionId: sub!.id,
      assignmentId: made.assignment.id,
      itemId: made.items[0]!.id,
      userId: e!.id,
      findName: 'T2',
      answer: '1',
      attempt: 1,
      verdict: 'correct',
      score: 2,
      maxScore: 2,
    })
    const cookie = await sessionCookie(made.instructor)

    const ag = await getJson<AssignmentGradebook>(
      assignmentGradebookLoader,
      `/api/assignments/${made.assignment.id}/gradebook`,
      { assignmentId: String(made.assignment.id) },
      cookie,
    )
    expect(ag.body.students.map((s) => [s.familyName, s.givenName, s.studentNumber])).toEqual([
      ['Baker', 'Al', 'N-3'],
      ['Baker', 'Zed', 'N-2'],
      ['Student 004', '', null],
      ['Young', 'Amy', 'N-1'],
    ])
    expect(ag.body.studentCount).toBe(4)
    expect(ag.body.dropped.map((x) => [x.userId, x.familyName, x.droppedAt])).toEqual([
      [e!.id, 'Aardvark', '2026-11-15T10:00:00.000Z'],
    ])
    expect(
      (
        await getJson<AssignmentGradebook>(
          assignmentGradebookLoader,
          `/api/assignments/${made.assignment.id}/gradebook?sort=name&dir=desc`,
          { assignmentId: String(made.assignment.id) },
          cookie,
        )
      ).body.students.map((s) => s.familyName),
    ).toEqual(['Young', 'Student 004', 'Baker', 'Baker'])

    const cg = await getJson<CourseGradebook>(
      courseGradebookLoader,
      `/api/courses/${made.course.id}/gradebook`,
      { courseId: String(made.course.id) },
      cookie,
    )
    expect(cg.body.students.map((s) => s.userId)).toEqual([c!.id, b!.id, d!.id, a!.id])
    expect(cg.body.dropped.map((x) => x.userId)).toEqual([e!.id])
    expect(cg.body.students.some((s) => s.userId === e!.id)).toBe(false)
  })
})

describe('GET /api/assignments/:id/problems/:position/answers', () => {
  const answers = (query: string, position = '1', cookie = world.cookies.instructor) =>
    getJson<FindAnswers & { error?: string }>(
      answersLoader,
      `/api/assignments/${world.assignment.id}/problems/${position}/answers${query}`,
      { assignmentId: String(world.assignment.id), position },
      cookie,
    )

  test('every answer to the first find by default, as typed, with verdict, pending ones and late ones flagged', async () => {
    const { status, body } = await answers('')
    expect(status).toBe(200)
    expect(body.find!.name).toBe('T2')
    expect(body.answers.map((a) => [a.userId, a.attempt, a.answer, a.verdict, a.late])).toEqual([
      [world.s1.id, 1, '310 K', 'incorrect', false],
      [world.s1.id, 2, '583 K', 'correct', false],
      [world.s2.id, 1, '600 K', 'correct', true],
      [world.s3.id, 1, '590 K', null, false],
    ])
    expect(body.answers[0]!.pitfall).toEqual({
      id: 'celsius-for-kelvin',
      title: 'Celsius used where kelvin is needed',
      feedback: 'Feedback for celsius-for-kelvin',
    })
    expect(body.answers[3]!.status).toBe('queued')
  })

  test('?find= picks the find; an unknown find or position is a 404', async () => {
    const w = await answers('?find=wNet')
    expect(w.body.answers.map((a) => [a.attempt, a.value, a.pitfall?.id ?? null])).toEqual([
      [1, 412, null],
      [1, -412.3, 'sign-convention-flipped'],
      [2, -412.04, 'sign-convention-flipped'],
    ])
    expect((await answers('?find=nope')).status).toBe(404)
    expect((await answers('', '9')).status).toBe(404)
  })

  test('a student gets 403', async () => {
    expect((await answers('', '1', world.cookies.student)).status).toBe(403)
  })
})

describe('GET /api/assignments/:id/statistics', () => {
  const stats = (cookie = world.cookies.instructor) =>
    getJson<AssignmentStatistics>(
      statisticsLoader,
      `/api/assignments/${world.assignment.id}/statistics`,
      { assignmentId: String(world.assignment.id) },
      cookie,
    )

  test('mean and median of scores as a share of the points, over students with a graded answer', async () => {
    const { status, body } = await stats()
    expect(status).toBe(200)
    const item = body.items[0]!
    // S1 7/7 and S2 1/7; S3's answer is still being graded and does not count yet.
    expect(item.summary.count).toBe(2)
    expect(item.summary.mean).toBeCloseTo((1 + 1 / 7) / 2, 9)
    expect(item.summary.median).toBeCloseTo((1 + 1 / 7) / 2, 9)
    const [t2, wNet, eta] = item.finds as [
      AssignmentStatistics['items'][0]['finds'][0],
      AssignmentStatistics['items'][0]['finds'][0],
      AssignmentStatistics['items'][0]['finds'][0],
    ]
    // T2: S1 2/2 and S2 1/2 (late penalty) → 1 and 0.5.
    expect(t2.summary.mean).toBeCloseTo(0.75, 9)
    expect(t2.summary.median).toBeCloseTo(0.75, 9)
    expect(t2.summary.histogram).toHaveLength(10)
    expect(t2.summary.histogram.map((b) => b.count)).toEqual([0, 0, 0, 0, 0, 1, 0, 0, 0, 1])
    // First attempts graded: S1 wrong, S2 right.
    expect(t2.firstTry).toEqual({ correct: 1, of: 2, share: 0.5 })
    expect(wNet.summary.mean).toBeCloseTo(0.5, 9)
    expect(wNet.firstTry).toEqual({ correct: 1, of: 2, share: 0.5 })
    expect(eta.summary.count).toBe(1)
    expect(eta.firstTry).toEqual({ correct: 1, of: 1, share: 1 })
  })

  test('wrong answers are grouped by value to 3 significant figures with the pitfall that explains them', async () => {
    const { body } = await stats()
    const wNet = body.items[0]!.finds.find((f) => f.name === 'wNet')!
    expect(wNet.wrongAnswers).toEqual([
      {
        value: -412,
        count: 2,
        examples: ['-412.3 kJ/kg', '-412.04'],
        pitfall: {
          id: 'sign-convention-flipped',
          title: 'Sign convention flipped',
          feedback: 'Feedback for sign-convention-flipped',
          count: 2,
        },
      },
    ])
    const t2 = body.items[0]!.finds.find((f) => f.name === 'T2')!
    expect(t2.wrongAnswers.map((g) => [g.value, g.count, g.pitfall?.id])).toEqual([[310, 1, 'celsius-for-kelvin']])
  })

  test('a TA may read them; a student gets 403', async () => {
    expect((await stats(world.cookies.ta)).status).toBe(200)
    expect((await stats(world.cookies.student)).status).toBe(403)
  })
})

describe('the staff pages', () => {
  test('the assignment gradebook page reads the same view from its URL; a student is refused with 403', async () => {
    const { loader } = await import('#app/routes/courses/assignments/gradebook.tsx')
    const params = { courseId: String(world.course.id), assignmentId: String(world.assignment.id) }
    const path = `/courses/${world.course.id}/assignments/${world.assignment.id}/gradebook?status=late&expand=1`
    const page = (await loader(args(getRequest(path, { Cookie: world.cookies.ta }), params))) as {
      gradebook: AssignmentGradebook
    }
    expect(page.gradebook.students.map((s) => s.userId)).toEqual([world.s2.id])
    expect(page.gradebook.view.expand).toBe('1')
    const refused = await settle(loader(args(getRequest(path, { Cookie: world.cookies.student }), params)))
    expect('thrown' in refused && (refused.thrown as { init?: { status?: number } }).init?.status).toBe(403)
  })

  test('the answers page of an assignment of another course is a 404', async () => {
    const { loader } = await import('#app/routes/courses/assignments/answers.tsx')
    const other = await createCourseWithAssignment(db(), [otto], { students: 1 })
    await addMember(db(), other.instructor.id, world.course.id, 'instructor')
    const params = { courseId: String(world.course.id), assignmentId: String(other.assignment.id), position: '1' }
    const out = await settle(
      loader(
        args(
          getRequest(`/courses/${world.course.id}/assignments/${other.assignment.id}/problems/1/answers`, {
            Cookie: await sessionCookie(other.instructor),
          }),
          params,
        ),
      ),
    )
    expect('thrown' in out && (out.thrown as { init?: { status?: number } }).init?.status).toBe(404)
  })
})

describe('a problem version whose stored document fails the definition check', () => {
  test('keeps its column in the gradebook, named as unreadable, instead of taking the page down', async () => {
    const made = await createCourseWithAssignment(db(), [otto], { students: 1 })
    const [item] = await db()
      .select({ versionId: assignmentItems.problemVersionId })
      .from(assignmentItems)
      .where(eq(assignmentItems.id, made.items[0]!.id))
    await db().execute(sql`update problem_versions set definition = 'null'::jsonb where id = ${item!.versionId}`)
    const { status, body } = await getJson<AssignmentGradebook>(
      assignmentGradebookLoader,
      `/api/assignments/${made.assignment.id}/gradebook`,
      { assignmentId: String(made.assignment.id) },
      await sessionCookie(made.instructor),
    )
    expect(status).toBe(200)
    expect(body.items.map((i) => [i.title, i.finds.length])).toEqual([
      [`Unreadable problem (version ${item!.versionId})`, 0],
    ])
  })
})
