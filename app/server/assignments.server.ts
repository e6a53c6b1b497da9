/**
 * Assignments as instructors set them and students see them: listing per course, one
 * assignment's detail, creating and editing (dates read in the course's time zone, problems
 * from the instructor's bank pinned to a version, which is frozen in the same transaction),
 * per-student extensions, and deleting an assignment nobody has answered. Releasing the key and
 * the grades live in releases.server.ts.
 *
 * Every change of dates or extensions writes an audit_events row.
 */
import { and, asc, desc, eq, inArray, isNull, or, sql } from 'drizzle-orm'
import { data } from 'react-router'
import { z } from 'zod'
import {
  attemptsAllowed,
  rulesOf,
  studentDueAt,
  submissionWindow,
  type StudentExtension,
  type SubmissionWindow,
} from '#app/domain/assignments/policy.ts'
import { findState, roundScore } from '#app/domain/assignments/scoring.ts'
import { canSeeProblem, type CourseRole } from '#app/domain/permissions.ts'
import { formatInZone, parseLocalDateTime, toLocalDateTimeValue } from '#app/lib/dates.ts'
import type { FieldErrors } from '#app/lib/form.ts'
import type { Db, Tx } from './db/client.server.ts'
import {
  assignmentItems,
  assignments,
  auditEvents,
  courses,
  extensions,
  memberships,
  problems,
  problemVersions,
  submissions,
  users,
  type Assignment,
} from './db/schema.server.ts'
import {
  checkWords,
  latestChecks,
  needsOverride,
  NEVER_CHECKED,
  refusalText,
  type VersionCheck,
} from './assignment-items.server.ts'
import { tryReadDefinition } from './definitions.server.ts'
import { listFindScores } from './grading.server.ts'
import { bankViewerFor, freezeProblemVersion, type BankViewer } from './problems.server.ts'
import type { SignedInUser } from './users.server.ts'

type Database = Db | Tx

// ---- Errors -------------------------------------------------------------------------------

/** The assignment does not exist in this course, or (for a student) has not opened yet. */
export class AssignmentNotFoundError extends Error {
  readonly status = 404
  constructor(message = 'There is no such assignment in this course.') {
    super(message)
    this.name = 'AssignmentNotFoundError'
  }
}

/** A student asked for an assignment that has not opened yet: the message says when it opens. */
export class AssignmentNotOpenError extends AssignmentNotFoundError {
  constructor(readonly opening: NotOpenInfo) {
    super(notOpenSentence(opening))
    this.name = 'AssignmentNotOpenError'
  }
}

export type NotOpenInfo = { title: string; opensAt: Date; timeZone: string }

export function notOpenSentence(o: NotOpenInfo): string {
  return `“${o.title}” opens ${formatInZone(o.opensAt, o.timeZone)}. Its problems appear here then.`
}

/** The assignment's title and opening when it exists in the course and has not opened yet; null otherwise. */
export async function notYetOpen(
  database: Database,
  opts: { courseId: number; assignmentId: number; now?: Date },
): Promise<NotOpenInfo | null> {
  if (!Number.isInteger(opts.assignmentId) || opts.assignmentId <= 0) return null
  const [row] = await database
    .select({ title: assignments.title, opensAt: assignments.opensAt, timeZone: courses.timeZone })
    .from(assignments)
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .where(and(eq(assignments.id, opts.assignmentId), eq(assignments.courseId, opts.courseId)))
    .limit(1)
  if (!row || row.opensAt.getTime() <= (opts.now ?? new Date()).getTime()) return null
  return row
}

/** The person may not do this to the assignment (only instructors change assignments). */
export class AssignmentPermissionError extends Error {
  readonly status = 403
  constructor(message = 'Only the course’s instructors can change its assignments.') {
    super(message)
    this.name = 'AssignmentPermissionError'
  }
}

async function roleInCourse(database: Database, userId: number, courseId: number): Promise<CourseRole | null> {
  const [row] = await database
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), eq(memberships.courseId, courseId)))
    .limit(1)
  return row?.role ?? null
}

export async function requireInstructor(database: Database, userId: number, courseId: number) {
  if ((await roleInCourse(database, userId, courseId)) !== 'instructor') throw new AssignmentPermissionError()
}

export async function courseZone(database: Database, courseId: number) {
  const [row] = await database
    .select({ timeZone: courses.timeZone, code: courses.code, title: courses.title })
    .from(courses)
    .where(eq(courses.id, courseId))
    .limit(1)
  if (!row) throw new AssignmentNotFoundError('There is no such course.')
  return row
}

export async function findAssignment(database: Database, courseId: number, assignmentId: number): Promise<Assignment> {
  if (!Number.isInteger(assignmentId) || assignmentId <= 0) throw new AssignmentNotFoundError()
  const [row] = await database
    .select()
    .from(assignments)
    .where(and(eq(assignments.id, assignmentId), eq(assignments.courseId, courseId)))
    .limit(1)
  if (!row) throw new AssignmentNotFoundError()
  return row
}

export { keyReleaseText, latePolicyText } from '#app/lib/assignment-text.ts'

// ---- Listing ------------------------------------------------------------------------------

export type AssignmentListRow = {
  id: number
  title: string
  opensAt: Date
  /** the assignment's due date; for a student, theirs (an extension's if they have one) */
  dueAt: Date
  itemCount: number
  maxScore: number
  gradesReleasedAt: Date | null
  /** students only */
  mine: { score: number; pending: number; window: SubmissionWindow; extended: boolean } | null
}

async function extensionsFor(
  database: Database,
  assignmentIds: number[],
  userId: number,
): Promise<Map<number, StudentExtension>> {
  if (assignmentIds.length === 0) return new Map()
  const rows = await database
    .select({ assignmentId: extensions.assignmentId, dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts })
    .from(extensions)
    .where(and(inArray(extensions.assignmentId, assignmentIds), eq(extensions.userId, userId)))
  return new Map(rows.map((r) => [r.assignmentId, { dueAt: r.dueAt, extraAttempts: r.extraAttempts }]))
}

/**
 * The course's assignments, by due date. Staff see all; students only those that have
 * opened, each with their due date (extension included), score so far and window.
 */
