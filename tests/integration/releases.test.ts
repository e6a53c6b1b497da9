/**
 * Releases and deletion that cannot be undone: the assignment page asks once more (a second
 * submit with confirm=yes), says what will happen and to how many, offers only what the rules
 * allow now, and the server refuses the same things with a clear 400 (409 for an answered
 * assignment) and changes nothing.
 */
import { and, eq, sql } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import { loader as pageLoader, action as pageAction } from '#app/routes/courses/assignments/$assignmentId.tsx'
import { db } from '#app/server/db/client.server.ts'
import { assignments, auditEvents, extensions, memberships, submissions } from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { releaseGrades, ReleaseRefusedError } from '#app/server/releases.server.ts'
import {
  addMember,
  createAssignment,
  createCourse,
  createProblemWithVersion,
  createUser,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { sessionCookie } from '#tests/support/login.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition
const DAY = 86_400_000

async function setUp(students = 3) {
  const course = await createCourse(db(), { timeZone: 'UTC' })
  const instructor = await createUser(db(), { name: 'Ingrid Instructor', departmentId: course.departmentId })
  await addMember(db(), instructor.id, course.id, 'instructor')
  const list = []
  for (let i = 0; i < students; i++) {
    const s = await createUser(db(), { name: `Student ${i + 1}` })
    await addMember(db(), s.id, course.id, 'student')
    list.push(s)
  }
  const p = await createProblemWithVersion(db(), instructor.id, otto)
  return { course, instructor, students: list, p }
}

async function mailJobsTo(emails: string[]) {
  const r = await db().execute<{ to: string }>(
    sql`select data->>'to' as "to" from pgboss.job where name = 'send-mail' and data->>'to' in (${sql.join(
      emails.map((t) => sql`${t}`),
      sql`, `,
    )})`,
  )
  return r.rows.map((x) => x.to)
}

function statusOf(out: { thrown: unknown } | { value: unknown }): number {
  const r = 'thrown' in out ? out.thrown : out.value
  if (r instanceof Response) return r.status
  if (r && typeof r === 'object' && 'init' in r) return (r as { init: { status?: number } | null }).init?.status ?? 200
  return 200
}

function bodyOf(out: { thrown: unknown } | { value: unknown }): unknown {
  const r = 'thrown' in out ? out.thrown : out.value
  return r && typeof r === 'object' && 'data' in r ? (r as { data: unknown }).data : r
}

async function released(assignmentId: number) {
  const [row] = await db()
    .select({ grades: assignments.gradesReleasedAt, key: assignments.keyReleasedAt })
    .from(assignments)
    .where(eq(assignments.id, assignmentId))
  return row!
}

function page(courseId: number, assignmentId: number) {
  return {
    path: `/courses/${courseId}/assignments/${assignmentId}`,
    params: { courseId: String(courseId), assignmentId: String(assignmentId) },
  }
}

describe('releasing grades', () => {
  test('a release without confirm=yes is refused with 400, releases nothing and mails no one', async () => {
    const { course, instructor, students, p } = await setUp()
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      opensAt: new Date(Date.now() - 9 * DAY),
      dueAt: new Date(Date.now() - 2 * DAY),
    })
    const { path, params } = page(course.id, assignment.id)
    const out = await settle(
      pageAction(
        args(formRequest(path, { intent: 'release-grades' }, { Cookie: await sessionCookie(instructor) }), params),
      ),
    )
    expect(statusOf(out)).toBe(400)
    expect(bodyOf(out)).toMatchObject({ formError: expect.stringMatching(/confirm/) })
    expect((await released(assignment.id)).grades).toBeNull()
    expect(await mailJobsTo(students.map((s) => s.email))).toEqual([])
    await expect(
      releaseGrades(db(), {
        courseId: course.id,
        assignmentId: assignment.id,
        actorId: instructor.id,
        confirmed: false,
      }),
    ).rejects.toBeInstanceOf(ReleaseRefusedError)
  })

  test('the confirmation step says what will happen and to how many (dropped students not counted); confirmed, it mails exactly them', async () => {
    const { course, instructor, students, p } = await setUp(3)
    await db()
      .update(memberships)
      .set({ droppedAt: new Date() })
      .where(and(eq(memberships.userId, students[2]!.id), eq(memberships.courseId, course.id)))
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Week 3',
      opensAt: new Date(Date.now() - 9 * DAY),
      dueAt: new Date(Date.now() - 2 * DAY),
    })
    const { path, params } = page(course.id, assignment.id)
    const cookie = await sessionCookie(instructor)
    const before = (await pageLoader(args(getRequest(path, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof pageLoader>
    >
    expect(before.confirm).toBeNull()
    expect(before.releases!.grades).toEqual({ state: 'offered', early: false })
    const asked = (await pageLoader(
      args(getRequest(`${path}?confirm=release-grades`, { Cookie: cookie }), params),
    )) as Awaited<ReturnType<typeof pageLoader>>
    expect(asked.confirm).toBe('release-grades')
    expect(asked.releases!.studentCount).toBe(2)
    const { gradesReleaseSentence } = await import('#app/domain/assignments/releases.ts')
    expect(gradesReleaseSentence('Week 3', asked.releases!.studentCount)).toBe(
      'E-mails 2 students their score for Week 3; this cannot be undone.',
    )

    const done = (await pageAction(
      args(
        formRequest(`${path}?confirm=release-grades`, { intent: 'release-grades', confirm: 'yes' }, { Cookie: cookie }),
        params,
      ),
    )) as Response
    expect(done.status).toBe(302)
    expect(done.headers.get('Location')).toBe(`${path}?done=grades`)
    expect((await released(assignment.id)).grades).not.toBeNull()
    expect((await mailJobsTo(students.map((s) => s.email))).sort()).toEqual(
      [students[0]!.email, students[1]!.email].sort(),
    )
    const [audit] = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.assignmentId, assignment.id), eq(auditEvents.kind, 'grades-released')))
    expect(audit!.after).toMatchObject({ mailed: 2, early: false })
  })

  test('before every window has closed, a release without the explicit checkbox is refused; with it, it goes through', async () => {
    const { course, instructor, students, p } = await setUp(2)
    // Due yesterday, but one student has an extension to next week.
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      opensAt: new Date(Date.now() - 9 * DAY),
      dueAt: new Date(Date.now() - DAY),
    })
    await db()
      .insert(extensions)
      .values({
        assignmentId: assignment.id,
        userId: students[0]!.id,
        dueAt: new Date(Date.now() + 7 * DAY),
        createdBy: instructor.id,
      })
    const { path, params } = page(course.id, assignment.id)
    const cookie = await sessionCookie(instructor)
    const view = (await pageLoader(
      args(getRequest(`${path}?confirm=release-grades`, { Cookie: cookie }), params),
    )) as Awaited<ReturnType<typeof pageLoader>>
    expect(view.releases!.grades).toEqual({ state: 'offered', early: true })
    expect(view.releases!.stillAnswering).toBe(1)

    const refused = await settle(
      pageAction(args(formRequest(path, { intent: 'release-grades', confirm: 'yes' }, { Cookie: cookie }), params)),
    )
    expect(statusOf(refused)).toBe(400)
    expect(bodyOf(refused)).toMatchObject({ formError: expect.stringMatching(/1 student can still answer/) })
    expect((await released(assignment.id)).grades).toBeNull()
    expect(await mailJobsTo(students.map((s) => s.email))).toEqual([])

    const done = (await pageAction(
      args(formRequest(path, { intent: 'release-grades', confirm: 'yes', early: 'yes' }, { Cookie: cookie }), params),
    )) as Response
    expect(done.status).toBe(302)
    expect((await mailJobsTo(students.map((s) => s.email))).length).toBe(2)
  })

  test('nothing is offered or released before the assignment opens', async () => {
    const { course, instructor, p } = await setUp(1)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      keyRelease: 'manual',
      opensAt: new Date(Date.now() + DAY),
      dueAt: new Date(Date.now() + 7 * DAY),
    })
    const { path, params } = page(course.id, assignment.id)
    const cookie = await sessionCookie(instructor)
    const view = (await pageLoader(args(getRequest(path, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof pageLoader>
    >
    expect(view.releases!.grades.state).toBe('not-yet')
    expect(view.releases!.key.state).toBe('not-yet')
    for (const intent of ['release-grades', 'release-key']) {
      const out = await settle(
        pageAction(args(formRequest(path, { intent, confirm: 'yes', early: 'yes' }, { Cookie: cookie }), params)),
      )
      expect(statusOf(out)).toBe(400)
    }
    expect(await released(assignment.id)).toEqual({ grades: null, key: null })
  })
})

