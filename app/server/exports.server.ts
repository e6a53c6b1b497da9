/**
 * Grade exports as CSV, written by csv-stringify (never hand-quoted).
 *
 * Course gradebook (GET /courses/:courseId/gradebook.csv), streamed as rows are produced:
 *   one header row, then a row per student of the course, sorted by name and e-mail:
 *   Student, E-mail, Section, one column per assignment (by due date), Total, Percent,
 *   Answers being graded. An assignment's header names its points, "Rankine 1 [20 pts]", and
 *   Total's header the course's points, so the file keeps a single header row: spreadsheets
 *   sort and filter it without a second row getting in the way. Scores are points to 0.01
 *   with late penalties already taken off; Percent is to 0.1 and empty when nothing is worth
 *   points. "Answers being graded" > 0 means the row may still change.
 *
 * Term export (department admins, built by the 'export-grades' job into grade_exports):
 *   the courses of one term have different assignments, so the file is long, not wide: one
 *   row per (course, student, assignment) and then one 'course total' row per (course,
 *   student). Columns: Course code, Course title, Student, E-mail, Section, Row, Assignment,
 *   Due, Time zone, Score, Max, Percent, Late, Answers being graded. Due is the assignment's
 *   due date as wall-clock time in the course's zone (named in the next column); Late is
 *   "yes" when any counted answer came after the student's due date.
 *
 * Every text cell goes through neutraliseCell (OWASP's CSV injection guidance), names,
 * e-mails, titles and headers alike; numbers are written as numbers (scores are never
 * negative). Both files start with a UTF-8 byte order mark so spreadsheet programs read
 * accented names correctly.
 */
import { Readable, pipeline } from 'node:stream'
import { TZDate } from '@date-fns/tz'
import { stringify, type Options as StringifyOptions } from 'csv-stringify'
import { stringify as stringifySync } from 'csv-stringify/sync'
import { format } from 'date-fns'
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm'
import type { Db, Tx } from './db/client.server.ts'
import { assignmentItems, assignments, courses, departments, gradeExports, memberships, terms, users } from './db/schema.server.ts'
import { listAssignmentTotals } from './grading.server.ts'
import { enqueue, PermanentJobError, withJobTransaction } from './queue.server.ts'

type Database = Db | Tx

/**
 * First characters that make a spreadsheet read a cell as a formula (=, +, -, @, tab,
 * carriage return), the minus sign U+2212 some spreadsheets also accept, and the
 * full-width = + - @ that Apple Numbers normalises to the plain ones.
 */
const FORMULA_START = /^[=+\-\u2212@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/

/** A text cell a spreadsheet will show as text: one starting like a formula gets a leading '. */
export function neutraliseCell(value: string): string {
  return FORMULA_START.test(value) ? `'${value}` : value
}

/** Shared by both exports: every string cell is neutralised, all text is quoted, BOM first. */
export const CSV_OPTIONS: StringifyOptions = {
  bom: true,
  quoted_string: true,
  record_delimiter: 'windows',
  cast: { string: (value) => neutraliseCell(value), boolean: (value) => (value ? 'yes' : '') },
}

const points = (x: number) => Math.round(x * 100) / 100
const percent = (score: number, max: number) => (max > 0 ? Math.round((score / max) * 1000) / 10 : '')

/** Lower-case ASCII words joined by '-', for file names ("Fall 2026" → "fall-2026"). */
export function fileSlug(text: string, fallback = 'export'): string {
  const slug = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '')
  return slug || fallback
}

/** "th-101-grades-2026-12-02.csv", dated in the course's zone. */
export function courseCsvFileName(courseCode: string, timeZone: string, now = new Date()): string {
  return `${fileSlug(courseCode, 'course')}-grades-${format(new TZDate(now.getTime(), timeZone), 'yyyy-MM-dd')}.csv`
}

