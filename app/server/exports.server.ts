/**
 * Grade exports: CSV written by csv-stringify (never hand-quoted) and XLSX written by exceljs.
 *
 * What is counted: a course total is the sum of the student's scores on the assignments whose
 * due date has passed when the file is made (countingRule in gradebook.server.ts). The other
 * assignments keep their column, marked "not counted" in its header, with empty cells; a
 * counted assignment a student never answered is 0. Dropped students are in no file.
 * The files are written from getCourseGradebook, the same data the gradebook page shows, so
 * the page, the CSV and the XLSX carry the same figures. Points go through roundPoints
 * (app/lib/points.ts): numbers stay numbers, to 0.01, late penalties already taken off.
 *
 * Course gradebook (GET /courses/:courseId/gradebook.csv and .xlsx): one header row, then a
 * row per current student in order of family name, then given name:
 *   Student ID, Family name, Given name, E-mail, Section, one column per assignment (by due
 *   date) headed with its possible points, "Week 3 — Otto cycle (4.29)" (and "— not counted,
 *   due …" while not due), "Total (N)" with the counted points, "Answers being graded"
 *   (> 0: the row may still change). The XLSX has the same columns on its "Grades" sheet with
 *   the header row frozen, and the rule in words on a "Notes" sheet.
 *
 * Term export (department admins, built by the 'export-grades' job into grade_exports): the
 * courses of one term have different assignments, so its tables are long, not wide, and a
 * grade system imports one table per file, so the assignment rows and the course totals are
 * two CSV files, downloaded apart (?file=assignments, ?file=course-totals):
 *   assignments: Course code, Course title, Student ID, Family name, Given name, E-mail,
 *     Section, Assignment, Due, Time zone, Counted, Score, Possible, Late, Answers being graded
 *   course totals: Course code, Course title, Student ID, Family name, Given name, E-mail,
 *     Section, Total, Possible, Assignments counted, Assignments, Counted as of, Time zone,
 *     Late, Answers being graded
 * Due and Counted as of are wall-clock times in the course's zone (named beside them); Late is
 * "yes" when any counted answer came after the student's due date. The two files are kept in
 * grade_exports.csv as one JSON document ({ format, files }); an export made before the split
 * holds a single CSV there and is still served as it was.
 *
 * Every text cell goes through neutraliseCell (OWASP's CSV injection guidance), names,
 * e-mails, titles and headers alike, in the CSV and the XLSX; numbers are written as numbers
 * (scores are never negative). CSV files start with a UTF-8 byte order mark so spreadsheet
 * programs read accented names correctly.
 */
import { Readable, pipeline } from 'node:stream'
import { TZDate } from '@date-fns/tz'
import { stringify, type Options as StringifyOptions } from 'csv-stringify'
import { stringify as stringifySync } from 'csv-stringify/sync'
import { format } from 'date-fns'
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm'
import ExcelJS from 'exceljs'
import { z } from 'zod'
import { roundPoints, formatPoints } from '#app/lib/points.ts'
import type { Db, Tx } from './db/client.server.ts'
import { courses, departments, gradeExports, terms, users } from './db/schema.server.ts'
import { DEFAULT_GRADEBOOK_VIEW, getCourseGradebook, type CourseGradebook } from './gradebook.server.ts'
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

/** "th-101-grades-2026-12-02.csv" (or .xlsx), dated in the course's zone. */
export function courseCsvFileName(
  courseCode: string,
  timeZone: string,
  now = new Date(),
  extension: 'csv' | 'xlsx' = 'csv',
): string {
  return `${fileSlug(courseCode, 'course')}-grades-${format(new TZDate(now.getTime(), timeZone), 'yyyy-MM-dd')}.${extension}`
}

/** A moment as wall-clock time in a zone, "2026-11-20 17:59", for files. */
function wallClock(at: Date | string, timeZone: string): string {
  return format(new TZDate(new Date(at).getTime(), timeZone), 'yyyy-MM-dd HH:mm')
}

type Cell = string | number | boolean | null