export async function listAssignmentsForCourse(
  database: Database,
  opts: { courseId: number; role: CourseRole; userId: number; now?: Date },
): Promise<AssignmentListRow[]> {
  const now = opts.now ?? new Date()
  const student = opts.role === 'student'
  const rows = await database
    .select({
      assignment: assignments,
      // Qualified by hand: Drizzle leaves columns unqualified in a select without joins, and
      // an unqualified "id" inside these subqueries would be the item's own id.
      itemCount: sql<number>`(select count(*) from ${assignmentItems} ai where ai.assignment_id = "assignments"."id")::int`,
      maxScore: sql<number>`(select coalesce(sum(ai.points), 0) from ${assignmentItems} ai where ai.assignment_id = "assignments"."id")::float8`,
    })
    .from(assignments)
    .where(
      and(
        eq(assignments.courseId, opts.courseId),
        student ? sql`${assignments.opensAt} <= ${now.toISOString()}` : undefined,
      ),
    )
    .orderBy(asc(assignments.dueAt), asc(assignments.id))
  const ids = rows.map((r) => r.assignment.id)
  const exts = student ? await extensionsFor(database, ids, opts.userId) : new Map<number, StudentExtension>()
  const scores = new Map<number, { score: number; pending: number }>()
  if (student) {
    for (const f of await listFindScores(database, { assignmentIds: ids, userId: opts.userId })) {
      const s = scores.get(f.assignmentId) ?? { score: 0, pending: 0 }
      s.score += f.score
      s.pending += f.pending
      scores.set(f.assignmentId, s)
    }
  }
  return rows.map(({ assignment: a, itemCount, maxScore }) => {
    const ext = exts.get(a.id) ?? null
    const rules = rulesOf(a)
    const s = scores.get(a.id)
    return {
      id: a.id,
      title: a.title,
      opensAt: a.opensAt,
      dueAt: student ? studentDueAt(rules, ext) : a.dueAt,
      itemCount,
      maxScore: Number(maxScore),
      gradesReleasedAt: a.gradesReleasedAt,
      mine: student
        ? {
            score: roundScore(s?.score ?? 0),
            pending: s?.pending ?? 0,
            window: submissionWindow(rules, ext, now),
            extended: ext?.dueAt != null,
          }
        : null,
    }
  })
}

// ---- One assignment -----------------------------------------------------------------------

export type ItemDetail = {
  id: number
  position: number
  problemId: number
  problemVersionId: number
  versionNumber: number
  title: string
  points: number
  /** staff: students have answered it, so its version and points change only by regrade */
  answered: boolean
  /** students only: their score, and whether every find is right or out of attempts */
  mine: { score: number; pending: number; finished: boolean; started: boolean } | null
}

export type AssignmentDetail = {
  assignment: Assignment
  items: ItemDetail[]
  maxScore: number
  timeZone: string
  /** students only */
  student: {
    extension: (StudentExtension & { reason: string }) | null
    dueAt: Date
    attempts: number
    window: SubmissionWindow
    total: number
  } | null
  /** staff only */
  staff: { extensionCount: number; studentCount: number } | null
}

/**
 * One assignment for a member of its course. Throws AssignmentNotFoundError when it is not
 * in the course, and AssignmentNotOpenError (saying when it opens) when a student asks before.
 */
export async function getAssignmentDetail(
  database: Database,
  opts: { courseId: number; assignmentId: number; role: CourseRole; userId: number; now?: Date },
): Promise<AssignmentDetail> {
  const now = opts.now ?? new Date()
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const isStudent = opts.role === 'student'
  const { timeZone } = await courseZone(database, opts.courseId)
  if (isStudent && a.opensAt.getTime() > now.getTime())
    throw new AssignmentNotOpenError({ title: a.title, opensAt: a.opensAt, timeZone })
  const itemRows = await database
    .select({
      id: assignmentItems.id,
      position: assignmentItems.position,
      problemId: assignmentItems.problemId,
      problemVersionId: assignmentItems.problemVersionId,
      versionNumber: problemVersions.number,
      definition: problemVersions.definition,
      points: assignmentItems.points,
      answered: sql<boolean>`exists (select 1 from ${submissions} where ${submissions.itemId} = ${assignmentItems.id})`,
    })
    .from(assignmentItems)
    .innerJoin(problemVersions, eq(problemVersions.id, assignmentItems.problemVersionId))
    .where(eq(assignmentItems.assignmentId, a.id))
    .orderBy(asc(assignmentItems.position))
  const maxScore = roundScore(itemRows.reduce((s, r) => s + r.points, 0))
  const rules = rulesOf(a)

  if (!isStudent) {
    const [counts] = await database
      .select({
        extensionCount: sql<number>`(select count(*) from ${extensions} where ${extensions.assignmentId} = ${a.id})::int`,
        studentCount: sql<number>`(select count(*) from ${memberships} where ${memberships.courseId} = ${a.courseId} and ${memberships.role} = 'student')::int`,
      })
      .from(sql`(select 1) as one`)
    return {
      assignment: a,
      items: itemRows.map((r) => ({ ...toItem(r, versionFacts(r)), answered: r.answered === true, mine: null })),
      maxScore,
      timeZone,
      student: null,
      staff: { extensionCount: counts?.extensionCount ?? 0, studentCount: counts?.studentCount ?? 0 },
    }
  }

  const [extRow] = await database
    .select({ dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts, reason: extensions.reason })
    .from(extensions)
    .where(and(eq(extensions.assignmentId, a.id), eq(extensions.userId, opts.userId)))
    .limit(1)
  const ext = extRow ?? null
  const attempts = attemptsAllowed(rules, ext)
  const finds = await listFindScores(database, { assignmentIds: [a.id], userId: opts.userId })
  const items = itemRows.map((r) => {
    const mineFinds = finds.filter((f) => f.itemId === r.id)
    const facts = versionFacts(r)
    const names = facts.findNames
    const finished =
      names.length > 0 &&
      names.every((name) => {
        const f = mineFinds.find((x) => x.findName === name)
        const state = findState({
          attemptsUsed: f?.attempts ?? 0,
          attemptsAllowed: attempts,
          anyCorrect: f?.correct ?? false,
          anyPending: (f?.pending ?? 0) > 0,
        })
        return state === 'correct' || state === 'out-of-attempts'
      })
    return {
      ...toItem(r, facts),
      answered: false,
      mine: {
        score: roundScore(mineFinds.reduce((s, f) => s + f.score, 0)),
        pending: mineFinds.reduce((s, f) => s + f.pending, 0),
        finished,
        started: mineFinds.length > 0,
      },
    }
  })
  return {
    assignment: a,
    items,
    maxScore,
    timeZone,
    student: {
      extension: ext,
      dueAt: studentDueAt(rules, ext),
      attempts,
      window: submissionWindow(rules, ext, now),
      total: roundScore(items.reduce((s, i) => s + (i.mine?.score ?? 0), 0)),
    },
    staff: null,
  }
}

