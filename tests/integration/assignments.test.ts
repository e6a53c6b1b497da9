/**
 * Building assignments through the real form actions, extensions, and releases against
 * PostgreSQL: versions frozen on use, field errors that write nothing, dates read in the
 * course's time zone, audit rows, release e-mails queued once, and who may do what.
 */
import { and, count, eq, inArray, sql } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import { loader as overviewLoader, action as overviewAction } from '#app/routes/courses/assignments/$assignmentId.tsx'
import { action as editAction } from '#app/routes/courses/assignments/edit.tsx'
import { action as extensionsAction } from '#app/routes/courses/assignments/extensions.tsx'
import { action as newAction, loader as newLoader } from '#app/routes/courses/assignments/new.tsx'
import {
  AssignmentPermissionError,
  getAssignmentDetail,
  listAssignmentsForCourse,
  removeExtension,
  setExtension,
  updateAssignment,
} from '#app/server/assignments.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { releaseGrades } from '#app/server/releases.server.ts'
import {
  assignmentItems,
  assignments,
  auditEvents,
  extensions,
  problemVersions,
  submissions,
} from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { loadSignedInUser } from '#app/server/users.server.ts'
import {
  addMember,
  createAssignment,
  createCourse,
  createProblemWithVersion,
  createUser,
  recordCheck,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { sessionCookie } from '#tests/support/login.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition
const diesel = DEMO_PROBLEMS.find((p) => p.definition.title.startsWith('Air-standard Diesel'))!.definition

/** A course (in `timeZone`) with an instructor, a TA and `students` students. */
async function setUp(options: { timeZone?: string; students?: number } = {}) {
  const course = await createCourse(db(), { timeZone: options.timeZone ?? 'UTC' })
  const instructor = await createUser(db(), { name: 'Ingrid Instructor', departmentId: course.departmentId })
  await addMember(db(), instructor.id, course.id, 'instructor')
  const ta = await createUser(db(), { name: 'Tomas Assistant', departmentId: course.departmentId })
  await addMember(db(), ta.id, course.id, 'ta')
  const students = []
  for (let i = 0; i < (options.students ?? 2); i++) {
    const s = await createUser(db(), { name: `Student ${i + 1}` })
    await addMember(db(), s.id, course.id, 'student')
    students.push(s)
  }
  return { course, instructor, ta, students }
}

function settingsFields(overrides: Record<string, string> = {}): Record<string, string> {
  return {
    intent: 'save',
    title: 'Week 3: power cycles',
    instructions: 'Show the cycle on a $T$–$s$ diagram first.',
    opensAt: '2027-01-10T09:00',
    dueAt: '2027-01-15T23:59',
    attemptsPerFind: '3',
    latePolicy: 'penalty',
    latePenaltyPercentPerDay: '10',
    lateDaysAllowed: '2',
    keyRelease: 'after-due',
    ...overrides,
  }
}

async function countAssignments(courseId: number) {
  const [row] = await db().select({ n: count() }).from(assignments).where(eq(assignments.courseId, courseId))
  return row!.n
}

function status(thrown: unknown): number | undefined {
  if (thrown instanceof Response) return thrown.status
  return (thrown as { init?: { status?: number } }).init?.status
}

describe('creating an assignment', () => {
  test('saves its items with the chosen versions and points, and freezes each version used', async () => {
    const { course, instructor } = await setUp()
    const a = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    const b = await createProblemWithVersion(db(), instructor.id, diesel, { frozen: false })
    await recordCheck(db(), a.versionId, instructor.id)
    await recordCheck(db(), b.versionId, instructor.id)
    const cookie = await sessionCookie(instructor)
    const path = `/courses/${course.id}/assignments/new`
    const res = (await newAction(
      args(
        formRequest(
          path,
          settingsFields({
            'items.0.versionId': String(a.versionId),
            'items.0.points': '10',
            'items.1.versionId': String(b.versionId),
            'items.1.points': '5.5',
          }),
          { Cookie: cookie },
        ),
        { courseId: String(course.id) },
      ),
    )) as Response
    expect(res.status).toBe(302)
    const id = Number(res.headers.get('Location')!.split('/').pop())
    const items = await db()
      .select()
      .from(assignmentItems)
      .where(eq(assignmentItems.assignmentId, id))
      .orderBy(assignmentItems.position)
    expect(items.map((i) => [i.position, i.problemId, i.problemVersionId, i.points])).toEqual([
      [1, a.problemId, a.versionId, 10],
      [2, b.problemId, b.versionId, 5.5],
    ])
    const versions = await db()
      .select({ frozenAt: problemVersions.frozenAt })
      .from(problemVersions)
      .where(inArray(problemVersions.id, [a.versionId, b.versionId]))
    expect(versions.every((v) => v.frozenAt !== null)).toBe(true)
    const [saved] = await db().select().from(assignments).where(eq(assignments.id, id))
    expect(saved).toMatchObject({
      title: 'Week 3: power cycles',
      attemptsPerFind: 3,
      latePolicy: 'penalty',
      latePenaltyPercentPerDay: 10,
      lateDaysAllowed: 2,
      keyRelease: 'after-due',
    })
  })

  test('a due date typed as 23:59 in America/Chicago in winter is stored as 05:59 UTC the next day', async () => {
    const { course, instructor } = await setUp({ timeZone: 'America/Chicago' })
    const a = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    await recordCheck(db(), a.versionId, instructor.id)
    const res = (await newAction(
      args(
        formRequest(
          `/courses/${course.id}/assignments/new`,
          settingsFields({
            dueAt: '2027-01-15T23:59',
            'items.0.versionId': String(a.versionId),
            'items.0.points': '10',
          }),
          {
            Cookie: await sessionCookie(instructor),
          },
        ),
        { courseId: String(course.id) },
      ),
    )) as Response
    expect(res.status).toBe(302)
    const [saved] = await db()
      .select({ dueAt: assignments.dueAt, opensAt: assignments.opensAt })
      .from(assignments)
      .where(eq(assignments.courseId, course.id))
    expect(saved!.dueAt.toISOString()).toBe('2027-01-16T05:59:00.000Z')
    expect(saved!.opensAt.toISOString()).toBe('2027-01-10T15:00:00.000Z')
  })

  test('a due date before the opening, an unknown problem and a problem not shared with the instructor come back as field errors, with nothing written', async () => {
    const { course, instructor } = await setUp()
    const mine = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    await recordCheck(db(), mine.versionId, instructor.id)
    const stranger = await createUser(db(), { departmentId: null })
    const hidden = await createProblemWithVersion(db(), stranger.id, diesel, { frozen: false })
    const fields = settingsFields({
      opensAt: '2027-01-15T09:00',
      dueAt: '2027-01-14T09:00',
      'items.0.versionId': String(mine.versionId),
      'items.0.points': '10',
      'items.1.versionId': '99999999',
      'items.1.points': '10',
      'items.2.versionId': String(hidden.versionId),
      'items.2.points': '10',
    })
    const result = (await newAction(
      args(formRequest(`/courses/${course.id}/assignments/new`, fields, { Cookie: await sessionCookie(instructor) }), {
        courseId: String(course.id),
      }),
    )) as unknown as {
      data: {
        fieldErrors: Record<string, string>
        formError: string
        state: { values: Record<string, string>; items: { versionId: string }[] }
      }
      init: { status: number }
    }
    expect(result.init.status).toBe(400)
    expect(result.data.fieldErrors.dueAt).toMatch(/after the opening/)
    expect(result.data.fieldErrors['items.1.versionId']).toMatch(/not in your bank/)
    expect(result.data.fieldErrors['items.2.versionId']).toMatch(/not in your bank/)
    expect(result.data.fieldErrors['items.0.versionId']).toBeUndefined()
    expect(result.data.formError).toMatch(/not saved/)
    // Everything typed comes back.
    expect(result.data.state.values.title).toBe('Week 3: power cycles')
    expect(result.data.state.items.map((i) => i.versionId)).toEqual([
      String(mine.versionId),
      '99999999',
      String(hidden.versionId),
    ])
    expect(await countAssignments(course.id)).toBe(0)
    const [v] = await db()
      .select({ frozenAt: problemVersions.frozenAt })
      .from(problemVersions)
      .where(eq(problemVersions.id, mine.versionId))
    expect(v!.frozenAt).toBeNull()
  })

  test('out-of-range numbers are refused beside their fields', async () => {
    const { course, instructor } = await setUp()
    const mine = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    const fields = settingsFields({
      attemptsPerFind: '0',
      latePenaltyPercentPerDay: '120',
      lateDaysAllowed: '61',
      'items.0.versionId': String(mine.versionId),
      'items.0.points': '-1',
    })
    const result = (await newAction(
      args(formRequest(`/courses/${course.id}/assignments/new`, fields, { Cookie: await sessionCookie(instructor) }), {
        courseId: String(course.id),
      }),
    )) as unknown as {
      data: { fieldErrors: Record<string, string> }
      init: { status: number }
    }
    expect(result.init.status).toBe(400)
    expect(Object.keys(result.data.fieldErrors).sort()).toEqual([
      'attemptsPerFind',
      'items.0.points',
      'lateDaysAllowed',
      'latePenaltyPercentPerDay',
    ])
    expect(await countAssignments(course.id)).toBe(0)
  })

  test('the add and remove buttons change the rows and keep what was typed, without saving', async () => {
    const { course, instructor } = await setUp()
    const cookie = await sessionCookie(instructor)
    const path = `/courses/${course.id}/assignments/new`
    const added = (await newAction(
      args(
        formRequest(path, settingsFields({ intent: 'add-item', 'items.0.versionId': '5', 'items.0.points': '7' }), {
          Cookie: cookie,
        }),
        { courseId: String(course.id) },
      ),
    )) as unknown as {
      data: { state: { values: { title: string }; items: { versionId: string; points: string }[] } }
    }
    expect(added.data.state.items).toEqual([
      { itemId: '', versionId: '5', points: '7' },
      { itemId: '', versionId: '', points: '10' },
    ])
    expect(added.data.state.values.title).toBe('Week 3: power cycles')
    const removed = (await newAction(
      args(
        formRequest(
          path,
          settingsFields({
            intent: 'remove-item:0',
            'items.0.versionId': '5',
            'items.0.points': '7',
            'items.1.versionId': '6',
            'items.1.points': '3',
          }),
          { Cookie: cookie },
        ),
        {
          courseId: String(course.id),
        },
      ),
    )) as unknown as { data: { state: { items: { versionId: string }[] } } }
    expect(removed.data.state.items.map((i) => i.versionId)).toEqual(['6'])
    expect(await countAssignments(course.id)).toBe(0)
  })
})

describe('editing', () => {
  test('an answered item keeps its version and points; the change of due date is audited', async () => {
    const { course, instructor, students } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const q = await createProblemWithVersion(db(), instructor.id, diesel)
    const { assignment, items } = await createAssignment(db(), course.id, instructor.id, [
      { ...p, points: 10 },
      { ...q, points: 4 },
    ])
    await db()
      .insert(submissions)
      .values({ assignmentId: assignment.id, itemId: items[0]!.id, userId: students[0]!.id, answers: { eta: '0.5' } })
    const user = (await loadSignedInUser(db(), instructor.id))!
    const result = await updateAssignment(db(), {
      courseId: course.id,
      assignmentId: assignment.id,
      user,
      state: {
        values: { ...settingsFields(), dueAt: '2027-02-01T12:00' } as never,
        items: [
          { itemId: String(items[0]!.id), versionId: String(q.versionId), points: '99' },
          { itemId: String(items[1]!.id), versionId: String(q.versionId), points: '6' },
        ],
      },
    })
    // The answered item stays on p, so q on the second row is not a duplicate.
    expect(result).toEqual({ ok: true, assignmentId: assignment.id })
    const after = await db()
      .select()
      .from(assignmentItems)
      .where(eq(assignmentItems.assignmentId, assignment.id))
      .orderBy(assignmentItems.position)
    expect(after.map((i) => [i.id, i.problemVersionId, i.points])).toEqual([
      [items[0]!.id, p.versionId, 10],
      [items[1]!.id, q.versionId, 6],
    ])
    const audit = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.assignmentId, assignment.id), eq(auditEvents.kind, 'assignment-changed')))
    expect(audit).toHaveLength(1)
    expect((audit[0]!.before as Record<string, unknown>).dueAt).toBe(assignment.dueAt.toISOString())
    expect((audit[0]!.after as Record<string, unknown>).dueAt).toBe('2027-02-01T12:00:00.000Z')
  })

  test('removing an answered item is refused', async () => {
    const { course, instructor, students } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const q = await createProblemWithVersion(db(), instructor.id, diesel)
    const { assignment, items } = await createAssignment(db(), course.id, instructor.id, [p, q])
    await db()
      .insert(submissions)
      .values({ assignmentId: assignment.id, itemId: items[0]!.id, userId: students[0]!.id, answers: {} })
    const user = (await loadSignedInUser(db(), instructor.id))!
    const result = await updateAssignment(db(), {
      courseId: course.id,
      assignmentId: assignment.id,
      user,
      state: {
        values: settingsFields() as never,
        items: [{ itemId: String(items[1]!.id), versionId: String(q.versionId), points: '10' }],
      },
    })
    expect(result.ok).toBe(false)
    expect(!result.ok && result.fieldErrors.items).toMatch(/cannot be removed/)
    expect(
      await db().select({ n: count() }).from(assignmentItems).where(eq(assignmentItems.assignmentId, assignment.id)),
    ).toEqual([{ n: 2 }])
  })
})

