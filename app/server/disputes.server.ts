/**
 * Disputes (#7): a student challenges the verdict on a graded answer to one find; the
 * course's TAs and instructors review and resolve it. Every score change is written to the
 * append-only audit_events table in the same transaction as the change.
 *
 * CONTRACT (the signatures below are fixed; the bodies are being built):
 * - Window: a find can be disputed once it has a graded answer, until assignment.disputeDays
 *   days after the assignment's grades are released (open while not released). One open
 *   dispute per (item, student, find) (a partial unique index enforces it).
 * - Resolutions: 'reject' keeps the score (status rejected); 'adjust' sets the find's score by
 *   hand, comment required (status adjusted); 'accept-for-variant' marks the answer correct
 *   for every student of the assignment who gave the same answer (same value, within 1e-9
 *   relative) to that find on the same variant (same givens), this student included (status
 *   upheld). Each changed part_result gets an audit row (kind 'dispute', actorId, before/after
 *   {verdict, score}, note = the comment); the student is e-mailed (queued send-mail) in the
 *   same transaction.
 *
 * How the resolutions change part_results (a find's score is the best of its graded answers):
 * - 'adjust' sets the disputed answer's score to the new score (its verdict stays) and lowers
 *   any other graded answer of that student to that find scoring above it to the new score,
 *   so that the find's score becomes exactly the new score, also when it goes down.
 * - 'accept-for-variant' marks each matching answer correct with its share less its own
 *   submission's late penalty, message "Accepted on review", and clears its pitfall (a
 *   correct answer has no slip to explain; the audit row keeps what it was).
 * Permissions are read from the memberships table, never from the actor's claimed role.
 * Audit rows of one resolution share one transaction, hence one `at`: the dispute's history
 * finds its score changes by the part ids its 'dispute-resolved' row lists and that `at`.
 */
import { createHash } from 'node:crypto'
import { and, asc, desc, eq, inArray, isNotNull, lte, ne, sql, type SQL } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { fileTypeFromBuffer } from 'file-type'
import { disputeWindow, sameAnswerValue, sameGivens } from '#app/domain/assignments/disputes.ts'
import { attemptsAllowed, rulesOf, submissionWindow, type AssignmentRules } from '#app/domain/assignments/policy.ts'
import { answerScore, findShares } from '#app/domain/assignments/scoring.ts'
import type { CycleDiagrams } from '#app/domain/authoring/diagram-plot.ts'
import type { DrawnGiven, Find, KeyEntry, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { cycleDiagrams } from '#app/domain/authoring/diagrams.ts'
import { renderPrompt } from '#app/domain/authoring/prompt.ts'
import { renderWorkedSolution, workedSolution } from '#app/domain/authoring/worked-solution.ts'
import { PITFALLS } from '#app/domain/grading/pitfalls.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { disputeResolutionMail, disputeResolvedHistoryText } from '#app/lib/dispute-resolution.ts'
import type { Db, Tx } from './db/client.server.ts'
import { isUniqueViolation } from './db/pg-errors.server.ts'
import {
  assignmentItems,
  assignments,
  attachments,
  auditEvents,
  courses,
  disputes,
  extensions,
  memberships,
  partResults,
  submissions,
  users,
  type CourseRole,
  type DisputeStatus,
} from './db/schema.server.ts'
import { linkMail, queueMail } from './email.server.ts'
import { appUrl } from './env.server.ts'
import { frozenDefinitions, studentVariant } from './grading.server.ts'
import { isRecord, listField, numberField, stringField } from './json-values.server.ts'
import { droppedFrom } from './membership-state.server.ts'
import { withJobTransaction } from './queue.server.ts'
import { formatPoints, formatPointsWord } from '#app/lib/points.ts'
import {
  ALLOWED_ATTACHMENT_TYPES,
  DISPUTE_COMMENT_MAX,
  DISPUTE_REASON_MAX,
  DISPUTE_REASON_MIN,
  MAX_ATTACHMENT_BYTES,
  type AttachmentType,
} from '#app/lib/dispute-limits.ts'
import { controlCharMessage, hasControlChar } from '#app/lib/text-field.ts'

type Database = Db | Tx

/** Upload limits (shared with the form): 10 MB; PDF, PNG or JPEG, the type read from the bytes. */
export { ALLOWED_ATTACHMENT_TYPES, MAX_ATTACHMENT_BYTES, type AttachmentType }

export type Upload = { fileName: string; bytes: Uint8Array }

export type RaiseDisputeInput = {
  courseId: number
  assignmentId: number
  position: number
  findName: string
  userId: number
  reason: string
  upload?: Upload | null
  now?: Date
}

export type RaiseDisputeResult =
  | { ok: true; disputeId: number }
  | { ok: false; formError?: string; fieldErrors: { reason?: string; file?: string; findName?: string } }

export type DisputeActor = { id: number; isAdmin: boolean; role: 'instructor' | 'ta' | 'student' }

export type DisputeListFilters = {
  assignmentId?: number
  status?: DisputeStatus | 'all'
  /** only disputes at least this many days old */
  olderThanDays?: number
}

export type DisputeListRow = {
  id: number
  status: DisputeStatus
  createdAt: string
  resolvedAt: string | null
  assignmentId: number
  assignmentTitle: string
  position: number
  problemTitle: string
  findName: string
  findLabel: string
  student: { id: number; name: string; email: string }
  reason: string
  hasAttachment: boolean
  scoreBefore: number | null
  scoreAfter: number | null
}

export type DisputeHistoryEntry = { at: string; who: string | null; kind: string; text: string }

export type DisputeDetail = {
  dispute: DisputeListRow & { comment: string | null; resolvedBy: string | null }
  timeZone: string
  find: { name: string; label: string; unit: string; share: number }
  /** the disputed answer and its grade */
  answer: {
    text: string
    attempt: number
    verdict: string | null
    message: string | null
    pitfallId: string | null
    pitfallTitle: string | null
    pitfallFeedback: string | null
    score: number | null
    maxScore: number
    submittedAt: string
    daysLate: number
  }
  /** every answer of this student to this find, oldest first */
  attempts: { text: string; attempt: number; verdict: string | null; score: number | null; submittedAt: string }[]
  /** the find's current score for the student (best of the graded answers) */
  findScore: number
  givens: readonly DrawnGiven[]
  promptHtml: string | null
  key: readonly KeyEntry[]
  workedHtml: string | null
  diagrams: CycleDiagrams | null
  attachment: { id: number; fileName: string; contentType: AttachmentType; size: number } | null
  /** how many other students gave the same answer on the same variant (what 'accept-for-variant' would change) */
  sameAnswerOnVariant: number
  history: DisputeHistoryEntry[]
}

export type ResolveDisputeInput = {
  courseId: number
  disputeId: number
  actor: DisputeActor
  decision: 'reject' | 'adjust' | 'accept-for-variant'
  /** for 'adjust': the find's new score, 0…its share of the points */
  newScore?: number
  comment: string
  now?: Date
  /** the site's address for the link in the e-mail (default: APP_URL) */
  baseUrl?: string
}

export type ResolveDisputeResult =
  | { ok: true; changed: number }
  | { ok: false; formError?: string; fieldErrors: { newScore?: string; comment?: string; decision?: string } }

/** A find's dispute state for the student's problem page. */
export type MyDispute = {
  id: number
  findName: string
  status: DisputeStatus
  createdAt: string
  resolvedAt: string | null
  comment: string | null
  scoreBefore: number | null
  scoreAfter: number | null
}

export type DisputeAllowance = { allowed: true; until: string | null } | { allowed: false; reason: string }

export type AuditRow = {
  id: number
  at: string
  actor: string | null
  kind: string
  student: string | null
  assignmentTitle: string | null
  before: unknown
  after: unknown
  note: string
}

export const REASON_MIN = DISPUTE_REASON_MIN
export const REASON_MAX = DISPUTE_REASON_MAX
export const COMMENT_MAX = DISPUTE_COMMENT_MAX

// ---- Shared lookups ---------------------------------------------------------------------

/** The viewer's role in the course, from the database (an actor's claimed role is never trusted). */
async function courseRoleOf(database: Database, userId: number, courseId: number): Promise<CourseRole | null> {
  const [row] = await database
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), eq(memberships.courseId, courseId)))
  return row?.role ?? null
}