type ItemRowOfVersion = {
  id: number
  position: number
  problemId: number
  problemVersionId: number
  versionNumber: number
  definition: unknown
  points: number
}

/**
 * The title and find names of the item's version. A version whose stored definition fails the
 * check still lists (untitled, with no finds), so the assignment page stays usable; the log
 * names the version (definitions.server.ts).
 */
function versionFacts(r: ItemRowOfVersion): { title: string; findNames: string[] } {
  const read = tryReadDefinition(r.definition, r.problemVersionId)
  return read.ok
    ? { title: read.definition.title, findNames: read.definition.finds.map((f) => f.name) }
    : { title: 'Untitled problem', findNames: [] }
}

function toItem(r: ItemRowOfVersion, facts: { title: string }) {
  return {
    id: r.id,
    position: r.position,
    problemId: r.problemId,
    problemVersionId: r.problemVersionId,
    versionNumber: r.versionNumber,
    title: facts.title,
    points: r.points,
  }
}

// ---- The form -----------------------------------------------------------------------------

/** One row of the problems table as typed: the chosen version, the points, and the item it edits. */
export type ItemRow = {
  itemId: string
  versionId: string
  points: string
  /** the id of the version the instructor assigns although its check failed, could not run, is running or never ran; an override of another version counts for nothing */
  override?: string
}

/** What the assignment form shows: every field as text, so that nothing typed is lost on an error. */
export type AssignmentFormState = {
  values: {
    title: string
    instructions: string
    opensAt: string
    dueAt: string
    attemptsPerFind: string
    latePolicy: string
    latePenaltyPercentPerDay: string
    lateDaysAllowed: string
    keyRelease: string
    /** days after the grades' release during which students may dispute; blank or missing: 7 for a new assignment, unchanged on edit */
    disputeDays: string
  }
  items: ItemRow[]
}

/** A bank problem the instructor may choose, with its versions (newest first). */
export type BankChoice = {
  problemId: number
  title: string
  versions: { id: number; number: number; savedAt: Date; author: string; check: VersionCheck }[]
}

/** An item students have answered: only a regrade changes its version or points. */
export type LockedItem = { itemId: number; position: number; title: string; versionNumber: number; points: number }

const ITEM_KEY = /^items\.(\d{1,3})\.(itemId|versionId|points|override)$/
export const MAX_ITEMS = 50

function text(form: FormData, name: string): string {
  const v = form.get(name)
  return typeof v === 'string' ? v : ''
}

/** The form's fields as typed (rows in the order of their index). */
export function assignmentFormFromData(form: FormData): AssignmentFormState {
  const rows = new Map<number, ItemRow>()
  for (const [key, value] of form.entries()) {
    const m = ITEM_KEY.exec(key)
    if (!m || typeof value !== 'string') continue
    const i = Number(m[1])
    const row = rows.get(i) ?? { itemId: '', versionId: '', points: '' }
    row[m[2] as keyof ItemRow] = value
    rows.set(i, row)
  }
  return {
    values: {
      title: text(form, 'title'),
      instructions: text(form, 'instructions'),
      opensAt: text(form, 'opensAt'),
      dueAt: text(form, 'dueAt'),
      attemptsPerFind: text(form, 'attemptsPerFind'),
      latePolicy: text(form, 'latePolicy'),
      latePenaltyPercentPerDay: text(form, 'latePenaltyPercentPerDay'),
      lateDaysAllowed: text(form, 'lateDaysAllowed'),
      keyRelease: text(form, 'keyRelease'),
      disputeDays: text(form, 'disputeDays'),
    },
    items: [...rows.entries()].sort((x, y) => x[0] - y[0]).map(([, r]) => r),
  }
}

/** A new assignment's starting values: opens at the next full hour, due a week later at 23:59, in the course's zone. */
export function newAssignmentForm(timeZone: string, now = new Date()): AssignmentFormState {
  const nextHour = new Date(Math.ceil(now.getTime() / 3_600_000) * 3_600_000)
  const opens = toLocalDateTimeValue(nextHour, timeZone)
  const due = toLocalDateTimeValue(new Date(nextHour.getTime() + 7 * 86_400_000), timeZone).slice(0, 10) + 'T23:59'
  return {
    values: {
      title: '',
      instructions: '',
      opensAt: opens,
      dueAt: due,
      attemptsPerFind: '3',
      latePolicy: 'closed',
      latePenaltyPercentPerDay: '10',
      lateDaysAllowed: '3',
      keyRelease: 'after-due',
      disputeDays: String(DEFAULT_DISPUTE_DAYS),
    },
    items: [{ itemId: '', versionId: '', points: '10' }],
  }
}

function formOfAssignment(
  a: Assignment,
  items: { id: number; problemVersionId: number; points: number }[],
  timeZone: string,
): AssignmentFormState {
  return {
    values: {
      title: a.title,
      instructions: a.instructions,
      opensAt: toLocalDateTimeValue(a.opensAt, timeZone),
      dueAt: toLocalDateTimeValue(a.dueAt, timeZone),
      attemptsPerFind: String(a.attemptsPerFind),
      latePolicy: a.latePolicy,
      latePenaltyPercentPerDay: String(a.latePenaltyPercentPerDay),
      lateDaysAllowed: String(a.lateDaysAllowed),
      keyRelease: a.keyRelease,
      disputeDays: String(a.disputeDays),
    },
    items: items.map((i) => ({
      itemId: String(i.id),
      versionId: String(i.problemVersionId),
      points: String(i.points),
    })),
  }
}

/** Adds an empty row, or removes row `index` (an answered item stays: it is refused with a message). */
export function changeRows(
  state: AssignmentFormState,
  change: { add: true } | { remove: number },
  locked: readonly LockedItem[] = [],
): { state: AssignmentFormState; fieldErrors: FieldErrors } {
  if ('add' in change) {
    if (state.items.length >= MAX_ITEMS)
      return { state, fieldErrors: { items: `An assignment holds at most ${MAX_ITEMS} problems.` } }
    return {
      state: { ...state, items: [...state.items, { itemId: '', versionId: '', points: '10' }] },
      fieldErrors: {},
    }
  }
  const row = state.items[change.remove]
  if (!row) return { state, fieldErrors: {} }
  if (locked.some((l) => String(l.itemId) === row.itemId)) {
    return {
      state,
      fieldErrors: {
        [`items.${change.remove}.versionId`]: 'Students have answered this problem, so it stays in the assignment.',
      },
    }
  }
  return { state: { ...state, items: state.items.filter((_, i) => i !== change.remove) }, fieldErrors: {} }
}

