/**
 * Home pages that say what to do: a student's due work (next due first, score so far, time
 * left, late ones flagged), a TA's open disputes, an instructor's disputes, unreleased grades
 * and pending invitations; empty states; and an assignment not yet open says when it opens,
 * on its page and its problems' pages, instead of "not found".
 */
import { nanoid } from 'nanoid'
import { afterAll, describe, expect, test } from 'vitest'
import { loader as homeLoader } from '#app/routes/home.tsx'
import { loader as assignmentLoader } from '#app/routes/courses/assignments/$assignmentId.tsx'
import { loader as problemLoader } from '#app/routes/courses/assignments/problem.tsx'
import { db } from '#app/server/db/client.server.ts'
import { accessTokens, disputes, partResults, problemSweeps, submissions } from '#app/server/db/schema.server.ts'
import { durationText } from '#app/server/home.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import {
  addMember,
  createAssignment,
  createCourse,
  createProblemWithVersion,
  createUser,
} from '#tests/support/factories.ts'
import { args, getRequest } from '#tests/support/requests.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { sessionCookie } from '#tests/support/login.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition
const DAY = 86_400_000

type Home = Awaited<ReturnType<typeof homeLoader>>['home']
async function homeOf(userId: number): Promise<Home> {
  return ((await homeLoader(args(getRequest('/', { Cookie: await sessionCookie({ id: userId }) })))) as { home: Home })
    .home
}

async function setUp() {
  const course = await createCourse(db(), { timeZone: 'Europe/Oslo' })
  const instructor = await createUser(db(), { name: 'Ingrid Instructor', departmentId: course.departmentId })
  await addMember(db(), instructor.id, course.id, 'instructor')
  const ta = await createUser(db(), { name: 'Tomas Assistant' })
  await addMember(db(), ta.id, course.id, 'ta')
  const student = await createUser(db(), { name: 'Sam Student' })
  await addMember(db(), student.id, course.id, 'student')
  const p = await createProblemWithVersion(db(), instructor.id, otto)
  return { course, instructor, ta, student, p }
}