function isStaffRole(role: CourseRole | null): role is 'instructor' | 'ta' {
  return role === 'instructor' || role === 'ta'
}

type ItemContext = {
  courseId: number
  courseCode: string
  courseTitle: string
  timeZone: string
  convention: 'chemistry' | 'engineering'
  assignmentId: number
  assignmentTitle: string
  gradesReleasedAt: Date | null
  disputeDays: number
  rules: AssignmentRules
  itemId: number
  position: number
  points: number
  problemId: number
  versionId: number
  definition: ProblemDefinition
}

async function loadItemContext(database: Database, where: SQL | undefined): Promise<ItemContext | null> {
  const [row] = await database
    .select({
      courseId: courses.id,
      courseCode: courses.code,
      courseTitle: courses.title,
      timeZone: courses.timeZone,
      convention: courses.signConvention,
      assignmentId: assignments.id,
      assignmentTitle: assignments.title,
      gradesReleasedAt: assignments.gradesReleasedAt,
      disputeDays: assignments.disputeDays,
      opensAt: assignments.opensAt,
      dueAt: assignments.dueAt,
      attemptsPerFind: assignments.attemptsPerFind,
      latePolicy: assignments.latePolicy,
      latePenaltyPercentPerDay: assignments.latePenaltyPercentPerDay,
      lateDaysAllowed: assignments.lateDaysAllowed,
      keyRelease: assignments.keyRelease,
      keyReleasedAt: assignments.keyReleasedAt,
      itemId: assignmentItems.id,
      position: assignmentItems.position,
      points: assignmentItems.points,
      problemId: assignmentItems.problemId,
      versionId: assignmentItems.problemVersionId,
    })
    .from(assignmentItems)
    .innerJoin(assignments, eq(assignments.id, assignmentItems.assignmentId))
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .where(where)
    .limit(1)
  if (!row) return null
  const definition = (await frozenDefinitions(database, [row.versionId])).get(row.versionId)
  if (!definition) return null
  return { ...row, rules: rulesOf(row), definition }
}

function itemByPosition(courseId: number, assignmentId: number, position: number) {
  return and(
    eq(assignments.courseId, courseId),
    eq(assignments.id, assignmentId),
    eq(assignmentItems.position, position),
  )
}

function findOf(ctx: ItemContext, findName: string): { find: Find; share: number } | null {
  const index = ctx.definition.finds.findIndex((f) => f.name === findName)
  const find = ctx.definition.finds[index]
  if (!find) return null
  const shares = findShares(
    ctx.points,
    ctx.definition.finds.map((f) => f.points),
  )
  return { find, share: shares[index] ?? 0 }
}

function variantOf(ctx: ItemContext, userId: number) {
  return studentVariant({
    versionId: ctx.versionId,
    definition: ctx.definition,
    assignmentId: ctx.assignmentId,
    problemId: ctx.problemId,
    userId,
    courseConvention: ctx.convention,
  })
}

type GradedPart = {
  id: number
  userId: number
  attempt: number
  answer: string
  verdict: string | null
  value: number | null
  score: number | null
  maxScore: number
  latePenalty: number
}