/** Every problem the viewer can see in the bank and not archived, with its versions, plus any version already on the assignment. */
export async function listBankChoices(
  database: Database,
  viewer: BankViewer,
  keepVersionIds: readonly number[] = [],
): Promise<BankChoice[]> {
  const rows = await database
    .select({
      problemId: problems.id,
      title: problems.title,
      ownerId: problems.ownerId,
      visibility: problems.visibility,
      departmentId: problems.departmentId,
      versionId: problemVersions.id,
      number: problemVersions.number,
      savedAt: problemVersions.createdAt,
      author: users.name,
    })
    .from(problems)
    .innerJoin(problemVersions, eq(problemVersions.problemId, problems.id))
    .innerJoin(users, eq(users.id, problemVersions.createdBy))
    .where(
      and(
        viewer.isAdmin
          ? undefined
          : or(
              eq(problems.ownerId, viewer.id),
              eq(problems.visibility, 'installation'),
              viewer.departmentId === null
                ? undefined
                : and(eq(problems.visibility, 'department'), eq(problems.departmentId, viewer.departmentId)),
              keepVersionIds.length ? inArray(problemVersions.id, [...keepVersionIds]) : undefined,
            ),
        // Archived problems are not offered; a version already on the assignment stays choosable.
        keepVersionIds.length
          ? or(isNull(problems.archivedAt), inArray(problemVersions.id, [...keepVersionIds]))
          : isNull(problems.archivedAt),
      ),
    )
    .orderBy(sql`lower(${problems.title})`, asc(problems.id), desc(problemVersions.number))
  const byProblem = new Map<number, BankChoice>()
  const visible = rows.filter((r) => canSeeProblem(viewer, r) || keepVersionIds.includes(r.versionId))
  const checks = await latestChecks(
    database,
    visible.map((r) => r.versionId),
  )
  for (const r of visible) {
    const choice = byProblem.get(r.problemId) ?? { problemId: r.problemId, title: r.title, versions: [] }
    choice.versions.push({
      id: r.versionId,
      number: r.number,
      savedAt: r.savedAt,
      author: r.author,
      check: checks.get(r.versionId) ?? NEVER_CHECKED,
    })
    byProblem.set(r.problemId, choice)
  }
  return [...byProblem.values()]
}

/** Days after the grades' release during which students may dispute a verdict (issue #7). */
export const DEFAULT_DISPUTE_DAYS = 7
export const MAX_DISPUTE_DAYS = 60

const LocalDateTime = z.string().trim().min(1, 'Enter a date and time.')
const Int = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Enter ${label}.`)
    .regex(/^\d+$/, `Enter ${label} as a whole number.`)
    .transform(Number)
    .pipe(
      z
        .number()
        .min(min, `${label[0]!.toUpperCase()}${label.slice(1)} must be at least ${min}.`)
        .max(max, `${label[0]!.toUpperCase()}${label.slice(1)} must be at most ${max}.`),
    )
const Num = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Enter ${label}.`)
    .regex(/^\d+(\.\d+)?$/, `Enter ${label} as a number such as 10 or 2.5.`)
    .transform(Number)
    .pipe(
      z
        .number()
        .min(min, `${label[0]!.toUpperCase()}${label.slice(1)} must be at least ${min}.`)
        .max(max, `${label[0]!.toUpperCase()}${label.slice(1)} must be at most ${max}.`),
    )

export const AssignmentSettingsSchema = z
  .object({
    title: z.string().trim().min(1, 'Give the assignment a title.').max(200, 'Keep the title under 200 characters.'),
    instructions: z.string().max(20_000, 'Keep the instructions under 20,000 characters.'),
    opensAt: LocalDateTime,
    dueAt: LocalDateTime,
    attemptsPerFind: Int('the attempts per find', 1, 100),
    latePolicy: z.enum(['closed', 'penalty'], { message: 'Choose what happens after the due date.' }),
    latePenaltyPercentPerDay: z.string(),
    lateDaysAllowed: z.string(),
    keyRelease: z.enum(['after-due', 'manual'], { message: 'Choose when the key is released.' }),
    disputeDays: z.string().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.disputeDays !== undefined && v.disputeDays.trim() !== '') {
      const d = Int('the days for disputes', 0, MAX_DISPUTE_DAYS).safeParse(v.disputeDays)
      if (!d.success) ctx.addIssue({ code: 'custom', path: ['disputeDays'], message: d.error.issues[0]!.message })
    }
    if (v.latePolicy !== 'penalty') return
    const pct = Num('the penalty per day', 0, 100).safeParse(v.latePenaltyPercentPerDay)
    if (!pct.success)
      ctx.addIssue({ code: 'custom', path: ['latePenaltyPercentPerDay'], message: pct.error.issues[0]!.message })
    const days = Int('the days late accepted', 0, 60).safeParse(v.lateDaysAllowed)
    if (!days.success)
      ctx.addIssue({ code: 'custom', path: ['lateDaysAllowed'], message: days.error.issues[0]!.message })
  })

type CheckedItem = { itemId: number | null; problemId: number; versionId: number; points: number }
/** A version put on the assignment by the instructor's override of its check (for the audit log). */
type CheckOverride = { position: number; versionId: number; check: string }
type CheckedAssignment = {
  title: string
  instructions: string
  opensAt: Date
  dueAt: Date
  attemptsPerFind: number
  latePolicy: 'closed' | 'penalty'
  latePenaltyPercentPerDay: number
  lateDaysAllowed: number
  keyRelease: 'after-due' | 'manual'
  /** null: not given (a form without the field); a new assignment takes the default, an edit keeps its value */
  disputeDays: number | null
  items: CheckedItem[]
  overrides: CheckOverride[]
}

export type SaveResult = { ok: true; assignmentId: number } | { ok: false; fieldErrors: FieldErrors; formError: string }

const SUMMARY = 'The assignment was not saved. Correct the fields marked below.'

/**
 * Checks the whole form: settings, dates in the course's zone, and each problem row against
 * what the viewer may use (their bank, or a version already on this assignment). Answered
 * items keep their stored version and points whatever the form says.
 */
