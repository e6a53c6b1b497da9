/**
 * Assignments as instructors set them and students see them: listing per course, one
 * assignment's detail, creating and editing (dates read in the course's time zone, problems
 * from the instructor's bank pinned to a version, which is frozen in the same transaction),
 * and deleting an assignment nobody has answered. Releasing the key and the grades live in
 * releases.server.ts.
 *
 * Beside it: assignment-access.server.ts (finding an assignment, who may change it, the
 * errors the pages answer with), assignment-form.server.ts (the form's fields and one
 * submission of it), assignment-extensions.server.ts (per-student extensions) and
 * error-page.server.ts (orErrorPage). Their names stay importable from here.
 *
 * Every change of dates or extensions writes an audit_events row.
 */
import { and, asc, desc, eq, inArray, isNull, or, sql } from 'drizzle-orm'
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
import { formatInZone, parseLocalDateTime } from '#app/lib/dates.ts'
import type { FieldErrors } from '#app/lib/form.ts'
import {
  AssignmentInUseError,
  AssignmentNotFoundError,
  AssignmentNotOpenError,
  courseZone,
  findAssignment,
  requireInstructor,
} from './assignment-access.server.ts'
import {
  AssignmentSettingsSchema,
  DEFAULT_DISPUTE_DAYS,
  formOfAssignment,
  MAX_ITEMS,
  newAssignmentForm,
  Num,
  SUMMARY,
  type AssignmentFormState,
  type BankChoice,
  type LockedItem,
  type SaveResult,
} from './assignment-form.server.ts'
import { checkWords, latestChecks, needsOverride, NEVER_CHECKED, refusalText } from './assignment-items.server.ts'
import type { Db, Tx } from './db/client.server.ts'
import {
  assignmentItems,
  assignments,
  auditEvents,
  extensions,
  memberships,
  problems,
  problemVersions,
  submissions,
  users,
  type Assignment,
} from './db/schema.server.ts'
import { tryReadDefinition } from './definitions.server.ts'
import { listFindScores } from './grading.server.ts'
import { bankViewerFor, freezeProblemVersion, type BankViewer } from './problems.server.ts'
import type { SignedInUser } from './users.server.ts'

// Moved to the modules beside this one; still importable from here.
export {
  AssignmentInUseError,
  AssignmentNotFoundError,
  AssignmentNotOpenError,
  AssignmentPermissionError,
  courseZone,
  findAssignment,
  notOpenSentence,
  notYetOpen,
  requireInstructor,
  type NotOpenInfo,
} from './assignment-access.server.ts'
export {
  assignmentFormFromData,
  AssignmentSettingsSchema,
  changeRows,
  DEFAULT_DISPUTE_DAYS,
  MAX_DISPUTE_DAYS,
  MAX_ITEMS,
  newAssignmentForm,
  runAssignmentFormAction,
  type AssignmentFormAnswer,
  type AssignmentFormState,
  type BankChoice,
  type ItemRow,
  type LockedItem,
  type SaveResult,
} from './assignment-form.server.ts'
export {
  ExtensionFormSchema,
  listExtensions,
  removeExtension,
  setExtension,
  type ExtensionForm,
  type ExtensionResult,
  type ExtensionRow,
} from './assignment-extensions.server.ts'
export { orErrorPage } from './error-page.server.ts'

type Database = Db | Tx

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

// ---- The form: the bank, checking and saving ---------------------------------------------

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
  const locked: LockedItem[] = []
  return { timeZone, state: newAssignmentForm(timeZone, opts.now), choices, locked }
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

/** A setting as the audit row keeps it: a date as its ISO text, anything else as it is. */
function auditable<T>(value: T | Date): T | string {
  return value instanceof Date ? value.toISOString() : value
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
      const was = auditable(current[key])
      const now = auditable(settings[key])
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

// ---- Deleting -----------------------------------------------------------------------------

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
