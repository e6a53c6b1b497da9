/**
 * Terms and courses through the real loaders and actions against PostgreSQL: admins add terms
 * and courses and make people instructors (an unknown address is invited by e-mail, sent by a
 * real worker), instructors change their course's settings (a convention change after answers
 * needs an explicit yes) and copy the course to another term. Every bad input comes back as
 * field errors and writes nothing; people without the role are refused.
 */
import { and, count, eq, inArray } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { action as courseAdminAction, loader as courseAdminLoader } from '#app/routes/admin/courses/$courseId.tsx'
import { action as newCourseAction, loader as newCourseLoader } from '#app/routes/admin/courses/new.tsx'
import { loader as adminIndexLoader } from '#app/routes/admin/index.tsx'
import { action as termsAction, loader as termsLoader } from '#app/routes/admin/terms.tsx'
import { action as settingsAction, loader as settingsLoader } from '#app/routes/courses/settings.tsx'
import { acceptInvitation } from '#app/server/access-links.server.ts'
import { shiftDays } from '#app/server/course-copy.server.ts'
import { db } from '#app/server/db/client.server.ts'
import {
  accessTokens,
  assignmentItems,
  assignments,
  auditEvents,
  courses,
  departments,
  extensions,
  memberships,
  problemVersions,
  submissions,
  terms,
} from '#app/server/db/schema.server.ts'
import { findLastMailTo, linksIn } from '#app/server/outbox.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { toLocalDateTimeValue, parseLocalDateTime } from '#app/lib/dates.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import {
  addMember,
  createAssignment,
  createCourse,
  createDepartment,
  createProblemWithVersion,
  createTerm,
  createUser,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { sessionCookie } from '#tests/support/login.ts'

let worker: RunningWorker
beforeAll(async () => {
  worker = await startWorker({ log: () => {} })
})
afterAll(async () => {
  await worker.stop()
  await stopBoss()
})

const followsCourse = DEMO_PROBLEMS.find((p) => p.definition.convention === 'course')!.definition
const fixedChemistry = DEMO_PROBLEMS.find((p) => p.definition.convention === 'chemistry')!.definition

type Answer = {
  data: {
    fieldErrors: Record<string, string | undefined>
    values: Record<string, string>
    done?: { outcome: string } | null
  }
  init: { status: number } | null
}

/** The status of what an action returned or threw: a Response, a data() value, or a plain object (200). */
function statusOf(out: { thrown: unknown } | { value: unknown }): number {
  const r = 'thrown' in out ? out.thrown : out.value
  if (r instanceof Response) return r.status
  if (r && typeof r === 'object' && 'init' in r) return (r as { init: { status?: number } | null }).init?.status ?? 200
  return 200
}

function redirectOf(out: unknown): string {
  expect(out).toBeInstanceOf(Response)
  const res = out as Response
  expect(res.status).toBe(302)
  return res.headers.get('Location')!
}

async function anAdmin(options: { timeZone?: string } = {}) {
  const department = await createDepartment(db())
  if (options.timeZone)
    await db().update(departments).set({ timeZone: options.timeZone }).where(eq(departments.id, department.id))
  const admin = await createUser(db(), { name: 'Ada Admin', isAdmin: true, departmentId: department.id })
  return { department, admin, cookie: await sessionCookie(admin) }
}

async function countOf(table: typeof terms | typeof courses, departmentId: number) {
  const [row] = await db().select({ n: count() }).from(table).where(eq(table.departmentId, departmentId))
  return row!.n
}