async function checkForm(
  database: Database,
  opts: {
    state: AssignmentFormState
    timeZone: string
    viewer: BankViewer
    existing: { id: number; problemVersionId: number; points: number; answered: boolean }[]
  },
): Promise<{ ok: true; value: CheckedAssignment } | { ok: false; fieldErrors: FieldErrors }> {
  const fieldErrors: FieldErrors = {}
  const parsed = AssignmentSettingsSchema.safeParse(opts.state.values)
  if (!parsed.success)
    for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0] ?? 'title')] ??= issue.message
  const opensAt = parseLocalDateTime(opts.state.values.opensAt, opts.timeZone)
  const dueAt = parseLocalDateTime(opts.state.values.dueAt, opts.timeZone)
  const badDate = `Enter a date and time that exists in ${opts.timeZone} (clock changes skip an hour).`
  if (!fieldErrors.opensAt && !opensAt) fieldErrors.opensAt = badDate
  if (!fieldErrors.dueAt && !dueAt) fieldErrors.dueAt = badDate
  if (opensAt && dueAt && dueAt.getTime() <= opensAt.getTime())
    fieldErrors.dueAt ??= 'The due date must be after the opening date.'

  const rows = opts.state.items
  if (rows.length === 0) fieldErrors.items = 'Add at least one problem.'
  if (rows.length > MAX_ITEMS) fieldErrors.items = `An assignment holds at most ${MAX_ITEMS} problems.`
  const typed = rows
    .map((r) => (/^\d{1,9}$/.test(r.versionId.trim()) ? Number(r.versionId.trim()) : null))
    .filter((x): x is number => x !== null)
  const versionIds = [...new Set([...typed, ...opts.existing.map((e) => e.problemVersionId)])]
  const versionRows = versionIds.length
    ? await database
        .select({
          versionId: problemVersions.id,
          problemId: problems.id,
          ownerId: problems.ownerId,
          visibility: problems.visibility,
          departmentId: problems.departmentId,
          archivedAt: problems.archivedAt,
        })
        .from(problemVersions)
        .innerJoin(problems, eq(problems.id, problemVersions.problemId))
        .where(inArray(problemVersions.id, versionIds))
    : []
  const checks = await latestChecks(
    database,
    versionRows.map((r) => r.versionId),
  )
  const overrides: CheckOverride[] = []
  const existingById = new Map(opts.existing.map((e) => [e.id, e]))
  const onAssignment = new Set(opts.existing.map((e) => e.problemVersionId))
  const items: CheckedItem[] = []
  const seenProblems = new Map<number, number>()
  rows.forEach((row, i) => {
    const prev = /^\d{1,9}$/.test(row.itemId) ? existingById.get(Number(row.itemId)) : undefined
    let versionId: number
    let points: number
    if (prev?.answered) {
      versionId = prev.problemVersionId
      points = prev.points
    } else {
      const v = versionRows.find((x) => String(x.versionId) === row.versionId.trim())
      if (row.versionId.trim() === '') {
        fieldErrors[`items.${i}.versionId`] = 'Choose a problem from the bank.'
        return
      }
      if (!v || (!canSeeProblem(opts.viewer, v) && !onAssignment.has(v.versionId))) {
        fieldErrors[`items.${i}.versionId`] = 'That problem is not in your bank or shared with you; choose another.'
        return
      }
      if (v.archivedAt && !onAssignment.has(v.versionId)) {
        fieldErrors[`items.${i}.versionId`] =
          'That problem is archived; restore it in the bank first, or choose another.'
        return
      }
      const p = Num('the points', 0, 10_000).safeParse(row.points)
      if (!p.success) {
        fieldErrors[`items.${i}.points`] = p.error.issues[0]!.message
        return
      }
      // A new row, or a row switched to another version, needs a passed check or the override;
      // a row left on its stored version does not ask again.
      if (prev?.problemVersionId !== v.versionId) {
        const check = checks.get(v.versionId) ?? NEVER_CHECKED
        if (needsOverride(check)) {
          if (row.override?.trim() !== String(v.versionId)) {
            fieldErrors[`items.${i}.versionId`] = refusalText(check)
            return
          }
          overrides.push({ position: i + 1, versionId: v.versionId, check: checkWords(check) })
        }
      }
      versionId = v.versionId
      points = p.data
    }
    const problemId = versionRows.find((x) => x.versionId === versionId)?.problemId
    if (problemId === undefined) {
      fieldErrors[`items.${i}.versionId`] = 'Choose a problem from the bank.'
      return
    }
    const twin = seenProblems.get(problemId)
    if (twin !== undefined) {
      fieldErrors[`items.${i}.versionId`] =
        `This problem is already problem ${twin + 1}; each student would get the same numbers twice.`
      return
    }
    seenProblems.set(problemId, i)
    items.push({ itemId: prev ? prev.id : null, problemId, versionId, points })
  })
  // Rows of answered items that the form no longer lists: refuse rather than delete answers.
  const kept = new Set(items.map((i) => i.itemId))
  const dropped = opts.existing.filter(
    (e) => e.answered && !kept.has(e.id) && !rows.some((r) => r.itemId === String(e.id)),
  )
  if (dropped.length) fieldErrors.items ??= 'Problems students have answered cannot be removed.'

  if (!parsed.success || Object.values(fieldErrors).some(Boolean) || !opensAt || !dueAt)
    return { ok: false, fieldErrors }
  const v = parsed.data
  const penalty = v.latePolicy === 'penalty'
  return {
    ok: true,
    value: {
      title: v.title,
      instructions: v.instructions.trim(),
      opensAt,
      dueAt,
      attemptsPerFind: v.attemptsPerFind,
      latePolicy: v.latePolicy,
      latePenaltyPercentPerDay: penalty ? Number(v.latePenaltyPercentPerDay.trim()) : 0,
      lateDaysAllowed: penalty ? Number(v.lateDaysAllowed.trim()) : 0,
      keyRelease: v.keyRelease,
      disputeDays: v.disputeDays === undefined || v.disputeDays.trim() === '' ? null : Number(v.disputeDays.trim()),
      items,
      overrides,
    },
  }
}

