/**
 * Grade exports against PostgreSQL: the course CSV through its route (content, formula
 * neutralising, who may have it), the term export built by a real pg-boss worker, and a
 * queued e-mail delivered by the worker to the local fake SMTP server's outbox.
 */
import { parse } from 'csv-parse/sync'
import { eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { action as exportsAction, loader as exportsLoader } from '#app/routes/admin/exports.tsx'
import { loader as courseCsvLoader } from '#app/routes/resources/course-gradebook-csv.ts'
import { loader as downloadLoader } from '#app/routes/resources/grade-export-download.ts'
import { db } from '#app/server/db/client.server.ts'
import { gradeExports, partResults, submissions } from '#app/server/db/schema.server.ts'
import { buildTermExport, requestTermExport, TERM_EXPORT_HEADER } from '#app/server/exports.server.ts'
import { findLastMailTo } from '#app/server/outbox.server.ts'
import { createSessionRow, sessionStorage } from '#app/server/session.server.ts'
import { enqueue, stopBoss } from '#app/server/queue.server.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { addMember, createAssignment, createCourse, createDepartment, createProblemWithVersion, createTerm, createUser } from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition

async function cookieFor(userId: number): Promise<string> {
  const row = await createSessionRow(db(), userId)
  const session = await sessionStorage().getSession()
  session.set('sid', row.id)
  return (await sessionStorage().commitSession(session)).split(';')[0]!
}

function thrownStatus(r: { thrown: unknown } | { value: unknown }): number | undefined {
  if (!('thrown' in r)) return undefined
  const t = r.thrown as { status?: number; init?: { status?: number } }
  return t.init?.status ?? t.status
}

/** One graded answer worth `score` of `maxScore` points to the first find of an item. */
async function giveScore(a: { assignmentId: number; itemId: number }, userId: number, score: number, maxScore: number, daysLate = 0) {
  const [s] = await db()
    .insert(submissions)
    .values({ assignmentId: a.assignmentId, itemId: a.itemId, userId, answers: { x: '1' }, status: 'graded', daysLate, gradedAt: new Date() })
    .returning({ id: submissions.id })
  await db().insert(partResults).values({
    submissionId: s!.id,
    assignmentId: a.assignmentId,
    itemId: a.itemId,
    userId,
    findName: otto.finds[0]!.name,
    answer: '1',
    attempt: 1,
    verdict: score > 0 ? 'correct' : 'incorrect',
    score,
    maxScore,
  })
}

/** A course with two assignments (worth 10 and 20, the later-made one due first), an instructor, a TA and the given students. */
async function courseWithGrades(options: { departmentId?: number; termId?: number; code?: string; students: { name: string; section: string | null }[] }) {
  const course = await createCourse(db(), { departmentId: options.departmentId, termId: options.termId, code: options.code ?? 'TH 201', title: 'Engineering Thermodynamics', timeZone: 'America/Chicago' })
  const instructor = await createUser(db(), { name: 'Ivy Instructor' })
  const ta = await createUser(db(), { name: 'Tariq Assistant' })
  await addMember(db(), instructor.id, course.id, 'instructor')
  await addMember(db(), ta.id, course.id, 'ta')
  const students = []
  for (const s of options.students) {
    const user = await createUser(db(), { name: s.name })
    await addMember(db(), user.id, course.id, 'student', s.section)
    students.push(user)
  }
  const problem = await createProblemWithVersion(db(), instructor.id, otto)
  const later = await createAssignment(db(), course.id, instructor.id, [{ ...problem, points: 20 }], {
    title: 'Otto cycle, part 2',
    opensAt: new Date('2026-10-01T12:00:00Z'),
    dueAt: new Date('2026-11-20T23:59:00Z'),
  })
  const earlier = await createAssignment(db(), course.id, instructor.id, [{ ...problem, points: 10 }], {
    title: 'Otto cycle, part 1',
    opensAt: new Date('2026-10-01T12:00:00Z'),
    // 05:59 UTC on 1 November is 00:59 in Chicago (CDT, UTC−5).
    dueAt: new Date('2026-11-01T05:59:00Z'),
  })
  return {
    course,
    instructor,
    ta,
    students,
    first: { assignmentId: earlier.assignment.id, itemId: earlier.items[0]!.id },
    second: { assignmentId: later.assignment.id, itemId: later.items[0]!.id },
  }
}

async function courseCsv(courseId: number, userId: number) {
  return settle(courseCsvLoader(args(getRequest(`/courses/${courseId}/gradebook.csv`, { Cookie: await cookieFor(userId) }), { courseId: String(courseId) })))
}

describe('course gradebook CSV', () => {
  test('a header, a row per student in name order, a column per assignment by due date, totals and percent', async () => {
    const c = await courseWithGrades({
      students: [
        { name: 'Zoë Zeller', section: 'B' },
        { name: 'Ada Adams', section: 'A' },
        { name: 'Nobody Yet', section: null },
      ],
    })
    const [zoe, ada] = c.students
    await giveScore(c.first, ada!.id, 7.5, 10)
    await giveScore(c.first, ada!.id, 9.25, 10) // a better second answer: the best counts
    await giveScore(c.second, ada!.id, 15, 20)
    await giveScore(c.second, zoe!.id, 20, 20)
    // An answer still waiting for the grader: no score yet, counted as being graded.
    const [waiting] = await db()
      .insert(submissions)
      .values({ assignmentId: c.first.assignmentId, itemId: c.first.itemId, userId: c.students[2]!.id, answers: { x: '1' } })
      .returning({ id: submissions.id })
    await db().insert(partResults).values({ submissionId: waiting!.id, ...c.first, userId: c.students[2]!.id, findName: otto.finds[0]!.name, answer: '1', attempt: 1, maxScore: 10 })

    const r = await courseCsv(c.course.id, c.instructor.id)
    expect('value' in r).toBe(true)
    const response = (r as { value: Response }).value
    expect(response.status).toBe(200)
    expect(response.headers.get('Content-Type')).toBe('text/csv; charset=utf-8')
    expect(response.headers.get('Content-Disposition')).toMatch(/^attachment; filename="th-201-grades-\d{4}-\d{2}-\d{2}\.csv"$/)
    expect(response.body).toBeInstanceOf(ReadableStream)
    const bytes = new Uint8Array(await response.arrayBuffer())
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]) // the UTF-8 byte order mark
    const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes)
    const rows = parse(text, { bom: true }) as string[][]
    expect(rows).toEqual([
      ['Student', 'E-mail', 'Section', 'Otto cycle, part 1 [10 pts]', 'Otto cycle, part 2 [20 pts]', 'Total [30 pts]', 'Percent', 'Answers being graded'],
      ['Ada Adams', ada!.email, 'A', '9.25', '15', '24.25', '80.8', '0'],
      ['Nobody Yet', c.students[2]!.email, '', '0', '0', '0', '0', '1'],
      ['Zoë Zeller', zoe!.email, 'B', '0', '20', '20', '66.7', '0'],
    ])
  })

  test('names that start like a formula come out as text with a leading quote', async () => {
    const names = ['=HYPERLINK("http://evil.example","click")', '+1', '-2', '\u2212 3', '@SUM(A1:A9)', '\tx', '\rx', 'Plain Name']
    const c = await courseWithGrades({ students: names.map((name) => ({ name, section: '=1+1' })) })
    const r = await courseCsv(c.course.id, c.ta.id)
    const rows = parse(await (r as { value: Response }).value.text(), { bom: true }) as string[][]
    const byName = rows.slice(1).map((row) => [row[0], row[2]])
    const expected = names.map((n) => [n === 'Plain Name' ? n : `'${n}`, "'=1+1"])
    expect(byName.sort()).toEqual(expected.sort())
    for (const row of rows) for (const cell of row) expect(cell).not.toMatch(/^[=+\-\u2212@\t\r]/)
  })

  test('only the course’s staff get it: a student and an outsider are refused', async () => {
    const c = await courseWithGrades({ students: [{ name: 'Sam Student', section: 'A' }] })
    const outsider = await createUser(db())
    expect(thrownStatus(await courseCsv(c.course.id, c.students[0]!.id))).toBe(403)
    expect(thrownStatus(await courseCsv(c.course.id, outsider.id))).toBe(403)
    const signedOut = await settle(courseCsvLoader(args(getRequest(`/courses/${c.course.id}/gradebook.csv`), { courseId: String(c.course.id) })))
    expect(thrownStatus(signedOut)).toBe(302)
    expect('value' in (await courseCsv(c.course.id, c.ta.id))).toBe(true)
  })
})