describe('terms (admin)', () => {
  test('an admin adds a term to their department; it is listed with its course count', async () => {
    const { department, cookie } = await anAdmin()
    const empty = await termsLoader(args(getRequest('/admin/terms', { Cookie: cookie })))
    expect(empty.terms).toEqual([])
    const out = await termsAction(
      args(
        formRequest(
          '/admin/terms',
          { name: ' Spring 2027 ', startsOn: '2027-01-11', endsOn: '2027-05-07' },
          { Cookie: cookie },
        ),
      ),
    )
    const location = redirectOf(out)
    const [row] = await db().select().from(terms).where(eq(terms.departmentId, department.id))
    expect(row).toMatchObject({ name: 'Spring 2027', startsOn: '2027-01-11', endsOn: '2027-05-07' })
    expect(location).toBe(`/admin/terms?created=${row!.id}`)
    const page = await termsLoader(args(getRequest(location, { Cookie: cookie })))
    expect(page.created).toBe(row!.id)
    expect(page.terms).toEqual([expect.objectContaining({ name: 'Spring 2027', courses: 0 })])
  })

  test.each([
    [{ name: '', startsOn: '2027-01-11', endsOn: '2027-05-07' }, { name: 'Name the term, such as Spring 2027.' }],
    [
      { name: 'Spring 2027', startsOn: '2027-02-30', endsOn: '2027-05-07' },
      { startsOn: 'Enter the first day of the term.' },
    ],
    [
      { name: 'Spring 2027', startsOn: '2027-05-07', endsOn: '2027-01-11' },
      { endsOn: 'The last day must come after the first day.' },
    ],
    [
      { name: 'Spring 2027', startsOn: '2027-01-11', endsOn: '2037-01-11' },
      { endsOn: expect.stringContaining('at most two years') },
    ],
    [
      { name: 'Spring 2027', startsOn: 'soon' },
      { startsOn: expect.any(String), endsOn: 'Enter the last day of the term.' },
    ],
  ])('bad input %j gets field errors and writes nothing', async (fields, errors) => {
    const { department, cookie } = await anAdmin()
    const out = (await termsAction(
      args(formRequest('/admin/terms', fields as Record<string, string>, { Cookie: cookie })),
    )) as unknown as Answer
    expect(out.init?.status).toBe(400)
    expect(out.data.fieldErrors).toMatchObject(errors)
    expect(out.data.values.name).toBe(fields.name)
    expect(await countOf(terms, department.id)).toBe(0)
  })

  test('a second term of the same name (any letter case) is refused', async () => {
    const { department, cookie } = await anAdmin()
    await createTerm(db(), department.id, { name: 'Autumn 2026' })
    const out = (await termsAction(
      args(
        formRequest(
          '/admin/terms',
          { name: 'autumn 2026', startsOn: '2026-09-01', endsOn: '2026-12-20' },
          { Cookie: cookie },
        ),
      ),
    )) as unknown as Answer
    expect(out.init?.status).toBe(400)
    expect(out.data.fieldErrors.name).toContain('already a term called autumn 2026')
    expect(await countOf(terms, department.id)).toBe(1)
  })

  test('people who are not admins are refused; an admin without a department cannot add one', async () => {
    const course = await createCourse(db())
    const instructor = await createUser(db(), { departmentId: course.departmentId })
    await addMember(db(), instructor.id, course.id, 'instructor')
    const cookie = await sessionCookie(instructor)
    expect(statusOf(await settle(termsLoader(args(getRequest('/admin/terms', { Cookie: cookie })))))).toBe(403)
    expect(
      statusOf(
        await settle(
          termsAction(
            args(
              formRequest(
                '/admin/terms',
                { name: 'X term', startsOn: '2027-01-01', endsOn: '2027-02-01' },
                { Cookie: cookie },
              ),
            ),
          ),
        ),
      ),
    ).toBe(403)
    expect(await countOf(terms, course.departmentId)).toBe(1)

    const homeless = await createUser(db(), { isAdmin: true, departmentId: null })
    const hc = await sessionCookie(homeless)
    const page = await termsLoader(args(getRequest('/admin/terms', { Cookie: hc })))
    expect(page.department).toBeNull()
    expect(
      statusOf(
        await settle(
          termsAction(
            args(
              formRequest(
                '/admin/terms',
                { name: 'X term', startsOn: '2027-01-01', endsOn: '2027-02-01' },
                { Cookie: hc },
              ),
            ),
          ),
        ),
      ),
    ).toBe(409)
  })
})

function courseFields(termId: number, overrides: Record<string, string> = {}) {
  return {
    termId: String(termId),
    code: 'ENTH 310',
    title: 'Applied Thermodynamics',
    signConvention: 'engineering',
    timeZone: 'Europe/Oslo',
    ...overrides,
  }
}

