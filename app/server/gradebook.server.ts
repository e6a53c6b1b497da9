/**
 * What course staff read about an assignment's grades: the assignment gradebook (students ×
 * problems, expandable to finds), the course gradebook (students × assignments), every answer
 * to one find, and the statistics per problem and per find.
 *
 * Scores come from listFindScores / listAssignmentTotals (grading.server.ts): a find's score
 * is its best graded answer, after the late penalty. Only the course's current students are
 * listed: dropped students (memberships.droppedAt) are left out of every total and listed
 * apart (`dropped`). Students are in order of family name, then given name (the display name
 * when a student has no family name on record). Dates are ISO strings, so the page's loader
 * and the /api/ routes return the same JSON.
 *
 * The course total counts only the assignments whose due date has passed (COUNTING_RULE);
 * the course CSV and XLSX are written from this same gradebook, so they show the same figures.
 */
import { and, asc, eq, inArray, isNotNull } from 'drizzle-orm'
import { z } from 'zod'
import { attemptsAllowed, rulesOf, type StudentExtension } from '#app/domain/assignments/policy.ts'
import { findShares, findState, roundScore } from '#app/domain/assignments/scoring.ts'
import {
  groupWrongAnswers,
  groupWrongAnswersByMultiple,
  histogram,
  mean,
  median,
  type HistogramBin,
  type WrongAnswerGroup,
} from '#app/domain/assignments/statistics.ts'
import type { CheckDetail } from '#app/domain/grading/index.ts'
import { PITFALLS } from '#app/domain/grading/pitfalls.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { formatPoints } from '#app/lib/points.ts'
import type { Db, Tx } from './db/client.server.ts'
import { tryReadDefinition } from './definitions.server.ts'
import {
  assignmentItems,
  assignments,
  courses,
  extensions,
  memberships,
  partResults,
  problemVersions,
  submissions,
  users,
} from './db/schema.server.ts'
import { listAssignmentTotals, listFindScores, type FindScoreRow } from './grading.server.ts'
import { textParamProblem, type ParamProblem } from '#app/lib/query-params.ts'

type Database = Db | Tx

// ---- The view: filters, search and sort, all from URL search params -------------------

export const GRADEBOOK_STATUSES = ['all', 'not-started', 'in-progress', 'finished', 'being-graded', 'late'] as const
export type GradebookStatusFilter = (typeof GRADEBOOK_STATUSES)[number]
/** Where a student stands; 'late' is a flag beside it, not a state. */
export type StudentStatus = 'not-started' | 'in-progress' | 'finished' | 'being-graded'
export const GRADEBOOK_SORTS = ['name', 'total', 'section'] as const
export type GradebookSort = (typeof GRADEBOOK_SORTS)[number]

// Every field falls back to its default: a hand-edited or stale link shows the whole
// gradebook rather than an error.
const GradebookViewSchema = z.object({
  section: z.string().trim().max(100).catch(''),
  status: z.enum(GRADEBOOK_STATUSES).catch('all'),
  q: z.string().trim().max(200).catch(''),
  sort: z.enum(GRADEBOOK_SORTS).catch('name'),
  dir: z.enum(['asc', 'desc']).catch('asc'),
  expand: z.enum(['1']).optional().catch(undefined),
})
export type GradebookView = z.infer<typeof GradebookViewSchema>

/**
 * The search or section in a gradebook's address when it holds control characters (a NUL
 * cannot be typed into a name, and nothing sensible matches it): the page and the API refuse
 * it with a 400 naming the part of the address.
 */
export function gradebookViewProblem(url: URL): ParamProblem | null {
  return textParamProblem(url.searchParams, { q: 'the search', section: 'the section' })
}

export function readGradebookView(url: URL): GradebookView {
  const p = url.searchParams
  return GradebookViewSchema.parse({
    section: p.get('section') ?? '',
    status: p.get('status') ?? 'all',
    q: p.get('q') ?? '',
    sort: p.get('sort') ?? 'name',
    dir: p.get('dir') ?? 'asc',
    expand: p.get('expand') ?? undefined,
  })
}

