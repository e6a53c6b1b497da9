/**
 * Regrading one assignment item: moving it to another version of its problem (a corrected
 * key, changed points) and/or changing a find's tolerance for this assignment.
 *
 * - previewRegrade computes, in memory and writing nothing, what every graded answer would
 *   become, and which students' scores would change and by how much.
 * - applyRegrade records the regrade and queues its job (jobs/handlers/regrade.ts) in one
 *   transaction; runRegrade (the job) rewrites the answers in chunks, each chunk in its own
 *   transaction with its audit events and the progress counters, so the page can follow it.
 *
 * A student's numbers never change in a regrade: the variant's seed comes from the problem,
 * not the version (studentSeed in grading.server.ts). The callers (routes) check who asks.
 */
import { and, asc, desc, eq, gt, inArray, isNotNull, isNull, ne, or, sql } from 'drizzle-orm'
import { gradeAnswer } from '#app/domain/assignments/grade-answer.ts'
import { findShares, roundScore } from '#app/domain/assignments/scoring.ts'
import { checkRuleOf, type Find, type ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { validateCheckRule, type CheckDetail, type Tolerance, type Verdict } from '#app/domain/grading/index.ts'
import type { Convention } from '#app/domain/thermo/index.ts'
import type { Db, Tx } from './db/client.server.ts'
import { tryReadDefinition } from './definitions.server.ts'
import {
  assignmentItems,
  assignments,
  auditEvents,
  courses,
  memberships,
  partResults,
  problems,
  problemVersions,
  regrades,
  submissions,
  users,
  type Regrade,
} from './db/schema.server.ts'
import { GRADER_VERSION, studentVariant } from './grading.server.ts'
import { freezeProblemVersion } from './problems.server.ts'
import { enqueue, withJobTransaction } from './queue.server.ts'

type Database = Db | Tx

/** Answers rewritten per transaction: small enough that progress moves, big enough to be quick. */
export const REGRADE_CHUNK = 200

/** What a regrade cannot do, in words for the instructor (field: the form field to mark). */
export class RegradeError extends Error {
  override name = 'RegradeError'
  constructor(
    message: string,
    readonly fieldErrors: Record<string, string> = {},
  ) {
    super(message)
  }
}

// ---- The item and its versions ----------------------------------------------------------

export type RegradeVersion = { id: number; number: number; frozen: boolean; current: boolean; createdAt: string }

export type RegradeFind = { name: string; label: string; unit: string; points: number; tolerance: Tolerance }

export type RegradeItem = {
  itemId: number
  assignmentId: number
  assignmentTitle: string
  courseId: number
  timeZone: string
  convention: Convention
  position: number
  problemId: number
  problemTitle: string
  points: number
  currentVersionId: number
  toleranceOverrides: Record<string, Tolerance>
  /** every version of the item's problem, oldest first */
  versions: RegradeVersion[]
}

/** The item at `position` of an assignment (of `courseId` when given), with its problem's versions; null when there is none. */
export async function getRegradeItem(
  database: Database,
  input: { courseId?: number; assignmentId: number; position: number },
): Promise<RegradeItem | null> {
  const [row] = await database
    .select({
      itemId: assignmentItems.id,
      assignmentId: assignments.id,
      assignmentTitle: assignments.title,
      courseId: assignments.courseId,
      timeZone: courses.timeZone,
      convention: courses.signConvention,
      position: assignmentItems.position,
      problemId: assignmentItems.problemId,
      problemTitle: problems.title,
      points: assignmentItems.points,
      currentVersionId: assignmentItems.problemVersionId,
      toleranceOverrides: assignmentItems.toleranceOverrides,
    })
    .from(assignmentItems)
    .innerJoin(assignments, eq(assignments.id, assignmentItems.assignmentId))
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .innerJoin(problems, eq(problems.id, assignmentItems.problemId))
    .where(
      and(
        eq(assignmentItems.assignmentId, input.assignmentId),
        eq(assignmentItems.position, input.position),
        input.courseId === undefined ? undefined : eq(assignments.courseId, input.courseId),
      ),
    )
    .limit(1)
  if (!row) return null
  const versions = await database
    .select({
      id: problemVersions.id,
      number: problemVersions.number,
      frozenAt: problemVersions.frozenAt,
      createdAt: problemVersions.createdAt,
    })
    .from(problemVersions)
    .where(eq(problemVersions.problemId, row.problemId))
    .orderBy(asc(problemVersions.number))
  return {
    ...row,
    toleranceOverrides: row.toleranceOverrides ?? {},
    versions: versions.map((v) => ({
      id: v.id,
      number: v.number,
      frozen: v.frozenAt !== null,
      current: v.id === row.currentVersionId,
      createdAt: v.createdAt.toISOString(),
    })),
  }
}

async function versionDefinition(database: Database, versionId: number): Promise<ProblemDefinition> {
  const [row] = await database
    .select({ definition: problemVersions.definition })
    .from(problemVersions)
    .where(eq(problemVersions.id, versionId))
  if (!row) throw new RegradeError('That version no longer exists.', { version: 'That version no longer exists.' })
  const read = tryReadDefinition(row.definition, versionId)
  if (!read.ok) throw new RegradeError(read.error.message, { version: read.error.message })
  return read.definition
}

export async function listVersionFinds(database: Database, versionId: number): Promise<RegradeFind[]> {
  const definition = await versionDefinition(database, versionId)
  return definition.finds.map((f) => ({
    name: f.name,
    label: f.label,
    unit: f.unit,
    points: f.points,
    tolerance: f.tolerance,
  }))
}

// ---- Tolerance overrides ------------------------------------------------------------------

/** One find's override as typed: kind 'default' (the version's own tolerance), 'relative' or 'absolute'. */
export type ToleranceFields = { kind: string; value: string; unit: string }

export type OverrideCheck = {
  overrides: Record<string, Tolerance>
  /** field name (`value.<find>`, `unit.<find>`, `kind.<find>`) → message */
  fieldErrors: Record<string, string>
  /** overrides typed for finds the target version does not have; not used */
  ignored: string[]
}

function readNumber(text: string): number | null {
  const t = text.trim().replace(/\u2212/g, '-')
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return null
  const n = Number(t)
  return Number.isFinite(n) ? n : null
}

/**
 * Reads the typed overrides against the target version's finds. Relative: a fraction (0.05)
 * or a percentage (5 %), at least 0 and below 1 (100 %). Absolute: at least 0, in a unit that
 * fits the find (empty: the find's own unit), as validateCheckRule judges it.
 */
export function checkToleranceOverrides(
  finds: readonly Find[],
  typed: Readonly<Record<string, ToleranceFields>>,
): OverrideCheck {
  const overrides: Record<string, Tolerance> = {}
  const fieldErrors: Record<string, string> = {}
  const ignored: string[] = []
  for (const [name, fields] of Object.entries(typed)) {
    const kind = fields.kind.trim()
    if (kind === '' || kind === 'default') continue
    const find = finds.find((f) => f.name === name)
    if (!find) {
      ignored.push(name)
      continue
    }
    if (kind !== 'relative' && kind !== 'absolute') {
      fieldErrors[`kind.${name}`] = 'Choose the version’s tolerance, a relative one or an absolute one.'
      continue
    }
    const raw = fields.value.trim()
    const percent = /^(.*?)\s*%$/.exec(raw)
    const n = readNumber(percent ? percent[1]! : raw)
    if (raw === '') {
      fieldErrors[`value.${name}`] = 'Type the tolerance.'
      continue
    }
    if (n === null) {
      fieldErrors[`value.${name}`] = `“${raw}” is not a number.`
      continue
    }
    let tolerance: Tolerance
    if (kind === 'relative') {
      if (fields.unit.trim() !== '') {
        fieldErrors[`unit.${name}`] = 'A relative tolerance has no unit; leave the unit empty.'
        continue
      }
      const value = percent ? n / 100 : n
      if (value < 0 || value >= 1) {
        fieldErrors[`value.${name}`] =
          'A relative tolerance is at least 0 and below 1 (100 %), for example 0.05 or 5 %.'
        continue
      }
      tolerance = { kind: 'relative', value }
    } else {
      if (percent) {
        fieldErrors[`value.${name}`] = 'An absolute tolerance is in a unit, not a percentage.'
        continue
      }
      if (n < 0) {
        fieldErrors[`value.${name}`] = 'An absolute tolerance is at least 0.'
        continue
      }
      const unit = fields.unit.trim()
      tolerance = unit === '' ? { kind: 'absolute', value: n } : { kind: 'absolute', value: n, unit }
    }
    // The expected value does not matter for the rule's shape; 1 stands in for it.
    const valid = validateCheckRule({ value: 1, unit: find.unit }, { ...checkRuleOf(find), tolerance })
    if (!valid.ok) {
      const field = valid.error.property.endsWith('unit') ? `unit.${name}` : `value.${name}`
      fieldErrors[field] =
        field === `unit.${name}`
          ? `“${fields.unit.trim()}” does not fit this find’s unit (${find.unit || 'a pure number'}).`
          : 'This tolerance cannot be used for this find.'
      continue
    }
    overrides[name] = tolerance
  }
  return { overrides, fieldErrors, ignored }
}

// ---- Recomputing answers -------------------------------------------------------------------

type Target = {
  assignmentId: number
  problemId: number
  versionId: number
  definition: ProblemDefinition
  convention: Convention
  shares: number[]
  overrides: Record<string, Tolerance>
}

type PartToRegrade = { id: number; userId: number; findName: string; answer: string; latePenalty: number }

export type NewGrade = {
  verdict: Verdict
  value: number | null
  score: number
  maxScore: number
  message: string
  pitfallId: string | null
  pitfallFeedback: string | null
  detail: CheckDetail | null
  /** the find is not part of the target version */
  removed: boolean
}

/** Same words as the grading job for an answer to a find the version no longer has. */
const REMOVED_MESSAGE = 'This question is no longer part of the problem.'

/** The part's grade against the target, or null when the student's variant cannot be drawn (the old grade is kept). */
function regradePart(target: Target, part: PartToRegrade): NewGrade | null {
  const index = target.definition.finds.findIndex((f) => f.name === part.findName)
  const find = target.definition.finds[index]
  if (!find)
    return {
      verdict: 'incorrect',
      value: null,
      score: 0,
      maxScore: 0,
      message: REMOVED_MESSAGE,
      pitfallId: null,
      pitfallFeedback: null,
      detail: null,
      removed: true,
    }
  const drawn = studentVariant({
    versionId: target.versionId,
    definition: target.definition,
    assignmentId: target.assignmentId,
    problemId: target.problemId,
    userId: part.userId,
    courseConvention: target.convention,
  })
  if (!drawn.ok) return null
  const share = target.shares[index] ?? 0
  const g = gradeAnswer({
    find,
    variant: drawn.variant,
    answer: part.answer,
    tolerance: target.overrides[find.name],
    share,
    latePenalty: part.latePenalty,
  })
  return {
    verdict: g.verdict,
    value: g.value,
    score: g.score,
    maxScore: share,
    message: g.message,
    pitfallId: g.pitfall?.id ?? null,
    pitfallFeedback: g.pitfall?.feedback ?? null,
    detail: g.detail,
    removed: false,
  }
}

/** Scores are compared to 1e-6 of a point, so float noise never counts as a change (nor writes an audit event). */
function gradeChanged(before: { verdict: Verdict | null; score: number | null }, after: NewGrade): boolean {
  return before.verdict !== after.verdict || roundScore(before.score ?? 0) !== roundScore(after.score)
}

type Prepared = { item: RegradeItem; target: Target; toVersion: RegradeVersion; check: OverrideCheck }

/** Loads the item and the target version and reads the overrides; throws RegradeError for what the instructor must fix. */
async function prepareRegrade(database: Database, input: RegradeRequest): Promise<Prepared> {
  const item = await getRegradeItem(database, input)
  if (!item) throw new RegradeError('There is no such problem in this assignment.')
  const toVersion = item.versions.find((v) => v.id === input.toVersionId)
  if (!toVersion)
    throw new RegradeError('Choose a version of this problem.', { version: 'Choose one of the versions listed.' })
  const definition = await versionDefinition(database, toVersion.id)
  const check = checkToleranceOverrides(definition.finds, input.toleranceOverrides)
  if (Object.keys(check.fieldErrors).length > 0)
    throw new RegradeError('Some tolerances cannot be used; see the marked fields.', check.fieldErrors)
  const target: Target = {
    assignmentId: item.assignmentId,
    problemId: item.problemId,
    versionId: toVersion.id,
    definition,
    convention: item.convention,
    shares: findShares(
      item.points,
      definition.finds.map((f) => f.points),
    ),
    overrides: check.overrides,
  }
  return { item, target, toVersion, check }
}

// ---- Preview ------------------------------------------------------------------------------

export type RegradeRequest = {
  /** when given, the assignment must be in this course */
  courseId?: number
  assignmentId: number
  position: number
  toVersionId: number
  toleranceOverrides: Readonly<Record<string, ToleranceFields>>
}

/** A find whose standing changes for a student (its best score before and after, for the record). */
export type FindChange = {
  name: string
  label: string
  oldVerdict: FindVerdict
  newVerdict: FindVerdict
  oldScore: number
  newScore: number
}

/** A find's standing for one student: correct if any answer is, else the last answer's verdict. */
export type FindVerdict = Verdict | 'removed'

export type StudentChange = {
  userId: number
  name: string
  email: string
  section: string | null
  oldScore: number
  newScore: number
  change: number
  finds: FindChange[]
}

export type RegradePreview = {
  item: RegradeItem
  toVersion: RegradeVersion
  /** the overrides as they would be stored */
  overrides: Record<string, Tolerance>
  ignoredOverrides: string[]
  /** students whose total on the problem or some find's verdict would change, largest |change| first */
  changed: StudentChange[]
  unchanged: number
  totals: {
    /** students with at least one graded answer to this problem */
    students: number
    affected: number
    /** mean change of the affected students' scores on this problem (0 when none) */
    meanChange: number
    /** graded answers recomputed, and those whose verdict or score would change */
    parts: number
    partsChanged: number
  }
  /** finds the target version no longer has: their answers would score 0 */
  removedFinds: { name: string; label: string; parts: number; students: number }[]
  /** students whose variant cannot be drawn from the target version: their grades would be kept */
  notRegraded: { userId: number; name: string; parts: number }[]
  /** graded answers still waiting for the grader (graded with the target version once applied) */
  pending: number
}

function findVerdict(parts: readonly { verdict: FindVerdict; attempt: number }[]): FindVerdict {
  if (parts.some((p) => p.verdict === 'correct')) return 'correct'
  let last = parts[0]!
  for (const p of parts) if (p.attempt > last.attempt) last = p
  return last.verdict
}

/** What applying the regrade would do to every graded answer of the item; writes nothing. */
export async function previewRegrade(database: Database, input: RegradeRequest): Promise<RegradePreview> {
  const { item, target, toVersion, check } = await prepareRegrade(database, input)
  const rows = await database
    .select({
      id: partResults.id,
      userId: partResults.userId,
      findName: partResults.findName,
      answer: partResults.answer,
      attempt: partResults.attempt,
      verdict: partResults.verdict,
      score: partResults.score,
      latePenalty: submissions.latePenalty,
    })
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(and(eq(partResults.itemId, item.itemId), isNotNull(partResults.verdict)))
    .orderBy(asc(partResults.userId), asc(partResults.id))
  const [pendingRow] = await database
    .select({ n: sql<number>`count(*)::int` })
    .from(partResults)
    .where(and(eq(partResults.itemId, item.itemId), isNull(partResults.verdict)))

  const userIds = [...new Set(rows.map((r) => r.userId))]
  const people = userIds.length
    ? await database
        .select({ id: users.id, name: users.name, email: users.email, section: memberships.section })
        .from(users)
        .leftJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.courseId, item.courseId)))
        .where(inArray(users.id, userIds))
    : []
  const person = new Map(people.map((p) => [p.id, p]))
  // A removed find's label is only in the version the item uses now.
  const anyRemoved = rows.some((r) => !target.definition.finds.some((f) => f.name === r.findName))
  const currentFinds = anyRemoved ? (await versionDefinition(database, item.currentVersionId)).finds : []
  const labels = new Map([...currentFinds, ...target.definition.finds].map((f) => [f.name, f.label]))

  const changed: StudentChange[] = []
  let unchanged = 0
  let partsChanged = 0
  const removed = new Map<string, { parts: number; students: Set<number> }>()
  const notRegraded: RegradePreview['notRegraded'] = []

  const byUser = new Map<number, typeof rows>()
  for (const r of rows) byUser.set(r.userId, [...(byUser.get(r.userId) ?? []), r])
  for (const [userId, parts] of byUser) {
    const who = person.get(userId)
    const graded = parts.map((p) => ({ part: p, next: regradePart(target, p) }))
    if (graded.some((g) => g.next === null)) {
      notRegraded.push({ userId, name: who?.name ?? `User ${userId}`, parts: parts.length })
      unchanged++
      continue
    }
    const byFind = new Map<
      string,
      {
        oldV: { verdict: FindVerdict; attempt: number }[]
        newV: { verdict: FindVerdict; attempt: number }[]
        oldS: number
        newS: number
      }
    >()
    for (const { part, next } of graded) {
      const n = next!
      const entry = byFind.get(part.findName) ?? { oldV: [], newV: [], oldS: 0, newS: 0 }
      entry.oldV.push({ verdict: part.verdict!, attempt: part.attempt })
      entry.newV.push({ verdict: n.removed ? 'removed' : n.verdict, attempt: part.attempt })
      entry.oldS = Math.max(entry.oldS, part.score ?? 0)
      entry.newS = Math.max(entry.newS, n.score)
      byFind.set(part.findName, entry)
      if (gradeChanged(part, n)) partsChanged++
      if (n.removed) {
        const r = removed.get(part.findName) ?? { parts: 0, students: new Set<number>() }
        r.parts++
        r.students.add(userId)
        removed.set(part.findName, r)
      }
    }
    const finds: FindChange[] = []
    let oldScore = 0
    let newScore = 0
    for (const [name, e] of byFind) {
      oldScore += e.oldS
      newScore += e.newS
      const oldVerdict = findVerdict(e.oldV)
      const newVerdict = findVerdict(e.newV)
      if (oldVerdict !== newVerdict) {
        finds.push({
          name,
          label: labels.get(name) ?? name,
          oldVerdict,
          newVerdict,
          oldScore: roundScore(e.oldS),
          newScore: roundScore(e.newS),
        })
      }
    }
    oldScore = roundScore(oldScore)
    newScore = roundScore(newScore)
    const change = roundScore(newScore - oldScore)
    if (change === 0 && finds.length === 0) {
      unchanged++
      continue
    }
    changed.push({
      userId,
      name: who?.name ?? `User ${userId}`,
      email: who?.email ?? '',
      section: who?.section ?? null,
      oldScore,
      newScore,
      change,
      finds,
    })
  }
  changed.sort((a, b) => Math.abs(b.change) - Math.abs(a.change) || a.name.localeCompare(b.name))
  const affected = changed.filter((c) => c.change !== 0)
  return {
    item,
    toVersion,
    overrides: check.overrides,
    ignoredOverrides: check.ignored,
    changed,
    unchanged,
    totals: {
      students: byUser.size,
      affected: affected.length,
      meanChange: affected.length ? roundScore(affected.reduce((a, c) => a + c.change, 0) / affected.length) : 0,
      parts: rows.length,
      partsChanged,
    },
    removedFinds: [...removed].map(([name, r]) => ({
      name,
      label: labels.get(name) ?? name,
      parts: r.parts,
      students: r.students.size,
    })),
    notRegraded,
    pending: pendingRow?.n ?? 0,
  }
}