const gradedPartColumns = {
  id: partResults.id,
  userId: partResults.userId,
  attempt: partResults.attempt,
  answer: partResults.answer,
  verdict: partResults.verdict,
  value: partResults.value,
  score: partResults.score,
  maxScore: partResults.maxScore,
  latePenalty: submissions.latePenalty,
}

/** A student's graded answers to one find, oldest first. */
async function gradedParts(
  database: Database,
  itemId: number,
  userId: number,
  findName: string,
): Promise<GradedPart[]> {
  return database
    .select(gradedPartColumns)
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(
      and(
        eq(partResults.itemId, itemId),
        eq(partResults.userId, userId),
        eq(partResults.findName, findName),
        isNotNull(partResults.verdict),
      ),
    )
    .orderBy(asc(partResults.attempt), asc(partResults.id))
}

function best(parts: readonly { score: number | null }[]): number {
  return parts.reduce((b, p) => Math.max(b, p.score ?? 0), 0)
}

/**
 * Other students' graded answers to the find with the same value (1e-9 relative) on the same
 * variant (every given reads the same) as this student's answer. Values are compared first,
 * so variants are drawn only for the few students whose number matches.
 */
async function sameAnswerParts(
  database: Database,
  ctx: ItemContext,
  findName: string,
  userId: number,
  value: number | null,
): Promise<GradedPart[]> {
  if (value === null || !Number.isFinite(value)) return []
  const mine = variantOf(ctx, userId)
  if (!mine.ok) return []
  const candidates = await database
    .select(gradedPartColumns)
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(
      and(
        eq(partResults.itemId, ctx.itemId),
        eq(partResults.findName, findName),
        ne(partResults.userId, userId),
        isNotNull(partResults.verdict),
        isNotNull(partResults.value),
      ),
    )
    .orderBy(asc(partResults.id))
  const sameVariant = new Map<number, boolean>()
  return candidates.filter((p) => {
    if (!sameAnswerValue(p.value!, value)) return false
    let same = sameVariant.get(p.userId)
    if (same === undefined) {
      const theirs = variantOf(ctx, p.userId)
      same = theirs.ok && sameGivens(mine.variant.givens, theirs.variant.givens)
      sameVariant.set(p.userId, same)
    }
    return same
  })
}

const points = formatPoints
const pluralPoints = formatPointsWord

// ---- Raising ----------------------------------------------------------------------------

/** Whether this student may dispute this find now, and until when. */
export async function disputeAllowance(
  database: Database,
  input: { courseId: number; assignmentId: number; position: number; findName: string; userId: number; now?: Date },
): Promise<DisputeAllowance & { code?: string }> {
  const ctx = await loadItemContext(database, itemByPosition(input.courseId, input.assignmentId, input.position))
  if (!ctx) return { allowed: false, code: 'no-problem', reason: 'There is no such problem in this course.' }
  const a = await allowanceFor(database, ctx, input)
  return a.allowed ? { allowed: true, until: a.until } : a
}

/**
 * For the problem page: whether each find may be disputed now, by the same rule raiseDispute
 * applies (so the page offers exactly what the server accepts).
 */
export async function disputeOffers(
  database: Database,
  input: { courseId: number; assignmentId: number; position: number; userId: number; now?: Date },
): Promise<Record<string, DisputeAllowance & { code?: string }>> {
  const ctx = await loadItemContext(database, itemByPosition(input.courseId, input.assignmentId, input.position))
  if (!ctx) return {}
  const out: Record<string, DisputeAllowance & { code?: string }> = {}
  for (const f of ctx.definition.finds) {
    const a = await allowanceFor(database, ctx, { ...input, findName: f.name })
    out[f.name] = a.allowed ? { allowed: true, until: a.until } : a
  }
  return out
}

async function allowanceFor(
  database: Database,
  ctx: ItemContext,
  input: { findName: string; userId: number; courseId: number; now?: Date },
) {
  if ((await courseRoleOf(database, input.userId, input.courseId)) !== 'student') {
    return { allowed: false as const, code: 'not-student', reason: 'Only students of this course can dispute a grade.' }
  }
  const found = findOf(ctx, input.findName)
  if (!found) return { allowed: false as const, code: 'no-find', reason: 'This problem has no such question.' }
  const now = input.now ?? new Date()
  const parts = await gradedParts(database, ctx.itemId, input.userId, input.findName)
  const latest = parts.at(-1)
  const [facts] = await database
    .select({
      open: sql<boolean>`exists (select 1 from ${disputes} d where d.item_id = ${ctx.itemId} and d.user_id = ${input.userId} and d.find_name = ${input.findName} and d.status = 'open')`,
      resolvedOnLatest: latest
        ? sql<boolean>`exists (select 1 from ${disputes} d where d.part_result_id = ${latest.id} and d.status <> 'open')`
        : sql<boolean>`false`,
      used: sql<number>`(select count(*) from ${partResults} p where p.item_id = ${ctx.itemId} and p.user_id = ${input.userId} and p.find_name = ${input.findName})::int`,
    })
    .from(sql`(select 1) as one`)
  const [ext] = await database
    .select({ dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts })
    .from(extensions)
    .where(and(eq(extensions.assignmentId, ctx.assignmentId), eq(extensions.userId, input.userId)))
    .limit(1)
  const windowNow = submissionWindow(ctx.rules, ext ?? null, now)
  const w = disputeWindow({
    gradesReleasedAt: ctx.gradesReleasedAt,
    disputeDays: ctx.disputeDays,
    graded: parts.length > 0,
    hasOpenDispute: facts?.open === true,
    now,
    format: (d) => formatInZone(d, ctx.timeZone),
    dropped: (await droppedFrom(database, input.userId, input.courseId)) !== null,
    latest: latest
      ? {
          verdict: latest.verdict ?? '',
          score: latest.score ?? 0,
          maxScore: latest.maxScore,
          disputeResolved: facts?.resolvedOnLatest === true,
        }
      : undefined,
    attemptsLeft: Math.max(0, attemptsAllowed(ctx.rules, ext ?? null) - (facts?.used ?? 0)),
    canStillAnswer: windowNow.state === 'open' || windowNow.state === 'late',
  })
  if (!w.allowed) return { allowed: false as const, code: w.code, reason: w.reason }
  return { allowed: true as const, until: w.until ? w.until.toISOString() : null, disputedPart: parts.at(-1)! }
}