async function existingItems(database: Database, assignmentId: number) {
  const rows = await database
    .select({
      id: assignmentItems.id,
      position: assignmentItems.position,
      problemVersionId: assignmentItems.problemVersionId,
      versionNumber: problemVersions.number,
      title: problems.title,
      points: assignmentItems.points,
      answered: sql<boolean>`exists (select 1 from ${submissions} where ${submissions.itemId} = ${assignmentItems.id})`,
    })
    .from(assignmentItems)
    .innerJoin(problemVersions, eq(problemVersions.id, assignmentItems.problemVersionId))
    .innerJoin(problems, eq(problems.id, assignmentItems.problemId))
    .where(eq(assignmentItems.assignmentId, assignmentId))
    .orderBy(asc(assignmentItems.position))
  return rows.map((r) => ({ ...r, answered: r.answered === true }))
}

/** What the new-assignment page needs: the course's zone, starting values and the bank. */
export async function getNewAssignmentForm(
  database: Database,
  opts: { courseId: number; user: SignedInUser; now?: Date },
) {
  await requireInstructor(database, opts.user.id, opts.courseId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const choices = await listBankChoices(database, await bankViewerFor(database, opts.user))
  return { timeZone, state: newAssignmentForm(timeZone, opts.now), choices, locked: [] as LockedItem[] }
}

/** What the edit page needs: the stored assignment as form values, the bank, and the answered items. */
export async function getEditAssignmentForm(
  database: Database,
  opts: { courseId: number; assignmentId: number; user: SignedInUser },
) {
  await requireInstructor(database, opts.user.id, opts.courseId)
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const items = await existingItems(database, a.id)
  const choices = await listBankChoices(
    database,
    await bankViewerFor(database, opts.user),
    items.map((i) => i.problemVersionId),
  )
  // Which version each item holds now: keeping it asks for no override of its check.
  const stored: Record<string, string> = Object.fromEntries(
    items.map((i) => [String(i.id), String(i.problemVersionId)]),
  )
  return {
    assignment: a,
    timeZone,
    state: formOfAssignment(a, items, timeZone),
    choices,
    locked: lockedOf(items),
    stored,
  }
}

function lockedOf(items: Awaited<ReturnType<typeof existingItems>>): LockedItem[] {
  return items
    .filter((i) => i.answered)
    .map((i) => ({
      itemId: i.id,
      position: i.position,
      title: i.title,
      versionNumber: i.versionNumber,
      points: i.points,
    }))
}

export async function listLockedItems(database: Database, assignmentId: number): Promise<LockedItem[]> {
  return lockedOf(await existingItems(database, assignmentId))
}

/** The bank as the form shows it, for re-rendering after an error or a row change. */
export async function bankChoicesFor(database: Database, opts: { user: SignedInUser; assignmentId?: number }) {
  const keep = opts.assignmentId
    ? (await existingItems(database, opts.assignmentId)).map((i) => i.problemVersionId)
    : []
  return listBankChoices(database, await bankViewerFor(database, opts.user), keep)
}

/** Creates the assignment and its items, freezing each version used, in one transaction. */
export async function createAssignment(
  database: Db,
  opts: { courseId: number; user: SignedInUser; state: AssignmentFormState },
): Promise<SaveResult> {
  await requireInstructor(database, opts.user.id, opts.courseId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const viewer = await bankViewerFor(database, opts.user)
  const checked = await checkForm(database, { state: opts.state, timeZone, viewer, existing: [] })
  if (!checked.ok) return { ok: false, fieldErrors: checked.fieldErrors, formError: SUMMARY }
  const { items, overrides, disputeDays, ...rest } = checked.value
  const settings = { ...rest, disputeDays: disputeDays ?? DEFAULT_DISPUTE_DAYS }
  const assignmentId = await database.transaction(async (tx) => {
    const [row] = await tx
      .insert(assignments)
      .values({ courseId: opts.courseId, createdBy: opts.user.id, ...settings })
      .returning({ id: assignments.id })
    await tx.insert(assignmentItems).values(
      items.map((it, i) => ({
        assignmentId: row!.id,
        position: i + 1,
        problemId: it.problemId,
        problemVersionId: it.versionId,
        points: it.points,
      })),
    )
    for (const versionId of new Set(items.map((i) => i.versionId))) await freezeProblemVersion(tx, versionId)
    if (overrides.length)
      await auditCheckOverride(tx, { actorId: opts.user.id, courseId: opts.courseId, assignmentId: row!.id, overrides })
    return row!.id
  })
  return { ok: true, assignmentId }
}

/** One audit row per save that assigned versions over their check: which rows, which versions, what the check said. */
async function auditCheckOverride(
  tx: Tx,
  o: { actorId: number; courseId: number; assignmentId: number; overrides: CheckOverride[] },
) {
  await tx.insert(auditEvents).values({
    actorId: o.actorId,
    courseId: o.courseId,
    assignmentId: o.assignmentId,
    kind: 'assignment-check-overridden',
    before: {},
    after: { items: o.overrides },
    note: o.overrides.map((x) => `Problem ${x.position} assigned although: ${x.check}`).join('; '),
  })
}

const SETTING_KEYS = [
  'title',
  'instructions',
  'opensAt',
  'dueAt',
  'attemptsPerFind',
  'latePolicy',
  'latePenaltyPercentPerDay',
  'lateDaysAllowed',
  'keyRelease',
  'disputeDays',
] as const

/**
 * Saves the edit: settings, and the problem rows (new rows inserted, removed unanswered rows
 * deleted, order renumbered). Answered items keep version and points. Writes one
 * 'assignment-changed' audit row with what changed.
 */
export async function updateAssignment(
  database: Db,
  opts: { courseId: number; assignmentId: number; user: SignedInUser; state: AssignmentFormState },
): Promise<SaveResult> {
  await requireInstructor(database, opts.user.id, opts.courseId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const viewer = await bankViewerFor(database, opts.user)
  return database.transaction(async (tx) => {
    // Locked so that two saves of the same assignment do not interleave their item changes.
    const [current] = await tx
      .select()
      .from(assignments)
      .where(and(eq(assignments.id, opts.assignmentId), eq(assignments.courseId, opts.courseId)))
      .for('update')
    if (!current) throw new AssignmentNotFoundError()
    const existing = await existingItems(tx, current.id)
    const checked = await checkForm(tx, { state: opts.state, timeZone, viewer, existing })
    if (!checked.ok) return { ok: false as const, fieldErrors: checked.fieldErrors, formError: SUMMARY }
    const { items, overrides, disputeDays, ...rest } = checked.value
    const settings = { ...rest, disputeDays: disputeDays ?? current.disputeDays }

    const before: Record<string, unknown> = {}
    const after: Record<string, unknown> = {}
    for (const key of SETTING_KEYS) {
      const was = current[key] instanceof Date ? (current[key] as Date).toISOString() : current[key]
      const now = settings[key] instanceof Date ? (settings[key] as Date).toISOString() : settings[key]
      if (was !== now) {
        before[key] = was
        after[key] = now
      }
    }
    const summary = (list: { versionId: number; points: number }[]) =>
      list.map((i) => ({ versionId: i.versionId, points: i.points }))
    const oldItems = summary(existing.map((e) => ({ versionId: e.problemVersionId, points: e.points })))
    const newItems = summary(items)
    if (JSON.stringify(oldItems) !== JSON.stringify(newItems)) {
      before.items = oldItems
      after.items = newItems
    }

    await tx
      .update(assignments)
      .set({ ...settings, updatedAt: new Date() })
      .where(eq(assignments.id, current.id))
    const keptIds = new Set(items.map((i) => i.itemId).filter((x): x is number => x !== null))
    const removed = existing.filter((e) => !keptIds.has(e.id)).map((e) => e.id)
    if (removed.length)
      await tx
        .delete(assignmentItems)
        .where(and(eq(assignmentItems.assignmentId, current.id), inArray(assignmentItems.id, removed)))
    for (const [i, it] of items.entries()) {
      if (it.itemId !== null) {
        await tx
          .update(assignmentItems)
          .set({ position: i + 1, problemId: it.problemId, problemVersionId: it.versionId, points: it.points })
          .where(eq(assignmentItems.id, it.itemId))
      } else {
        await tx.insert(assignmentItems).values({
          assignmentId: current.id,
          position: i + 1,
          problemId: it.problemId,
          problemVersionId: it.versionId,
          points: it.points,
        })
      }
    }
    for (const versionId of new Set(items.map((i) => i.versionId))) await freezeProblemVersion(tx, versionId)
    if (Object.keys(after).length) {
      await tx.insert(auditEvents).values({
        actorId: opts.user.id,
        courseId: opts.courseId,
        assignmentId: current.id,
        kind: 'assignment-changed',
        before,
        after,
      })
    }
    if (overrides.length)
      await auditCheckOverride(tx, {
        actorId: opts.user.id,
        courseId: opts.courseId,
        assignmentId: current.id,
        overrides,
      })
    return { ok: true as const, assignmentId: current.id }
  })
}

// ---- Extensions ---------------------------------------------------------------------------

export type ExtensionRow = {
  userId: number
  name: string
  email: string
  section: string | null
  dueAt: Date | null
  extraAttempts: number
  reason: string
}

/** The course's students, each with their extension on this assignment if any. */
export async function listExtensions(database: Database, opts: { courseId: number; assignmentId: number }) {
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const rows = await database
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      section: memberships.section,
      dueAt: extensions.dueAt,
      extraAttempts: extensions.extraAttempts,
      reason: extensions.reason,
      hasExtension: sql<boolean>`${extensions.id} is not null`,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .leftJoin(extensions, and(eq(extensions.userId, users.id), eq(extensions.assignmentId, a.id)))
    .where(and(eq(memberships.courseId, opts.courseId), eq(memberships.role, 'student')))
    .orderBy(asc(users.name), asc(users.id))
  const students = rows.map((r) => ({ userId: r.userId, name: r.name, email: r.email, section: r.section }))
  const granted: ExtensionRow[] = rows
    .filter((r) => r.hasExtension)
    .map((r) => ({
      userId: r.userId,
      name: r.name,
      email: r.email,
      section: r.section,
      dueAt: r.dueAt,
      extraAttempts: r.extraAttempts ?? 0,
      reason: r.reason ?? '',
    }))
  return { assignment: a, timeZone, students, extensions: granted }
}

export const ExtensionFormSchema = z.object({
  userId: z
    .string()
    .regex(/^\d{1,9}$/, 'Choose a student.')
    .transform(Number),
  dueAt: z.string().trim(),
  extraAttempts: z
    .string()
    .trim()
    .transform((s) => (s === '' ? '0' : s))
    .pipe(
      z
        .string()
        .regex(/^\d{1,3}$/, 'Enter extra attempts as a whole number from 0 to 100.')
        .transform(Number),
    )
    .pipe(z.number().max(100, 'At most 100 extra attempts.')),
  reason: z.string().trim().max(500, 'Keep the reason under 500 characters.'),
})
export type ExtensionForm = z.infer<typeof ExtensionFormSchema>

export type ExtensionResult = { ok: true } | { ok: false; fieldErrors: FieldErrors }

/**
 * Gives a student a later due date and/or extra attempts (replacing any extension they had),
 * with an 'extension' audit row. The due date is read in the course's zone.
 */
export async function setExtension(
  database: Db,
  opts: { courseId: number; assignmentId: number; actorId: number; input: ExtensionForm },
): Promise<ExtensionResult> {
  await requireInstructor(database, opts.actorId, opts.courseId)
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const fieldErrors: FieldErrors = {}
  if ((await roleInCourse(database, opts.input.userId, opts.courseId)) !== 'student')
    fieldErrors.userId = 'Choose a student of this course.'
  let dueAt: Date | null = null
  if (opts.input.dueAt !== '') {
    dueAt = parseLocalDateTime(opts.input.dueAt, timeZone)
    if (!dueAt) fieldErrors.dueAt = `Enter a date and time that exists in ${timeZone}.`
    else if (dueAt.getTime() <= a.dueAt.getTime())
      fieldErrors.dueAt = `An extension’s due date must be after the assignment’s (${formatInZone(a.dueAt, timeZone)}).`
  }
  if (dueAt === null && !fieldErrors.dueAt && opts.input.extraAttempts === 0)
    fieldErrors.dueAt = 'Give a later due date, extra attempts, or both.'
  if (Object.keys(fieldErrors).length) return { ok: false, fieldErrors }
  await database.transaction(async (tx) => {
    const [prev] = await tx
      .select({ dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts, reason: extensions.reason })
      .from(extensions)
      .where(and(eq(extensions.assignmentId, a.id), eq(extensions.userId, opts.input.userId)))
      .for('update')
    const values = { dueAt, extraAttempts: opts.input.extraAttempts, reason: opts.input.reason }
    await tx
      .insert(extensions)
      .values({ assignmentId: a.id, userId: opts.input.userId, createdBy: opts.actorId, ...values })
      .onConflictDoUpdate({
        target: [extensions.assignmentId, extensions.userId],
        set: { ...values, updatedAt: new Date() },
      })
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      assignmentId: a.id,
      userId: opts.input.userId,
      kind: 'extension',
      before: prev
        ? { dueAt: prev.dueAt?.toISOString() ?? null, extraAttempts: prev.extraAttempts, reason: prev.reason }
        : null,
      after: { dueAt: dueAt?.toISOString() ?? null, extraAttempts: values.extraAttempts, reason: values.reason },
      note: opts.input.reason,
    })
  })
  return { ok: true }
}

/** Takes a student's extension away (an 'extension' audit row with after null). False when they had none. */
export async function removeExtension(
  database: Db,
  opts: { courseId: number; assignmentId: number; actorId: number; userId: number },
): Promise<boolean> {
  await requireInstructor(database, opts.actorId, opts.courseId)
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  return database.transaction(async (tx) => {
    const [gone] = await tx
      .delete(extensions)
      .where(and(eq(extensions.assignmentId, a.id), eq(extensions.userId, opts.userId)))
      .returning({ dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts, reason: extensions.reason })
    if (!gone) return false
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      assignmentId: a.id,
      userId: opts.userId,
      kind: 'extension',
      before: { dueAt: gone.dueAt?.toISOString() ?? null, extraAttempts: gone.extraAttempts, reason: gone.reason },
      after: null,
    })
    return true
  })
}