/** The whole gradebook, by name. */
export const DEFAULT_GRADEBOOK_VIEW: GradebookView = { section: '', status: 'all', q: '', sort: 'name', dir: 'asc' }

type ViewRow = {
  name: string
  familyName: string
  givenName: string
  email: string
  studentNumber?: string | null
  section: string | null
  total: number
  status: StudentStatus
  late: boolean
}

// Sorted here rather than in SQL so the order does not depend on the database's collation.
const collator = new Intl.Collator('en', { sensitivity: 'base', numeric: true })

/** Family name, then given name, then the display name and e-mail (so the order is total). */
export function compareStudents(
  a: Omit<StudentNames, 'studentNumber'> & { name: string; email: string },
  b: Omit<StudentNames, 'studentNumber'> & { name: string; email: string },
): number {
  return (
    collator.compare(a.familyName, b.familyName) ||
    collator.compare(a.givenName, b.givenName) ||
    collator.compare(a.name, b.name) ||
    collator.compare(a.email, b.email)
  )
}

/** The rows the view asks for, in its order (ties by family name, given name, then e-mail). */
export function applyGradebookView<T extends ViewRow>(rows: readonly T[], view: GradebookView): T[] {
  const q = view.q.toLowerCase()
  const kept = rows.filter((r) => {
    if (view.section && (r.section ?? '') !== view.section) return false
    if (view.status === 'late' ? !r.late : view.status !== 'all' && r.status !== view.status) return false
    if (q && ![r.name, r.email, r.studentNumber ?? ''].some((text) => text.toLowerCase().includes(q))) return false
    return true
  })
  const byName = compareStudents
  const sign = view.dir === 'desc' ? -1 : 1
  return kept.sort((a, b) => {
    if (view.sort === 'total') return sign * (a.total - b.total) || byName(a, b)
    if (view.sort === 'section') {
      // Students without a section stay last in either direction.
      if ((a.section === null) !== (b.section === null)) return a.section === null ? 1 : -1
      return sign * (a.section ?? '').localeCompare(b.section ?? '', 'en', { numeric: true }) || byName(a, b)
    }
    return sign * byName(a, b)
  })
}

// ---- Shared reads ----------------------------------------------------------------------

type ItemFacts = {
  id: number
  position: number
  title: string
  points: number
  finds: { name: string; label: string; unit: string; share: number }[]
}

async function listItems(
  database: Database,
  assignmentIds: number[],
): Promise<(ItemFacts & { assignmentId: number })[]> {
  if (assignmentIds.length === 0) return []
  const rows = await database
    .select({
      id: assignmentItems.id,
      assignmentId: assignmentItems.assignmentId,
      position: assignmentItems.position,
      points: assignmentItems.points,
      versionId: problemVersions.id,
      definition: problemVersions.definition,
    })
    .from(assignmentItems)
    .innerJoin(problemVersions, eq(problemVersions.id, assignmentItems.problemVersionId))
    .where(inArray(assignmentItems.assignmentId, assignmentIds))
    .orderBy(asc(assignmentItems.assignmentId), asc(assignmentItems.position))
  return rows.map((r) => {
    // A version whose stored document fails the check (logged by the reader) keeps its column and
    // its scores, without per-find columns, rather than taking the whole gradebook down.
    const read = tryReadDefinition(r.definition, r.versionId)
    const def = read.ok ? read.definition : { title: `Unreadable problem (version ${r.versionId})`, finds: [] }
    const shares = findShares(
      r.points,
      def.finds.map((f) => f.points),
    )
    return {
      id: r.id,
      assignmentId: r.assignmentId,
      position: r.position,
      title: def.title,
      points: r.points,
      finds: def.finds.map((f, i) => ({
        name: f.name,
        label: f.label,
        unit: f.unit,
        share: roundScore(shares[i] ?? 0),
      })),
    }
  })
}

export type StudentNames = {
  /** the student ID the department gave (users.studentNumber), or null */
  studentNumber: string | null
  /** users.familyName, or the display name when there is none */
  familyName: string
  /** users.givenName, or '' when there is none */
  givenName: string
}