/** The file name as shown: the last path segment, without control characters, at most 200 characters. */
export function cleanFileName(name: string): string {
  const base = (name.split(/[\\/]/).pop() ?? '').replace(/\p{Cc}/gu, '').trim()
  return base.slice(0, 200) || 'attachment'
}

function megabytes(n: number): string {
  return (n / (1024 * 1024)).toFixed(1)
}

/**
 * Checks an upload: none, or at most 10 MB of PDF, PNG or JPEG as read from its first bytes.
 * An empty file counts as no upload (a form posted without choosing a file sends one).
 */
export async function checkUpload(
  upload: Upload | null | undefined,
): Promise<
  | { ok: true; file: { fileName: string; contentType: AttachmentType; bytes: Uint8Array } | null }
  | { ok: false; error: string }
> {
  if (!upload || upload.bytes.byteLength === 0) return { ok: true, file: null }
  if (upload.bytes.byteLength > MAX_ATTACHMENT_BYTES) {
    return {
      ok: false,
      error: `The file is larger than 10 MB (it is ${megabytes(upload.bytes.byteLength)} MB). Attach a smaller PDF, PNG or JPEG, or send the dispute without it.`,
    }
  }
  const detected = await fileTypeFromBuffer(upload.bytes)
  const type = ALLOWED_ATTACHMENT_TYPES.find((t) => t === detected?.mime)
  if (!type) {
    const looks = detected ? `a .${detected.ext} file` : 'something else'
    return {
      ok: false,
      error: `Only PDF, PNG or JPEG files can be attached, and this file looks like ${looks} (the type is read from the file's content, not its name).`,
    }
  }
  return { ok: true, file: { fileName: cleanFileName(upload.fileName), contentType: type, bytes: upload.bytes } }
}

function checkReason(text: string): string | null {
  const reason = text.trim()
  if (hasControlChar(reason)) return controlCharMessage('the reason', reason)
  if (reason === '') return 'Say why you think this grade is wrong.'
  if (reason.length < REASON_MIN) return `Say a little more: the reason needs at least ${REASON_MIN} characters.`
  if (reason.length > REASON_MAX)
    return `Keep the reason to ${REASON_MAX.toLocaleString('en')} characters (it has ${reason.length.toLocaleString('en')}).`
  return null
}

const OPEN_ALREADY =
  'You already have an open dispute on this question. You can raise another once it has been resolved.'

class OpenDisputeExists extends Error {}

export async function raiseDispute(database: Db, input: RaiseDisputeInput): Promise<RaiseDisputeResult> {
  const fieldErrors: { reason?: string; file?: string; findName?: string } = {}
  const reasonError = checkReason(input.reason)
  if (reasonError) fieldErrors.reason = reasonError
  const upload = await checkUpload(input.upload)
  if (!upload.ok) fieldErrors.file = upload.error
  const reason = input.reason.trim()
  try {
    return await database.transaction(async (tx): Promise<RaiseDisputeResult> => {
      const ctx = await loadItemContext(tx, itemByPosition(input.courseId, input.assignmentId, input.position))
      if (!ctx) return { ok: false, formError: 'There is no such problem in this course.', fieldErrors }
      const allowance = await allowanceFor(tx, ctx, { ...input, now: input.now ?? new Date() })
      if (!allowance.allowed) {
        if (allowance.code === 'open-dispute' || allowance.code === 'no-find')
          return { ok: false, fieldErrors: { ...fieldErrors, findName: allowance.reason } }
        return { ok: false, formError: allowance.reason, fieldErrors }
      }
      if (Object.keys(fieldErrors).length > 0)
        return { ok: false, formError: 'The dispute was not sent. Correct what is marked below.', fieldErrors }
      let attachmentId: number | null = null
      if (upload.ok && upload.file) {
        const bytes = Buffer.from(upload.file.bytes.buffer, upload.file.bytes.byteOffset, upload.file.bytes.byteLength)
        const [row] = await tx
          .insert(attachments)
          .values({
            userId: input.userId,
            courseId: ctx.courseId,
            fileName: upload.file.fileName,
            contentType: upload.file.contentType,
            size: bytes.byteLength,
            sha256: createHash('sha256').update(bytes).digest('hex'),
            data: bytes,
          })
          .returning({ id: attachments.id })
        attachmentId = row!.id
      }
      let disputeId: number
      try {
        const [row] = await tx
          .insert(disputes)
          .values({
            courseId: ctx.courseId,
            assignmentId: ctx.assignmentId,
            itemId: ctx.itemId,
            userId: input.userId,
            findName: input.findName,
            partResultId: allowance.disputedPart.id,
            reason,
            attachmentId,
          })
          .returning({ id: disputes.id })
        disputeId = row!.id
      } catch (e) {
        // Two presses at once: the partial unique index lets one through; the other rolls back.
        if (isUniqueViolation(e, 'disputes_one_open_per_find')) throw new OpenDisputeExists()
        throw e
      }
      await tx.insert(auditEvents).values({
        actorId: input.userId,
        courseId: ctx.courseId,
        assignmentId: ctx.assignmentId,
        userId: input.userId,
        partResultId: allowance.disputedPart.id,
        kind: 'dispute-raised',
        before: null,
        after: { disputeId, findName: input.findName },
        note: reason,
      })
      return { ok: true, disputeId }
    })
  } catch (e) {
    if (e instanceof OpenDisputeExists || isUniqueViolation(e, 'disputes_one_open_per_find'))
      return { ok: false, fieldErrors: { findName: OPEN_ALREADY } }
    throw e
  }
}

