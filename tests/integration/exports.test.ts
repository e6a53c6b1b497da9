/**
 * Grade exports against PostgreSQL: the course CSV and XLSX through their routes (the same
 * figures as the gradebook page, order, dropped students, assignments not yet due, formula
 * neutralising, who may have them), the term export built by a real pg-boss worker into two
 * files, and a queued e-mail delivered by the worker to the local fake SMTP server's outbox.
 */
import { createElement } from 'react'
import { QueryClient, QueryClientProvider } from '@tanstack/react-query'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { parse } from 'csv-parse/sync'
import { and, eq } from 'drizzle-orm'
import ExcelJS from 'exceljs'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { action as exportsAction, loader as exportsLoader } from '#app/routes/admin/exports.tsx'
import CourseGradebookRoute, { loader as gradebookPageLoader } from '#app/routes/courses/gradebook.tsx'
import { loader as courseCsvLoader } from '#app/routes/resources/course-gradebook-csv.ts'
import { loader as courseXlsxLoader } from '#app/routes/resources/course-gradebook-xlsx.ts'
import { loader as downloadLoader } from '#app/routes/resources/grade-export-download.ts'
import { db } from '#app/server/db/client.server.ts'
import {
  assignmentItems,
  gradeExports,
  memberships,
  partResults,
  submissions,
  users,
} from '#app/server/db/schema.server.ts'
import { releaseGrades } from '#app/server/releases.server.ts'
import {
  buildTermExport,
  readStoredExport,
  requestTermExport,
  TERM_ASSIGNMENTS_HEADER,
  TERM_TOTALS_HEADER,
  XLSX_CONTENT_TYPE,
} from '#app/server/exports.server.ts'
import { findLastMailTo } from '#app/server/outbox.server.ts'
import { enqueue, stopBoss } from '#app/server/queue.server.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
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
import { sessionCookie } from '#tests/support/login.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition

function thrownStatus(r: { thrown: unknown } | { value: unknown }): number | undefined {
  if (!('thrown' in r)) return undefined
  const t = r.thrown as { status?: number; init?: { status?: number } }
  return t.init?.status ?? t.status
}