async function listCourseAssignments(database: Database, courseIds: number[]) {
  if (courseIds.length === 0) return []
  return database
    .select({
      id: assignments.id,
      courseId: assignments.courseId,
      title: assignments.title,
      dueAt: assignments.dueAt,
      maxScore: sql<number>`coalesce(sum(${assignmentItems.points}), 0)::float8`,
    })
    .from(assignments)
    .leftJoin(assignmentItems, eq(assignmentItems.assignmentId, assignments.id))
    .where(inArray(assignments.courseId, courseIds))
    .groupBy(assignments.id)
    .orderBy(asc(assignments.dueAt), asc(assignments.id))
}

// Sorted here rather than in SQL so the order does not depend on the database's collation.
const byName = new Intl.Collator('en', { sensitivity: 'base', numeric: true })

async function listCourseStudents(database: Database, courseId: number) {
  const rows = await database
    .select({ userId: users.id, name: users.name, email: users.email, section: memberships.section })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.courseId, courseId), eq(memberships.role, 'student')))
  return rows.sort((a, b) => byName.compare(a.name, b.name) || byName.compare(a.email, b.email) || a.userId - b.userId)
}

type CourseGrades = {
  assignments: Awaited<ReturnType<typeof listCourseAssignments>>
  students: Awaited<ReturnType<typeof listCourseStudents>>
  /** `${assignmentId}:${userId}` → the student's total on the assignment */
  totals: Map<string, { score: number; pending: number; late: boolean }>
}

async function loadCourseGrades(database: Database, courseId: number): Promise<CourseGrades> {
  const [assignmentRows, students, totalRows] = await Promise.all([
    listCourseAssignments(database, [courseId]),
    listCourseStudents(database, courseId),
    listAssignmentTotals(database, { courseIds: [courseId] }),
  ])
  const totals = new Map(totalRows.map((t) => [`${t.assignmentId}:${t.userId}`, { score: t.score, pending: t.pending, late: t.late }]))
  return { assignments: assignmentRows, students, totals }
}

function* courseRecords(grades: CourseGrades): Generator<(string | number)[]> {
  const coursePoints = grades.assignments.reduce((sum, a) => sum + a.maxScore, 0)
  yield [
    'Student',
    'E-mail',
    'Section',
    ...grades.assignments.map((a) => `${a.title} [${points(a.maxScore)} pts]`),
    `Total [${points(coursePoints)} pts]`,
    'Percent',
    'Answers being graded',
  ]
  for (const s of grades.students) {
    let total = 0
    let pending = 0
    const cells = grades.assignments.map((a) => {
      const t = grades.totals.get(`${a.id}:${s.userId}`)
      total += t?.score ?? 0
      pending += t?.pending ?? 0
      return points(t?.score ?? 0)
    })
    yield [s.name, s.email, s.section ?? '', ...cells, points(total), percent(total, coursePoints), pending]
  }
}

/**
 * The course gradebook as a CSV byte stream (see the header of this file for its columns).
 * The data is read before this resolves, so a database error surfaces before any byte is
 * sent; rows are then stringified one at a time as the client reads them.
 */
export async function courseGradeCsv(database: Database, courseId: number): Promise<ReadableStream<Uint8Array>> {
  const grades = await loadCourseGrades(database, courseId)
  const stringifier = stringify(CSV_OPTIONS)
  pipeline(Readable.from(courseRecords(grades)), stringifier, (error) => {
    // A client that stops reading (closed tab, cancelled download) is not an error worth logging.
    const code = (error as { code?: string } | null)?.code
    if (error && error.name !== 'AbortError' && code !== 'ERR_STREAM_PREMATURE_CLOSE') console.error('Course CSV stream stopped:', error.message)
  })
  return Readable.toWeb(stringifier) as unknown as ReadableStream<Uint8Array>
}

// ---- Term export for department admins ----------------------------------------------------

/** A request the admin can fix (shown next to the form), not a server fault. */
export class ExportRequestError extends Error {
  override name = 'ExportRequestError'
}

async function adminScope(database: Database, userId: number) {
  const [row] = await database.select({ isAdmin: users.isAdmin, departmentId: users.departmentId }).from(users).where(eq(users.id, userId)).limit(1)
  return row ?? null
}