// ---- Reading ----------------------------------------------------------------------------

const student = alias(users, 'student')
const resolver = alias(users, 'resolver')

const listColumns = {
  id: disputes.id,
  status: disputes.status,
  createdAt: disputes.createdAt,
  resolvedAt: disputes.resolvedAt,
  assignmentId: disputes.assignmentId,
  assignmentTitle: assignments.title,
  itemId: disputes.itemId,
  position: assignmentItems.position,
  versionId: assignmentItems.problemVersionId,
  findName: disputes.findName,
  studentId: student.id,
  studentName: student.name,
  studentEmail: student.email,
  reason: disputes.reason,
  attachmentId: disputes.attachmentId,
  scoreBefore: disputes.scoreBefore,
  scoreAfter: disputes.scoreAfter,
  comment: disputes.comment,
  resolvedByName: resolver.name,
  partResultId: disputes.partResultId,
  courseId: disputes.courseId,
  userId: disputes.userId,
}

function disputeQuery(database: Database, where: SQL | undefined) {
  return database
    .select(listColumns)
    .from(disputes)
    .innerJoin(assignments, eq(assignments.id, disputes.assignmentId))
    .innerJoin(assignmentItems, eq(assignmentItems.id, disputes.itemId))
    .innerJoin(student, eq(student.id, disputes.userId))
    .leftJoin(resolver, eq(resolver.id, disputes.resolvedBy))
    .where(where)
}

type DisputeRecord = Awaited<ReturnType<typeof disputeQuery>>[number]

function toListRow(r: DisputeRecord, definition: ProblemDefinition | undefined): DisputeListRow {
  return {
    id: r.id,
    status: r.status,
    createdAt: r.createdAt.toISOString(),
    resolvedAt: r.resolvedAt ? r.resolvedAt.toISOString() : null,
    assignmentId: r.assignmentId,
    assignmentTitle: r.assignmentTitle,
    position: r.position,
    problemTitle: definition?.title ?? 'Untitled problem',
    findName: r.findName,
    findLabel: definition?.finds.find((f) => f.name === r.findName)?.label ?? r.findName,
    student: { id: r.studentId, name: r.studentName, email: r.studentEmail },
    reason: r.reason,
    hasAttachment: r.attachmentId !== null,
    scoreBefore: r.scoreBefore,
    scoreAfter: r.scoreAfter,
  }
}

/** Staff: the course's disputes (oldest first); a student: only their own. */
export async function listDisputes(
  database: Database,
  input: { courseId: number; viewer: DisputeActor; filters?: DisputeListFilters; now?: Date },
): Promise<DisputeListRow[]> {
  const role = await courseRoleOf(database, input.viewer.id, input.courseId)
  if (role === null) return []
  const f = input.filters ?? {}
  const now = input.now ?? new Date()
  const rows = await disputeQuery(
    database,
    and(
      eq(disputes.courseId, input.courseId),
      isStaffRole(role) ? undefined : eq(disputes.userId, input.viewer.id),
      f.assignmentId === undefined ? undefined : eq(disputes.assignmentId, f.assignmentId),
      f.status === undefined || f.status === 'all' ? undefined : eq(disputes.status, f.status),
      f.olderThanDays === undefined || !(f.olderThanDays > 0)
        ? undefined
        : lte(disputes.createdAt, new Date(now.getTime() - f.olderThanDays * 86_400_000)),
    ),
  ).orderBy(asc(disputes.createdAt), asc(disputes.id))
  const definitions = await frozenDefinitions(
    database,
    rows.map((r) => r.versionId),
  )
  return rows.map((r) => toListRow(r, definitions.get(r.versionId)))
}

/** The dispute if the viewer may see it (staff of its course, or the student who raised it). */
async function visibleDispute(
  database: Database,
  courseId: number,
  disputeId: number,
  viewerId: number,
): Promise<{ row: DisputeRecord; staff: boolean } | null> {
  const [row] = await disputeQuery(database, and(eq(disputes.id, disputeId), eq(disputes.courseId, courseId))).limit(1)
  if (!row) return null
  const staff = isStaffRole(await courseRoleOf(database, viewerId, courseId))
  if (staff || row.userId === viewerId) return { row, staff }
  return null
}

function pitfallTitle(id: string | null): string | null {
  if (id === null) return null
  return PITFALLS.find((p) => p.id === id)?.title ?? id
}

/**
 * Null when there is no such dispute in the course or the viewer may not see it (a student sees
 * only their own, and without the key, worked solution, diagrams or the count of others).
 */