/** The names a gradebook sorts and exports by, falling back to the display name. */
export function studentNames(u: {
  name: string
  studentNumber: string | null
  familyName: string | null
  givenName: string | null
}): StudentNames {
  const family = u.familyName?.trim() ?? ''
  return {
    studentNumber: u.studentNumber?.trim() || null,
    familyName: family || u.name,
    givenName: u.givenName?.trim() ?? '',
  }
}

export type DroppedStudent = StudentNames & {
  userId: number
  name: string
  email: string
  section: string | null
  droppedAt: string
}

/** The course's current students in gradebook order, and its dropped students apart. */
async function listStudents(database: Database, courseId: number) {
  const rows = await database
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      studentNumber: users.studentNumber,
      familyName: users.familyName,
      givenName: users.givenName,
      section: memberships.section,
      droppedAt: memberships.droppedAt,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.courseId, courseId), eq(memberships.role, 'student')))
  const people = rows
    .map((r) => ({
      userId: r.userId,
      name: r.name,
      email: r.email,
      section: r.section,
      droppedAt: r.droppedAt,
      ...studentNames(r),
    }))
    .sort((a, b) => compareStudents(a, b) || a.userId - b.userId)
  const current = people.filter((p) => p.droppedAt === null).map(({ droppedAt: _d, ...p }) => p)
  const dropped: DroppedStudent[] = people
    .filter((p) => p.droppedAt !== null)
    .map((p) => ({ ...p, droppedAt: p.droppedAt!.toISOString() }))
  return { current, dropped }
}

function sectionsOf(students: readonly { section: string | null }[]): string[] {
  return [...new Set(students.map((s) => s.section).filter((s): s is string => s !== null))].sort((a, b) =>
    a.localeCompare(b, 'en', { numeric: true }),
  )
}

/**
 * One student's standing on one assignment: being graded while any answer waits; not started
 * with no answer; finished when every find is right or out of attempts; else in progress.
 */
function studentStatus(
  items: readonly ItemFacts[],
  scores: ReadonlyMap<string, FindScoreRow>,
  allowed: number,
): StudentStatus {
  let answered = false
  let open = false
  let pending = false
  for (const item of items)
    for (const f of item.finds) {
      const row = scores.get(`${item.id}|${f.name}`)
      if (row) answered = true
      if (row && row.pending > 0) pending = true
      const state = findState({
        attemptsUsed: row?.attempts ?? 0,
        attemptsAllowed: allowed,
        anyCorrect: row?.correct ?? false,
        anyPending: (row?.pending ?? 0) > 0,
      })
      if (state !== 'correct' && state !== 'out-of-attempts') open = true
    }
  if (pending) return 'being-graded'
  if (!answered) return 'not-started'
  return open ? 'in-progress' : 'finished'
}

/** findScores of one (assignment, student), keyed `${itemId}|${findName}`. */
function indexScores(rows: readonly FindScoreRow[]): Map<string, Map<string, FindScoreRow>> {
  const byStudent = new Map<string, Map<string, FindScoreRow>>()
  for (const r of rows) {
    const key = `${r.assignmentId}|${r.userId}`
    let m = byStudent.get(key)
    if (!m) byStudent.set(key, (m = new Map()))
    m.set(`${r.itemId}|${r.findName}`, r)
  }
  return byStudent
}

async function findAssignment(database: Database, assignmentId: number, courseId?: number) {
  const [row] = await database
    .select({ assignment: assignments, timeZone: courses.timeZone })
    .from(assignments)
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .where(
      and(eq(assignments.id, assignmentId), courseId === undefined ? undefined : eq(assignments.courseId, courseId)),
    )
    .limit(1)
  return row ?? null
}

// ---- Assignment gradebook ----------------------------------------------------------------