describe('releasing the key by hand', () => {
  test('not offered until every window (late days and extensions included) has closed, with a sentence saying when; then released on confirmation', async () => {
    const { course, instructor, students, p } = await setUp(2)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      keyRelease: 'manual',
      latePolicy: 'penalty',
      lateDaysAllowed: 2,
      latePenaltyPercentPerDay: 10,
      opensAt: new Date(Date.now() - 9 * DAY),
      dueAt: new Date(Date.now() - DAY),
    })
    const { path, params } = page(course.id, assignment.id)
    const cookie = await sessionCookie(instructor)
    // Due yesterday with two late days: still open for a day.
    let view = (await pageLoader(
      args(getRequest(`${path}?confirm=release-key`, { Cookie: cookie }), params),
    )) as Awaited<ReturnType<typeof pageLoader>>
    expect(view.releases!.key).toMatchObject({
      state: 'not-yet',
      reason: expect.stringMatching(/once every student’s window has closed, after /),
    })
    let out = await settle(
      pageAction(args(formRequest(path, { intent: 'release-key', confirm: 'yes' }, { Cookie: cookie }), params)),
    )
    expect(statusOf(out)).toBe(400)
    expect((await released(assignment.id)).key).toBeNull()

    // Past the late days, but one student's extension runs a week longer.
    await db()
      .update(assignments)
      .set({ dueAt: new Date(Date.now() - 5 * DAY) })
      .where(eq(assignments.id, assignment.id))
    await db()
      .insert(extensions)
      .values({
        assignmentId: assignment.id,
        userId: students[1]!.id,
        dueAt: new Date(Date.now() + 7 * DAY),
        createdBy: instructor.id,
      })
    view = (await pageLoader(args(getRequest(path, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof pageLoader>
    >
    expect(view.releases!.key.state).toBe('not-yet')

    await db().delete(extensions).where(eq(extensions.assignmentId, assignment.id))
    view = (await pageLoader(args(getRequest(path, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof pageLoader>
    >
    expect(view.releases!.key.state).toBe('offered')
    out = await settle(pageAction(args(formRequest(path, { intent: 'release-key' }, { Cookie: cookie }), params)))
    expect(statusOf(out)).toBe(400)
    expect((await released(assignment.id)).key).toBeNull()
    const done = (await pageAction(
      args(formRequest(path, { intent: 'release-key', confirm: 'yes' }, { Cookie: cookie }), params),
    )) as Response
    expect(done.headers.get('Location')).toBe(`${path}?done=key`)
    expect((await released(assignment.id)).key).not.toBeNull()
    const rows = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.assignmentId, assignment.id), eq(auditEvents.kind, 'key-released')))
    expect(rows).toHaveLength(1)
  })
})

describe('deleting an assignment', () => {
  test('one nobody answered is deleted after confirmation, with an audit row; without confirm=yes nothing goes', async () => {
    const { course, instructor, p } = await setUp(1)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], { title: 'Spare week' })
    const { path, params } = page(course.id, assignment.id)
    const cookie = await sessionCookie(instructor)
    const view = (await pageLoader(args(getRequest(`${path}?confirm=delete`, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof pageLoader>
    >
    expect(view.deletion).toMatchObject({ title: 'Spare week', items: 1, answered: false })
    const refused = await settle(pageAction(args(formRequest(path, { intent: 'delete' }, { Cookie: cookie }), params)))
    expect(statusOf(refused)).toBe(400)
    expect(
      await db().select({ id: assignments.id }).from(assignments).where(eq(assignments.id, assignment.id)),
    ).toHaveLength(1)
    const done = (await pageAction(
      args(formRequest(path, { intent: 'delete', confirm: 'yes' }, { Cookie: cookie }), params),
    )) as Response
    expect(done.headers.get('Location')).toBe(`/courses/${course.id}?deleted=1`)
    expect(
      await db().select({ id: assignments.id }).from(assignments).where(eq(assignments.id, assignment.id)),
    ).toEqual([])
    const [audit] = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.assignmentId, assignment.id), eq(auditEvents.kind, 'assignment-deleted')))
    expect(audit!.before).toMatchObject({ title: 'Spare week', items: 1 })
  })

  test('one with any submission is refused with a clear message and kept', async () => {
    const { course, instructor, students, p } = await setUp(1)
    const { assignment, items } = await createAssignment(db(), course.id, instructor.id, [p])
    await db()
      .insert(submissions)
      .values({ assignmentId: assignment.id, itemId: items[0]!.id, userId: students[0]!.id, answers: { T2: '300 K' } })
    const { path, params } = page(course.id, assignment.id)
    const cookie = await sessionCookie(instructor)
    const view = (await pageLoader(args(getRequest(path, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof pageLoader>
    >
    expect(view.deletion!.answered).toBe(true)
    const out = await settle(
      pageAction(args(formRequest(path, { intent: 'delete', confirm: 'yes' }, { Cookie: cookie }), params)),
    )
    expect(statusOf(out)).toBe(409)
    expect(bodyOf(out)).toMatchObject({
      formError: expect.stringMatching(/cannot be deleted: students have answered it/),
    })
    expect(
      await db().select({ id: assignments.id }).from(assignments).where(eq(assignments.id, assignment.id)),
    ).toHaveLength(1)
  })
})