describe('through the worker', () => {
  let worker: RunningWorker
  const workerErrors: string[] = []

  beforeAll(async () => {
    worker = await startWorker({ databaseUrl: process.env.DATABASE_URL, log: () => {}, logError: (line) => workerErrors.push(line) })
  })

  afterAll(async () => {
    await worker.stop()
    await stopBoss()
  })

  async function waitForExport(exportId: number, ms = 30_000) {
    const until = Date.now() + ms
    for (;;) {
      const [row] = await db().select().from(gradeExports).where(eq(gradeExports.id, exportId))
      if (row && (row.status === 'done' || row.status === 'failed')) return row
      if (Date.now() > until) throw new Error(`export ${exportId} did not finish: ${JSON.stringify(row)} ${workerErrors.join(' | ')}`)
      await new Promise((r) => setTimeout(r, 200))
    }
  }

  test('a department admin’s term export ends done with a row per (course, student, assignment) and a total row per student', async () => {
    const department = await createDepartment(db())
    const other = await createDepartment(db())
    const term = await createTerm(db(), department.id, { name: 'Fall 2026' })
    const c = await courseWithGrades({ departmentId: department.id, termId: term.id, code: 'TH 301', students: [{ name: '@Bob', section: 'A' }, { name: 'Ann', section: null }] })
    const [bob, ann] = c.students
    await giveScore(c.first, bob!.id, 5, 10, 2)
    await giveScore(c.second, bob!.id, 20, 20)
    // '@Bob' sorts before 'Ann': symbols come before letters in the name order.
    // Same term, another department: not this admin's to export.
    await courseWithGrades({ departmentId: other.id, termId: term.id, code: 'XX 999', students: [{ name: 'Elsewhere', section: 'A' }] })
    const admin = await createUser(db(), { isAdmin: true, departmentId: department.id })

    const posted = await exportsAction(args(formRequest('/admin/exports', { termId: String(term.id) }, { Cookie: await cookieFor(admin.id) })))
    expect((posted as Response).status).toBe(302)
    const [made] = await db().select().from(gradeExports).where(eq(gradeExports.requestedBy, admin.id))
    expect((posted as Response).headers.get('Location')).toBe(`/admin/exports?requested=${made!.id}`)
    expect(made!.fileName).toMatch(/^grades-fall-2026-\d{4}-\d{2}-\d{2}\.csv$/)

    const row = await waitForExport(made!.id)
    expect(row).toMatchObject({ status: 'done', rows: 6, error: null })
    const rows = parse(row.csv!, { bom: true }) as string[][]
    const who = (u: { name: string; email: string }, section: string) => ['TH 301', 'Engineering Thermodynamics', u.name, u.email, section]
    expect(rows).toEqual([
      [...TERM_EXPORT_HEADER],
      [...who({ ...bob!, name: "'@Bob" }, 'A'), 'assignment', 'Otto cycle, part 1', '2026-11-01 00:59', 'America/Chicago', '5', '10', '50', 'yes', '0'],
      [...who({ ...bob!, name: "'@Bob" }, 'A'), 'assignment', 'Otto cycle, part 2', '2026-11-20 17:59', 'America/Chicago', '20', '20', '100', '', '0'],
      [...who({ ...bob!, name: "'@Bob" }, 'A'), 'course total', '', '', 'America/Chicago', '25', '30', '83.3', 'yes', '0'],
      [...who(ann!, ''), 'assignment', 'Otto cycle, part 1', '2026-11-01 00:59', 'America/Chicago', '0', '10', '0', '', '0'],
      [...who(ann!, ''), 'assignment', 'Otto cycle, part 2', '2026-11-20 17:59', 'America/Chicago', '0', '20', '0', '', '0'],
      [...who(ann!, ''), 'course total', '', '', 'America/Chicago', '0', '30', '0', '', '0'],
    ])

    // The page lists it as done with a link; the download is the stored file.
    const page = await exportsLoader(args(getRequest('/admin/exports', { Cookie: await cookieFor(admin.id) })))
    expect(page.exports).toEqual([expect.objectContaining({ id: made!.id, status: 'done', rows: 6, termName: 'Fall 2026' })])
    const anotherAdmin = await createUser(db(), { isAdmin: true })
    const download = (await downloadLoader(args(getRequest(`/admin/exports/${made!.id}`, { Cookie: await cookieFor(anotherAdmin.id) }), { exportId: String(made!.id) }))) as Response
    expect(download.headers.get('Content-Type')).toBe('text/csv; charset=utf-8')
    expect(download.headers.get('Content-Disposition')).toBe(`attachment; filename="${made!.fileName}"`)
    expect(Buffer.from(await download.arrayBuffer()).equals(Buffer.from(row.csv!, 'utf8'))).toBe(true)

    // Running the job again leaves a done export as it is.
    expect(await buildTermExport(db(), made!.id)).toBe('already-done')
  })

  test('an admin without a department exports every course of the term', async () => {
    const department = await createDepartment(db())
    const other = await createDepartment(db())
    const term = await createTerm(db(), department.id, { name: 'Spring 2027' })
    await courseWithGrades({ departmentId: department.id, termId: term.id, code: 'AA 100', students: [{ name: 'One', section: 'A' }] })
    await courseWithGrades({ departmentId: other.id, termId: term.id, code: 'BB 200', students: [{ name: 'Two', section: 'B' }] })
    const admin = await createUser(db(), { isAdmin: true, departmentId: null })
    const { exportId, created } = await requestTermExport(db(), { adminUser: admin, termId: term.id })
    expect(created).toBe(true)
    const row = await waitForExport(exportId)
    expect(row.status).toBe('done')
    const rows = parse(row.csv!, { bom: true }) as string[][]
    expect(rows.slice(1).map((r) => [r[0], r[2], r[5]])).toEqual([
      ['AA 100', 'One', 'assignment'],
      ['AA 100', 'One', 'assignment'],
      ['AA 100', 'One', 'course total'],
      ['BB 200', 'Two', 'assignment'],
      ['BB 200', 'Two', 'assignment'],
      ['BB 200', 'Two', 'course total'],
    ])
  })

  test('asking again while the same term’s export is unfinished gives that export, not a second one', async () => {
    const department = await createDepartment(db())
    const term = await createTerm(db(), department.id)
    const admin = await createUser(db(), { isAdmin: true, departmentId: department.id })
    // Inserted without a job, so it stays 'running' while we ask.
    const [open] = await db().insert(gradeExports).values({ requestedBy: admin.id, termId: term.id, status: 'running', fileName: 'grades-x.csv' }).returning()
    expect(await requestTermExport(db(), { adminUser: admin, termId: term.id })).toEqual({ exportId: open!.id, created: false })
    expect(await db().select().from(gradeExports).where(eq(gradeExports.requestedBy, admin.id))).toHaveLength(1)
    await db().update(gradeExports).set({ status: 'failed' }).where(eq(gradeExports.id, open!.id))
    const fresh = await requestTermExport(db(), { adminUser: admin, termId: term.id })
    expect(fresh.created).toBe(true)
    expect(fresh.exportId).not.toBe(open!.id)
    expect((await waitForExport(fresh.exportId)).status).toBe('done')
  })

  test('an admin cannot export another department’s term, a non-admin cannot use the page, an unfinished export cannot be downloaded', async () => {
    const mine = await createDepartment(db())
    const theirs = await createDepartment(db())
    const theirTerm = await createTerm(db(), theirs.id)
    const admin = await createUser(db(), { isAdmin: true, departmentId: mine.id })
    const cookie = await cookieFor(admin.id)

    const refused = (await exportsAction(args(formRequest('/admin/exports', { termId: String(theirTerm.id) }, { Cookie: cookie })))) as unknown as {
      data: { fieldErrors: { termId?: string }; values: { termId: string } }
      init: { status: number }
    }
    expect(refused.init.status).toBe(400)
    expect(refused.data.fieldErrors.termId).toBe('Choose one of the terms listed.')
    expect(refused.data.values.termId).toBe(String(theirTerm.id))
    const junk = (await exportsAction(args(formRequest('/admin/exports', { termId: 'fall' }, { Cookie: cookie })))) as unknown as { data: { fieldErrors: { termId?: string } }; init: { status: number } }
    expect(junk.init.status).toBe(400)
    expect(junk.data.fieldErrors.termId).toBe('Choose a term.')
    expect(await db().select().from(gradeExports).where(eq(gradeExports.requestedBy, admin.id))).toEqual([])
    expect((await exportsLoader(args(getRequest('/admin/exports', { Cookie: cookie })))).terms.map((t) => t.id)).not.toContain(theirTerm.id)

    const teacher = await createUser(db())
    expect(thrownStatus(await settle(exportsLoader(args(getRequest('/admin/exports', { Cookie: await cookieFor(teacher.id) })))))).toBe(403)
    expect(thrownStatus(await settle(exportsAction(args(formRequest('/admin/exports', { termId: String(theirTerm.id) }, { Cookie: await cookieFor(teacher.id) })))))).toBe(403)

    // Not yet built (inserted without a job): not downloadable; nor is a number that does not exist.
    const [queued] = await db().insert(gradeExports).values({ requestedBy: admin.id, termId: theirTerm.id, fileName: 'grades-x.csv' }).returning()
    expect(thrownStatus(await settle(downloadLoader(args(getRequest(`/admin/exports/${queued!.id}`, { Cookie: cookie }), { exportId: String(queued!.id) }))))).toBe(404)
    expect(thrownStatus(await settle(downloadLoader(args(getRequest('/admin/exports/999999', { Cookie: cookie }), { exportId: '999999' }))))).toBe(404)
    expect(
      thrownStatus(await settle(downloadLoader(args(getRequest(`/admin/exports/${queued!.id}`, { Cookie: await cookieFor(teacher.id) }), { exportId: String(queued!.id) })))),
    ).toBe(403)
  })

  test('an export whose admin lost the role fails with the reason and is not retried', async () => {
    const department = await createDepartment(db())
    const term = await createTerm(db(), department.id)
    const former = await createUser(db(), { isAdmin: false, departmentId: department.id })
    const [row] = await db().insert(gradeExports).values({ requestedBy: former.id, termId: term.id, fileName: 'grades-x.csv' }).returning()
    await expect(buildTermExport(db(), row!.id)).rejects.toThrow('no longer a department admin')
    const [after] = await db().select().from(gradeExports).where(eq(gradeExports.id, row!.id))
    expect(after).toMatchObject({ status: 'failed', error: 'The person who asked for this export is no longer a department admin.', csv: null })
  })

  test('an e-mail queued with enqueue(send-mail) is delivered by the worker to the outbox', async () => {
    const to = `grades-${Date.now()}@test.example`
    await enqueue('send-mail', { v: 1, to, subject: 'Your grades for TH 201 are released', text: 'Sign in to see them.', html: '<p>Sign in to see them.</p>' })
    const until = Date.now() + 20_000
    let mail = await findLastMailTo(db(), to)
    while (!mail && Date.now() < until) {
      await new Promise((r) => setTimeout(r, 200))
      mail = await findLastMailTo(db(), to)
    }
    expect(mail).toMatchObject({ subject: 'Your grades for TH 201 are released' })
    expect(mail!.text).toContain('Sign in to see them.')
    expect(workerErrors.filter((l) => l.includes('send-mail'))).toEqual([])
  })
})