describe('courses (admin)', () => {
  test('an admin creates a course in a term of their department; the zone is read case-blind; an audit row is written', async () => {
    const { department, admin, cookie } = await anAdmin({ timeZone: 'America/Chicago' })
    const term = await createTerm(db(), department.id, { name: 'Spring 2027' })
    const form = await newCourseLoader(args(getRequest(`/admin/courses/new?termId=${term.id}`, { Cookie: cookie })))
    expect(form.terms.map((t) => t.id)).toEqual([term.id])
    expect(form.termId).toBe(String(term.id))
    expect(form.department?.timeZone).toBe('America/Chicago')

    const out = await newCourseAction(
      args(
        formRequest(
          '/admin/courses/new',
          courseFields(term.id, { timeZone: ' europe/oslo ', signConvention: 'chemistry' }),
          { Cookie: cookie },
        ),
      ),
    )
    const location = redirectOf(out)
    const [row] = await db().select().from(courses).where(eq(courses.termId, term.id))
    expect(row).toMatchObject({
      departmentId: department.id,
      code: 'ENTH 310',
      title: 'Applied Thermodynamics',
      signConvention: 'chemistry',
      timeZone: 'Europe/Oslo',
      copiedFromId: null,
    })
    expect(location).toBe(`/admin/courses/${row!.id}?created=1`)
    const [audit] = await db().select().from(auditEvents).where(eq(auditEvents.courseId, row!.id))
    expect(audit).toMatchObject({ actorId: admin.id, kind: 'course-created' })

    const page = await courseAdminLoader(args(getRequest(location, { Cookie: cookie }), { courseId: String(row!.id) }))
    expect(page.created).toBe(true)
    expect(page.course).toMatchObject({ code: 'ENTH 310', termName: 'Spring 2027', timeZone: 'Europe/Oslo' })
    expect(page.instructors).toEqual([])

    const index = await adminIndexLoader(args(getRequest('/admin', { Cookie: cookie })))
    expect(index.courses.find((c) => c.id === row!.id)).toMatchObject({ code: 'ENTH 310', timeZone: 'Europe/Oslo' })
  })

  test.each([
    [{ timeZone: 'Mars/Olympus_Mons' }, { timeZone: expect.stringContaining('not a time zone we know') }],
    [{ timeZone: '+02:00' }, { timeZone: expect.stringContaining('not an offset') }],
    [{ timeZone: 'CET' }, { timeZone: expect.stringContaining('region and city') }],
    [{ timeZone: '' }, { timeZone: expect.stringContaining('Choose or type') }],
    [{ signConvention: 'physics' }, { signConvention: 'Choose a sign convention.' }],
    [{ code: '' }, { code: 'Enter a course code, such as ENTH 210.' }],
    [{ code: '=cmd|x' }, { code: expect.stringContaining('Use letters, digits') }],
    [{ title: ' ' }, { title: 'Enter the course title.' }],
    [{ termId: '' }, { termId: 'Choose the term.' }],
  ])('bad input %j gets field errors and writes nothing', async (overrides, errors) => {
    const { department, cookie } = await anAdmin()
    const term = await createTerm(db(), department.id)
    const out = (await newCourseAction(
      args(formRequest('/admin/courses/new', courseFields(term.id, overrides), { Cookie: cookie })),
    )) as unknown as Answer
    expect(out.init?.status).toBe(400)
    expect(out.data.fieldErrors).toMatchObject(errors)
    expect(out.data.values.code).toBe(courseFields(term.id, overrides).code)
    expect(await countOf(courses, department.id)).toBe(0)
  })

  test('another department’s term and a code the term already has are refused', async () => {
    const { department, cookie } = await anAdmin()
    const term = await createTerm(db(), department.id, { name: 'Spring 2027' })
    const elsewhere = await createCourse(db())
    const foreign = (await newCourseAction(
      args(formRequest('/admin/courses/new', courseFields(elsewhere.termId), { Cookie: cookie })),
    )) as unknown as Answer
    expect(foreign.init?.status).toBe(400)
    expect(foreign.data.fieldErrors.termId).toBe('Choose one of your department’s terms.')
    expect(await countOf(courses, elsewhere.departmentId)).toBe(1)

    await createCourse(db(), { departmentId: department.id, termId: term.id, code: 'ENTH 310' })
    const clash = (await newCourseAction(
      args(formRequest('/admin/courses/new', courseFields(term.id, { code: 'enth 310' }), { Cookie: cookie })),
    )) as unknown as Answer
    expect(clash.init?.status).toBe(400)
    expect(clash.data.fieldErrors.code).toBe(
      'Spring 2027 already has a course enth 310. Choose another code or another term.',
    )
    expect(await countOf(courses, department.id)).toBe(1)
  })

  test('people who are not admins are refused the new-course page and the course page', async () => {
    const course = await createCourse(db())
    const instructor = await createUser(db(), { departmentId: course.departmentId })
    await addMember(db(), instructor.id, course.id, 'instructor')
    const cookie = await sessionCookie(instructor)
    expect(statusOf(await settle(newCourseLoader(args(getRequest('/admin/courses/new', { Cookie: cookie })))))).toBe(
      403,
    )
    expect(
      statusOf(
        await settle(
          newCourseAction(
            args(formRequest('/admin/courses/new', courseFields(course.termId, { code: 'NEW 1' }), { Cookie: cookie })),
          ),
        ),
      ),
    ).toBe(403)
    expect(
      statusOf(
        await settle(
          courseAdminLoader(
            args(getRequest(`/admin/courses/${course.id}`, { Cookie: cookie }), { courseId: String(course.id) }),
          ),
        ),
      ),
    ).toBe(403)
    const out = await settle(
      courseAdminAction(
        args(formRequest(`/admin/courses/${course.id}`, { email: 'x@test.example' }, { Cookie: cookie }), {
          courseId: String(course.id),
        }),
      ),
    )
    expect(statusOf(out)).toBe(403)
    expect(await countOf(courses, course.departmentId)).toBe(1)
    const [tokens] = await db()
      .select({ n: count() })
      .from(accessTokens)
      .where(eq(accessTokens.email, 'x@test.example'))
    expect(tokens!.n).toBe(0)
  })

  test('an unknown course is a 404 page for an admin', async () => {
    const { cookie } = await anAdmin()
    expect(
      statusOf(
        await settle(
          courseAdminLoader(args(getRequest('/admin/courses/999999', { Cookie: cookie }), { courseId: '999999' })),
        ),
      ),
    ).toBe(404)
    expect(
      statusOf(
        await settle(
          courseAdminLoader(args(getRequest('/admin/courses/abc', { Cookie: cookie }), { courseId: 'abc' })),
        ),
      ),
    ).toBe(404)
  })
})