/** One graded answer worth `score` of `maxScore` points to the first find of an item. */
async function giveScore(
  a: { assignmentId: number; itemId: number },
  userId: number,
  score: number,
  maxScore: number,
  daysLate = 0,
) {
  const [s] = await db()
    .insert(submissions)
    .values({
      assignmentId: a.assignmentId,
      itemId: a.itemId,
      userId,
      answers: { x: '1' },
      status: 'graded',
      daysLate,
      gradedAt: new Date(),
    })
    .returning({ id: submissions.id })
  await db()
    .insert(partResults)
    .values({
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

type StudentSpec = {
  name: string
  section: string | null
  familyName?: string
  givenName?: string
  studentNumber?: string
  dropped?: boolean
}

/**
 * A course with two assignments (worth 10 and 20, the later-made one due first, both past their
 * due date), an instructor, a TA and the given students; with `notYetDue`, a third assignment
 * worth 4 that is open and due in a week.
 */
async function courseWithGrades(options: {
  departmentId?: number
  termId?: number
  code?: string
  students: StudentSpec[]
  notYetDue?: boolean
}) {
  const course = await createCourse(db(), {
    departmentId: options.departmentId,
    termId: options.termId,
    code: options.code ?? 'TH 201',
    title: 'Engineering Thermodynamics',
    timeZone: 'America/Chicago',
  })
  const instructor = await createUser(db(), { name: 'Ivy Instructor' })
  const ta = await createUser(db(), { name: 'Tariq Assistant' })
  await addMember(db(), instructor.id, course.id, 'instructor')
  await addMember(db(), ta.id, course.id, 'ta')
  const students = []
  for (const s of options.students) {
    const user = await createUser(db(), { name: s.name })
    await addMember(db(), user.id, course.id, 'student', s.section)
    if (s.familyName !== undefined || s.givenName !== undefined || s.studentNumber !== undefined) {
      await db()
        .update(users)
        .set({
          familyName: s.familyName ?? null,
          givenName: s.givenName ?? null,
          studentNumber: s.studentNumber ?? null,
        })
        .where(eq(users.id, user.id))
    }
    if (s.dropped)
      await db()
        .update(memberships)
        .set({ droppedAt: new Date('2026-11-10T12:00:00Z') })
        .where(and(eq(memberships.userId, user.id), eq(memberships.courseId, course.id)))
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
  const open = options.notYetDue
    ? await createAssignment(db(), course.id, instructor.id, [{ ...problem, points: 4 }], {
        title: 'Week 5 — Rankine, not due yet',
        opensAt: new Date(Date.now() - 24 * 3600_000),
        dueAt: new Date(Date.now() + 7 * 24 * 3600_000),
      })
    : null
  return {
    course,
    instructor,
    ta,
    students,
    first: { assignmentId: earlier.assignment.id, itemId: earlier.items[0]!.id },
    second: { assignmentId: later.assignment.id, itemId: later.items[0]!.id },
    third: open ? { assignmentId: open.assignment.id, itemId: open.items[0]!.id } : null,
  }
}

async function courseCsv(courseId: number, userId: number) {
  return settle(
    courseCsvLoader(
      args(getRequest(`/courses/${courseId}/gradebook.csv`, { Cookie: await sessionCookie({ id: userId }) }), {
        courseId: String(courseId),
      }),
    ),
  )
}

async function courseXlsx(courseId: number, userId: number) {
  return settle(
    courseXlsxLoader(
      args(getRequest(`/courses/${courseId}/gradebook.xlsx`, { Cookie: await sessionCookie({ id: userId }) }), {
        courseId: String(courseId),
      }),
    ),
  )
}

/** The rows of the workbook's Grades sheet as plain values, and the sheet itself. */
async function readXlsx(response: Response) {
  const workbook = new ExcelJS.Workbook()
  await workbook.xlsx.load(await response.arrayBuffer())
  const sheet = workbook.getWorksheet('Grades')!
  const rows: unknown[][] = []
  sheet.eachRow({ includeEmpty: false }, (row) => {
    const values: unknown[] = []
    for (let i = 1; i <= sheet.columnCount; i++) values.push(row.getCell(i).value ?? '')
    rows.push(values)
  })
  return { workbook, sheet, rows }
}

describe('course gradebook CSV and XLSX', () => {
  test('a header, a row per current student by family then given name, a column per assignment by due date with its points, totals of what is due', async () => {
    const c = await courseWithGrades({
      notYetDue: true,
      students: [
        { name: 'Ada Zeller', familyName: 'Zeller', givenName: 'Ada', studentNumber: 'S-0004', section: 'B' },
        { name: 'Zoë Adams', familyName: 'Adams', givenName: 'Zoë', studentNumber: 'S-0002', section: 'A' },
        { name: 'Ben Adams', familyName: 'Adams', givenName: 'Ben', studentNumber: 'S-0001', section: 'A' },
        // No family name on record: sorted and exported by the display name.
        { name: 'Mononym Kai', section: null },
        {
          name: 'Dan Dropped',
          familyName: 'Aaron',
          givenName: 'Dan',
          studentNumber: 'S-0009',
          section: 'A',
          dropped: true,
        },
      ],
    })
    const [zeller, zoe, ben, kai, dan] = c.students
    await giveScore(c.first, zoe!.id, 7.5, 10)
    await giveScore(c.first, zoe!.id, 9.25, 10) // a better second answer: the best counts
    await giveScore(c.second, zoe!.id, 15, 20)
    await giveScore(c.second, zeller!.id, 20 / 7, 20) // 2.857142…: shown and exported as 2.86
    await giveScore(c.third!, zeller!.id, 4, 4) // not due yet: not in the total
    await giveScore(c.first, dan!.id, 10, 10) // dropped: in no total and no file
    // An answer still waiting for the grader: no score yet, counted as being graded.
    const [waiting] = await db()
      .insert(submissions)
      .values({ assignmentId: c.first.assignmentId, itemId: c.first.itemId, userId: kai!.id, answers: { x: '1' } })
      .returning({ id: submissions.id })
    await db()
      .insert(partResults)
      .values({
        submissionId: waiting!.id,
        ...c.first,
        userId: kai!.id,
        findName: otto.finds[0]!.name,
        answer: '1',
        attempt: 1,
        maxScore: 10,
      })

    const r = await courseCsv(c.course.id, c.instructor.id)
    expect('value' in r).toBe(true)
    const response = (r as { value: Response }).value
    expect(response.status).toBe(200)
    expect(response.headers.get('Content-Type')).toBe('text/csv; charset=utf-8')
    expect(response.headers.get('Cache-Control')).toBe('no-store')
    expect(response.headers.get('Content-Disposition')).toMatch(
      /^attachment; filename="th-201-grades-\d{4}-\d{2}-\d{2}\.csv"$/,
    )
    expect(response.body).toBeInstanceOf(ReadableStream)
    const bytes = new Uint8Array(await response.arrayBuffer())
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]) // the UTF-8 byte order mark
    const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes)
    const rows = parse(text, { bom: true }) as string[][]
    const header = rows[0]!
    expect(header.slice(0, 7)).toEqual([
      'Student ID',
      'Family name',
      'Given name',
      'E-mail',
      'Section',
      'Otto cycle, part 1 (10)',
      'Otto cycle, part 2 (20)',
    ])
    expect(header[7]).toMatch(
      /^Week 5 — Rankine, not due yet \(4\) — not counted, due \d{4}-\d{2}-\d{2} \d{2}:\d{2} America\/Chicago$/,
    )
    expect(header.slice(8)).toEqual(['Total (30)', 'Answers being graded'])
    expect(rows.slice(1)).toEqual([
      ['S-0001', 'Adams', 'Ben', ben!.email, 'A', '0', '0', '', '0', '0'],
      ['S-0002', 'Adams', 'Zoë', zoe!.email, 'A', '9.25', '15', '', '24.25', '0'],
      ['', 'Mononym Kai', '', kai!.email, '', '0', '0', '', '0', '1'],
      ['S-0004', 'Zeller', 'Ada', zeller!.email, 'B', '0', '2.86', '', '2.86', '0'],
    ])
    expect(text).not.toContain(dan!.email)

    // The page shows the same figures, says which assignments count, and lists the dropped student apart.
    const page = await gradebookPageLoader(
      args(getRequest(`/courses/${c.course.id}/gradebook`, { Cookie: await sessionCookie(c.instructor) }), {
        courseId: String(c.course.id),
      }),
    )
    const g = page.gradebook
    expect(g.rule).toMatch(
      /^Totals count only assignments whose due date has passed, as of .+\. 2 of 3 assignments are past their due date and counted \(30 points\); the others are shown but not counted/,
    )
    expect(g.assignments.map((a) => [a.title, a.counted, a.stage])).toEqual([
      ['Otto cycle, part 1', true, 'due'],
      ['Otto cycle, part 2', true, 'due'],
      ['Week 5 — Rankine, not due yet', false, 'open'],
    ])
    expect(g.points).toBe(30)
    expect(g.students.map((s) => s.userId)).toEqual([ben!.id, zoe!.id, kai!.id, zeller!.id])
    expect(g.dropped.map((d) => [d.userId, d.familyName, d.givenName])).toEqual([[dan!.id, 'Aaron', 'Dan']])
    const screen = g.students.map((s) => [s.total, ...s.assignments.map((a) => (a.counted ? a.score : null))])
    // The screen keeps the exact score; it shows it through formatPoints, which rounds as the file does.
    const csvFigures = rows
      .slice(1)
      .map((row) => [Number(row[8]), ...row.slice(5, 8).map((x) => (x === '' ? null : Number(x)))])
    expect(screen.map((r) => r.map((x) => (x === null ? null : Math.round(x * 100) / 100)))).toEqual(csvFigures)
    // What the page renders: the sentence above the table, each row's figures as the CSV has them,
    // "—" only in the column not counted, and the dropped student apart from the table.
    const url = `/courses/${c.course.id}/gradebook`
    const Stub = createRoutesStub([
      {
        path: '/courses/:courseId/gradebook',
        Component: CourseGradebookRoute as never,
        loader: () => page,
        HydrateFallback: () => null,
      },
    ])
    const html = renderToString(
      createElement(
        QueryClientProvider,
        { client: new QueryClient() },
        createElement(Stub, { initialEntries: [url], hydrationData: { loaderData: { 0: page } } }),
      ),
    ).replaceAll('<!-- -->', '')
    expect(html).toContain('Totals count only assignments whose due date has passed, as of ')
    expect(html).toContain('2 of 3 assignments are past their due date and counted (30 points)')
    const [table, afterTable] = html.split('</table>') as [string, string]
    const trs = table.split('<tr').slice(2) // the header row, then one per student
    expect(trs).toHaveLength(4)
    rows.slice(1).forEach((csvRow, i) => {
      const cells = [...trs[i]!.matchAll(/<td[^>]*>(.*?)<\/td>/g)].map((m) =>
        m[1]!.replace(/<[^>]+>/g, '').replace(/grading…$/, ''),
      )
      expect(trs[i]).toContain(csvRow[3]!) // the same student, in the same place
      // Section, three assignments, the total, the status.
      expect(cells.slice(1, 5)).toEqual([csvRow[5], csvRow[6], '—not counted', csvRow[8]])
    })
    expect(afterTable).toContain('Dropped students (1)')
    expect(afterTable).toContain(dan!.email)
    expect(table).not.toContain(dan!.email)

    // The not-yet-due score is kept (the assignment gradebook shows it) but not in the total.
    expect(g.students.find((s) => s.userId === zeller!.id)!.assignments[2]).toMatchObject({ score: 4, counted: false })

    // The XLSX: the same columns and figures, numbers as numbers, the header row frozen.
    const x = await courseXlsx(c.course.id, c.instructor.id)
    const xr = (x as { value: Response }).value
    expect(xr.headers.get('Content-Type')).toBe(XLSX_CONTENT_TYPE)
    expect(xr.headers.get('Cache-Control')).toBe('no-store')
    expect(xr.headers.get('Content-Disposition')).toMatch(
      /^attachment; filename="th-201-grades-\d{4}-\d{2}-\d{2}\.xlsx"$/,
    )
    const book = await readXlsx(xr)
    expect(book.sheet.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 })
    expect(book.rows[0]).toEqual(header)
    expect(book.rows.slice(1)).toEqual([
      ['S-0001', 'Adams', 'Ben', ben!.email, 'A', 0, 0, '', 0, 0],
      ['S-0002', 'Adams', 'Zoë', zoe!.email, 'A', 9.25, 15, '', 24.25, 0],
      ['', 'Mononym Kai', '', kai!.email, '', 0, 0, '', 0, 1],
      ['S-0004', 'Zeller', 'Ada', zeller!.email, 'B', 0, 2.86, '', 2.86, 0],
    ])
    // The rule in words on its own sheet (made a moment later than the page, so compared without the time).
    const withoutTime = (t: string) => t.replace(/as of [^()]+\([^)]+\)\. /, 'as of … ')
    const notes = String(book.workbook.getWorksheet('Notes')!.getCell('A1').value)
    expect(withoutTime(notes)).toBe(withoutTime(g.rule))
    expect(withoutTime(notes)).toContain('as of … 2 of 3 assignments')
  })

  test('names that start like a formula come out as text with a leading quote', async () => {
    const names = [
      '=HYPERLINK("http://evil.example","click")',
      '+1',
      '-2',
      '\u2212 3',
      '@SUM(A1:A9)',
      '\tx',
      '\rx',
      'Plain Name',
    ]
    const c = await courseWithGrades({ students: names.map((name) => ({ name, section: '=1+1' })) })
    const r = await courseCsv(c.course.id, c.ta.id)
    const rows = parse(await (r as { value: Response }).value.text(), { bom: true }) as string[][]
    const byName = rows.slice(1).map((row) => [row[1], row[4]])
    const expected = names.map((n) => [n === 'Plain Name' ? n : `'${n}`, "'=1+1"])
    expect(byName.sort()).toEqual(expected.sort())
    for (const row of rows) for (const cell of row) expect(cell).not.toMatch(/^[=+\-\u2212@\t\r]/)

    // The XLSX neutralises the same cells, and holds no formula at all.
    const book = await readXlsx(((await courseXlsx(c.course.id, c.ta.id)) as { value: Response }).value)
    // XML reads a carriage return back as a line feed, so '\rx' returns as '\nx' (still behind its quote).
    const asXml = (t: string) => t.replace(/\r/g, '\n')
    expect(
      book.rows
        .slice(1)
        .map((row) => [row[1], row[4]])
        .sort(),
    ).toEqual(expected.map((pair) => pair.map(asXml)).sort())
    book.sheet.eachRow((row) =>
      row.eachCell((cell) => {
        expect(cell.type).not.toBe(ExcelJS.ValueType.Formula)
        if (typeof cell.value === 'string') expect(cell.value).not.toMatch(/^[=+\-\u2212@\t\r]/)
      }),
    )
  })

  test('only the course’s staff get it: a student and an outsider are refused', async () => {
    const c = await courseWithGrades({ students: [{ name: 'Sam Student', section: 'A' }] })
    const outsider = await createUser(db())
    expect(thrownStatus(await courseCsv(c.course.id, c.students[0]!.id))).toBe(403)
    expect(thrownStatus(await courseCsv(c.course.id, outsider.id))).toBe(403)
    const signedOut = await settle(
      courseCsvLoader(args(getRequest(`/courses/${c.course.id}/gradebook.csv`), { courseId: String(c.course.id) })),
    )
    expect(thrownStatus(signedOut)).toBe(302)
    expect('value' in (await courseCsv(c.course.id, c.ta.id))).toBe(true)
    expect(thrownStatus(await courseXlsx(c.course.id, c.students[0]!.id))).toBe(403)
    expect(thrownStatus(await courseXlsx(c.course.id, outsider.id))).toBe(403)
    expect('value' in (await courseXlsx(c.course.id, c.ta.id))).toBe(true)
  })
})