// ---- Deleting -----------------------------------------------------------------------------

/** The assignment cannot be deleted: somebody has answered it. */
export class AssignmentInUseError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 409 = 409,
  ) {
    super(message)
    this.name = 'AssignmentInUseError'
  }
}

/** What deleting the assignment would remove, for the confirmation; `answered` when it cannot be deleted. */
export async function deletionSummary(database: Database, opts: { courseId: number; assignmentId: number }) {
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const [row] = await database
    .select({
      items: sql<number>`(select count(*) from ${assignmentItems} where ${assignmentItems.assignmentId} = ${a.id})::int`,
      extensions: sql<number>`(select count(*) from ${extensions} where ${extensions.assignmentId} = ${a.id})::int`,
      submissions: sql<number>`(select count(*) from ${submissions} where ${submissions.assignmentId} = ${a.id})::int`,
    })
    .from(sql`(select 1) as one`)
  return {
    title: a.title,
    items: row?.items ?? 0,
    extensions: row?.extensions ?? 0,
    answered: (row?.submissions ?? 0) > 0,
  }
}

/**
 * Deletes an assignment nobody has answered, with an 'assignment-deleted' audit row. The row is
 * locked first, so a submission being stored at that moment either lands before (and the
 * deletion is refused) or waits and is refused itself.
 */
