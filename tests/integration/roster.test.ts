/**
 * Rosters against PostgreSQL, through the routes' loaders and actions: importing a class
 * list (preview, per-row problems with nothing written, re-import updating), invitations
 * (the e-mail through a real worker, joining as a roster student, resend, revoke), dropping
 * and undoing, sections and their TAs, and who may do what.
 */
import { and, count, eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { action as importAction, loader as importLoader } from '#app/routes/courses/people/import.tsx'
import { action as sectionsAction, loader as sectionsLoader } from '#app/routes/courses/people/sections.tsx'
import { action as peopleAction, loader as peopleLoader } from '#app/routes/courses/people.tsx'
import { action as joinAction, loader as joinLoader } from '#app/routes/join.tsx'
import { db } from '#app/server/db/client.server.ts'
import {
  accessTokens,
  auditEvents,
  courseSections,
  memberships,
  sectionStaff,
  users,
} from '#app/server/db/schema.server.ts'
import { findLastMailTo, linksIn } from '#app/server/outbox.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import { addMember, createCourse, createUser } from '#tests/support/factories.ts'
import { sessionCookie } from '#tests/support/login.ts'
import { args, BASE, formRequest, getRequest, settle } from '#tests/support/requests.ts'

let worker: RunningWorker
beforeAll(async () => {
  worker = await startWorker({ log: () => {} })
})
afterAll(async () => {
  await worker.stop()
  await stopBoss()
})

async function mailTo(address: string, subjectPart = '') {
  const until = Date.now() + 15_000
  for (;;) {
    const mail = await findLastMailTo(db(), address)
    if ((mail && mail.subject.includes(subjectPart)) || Date.now() > until) return mail
    await new Promise((r) => setTimeout(r, 100))
  }
}

/** A multipart form as a browser sends it, with its Content-Length. */
async function multipart(path: string, fields: Record<string, string | File>, cookie: string) {
  const fd = new FormData()
  for (const [k, v] of Object.entries(fields)) fd.append(k, v)
  const draft = new Request(`${BASE}${path}`, { method: 'POST', body: fd })
  const body = await draft.arrayBuffer()
  return new Request(`${BASE}${path}`, {
    method: 'POST',
    body,
    headers: {
      'Content-Type': draft.headers.get('Content-Type')!,
      'Content-Length': String(body.byteLength),
      Cookie: cookie,
    },
  })
}

type ImportData = {
  formError: string | null
  csv: string
  plan: {
    rows: { line: number; status: string; errors: string[]; changes: string[] }[]
    counts: Record<string, number>
    newSections: string[]
  } | null
}
function unwrap(r: unknown): { status: number; data: ImportData } {
  const x = r as { data?: ImportData; init?: { status?: number } | null }
  return { status: x.init?.status ?? 200, data: x.data! }
}

async function setup() {
  const course = await createCourse(db(), { code: `RS ${Math.floor(Math.random() * 900 + 100)}` })
  const instructor = await createUser(db(), { name: 'Ines Instructor' })
  await addMember(db(), instructor.id, course.id, 'instructor')
  const cookie = await sessionCookie(instructor)
  const cid = { courseId: String(course.id) }
  const people = `/courses/${course.id}/people`
  return { course, instructor, cookie, cid, people }
}

async function preview(s: Awaited<ReturnType<typeof setup>>, fields: Record<string, string | File>) {
  return unwrap(
    await importAction(args(await multipart(`${s.people}/import`, { intent: 'preview', ...fields }, s.cookie), s.cid)),
  )
}
async function confirm(s: Awaited<ReturnType<typeof setup>>, csv: string) {
  const r = await settle(
    importAction(
      args(await multipart(`${s.people}/import`, { intent: 'import', csv, fileName: 'list.csv' }, s.cookie), s.cid),
    ),
  )
  return 'thrown' in r ? { thrown: r.thrown } : { value: r.value }
}

const uid = () => Math.random().toString(36).slice(2, 8)

async function countWrites(courseId: number) {
  const [u] = await db().select({ n: count() }).from(users)
  const [m] = await db().select({ n: count() }).from(memberships).where(eq(memberships.courseId, courseId))
  const [t] = await db().select({ n: count() }).from(accessTokens).where(eq(accessTokens.courseId, courseId))
  const [a] = await db().select({ n: count() }).from(auditEvents).where(eq(auditEvents.courseId, courseId))
  const [cs] = await db().select({ n: count() }).from(courseSections).where(eq(courseSections.courseId, courseId))
  return { users: u!.n, memberships: m!.n, tokens: t!.n, audit: a!.n, sections: cs!.n }
}

describe('importing a class list', () => {
  test('a good file: preview writes nothing, confirm makes accounts without passwords, memberships, sections, invitations and one audit row', async () => {
    const s = await setup()
    const k = uid()
    const csv = `\uFEFFStudent ID;Surname;First name;E-mail;Section\r\nA${k}1;Okafor;Ngozi;Ngozi.${k}@Uni.Example;Lab 1\r\nA${k}2;Berg;Lars;lars.${k}@uni.example;Lab 2\r\n`
    const before = await countWrites(s.course.id)
    const p = await preview(s, { file: new File([csv], 'class.csv', { type: 'text/csv' }) })
    expect(p.status).toBe(200)
    expect(p.data.plan?.counts).toMatchObject({ new: 2, error: 0 })
    expect(p.data.plan?.newSections).toEqual(['Lab 1', 'Lab 2'])
    expect(p.data.csv).toContain(`A${k}1`)
    expect(await countWrites(s.course.id)).toEqual(before)

    const done = await confirm(s, p.data.csv)
    const res = 'thrown' in done ? (done.thrown as Response) : (done.value as Response)
    expect(res.status).toBe(302)
    expect(res.headers.get('Location')).toBe(`${s.people}?imported=2&updated=0&invited=2`)

    const [ngozi] = await db()
      .select()
      .from(users)
      .where(eq(users.email, `ngozi.${k}@uni.example`))
    expect(ngozi).toMatchObject({
      studentNumber: `A${k}1`,
      familyName: 'Okafor',
      givenName: 'Ngozi',
      name: 'Ngozi Okafor',
      passwordHash: null,
    })
    const [m] = await db()
      .select()
      .from(memberships)
      .where(and(eq(memberships.userId, ngozi!.id), eq(memberships.courseId, s.course.id)))
    expect(m).toMatchObject({ role: 'student', section: 'Lab 1', droppedAt: null })
    const sections = await db()
      .select({ name: courseSections.name })
      .from(courseSections)
      .where(eq(courseSections.courseId, s.course.id))
    expect(sections.map((x) => x.name).sort()).toEqual(['Lab 1', 'Lab 2'])
    const [tok] = await db()
      .select()
      .from(accessTokens)
      .where(eq(accessTokens.email, `ngozi.${k}@uni.example`))
    expect(tok).toMatchObject({
      purpose: 'invitation',
      role: 'student',
      courseId: s.course.id,
      usedAt: null,
      revokedAt: null,
    })
    expect(tok!.lastSentAt).toBeInstanceOf(Date)
    const audit = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.courseId, s.course.id), eq(auditEvents.kind, 'roster-import')))
    expect(audit).toHaveLength(1)
    expect(audit[0]).toMatchObject({
      actorId: s.instructor.id,
      after: expect.objectContaining({ new: 2, invited: 2, newSections: ['Lab 1', 'Lab 2'] }),
    })

    // The roster shows them from the first day; the invitation is pending.
    const page = await peopleLoader(args(getRequest(s.people, { Cookie: s.cookie }), s.cid))
    expect(page.roster.active.map((x) => x.name)).toEqual(expect.arrayContaining(['Ngozi Okafor', 'Lars Berg']))
    expect(page.pending.map((x) => x.email).sort()).toEqual([`lars.${k}@uni.example`, `ngozi.${k}@uni.example`])

    // The e-mail arrives; the link sets the password of the existing account, with the name filled in.
    const mail = await mailTo(`ngozi.${k}@uni.example`)
    expect(mail?.subject).toContain(s.course.code)
    const token = new URL(linksIn(mail!.text).find((l) => l.includes('/join/'))!).pathname.split('/').pop()!
    const join = await joinLoader(args(getRequest(`/join/${token}`), { token }))
    expect(join.invitation).toMatchObject({ hasAccount: false, name: 'Ngozi Okafor' })
    const joined = await settle(
      joinAction(
        args(
          formRequest(`/join/${token}`, {
            name: 'Ngozi Okafor',
            password: 'a long enough password',
            confirm: 'a long enough password',
          }),
          { token },
        ),
      ),
    )
    const jr = ('value' in joined ? joined.value : joined.thrown) as Response
    expect(jr.status).toBe(302)
    const after = await db()
      .select()
      .from(users)
      .where(eq(users.email, `ngozi.${k}@uni.example`))
    expect(after).toHaveLength(1)
    expect(after[0]!.passwordHash).not.toBeNull()
    expect(after[0]!.id).toBe(ngozi!.id)
    const pendingAfter = await peopleLoader(args(getRequest(s.people, { Cookie: s.cookie }), s.cid))
    expect(pendingAfter.pending.map((x) => x.email)).toEqual([`lars.${k}@uni.example`])
  })

  test('bad rows: each says what is wrong, and nothing is written even when the import is pressed anyway', async () => {
    const s = await setup()
    const k = uid()
    // Someone already registered elsewhere with a student ID.
    const other = await createUser(db(), { email: `taken.${k}@uni.example`, name: 'Taken Person' })
    await db()
      .update(users)
      .set({ studentNumber: `T${k}` })
      .where(eq(users.id, other.id))
    const ta = await createUser(db(), { email: `ta.${k}@uni.example` })
    await addMember(db(), ta.id, s.course.id, 'ta')
    const csv = [
      'student_id,last name,given name,email',
      `B${k}1,Good,Row,good.${k}@uni.example`,
      `,Missing,Id,missing.${k}@uni.example`,
      `B${k}3,Bad,Mail,not-an-address`,
      `B${k}1,Dup,Id,dupid.${k}@uni.example`,
      `B${k}5,Dup,Mail,GOOD.${k}@uni.example`,
      `B${k}6,Other,Id,taken.${k}@uni.example`,
      `B${k}7,${'x'.repeat(61)},Long,long.${k}@uni.example`,
      `B${k}8,Nul,By\u0000te,nul.${k}@uni.example`,
      `T${k},Wrong,Mail,someone.${k}@uni.example`,
      `B${k}10,Staff,Member,ta.${k}@uni.example`,
    ].join('\n')
    const before = await countWrites(s.course.id)
    const p = await preview(s, { csv })
    expect(p.status).toBe(400)
    const errs = (line: number) => p.data.plan!.rows.find((r) => r.line === line)!.errors.join(' ')
    expect(p.data.plan!.rows.find((r) => r.line === 2)!.status).toBe('new')
    expect(errs(3)).toBe('The student ID is missing.')
    expect(errs(4)).toMatch(/e-mail address is not valid/)
    expect(errs(5)).toBe(`The student ID B${k}1 is also on line 2.`)
    expect(errs(6)).toBe(`The e-mail address good.${k}@uni.example is also on line 2.`)
    expect(errs(7)).toMatch(/already registered to a different student ID/)
    expect(errs(8)).toBe('The family name is longer than 60 characters.')
    expect(errs(9)).toMatch(/NUL byte/)
    expect(errs(10)).toMatch(/already registered with a different e-mail address/)
    expect(errs(11)).toMatch(/teaching assistant of this course/)
    expect(p.data.plan!.counts.error).toBe(9)

    const forced = await confirm(s, csv)
    expect('value' in forced && unwrap(forced.value).status).toBe(409)
    expect('value' in forced && unwrap(forced.value).data.formError).toMatch(
      /Nothing was imported: 9 rows have problems/,
    )
    expect(await countWrites(s.course.id)).toEqual(before)
    expect(await findLastMailTo(db(), `good.${k}@uni.example`)).toBeNull()
  })

  test('whole-file problems and limits are refused with a message', async () => {
    const s = await setup()
    const missing = await preview(s, { csv: 'Student ID,E-mail\n1,a@x.example' })
    expect(missing.status).toBe(400)
    expect(missing.data.formError).toMatch(/Missing: family name, given name/)
    const empty = await preview(s, { csv: '' })
    expect(empty.data.formError).toMatch(/Choose a CSV file/)
    const big = await preview(s, { file: new File(['x'.repeat(1024 * 1024 + 10)], 'big.csv') })
    expect(big.status).toBe(413)
    expect(big.data.formError).toMatch(/larger than 1 MB/)
    const noLength = new Request(`${BASE}${s.people}/import`, {
      method: 'POST',
      body: 'intent=preview',
      headers: { Cookie: s.cookie, 'Content-Type': 'application/x-www-form-urlencoded' },
    })
    expect(unwrap(await importAction(args(noLength, s.cid))).status).toBe(411)
  })

  test('a file that is not UTF-8 is read as Windows-1252 and says so', async () => {
    const s = await setup()
    const k = uid()
    const latin = new Uint8Array([
      ...new TextEncoder().encode(`Student ID,Family name,Given name,E-mail\nW${k},M`),
      0xfc,
      ...new TextEncoder().encode(`ller,Jos,w.${k}@uni.example\n`),
    ])
    const p = await preview(s, { file: new File([latin], 'excel.csv') })
    expect(p.data.plan?.counts.new).toBe(1)
    expect(p.data.csv).toContain('Müller')
  })

  test('re-importing updates names and sections instead of making anyone twice; an existing account is matched by e-mail', async () => {
    const s = await setup()
    const k = uid()
    const existing = await createUser(db(), { email: `had.${k}@uni.example`, name: 'Had Account' })
    const first = `Student ID,Family name,Given name,E-mail,Section\nC${k}1,Smith,Jo,jo.${k}@uni.example,Lab 1\nC${k}2,Account,Had,had.${k}@uni.example,\n`
    const p1 = await preview(s, { csv: first })
    expect(p1.data.plan!.rows.map((r) => r.status)).toEqual(['new', 'add'])
    await confirm(s, first)
    const second = `Student ID,Family name,Given name,E-mail,Section\nC${k}1,Smyth,Jo,JO.${k}@uni.example,Lab 2\nC${k}2,Account,Had,had.${k}@uni.example,\n`
    const p2 = await preview(s, { csv: second })
    expect(p2.data.plan!.rows[0]).toMatchObject({
      status: 'update',
      changes: ['family name “Smith” → “Smyth”', 'section “Lab 1” → “Lab 2”'],
    })
    expect(p2.data.plan!.rows[1]!.status).toBe('unchanged')
    const done = await confirm(s, second)
    expect((('thrown' in done ? done.thrown : done.value) as Response).headers.get('Location')).toContain(
      'imported=0&updated=1&invited=0',
    )
    const jo = await db()
      .select()
      .from(users)
      .where(eq(users.email, `jo.${k}@uni.example`))
    expect(jo).toHaveLength(1)
    expect(jo[0]).toMatchObject({ familyName: 'Smyth', name: 'Jo Smyth', studentNumber: `C${k}1` })
    const [had] = await db().select().from(users).where(eq(users.id, existing.id))
    expect(had).toMatchObject({ studentNumber: `C${k}2`, name: 'Had Account' })
    expect(had!.passwordHash).not.toBeNull()
    const rows = await db().select().from(memberships).where(eq(memberships.courseId, s.course.id))
    expect(rows.filter((r) => r.role === 'student')).toHaveLength(2)
    expect(rows.find((r) => r.userId === jo[0]!.id)!.section).toBe('Lab 2')
    // Only the first import sent invitations (one each).
    const tokens = await db().select().from(accessTokens).where(eq(accessTokens.courseId, s.course.id))
    expect(tokens).toHaveLength(2)
  })
})