export type GradebookFind = {
  name: string
  score: number
  max: number
  attempts: number
  correct: boolean
  pending: number
}
export type GradebookStudent = StudentNames & {
  userId: number
  name: string
  email: string
  section: string | null
  extension: { dueAt: string | null; extraAttempts: number } | null
  total: number
  maxScore: number
  late: boolean
  pending: number
  status: StudentStatus
  items: { position: number; score: number; max: number; finds: GradebookFind[] }[]
}
export type AssignmentGradebook = {
  assignment: {
    id: number
    courseId: number
    title: string
    opensAt: string
    dueAt: string
    points: number
    attemptsPerFind: number
    timeZone: string
    /** 'due' once its due date has passed: only then do its scores count in the course total */
    stage: AssignmentStage
  }
  items: Omit<ItemFacts, 'id'>[]
  sections: string[]
  /** current students in the course, before the view's filters (dropped ones not included) */
  studentCount: number
  students: GradebookStudent[]
  /** students who dropped the course: in no total, listed apart */
  dropped: DroppedStudent[]
  /** answers still waiting for the grader, over the whole assignment (the page polls while > 0) */
  pendingCount: number
  view: GradebookView
}

/** The assignment's gradebook, or null when it is not an assignment of `courseId`. */
export async function getAssignmentGradebook(
  database: Database,
  input: { assignmentId: number; courseId: number; view?: GradebookView },
): Promise<AssignmentGradebook | null> {
  const found = await findAssignment(database, input.assignmentId, input.courseId)
  if (!found) return null
  const { assignment, timeZone } = found
  const view = input.view ?? DEFAULT_GRADEBOOK_VIEW
  const [items, { current: students, dropped }, scores, totals, exts] = await Promise.all([
    listItems(database, [assignment.id]),
    listStudents(database, assignment.courseId),
    listFindScores(database, { assignmentIds: [assignment.id] }),
    listAssignmentTotals(database, { courseIds: [assignment.courseId], assignmentIds: [assignment.id] }),
    database
      .select({ userId: extensions.userId, dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts })
      .from(extensions)
      .where(eq(extensions.assignmentId, assignment.id)),
  ])
  const rules = rulesOf(assignment)
  const byStudent = indexScores(scores)
  const totalOf = new Map(totals.map((t) => [t.userId, t]))
  const extOf = new Map(exts.map((e) => [e.userId, e]))
  const points = roundScore(items.reduce((a, i) => a + i.points, 0))

  const rows: GradebookStudent[] = students.map((s) => {
    const mine = byStudent.get(`${assignment.id}|${s.userId}`) ?? new Map<string, FindScoreRow>()
    const ext = extOf.get(s.userId) ?? null
    const studentExt: StudentExtension | null = ext ? { dueAt: ext.dueAt, extraAttempts: ext.extraAttempts } : null
    const total = totalOf.get(s.userId)
    const perItem = items.map((item) => {
      const finds = item.finds.map((f) => {
        const r = mine.get(`${item.id}|${f.name}`)
        return {
          name: f.name,
          score: r?.score ?? 0,
          max: f.share,
          attempts: r?.attempts ?? 0,
          correct: r?.correct ?? false,
          pending: r?.pending ?? 0,
        }
      })
      return {
        position: item.position,
        score: roundScore(finds.reduce((a, f) => a + f.score, 0)),
        max: item.points,
        finds,
      }
    })
    return {
      ...s,
      extension: ext ? { dueAt: ext.dueAt?.toISOString() ?? null, extraAttempts: ext.extraAttempts } : null,
      total: total?.score ?? 0,
      maxScore: total?.maxScore ?? points,
      late: total?.late ?? false,
      pending: total?.pending ?? 0,
      status: studentStatus(items, mine, attemptsAllowed(rules, studentExt)),
      items: perItem,
    }
  })

  return {
    assignment: {
      id: assignment.id,
      courseId: assignment.courseId,
      title: assignment.title,
      opensAt: assignment.opensAt.toISOString(),
      dueAt: assignment.dueAt.toISOString(),
      points,
      attemptsPerFind: assignment.attemptsPerFind,
      timeZone,
      stage: assignmentStage(assignment, new Date()),
    },
    items: items.map(({ id: _id, assignmentId: _a, ...rest }) => rest),
    sections: sectionsOf(students),
    studentCount: students.length,
    students: applyGradebookView(rows, view),
    dropped,
    pendingCount: rows.reduce((a, r) => a + r.pending, 0),
    view,
  }
}