export async function getDisputeDetail(
  database: Database,
  input: { courseId: number; disputeId: number; viewer: DisputeActor },
): Promise<DisputeDetail | null> {
  const visible = await visibleDispute(database, input.courseId, input.disputeId, input.viewer.id)
  if (!visible) return null
  const { row, staff } = visible
  const ctx = await loadItemContext(database, eq(assignmentItems.id, row.itemId))
  if (!ctx) return null
  const findInfo = findOf(ctx, row.findName)
  const find = findInfo?.find
  const [answer] = await database
    .select({
      answer: partResults.answer,
      attempt: partResults.attempt,
      verdict: partResults.verdict,
      value: partResults.value,
      message: partResults.message,
      pitfallId: partResults.pitfallId,
      pitfallFeedback: partResults.pitfallFeedback,
      score: partResults.score,
      maxScore: partResults.maxScore,
      submittedAt: submissions.submittedAt,
      daysLate: submissions.daysLate,
    })
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(eq(partResults.id, row.partResultId))
  if (!answer) return null
  const attempts = await database
    .select({
      text: partResults.answer,
      attempt: partResults.attempt,
      verdict: partResults.verdict,
      score: partResults.score,
      submittedAt: submissions.submittedAt,
    })
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(
      and(
        eq(partResults.itemId, row.itemId),
        eq(partResults.userId, row.userId),
        eq(partResults.findName, row.findName),
      ),
    )
    .orderBy(asc(partResults.attempt), asc(partResults.id))
  const drawn = variantOf(ctx, row.userId)
  const displays = Object.fromEntries(ctx.definition.givens.filter((g) => g.display).map((g) => [g.name, g.display!]))
  const [file] = row.attachmentId
    ? await database
        .select({
          id: attachments.id,
          fileName: attachments.fileName,
          contentType: attachments.contentType,
          size: attachments.size,
        })
        .from(attachments)
        .where(eq(attachments.id, row.attachmentId))
    : []
  // Stored as detected from the bytes at upload; a type outside the list is not offered (nor served).
  const fileType = ALLOWED_ATTACHMENT_TYPES.find((t) => t === file?.contentType)
  // The student who raised it gets no more than their problem page gives: the key, the worked
  // solution and other students' answers are for staff (defence in depth; the page also filters).
  const keyShown = staff && drawn.ok
  const others = staff ? await sameAnswerParts(database, ctx, row.findName, row.userId, answer.value) : []
  return {
    dispute: { ...toListRow(row, ctx.definition), comment: row.comment, resolvedBy: row.resolvedByName },
    timeZone: ctx.timeZone,
    find: {
      name: row.findName,
      label: find?.label ?? row.findName,
      unit: find?.unit ?? '',
      share: findInfo?.share ?? answer.maxScore,
    },
    answer: {
      text: answer.answer,
      attempt: answer.attempt,
      verdict: answer.verdict,
      message: answer.message,
      pitfallId: answer.pitfallId,
      pitfallTitle: pitfallTitle(answer.pitfallId),
      pitfallFeedback: answer.pitfallFeedback,
      score: answer.score,
      maxScore: answer.maxScore,
      submittedAt: answer.submittedAt.toISOString(),
      daysLate: answer.daysLate,
    },
    attempts: attempts.map((a) => ({
      text: a.text,
      attempt: a.attempt,
      verdict: a.verdict,
      score: a.score,
      submittedAt: a.submittedAt.toISOString(),
    })),
    findScore: best(attempts),
    givens: drawn.ok ? drawn.variant.givens : [],
    promptHtml: drawn.ok ? renderPrompt(ctx.definition.prompt, drawn.variant.givens, displays).html : null,
    key: keyShown ? drawn.variant.key : [],
    workedHtml: keyShown ? renderWorkedSolution(workedSolution(drawn.variant, ctx.definition)) : null,
    diagrams: keyShown ? cycleDiagrams(drawn.variant.solution) : null,
    attachment:
      file && fileType ? { id: file.id, fileName: file.fileName, contentType: fileType, size: file.size } : null,
    sameAnswerOnVariant: new Set(others.map((p) => p.userId)).size,
    history: await disputeHistory(database, row, find?.label ?? row.findName),
  }
}

type GradeState = { verdict: string | null; score: number | null }

/** The grade an audit event's before or after records ({ verdict, score }); null when it records none. */
function gradeState(v: unknown): GradeState | null {
  if (!isRecord(v)) return null
  return { verdict: stringField(v, 'verdict') ?? null, score: numberField(v, 'score') ?? null }
}

function gradeText(g: GradeState | null | undefined): string {
  if (!g) return 'nothing'
  return `${g.verdict ?? 'not graded'}, ${pluralPoints(g.score ?? 0)}`
}