describe('pending invitations', () => {
  test('resend keeps the link, renews it and moves lastSentAt; revoke makes the link say it was withdrawn', async () => {
    const s = await setup()
    const k = uid()
    await confirm(
      s,
      `Student ID,Family name,Given name,E-mail\nD${k}1,Ray,Amy,amy.${k}@uni.example\nD${k}2,Ray,Ben,ben.${k}@uni.example\n`,
    )
    const page = await peopleLoader(args(getRequest(s.people, { Cookie: s.cookie }), s.cid))
    const amy = page.pending.find((p) => p.email === `amy.${k}@uni.example`)!
    const ben = page.pending.find((p) => p.email === `ben.${k}@uni.example`)!

    // Too soon after the first e-mail.
    const soon = unwrap(
      await peopleAction(
        args(formRequest(s.people, { intent: 'resend', invitationId: String(amy.id) }, { Cookie: s.cookie }), s.cid),
      ),
    )
    expect(soon.status).toBe(400)
    expect(soon.data).toMatchObject({ message: expect.stringMatching(/less than a minute ago/) })

    // The first e-mail has arrived before the reminder is sent, so "the last mail" is the reminder.
    expect((await mailTo(`amy.${k}@uni.example`))?.subject).toMatch(/^You are invited/)
    const old = new Date(Date.now() - 3 * 86_400_000)
    await db()
      .update(accessTokens)
      .set({ lastSentAt: old, expiresAt: new Date(Date.now() - 1000) })
      .where(eq(accessTokens.id, amy.id))
    const [beforeRow] = await db().select().from(accessTokens).where(eq(accessTokens.id, amy.id))
    const resent = await peopleAction(
      args(formRequest(s.people, { intent: 'resend', invitationId: String(amy.id) }, { Cookie: s.cookie }), s.cid),
    )
    expect(resent).toMatchObject({ ok: true, message: `The invitation was sent again to amy.${k}@uni.example.` })
    const [afterRow] = await db().select().from(accessTokens).where(eq(accessTokens.id, amy.id))
    expect(afterRow!.token).toBe(beforeRow!.token)
    expect(afterRow!.lastSentAt!.getTime()).toBeGreaterThan(old.getTime())
    expect(afterRow!.expiresAt.getTime()).toBeGreaterThan(Date.now() + 6 * 86_400_000)
    const reminder = await mailTo(`amy.${k}@uni.example`, 'Reminder')
    expect(reminder?.subject).toMatch(/^Reminder/)
    expect(reminder?.text).toContain(`/join/${afterRow!.token}`)

    const revoked = await peopleAction(
      args(formRequest(s.people, { intent: 'revoke', invitationId: String(ben.id) }, { Cookie: s.cookie }), s.cid),
    )
    expect(revoked).toMatchObject({ ok: true })
    const [benRow] = await db().select().from(accessTokens).where(eq(accessTokens.id, ben.id))
    expect(benRow!.revokedAt).toBeInstanceOf(Date)
    const token = benRow!.token
    expect((await joinLoader(args(getRequest(`/join/${token}`), { token }))).problem).toBe('revoked')
    const tryJoin = unwrap(
      await joinAction(
        args(
          formRequest(`/join/${token}`, {
            name: 'Ben Ray',
            password: 'a long enough password',
            confirm: 'a long enough password',
          }),
          { token },
        ),
      ),
    )
    expect(tryJoin.status).toBe(400)
    const [ben2] = await db()
      .select()
      .from(users)
      .where(eq(users.email, `ben.${k}@uni.example`))
    expect(ben2!.passwordHash).toBeNull()
    // Revoked twice, or resent after revoking: a clear refusal.
    const again = unwrap(
      await peopleAction(
        args(formRequest(s.people, { intent: 'resend', invitationId: String(ben.id) }, { Cookie: s.cookie }), s.cid),
      ),
    )
    expect(again.status).toBe(400)
    expect(again.data).toMatchObject({ message: expect.stringMatching(/no longer waiting/) })
    const listed = await peopleLoader(args(getRequest(s.people, { Cookie: s.cookie }), s.cid))
    expect(listed.pending.map((p) => p.email)).toEqual([`amy.${k}@uni.example`])
    expect(listed.roster.active.some((m) => m.email === `ben.${k}@uni.example`)).toBe(true)
    const kinds = await db()
      .select({ kind: auditEvents.kind })
      .from(auditEvents)
      .where(eq(auditEvents.courseId, s.course.id))
    expect(kinds.map((x) => x.kind)).toEqual(expect.arrayContaining(['invitation-resent', 'invitation-revoked']))
  })
})