/** The terms an admin may export: their department's, or every term when they have none. */
export async function listExportableTerms(database: Database, adminUserId: number) {
  const scope = await adminScope(database, adminUserId)
  if (!scope?.isAdmin) return []
  return database
    .select({ id: terms.id, name: terms.name, departmentName: departments.name, startsOn: terms.startsOn, endsOn: terms.endsOn })
    .from(terms)
    .innerJoin(departments, eq(departments.id, terms.departmentId))
    .where(scope.departmentId === null ? undefined : eq(terms.departmentId, scope.departmentId))
    .orderBy(desc(terms.startsOn), asc(departments.name), asc(terms.name))
}

/** The latest exports one admin asked for, newest first (no CSV text). */
export async function listExportsForAdmin(database: Database, adminUserId: number, limit = 30) {
  return database
    .select({
      id: gradeExports.id,
      termName: terms.name,
      departmentName: departments.name,
      status: gradeExports.status,
      rows: gradeExports.rows,
      fileName: gradeExports.fileName,
      error: gradeExports.error,
      createdAt: gradeExports.createdAt,
      finishedAt: gradeExports.finishedAt,
    })
    .from(gradeExports)
    .innerJoin(terms, eq(terms.id, gradeExports.termId))
    .innerJoin(departments, eq(departments.id, terms.departmentId))
    .where(eq(gradeExports.requestedBy, adminUserId))
    .orderBy(desc(gradeExports.createdAt), desc(gradeExports.id))
    .limit(limit)
}

/** What /admin/exports shows: the terms to choose from and the admin's own exports. */
export async function adminExportsPage(database: Database, adminUserId: number) {
  const [termOptions, exports] = await Promise.all([listExportableTerms(database, adminUserId), listExportsForAdmin(database, adminUserId)])
  return { terms: termOptions, exports }
}

/**
 * Records an export of one term's grades and queues its job in the same transaction.
 * While the same admin's export of the same term is still waiting or running, that one is
 * returned instead of a second (a double click makes one file).
 * Throws ExportRequestError for a term that does not exist or is outside the admin's department.
 */
export async function requestTermExport(database: Db, input: { adminUser: { id: number }; termId: number; now?: Date }): Promise<{ exportId: number; created: boolean }> {
  const scope = await adminScope(database, input.adminUser.id)
  if (!scope?.isAdmin) throw new ExportRequestError('Only department admins can export a term’s grades.')
  const [term] = await database.select({ id: terms.id, name: terms.name, departmentId: terms.departmentId }).from(terms).where(eq(terms.id, input.termId)).limit(1)
  if (!term || (scope.departmentId !== null && term.departmentId !== scope.departmentId)) throw new ExportRequestError('Choose one of the terms listed.')
  const day = (input.now ?? new Date()).toISOString().slice(0, 10)
  return withJobTransaction(database, async (tx, jobs) => {
    // Serialises two requests of the same admin, so the check below sees the other's row.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('grade-export'), ${input.adminUser.id})`)
    const [open] = await tx
      .select({ id: gradeExports.id })
      .from(gradeExports)
      .where(and(eq(gradeExports.requestedBy, input.adminUser.id), eq(gradeExports.termId, term.id), inArray(gradeExports.status, ['queued', 'running'])))
      .limit(1)
    if (open) return { exportId: open.id, created: false }
    const [row] = await tx
      .insert(gradeExports)
      .values({ requestedBy: input.adminUser.id, termId: term.id, status: 'queued', fileName: `grades-${fileSlug(term.name, 'term')}-${day}.csv` })
      .returning({ id: gradeExports.id })
    await enqueue('export-grades', { v: 1, exportId: row!.id }, { connection: jobs })
    return { exportId: row!.id, created: true }
  })
}

export const TERM_EXPORT_HEADER = [
  'Course code',
  'Course title',
  'Student',
  'E-mail',
  'Section',
  'Row',
  'Assignment',
  'Due',
  'Time zone',
  'Score',
  'Max',
  'Percent',
  'Late',
  'Answers being graded',
] as const

export type BuildOutcome = 'done' | 'already-done' | 'missing'