// ---- Apply --------------------------------------------------------------------------------

function sameOverrides(a: Record<string, Tolerance>, b: Record<string, Tolerance>): boolean {
  const norm = (o: Record<string, Tolerance>) =>
    JSON.stringify(
      Object.keys(o)
        .sort()
        .map((k) => [k, o[k]!.kind, o[k]!.value, 'unit' in o[k]! ? (o[k]!.unit ?? null) : null]),
    )
  return norm(a) === norm(b)
}

/**
 * Records the regrade and queues its job, in one transaction; returns its id. Refused
 * (RegradeError) while another regrade of the item is queued or running, and when it would
 * change nothing. Freezes the target version: from now on an assignment uses it.
 */
export async function applyRegrade(database: Db, input: RegradeRequest & { requestedBy: number }): Promise<number> {
  return withJobTransaction(database, async (tx, jobs) => {
    const { item, target, toVersion } = await prepareRegrade(tx, input)
    // The item's row lock makes two instructors applying at once wait for each other, so the
    // second sees the first's regrade below.
    await tx
      .select({ id: assignmentItems.id })
      .from(assignmentItems)
      .where(eq(assignmentItems.id, item.itemId))
      .for('update')
    const [busy] = await tx
      .select({ id: regrades.id })
      .from(regrades)
      .where(and(eq(regrades.itemId, item.itemId), inArray(regrades.status, ['queued', 'running'])))
      .limit(1)
    if (busy) throw new RegradeError('A regrade of this problem is already under way; wait until it has finished.')
    if (toVersion.id === item.currentVersionId && sameOverrides(target.overrides, item.toleranceOverrides)) {
      throw new RegradeError(
        'This is the problem’s current version with the same tolerances: choose another version or change a tolerance.',
      )
    }
    const [count] = await tx
      .select({ n: sql<number>`count(*)::int` })
      .from(partResults)
      .where(and(eq(partResults.itemId, item.itemId), isNotNull(partResults.verdict)))
    const [row] = await tx
      .insert(regrades)
      .values({
        assignmentId: item.assignmentId,
        itemId: item.itemId,
        fromVersionId: item.currentVersionId,
        toVersionId: toVersion.id,
        toleranceOverrides: target.overrides,
        status: 'queued',
        total: count?.n ?? 0,
        requestedBy: input.requestedBy,
      })
      .returning({ id: regrades.id })
    await freezeProblemVersion(tx, toVersion.id)
    await enqueue('regrade', { v: 1, regradeId: row!.id }, { connection: jobs })
    return row!.id
  })
}