describe('dropping a student', () => {
  test('drop and undo set droppedAt, show the student apart, and write audit rows', async () => {
    const s = await setup()
    const student = await createUser(db(), { name: 'Dara Drop' })
    await addMember(db(), student.id, s.course.id, 'student')
    const dropped = await peopleAction(
      args(formRequest(s.people, { intent: 'drop', userId: String(student.id) }, { Cookie: s.cookie }), s.cid),
    )
    expect(dropped).toMatchObject({ ok: true, message: 'Dara Drop was dropped. Their answers are kept.' })
    const [m] = await db()
      .select()
      .from(memberships)
      .where(and(eq(memberships.userId, student.id), eq(memberships.courseId, s.course.id)))
    expect(m!.droppedAt).toBeInstanceOf(Date)
    const page = await peopleLoader(args(getRequest(s.people, { Cookie: s.cookie }), s.cid))
    expect(page.roster.dropped.map((x) => x.userId)).toEqual([student.id])
    expect(page.roster.active.some((x) => x.userId === student.id)).toBe(false)

    await peopleAction(
      args(formRequest(s.people, { intent: 'undrop', userId: String(student.id) }, { Cookie: s.cookie }), s.cid),
    )
    const [m2] = await db()
      .select()
      .from(memberships)
      .where(and(eq(memberships.userId, student.id), eq(memberships.courseId, s.course.id)))
    expect(m2!.droppedAt).toBeNull()
    const kinds = await db()
      .select({ kind: auditEvents.kind, userId: auditEvents.userId })
      .from(auditEvents)
      .where(eq(auditEvents.courseId, s.course.id))
      .orderBy(auditEvents.id)
    expect(kinds).toEqual([
      { kind: 'student-dropped', userId: student.id },
      { kind: 'student-undropped', userId: student.id },
    ])
    // Only students are dropped.
    const ta = await createUser(db())
    await addMember(db(), ta.id, s.course.id, 'ta')
    const refused = unwrap(
      await peopleAction(
        args(formRequest(s.people, { intent: 'drop', userId: String(ta.id) }, { Cookie: s.cookie }), s.cid),
      ),
    )
    expect(refused.status).toBe(400)
    expect(refused.data).toMatchObject({ message: 'That person is not a student of this course.' })
  })
})