describe('extensions', () => {
  test('saving twice updates the one extension; each change and the removal write an audit row', async () => {
    const { course, instructor, students } = await setUp({ timeZone: 'America/Chicago' })
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      dueAt: new Date('2027-01-16T05:59:00Z'),
      opensAt: new Date('2027-01-01T00:00:00Z'),
    })
    const who = students[0]!.id
    const base = { courseId: course.id, assignmentId: assignment.id, actorId: instructor.id }
    expect(
      await setExtension(db(), {
        ...base,
        input: { userId: who, dueAt: '2027-01-18T23:59', extraAttempts: 0, reason: 'Illness' },
      }),
    ).toEqual({ ok: true })
    expect(
      await setExtension(db(), {
        ...base,
        input: { userId: who, dueAt: '', extraAttempts: 2, reason: 'Accommodation letter' },
      }),
    ).toEqual({ ok: true })
    const rows = await db().select().from(extensions).where(eq(extensions.assignmentId, assignment.id))
    expect(rows).toHaveLength(1)
    expect(rows[0]).toMatchObject({ userId: who, dueAt: null, extraAttempts: 2, reason: 'Accommodation letter' })

    expect(await removeExtension(db(), { ...base, userId: who })).toBe(true)
    expect(await db().select().from(extensions).where(eq(extensions.assignmentId, assignment.id))).toEqual([])
    const audit = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.assignmentId, assignment.id), eq(auditEvents.kind, 'extension')))
      .orderBy(auditEvents.id)
    expect(audit.map((a) => [a.userId, a.actorId, a.before, a.after])).toEqual([
      [who, instructor.id, null, { dueAt: '2027-01-19T05:59:00.000Z', extraAttempts: 0, reason: 'Illness' }],
      [
        who,
        instructor.id,
        { dueAt: '2027-01-19T05:59:00.000Z', extraAttempts: 0, reason: 'Illness' },
        { dueAt: null, extraAttempts: 2, reason: 'Accommodation letter' },
      ],
      [who, instructor.id, { dueAt: null, extraAttempts: 2, reason: 'Accommodation letter' }, null],
    ])
  })

  test('an extension due before the assignment, for someone not a student, or with nothing extended is refused', async () => {
    const { course, instructor, ta, students } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], {
      dueAt: new Date('2027-01-15T12:00:00Z'),
      opensAt: new Date('2027-01-01T00:00:00Z'),
    })
    const base = { courseId: course.id, assignmentId: assignment.id, actorId: instructor.id }
    const early = await setExtension(db(), {
      ...base,
      input: { userId: students[0]!.id, dueAt: '2027-01-14T12:00', extraAttempts: 0, reason: '' },
    })
    expect(!early.ok && early.fieldErrors.dueAt).toMatch(/after the assignment/)
    const notStudent = await setExtension(db(), {
      ...base,
      input: { userId: ta.id, dueAt: '2027-01-20T12:00', extraAttempts: 0, reason: '' },
    })
    expect(!notStudent.ok && notStudent.fieldErrors.userId).toMatch(/student/)
    const nothing = await setExtension(db(), {
      ...base,
      input: { userId: students[0]!.id, dueAt: '', extraAttempts: 0, reason: '' },
    })
    expect(nothing.ok).toBe(false)
    expect(await db().select().from(extensions).where(eq(extensions.assignmentId, assignment.id))).toEqual([])
    expect(await db().select().from(auditEvents).where(eq(auditEvents.assignmentId, assignment.id))).toEqual([])
  })

  test('a student sees their extended due date and extra attempts', async () => {
    const { course, instructor, students } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], { attemptsPerFind: 3 })
    await setExtension(db(), {
      courseId: course.id,
      assignmentId: assignment.id,
      actorId: instructor.id,
      input: { userId: students[0]!.id, dueAt: '2099-01-01T00:00', extraAttempts: 2, reason: '' },
    })
    const detail = await getAssignmentDetail(db(), {
      courseId: course.id,
      assignmentId: assignment.id,
      role: 'student',
      userId: students[0]!.id,
    })
    expect(detail.student!.dueAt.toISOString()).toBe('2099-01-01T00:00:00.000Z')
    expect(detail.student!.attempts).toBe(5)
    const other = await getAssignmentDetail(db(), {
      courseId: course.id,
      assignmentId: assignment.id,
      role: 'student',
      userId: students[1]!.id,
    })
    expect(other.student!.dueAt.toISOString()).toBe(assignment.dueAt.toISOString())
    expect(other.student!.attempts).toBe(3)
  })
})