// ---- Run (the job) ------------------------------------------------------------------------

export type RunRegradeOutcome = 'done' | 'already-done' | 'missing'

/**
 * Applies a queued regrade. Order matters for answers that arrive while it runs:
 *
 * 1. First, in one transaction, the item is moved to the target version and tolerances.
 *    The grading job reads the item when it grades, so every submission graded after this
 *    commit is graded against the target. Moving the item last instead would let answers
 *    graded meanwhile use the old version after the regrade had passed them by.
 * 2. Then every graded answer of the item not yet carrying this regrade's id is recomputed,
 *    REGRADE_CHUNK at a time, until none is left. A grading transaction that read the item
 *    just before step 1 commits its answers (old version, no regrade id) a moment later;
 *    they are picked up by the next chunk. Before finishing, the queued submissions of the
 *    item are locked (SELECT … FOR UPDATE), which waits for any grading still in flight, and
 *    the search runs once more. Answers graded after step 1 are recomputed too (harmlessly:
 *    nothing changes), so `total` grows with them and progress never exceeds it.
 *
 * Idempotent: answers carrying the id are skipped, so a retry continues where the last try
 * stopped, and a 'done' regrade is not run again. Each chunk writes its answers, its audit
 * events and the progress counters in one transaction.
 */
export async function runRegrade(
  database: Db,
  regradeId: number,
  options: { chunk?: number } = {},
): Promise<RunRegradeOutcome> {
  const chunk = Math.max(1, Math.floor(options.chunk ?? REGRADE_CHUNK))
  const [regrade] = await database.select().from(regrades).where(eq(regrades.id, regradeId))
  if (!regrade) return 'missing'
  if (regrade.status === 'done') return 'already-done'

  const [context] = await database
    .select({
      courseId: assignments.courseId,
      convention: courses.signConvention,
      problemId: assignmentItems.problemId,
      points: assignmentItems.points,
    })
    .from(assignmentItems)
    .innerJoin(assignments, eq(assignments.id, assignmentItems.assignmentId))
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .where(eq(assignmentItems.id, regrade.itemId))
  if (!context) return 'missing'
  const definition = await versionDefinition(database, regrade.toVersionId)
  const overrides = regrade.toleranceOverrides ?? {}
  const target: Target = {
    assignmentId: regrade.assignmentId,
    problemId: context.problemId,
    versionId: regrade.toVersionId,
    definition,
    convention: context.convention,
    shares: findShares(
      context.points,
      definition.finds.map((f) => f.points),
    ),
    overrides,
  }

  await database.transaction(async (tx) => {
    await tx.update(regrades).set({ status: 'running', error: null }).where(eq(regrades.id, regradeId))
    await tx
      .update(assignmentItems)
      .set({ problemVersionId: regrade.toVersionId, toleranceOverrides: overrides })
      .where(eq(assignmentItems.id, regrade.itemId))
  })

  const waiting = and(
    eq(partResults.itemId, regrade.itemId),
    isNotNull(partResults.verdict),
    or(isNull(partResults.regradeId), ne(partResults.regradeId, regradeId)),
  )
  for (let settled = false; !settled;) {
    let after = 0
    for (;;) {
      const moved = await database.transaction((tx) =>
        regradeChunk(tx, { regrade, target, courseId: context.courseId, waiting, after, chunk }),
      )
      if (moved === null) break
      after = moved
    }
    settled = await database.transaction(async (tx) => {
      await tx
        .select({ id: submissions.id })
        .from(submissions)
        .where(and(eq(submissions.itemId, regrade.itemId), eq(submissions.status, 'queued')))
        .for('update')
      const [left] = await tx
        .select({ n: sql<number>`count(*)::int` })
        .from(partResults)
        .where(waiting)
      if ((left?.n ?? 0) > 0) return false
      await tx
        .update(regrades)
        .set({ status: 'done', finishedAt: sql`clock_timestamp()`, error: null })
        .where(eq(regrades.id, regradeId))
      return true
    })
  }
  return 'done'
}