describe('sections', () => {
  test('create, rename (students follow), set a student’s section, assign a TA, delete', async () => {
    const s = await setup()
    const path = `${s.people}/sections`
    const post = async (fields: Record<string, string>) =>
      sectionsAction(args(formRequest(path, fields, { Cookie: s.cookie }), s.cid))
    expect(await post({ intent: 'create', name: '  Lab   A ' })).toMatchObject({
      data: { ok: true, message: 'Section “Lab A” added.' },
    })
    expect(await post({ intent: 'create', name: 'lab a' })).toMatchObject({
      data: { ok: false, message: 'There is already a section called “lab a”.' },
      init: { status: 400 },
    })
    expect(await post({ intent: 'create', name: '' })).toMatchObject({
      data: { ok: false, message: 'Give the section a name.' },
    })
    const [section] = await db().select().from(courseSections).where(eq(courseSections.courseId, s.course.id))

    const student = await createUser(db(), { name: 'Sam Section' })
    await addMember(db(), student.id, s.course.id, 'student')
    expect(
      await peopleAction(
        args(
          formRequest(
            s.people,
            { intent: 'set-section', userId: String(student.id), sectionId: String(section!.id) },
            { Cookie: s.cookie },
          ),
          s.cid,
        ),
      ),
    ).toMatchObject({
      ok: true,
      message: 'Sam Section is now in section Lab A.',
    })
    await post({ intent: 'rename', sectionId: String(section!.id), name: 'Lab Tuesday' })
    const [m] = await db().select().from(memberships).where(eq(memberships.userId, student.id))
    expect(m!.section).toBe('Lab Tuesday')

    const ta = await createUser(db(), { name: 'Tariq TA' })
    await addMember(db(), ta.id, s.course.id, 'ta')
    expect(await post({ intent: 'assign', sectionId: String(section!.id), userId: String(ta.id) })).toMatchObject({
      data: { ok: true },
    })
    expect(await post({ intent: 'assign', sectionId: String(section!.id), userId: String(student.id) })).toMatchObject({
      data: { ok: false, message: 'Only teaching assistants of this course can be assigned to a section.' },
    })
    const view = await sectionsLoader(args(getRequest(path, { Cookie: s.cookie }), s.cid))
    expect(view.sections).toEqual([
      { id: section!.id, name: 'Lab Tuesday', students: 1, staff: [{ userId: ta.id, name: 'Tariq TA' }] },
    ])

    // A section from another course is not this course's.
    const otherCourse = await createCourse(db())
    const [foreign] = await db().insert(courseSections).values({ courseId: otherCourse.id, name: 'X' }).returning()
    expect(await post({ intent: 'delete', sectionId: String(foreign!.id) })).toMatchObject({
      data: { ok: false, message: 'That section no longer exists.' },
    })

    expect(await post({ intent: 'delete', sectionId: String(section!.id) })).toMatchObject({ data: { ok: true } })
    const [m2] = await db().select().from(memberships).where(eq(memberships.userId, student.id))
    expect(m2!.section).toBeNull()
    expect(await db().select().from(sectionStaff).where(eq(sectionStaff.sectionId, section!.id))).toEqual([])
    const kinds = await db()
      .select({ kind: auditEvents.kind })
      .from(auditEvents)
      .where(eq(auditEvents.courseId, s.course.id))
      .orderBy(auditEvents.id)
    expect(kinds.map((x) => x.kind)).toEqual([
      'section-created',
      'student-section',
      'section-renamed',
      'section-staff',
      'section-deleted',
    ])
  })

  test('section names students carry from before are set up on request', async () => {
    const s = await setup()
    const student = await createUser(db())
    await addMember(db(), student.id, s.course.id, 'student', 'Old group')
    const path = `${s.people}/sections`
    expect((await sectionsLoader(args(getRequest(path, { Cookie: s.cookie }), s.cid))).loose).toEqual(['Old group'])
    await sectionsAction(args(formRequest(path, { intent: 'adopt' }, { Cookie: s.cookie }), s.cid))
    const view = await sectionsLoader(args(getRequest(path, { Cookie: s.cookie }), s.cid))
    expect(view.loose).toEqual([])
    expect(view.sections.map((x) => [x.name, x.students])).toEqual([['Old group', 1]])
  })
})