/** The dispute's story in words, oldest first: raised, each score change it caused, resolved. */
async function disputeHistory(
  database: Database,
  row: DisputeRecord,
  findLabel: string,
): Promise<DisputeHistoryEntry[]> {
  const actor = alias(users, 'actor')
  const subject = alias(users, 'subject')
  const auditQuery = (where: SQL | undefined) =>
    database
      .select({
        id: auditEvents.id,
        at: auditEvents.at,
        kind: auditEvents.kind,
        actorName: actor.name,
        userId: auditEvents.userId,
        studentName: subject.name,
        partResultId: auditEvents.partResultId,
        attempt: partResults.attempt,
        before: auditEvents.before,
        after: auditEvents.after,
        note: auditEvents.note,
      })
      .from(auditEvents)
      .leftJoin(actor, eq(actor.id, auditEvents.actorId))
      .leftJoin(subject, eq(subject.id, auditEvents.userId))
      .leftJoin(partResults, eq(partResults.id, auditEvents.partResultId))
      .where(where)
      .orderBy(asc(auditEvents.at), asc(auditEvents.id))
  const own = await auditQuery(
    and(
      eq(auditEvents.courseId, row.courseId),
      inArray(auditEvents.kind, ['dispute-raised', 'dispute-resolved']),
      sql`${auditEvents.after}->>'disputeId' = ${String(row.id)}`,
    ),
  )
  const raised = own.find((e) => e.kind === 'dispute-raised')
  const resolved = own.find((e) => e.kind === 'dispute-resolved')
  const changedIds = listField(resolved?.after, 'partResultIds') ?? []
  const events =
    resolved && changedIds.length > 0
      ? await auditQuery(
          and(
            eq(auditEvents.courseId, row.courseId),
            eq(auditEvents.kind, 'dispute'),
            // The same transaction, so the same now(); compared in SQL, where the microseconds are.
            sql`${auditEvents.at} = (select a2.at from ${auditEvents} a2 where a2.id = ${resolved.id})`,
            inArray(auditEvents.partResultId, changedIds.map(Number)),
          ),
        )
      : []
  const out: DisputeHistoryEntry[] = []
  out.push({
    at: (raised?.at ?? row.createdAt).toISOString(),
    who: row.studentName,
    kind: 'raised',
    text: `Disputed the verdict on “${findLabel}”${row.attachmentId !== null ? ', with an uploaded file' : ''}: ${row.reason}`,
  })
  for (const e of events) {
    const whose = e.userId === row.userId ? `${row.studentName}’s` : `${e.studentName ?? 'Another student'}’s`
    out.push({
      at: e.at.toISOString(),
      who: e.actorName,
      kind: 'score-changed',
      text: `${whose} answer (attempt ${e.attempt ?? '?'}) changed from ${gradeText(gradeState(e.before))} to ${gradeText(gradeState(e.after))}.`,
    })
  }
  if (row.status !== 'open') {
    const before = row.scoreBefore ?? 0
    const after = row.scoreAfter ?? before
    out.push({
      at: (resolved?.at ?? row.resolvedAt ?? row.createdAt).toISOString(),
      who: resolved?.actorName ?? row.resolvedByName,
      kind: 'resolved',
      text: disputeResolvedHistoryText({
        outcome: row.status,
        scoreBefore: before,
        scoreAfter: after,
        comment: row.comment,
      }),
    })
  }
  return out
}

// ---- Resolving --------------------------------------------------------------------------

const DECISIONS = ['reject', 'adjust', 'accept-for-variant'] as const

const DEFAULT_NOTES: Record<ResolveDisputeInput['decision'], string> = {
  reject: 'Dispute rejected: the score is kept.',
  adjust: 'Score adjusted on review of a dispute.',
  'accept-for-variant': 'The same answer on the same variant was accepted on review of a dispute.',
}

const STATUS_OF: Record<ResolveDisputeInput['decision'], Exclude<DisputeStatus, 'open'>> = {
  reject: 'rejected',
  adjust: 'adjusted',
  'accept-for-variant': 'upheld',
}

type PartChange = { part: GradedPart; next: { verdict: 'correct' | null; score: number }; setCorrect: boolean }