// ---- Course gradebook ----------------------------------------------------------------------

/**
 * Where an assignment stands at a moment: not open yet, open (not yet due), or due (its due
 * date has passed). Only due assignments count toward the course total.
 */
export type AssignmentStage = 'not-open' | 'open' | 'due'

export function assignmentStage(a: { opensAt: Date; dueAt: Date }, now: Date): AssignmentStage {
  if (a.dueAt.getTime() <= now.getTime()) return 'due'
  return a.opensAt.getTime() > now.getTime() ? 'not-open' : 'open'
}

/**
 * The rule, in one sentence, as the page shows it above the table and the exports carry it:
 * which assignments the total counts, as of when.
 */
export function countingRule(input: {
  counted: number
  of: number
  points: number
  asOf: Date
  timeZone: string
}): string {
  const when = formatInZone(input.asOf, input.timeZone)
  const which =
    input.of === 0
      ? 'There are no assignments yet.'
      : input.counted === input.of
        ? `All ${input.of === 1 ? 'the assignment is' : `${input.of} assignments are`} past their due date and counted (${formatPoints(input.points)} points).`
        : `${input.counted} of ${input.of} assignments are past their due date and counted (${formatPoints(input.points)} points); the others are shown but not counted (“—”).`
  return `Totals count only assignments whose due date has passed, as of ${when}. ${which} A student who answered nothing on a counted assignment has 0 for it. Dropped students are in no total.`
}

export type CourseGradebookCell = {
  assignmentId: number
  /** the score so far (late penalties taken off); in the total only when `counted` */
  score: number
  maxScore: number
  /** the assignment's due date has passed: this score is in the course total */
  counted: boolean
  late: boolean
  pending: number
  status: StudentStatus
}
export type CourseGradebookStudent = StudentNames & {
  userId: number
  name: string
  email: string
  section: string | null
  /** the sum of the counted assignments' scores */
  total: number
  /** the points of the counted assignments */
  maxScore: number
  late: boolean
  pending: number
  status: StudentStatus
  assignments: CourseGradebookCell[]
}
export type CourseGradebook = {
  course: { id: number; timeZone: string }
  assignments: {
    id: number
    title: string
    opensAt: string
    dueAt: string
    points: number
    stage: AssignmentStage
    counted: boolean
  }[]
  /** the most a student can earn over the counted assignments (what the total is out of) */
  points: number
  /** the most a student can earn over every assignment, counted or not */
  allPoints: number
  /** the moment the rule was applied */
  asOf: string
  /** COUNTING_RULE in words, for above the table and the exports */
  rule: string
  sections: string[]
  studentCount: number
  students: CourseGradebookStudent[]
  /** students who dropped the course: in no total and no export, listed apart */
  dropped: DroppedStudent[]
  pendingCount: number
  view: GradebookView
}

/** Where a student stands over the course's assignments (see studentStatus). */
function courseStatus(cells: readonly CourseGradebookCell[]): StudentStatus {
  if (cells.some((c) => c.status === 'being-graded')) return 'being-graded'
  if (cells.every((c) => c.status === 'not-started')) return 'not-started'
  if (cells.every((c) => c.status === 'finished')) return 'finished'
  return 'in-progress'
}

/**
 * Students × assignments with totals, or null when there is no such course. The total of a
 * student is the sum of their scores on the assignments due by `now` (see countingRule).
 */