describe('assigning instructors (admin)', () => {
  async function mailTo(address: string) {
    const until = Date.now() + 15_000
    for (;;) {
      const mail = await findLastMailTo(db(), address)
      if (mail || Date.now() > until) return mail
      await new Promise((r) => setTimeout(r, 100))
    }
  }

  test('an existing account becomes instructor at once (a student of the course too); again says so; audit rows', async () => {
    const { department, admin, cookie } = await anAdmin()
    const course = await createCourse(db(), { departmentId: department.id })
    const ida = await createUser(db(), { name: 'Ida Instructor', email: 'ida@test.example' })
    const sam = await createUser(db(), { name: 'Sam Switch' })
    await addMember(db(), sam.id, course.id, 'student')
    const post = (email: string) =>
      courseAdminAction(
        args(formRequest(`/admin/courses/${course.id}`, { email }, { Cookie: cookie }), {
          courseId: String(course.id),
        }),
      )

    const first = (await post(' IDA@test.example ')) as { done: { outcome: string; name: string } }
    expect(first.done).toMatchObject({ outcome: 'added', name: 'Ida Instructor', email: 'ida@test.example' })
    const again = (await post('ida@test.example')) as { done: { outcome: string } }
    expect(again.done.outcome).toBe('already')
    expect(((await post(sam.email)) as { done: { outcome: string } }).done.outcome).toBe('added')

    const rows = await db()
      .select({ userId: memberships.userId, role: memberships.role })
      .from(memberships)
      .where(eq(memberships.courseId, course.id))
    expect(rows).toEqual(
      expect.arrayContaining([
        { userId: ida.id, role: 'instructor' },
        { userId: sam.id, role: 'instructor' },
      ]),
    )
    const audits = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.courseId, course.id), eq(auditEvents.kind, 'instructor-added')))
    expect(audits.map((a) => [a.userId, a.actorId, a.before])).toEqual(
      expect.arrayContaining([
        [ida.id, admin.id, null],
        [sam.id, admin.id, { role: 'student' }],
      ]),
    )
    expect(audits).toHaveLength(2)
    const page = await courseAdminLoader(
      args(getRequest(`/admin/courses/${course.id}`, { Cookie: cookie }), { courseId: String(course.id) }),
    )
    expect(page.instructors.map((i) => i.name)).toEqual(['Ida Instructor', 'Sam Switch'])
  })

  test('an unknown address is invited as instructor through the usual invitation; accepting makes them instructor', async () => {
    const { department, cookie } = await anAdmin()
    const course = await createCourse(db(), { departmentId: department.id, code: 'ENTH 320' })
    const out = (await courseAdminAction(
      args(formRequest(`/admin/courses/${course.id}`, { email: 'New.Teacher@Test.Example' }, { Cookie: cookie }), {
        courseId: String(course.id),
      }),
    )) as { done: { outcome: string; email: string } }
    expect(out.done).toMatchObject({ outcome: 'invited', email: 'new.teacher@test.example' })
    const [token] = await db().select().from(accessTokens).where(eq(accessTokens.email, 'new.teacher@test.example'))
    expect(token).toMatchObject({ purpose: 'invitation', role: 'instructor', courseId: course.id, usedAt: null })
    const mail = await mailTo('new.teacher@test.example')
    expect(mail?.subject).toContain('ENTH 320')
    expect(mail?.text).toContain('as instructor')
    const link = linksIn(mail!.text).find((l) => l.includes('/join/'))!
    expect(link.endsWith(`/join/${token!.token}`)).toBe(true)

    const page = await courseAdminLoader(
      args(getRequest(`/admin/courses/${course.id}`, { Cookie: cookie }), { courseId: String(course.id) }),
    )
    expect(page.invitations.map((i) => i.email)).toEqual(['new.teacher@test.example'])

    const accepted = await acceptInvitation(db(), token!.token, {
      name: 'Nel Teacher',
      password: 'a long enough password',
    })
    const [m] = await db()
      .select()
      .from(memberships)
      .where(and(eq(memberships.userId, accepted!.userId), eq(memberships.courseId, course.id)))
    expect(m?.role).toBe('instructor')
  })

  test('an account that has never set a password is invited (the link sets it), not made instructor unseen', async () => {
    const { department, cookie } = await anAdmin()
    const course = await createCourse(db(), { departmentId: department.id })
    const pending = await createUser(db(), { email: 'pending@test.example', password: null })
    const out = (await courseAdminAction(
      args(formRequest(`/admin/courses/${course.id}`, { email: pending.email }, { Cookie: cookie }), {
        courseId: String(course.id),
      }),
    )) as { done: { outcome: string } }
    expect(out.done.outcome).toBe('invited')
    const [token] = await db().select().from(accessTokens).where(eq(accessTokens.email, pending.email))
    expect(token).toMatchObject({ role: 'instructor', courseId: course.id })
    const [n] = await db().select({ n: count() }).from(memberships).where(eq(memberships.courseId, course.id))
    expect(n!.n).toBe(0)
  })

  test('a malformed address gets a field error and nothing is written', async () => {
    const { department, cookie } = await anAdmin()
    const course = await createCourse(db(), { departmentId: department.id })
    const out = (await courseAdminAction(
      args(formRequest(`/admin/courses/${course.id}`, { email: 'not an address' }, { Cookie: cookie }), {
        courseId: String(course.id),
      }),
    )) as unknown as Answer
    expect(out.init?.status).toBe(400)
    expect(out.data.fieldErrors.email).toContain('valid e-mail address')
    expect(out.data.values.email).toBe('not an address')
    const [n] = await db().select({ n: count() }).from(memberships).where(eq(memberships.courseId, course.id))
    expect(n!.n).toBe(0)
    const [t] = await db().select({ n: count() }).from(accessTokens).where(eq(accessTokens.courseId, course.id))
    expect(t!.n).toBe(0)
  })
})