describe('releasing grades', () => {
  async function mailJobs(to: string[]) {
    const r = await db().execute<{ to: string; text: string }>(
      sql`select data->>'to' as "to", data->>'text' as text from pgboss.job where name = 'send-mail' and data->>'to' in (${sql.join(
        to.map((t) => sql`${t}`),
        sql`, `,
      )})`,
    )
    return r.rows
  }

  test('queues exactly one e-mail per student with their score and a link; releasing again queues none', async () => {
    const { course, instructor, students } = await setUp({ students: 3 })
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [{ ...p, points: 12 }])
    const opts = {
      courseId: course.id,
      assignmentId: assignment.id,
      actorId: instructor.id,
      confirmed: true,
      early: true,
      baseUrl: 'https://cw.test',
    }
    const first = await releaseGrades(db(), opts)
    expect(first).toMatchObject({ released: true, mailed: 3 })
    const emails = students.map((s) => s.email)
    const jobs = await mailJobs(emails)
    expect(jobs.map((j) => j.to).sort()).toEqual([...emails].sort())
    for (const j of jobs) {
      expect(j.text).toContain('Your score: 0 of 12 points.')
      expect(j.text).toContain(`https://cw.test/courses/${course.id}/assignments/${assignment.id}`)
    }
    const second = await releaseGrades(db(), opts)
    expect(second).toMatchObject({ released: false, mailed: 0 })
    expect(await mailJobs(emails)).toHaveLength(3)
    const [row] = await db()
      .select({ at: assignments.gradesReleasedAt })
      .from(assignments)
      .where(eq(assignments.id, assignment.id))
    expect(row!.at).not.toBeNull()
    const audit = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.assignmentId, assignment.id), eq(auditEvents.kind, 'grades-released')))
    expect(audit).toHaveLength(1)
  })

  test('through the page: the instructor’s confirmed release releases; a TA’s press is refused', async () => {
    const { course, instructor, ta } = await setUp({ students: 1 })
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p])
    const path = `/courses/${course.id}/assignments/${assignment.id}`
    const params = { courseId: String(course.id), assignmentId: String(assignment.id) }
    const refused = await settle(
      overviewAction(
        args(formRequest(path, { intent: 'release-grades' }, { Cookie: await sessionCookie(ta) }), params),
      ),
    )
    expect('thrown' in refused && status(refused.thrown)).toBe(403)
    const done = (await overviewAction(
      args(
        formRequest(
          path,
          { intent: 'release-grades', confirm: 'yes', early: 'yes' },
          { Cookie: await sessionCookie(instructor) },
        ),
        params,
      ),
    )) as Response
    expect(done.status).toBe(302)
    const [row] = await db()
      .select({ at: assignments.gradesReleasedAt })
      .from(assignments)
      .where(eq(assignments.id, assignment.id))
    expect(row!.at).not.toBeNull()
  })
})