export async function getCourseGradebook(
  database: Database,
  courseId: number,
  view: GradebookView = DEFAULT_GRADEBOOK_VIEW,
  options: { now?: Date } = {},
): Promise<CourseGradebook | null> {
  const now = options.now ?? new Date()
  const [course] = await database
    .select({ id: courses.id, timeZone: courses.timeZone })
    .from(courses)
    .where(eq(courses.id, courseId))
    .limit(1)
  if (!course) return null
  const assignmentRows = await database
    .select()
    .from(assignments)
    .where(eq(assignments.courseId, courseId))
    .orderBy(asc(assignments.dueAt), asc(assignments.id))
  const ids = assignmentRows.map((a) => a.id)
  const [items, { current: students, dropped }, scores, totals, exts] = await Promise.all([
    listItems(database, ids),
    listStudents(database, courseId),
    listFindScores(database, { assignmentIds: ids }),
    listAssignmentTotals(database, { courseIds: [courseId] }),
    ids.length
      ? database
          .select({
            assignmentId: extensions.assignmentId,
            userId: extensions.userId,
            dueAt: extensions.dueAt,
            extraAttempts: extensions.extraAttempts,
          })
          .from(extensions)
          .where(inArray(extensions.assignmentId, ids))
      : Promise.resolve([]),
  ])
  const byStudent = indexScores(scores)
  const totalOf = new Map(totals.map((t) => [`${t.assignmentId}|${t.userId}`, t]))
  const extOf = new Map(exts.map((e) => [`${e.assignmentId}|${e.userId}`, e]))
  const itemsOf = new Map<number, ItemFacts[]>(ids.map((id) => [id, items.filter((i) => i.assignmentId === id)]))
  const pointsOf = new Map(ids.map((id) => [id, roundScore((itemsOf.get(id) ?? []).reduce((a, i) => a + i.points, 0))]))
  const stageOf = new Map(assignmentRows.map((a) => [a.id, assignmentStage(a, now)]))
  const countedIds = new Set(ids.filter((id) => stageOf.get(id) === 'due'))
  const allPoints = roundScore([...pointsOf.values()].reduce((a, b) => a + b, 0))
  const coursePoints = roundScore([...countedIds].reduce((a, id) => a + (pointsOf.get(id) ?? 0), 0))

  const rows: CourseGradebookStudent[] = students.map((s) => {
    const cells = assignmentRows.map((a): CourseGradebookCell => {
      const t = totalOf.get(`${a.id}|${s.userId}`)
      const ext = extOf.get(`${a.id}|${s.userId}`)
      const allowed = attemptsAllowed(rulesOf(a), ext ? { dueAt: ext.dueAt, extraAttempts: ext.extraAttempts } : null)
      const status = studentStatus(itemsOf.get(a.id) ?? [], byStudent.get(`${a.id}|${s.userId}`) ?? new Map(), allowed)
      return {
        assignmentId: a.id,
        score: roundScore(t?.score ?? 0),
        maxScore: t?.maxScore ?? pointsOf.get(a.id) ?? 0,
        counted: countedIds.has(a.id),
        late: t?.late ?? false,
        pending: t?.pending ?? 0,
        status,
      }
    })
    return {
      ...s,
      total: roundScore(cells.reduce((a, c) => a + (c.counted ? c.score : 0), 0)),
      maxScore: coursePoints,
      late: cells.some((c) => c.late),
      pending: cells.reduce((a, c) => a + c.pending, 0),
      status: cells.length ? courseStatus(cells) : 'not-started',
      assignments: cells,
    }
  })
  return {
    course,
    assignments: assignmentRows.map((a) => ({
      id: a.id,
      title: a.title,
      opensAt: a.opensAt.toISOString(),
      dueAt: a.dueAt.toISOString(),
      points: pointsOf.get(a.id) ?? 0,
      stage: stageOf.get(a.id)!,
      counted: countedIds.has(a.id),
    })),
    points: coursePoints,
    allPoints,
    asOf: now.toISOString(),
    rule: countingRule({
      counted: countedIds.size,
      of: ids.length,
      points: coursePoints,
      asOf: now,
      timeZone: course.timeZone,
    }),
    sections: sectionsOf(students),
    studentCount: students.length,
    students: applyGradebookView(rows, view),
    dropped,
    pendingCount: rows.reduce((a, r) => a + r.pending, 0),
    view,
  }
}

// ---- Every answer to one find ---------------------------------------------------------------

const pitfallTitle = (id: string) => PITFALLS.find((p) => p.id === id)?.title ?? id