/** One header row and a row per current student: the course gradebook as a single table. */
export function courseGradeTable(gradebook: CourseGradebook): { header: string[]; rows: Cell[][] } {
  const zone = gradebook.course.timeZone
  const header = [
    'Student ID',
    'Family name',
    'Given name',
    'E-mail',
    'Section',
    ...gradebook.assignments.map((a) =>
      a.counted
        ? `${a.title} (${formatPoints(a.points)})`
        : `${a.title} (${formatPoints(a.points)}) — not counted, due ${wallClock(a.dueAt, zone)} ${zone}`,
    ),
    `Total (${formatPoints(gradebook.points)})`,
    'Answers being graded',
  ]
  const rows = gradebook.students.map((s): Cell[] => [
    s.studentNumber ?? '',
    s.familyName,
    s.givenName,
    s.email,
    s.section ?? '',
    ...s.assignments.map((c) => (c.counted ? roundPoints(c.score) : null)),
    roundPoints(s.total),
    s.pending,
  ])
  return { header, rows }
}

async function loadCourseGradebook(database: Database, courseId: number, now: Date): Promise<CourseGradebook> {
  const gradebook = await getCourseGradebook(database, courseId, DEFAULT_GRADEBOOK_VIEW, { now })
  if (!gradebook) throw new ExportRequestError('There is no such course.')
  return gradebook
}

/**
 * The course gradebook as a CSV byte stream (see the header of this file for its columns).
 * The data is read before this resolves, so a database error surfaces before any byte is
 * sent; rows are then stringified one at a time as the client reads them.
 */
export async function courseGradeCsv(
  database: Database,
  courseId: number,
  options: { now?: Date } = {},
): Promise<ReadableStream<Uint8Array>> {
  const { header, rows } = courseGradeTable(await loadCourseGradebook(database, courseId, options.now ?? new Date()))
  function* records() {
    yield header
    for (const row of rows) yield row.map((c) => c ?? '')
  }
  const stringifier = stringify(CSV_OPTIONS)
  pipeline(Readable.from(records()), stringifier, (error) => {
    // A client that stops reading (closed tab, cancelled download) is not an error worth logging.
    const code = error?.code
    if (error && error.name !== 'AbortError' && code !== 'ERR_STREAM_PREMATURE_CLOSE')
      console.error('Course CSV stream stopped:', error.message)
  })
  // A cast kept on purpose: Node's web stream is the same object the Response takes, but
  // @types/node declares its own ReadableStream, whose finished read lacks DOM's `value`.
  // eslint-disable-next-line @typescript-eslint/consistent-type-assertions -- the one cast kept, for the reason above
  return Readable.toWeb(stringifier) as unknown as ReadableStream<Uint8Array>
}

export const XLSX_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet'

/**
 * The course gradebook as an XLSX workbook: a "Grades" sheet with the CSV's columns (numbers
 * as numbers, text neutralised like the CSV, the header row frozen) and a "Notes" sheet with
 * the counting rule in words.
 */
export async function courseGradeXlsx(
  database: Database,
  courseId: number,
  options: { now?: Date } = {},
): Promise<Buffer> {
  const gradebook = await loadCourseGradebook(database, courseId, options.now ?? new Date())
  const { header, rows } = courseGradeTable(gradebook)
  const text = (c: Cell) => (typeof c === 'string' ? neutraliseCell(c) : typeof c === 'boolean' ? (c ? 'yes' : '') : c)
  const workbook = new ExcelJS.Workbook()
  workbook.creator = 'Cyclewright'
  workbook.created = new Date(gradebook.asOf)
  const sheet = workbook.addWorksheet('Grades', { views: [{ state: 'frozen', xSplit: 0, ySplit: 1 }] })
  sheet.addRow(header.map(text))
  sheet.getRow(1).font = { bold: true }
  for (const row of rows) sheet.addRow(row.map(text))
  sheet.columns.forEach((column, i) => {
    column.width = Math.min(40, Math.max(10, (header[i] ?? '').length + 2))
  })
  const notes = workbook.addWorksheet('Notes')
  notes.addRow([neutraliseCell(gradebook.rule)])
  notes.addRow([
    `Scores are points to 0.01, with late penalties taken off. Empty cells: assignments not counted yet. "Answers being graded" above 0: the row may still change.`,
  ])
  notes.getColumn(1).width = 120
  return Buffer.from(await workbook.xlsx.writeBuffer())
}