/** A course in Europe/Oslo in a term starting 2026-09-07, with an instructor, a TA, a student and one assignment. */
async function courseToCopy() {
  const department = await createDepartment(db())
  const autumn = await createTerm(db(), department.id, {
    name: 'Autumn 2026',
    startsOn: '2026-09-07',
    endsOn: '2026-12-18',
  })
  const winter = await createTerm(db(), department.id, {
    name: 'Winter 2027',
    startsOn: '2027-01-04',
    endsOn: '2027-04-30',
  })
  const course = await createCourse(db(), {
    departmentId: department.id,
    termId: autumn.id,
    code: 'ENTH 150',
    title: 'Heat engines',
    timeZone: 'Europe/Oslo',
    signConvention: 'engineering',
  })
  const instructor = await createUser(db(), { name: 'Ines Instructor', departmentId: department.id })
  await addMember(db(), instructor.id, course.id, 'instructor')
  const coInstructor = await createUser(db(), { name: 'Otto Co-instructor', departmentId: department.id })
  await addMember(db(), coInstructor.id, course.id, 'instructor')
  const ta = await createUser(db(), { name: 'Tove Assistant' })
  await addMember(db(), ta.id, course.id, 'ta')
  const student = await createUser(db(), { name: 'Stig Student' })
  await addMember(db(), student.id, course.id, 'student')
  const p1 = await createProblemWithVersion(db(), instructor.id, followsCourse)
  const p2 = await createProblemWithVersion(db(), instructor.id, fixedChemistry, { frozen: false })
  const { assignment, items } = await createAssignment(
    db(),
    course.id,
    instructor.id,
    [
      { ...p1, points: 12, toleranceOverrides: { wNet: { kind: 'relative', value: 0.05 } } },
      { ...p2, points: 8 },
    ],
    {
      title: 'Week 5: Carnot',
      // 23:59 in Oslo in October is summer time (UTC+2); the copy's date in February is winter time.
      opensAt: parseLocalDateTime('2026-10-05T09:00', 'Europe/Oslo')!,
      dueAt: parseLocalDateTime('2026-10-12T23:59', 'Europe/Oslo')!,
      keyRelease: 'manual',
      keyReleasedAt: new Date('2026-10-13T10:00:00Z'),
      gradesReleasedAt: new Date('2026-10-14T10:00:00Z'),
      latePolicy: 'penalty',
      latePenaltyPercentPerDay: 10,
      lateDaysAllowed: 2,
      disputeDays: 5,
      attemptsPerFind: 4,
    },
  )
  await db()
    .insert(extensions)
    .values({ assignmentId: assignment.id, userId: student.id, extraAttempts: 1, createdBy: instructor.id })
  return { department, autumn, winter, course, instructor, coInstructor, ta, student, assignment, items, p1, p2 }
}

async function coursesIn(termId: number) {
  return db().select().from(courses).where(eq(courses.termId, termId))
}