export type FindAnswer = {
  partResultId: number
  userId: number
  name: string
  email: string
  section: string | null
  attempt: number
  /** the text as typed */
  answer: string
  /** null while the answer waits for the grader (or grading failed: see status) */
  verdict: 'correct' | 'incorrect' | 'unreadable' | 'wrong-dimension' | null
  status: 'queued' | 'graded' | 'failed'
  value: number | null
  score: number | null
  maxScore: number
  message: string | null
  pitfall: { id: string; title: string; feedback: string } | null
  submittedAt: string
  daysLate: number
  late: boolean
}
export type FindAnswers = {
  assignment: { id: number; courseId: number; title: string; timeZone: string }
  item: { position: number; title: string; points: number }
  finds: { name: string; label: string; unit: string; share: number }[]
  /** the find shown: the one asked for, else the first; null when the name matches none */
  find: { name: string; label: string; unit: string; share: number } | null
  answers: FindAnswer[]
}

/**
 * Every counted answer to one find of an assignment's problem, by student then attempt;
 * null when the assignment (in `courseId`, when given) has no problem at that position.
 */
export async function getFindAnswers(
  database: Database,
  input: { assignmentId: number; position: number; findName?: string; courseId?: number },
): Promise<FindAnswers | null> {
  const found = await findAssignment(database, input.assignmentId, input.courseId)
  if (!found) return null
  const items = await listItems(database, [input.assignmentId])
  const item = items.find((i) => i.position === input.position)
  if (!item) return null
  const find =
    input.findName === undefined || input.findName === ''
      ? (item.finds[0] ?? null)
      : (item.finds.find((f) => f.name === input.findName) ?? null)
  const base = {
    assignment: {
      id: found.assignment.id,
      courseId: found.assignment.courseId,
      title: found.assignment.title,
      timeZone: found.timeZone,
    },
    item: { position: item.position, title: item.title, points: item.points },
    finds: item.finds,
    find,
  }
  if (!find) return { ...base, answers: [] }
  const rows = await database
    .select({
      partResultId: partResults.id,
      userId: partResults.userId,
      name: users.name,
      email: users.email,
      section: memberships.section,
      attempt: partResults.attempt,
      answer: partResults.answer,
      verdict: partResults.verdict,
      status: submissions.status,
      value: partResults.value,
      score: partResults.score,
      maxScore: partResults.maxScore,
      message: partResults.message,
      pitfallId: partResults.pitfallId,
      pitfallFeedback: partResults.pitfallFeedback,
      submittedAt: submissions.submittedAt,
      daysLate: submissions.daysLate,
    })
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .innerJoin(users, eq(users.id, partResults.userId))
    .leftJoin(
      memberships,
      and(eq(memberships.userId, partResults.userId), eq(memberships.courseId, found.assignment.courseId)),
    )
    .where(and(eq(partResults.itemId, item.id), eq(partResults.findName, find.name)))
    .orderBy(asc(users.name), asc(users.email), asc(partResults.userId), asc(partResults.attempt))
  return {
    ...base,
    answers: rows.map(({ pitfallId, pitfallFeedback, submittedAt, ...r }) => ({
      ...r,
      pitfall: pitfallId ? { id: pitfallId, title: pitfallTitle(pitfallId), feedback: pitfallFeedback ?? '' } : null,
      submittedAt: submittedAt.toISOString(),
      late: r.daysLate > 0,
    })),
  }
}

// ---- Statistics --------------------------------------------------------------------------

export const HISTOGRAM_BINS = 10

export type ScoreSummary = {
  /** students with at least one graded answer */
  count: number
  /** as shares of the most that can be earned, 0…1 */
  mean: number | null
  median: number | null
  histogram: HistogramBin[]
}
export type FindStatistics = {
  name: string
  label: string
  unit: string
  share: number
  summary: ScoreSummary
  /** among students whose first answer is graded */
  firstTry: { correct: number; of: number; share: number | null }
  wrongAnswers: NamedGroup[]
  /** the same wrong answers grouped by their multiple of each student's own key (−1: the other sign, 1000: kJ as J, …) */
  wrongMultiples: NamedGroup[]
}
export type AssignmentStatistics = {
  assignment: { id: number; courseId: number; title: string; points: number; timeZone: string }
  /** graded answers the numbers are built from */
  gradedAnswers: number
  items: { position: number; title: string; points: number; summary: ScoreSummary; finds: FindStatistics[] }[]
}