// ---- Term export for department admins ----------------------------------------------------

/** A request the admin can fix (shown next to the form), not a server fault. */
export class ExportRequestError extends Error {
  override name = 'ExportRequestError'
}

async function adminScope(database: Database, userId: number) {
  const [row] = await database
    .select({ isAdmin: users.isAdmin, departmentId: users.departmentId })
    .from(users)
    .where(eq(users.id, userId))
    .limit(1)
  return row ?? null
}

/** The terms an admin may export: their department's, or every term when they have none. */
export async function listExportableTerms(database: Database, adminUserId: number) {
  const scope = await adminScope(database, adminUserId)
  if (!scope?.isAdmin) return []
  return database
    .select({
      id: terms.id,
      name: terms.name,
      departmentName: departments.name,
      startsOn: terms.startsOn,
      endsOn: terms.endsOn,
    })
    .from(terms)
    .innerJoin(departments, eq(departments.id, terms.departmentId))
    .where(scope.departmentId === null ? undefined : eq(terms.departmentId, scope.departmentId))
    .orderBy(desc(terms.startsOn), asc(departments.name), asc(terms.name))
}

/** The latest exports one admin asked for, newest first (no file text). */
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
      // An export made before the split holds one CSV rather than the JSON of two files.
      legacy: sql<boolean>`coalesce(left(${gradeExports.csv}, 1) <> '{', false)`,
    })
    .from(gradeExports)
    .innerJoin(terms, eq(terms.id, gradeExports.termId))
    .innerJoin(departments, eq(departments.id, terms.departmentId))
    .where(eq(gradeExports.requestedBy, adminUserId))
    .orderBy(desc(gradeExports.createdAt), desc(gradeExports.id))
    .limit(limit)
}

/** The download links of one export: two files, or the single file of an export made before the split. */
function exportFiles(e: { id: number; fileName: string; legacy: boolean }) {
  if (e.legacy)
    return [{ label: 'Download the CSV', name: termExportFileName(e.fileName, null), href: `/admin/exports/${e.id}` }]
  return [
    {
      label: 'Course totals',
      name: termExportFileName(e.fileName, 'course-totals'),
      href: `/admin/exports/${e.id}?file=course-totals`,
    },
    {
      label: 'Assignment rows',
      name: termExportFileName(e.fileName, 'assignments'),
      href: `/admin/exports/${e.id}?file=assignments`,
    },
  ]
}

/** What /admin/exports shows: the terms to choose from and the admin's own exports with their files. */
export async function adminExportsPage(database: Database, adminUserId: number) {
  const [termOptions, exports] = await Promise.all([
    listExportableTerms(database, adminUserId),
    listExportsForAdmin(database, adminUserId),
  ])
  return {
    terms: termOptions,
    exports: exports.map(({ legacy, ...e }) => ({ ...e, files: exportFiles({ ...e, legacy }) })),
  }
}

/**
 * Records an export of one term's grades and queues its job in the same transaction.
 * While the same admin's export of the same term is still waiting or running, that one is
 * returned instead of a second (a double click makes one file).
 * Throws ExportRequestError for a term that does not exist or is outside the admin's department.
 */