describe('the home page says what to do', () => {
  test('a student sees what is due, next due first, with time left and score; a late one is flagged; a closed one is gone', async () => {
    const { course, instructor, student, p } = await setUp()
    const now = Date.now()
    await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Week 5',
      opensAt: new Date(now - DAY),
      dueAt: new Date(now + 5 * DAY),
    })
    await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Week 4',
      opensAt: new Date(now - DAY),
      dueAt: new Date(now + 2 * DAY + 3 * 3600_000 + 60_000),
    })
    await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Week 3',
      opensAt: new Date(now - 9 * DAY),
      dueAt: new Date(now - DAY),
      latePolicy: 'penalty',
      lateDaysAllowed: 3,
      latePenaltyPercentPerDay: 10,
    })
    await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Week 2',
      opensAt: new Date(now - 9 * DAY),
      dueAt: new Date(now - 2 * DAY),
    })
    await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Week 6',
      opensAt: new Date(now + 3 * DAY),
      dueAt: new Date(now + 10 * DAY),
    })
    const home = await homeOf(student.id)
    expect(home.staff).toEqual([])
    const mine = home.student.find((c) => c.courseId === course.id)!
    expect(mine.due.map((d) => d.title)).toEqual(['Week 3', 'Week 4', 'Week 5'])
    const [late, next] = mine.due as [Home['student'][0]['due'][0], Home['student'][0]['due'][0]]
    expect(late).toMatchObject({
      late: true,
      timeLeft: expect.stringMatching(/^late: accepted for 1 day 23 hours more, with a penalty$/),
    })
    expect(next).toMatchObject({ late: false, timeLeft: '2 days 3 hours left', progress: '0 of 10 points so far' })
    expect(next.dueText).toMatch(/\d/)
    expect(mine.opening).toEqual([{ title: 'Week 6', opensText: expect.any(String) }])
  })

  test('nothing due: an empty list, not an error', async () => {
    const { student } = await setUp()
    const home = await homeOf(student.id)
    expect(home.student[0]!.due).toEqual([])
  })

  test('a TA sees the open disputes of their course with the oldest; an instructor also unreleased grades, invitations and failed checks', async () => {
    const { course, instructor, ta, student, p } = await setUp()
    const empty = await homeOf(ta.id)
    expect(empty.staff[0]).toMatchObject({ role: 'ta', openDisputes: 0, oldestDisputeText: null })

    const { assignment, items } = await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Past due',
      opensAt: new Date(Date.now() - 9 * DAY),
      dueAt: new Date(Date.now() - DAY),
    })
    await createAssignment(db(), course.id, instructor.id, [p], { title: 'Still open' })
    const item = items[0]!
    const [sub] = await db()
      .insert(submissions)
      .values({
        assignmentId: assignment.id,
        itemId: item.id,
        userId: student.id,
        answers: { T2: '1 K' },
        status: 'graded',
      })
      .returning()
    const [part] = await db()
      .insert(partResults)
      .values({
        submissionId: sub!.id,
        assignmentId: assignment.id,
        itemId: item.id,
        userId: student.id,
        findName: 'T2',
        answer: '1 K',
        attempt: 1,
        verdict: 'incorrect',
        value: 1,
        score: 0,
        maxScore: 2,
      })
      .returning()
    await db().insert(disputes).values({
      courseId: course.id,
      assignmentId: assignment.id,
      itemId: item.id,
      userId: student.id,
      findName: 'T2',
      partResultId: part!.id,
      reason: 'I think this is right.',
    })
    await db()
      .insert(accessTokens)
      .values({
        token: nanoid(32),
        purpose: 'invitation',
        email: 'new@example.test',
        courseId: course.id,
        role: 'student',
        expiresAt: new Date(Date.now() + DAY),
      })
    await db()
      .insert(accessTokens)
      .values({
        token: nanoid(32),
        purpose: 'invitation',
        email: 'old@example.test',
        courseId: course.id,
        role: 'student',
        expiresAt: new Date(Date.now() - DAY),
      })
    await db().insert(problemSweeps).values({
      problemVersionId: p.versionId,
      requestedBy: instructor.id,
      status: 'done',
      total: 100,
      checked: 100,
      failed: 4,
    })

    const taHome = await homeOf(ta.id)
    expect(taHome.staff[0]).toMatchObject({
      role: 'ta',
      openDisputes: 1,
      reviewHref: `/courses/${course.id}/disputes`,
      oldestDisputeText: expect.stringMatching(/^the oldest waiting since /),
    })
    expect(taHome.staff[0]!.unreleased).toEqual([])
    expect(taHome.failedChecks).toEqual([])

    const mine = await homeOf(instructor.id)
    expect(mine.staff[0]).toMatchObject({ role: 'instructor', openDisputes: 1, pendingInvitations: 1 })
    expect(mine.staff[0]!.unreleased.map((u) => u.title)).toEqual(['Past due'])
    expect(mine.failedChecks).toEqual([
      { problemId: p.problemId, title: otto.title, failed: 4, total: 100, status: 'done' },
    ])
  })

  test('durations read in the two largest units', () => {
    expect(durationText(2 * DAY + 3 * 3600_000 + 5 * 60_000)).toBe('2 days 3 hours')
    expect(durationText(3600_000 + 60_000)).toBe('1 hour 1 minute')
    expect(durationText(30_000)).toBe('less than a minute')
  })
})

describe('an assignment not open yet', () => {
  test('its page and its problem pages tell the student when it opens, and nothing of its content', async () => {
    const { course, instructor, student, p } = await setUp()
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Week 9',
      opensAt: new Date(Date.now() + 2 * DAY),
      dueAt: new Date(Date.now() + 9 * DAY),
    })
    const cookie = await sessionCookie(student)
    const params = { courseId: String(course.id), assignmentId: String(assignment.id) }
    const page = await assignmentLoader(
      args(getRequest(`/courses/${course.id}/assignments/${assignment.id}`, { Cookie: cookie }), params),
    )
    expect(page).toMatchObject({
      notOpen: {
        title: 'Week 9',
        message: expect.stringMatching(/^“Week 9” opens .+ Its problems appear here then\.$/),
      },
    })
    expect(page).not.toHaveProperty('detail')
    const problem = await problemLoader(
      args(getRequest(`/courses/${course.id}/assignments/${assignment.id}/problems/1`, { Cookie: cookie }), {
        ...params,
        position: '1',
      }),
    )
    expect(problem).toEqual({
      notOpen: {
        title: 'Week 9',
        message: expect.stringMatching(/opens/),
        back: `/courses/${course.id}/assignments/${assignment.id}`,
      },
    })
  })
})