/** Staff only (instructor or TA of the course). */
export async function resolveDispute(database: Db, input: ResolveDisputeInput): Promise<ResolveDisputeResult> {
  const fieldErrors: { newScore?: string; comment?: string; decision?: string } = {}
  const decision = DECISIONS.find((d) => d === input.decision)
  if (!decision)
    fieldErrors.decision = 'Choose how to resolve the dispute: keep the score, adjust it, or accept the answer.'
  const comment = (input.comment ?? '').trim()
  if (hasControlChar(comment)) fieldErrors.comment = controlCharMessage('the comment', comment)
  else if (comment.length > COMMENT_MAX)
    fieldErrors.comment = `Keep the comment to ${COMMENT_MAX.toLocaleString('en')} characters (it has ${comment.length.toLocaleString('en')}).`
  if (decision === 'adjust') {
    if (comment === '') fieldErrors.comment ??= 'Say why the score changes.'
    if (input.newScore === undefined || !Number.isFinite(input.newScore))
      fieldErrors.newScore = 'Enter the new score for this question.'
  }
  if (!decision || Object.keys(fieldErrors).length > 0)
    return { ok: false, formError: 'The dispute was not resolved. Correct what is marked below.', fieldErrors }
  const now = input.now ?? new Date()
  const baseUrl = (input.baseUrl ?? appUrl()).replace(/\/$/, '')

  return withJobTransaction(database, async (tx, jobs): Promise<ResolveDisputeResult> => {
    const role = await courseRoleOf(tx, input.actor.id, input.courseId)
    if (!isStaffRole(role))
      return { ok: false, formError: 'Only the course’s instructors and TAs can resolve disputes.', fieldErrors: {} }
    // Locked: two reviewers pressing at once resolve it once.
    const [locked] = await tx
      .select({ id: disputes.id, status: disputes.status })
      .from(disputes)
      .where(and(eq(disputes.id, input.disputeId), eq(disputes.courseId, input.courseId)))
      .for('update')
    if (!locked) return { ok: false, formError: 'There is no such dispute in this course.', fieldErrors: {} }
    if (locked.status !== 'open') return { ok: false, formError: 'This dispute was already resolved', fieldErrors: {} }
    const [row] = await disputeQuery(tx, eq(disputes.id, input.disputeId))
    const ctx = await loadItemContext(tx, eq(assignmentItems.id, row!.itemId))
    if (!row || !ctx) return { ok: false, formError: 'This dispute’s problem is no longer available.', fieldErrors: {} }
    const findInfo = findOf(ctx, row.findName)
    const mine = await gradedParts(tx, ctx.itemId, row.userId, row.findName)
    const disputed = mine.find((p) => p.id === row.partResultId)
    if (!disputed)
      return {
        ok: false,
        formError: 'The disputed answer is no longer graded; it cannot be resolved now.',
        fieldErrors: {},
      }
    const share = disputed.maxScore
    const scoreBefore = best(mine)

    const changes: PartChange[] = []
    if (decision === 'adjust') {
      const newScore = input.newScore!
      if (newScore < 0 || newScore > share + 1e-9) {
        return {
          ok: false,
          formError: 'The dispute was not resolved. Correct what is marked below.',
          fieldErrors: {
            newScore: `The score must be between 0 and ${points(share)} (this question’s share of the points).`,
          },
        }
      }
      const target = Math.min(newScore, share)
      for (const p of mine) {
        const next = p.id === disputed.id ? target : p.score !== null && p.score > target ? target : p.score
        if (next !== p.score) changes.push({ part: p, next: { verdict: null, score: next! }, setCorrect: false })
      }
    } else if (decision === 'accept-for-variant') {
      const others = await sameAnswerParts(tx, ctx, row.findName, row.userId, disputed.value)
      for (const p of [disputed, ...others]) {
        const score = answerScore('correct', p.latePenalty, p.maxScore)
        if (p.verdict !== 'correct' || p.score !== score)
          changes.push({ part: p, next: { verdict: 'correct', score }, setCorrect: true })
      }
    }

    const note = comment || DEFAULT_NOTES[decision]
    for (const c of changes) {
      await tx
        .update(partResults)
        .set(
          c.setCorrect
            ? {
                verdict: 'correct',
                score: c.next.score,
                message: 'Accepted on review',
                pitfallId: null,
                pitfallFeedback: null,
              }
            : { score: c.next.score },
        )
        .where(eq(partResults.id, c.part.id))
    }
    if (changes.length > 0) {
      await tx.insert(auditEvents).values(
        changes.map((c) => ({
          actorId: input.actor.id,
          courseId: ctx.courseId,
          assignmentId: ctx.assignmentId,
          userId: c.part.userId,
          partResultId: c.part.id,
          kind: 'dispute',
          before: { verdict: c.part.verdict, score: c.part.score },
          after: { verdict: c.setCorrect ? 'correct' : c.part.verdict, score: c.next.score },
          note,
        })),
      )
    }
    const scoreAfter = best(await gradedParts(tx, ctx.itemId, row.userId, row.findName))
    const status = STATUS_OF[decision]
    await tx
      .update(disputes)
      .set({ status, comment: comment || null, resolvedBy: input.actor.id, resolvedAt: now, scoreBefore, scoreAfter })
      .where(eq(disputes.id, row.id))
    await tx.insert(auditEvents).values({
      actorId: input.actor.id,
      courseId: ctx.courseId,
      assignmentId: ctx.assignmentId,
      userId: row.userId,
      partResultId: row.partResultId,
      kind: 'dispute-resolved',
      before: { disputeId: row.id, status: 'open', score: scoreBefore },
      after: {
        disputeId: row.id,
        status,
        score: scoreAfter,
        changed: changes.length,
        partResultIds: changes.map((c) => c.part.id),
      },
      note,
    })

    const label = findInfo?.find.label ?? row.findName
    const mail = disputeResolutionMail({
      outcome: status,
      studentName: row.studentName,
      courseCode: ctx.courseCode,
      courseTitle: ctx.courseTitle,
      assignmentTitle: ctx.assignmentTitle,
      position: ctx.position,
      findLabel: label,
      scoreBefore,
      scoreAfter,
      share,
      comment: comment || null,
    })
    await queueMail(
      linkMail({
        to: row.studentEmail,
        subject: mail.subject,
        lines: mail.lines,
        link: `${baseUrl}/courses/${ctx.courseId}/assignments/${ctx.assignmentId}/problems/${ctx.position}`,
        linkLabel: 'See the problem',
      }),
      { connection: jobs },
    )
    return { ok: true, changed: changes.length }
  })
}

// ---- The student's side, attachments, the audit log ---------------------------------------

/** The student's disputes on one problem, newest first per find. */
export async function listMyDisputes(
  database: Database,
  input: { itemId: number; userId: number },
): Promise<MyDispute[]> {
  const rows = await database
    .select({
      id: disputes.id,
      findName: disputes.findName,
      status: disputes.status,
      createdAt: disputes.createdAt,
      resolvedAt: disputes.resolvedAt,
      comment: disputes.comment,
      scoreBefore: disputes.scoreBefore,
      scoreAfter: disputes.scoreAfter,
    })
    .from(disputes)
    .where(and(eq(disputes.itemId, input.itemId), eq(disputes.userId, input.userId)))
    .orderBy(asc(disputes.findName), desc(disputes.createdAt), desc(disputes.id))
  return rows.map((r) => ({
    ...r,
    createdAt: r.createdAt.toISOString(),
    resolvedAt: r.resolvedAt ? r.resolvedAt.toISOString() : null,
  }))
}

/** The bytes of an attachment, for its owner or the course's staff; null otherwise. */
export async function getAttachmentForViewer(
  database: Database,
  input: { courseId: number; disputeId: number; viewer: DisputeActor },
): Promise<{ fileName: string; contentType: AttachmentType; data: Buffer } | null> {
  const [row] = await database
    .select({
      ownerId: disputes.userId,
      fileName: attachments.fileName,
      contentType: attachments.contentType,
      data: attachments.data,
    })
    .from(disputes)
    .innerJoin(attachments, and(eq(attachments.id, disputes.attachmentId), eq(attachments.courseId, disputes.courseId)))
    .where(and(eq(disputes.id, input.disputeId), eq(disputes.courseId, input.courseId)))
  if (!row) return null
  if (row.ownerId !== input.viewer.id && !isStaffRole(await courseRoleOf(database, input.viewer.id, input.courseId)))
    return null
  const contentType = ALLOWED_ATTACHMENT_TYPES.find((t) => t === row.contentType)
  if (!contentType) return null
  return { fileName: row.fileName, contentType, data: Buffer.from(row.data) }
}