export async function requestTermExport(
  database: Db,
  input: { adminUser: { id: number }; termId: number; now?: Date },
): Promise<{ exportId: number; created: boolean }> {
  const scope = await adminScope(database, input.adminUser.id)
  if (!scope?.isAdmin) throw new ExportRequestError('Only department admins can export a term’s grades.')
  const [term] = await database
    .select({ id: terms.id, name: terms.name, departmentId: terms.departmentId })
    .from(terms)
    .where(eq(terms.id, input.termId))
    .limit(1)
  if (!term || (scope.departmentId !== null && term.departmentId !== scope.departmentId))
    throw new ExportRequestError('Choose one of the terms listed.')
  const day = (input.now ?? new Date()).toISOString().slice(0, 10)
  return withJobTransaction(database, async (tx, jobs) => {
    // Serialises two requests of the same admin, so the check below sees the other's row.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('grade-export'), ${input.adminUser.id})`)
    const [open] = await tx
      .select({ id: gradeExports.id })
      .from(gradeExports)
      .where(
        and(
          eq(gradeExports.requestedBy, input.adminUser.id),
          eq(gradeExports.termId, term.id),
          inArray(gradeExports.status, ['queued', 'running']),
        ),
      )
      .limit(1)
    if (open) return { exportId: open.id, created: false }
    const [row] = await tx
      .insert(gradeExports)
      .values({
        requestedBy: input.adminUser.id,
        termId: term.id,
        status: 'queued',
        fileName: `grades-${fileSlug(term.name, 'term')}-${day}`,
      })
      .returning({ id: gradeExports.id })
    await enqueue('export-grades', { v: 1, exportId: row!.id }, { connection: jobs })
    return { exportId: row!.id, created: true }
  })
}

const WHO_HEADER = [
  'Course code',
  'Course title',
  'Student ID',
  'Family name',
  'Given name',
  'E-mail',
  'Section',
] as const

/** The term export's assignment rows: one per (course, student, assignment). */
export const TERM_ASSIGNMENTS_HEADER = [
  ...WHO_HEADER,
  'Assignment',
  'Due',
  'Time zone',
  'Counted',
  'Score',
  'Possible',
  'Late',
  'Answers being graded',
] as const

/** The term export's course totals: one per (course, student). */
export const TERM_TOTALS_HEADER = [
  ...WHO_HEADER,
  'Total',
  'Possible',
  'Assignments counted',
  'Assignments',
  'Counted as of',
  'Time zone',
  'Late',
  'Answers being graded',
] as const

export const TERM_EXPORT_FILES = ['assignments', 'course-totals'] as const
export type TermExportFile = (typeof TERM_EXPORT_FILES)[number]

const STORED_FORMAT = 'term-export/2'
type StoredTermExport = { format: typeof STORED_FORMAT; files: Record<TermExportFile, string> }
// Other fields are kept as they are: an export written by a newer release still serves its two files.
const StoredTermExportSchema = z.object({
  format: z.literal(STORED_FORMAT),
  files: z.looseObject({ assignments: z.string(), 'course-totals': z.string() }),
})

/** What grade_exports.csv holds: the two files of a term export, or one CSV of an older export. */
export function readStoredExport(text: string): { files: Record<TermExportFile, string> } | { legacy: string } {
  if (text.startsWith('{')) {
    try {
      const parsed = StoredTermExportSchema.safeParse(JSON.parse(text))
      if (parsed.success) return { files: parsed.data.files }
    } catch {
      // not ours: served as the text it is
    }
  }
  return { legacy: text }
}

/** "grades-fall-2026-2026-12-02-course-totals.csv" from the stored base name. */
export function termExportFileName(stored: string, file: TermExportFile | null): string {
  const base = fileSlug(stored.replace(/\.csv$/, ''), 'grades')
  return file === null ? `${base}.csv` : `${base}-${file}.csv`
}

export type BuildOutcome = 'done' | 'already-done' | 'missing'

/**
 * Builds a queued term export (the 'export-grades' job): status running while it works
 * (rows counts up course by course, for the progress shown to the admin), then done with
 * the CSV text and its number of data rows. A done export is left as it is.
 *
 * On failure it records why and rethrows: failed for a PermanentJobError or when
 * `lastAttempt`, else back to queued with the reason, as the job will be retried.
 */