function summarise(shares: number[]): ScoreSummary {
  return {
    count: shares.length,
    mean: mean(shares),
    median: median(shares),
    histogram: histogram(shares, HISTOGRAM_BINS, [0, 1]),
  }
}

/**
 * Per problem and per find: scores as a share of the most that can be earned (best graded
 * answer per student, late penalties included), over the students with a graded answer; the
 * share right at the first attempt; and the most common wrong answers (statistics.ts says how
 * they are grouped). Answers still waiting for the grader are not counted yet.
 */
type NamedGroup = Omit<WrongAnswerGroup, 'pitfall'> & {
  pitfall: { id: string; title: string; feedback: string; count: number } | null
}

/** The student's key in the find's unit, from the checker's detail (answer − key). */
function expectedOf(value: number | null, detail: CheckDetail | null): number | null {
  const difference = detail?.difference
  return value !== null && typeof difference === 'number' && Number.isFinite(difference) ? value - difference : null
}

export async function getAssignmentStatistics(
  database: Database,
  assignmentId: number,
  courseId?: number,
): Promise<AssignmentStatistics | null> {
  const found = await findAssignment(database, assignmentId, courseId)
  if (!found) return null
  const [items, graded] = await Promise.all([
    listItems(database, [assignmentId]),
    database
      .select({
        itemId: partResults.itemId,
        userId: partResults.userId,
        findName: partResults.findName,
        attempt: partResults.attempt,
        verdict: partResults.verdict,
        score: partResults.score,
        value: partResults.value,
        answer: partResults.answer,
        pitfallId: partResults.pitfallId,
        pitfallFeedback: partResults.pitfallFeedback,
        detail: partResults.detail,
      })
      .from(partResults)
      .where(and(eq(partResults.assignmentId, assignmentId), isNotNull(partResults.verdict))),
  ])

  const statItems = items.map((item) => {
    const mine = graded.filter((g) => g.itemId === item.id)
    const itemBest = new Map<number, number>()
    const finds = item.finds.map((f): FindStatistics => {
      const rows = mine.filter((g) => g.findName === f.name)
      const best = new Map<number, number>()
      let firstOf = 0
      let firstCorrect = 0
      for (const r of rows) {
        best.set(r.userId, Math.max(best.get(r.userId) ?? 0, r.score ?? 0))
        if (r.attempt === 1) {
          firstOf += 1
          if (r.verdict === 'correct') firstCorrect += 1
        }
      }
      for (const [userId, s] of best) itemBest.set(userId, (itemBest.get(userId) ?? 0) + s)
      const shares = f.share > 0 ? [...best.values()].map((s) => Math.min(1, s / f.share)) : []
      const incorrect = rows
        .filter((r) => r.verdict === 'incorrect')
        .map((r) => ({ ...r, expected: expectedOf(r.value, r.detail) }))
      const wrong = groupWrongAnswers(incorrect)
      const named = (g: WrongAnswerGroup): NamedGroup => ({
        ...g,
        pitfall: g.pitfall ? { ...g.pitfall, title: pitfallTitle(g.pitfall.id) } : null,
      })
      return {
        ...f,
        summary: summarise(shares),
        firstTry: { correct: firstCorrect, of: firstOf, share: firstOf > 0 ? firstCorrect / firstOf : null },
        wrongAnswers: wrong.map(named),
        wrongMultiples: groupWrongAnswersByMultiple(incorrect).map(named),
      }
    })
    const itemShares = item.points > 0 ? [...itemBest.values()].map((s) => Math.min(1, s / item.points)) : []
    return { position: item.position, title: item.title, points: item.points, summary: summarise(itemShares), finds }
  })

  return {
    assignment: {
      id: found.assignment.id,
      courseId: found.assignment.courseId,
      title: found.assignment.title,
      points: roundScore(items.reduce((a, i) => a + i.points, 0)),
      timeZone: found.timeZone,
    },
    gradedAnswers: graded.length,
    items: statItems,
  }
}