describe('copying a course to another term (instructors)', () => {
  test('the copy: same settings and problem versions, dates moved by the terms’ difference on the Oslo clock, instructors only, nothing released', async () => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const page = await settingsLoader(
      args(getRequest(`/courses/${s.course.id}/settings`, { Cookie: cookie }), { courseId: String(s.course.id) }),
    )
    expect(page.copyTerms.find((t) => t.id === s.winter.id)).toMatchObject({ defaultOffsetDays: 119, current: false })
    expect(page.copyTerms.find((t) => t.id === s.autumn.id)).toMatchObject({ defaultOffsetDays: 0, current: true })
    expect(page).toMatchObject({ assignmentCount: 1, instructorCount: 2 })

    const out = await settingsAction(
      args(
        formRequest(
          `/courses/${s.course.id}/settings`,
          { intent: 'copy', termId: String(s.winter.id), code: 'ENTH 150', title: 'Heat engines', offsetDays: '' },
          { Cookie: cookie },
        ),
        { courseId: String(s.course.id) },
      ),
    )
    const [copy] = await coursesIn(s.winter.id)
    expect(redirectOf(out)).toBe(`/courses/${copy!.id}/settings?copied=1`)
    expect(copy).toMatchObject({
      departmentId: s.department.id,
      code: 'ENTH 150',
      title: 'Heat engines',
      timeZone: 'Europe/Oslo',
      signConvention: 'engineering',
      copiedFromId: s.course.id,
    })

    const staff = await db()
      .select({ userId: memberships.userId, role: memberships.role })
      .from(memberships)
      .where(eq(memberships.courseId, copy!.id))
    expect(staff.sort((a, b) => a.userId - b.userId)).toEqual(
      [
        { userId: s.instructor.id, role: 'instructor' },
        { userId: s.coInstructor.id, role: 'instructor' },
      ].sort((a, b) => a.userId - b.userId),
    )

    const [a] = await db().select().from(assignments).where(eq(assignments.courseId, copy!.id))
    expect(a).toMatchObject({
      title: 'Week 5: Carnot',
      keyRelease: 'manual',
      keyReleasedAt: null,
      gradesReleasedAt: null,
      latePolicy: 'penalty',
      latePenaltyPercentPerDay: 10,
      lateDaysAllowed: 2,
      disputeDays: 5,
      attemptsPerFind: 4,
      createdBy: s.instructor.id,
    })
    // 119 days later on the wall clock: 09:00 and 23:59 stay 09:00 and 23:59 across the end of summer time.
    expect(toLocalDateTimeValue(a!.opensAt, 'Europe/Oslo')).toBe('2027-02-01T09:00')
    expect(toLocalDateTimeValue(a!.dueAt, 'Europe/Oslo')).toBe('2027-02-08T23:59')
    expect(a!.dueAt.toISOString()).toBe('2027-02-08T22:59:00.000Z')

    const copiedItems = await db().select().from(assignmentItems).where(eq(assignmentItems.assignmentId, a!.id))
    expect(
      copiedItems
        .map((i) => ({
          position: i.position,
          problemId: i.problemId,
          versionId: i.problemVersionId,
          points: i.points,
          tol: i.toleranceOverrides,
        }))
        .sort((x, y) => x.position - y.position),
    ).toEqual([
      {
        position: 1,
        problemId: s.p1.problemId,
        versionId: s.p1.versionId,
        points: 12,
        tol: { wNet: { kind: 'relative', value: 0.05 } },
      },
      { position: 2, problemId: s.p2.problemId, versionId: s.p2.versionId, points: 8, tol: {} },
    ])
    const versions = await db()
      .select({ id: problemVersions.id, frozenAt: problemVersions.frozenAt })
      .from(problemVersions)
      .where(inArray(problemVersions.id, [s.p1.versionId, s.p2.versionId]))
    expect(versions.every((v) => v.frozenAt !== null)).toBe(true)

    const [ext] = await db().select({ n: count() }).from(extensions).where(eq(extensions.assignmentId, a!.id))
    expect(ext!.n).toBe(0)
    const [subs] = await db().select({ n: count() }).from(submissions).where(eq(submissions.assignmentId, a!.id))
    expect(subs!.n).toBe(0)
    // The old course is untouched.
    const [old] = await db().select().from(assignments).where(eq(assignments.id, s.assignment.id))
    expect(old!.keyReleasedAt).not.toBeNull()
    expect(old!.dueAt.toISOString()).toBe(s.assignment.dueAt.toISOString())

    const [audit] = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.courseId, copy!.id), eq(auditEvents.kind, 'course-copied')))
    expect(audit).toMatchObject({
      actorId: s.instructor.id,
      before: { courseId: s.course.id, code: 'ENTH 150' },
      after: expect.objectContaining({ offsetDays: 119, instructors: 2 }),
    })

    const copiedPage = await settingsLoader(
      args(getRequest(`/courses/${copy!.id}/settings?copied=1`, { Cookie: cookie }), { courseId: String(copy!.id) }),
    )
    expect(copiedPage.copied).toBe(true)
    expect(copiedPage.copyOf).toEqual({ code: 'ENTH 150', termName: 'Autumn 2026', offsetDays: 119, assignments: 1 })
  })

  test('a chosen offset moves the dates by that many days instead; a copy in the same term needs a new code', async () => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const post = (fields: Record<string, string>) =>
      settingsAction(
        args(formRequest(`/courses/${s.course.id}/settings`, { intent: 'copy', ...fields }, { Cookie: cookie }), {
          courseId: String(s.course.id),
        }),
      )
    const sameTerm = (await post({
      termId: String(s.autumn.id),
      code: 'ENTH 150',
      title: 'Heat engines',
      offsetDays: '7',
    })) as unknown as Answer
    expect(sameTerm.init?.status).toBe(400)
    expect(sameTerm.data.fieldErrors.code).toBe(
      'Autumn 2026 already has a course ENTH 150. Choose another code or another term.',
    )

    redirectOf(
      await post({
        termId: String(s.autumn.id),
        code: 'ENTH 150B',
        title: 'Heat engines (second group)',
        offsetDays: '−7',
      }),
    )
    const [copy] = (await coursesIn(s.autumn.id)).filter((c) => c.code === 'ENTH 150B')
    const [a] = await db().select().from(assignments).where(eq(assignments.courseId, copy!.id))
    expect(toLocalDateTimeValue(a!.dueAt, 'Europe/Oslo')).toBe('2026-10-05T23:59')
    expect(copy!.title).toBe('Heat engines (second group)')
  })

  test.each([
    [{ termId: '' }, { termId: 'Choose the term to copy the course to.' }],
    [{ offsetDays: 'a week' }, { offsetDays: expect.stringContaining('whole number of days') }],
    [{ offsetDays: '99999' }, { offsetDays: expect.stringContaining('at most 3660 days') }],
    [{ code: '' }, { code: 'Enter a course code, such as ENTH 210.' }],
    [{ title: '' }, { title: 'Enter the course title.' }],
  ])('bad copy input %j gets field errors and writes nothing', async (overrides, errors) => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const fields = {
      intent: 'copy',
      termId: String(s.winter.id),
      code: 'ENTH 150',
      title: 'Heat engines',
      offsetDays: '',
      ...overrides,
    }
    const out = (await settingsAction(
      args(formRequest(`/courses/${s.course.id}/settings`, fields, { Cookie: cookie }), {
        courseId: String(s.course.id),
      }),
    )) as unknown as Answer
    expect(out.init?.status).toBe(400)
    expect(out.data.fieldErrors).toMatchObject(errors)
    expect(await coursesIn(s.winter.id)).toEqual([])
  })

  test('another department’s term and a code already in the target term are refused, writing nothing', async () => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const elsewhere = await createCourse(db())
    const foreign = (await settingsAction(
      args(
        formRequest(
          `/courses/${s.course.id}/settings`,
          { intent: 'copy', termId: String(elsewhere.termId), code: 'ENTH 150', title: 'Heat engines' },
          { Cookie: cookie },
        ),
        { courseId: String(s.course.id) },
      ),
    )) as unknown as Answer
    expect(foreign.init?.status).toBe(400)
    expect(foreign.data.fieldErrors.termId).toBe('Choose one of the department’s terms.')
    expect(await coursesIn(elsewhere.termId)).toHaveLength(1)

    await createCourse(db(), { departmentId: s.department.id, termId: s.winter.id, code: 'ENTH 150' })
    const clash = (await settingsAction(
      args(
        formRequest(
          `/courses/${s.course.id}/settings`,
          { intent: 'copy', termId: String(s.winter.id), code: 'enth 150', title: 'Heat engines' },
          { Cookie: cookie },
        ),
        { courseId: String(s.course.id) },
      ),
    )) as unknown as Answer
    expect(clash.init?.status).toBe(400)
    expect(clash.data.fieldErrors.code).toContain('Winter 2027 already has a course')
    expect(await coursesIn(s.winter.id)).toHaveLength(1)
    const [n] = await db()
      .select({ n: count() })
      .from(assignments)
      .where(
        inArray(
          assignments.courseId,
          (await coursesIn(s.winter.id)).map((c) => c.id),
        ),
      )
    expect(n!.n).toBe(0)
  })

  test('two copies sent at once with the same code: one is made, the other gets the field error', async () => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const send = () =>
      settingsAction(
        args(
          formRequest(
            `/courses/${s.course.id}/settings`,
            { intent: 'copy', termId: String(s.winter.id), code: 'ENTH 150', title: 'Heat engines' },
            { Cookie: cookie },
          ),
          { courseId: String(s.course.id) },
        ),
      )
    const results = await Promise.all([send(), send()])
    expect(results.filter((r) => r instanceof Response)).toHaveLength(1)
    const refused = results.find((r) => !(r instanceof Response)) as unknown as Answer
    expect(refused.init?.status).toBe(400)
    expect(refused.data.fieldErrors.code).toContain('already has a course ENTH 150')
    const made = await coursesIn(s.winter.id)
    expect(made).toHaveLength(1)
    const [n] = await db().select({ n: count() }).from(assignments).where(eq(assignments.courseId, made[0]!.id))
    expect(n!.n).toBe(1)
  })

  test('TAs, students, admins who are not instructors and strangers are refused the page and both forms', async () => {
    const s = await courseToCopy()
    const admin = await createUser(db(), { isAdmin: true, departmentId: s.department.id })
    const stranger = await createUser(db())
    for (const who of [s.ta, s.student, admin, stranger]) {
      const cookie = await sessionCookie(who)
      const params = { courseId: String(s.course.id) }
      expect(
        statusOf(
          await settle(
            settingsLoader(args(getRequest(`/courses/${s.course.id}/settings`, { Cookie: cookie }), params)),
          ),
        ),
      ).toBe(403)
      const copy = await settle(
        settingsAction(
          args(
            formRequest(
              `/courses/${s.course.id}/settings`,
              { intent: 'copy', termId: String(s.winter.id), code: 'ENTH 150', title: 'Heat engines' },
              { Cookie: cookie },
            ),
            params,
          ),
        ),
      )
      expect(statusOf(copy)).toBe(403)
      const save = await settle(
        settingsAction(
          args(
            formRequest(
              `/courses/${s.course.id}/settings`,
              { intent: 'save', code: 'HACK 1', title: 'Hacked', timeZone: 'UTC', signConvention: 'chemistry' },
              { Cookie: cookie },
            ),
            params,
          ),
        ),
      )
      expect(statusOf(save)).toBe(403)
    }
    expect(await coursesIn(s.winter.id)).toEqual([])
    const [row] = await db().select().from(courses).where(eq(courses.id, s.course.id))
    expect(row).toMatchObject({ code: 'ENTH 150', title: 'Heat engines', signConvention: 'engineering' })
  })
})