describe('the course list', () => {
  test('counts each assignment’s own problems and points', async () => {
    const { course, instructor } = await setUp()
    const a = await createProblemWithVersion(db(), instructor.id, otto)
    const b = await createProblemWithVersion(db(), instructor.id, otto)
    await createAssignment(
      db(),
      course.id,
      instructor.id,
      [
        { ...a, points: 10 },
        { ...b, points: 15 },
      ],
      { title: 'Two problems' },
    )
    await createAssignment(db(), course.id, instructor.id, [{ ...a, points: 4 }], { title: 'One problem' })
    const list = await listAssignmentsForCourse(db(), {
      courseId: course.id,
      role: 'instructor',
      userId: instructor.id,
    })
    expect(Object.fromEntries(list.map((r) => [r.title, [r.itemCount, r.maxScore]]))).toEqual({
      'Two problems': [2, 25],
      'One problem': [1, 4],
    })
  })
})

describe('who sees and changes what', () => {
  test('students do not see assignments that have not opened in the list; by address they are told when it opens', async () => {
    const { course, instructor, students } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const open = await createAssignment(db(), course.id, instructor.id, [p], { title: 'Open now' })
    const later = await createAssignment(db(), course.id, instructor.id, [p], {
      title: 'Opens later',
      opensAt: new Date(Date.now() + 86_400_000),
      dueAt: new Date(Date.now() + 7 * 86_400_000),
    })
    const studentList = await listAssignmentsForCourse(db(), {
      courseId: course.id,
      role: 'student',
      userId: students[0]!.id,
    })
    expect(studentList.map((a) => a.title)).toEqual(['Open now'])
    const staffList = await listAssignmentsForCourse(db(), {
      courseId: course.id,
      role: 'instructor',
      userId: instructor.id,
    })
    expect(staffList.map((a) => a.title).sort()).toEqual(['Open now', 'Opens later'])
    const cookie = await sessionCookie(students[0]!)
    const hidden = await settle(
      overviewLoader(
        args(getRequest(`/courses/${course.id}/assignments/${later.assignment.id}`, { Cookie: cookie }), {
          courseId: String(course.id),
          assignmentId: String(later.assignment.id),
        }),
      ),
    )
    // By address, the page says when it opens, and nothing of its content.
    expect('value' in hidden && hidden.value).toEqual({
      notOpen: {
        title: 'Opens later',
        message: expect.stringMatching(/^“Opens later” opens .+\. Its problems appear here then\.$/),
      },
      course: expect.anything(),
    })
    const shown = await settle(
      overviewLoader(
        args(getRequest(`/courses/${course.id}/assignments/${open.assignment.id}`, { Cookie: cookie }), {
          courseId: String(course.id),
          assignmentId: String(open.assignment.id),
        }),
      ),
    )
    expect('value' in shown && shown.value.detail?.assignment.title).toBe('Open now')
  })

  test('a student cannot reach the new, edit or extensions pages or their actions (403)', async () => {
    const { course, instructor, students } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p])
    const cookie = await sessionCookie(students[0]!)
    const params = { courseId: String(course.id), assignmentId: String(assignment.id) }
    const base = `/courses/${course.id}/assignments`
    const fields = settingsFields({ 'items.0.versionId': String(p.versionId), 'items.0.points': '10' })
    // Thunks, so each request starts only when it is awaited: a rejection is never left unhandled.
    const attempts: (() => Promise<unknown>)[] = [
      () => newLoader(args(getRequest(`${base}/new`, { Cookie: cookie }), params)),
      () => newAction(args(formRequest(`${base}/new`, fields, { Cookie: cookie }), params)),
      () => editAction(args(formRequest(`${base}/${assignment.id}/edit`, fields, { Cookie: cookie }), params)),
      () =>
        extensionsAction(
          args(
            formRequest(
              `${base}/${assignment.id}/extensions`,
              { userId: String(students[0]!.id), dueAt: '2099-01-01T00:00', extraAttempts: '1', reason: '' },
              { Cookie: cookie },
            ),
            params,
          ),
        ),
    ]
    for (const attempt of attempts) {
      const r = await settle(attempt())
      expect('thrown' in r && status(r.thrown)).toBe(403)
    }
    expect(await countAssignments(course.id)).toBe(1)
    expect(await db().select().from(extensions).where(eq(extensions.assignmentId, assignment.id))).toEqual([])
  })

  test('a TA cannot edit an assignment, by the page or by the server function', async () => {
    const { course, instructor, ta } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment } = await createAssignment(db(), course.id, instructor.id, [p], { title: 'Untouched' })
    const params = { courseId: String(course.id), assignmentId: String(assignment.id) }
    const fields = settingsFields({
      title: 'Changed by TA',
      'items.0.versionId': String(p.versionId),
      'items.0.points': '10',
    })
    const r = await settle(
      editAction(
        args(
          formRequest(`/courses/${course.id}/assignments/${assignment.id}/edit`, fields, {
            Cookie: await sessionCookie(ta),
          }),
          params,
        ),
      ),
    )
    expect('thrown' in r && status(r.thrown)).toBe(403)
    const taUser = (await loadSignedInUser(db(), ta.id))!
    await expect(
      updateAssignment(db(), {
        courseId: course.id,
        assignmentId: assignment.id,
        user: taUser,
        state: { values: settingsFields() as never, items: [] },
      }),
    ).rejects.toBeInstanceOf(AssignmentPermissionError)
    const [row] = await db()
      .select({ title: assignments.title })
      .from(assignments)
      .where(eq(assignments.id, assignment.id))
    expect(row!.title).toBe('Untouched')
  })
})