describe('through the worker', () => {
  let worker: RunningWorker
  const workerErrors: string[] = []

  beforeAll(async () => {
    worker = await startWorker({
      databaseUrl: process.env.DATABASE_URL,
      log: () => {},
      logError: (line) => workerErrors.push(line),
    })
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
      if (Date.now() > until)
        throw new Error(`export ${exportId} did not finish: ${JSON.stringify(row)} ${workerErrors.join(' | ')}`)
      await new Promise((r) => setTimeout(r, 200))
    }
  }

  test('a department admin’s term export ends done with two files: a row per (course, student, assignment), and the course totals apart', async () => {
    const department = await createDepartment(db())
    const other = await createDepartment(db())
    const term = await createTerm(db(), department.id, { name: 'Fall 2026' })
    const c = await courseWithGrades({
      departmentId: department.id,
      termId: term.id,
      code: 'TH 301',
      notYetDue: true,
      students: [
        { name: '@Bob', section: 'A' },
        { name: 'Ann', section: null },
        { name: 'Gone Student', section: 'A', dropped: true },
      ],
    })
    const [bob, ann, gone] = c.students
    await giveScore(c.first, bob!.id, 5, 10, 2)
    await giveScore(c.second, bob!.id, 20, 20)
    await giveScore(c.third!, bob!.id, 4, 4) // not due yet: listed, not counted
    await giveScore(c.first, gone!.id, 10, 10)
    // '@Bob' sorts before 'Ann': symbols come before letters in the name order.
    // Same term, another department: not this admin's to export.
    await courseWithGrades({
      departmentId: other.id,
      termId: term.id,
      code: 'XX 999',
      students: [{ name: 'Elsewhere', section: 'A' }],
    })
    const admin = await createUser(db(), { isAdmin: true, departmentId: department.id })

    const posted = await exportsAction(
      args(formRequest('/admin/exports', { termId: String(term.id) }, { Cookie: await sessionCookie(admin) })),
    )
    expect((posted as Response).status).toBe(302)
    const [made] = await db().select().from(gradeExports).where(eq(gradeExports.requestedBy, admin.id))
    expect((posted as Response).headers.get('Location')).toBe(`/admin/exports?requested=${made!.id}`)
    expect(made!.fileName).toMatch(/^grades-fall-2026-\d{4}-\d{2}-\d{2}$/)

    const row = await waitForExport(made!.id)
    // 2 students × 3 assignments, and 2 course totals; the dropped student is in neither file.
    expect(row).toMatchObject({ status: 'done', rows: 8, error: null })

    const admins = { Cookie: await sessionCookie(await createUser(db(), { isAdmin: true })) }
    const download = async (query: string) =>
      settle(
        downloadLoader(args(getRequest(`/admin/exports/${made!.id}${query}`, admins), { exportId: String(made!.id) })),
      )
    const file = async (query: string) => {
      const r = await download(query)
      expect('value' in r).toBe(true)
      const response = (r as { value: Response }).value
      expect(response.headers.get('Content-Type')).toBe('text/csv; charset=utf-8')
      expect(response.headers.get('Cache-Control')).toBe('no-store')
      return { response, rows: parse(await response.text(), { bom: true }) as string[][] }
    }

    const who = (u: { name: string; email: string }, section: string) => [
      'TH 301',
      'Engineering Thermodynamics',
      '',
      u.name,
      '',
      u.email,
      section,
    ]
    const quotedBob = { ...bob!, name: "'@Bob" }
    const assignmentsFile = await file('?file=assignments')
    expect(assignmentsFile.response.headers.get('Content-Disposition')).toBe(
      `attachment; filename="${made!.fileName}-assignments.csv"`,
    )
    const dueOpen = assignmentsFile.rows[3]![8]!
    expect(dueOpen).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}$/)
    expect(assignmentsFile.rows).toEqual([
      [...TERM_ASSIGNMENTS_HEADER],
      [
        ...who(quotedBob, 'A'),
        'Otto cycle, part 1',
        '2026-11-01 00:59',
        'America/Chicago',
        'yes',
        '5',
        '10',
        'yes',
        '0',
      ],
      [...who(quotedBob, 'A'), 'Otto cycle, part 2', '2026-11-20 17:59', 'America/Chicago', 'yes', '20', '20', '', '0'],
      [...who(quotedBob, 'A'), 'Week 5 — Rankine, not due yet', dueOpen, 'America/Chicago', '', '', '4', '', '0'],
      [...who(ann!, ''), 'Otto cycle, part 1', '2026-11-01 00:59', 'America/Chicago', 'yes', '0', '10', '', '0'],
      [...who(ann!, ''), 'Otto cycle, part 2', '2026-11-20 17:59', 'America/Chicago', 'yes', '0', '20', '', '0'],
      [...who(ann!, ''), 'Week 5 — Rankine, not due yet', dueOpen, 'America/Chicago', '', '', '4', '', '0'],
    ])
    // Without ?file: the assignment rows.
    expect((await file('')).rows).toEqual(assignmentsFile.rows)

    const totalsFile = await file('?file=course-totals')
    expect(totalsFile.response.headers.get('Content-Disposition')).toBe(
      `attachment; filename="${made!.fileName}-course-totals.csv"`,
    )
    const asOf = totalsFile.rows[1]![11]!
    expect(asOf).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}$/)
    expect(totalsFile.rows).toEqual([
      [...TERM_TOTALS_HEADER],
      [...who(quotedBob, 'A'), '25', '30', '2', '3', asOf, 'America/Chicago', 'yes', '0'],
      [...who(ann!, ''), '0', '30', '2', '3', asOf, 'America/Chicago', '', '0'],
    ])
    for (const f of [assignmentsFile, totalsFile]) expect(f.rows.flat()).not.toContain(gone!.email)

    // An unknown file is a 404 with the two names, not a server error.
    expect(thrownStatus(await download('?file=everything'))).toBe(404)

    // The page lists it as done with a link to each file.
    const page = await exportsLoader(args(getRequest('/admin/exports', { Cookie: await sessionCookie(admin) })))
    expect(page.exports).toEqual([
      expect.objectContaining({ id: made!.id, status: 'done', rows: 8, termName: 'Fall 2026' }),
    ])
    expect(page.exports[0]!.files.map((f) => [f.name, f.href])).toEqual([
      [`${made!.fileName}-course-totals.csv`, `/admin/exports/${made!.id}?file=course-totals`],
      [`${made!.fileName}-assignments.csv`, `/admin/exports/${made!.id}?file=assignments`],
    ])

    // Running the job again leaves a done export as it is.
    expect(await buildTermExport(db(), made!.id)).toBe('already-done')
  })

  test('an export made before the split into two files is still downloaded as its one CSV', async () => {
    const department = await createDepartment(db())
    const term = await createTerm(db(), department.id)
    const admin = await createUser(db(), { isAdmin: true, departmentId: department.id })
    const csv = '\uFEFF"Course code","Row"\r\n"TH 1","course total"\r\n'
    const [old] = await db()
      .insert(gradeExports)
      .values({
        requestedBy: admin.id,
        termId: term.id,
        status: 'done',
        rows: 1,
        fileName: 'grades-old-2026-11-01.csv',
        csv,
      })
      .returning()
    const cookie = { Cookie: await sessionCookie(admin) }
    const r = (await downloadLoader(
      args(getRequest(`/admin/exports/${old!.id}`, cookie), { exportId: String(old!.id) }),
    )) as Response
    expect(r.headers.get('Content-Disposition')).toBe('attachment; filename="grades-old-2026-11-01.csv"')
    expect(Buffer.from(await r.arrayBuffer()).equals(Buffer.from(csv, 'utf8'))).toBe(true)
    expect(
      thrownStatus(
        await settle(
          downloadLoader(
            args(getRequest(`/admin/exports/${old!.id}?file=course-totals`, cookie), { exportId: String(old!.id) }),
          ),
        ),
      ),
    ).toBe(404)
    const page = await exportsLoader(args(getRequest('/admin/exports', cookie)))
    expect(page.exports[0]!.files.map((f) => f.href)).toEqual([`/admin/exports/${old!.id}`])
  })

  test('an admin without a department exports every course of the term', async () => {
    const department = await createDepartment(db())
    const other = await createDepartment(db())
    const term = await createTerm(db(), department.id, { name: 'Spring 2027' })
    await courseWithGrades({
      departmentId: department.id,
      termId: term.id,
      code: 'AA 100',
      students: [{ name: 'One', section: 'A' }],
    })
    await courseWithGrades({
      departmentId: other.id,
      termId: term.id,
      code: 'BB 200',
      students: [{ name: 'Two', section: 'B' }],
    })
    const admin = await createUser(db(), { isAdmin: true, departmentId: null })
    const { exportId, created } = await requestTermExport(db(), { adminUser: admin, termId: term.id })
    expect(created).toBe(true)
    const row = await waitForExport(exportId)
    expect(row.status).toBe('done')
    const files = readStoredExport(row.csv!) as { files: Record<'assignments' | 'course-totals', string> }
    const assignmentRows = parse(files.files.assignments, { bom: true }) as string[][]
    const totalRows = parse(files.files['course-totals'], { bom: true }) as string[][]
    expect(assignmentRows.slice(1).map((r) => [r[0], r[3], r[7]])).toEqual([
      ['AA 100', 'One', 'Otto cycle, part 1'],
      ['AA 100', 'One', 'Otto cycle, part 2'],
      ['BB 200', 'Two', 'Otto cycle, part 1'],
      ['BB 200', 'Two', 'Otto cycle, part 2'],
    ])
    expect(totalRows.slice(1).map((r) => [r[0], r[3]])).toEqual([
      ['AA 100', 'One'],
      ['BB 200', 'Two'],
    ])
  })

  test('asking again while the same term’s export is unfinished gives that export, not a second one', async () => {
    const department = await createDepartment(db())
    const term = await createTerm(db(), department.id)
    const admin = await createUser(db(), { isAdmin: true, departmentId: department.id })
    // Inserted without a job, so it stays 'running' while we ask.
    const [open] = await db()
      .insert(gradeExports)
      .values({ requestedBy: admin.id, termId: term.id, status: 'running', fileName: 'grades-x.csv' })
      .returning()
    expect(await requestTermExport(db(), { adminUser: admin, termId: term.id })).toEqual({
      exportId: open!.id,
      created: false,
    })
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
    const cookie = await sessionCookie(admin)

    const refused = (await exportsAction(
      args(formRequest('/admin/exports', { termId: String(theirTerm.id) }, { Cookie: cookie })),
    )) as unknown as {
      data: { fieldErrors: { termId?: string }; values: { termId: string } }
      init: { status: number }
    }
    expect(refused.init.status).toBe(400)
    expect(refused.data.fieldErrors.termId).toBe('Choose one of the terms listed.')
    expect(refused.data.values.termId).toBe(String(theirTerm.id))
    const junk = (await exportsAction(
      args(formRequest('/admin/exports', { termId: 'fall' }, { Cookie: cookie })),
    )) as unknown as { data: { fieldErrors: { termId?: string } }; init: { status: number } }
    expect(junk.init.status).toBe(400)
    expect(junk.data.fieldErrors.termId).toBe('Choose a term.')
    expect(await db().select().from(gradeExports).where(eq(gradeExports.requestedBy, admin.id))).toEqual([])
    expect(
      (await exportsLoader(args(getRequest('/admin/exports', { Cookie: cookie })))).terms.map((t) => t.id),
    ).not.toContain(theirTerm.id)

    const teacher = await createUser(db())
    expect(
      thrownStatus(
        await settle(exportsLoader(args(getRequest('/admin/exports', { Cookie: await sessionCookie(teacher) })))),
      ),
    ).toBe(403)
    expect(
      thrownStatus(
        await settle(
          exportsAction(
            args(
              formRequest('/admin/exports', { termId: String(theirTerm.id) }, { Cookie: await sessionCookie(teacher) }),
            ),
          ),
        ),
      ),
    ).toBe(403)

    // Not yet built (inserted without a job): not downloadable; nor is a number that does not exist.
    const [queued] = await db()
      .insert(gradeExports)
      .values({ requestedBy: admin.id, termId: theirTerm.id, fileName: 'grades-x.csv' })
      .returning()
    expect(
      thrownStatus(
        await settle(
          downloadLoader(
            args(getRequest(`/admin/exports/${queued!.id}`, { Cookie: cookie }), { exportId: String(queued!.id) }),
          ),
        ),
      ),
    ).toBe(404)
    expect(
      thrownStatus(
        await settle(
          downloadLoader(args(getRequest('/admin/exports/999999', { Cookie: cookie }), { exportId: '999999' })),
        ),
      ),
    ).toBe(404)
    expect(
      thrownStatus(
        await settle(
          downloadLoader(
            args(getRequest(`/admin/exports/${queued!.id}`, { Cookie: await sessionCookie(teacher) }), {
              exportId: String(queued!.id),
            }),
          ),
        ),
      ),
    ).toBe(403)
  })

  test('an export whose admin lost the role fails with the reason and is not retried', async () => {
    const department = await createDepartment(db())
    const term = await createTerm(db(), department.id)
    const former = await createUser(db(), { isAdmin: false, departmentId: department.id })
    const [row] = await db()
      .insert(gradeExports)
      .values({ requestedBy: former.id, termId: term.id, fileName: 'grades-x.csv' })
      .returning()
    await expect(buildTermExport(db(), row!.id)).rejects.toThrow('no longer a department admin')
    const [after] = await db().select().from(gradeExports).where(eq(gradeExports.id, row!.id))
    expect(after).toMatchObject({
      status: 'failed',
      error: 'The person who asked for this export is no longer a department admin.',
      csv: null,
    })
  })

  test('the grade-release e-mail writes the score as the gradebook and the files do: 2.86 of 4.29, not 2.857143', async () => {
    const c = await courseWithGrades({ students: [{ name: 'Rita Rounding', section: 'A' }] })
    const rita = c.students[0]!
    await db()
      .update(assignmentItems)
      .set({ points: 30 / 7 })
      .where(eq(assignmentItems.id, c.first.itemId))
    await giveScore(c.first, rita.id, 20 / 7, 30 / 7)
    await releaseGrades(db(), {
      courseId: c.course.id,
      assignmentId: c.first.assignmentId,
      actorId: c.instructor.id,
      confirmed: true,
      early: true,
      baseUrl: 'https://cw.test',
    })
    const until = Date.now() + 20_000
    let mail = await findLastMailTo(db(), rita.email)
    while (!mail && Date.now() < until) {
      await new Promise((r) => setTimeout(r, 200))
      mail = await findLastMailTo(db(), rita.email)
    }
    expect(mail!.text).toContain('Your score: 2.86 of 4.29 points.')
    const rows = parse(await ((await courseCsv(c.course.id, c.instructor.id)) as { value: Response }).value.text(), {
      bom: true,
    }) as string[][]
    expect(rows[0]![5]).toBe('Otto cycle, part 1 (4.29)')
    expect(rows[1]![5]).toBe('2.86')
  })

  test('an e-mail queued with enqueue(send-mail) is delivered by the worker to the outbox', async () => {
    const to = `grades-${Date.now()}@test.example`
    await enqueue('send-mail', {
      v: 1,
      to,
      subject: 'Your grades for TH 201 are released',
      text: 'Sign in to see them.',
      html: '<p>Sign in to see them.</p>',
    })
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