export async function deleteAssignment(
  database: Db,
  opts: { courseId: number; assignmentId: number; actorId: number },
): Promise<{ title: string }> {
  await requireInstructor(database, opts.actorId, opts.courseId)
  return database.transaction(async (tx) => {
    const [a] = await tx
      .select()
      .from(assignments)
      .where(and(eq(assignments.id, opts.assignmentId), eq(assignments.courseId, opts.courseId)))
      .for('update')
    if (!a) throw new AssignmentNotFoundError()
    const summary = await deletionSummary(tx, opts)
    if (summary.answered)
      throw new AssignmentInUseError(
        `“${a.title}” cannot be deleted: students have answered it, and their work is kept. Change its dates instead, or leave it unreleased.`,
      )
    await tx.delete(assignments).where(eq(assignments.id, a.id))
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      assignmentId: a.id,
      kind: 'assignment-deleted',
      before: {
        title: a.title,
        opensAt: a.opensAt.toISOString(),
        dueAt: a.dueAt.toISOString(),
        items: summary.items,
        extensions: summary.extensions,
      },
      after: null,
    })
    return { title: a.title }
  })
}

/** A student's due date in words, with the zone, for screens and mails. */
export function dueText(dueAt: Date, timeZone: string): string {
  return formatInZone(dueAt, timeZone)
}

// ---- The form's action (new and edit pages) ------------------------------------------------

export type AssignmentFormAnswer = {
  state: AssignmentFormState
  fieldErrors: FieldErrors
  formError?: string
  nonce: string
}

const IntentSchema = z.union([z.literal('save'), z.literal('add-item'), z.string().regex(/^remove-item:\d{1,3}$/)])

function formAnswer(
  state: AssignmentFormState,
  fieldErrors: FieldErrors = {},
  formError?: string,
): AssignmentFormAnswer {
  // A fresh nonce remounts the form, so refilled values replace what the browser kept.
  return { state, fieldErrors, ...(formError ? { formError } : {}), nonce: crypto.randomUUID() }
}

/**
 * One submission of the assignment form: adding or removing a row answers with the form as
 * typed; saving calls `save` and answers with the id, or with the errors (status 400).
 * Permission errors from `save` propagate (the route turns them into 403/404 pages).
 */
export async function runAssignmentFormAction(
  form: FormData,
  opts: { locked: readonly LockedItem[]; save: (state: AssignmentFormState) => Promise<SaveResult> },
): Promise<{ status: 200 | 400; answer: AssignmentFormAnswer } | { status: 'saved'; assignmentId: number }> {
  const state = assignmentFormFromData(form)
  const intent = IntentSchema.safeParse(form.get('intent'))
  if (!intent.success)
    return { status: 400, answer: formAnswer(state, { title: 'Use one of the buttons of the form.' }, SUMMARY) }
  if (intent.data === 'add-item') {
    const changed = changeRows(state, { add: true }, opts.locked)
    return { status: 200, answer: formAnswer(changed.state, changed.fieldErrors) }
  }
  if (intent.data.startsWith('remove-item:')) {
    const changed = changeRows(state, { remove: Number(intent.data.slice('remove-item:'.length)) }, opts.locked)
    return { status: 200, answer: formAnswer(changed.state, changed.fieldErrors) }
  }
  const result = await opts.save(state)
  if (result.ok) return { status: 'saved', assignmentId: result.assignmentId }
  return { status: 400, answer: formAnswer(state, result.fieldErrors, result.formError) }
}

/** Awaits `work`, turning this module's typed errors into the error page (403/404); anything else is rethrown. */
export async function orErrorPage<T>(work: Promise<T>): Promise<T> {
  try {
    return await work
  } catch (e) {
    if (
      e instanceof AssignmentNotFoundError ||
      e instanceof AssignmentPermissionError ||
      e instanceof AssignmentInUseError
    )
      throw data(e.message, { status: e.status })
    throw e
  }
}