/** Rewrites the next chunk of waiting answers (ids above `after`); returns the last id, or null when none was left. */
async function regradeChunk(
  tx: Tx,
  input: {
    regrade: Regrade
    target: Target
    courseId: number
    waiting: ReturnType<typeof and>
    after: number
    chunk: number
  },
): Promise<number | null> {
  const { regrade, target } = input
  const parts = await tx
    .select({
      id: partResults.id,
      userId: partResults.userId,
      findName: partResults.findName,
      answer: partResults.answer,
      verdict: partResults.verdict,
      score: partResults.score,
      latePenalty: submissions.latePenalty,
    })
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(and(input.waiting, gt(partResults.id, input.after)))
    .orderBy(asc(partResults.id))
    .limit(input.chunk)
    .for('update', { of: partResults })
  if (parts.length === 0) return null

  let changed = 0
  const audits: (typeof auditEvents.$inferInsert)[] = []
  for (const p of parts) {
    const next = regradePart(target, p)
    if (next === null) {
      // The student's variant cannot be drawn from the target: the old grade stands.
      await tx.update(partResults).set({ regradeId: regrade.id }).where(eq(partResults.id, p.id))
      continue
    }
    await tx
      .update(partResults)
      .set({
        verdict: next.verdict,
        value: next.value,
        score: next.score,
        maxScore: next.maxScore,
        message: next.message,
        pitfallId: next.pitfallId,
        pitfallFeedback: next.pitfallFeedback,
        detail: next.detail,
        gradedVersionId: regrade.toVersionId,
        graderVersion: GRADER_VERSION,
        gradedAt: sql`clock_timestamp()`,
        regradeId: regrade.id,
      })
      .where(eq(partResults.id, p.id))
    if (gradeChanged(p, next)) {
      changed++
      audits.push({
        actorId: regrade.requestedBy,
        courseId: input.courseId,
        assignmentId: regrade.assignmentId,
        userId: p.userId,
        partResultId: p.id,
        kind: 'regrade',
        before: { verdict: p.verdict, score: p.score },
        after: { verdict: next.verdict, score: next.score },
        note: `Regrade ${regrade.id}${next.removed ? ': the find is not part of the new version' : ''}`,
      })
    }
  }
  if (audits.length) await tx.insert(auditEvents).values(audits)
  const [left] = await tx
    .select({ n: sql<number>`count(*)::int` })
    .from(partResults)
    .where(and(input.waiting, gt(partResults.id, parts[parts.length - 1]!.id)))
  // done + what is still waiting: answers graded while the regrade runs join the total.
  await tx
    .update(regrades)
    .set({
      done: sql`${regrades.done} + ${parts.length}`,
      changed: sql`${regrades.changed} + ${changed}`,
      total: sql`greatest(${regrades.total}, ${regrades.done} + ${parts.length} + ${left?.n ?? 0})`,
    })
    .where(eq(regrades.id, regrade.id))
  return parts[parts.length - 1]!.id
}