export async function buildTermExport(
  database: Db,
  exportId: number,
  options: { lastAttempt?: boolean } = {},
): Promise<BuildOutcome> {
  const [row] = await database
    .select({ status: gradeExports.status, requestedBy: gradeExports.requestedBy, termId: gradeExports.termId })
    .from(gradeExports)
    .where(eq(gradeExports.id, exportId))
    .limit(1)
  if (!row) return 'missing'
  if (row.status === 'done') return 'already-done'
  await database
    .update(gradeExports)
    .set({ status: 'running', rows: 0, error: null })
    .where(eq(gradeExports.id, exportId))
  try {
    const scope = await adminScope(database, row.requestedBy)
    if (!scope?.isAdmin)
      throw new PermanentJobError('The person who asked for this export is no longer a department admin.')
    const courseRows = await database
      .select({ id: courses.id, code: courses.code, title: courses.title, timeZone: courses.timeZone })
      .from(courses)
      .where(
        and(
          eq(courses.termId, row.termId),
          scope.departmentId === null ? undefined : eq(courses.departmentId, scope.departmentId),
        ),
      )
      .orderBy(asc(courses.code), asc(courses.id))

    const now = new Date()
    const assignmentRecords: Cell[][] = [[...TERM_ASSIGNMENTS_HEADER]]
    const totalRecords: Cell[][] = [[...TERM_TOTALS_HEADER]]
    for (const course of courseRows) {
      const gradebook = await loadCourseGradebook(database, course.id, now)
      const zone = course.timeZone
      const counted = gradebook.assignments.filter((a) => a.counted).length
      for (const s of gradebook.students) {
        const who: Cell[] = [
          course.code,
          course.title,
          s.studentNumber ?? '',
          s.familyName,
          s.givenName,
          s.email,
          s.section ?? '',
        ]
        gradebook.assignments.forEach((a, i) => {
          const c = s.assignments[i]!
          assignmentRecords.push([
            ...who,
            a.title,
            wallClock(a.dueAt, zone),
            zone,
            a.counted,
            a.counted ? roundPoints(c.score) : '',
            roundPoints(a.points),
            c.late,
            c.pending,
          ])
        })
        totalRecords.push([
          ...who,
          roundPoints(s.total),
          roundPoints(gradebook.points),
          counted,
          gradebook.assignments.length,
          wallClock(now, zone),
          zone,
          s.late,
          s.pending,
        ])
      }
      await database
        .update(gradeExports)
        .set({ rows: assignmentRecords.length + totalRecords.length - 2 })
        .where(eq(gradeExports.id, exportId))
    }
    const stored: StoredTermExport = {
      format: STORED_FORMAT,
      files: {
        assignments: stringifySync(assignmentRecords, CSV_OPTIONS),
        'course-totals': stringifySync(totalRecords, CSV_OPTIONS),
      },
    }
    await database
      .update(gradeExports)
      .set({
        status: 'done',
        csv: JSON.stringify(stored),
        rows: assignmentRecords.length + totalRecords.length - 2,
        error: null,
        finishedAt: sql`clock_timestamp()`,
      })
      .where(eq(gradeExports.id, exportId))
    return 'done'
  } catch (e) {
    const reason = e instanceof Error ? e.message : String(e)
    const failed = e instanceof PermanentJobError || options.lastAttempt === true
    await database
      .update(gradeExports)
      .set(
        failed
          ? {
              status: 'failed',
              error: e instanceof PermanentJobError ? reason : `The export stopped: ${reason}`,
              finishedAt: sql`clock_timestamp()`,
            }
          : { status: 'queued', error: `An attempt stopped (${reason}); trying again shortly.` },
      )
      .where(eq(gradeExports.id, exportId))
      .catch((writeError: unknown) => console.error('Could not record the export failure:', writeError))
    throw e
  }
}

/**
 * One file of a finished export, for any department admin; null while it is not done or when
 * it has no such file. `file` null: an older export's single CSV (or, for a two-file export,
 * its assignment rows).
 */
export async function getExportDownload(database: Database, exportId: number, file: TermExportFile | null = null) {
  const [row] = await database
    .select({ fileName: gradeExports.fileName, csv: gradeExports.csv })
    .from(gradeExports)
    .where(and(eq(gradeExports.id, exportId), eq(gradeExports.status, 'done')))
    .limit(1)
  if (!row || row.csv === null) return null
  const stored = readStoredExport(row.csv)
  if ('legacy' in stored)
    return file === null || file === 'assignments'
      ? { fileName: termExportFileName(row.fileName, null), csv: stored.legacy }
      : null
  const chosen = file ?? 'assignments'
  return { fileName: termExportFileName(row.fileName, chosen), csv: stored.files[chosen] }
}