describe('who may do what', () => {
  test('a TA sees the roster and sections but changes nothing; a student and a stranger see nothing', async () => {
    const s = await setup()
    const ta = await createUser(db())
    await addMember(db(), ta.id, s.course.id, 'ta')
    const student = await createUser(db())
    await addMember(db(), student.id, s.course.id, 'student')
    const stranger = await createUser(db())
    const [section] = await db().insert(courseSections).values({ courseId: s.course.id, name: 'S1' }).returning()
    await db()
      .insert(accessTokens)
      .values({
        token: `tok${uid()}xxxxxxxxxxxx`,
        purpose: 'invitation',
        email: 'p@x.example',
        courseId: s.course.id,
        role: 'student',
        expiresAt: new Date(Date.now() + 86_400_000),
      })
    const [invitation] = await db().select().from(accessTokens).where(eq(accessTokens.courseId, s.course.id))

    const taCookie = await sessionCookie(ta)
    const seen = await peopleLoader(args(getRequest(s.people, { Cookie: taCookie }), s.cid))
    expect(seen.mayManage).toBe(false)
    expect(seen.pending).toHaveLength(1)
    expect(
      (await sectionsLoader(args(getRequest(`${s.people}/sections`, { Cookie: taCookie }), s.cid))).mayManage,
    ).toBe(false)

    const status = (r: { thrown: unknown } | { value: unknown }) =>
      'thrown' in r ? (r.thrown as { init: { status: number } }).init?.status : 'no refusal'
    const changes: Record<string, string>[] = [
      { intent: 'drop', userId: String(student.id) },
      { intent: 'set-section', userId: String(student.id), sectionId: String(section!.id) },
      { intent: 'resend', invitationId: String(invitation!.id) },
      { intent: 'revoke', invitationId: String(invitation!.id) },
    ]
    for (const who of [ta, student, stranger]) {
      const cookie = await sessionCookie(who)
      for (const fields of changes)
        expect(status(await settle(peopleAction(args(formRequest(s.people, fields, { Cookie: cookie }), s.cid))))).toBe(
          403,
        )
      expect(
        status(
          await settle(
            sectionsAction(
              args(formRequest(`${s.people}/sections`, { intent: 'create', name: 'Nope' }, { Cookie: cookie }), s.cid),
            ),
          ),
        ),
      ).toBe(403)
      expect(
        status(await settle(importLoader(args(getRequest(`${s.people}/import`, { Cookie: cookie }), s.cid)))),
      ).toBe(403)
      const csv = 'Student ID,Family name,Given name,E-mail\n1,A,B,b@x.example'
      expect(
        status(
          await settle(
            importAction(args(await multipart(`${s.people}/import`, { intent: 'import', csv }, cookie), s.cid)),
          ),
        ),
      ).toBe(403)
    }
    for (const who of [student, stranger]) {
      const cookie = await sessionCookie(who)
      expect(status(await settle(peopleLoader(args(getRequest(s.people, { Cookie: cookie }), s.cid))))).toBe(403)
      expect(
        status(await settle(sectionsLoader(args(getRequest(`${s.people}/sections`, { Cookie: cookie }), s.cid)))),
      ).toBe(403)
    }
    // Nothing changed.
    const [m] = await db().select().from(memberships).where(eq(memberships.userId, student.id))
    expect(m).toMatchObject({ droppedAt: null, section: null })
    const [inv] = await db().select().from(accessTokens).where(eq(accessTokens.id, invitation!.id))
    expect(inv!.revokedAt).toBeNull()
    expect(
      (await db().select().from(courseSections).where(eq(courseSections.courseId, s.course.id))).map((x) => x.name),
    ).toEqual(['S1'])
    expect(
      (await db().execute(sql`select count(*)::int as n from audit_events where course_id = ${s.course.id}`)).rows[0],
    ).toEqual({ n: 0 })
  })
})

// Last in the file: its 5,000 e-mails keep the worker busy for a while.
describe('a full-size class list', () => {
  test('5,000 students import in one go, each with one account, membership and invitation', async () => {
    const s = await setup()
    const k = uid()
    const lines = ['Student ID,Family name,Given name,E-mail,Section']
    for (let i = 0; i < 5000; i++) lines.push(`M${k}${i},Family${i},Given${i},m${i}.${k}@big.example,Group ${i % 20}`)
    const done = await confirm(s, lines.join('\n'))
    const res = ('thrown' in done ? done.thrown : done.value) as Response
    expect(res.headers.get('Location')).toContain('imported=5000')
    const [m] = await db()
      .select({ n: count() })
      .from(memberships)
      .where(and(eq(memberships.courseId, s.course.id), eq(memberships.role, 'student')))
    const [t] = await db().select({ n: count() }).from(accessTokens).where(eq(accessTokens.courseId, s.course.id))
    expect([m!.n, t!.n]).toEqual([5000, 5000])
  }, 120_000)
})