/** Marks a regrade that stopped: queued again when the job will retry, failed when not. */
export async function recordRegradeFailure(
  database: Db,
  regradeId: number,
  input: { message: string; willRetry: boolean },
): Promise<void> {
  await database
    .update(regrades)
    .set(
      input.willRetry
        ? { status: 'queued', error: input.message }
        : { status: 'failed', error: input.message, finishedAt: sql`clock_timestamp()` },
    )
    .where(and(eq(regrades.id, regradeId), ne(regrades.status, 'done')))
}

// ---- Progress -----------------------------------------------------------------------------

export type RegradeProgress = {
  id: number
  courseId: number
  assignmentId: number
  itemId: number
  position: number
  status: Regrade['status']
  total: number
  done: number
  changed: number
  error: string | null
  fromVersionNumber: number | null
  toVersionNumber: number | null
  toleranceOverrides: Record<string, Tolerance>
  requestedByName: string
  createdAt: string
  finishedAt: string | null
}

const progressColumns = {
  id: regrades.id,
  courseId: assignments.courseId,
  assignmentId: regrades.assignmentId,
  itemId: regrades.itemId,
  position: assignmentItems.position,
  status: regrades.status,
  total: regrades.total,
  done: regrades.done,
  changed: regrades.changed,
  error: regrades.error,
  fromVersionId: regrades.fromVersionId,
  toVersionId: regrades.toVersionId,
  toleranceOverrides: regrades.toleranceOverrides,
  requestedByName: users.name,
  createdAt: regrades.createdAt,
  finishedAt: regrades.finishedAt,
}