/**
 * Builds a queued term export (the 'export-grades' job): status running while it works
 * (rows counts up course by course, for the progress shown to the admin), then done with
 * the CSV text and its number of data rows. A done export is left as it is.
 *
 * On failure it records why and rethrows: failed for a PermanentJobError or when
 * `lastAttempt`, else back to queued with the reason, as the job will be retried.
 */
export async function buildTermExport(database: Db, exportId: number, options: { lastAttempt?: boolean } = {}): Promise<BuildOutcome> {
  const [row] = await database
    .select({ status: gradeExports.status, requestedBy: gradeExports.requestedBy, termId: gradeExports.termId })
    .from(gradeExports)
    .where(eq(gradeExports.id, exportId))
    .limit(1)
  if (!row) return 'missing'
  if (row.status === 'done') return 'already-done'
  await database.update(gradeExports).set({ status: 'running', rows: 0, error: null }).where(eq(gradeExports.id, exportId))
  try {
    const scope = await adminScope(database, row.requestedBy)
    if (!scope?.isAdmin) throw new PermanentJobError('The person who asked for this export is no longer a department admin.')
    const courseRows = await database
      .select({ id: courses.id, code: courses.code, title: courses.title, timeZone: courses.timeZone })
      .from(courses)
      .where(and(eq(courses.termId, row.termId), scope.departmentId === null ? undefined : eq(courses.departmentId, scope.departmentId)))
      .orderBy(asc(courses.code), asc(courses.id))

    const records: (string | number | boolean)[][] = [[...TERM_EXPORT_HEADER]]
    for (const course of courseRows) {
      const grades = await loadCourseGrades(database, course.id)
      const coursePoints = grades.assignments.reduce((sum, a) => sum + a.maxScore, 0)
      const who = (s: CourseGrades['students'][number]) => [course.code, course.title, s.name, s.email, s.section ?? '']
      for (const s of grades.students) {
        let total = 0
        let pending = 0
        let late = false
        for (const a of grades.assignments) {
          const t = grades.totals.get(`${a.id}:${s.userId}`) ?? { score: 0, pending: 0, late: false }
          total += t.score
          pending += t.pending
          late ||= t.late
          const due = format(new TZDate(a.dueAt.getTime(), course.timeZone), 'yyyy-MM-dd HH:mm')
          records.push([...who(s), 'assignment', a.title, due, course.timeZone, points(t.score), points(a.maxScore), percent(t.score, a.maxScore), t.late, t.pending])
        }
        records.push([...who(s), 'course total', '', '', course.timeZone, points(total), points(coursePoints), percent(total, coursePoints), late, pending])
      }
      await database.update(gradeExports).set({ rows: records.length - 1 }).where(eq(gradeExports.id, exportId))
    }
    const csv = stringifySync(records, CSV_OPTIONS)
    await database
      .update(gradeExports)
      .set({ status: 'done', csv, rows: records.length - 1, error: null, finishedAt: sql`clock_timestamp()` })
      .where(eq(gradeExports.id, exportId))
    return 'done'
  } catch (e) {
    const reason = e instanceof Error ? e.message : String(e)
    const failed = e instanceof PermanentJobError || options.lastAttempt === true
    await database
      .update(gradeExports)
      .set(
        failed
          ? { status: 'failed', error: e instanceof PermanentJobError ? reason : `The export stopped: ${reason}`, finishedAt: sql`clock_timestamp()` }
          : { status: 'queued', error: `An attempt stopped (${reason}); trying again shortly.` },
      )
      .where(eq(gradeExports.id, exportId))
      .catch((writeError: unknown) => console.error('Could not record the export failure:', writeError))
    throw e
  }
}

/** A finished export's file, for any department admin; null while it is not done. */
export async function getExportDownload(database: Database, exportId: number) {
  const [row] = await database
    .select({ fileName: gradeExports.fileName, csv: gradeExports.csv })
    .from(gradeExports)
    .where(and(eq(gradeExports.id, exportId), eq(gradeExports.status, 'done')))
    .limit(1)
  if (!row || row.csv === null) return null
  return { fileName: row.fileName, csv: row.csv }
}