describe('course settings (instructors)', () => {
  function settings(overrides: Record<string, string> = {}) {
    return {
      intent: 'save',
      code: 'ENTH 150',
      title: 'Heat engines',
      timeZone: 'Europe/Oslo',
      signConvention: 'engineering',
      ...overrides,
    }
  }

  test('an instructor renames the course and moves it to another zone; an audit row records what changed', async () => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const out = await settingsAction(
      args(
        formRequest(
          `/courses/${s.course.id}/settings`,
          settings({ title: 'Heat engines and refrigerators', code: 'ENTH 151', timeZone: 'america/chicago' }),
          {
            Cookie: cookie,
          },
        ),
        { courseId: String(s.course.id) },
      ),
    )
    expect(redirectOf(out)).toBe(`/courses/${s.course.id}/settings?saved=1`)
    const [row] = await db().select().from(courses).where(eq(courses.id, s.course.id))
    expect(row).toMatchObject({
      title: 'Heat engines and refrigerators',
      code: 'ENTH 151',
      timeZone: 'America/Chicago',
      signConvention: 'engineering',
    })
    const [audit] = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.courseId, s.course.id), eq(auditEvents.kind, 'course-settings-changed')))
    expect(audit).toMatchObject({
      actorId: s.instructor.id,
      before: { title: 'Heat engines', code: 'ENTH 150', timeZone: 'Europe/Oslo' },
      after: { title: 'Heat engines and refrigerators', code: 'ENTH 151', timeZone: 'America/Chicago' },
    })
    // Dates are the same moments, shown in the new zone.
    const [a] = await db().select().from(assignments).where(eq(assignments.id, s.assignment.id))
    expect(a!.dueAt.toISOString()).toBe(s.assignment.dueAt.toISOString())
  })

  test.each([
    [{ timeZone: 'Europe/Atlantis' }, { timeZone: expect.stringContaining('not a time zone we know') }],
    [{ title: '' }, { title: 'Enter the course title.' }],
    [{ code: 'x' }, { code: 'Enter a course code, such as ENTH 210.' }],
    [{ signConvention: '' }, { signConvention: 'Choose a sign convention.' }],
  ])('bad settings %j get field errors and change nothing', async (overrides, errors) => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const out = (await settingsAction(
      args(
        formRequest(`/courses/${s.course.id}/settings`, settings({ title: 'Renamed', ...overrides }), {
          Cookie: cookie,
        }),
        { courseId: String(s.course.id) },
      ),
    )) as unknown as Answer
    expect(out.init?.status).toBe(400)
    expect(out.data.fieldErrors).toMatchObject(errors)
    const [row] = await db().select().from(courses).where(eq(courses.id, s.course.id))
    expect(row).toMatchObject({ title: 'Heat engines', code: 'ENTH 150', timeZone: 'Europe/Oslo' })
    const [n] = await db()
      .select({ n: count() })
      .from(auditEvents)
      .where(and(eq(auditEvents.courseId, s.course.id), eq(auditEvents.kind, 'course-settings-changed')))
    expect(n!.n).toBe(0)
  })

  test('a code another course of the term has is refused', async () => {
    const s = await courseToCopy()
    await createCourse(db(), { departmentId: s.department.id, termId: s.autumn.id, code: 'ENTH 160' })
    const cookie = await sessionCookie(s.instructor)
    const out = (await settingsAction(
      args(formRequest(`/courses/${s.course.id}/settings`, settings({ code: 'ENTH 160' }), { Cookie: cookie }), {
        courseId: String(s.course.id),
      }),
    )) as unknown as Answer
    expect(out.init?.status).toBe(400)
    expect(out.data.fieldErrors.code).toBe(
      'Autumn 2026 already has a course ENTH 160. Choose another code or another term.',
    )
  })

  test('before anyone has answered, the convention changes without a confirmation', async () => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const page = await settingsLoader(
      args(getRequest(`/courses/${s.course.id}/settings`, { Cookie: cookie }), { courseId: String(s.course.id) }),
    )
    expect(page.impact).toEqual({ answers: 0, students: 0, followingProblems: 1, fixedProblems: 1 })
    redirectOf(
      await settingsAction(
        args(
          formRequest(`/courses/${s.course.id}/settings`, settings({ signConvention: 'chemistry' }), {
            Cookie: cookie,
          }),
          { courseId: String(s.course.id) },
        ),
      ),
    )
    const [row] = await db().select().from(courses).where(eq(courses.id, s.course.id))
    expect(row!.signConvention).toBe('chemistry')
  })

  test('after answers, changing the convention needs the explicit yes; without it nothing changes', async () => {
    const s = await courseToCopy()
    await db()
      .insert(submissions)
      .values({
        assignmentId: s.assignment.id,
        itemId: s.items[0]!.id,
        userId: s.student.id,
        answers: { wNet: '120 kJ/kg' },
      })
    const cookie = await sessionCookie(s.instructor)
    const params = { courseId: String(s.course.id) }
    const page = await settingsLoader(args(getRequest(`/courses/${s.course.id}/settings`, { Cookie: cookie }), params))
    expect(page.impact).toMatchObject({ answers: 1, students: 1, followingProblems: 1 })

    const refused = (await settingsAction(
      args(
        formRequest(`/courses/${s.course.id}/settings`, settings({ signConvention: 'chemistry', title: 'Renamed' }), {
          Cookie: cookie,
        }),
        params,
      ),
    )) as unknown as Answer
    expect(refused.init?.status).toBe(400)
    expect(refused.data.fieldErrors.confirmConvention).toContain('Tick the box to confirm')
    expect(refused.data.values.title).toBe('Renamed')
    let [row] = await db().select().from(courses).where(eq(courses.id, s.course.id))
    expect(row).toMatchObject({ signConvention: 'engineering', title: 'Heat engines' })

    // Other changes still save without the box while the convention stays.
    redirectOf(
      await settingsAction(
        args(
          formRequest(`/courses/${s.course.id}/settings`, settings({ title: 'Renamed' }), { Cookie: cookie }),
          params,
        ),
      ),
    )
    redirectOf(
      await settingsAction(
        args(
          formRequest(
            `/courses/${s.course.id}/settings`,
            settings({ title: 'Renamed', signConvention: 'chemistry', confirmConvention: 'yes' }),
            { Cookie: cookie },
          ),
          params,
        ),
      ),
    )
    ;[row] = await db().select().from(courses).where(eq(courses.id, s.course.id))
    expect(row).toMatchObject({ signConvention: 'chemistry', title: 'Renamed' })
    const audits = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.courseId, s.course.id), eq(auditEvents.kind, 'course-settings-changed')))
    expect(audits.map((a) => a.after)).toEqual(
      expect.arrayContaining([{ title: 'Renamed' }, { signConvention: 'chemistry' }]),
    )
  })

  test('an unknown intent is a 400 page, not a server error', async () => {
    const s = await courseToCopy()
    const cookie = await sessionCookie(s.instructor)
    const out = await settle(
      settingsAction(
        args(formRequest(`/courses/${s.course.id}/settings`, { intent: 'delete' }, { Cookie: cookie }), {
          courseId: String(s.course.id),
        }),
      ),
    )
    expect(statusOf(out)).toBe(400)
  })
})

describe('shifting dates on a course’s clock', () => {
  // Oslo: summer time (UTC+2) ends 25 Oct 2026, begins 28 Mar 2027 (EU rule: last Sundays of October and March).
  test.each([
    ['2026-10-12T23:59', 119, '2027-02-08T23:59'],
    ['2027-03-20T12:00', 14, '2027-04-03T12:00'],
    ['2027-02-08T23:59', -119, '2026-10-12T23:59'],
  ])('%s + %i days is %s in Europe/Oslo', (from, days, to) => {
    expect(
      toLocalDateTimeValue(shiftDays(parseLocalDateTime(from, 'Europe/Oslo')!, days, 'Europe/Oslo'), 'Europe/Oslo'),
    ).toBe(to)
  })
})