/** The regrades with the people and places their progress names; narrowed by the caller's where. */
function progressQuery(database: Database) {
  return database
    .select(progressColumns)
    .from(regrades)
    .innerJoin(assignments, eq(assignments.id, regrades.assignmentId))
    .innerJoin(assignmentItems, eq(assignmentItems.id, regrades.itemId))
    .innerJoin(users, eq(users.id, regrades.requestedBy))
}

type ProgressRow = Awaited<ReturnType<typeof progressQuery>>[number]

async function toProgress(database: Database, rows: ProgressRow[]): Promise<RegradeProgress[]> {
  const ids = [...new Set(rows.flatMap((r) => [r.fromVersionId, r.toVersionId]))]
  const numbers = ids.length
    ? new Map(
        (
          await database
            .select({ id: problemVersions.id, number: problemVersions.number })
            .from(problemVersions)
            .where(inArray(problemVersions.id, ids))
        ).map((v) => [v.id, v.number]),
      )
    : new Map<number, number>()
  return rows.map((r) => ({
    id: r.id,
    courseId: r.courseId,
    assignmentId: r.assignmentId,
    itemId: r.itemId,
    position: r.position,
    status: r.status,
    total: r.total,
    done: r.done,
    changed: r.changed,
    error: r.error,
    fromVersionNumber: numbers.get(r.fromVersionId) ?? null,
    toVersionNumber: numbers.get(r.toVersionId) ?? null,
    toleranceOverrides: r.toleranceOverrides ?? {},
    requestedByName: r.requestedByName,
    createdAt: r.createdAt.toISOString(),
    finishedAt: r.finishedAt ? r.finishedAt.toISOString() : null,
  }))
}

