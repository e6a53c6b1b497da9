/**
 * The student's side of an assignment problem: what their page shows (their variant's
 * prompt, each find's state and last answer, receipts, the key once released) and storing a
 * press of Submit.
 *
 * Submitting: answers that cannot be graded (unreadable, wrong dimension) are reported per
 * find and use no attempt; blank finds and finds already answered correctly are skipped; a
 * find out of attempts is refused. The rest are stored with the submission — the answers as
 * typed, durably — and one grading job is queued in the same transaction, so a stored
 * submission is always graded and a rolled-back one never is. Attempt numbers are counted
 * under a per-(item, student) advisory lock, so two quick presses cannot both be attempt 2.
 *
 * One press is stored once: each rendered form carries a one-time token (newFormToken), kept
 * on the submission (unique per student). A press whose token is already stored (a reload
 * that posts again, a double click) stores nothing and answers with the first press's
 * receipt and refusals. What a press refused is worked out again from the stored submission
 * (refusalsOf: its answers hold everything typed), so the page after the redirect shows it.
 */
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm'
import { nanoid } from 'nanoid'
import { precheckAnswer } from '#app/domain/assignments/grade-answer.ts'
import {
  attemptsAllowed,
  isKeyReleased,
  studentDueAt,
  submissionWindow,
  type AssignmentRules,
  type StudentExtension,
  type SubmissionWindow,
} from '#app/domain/assignments/policy.ts'
import { findShares, findState, type FindState } from '#app/domain/assignments/scoring.ts'
import type { CycleDiagrams } from '#app/domain/authoring/diagram-plot.ts'
import type { Find, KeyEntry, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { cycleDiagrams } from '#app/domain/authoring/diagrams.ts'
import { renderPrompt } from '#app/domain/authoring/prompt.ts'
import { renderWorkedSolution, workedSolution } from '#app/domain/authoring/worked-solution.ts'
import { formatUnitForDisplay } from '#app/domain/grading/index.ts'
import type { Db, Tx } from './db/client.server.ts'
import { isUniqueViolation } from './db/pg-errors.server.ts'
import { assignmentItems, assignments, courses, extensions, partResults, submissions } from './db/schema.server.ts'
import { frozenDefinitions, studentVariant } from './grading.server.ts'
import { DROPPED_SUBMIT_MESSAGE, droppedFrom } from './membership-state.server.ts'
import { enqueue, withJobTransaction } from './queue.server.ts'

type Database = Db | Tx

/** Longest answer text kept per find (the reader refuses longer ones anyway). */
export const MAX_ANSWER_LENGTH = 500

/** A fresh one-time token for a rendered answer form. */
export function newFormToken(): string {
  return nanoid()
}

/** What a form token looks like (nanoid's alphabet); anything else is treated as no token. */
export const FORM_TOKEN_PATTERN = /^[A-Za-z0-9_-]{16,64}$/

export type ProblemRef = { courseId: number; assignmentId: number; position: number; userId: number }

type LoadedItem = {
  assignmentId: number
  title: string
  courseId: number
  timeZone: string
  convention: 'chemistry' | 'engineering'
  rules: AssignmentRules
  itemId: number
  position: number
  itemCount: number
  points: number
  problemId: number
  versionId: number
  definition: ProblemDefinition
  extension: StudentExtension | null
}

async function loadItem(database: Database, ref: ProblemRef): Promise<LoadedItem | null> {
  const [row] = await database
    .select({
      assignmentId: assignments.id,
      title: assignments.title,
      courseId: assignments.courseId,
      timeZone: courses.timeZone,
      convention: courses.signConvention,
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
      itemCount: sql<number>`(select count(*)::int from ${assignmentItems} ai where ai.assignment_id = ${assignments.id})`,
      extensionId: extensions.id,
      extensionDueAt: extensions.dueAt,
      extraAttempts: extensions.extraAttempts,
    })
    .from(assignments)
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .innerJoin(
      assignmentItems,
      and(eq(assignmentItems.assignmentId, assignments.id), eq(assignmentItems.position, ref.position)),
    )
    .leftJoin(extensions, and(eq(extensions.assignmentId, assignments.id), eq(extensions.userId, ref.userId)))
    .where(and(eq(assignments.id, ref.assignmentId), eq(assignments.courseId, ref.courseId)))
    .limit(1)
  if (!row) return null
  const definition = (await frozenDefinitions(database, [row.versionId])).get(row.versionId)
  if (!definition) return null
  return {
    assignmentId: row.assignmentId,
    title: row.title,
    courseId: row.courseId,
    timeZone: row.timeZone,
    convention: row.convention,
    rules: {
      opensAt: row.opensAt,
      dueAt: row.dueAt,
      attemptsPerFind: row.attemptsPerFind,
      latePolicy: row.latePolicy,
      latePenaltyPercentPerDay: row.latePenaltyPercentPerDay,
      lateDaysAllowed: row.lateDaysAllowed,
      keyRelease: row.keyRelease,
      keyReleasedAt: row.keyReleasedAt,
    },
    itemId: row.itemId,
    position: row.position,
    itemCount: row.itemCount,
    points: row.points,
    problemId: row.problemId,
    versionId: row.versionId,
    definition,
    extension: row.extensionId === null ? null : { dueAt: row.extensionDueAt, extraAttempts: row.extraAttempts ?? 0 },
  }
}

type PartRow = {
  submissionId: number
  findName: string
  attempt: number
  answer: string
  verdict: 'correct' | 'incorrect' | 'unreadable' | 'wrong-dimension' | null
  score: number | null
  message: string | null
  pitfallFeedback: string | null
  status: 'queued' | 'graded' | 'failed'
}

async function loadParts(database: Database, itemId: number, userId: number): Promise<PartRow[]> {
  return database
    .select({
      submissionId: partResults.submissionId,
      findName: partResults.findName,
      attempt: partResults.attempt,
      answer: partResults.answer,
      verdict: partResults.verdict,
      score: partResults.score,
      message: partResults.message,
      pitfallFeedback: partResults.pitfallFeedback,
      status: submissions.status,
    })
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(and(eq(partResults.itemId, itemId), eq(partResults.userId, userId)))
    .orderBy(asc(partResults.findName), asc(partResults.attempt))
}

export type FindView = {
  name: string
  label: string
  unit: string
  /** how the unit is shown beside the input ("kJ/kg"; "" for a pure number) */
  unitHint: string
  share: number
  state: FindState
  attemptsUsed: number
  attemptsAllowed: number
  /** best score so far */
  score: number
  /** the latest counted answer and its grade (verdict null while it is being graded) */
  last: {
    answer: string
    attempt: number
    verdict: PartRow['verdict']
    message: string | null
    pitfallFeedback: string | null
    gradingFailed: boolean
  } | null
}

export type Receipt = {
  submissionId: number
  submittedAt: string
  status: 'queued' | 'graded' | 'failed'
  daysLate: number
  latePenalty: number
  parts: { findName: string; label: string; attempt: number; of: number }[]
}

export type MyResults = {
  finds: FindView[]
  receipts: Receipt[]
  /** any answer still waiting for the grader */
  pending: boolean
  score: number
  points: number
  /** the text last typed per find (blank finds included), to refill the form */
  lastTyped: Record<string, string>
}

function findViews(item: LoadedItem, parts: PartRow[]): FindView[] {
  const allowed = attemptsAllowed(item.rules, item.extension)
  const shares = findShares(
    item.points,
    item.definition.finds.map((f) => f.points),
  )
  return item.definition.finds.map((f, i) => {
    const mine = parts.filter((p) => p.findName === f.name)
    const last = mine.at(-1)
    const anyCorrect = mine.some((p) => p.verdict === 'correct')
    const anyPending = mine.some((p) => p.verdict === null && p.status === 'queued')
    return {
      name: f.name,
      label: f.label,
      unit: f.unit,
      unitHint: formatUnitForDisplay(f.unit),
      share: shares[i] ?? 0,
      state: findState({ attemptsUsed: mine.length, attemptsAllowed: allowed, anyCorrect, anyPending }),
      attemptsUsed: mine.length,
      attemptsAllowed: allowed,
      score: mine.reduce((best, p) => Math.max(best, p.score ?? 0), 0),
      last: last
        ? {
            answer: last.answer,
            attempt: last.attempt,
            verdict: last.verdict,
            message: last.message,
            pitfallFeedback: last.pitfallFeedback,
            gradingFailed: last.status === 'failed',
          }
        : null,
    }
  })
}

async function myResults(database: Database, item: LoadedItem, userId: number): Promise<MyResults> {
  return (await myResultsAndParts(database, item, userId)).results
}

type LatestPress = { id: number; answers: Record<string, string> }

async function myResultsAndParts(
  database: Database,
  item: LoadedItem,
  userId: number,
): Promise<{ results: MyResults; parts: PartRow[]; latest: LatestPress | null }> {
  const parts = await loadParts(database, item.itemId, userId)
  const finds = findViews(item, parts)
  const subs = await database
    .select({
      id: submissions.id,
      submittedAt: submissions.submittedAt,
      status: submissions.status,
      daysLate: submissions.daysLate,
      latePenalty: submissions.latePenalty,
      answers: submissions.answers,
    })
    .from(submissions)
    .where(and(eq(submissions.itemId, item.itemId), eq(submissions.userId, userId)))
    .orderBy(desc(submissions.submittedAt), desc(submissions.id))
    .limit(20)
  const allowed = attemptsAllowed(item.rules, item.extension)
  const labels = new Map(item.definition.finds.map((f) => [f.name, f.label]))
  const receipts: Receipt[] = subs.map((s) => ({
    submissionId: s.id,
    submittedAt: s.submittedAt.toISOString(),
    status: s.status,
    daysLate: s.daysLate,
    latePenalty: s.latePenalty,
    parts: parts
      .filter((p) => p.submissionId === s.id)
      .map((p) => ({
        findName: p.findName,
        label: labels.get(p.findName) ?? p.findName,
        attempt: p.attempt,
        of: allowed,
      })),
  }))
  const results: MyResults = {
    finds,
    receipts,
    pending: finds.some((f) => f.state === 'grading'),
    score: Math.round(finds.reduce((a, f) => a + f.score, 0) * 1e6) / 1e6,
    points: item.points,
    lastTyped: subs[0]?.answers ?? {},
  }
  return {
    results,
    parts,
    latest: subs[0] ? { id: subs[0].id, answers: subs[0].answers } : null,
  }
}

/** How one press treats one find's text: not sent, skipped (already correct), refused (with why, no attempt used) or counted. */
type PartDecision =
  { kind: 'blank' } | { kind: 'skip' } | { kind: 'refuse'; message: string } | { kind: 'count'; text: string }

/**
 * The rules of a press for one find, in order: blank, already correct, out of attempts, too
 * long, unreadable or of the wrong dimension, else counted. `earlier` are the student's
 * counted answers to this find stored before this press.
 */
function decidePart(find: Find, typed: string, earlier: readonly PartRow[], allowed: number): PartDecision {
  const text = typed.slice(0, MAX_ANSWER_LENGTH).trim()
  if (text === '') return { kind: 'blank' }
  if (earlier.some((p) => p.verdict === 'correct')) return { kind: 'skip' }
  if (earlier.length >= allowed)
    return { kind: 'refuse', message: `You have used all ${allowed} attempts for this question.` }
  if (typed.length > MAX_ANSWER_LENGTH)
    return {
      kind: 'refuse',
      message: `This answer is longer than ${MAX_ANSWER_LENGTH} characters; shorten it. It did not use an attempt.`,
    }
  const check = precheckAnswer(find, text)
  if (!check.ok) return { kind: 'refuse', message: `${check.message} This did not use an attempt.` }
  return { kind: 'count', text }
}

/**
 * The finds a stored press did not count, with why, worked out again from what it stored
 * (its answers keep every text typed; its parts are the counted ones). The rules are pure
 * and the earlier answers are those stored before it, so this repeats what the press said.
 */
function refusalsOf(item: LoadedItem, parts: readonly PartRow[], press: LatestPress): Record<string, string> {
  const allowed = attemptsAllowed(item.rules, item.extension)
  const out: Record<string, string> = {}
  for (const f of item.definition.finds) {
    const mine = parts.filter((p) => p.findName === f.name)
    if (mine.some((p) => p.submissionId === press.id)) continue
    const decision = decidePart(
      f,
      String(press.answers[f.name] ?? ''),
      mine.filter((p) => p.submissionId < press.id),
      allowed,
    )
    if (decision.kind === 'refuse') out[f.name] = decision.message
    // Stored text that the rules would count now was refused for a reason the stored text no
    // longer shows (it was cut to the longest kept length).
    else if (decision.kind === 'count')
      out[f.name] = 'This answer was not counted; check it and submit it again. It did not use an attempt.'
  }
  return out
}

export type StudentProblem = {
  assignment: {
    id: number
    title: string
    timeZone: string
    dueAt: string
    hasExtension: boolean
    rules: AssignmentRules
  }
  item: { id: number; position: number; count: number; points: number; title: string }
  window: SubmissionWindow
  /** null when the variant could not be drawn (a broken problem version; staff are told) */
  promptHtml: string | null
  variantError: string | null
  results: MyResults
  /** what the shown press (`receiptId`, when it is the student's latest) did not count, with why */
  refused: { submissionId: number; fieldErrors: Record<string, string> } | null
  /** the key, worked solution and diagrams, once released to this student */
  key: { entries: readonly KeyEntry[]; workedHtml: string; diagrams: CycleDiagrams } | null
}

/**
 * The problem page of one student (or of a staff member previewing their own variant, with
 * `showKey`). Null when there is no such problem in the course, or it is not open yet to a student.
 */
export async function getStudentProblem(
  database: Database,
  ref: ProblemRef & { now?: Date; showKey?: boolean; allowBeforeOpen?: boolean; receiptId?: number | null },
): Promise<StudentProblem | null> {
  const now = ref.now ?? new Date()
  const item = await loadItem(database, ref)
  if (!item) return null
  if (!ref.allowBeforeOpen && now.getTime() < item.rules.opensAt.getTime()) return null
  const drawn = studentVariant({
    versionId: item.versionId,
    definition: item.definition,
    assignmentId: item.assignmentId,
    problemId: item.problemId,
    userId: ref.userId,
    courseConvention: item.convention,
  })
  const displays = Object.fromEntries(item.definition.givens.filter((g) => g.display).map((g) => [g.name, g.display!]))
  const released = ref.showKey === true || isKeyReleased(item.rules, item.extension, now)
  let key: StudentProblem['key'] = null
  if (drawn.ok && released) {
    key = {
      entries: drawn.variant.key,
      workedHtml: renderWorkedSolution(workedSolution(drawn.variant, item.definition)),
      diagrams: cycleDiagrams(drawn.variant.solution),
    }
  }
  const mine = await myResultsAndParts(database, item, ref.userId)
  // Only for the latest press: the form is refilled with its text, so its refusals sit beside it.
  const refused =
    ref.receiptId != null && mine.latest?.id === ref.receiptId
      ? { submissionId: mine.latest.id, fieldErrors: refusalsOf(item, mine.parts, mine.latest) }
      : null
  return {
    assignment: {
      id: item.assignmentId,
      title: item.title,
      timeZone: item.timeZone,
      dueAt: studentDueAt(item.rules, item.extension).toISOString(),
      hasExtension: item.extension !== null,
      rules: item.rules,
    },
    item: {
      id: item.itemId,
      position: item.position,
      count: item.itemCount,
      points: item.points,
      title: item.definition.title,
    },
    window: submissionWindow(item.rules, item.extension, now),
    promptHtml: drawn.ok ? renderPrompt(item.definition.prompt, drawn.variant.givens, displays).html : null,
    variantError: drawn.ok
      ? null
      : 'This problem could not be set up for you. Please tell your teacher; your answers to other problems are not affected.',
    results: mine.results,
    refused,
    key,
  }
}

/**
 * What the page polls while grading runs (GET /api/assignments/:a/problems/:p/mine). Null
 * when there is no such problem in the course or it has not opened yet.
 */
export async function getMyResults(database: Database, ref: ProblemRef & { now?: Date }): Promise<MyResults | null> {
  const item = await loadItem(database, ref)
  if (!item) return null
  if ((ref.now ?? new Date()).getTime() < item.rules.opensAt.getTime()) return null
  return myResults(database, item, ref.userId)
}

/** The course an assignment belongs to, or null. */
export async function findAssignmentCourseId(database: Database, assignmentId: number): Promise<number | null> {
  const [row] = await database
    .select({ courseId: assignments.courseId })
    .from(assignments)
    .where(eq(assignments.id, assignmentId))
  return row?.courseId ?? null
}

export type SubmitResult =
  | {
      ok: true
      /** the form's token was already stored: nothing new was stored, this is the first press's answer */
      repeated: boolean
      receipt: Receipt
      /** finds not counted, with why (unreadable, wrong dimension, out of attempts) */
      fieldErrors: Record<string, string>
      /** finds skipped because they are already correct */
      skipped: string[]
      values: Record<string, string>
    }
  | { ok: false; formError: string; fieldErrors: Record<string, string>; values: Record<string, string> }

function receiptOf(
  item: LoadedItem,
  allowed: number,
  sub: { id: number; submittedAt: Date; daysLate: number; latePenalty: number; status: Receipt['status'] },
  counted: readonly { findName: string; attempt: number }[],
): Receipt {
  const labels = new Map(item.definition.finds.map((f) => [f.name, f.label]))
  return {
    submissionId: sub.id,
    submittedAt: sub.submittedAt.toISOString(),
    status: sub.status,
    daysLate: sub.daysLate,
    latePenalty: sub.latePenalty,
    parts: counted.map((c) => ({
      findName: c.findName,
      label: labels.get(c.findName) ?? c.findName,
      attempt: c.attempt,
      of: allowed,
    })),
  }
}

/** The press stored with this student's form token, if any. */
async function pressWithToken(database: Database, userId: number, formToken: string) {
  const [row] = await database
    .select({
      id: submissions.id,
      itemId: submissions.itemId,
      answers: submissions.answers,
      submittedAt: submissions.submittedAt,
      status: submissions.status,
      daysLate: submissions.daysLate,
      latePenalty: submissions.latePenalty,
    })
    .from(submissions)
    .where(and(eq(submissions.userId, userId), eq(submissions.formToken, formToken)))
    .limit(1)
  return row ?? null
}

/** The first press's answer to a press repeating its token. */
async function answerRepeat(
  database: Database,
  item: LoadedItem,
  userId: number,
  stored: NonNullable<Awaited<ReturnType<typeof pressWithToken>>>,
  typed: Record<string, string>,
): Promise<SubmitResult> {
  const answers = stored.answers
  if (stored.itemId !== item.itemId) {
    return {
      ok: false,
      formError:
        'This form was already sent from another problem’s page. Reload this page and submit again; your answers are still in the form.',
      fieldErrors: {},
      values: typed,
    }
  }
  const parts = await loadParts(database, item.itemId, userId)
  const allowed = attemptsAllowed(item.rules, item.extension)
  const counted = parts.filter((p) => p.submissionId === stored.id)
  return {
    ok: true,
    repeated: true,
    receipt: receiptOf(item, allowed, stored, counted),
    fieldErrors: refusalsOf(item, parts, { id: stored.id, answers }),
    skipped: [],
    values: answers,
  }
}

function isFormTokenClash(e: unknown): boolean {
  return isUniqueViolation(e, 'submissions_user_form_token_idx')
}

/**
 * Stores a press of Submit (see the header) and queues its grading. `answers` maps find
 * names to the text typed; other keys are ignored. `formToken` is the rendered form's
 * one-time token: a press with a token already stored stores nothing and answers as the
 * first did (`repeated`). Without a token (a page from before tokens) the press is stored
 * as a fresh one. Never throws for a student's input.
 */
export async function submitAnswers(
  database: Db,
  ref: ProblemRef & { answers: Record<string, string>; now?: Date; formToken?: string | null },
): Promise<SubmitResult> {
  const formToken = ref.formToken && FORM_TOKEN_PATTERN.test(ref.formToken) ? ref.formToken : null
  try {
    return await storePress(database, { ...ref, formToken })
  } catch (e) {
    // The same token sent for two problems at once: the other press won; answer as a repeat.
    if (formToken && isFormTokenClash(e)) return storePress(database, { ...ref, formToken })
    throw e
  }
}

async function storePress(
  database: Db,
  ref: ProblemRef & { answers: Record<string, string>; now?: Date; formToken: string | null },
): Promise<SubmitResult> {
  const values: Record<string, string> = {}
  return withJobTransaction(database, async (tx, jobs) => {
    const item = await loadItem(tx, ref)
    if (!item)
      return { ok: false, formError: 'There is no such problem in this course.', fieldErrors: {}, values: ref.answers }
    for (const f of item.definition.finds) values[f.name] = (ref.answers[f.name] ?? '').slice(0, MAX_ANSWER_LENGTH)
    if ((await droppedFrom(tx, ref.userId, ref.courseId)) !== null)
      return { ok: false, formError: DROPPED_SUBMIT_MESSAGE, fieldErrors: {}, values }
    // The clock is read inside the transaction, after the lock, so lateness is judged at storage time.
    await tx.execute(sql`select pg_advisory_xact_lock(${item.itemId}, ${ref.userId})`)
    // After the lock: a press with the same token that got here first has committed, so it is seen.
    if (ref.formToken) {
      const stored = await pressWithToken(tx, ref.userId, ref.formToken)
      if (stored) return answerRepeat(tx, item, ref.userId, stored, values)
    }
    const now = ref.now ?? new Date()
    const window = submissionWindow(item.rules, item.extension, now)
    if (window.state === 'not-open' || window.state === 'closed') {
      const formError =
        window.state === 'not-open'
          ? 'This assignment is not open yet, so your answers were not submitted. They are still in the form.'
          : window.reason === 'key-released'
            ? 'The key has been released, so answers are no longer accepted. Your answers are still in the form.'
            : 'The due date has passed and this assignment no longer accepts answers. Your answers are still in the form.'
      return { ok: false, formError, fieldErrors: {}, values }
    }
    const parts = await loadParts(tx, item.itemId, ref.userId)
    const allowed = attemptsAllowed(item.rules, item.extension)
    const shares = findShares(
      item.points,
      item.definition.finds.map((f) => f.points),
    )
    const fieldErrors: Record<string, string> = {}
    const skipped: string[] = []
    const counted: { findName: string; answer: string; attempt: number; maxScore: number }[] = []
    item.definition.finds.forEach((f, i) => {
      const mine = parts.filter((p) => p.findName === f.name)
      const decision = decidePart(f, ref.answers[f.name] ?? '', mine, allowed)
      if (decision.kind === 'skip') skipped.push(f.name)
      else if (decision.kind === 'refuse') fieldErrors[f.name] = decision.message
      else if (decision.kind === 'count')
        counted.push({ findName: f.name, answer: decision.text, attempt: mine.length + 1, maxScore: shares[i] ?? 0 })
    })
    if (counted.length === 0) {
      const formError =
        Object.keys(fieldErrors).length > 0
          ? 'Nothing was submitted: fix the answers marked below. No attempt was used.'
          : skipped.length > 0
            ? 'Nothing new to submit: the questions you answered are already correct.'
            : 'Nothing was submitted: type an answer to at least one question.'
      return { ok: false, formError, fieldErrors, values }
    }
    // The submission and its parts in one statement (one round trip fewer on the busiest path).
    const partValues = sql.join(
      counted.map(
        (c) => sql`(${c.findName}::text, ${c.answer}::text, ${c.attempt}::int, ${c.maxScore}::double precision)`,
      ),
      sql`, `,
    )
    const daysLate = window.state === 'late' ? window.daysLate : 0
    const penalty = window.state === 'late' ? window.penalty : 0
    const inserted = await tx.execute<{
      id: number
      submitted_at: Date | string
      days_late: number
      late_penalty: number
    }>(sql`
      with s as (
        insert into ${submissions} (assignment_id, item_id, user_id, answers, submitted_at, days_late, late_penalty, form_token)
        values (${item.assignmentId}, ${item.itemId}, ${ref.userId}, ${JSON.stringify(values)}::jsonb, ${now.toISOString()}::timestamptz, ${daysLate}, ${penalty}, ${ref.formToken}::text)
        returning id, submitted_at, days_late, late_penalty
      ), p as (
        insert into ${partResults} (submission_id, assignment_id, item_id, user_id, find_name, answer, attempt, max_score)
        select s.id, ${item.assignmentId}, ${item.itemId}, ${ref.userId}, v.find_name, v.answer, v.attempt, v.max_score
        from s cross join (values ${partValues}) as v(find_name, answer, attempt, max_score)
      )
      select id, submitted_at, days_late, late_penalty from s`)
    const row = inserted.rows[0]!
    const sub = {
      id: row.id,
      submittedAt: new Date(row.submitted_at),
      daysLate: row.days_late,
      latePenalty: Number(row.late_penalty),
    }
    await enqueue('grade-submission', { v: 1, submissionId: sub.id }, { connection: jobs })
    return {
      ok: true,
      repeated: false,
      receipt: receiptOf(item, allowed, { ...sub, status: 'queued' }, counted),
      fieldErrors,
      skipped,
      values,
    }
  })
}

/** Submission ids of a student's item, newest first (tests and the receipt page). */
export async function listSubmissionIds(database: Database, itemIds: number[], userId: number): Promise<number[]> {
  if (itemIds.length === 0) return []
  const rows = await database
    .select({ id: submissions.id })
    .from(submissions)
    .where(and(inArray(submissions.itemId, itemIds), eq(submissions.userId, userId)))
    .orderBy(desc(submissions.id))
  return rows.map((r) => r.id)
}