/** A regrade's progress (the course it belongs to included, for the caller's permission check); null when there is none. */
export async function getRegradeProgress(database: Database, regradeId: number): Promise<RegradeProgress | null> {
  const rows = await progressQuery(database).where(eq(regrades.id, regradeId))
  return (await toProgress(database, rows))[0] ?? null
}

/** The latest regrades of an item, newest first. */
export async function listItemRegrades(database: Database, itemId: number, limit = 10): Promise<RegradeProgress[]> {
  const rows = await progressQuery(database)
    .where(eq(regrades.itemId, itemId))
    .orderBy(desc(regrades.createdAt), desc(regrades.id))
    .limit(limit)
  return toProgress(database, rows)
}

// ---- The regrade page ---------------------------------------------------------------------

export type RegradePage = {
  item: RegradeItem
  /** the version the form shows finds for (the one asked for, else the current one) */
  targetVersion: RegradeVersion
  finds: RegradeFind[]
  /** the form's values: version, kind.<find>, value.<find>, unit.<find> */
  values: Record<string, string>
  preview: RegradePreview | null
  previewError: { message: string; fieldErrors: Record<string, string> } | null
  regrades: RegradeProgress[]
  /** the regrade asked for with ?regrade=, when it is one of this item's */
  progress: RegradeProgress | null
}

function toleranceValues(name: string, t: Tolerance | undefined): Record<string, string> {
  if (!t) return { [`kind.${name}`]: 'default', [`value.${name}`]: '', [`unit.${name}`]: '' }
  if (t.kind === 'relative')
    return { [`kind.${name}`]: 'relative', [`value.${name}`]: `${roundScore(t.value * 100)} %`, [`unit.${name}`]: '' }
  return { [`kind.${name}`]: 'absolute', [`value.${name}`]: String(t.value), [`unit.${name}`]: t.unit ?? '' }
}

/**
 * Everything the regrade page shows: the item and its versions, the target version's finds
 * with the tolerances typed (or the item's current overrides), the preview when asked for,
 * the item's latest regrades and the progress of one. Null when the item is not in the course.
 */
export async function loadRegradePage(
  database: Database,
  input: {
    courseId: number
    assignmentId: number
    position: number
    versionId?: number
    typed?: Record<string, ToleranceFields>
    preview: boolean
    regradeId?: number
  },
): Promise<RegradePage | null> {
  const item = await getRegradeItem(database, input)
  if (!item) return null
  const targetVersion = item.versions.find((v) => v.id === input.versionId) ?? item.versions.find((v) => v.current)!
  const finds = await listVersionFinds(database, targetVersion.id)
  const values: Record<string, string> = { version: String(targetVersion.id) }
  for (const f of finds) Object.assign(values, toleranceValues(f.name, item.toleranceOverrides[f.name]))
  if (input.typed) {
    for (const [name, t] of Object.entries(input.typed))
      Object.assign(values, { [`kind.${name}`]: t.kind, [`value.${name}`]: t.value, [`unit.${name}`]: t.unit })
  }
  let preview: RegradePreview | null = null
  let previewError: RegradePage['previewError'] = null
  if (input.preview) {
    // The item's current overrides, replaced by whatever the form sent.
    const typed = {
      ...Object.fromEntries(
        finds.map((f) => [
          f.name,
          { kind: values[`kind.${f.name}`]!, value: values[`value.${f.name}`]!, unit: values[`unit.${f.name}`]! },
        ]),
      ),
      ...input.typed,
    }
    try {
      preview = await previewRegrade(database, {
        courseId: input.courseId,
        assignmentId: input.assignmentId,
        position: input.position,
        toVersionId: targetVersion.id,
        toleranceOverrides: typed,
      })
    } catch (e) {
      if (!(e instanceof RegradeError)) throw e
      previewError = { message: e.message, fieldErrors: e.fieldErrors }
    }
  }
  const list = await listItemRegrades(database, item.itemId)
  const asked =
    input.regradeId === undefined
      ? null
      : (list.find((r) => r.id === input.regradeId) ?? (await getRegradeProgress(database, input.regradeId)))
  return {
    item,
    targetVersion,
    finds,
    values,
    preview,
    previewError,
    regrades: list,
    progress: asked && asked.itemId === item.itemId ? asked : null,
  }
}
