/**
 * Grading on the server: a student's variant (recomputed from the problem version's definition
 * and the seed, cached per process by the definition's content), grading one stored submission
 * in one transaction, and the best score per find that gradebooks and exports add up.
 *
 * Idempotent by construction: gradeSubmission locks the submission row and grades only a
 * submission still 'queued', so a retried or duplicated job changes nothing the second time.
 */
import { createHash } from 'node:crypto'
import { and, eq, inArray, isNull, sql } from 'drizzle-orm'
import { gradeAnswer } from '#app/domain/assignments/grade-answer.ts'
import { findShares } from '#app/domain/assignments/scoring.ts'
import type { DrawResult, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { seedFrom } from '#app/domain/authoring/seed.ts'
import { drawVariant, resolveConvention } from '#app/domain/authoring/variant.ts'
import type { CheckDetail } from '#app/domain/grading/index.ts'
import type { Convention } from '#app/domain/thermo/index.ts'
import type { Db, Tx } from './db/client.server.ts'
import { tryReadDefinition } from './definitions.server.ts'
import { assignmentItems, assignments, courses, partResults, problemVersions, submissions } from './db/schema.server.ts'

type Database = Db | Tx

/** Changes when the way answers are graded changes, so a grade says which rules made it. */
export const GRADER_VERSION = 'cw-grader-1'

/** The seed of a student's variant of a problem in an assignment (the problem, not the version: a regrade keeps the numbers). */
export function studentSeed(assignmentId: number, problemId: number, userId: number): number {
  return seedFrom('assignment', assignmentId, 'problem', problemId, 'student', userId)
}

// Variants are recomputed on demand; this keeps the last few thousand per process so a
// burst of submissions to one problem solves each student's cycle once. The key is the
// definition's content (not the version id): an unfrozen version is edited in place, and a
// regrade preview may target one, so an id alone could hand back numbers from before the edit.
const VARIANT_CACHE_LIMIT = 5000
const variantCache = new Map<string, DrawResult>()

/** JSON with object keys sorted at every level, so equal documents give equal text whatever their key order (jsonb reorders keys). */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null'
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`
  const entries: [string, unknown][] = Object.entries(value)
    .filter(([, v]) => v !== undefined && typeof v !== 'function')
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`
}

/** A stable hash of a definition's content (sha256 of its canonical JSON). */
export function definitionHash(definition: ProblemDefinition): string {
  return createHash('sha256').update(canonicalJson(definition)).digest('base64url')
}

/**
 * A student's variant of a problem version in the course's sign convention. Never throws.
 * `versionId` names the version for the caller's sake; the numbers depend only on the
 * definition, the seed and the convention, and so does the cache.
 */
export function studentVariant(input: {
  versionId: number
  definition: ProblemDefinition
  assignmentId: number
  problemId: number
  userId: number
  courseConvention: Convention
}): DrawResult {
  const seed = studentSeed(input.assignmentId, input.problemId, input.userId)
  const convention = resolveConvention(input.definition, input.courseConvention)
  const cacheKey = `${definitionHash(input.definition)}|${seed}|${convention}`
  const hit = variantCache.get(cacheKey)
  if (hit) {
    // Map keeps insertion order: re-inserting makes this the most recently used.
    variantCache.delete(cacheKey)
    variantCache.set(cacheKey, hit)
    return hit
  }
  let drawn: DrawResult
  try {
    drawn = drawVariant(input.definition, seed, { convention })
  } catch (e) {
    console.error('drawVariant threw', e)
    drawn = { ok: false, seed, error: { code: 'invalid-definition', message: 'This variant could not be drawn.' } }
  }
  variantCache.set(cacheKey, drawn)
  if (variantCache.size > VARIANT_CACHE_LIMIT) variantCache.delete(variantCache.keys().next().value!)
  return drawn
}

/**
 * 'busy': another transaction holds the submission (a batch still running past its job's
 * expiry, say); the job must be retried, not completed, since that transaction may yet fail.
 */
export type GradeOutcome = 'graded' | 'already-graded' | 'busy' | 'missing' | 'failed'

// Definitions of frozen versions, by version id. Safe to keep: a frozen version is never
// edited (saving it makes the next version), so the document under a frozen id never changes.
// An unfrozen version (edited in place) is read from the database every time and never kept.
const DEFINITION_CACHE_LIMIT = 500
const definitionCache = new Map<number, ProblemDefinition>()

/**
 * The definitions of these versions in one query; frozen ones come from (and go to) the
 * per-process cache. A version whose stored definition fails the check is left out (and
 * logged): callers treat it as a version that cannot be drawn.
 */
export async function frozenDefinitions(
  database: Database,
  versionIds: readonly number[],
): Promise<Map<number, ProblemDefinition>> {
  const out = new Map<number, ProblemDefinition>()
  const missing: number[] = []
  for (const id of new Set(versionIds)) {
    const hit = definitionCache.get(id)
    if (hit) out.set(id, hit)
    else missing.push(id)
  }
  if (missing.length > 0) {
    const rows = await database
      .select({ id: problemVersions.id, definition: problemVersions.definition, frozenAt: problemVersions.frozenAt })
      .from(problemVersions)
      .where(inArray(problemVersions.id, missing))
    for (const r of rows) {
      const read = tryReadDefinition(r.definition, r.id)
      if (!read.ok) continue
      const def = read.definition
      out.set(r.id, def)
      if (r.frozenAt === null) continue
      definitionCache.set(r.id, def)
      if (definitionCache.size > DEFINITION_CACHE_LIMIT) definitionCache.delete(definitionCache.keys().next().value!)
    }
  }
  return out
}

/**
 * Grades every ungraded part of a submission and marks it graded, in one transaction.
 * 'failed' means the variant could not be drawn (a broken problem version): the submission is
 * marked failed with the reason, which staff see; retrying would not help.
 */
export async function gradeSubmission(database: Db, submissionId: number): Promise<GradeOutcome> {
  const outcomes = await gradeSubmissions(database, [submissionId])
  return outcomes.get(submissionId) ?? 'missing'
}

/**
 * Grades a batch of submissions in one transaction (the worker takes jobs in batches; one
 * commit for the batch instead of one per submission is most of the grader's speed). Each
 * submission is graded only while it is still 'queued', under a row lock, so a retried or
 * duplicated job never counts twice. A submission another transaction is grading right now
 * is skipped (SKIP LOCKED) and reported 'busy', for its job to be retried (that transaction
 * may still roll back). Returns each id's outcome.
 */
export async function gradeSubmissions(
  database: Db,
  submissionIds: readonly number[],
): Promise<Map<number, GradeOutcome>> {
  const ids = [...new Set(submissionIds)]
  const outcomes = new Map<number, GradeOutcome>(ids.map((id) => [id, 'missing']))
  if (ids.length === 0) return outcomes
  return database.transaction(async (tx) => {
    const idList = sql.join(
      ids.map((id) => sql`${id}`),
      sql`, `,
    )
    // The items first (shared): a regrade moving an item to another version holds it
    // exclusively, so a grade is never computed from a version the regrade has replaced.
    await tx.execute(
      sql`select 1 from ${assignmentItems} where id in (select item_id from ${submissions} where id in (${idList})) order by id for share`,
    )
    const rows = await tx
      .select({
        id: submissions.id,
        status: submissions.status,
        userId: submissions.userId,
        assignmentId: submissions.assignmentId,
        latePenalty: submissions.latePenalty,
        itemId: submissions.itemId,
        itemPoints: assignmentItems.points,
        problemId: assignmentItems.problemId,
        versionId: assignmentItems.problemVersionId,
        toleranceOverrides: assignmentItems.toleranceOverrides,
        convention: courses.signConvention,
      })
      .from(submissions)
      .innerJoin(assignmentItems, eq(assignmentItems.id, submissions.itemId))
      .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
      .innerJoin(courses, eq(courses.id, assignments.courseId))
      .where(inArray(submissions.id, ids))
      .orderBy(submissions.id)
      .for('update', { of: submissions, skipLocked: true })
    for (const r of rows) outcomes.set(r.id, 'already-graded')
    const seen = new Set(rows.map((r) => r.id))
    // Not locked by us: held by another transaction, or no such submission (deleted with its course).
    if (seen.size < ids.length) {
      const exist = await tx.select({ id: submissions.id }).from(submissions).where(inArray(submissions.id, ids))
      const present = new Set(exist.map((r) => r.id))
      for (const id of ids) if (!seen.has(id)) outcomes.set(id, present.has(id) ? 'busy' : 'missing')
    }
    const queued = rows.filter((r) => r.status === 'queued')
    if (queued.length === 0) return outcomes

    const definitions = await frozenDefinitions(
      tx,
      queued.map((r) => r.versionId),
    )
    const parts = await tx
      .select({
        id: partResults.id,
        submissionId: partResults.submissionId,
        findName: partResults.findName,
        answer: partResults.answer,
      })
      .from(partResults)
      .where(
        and(
          inArray(
            partResults.submissionId,
            queued.map((r) => r.id),
          ),
          isNull(partResults.verdict),
        ),
      )
    const partsOf = new Map<number, typeof parts>()
    for (const p of parts) partsOf.set(p.submissionId, [...(partsOf.get(p.submissionId) ?? []), p])

    type Graded = {
      id: number
      verdict: string
      value: number | null
      score: number
      message: string
      pitfallId: string | null
      pitfallFeedback: string | null
      detail: CheckDetail | null
      versionId: number
    }
    const graded: Graded[] = []
    const done: number[] = []
    const failed: { id: number; error: string }[] = []
    for (const row of queued) {
      const definition = definitions.get(row.versionId)
      const drawn = definition
        ? studentVariant({
            versionId: row.versionId,
            definition,
            assignmentId: row.assignmentId,
            problemId: row.problemId,
            userId: row.userId,
            courseConvention: row.convention,
          })
        : null
      if (!definition || !drawn || !drawn.ok) {
        const why = drawn && !drawn.ok ? drawn.error.message : 'its problem version is missing'
        failed.push({ id: row.id, error: `The problem version could not be solved for this student: ${why}` })
        outcomes.set(row.id, 'failed')
        continue
      }
      const shares = findShares(
        row.itemPoints,
        definition.finds.map((f) => f.points),
      )
      const overrides = row.toleranceOverrides
      for (const p of partsOf.get(row.id) ?? []) {
        const index = definition.finds.findIndex((f) => f.name === p.findName)
        const find = definition.finds[index]
        if (!find) {
          graded.push({
            id: p.id,
            verdict: 'incorrect',
            value: null,
            score: 0,
            message: 'This question is no longer part of the problem.',
            pitfallId: null,
            pitfallFeedback: null,
            detail: null,
            versionId: row.versionId,
          })
          continue
        }
        const g = gradeAnswer({
          find,
          variant: drawn.variant,
          answer: p.answer,
          tolerance: overrides[find.name],
          share: shares[index] ?? 0,
          latePenalty: row.latePenalty,
        })
        graded.push({
          id: p.id,
          verdict: g.verdict,
          value: g.value,
          score: g.score,
          message: g.message,
          pitfallId: g.pitfall?.id ?? null,
          pitfallFeedback: g.pitfall?.feedback ?? null,
          detail: g.detail,
          versionId: row.versionId,
        })
      }
      done.push(row.id)
      outcomes.set(row.id, 'graded')
    }
    if (graded.length > 0) {
      // One statement for all parts of the batch.
      const values = sql.join(
        graded.map(
          (g) =>
            sql`(${g.id}::int, ${g.verdict}::verdict, ${g.value}::double precision, ${g.score}::double precision, ${g.message}::text, ${g.pitfallId}::text, ${g.pitfallFeedback}::text, ${g.detail === null ? null : JSON.stringify(g.detail)}::jsonb, ${g.versionId}::int)`,
        ),
        sql`, `,
      )
      await tx.execute(sql`
        update ${partResults} as p set
          verdict = v.verdict, value = v.value, score = v.score, message = v.message,
          pitfall_id = v.pitfall_id, pitfall_feedback = v.pitfall_feedback, detail = v.detail,
          graded_version_id = v.version_id, grader_version = ${GRADER_VERSION}, graded_at = clock_timestamp()
        from (values ${values}) as v(id, verdict, value, score, message, pitfall_id, pitfall_feedback, detail, version_id)
        where p.id = v.id`)
    }
    if (done.length > 0) {
      await tx
        .update(submissions)
        .set({ status: 'graded', gradedAt: sql`clock_timestamp()`, error: null })
        .where(inArray(submissions.id, done))
    }
    for (const f of failed) {
      await tx
        .update(submissions)
        .set({ status: 'failed', gradedAt: sql`clock_timestamp()`, error: f.error })
        .where(eq(submissions.id, f.id))
    }
    return outcomes
  })
}

export type FindScoreRow = {
  assignmentId: number
  itemId: number
  userId: number
  findName: string
  /** best score over graded answers */
  score: number
  maxScore: number
  attempts: number
  pending: number
  correct: boolean
  /** any counted answer after the student's due date */
  late: boolean
  firstCorrect: boolean
}

/**
 * The best score of each (student, find) with an answer, for the given assignments and
 * optionally one student. Finds never answered have no row (they score 0).
 */
export async function listFindScores(
  database: Database,
  filter: { assignmentIds: number[]; userId?: number },
): Promise<FindScoreRow[]> {
  if (filter.assignmentIds.length === 0) return []
  const rows = await database
    .select({
      assignmentId: partResults.assignmentId,
      itemId: partResults.itemId,
      userId: partResults.userId,
      findName: partResults.findName,
      score: sql<number>`coalesce(max(${partResults.score}), 0)::float8`,
      maxScore: sql<number>`max(${partResults.maxScore})::float8`,
      attempts: sql<number>`count(*)::int`,
      pending: sql<number>`(count(*) filter (where ${partResults.verdict} is null and ${submissions.status} = 'queued'))::int`,
      correct: sql<boolean>`bool_or(${partResults.verdict} = 'correct')`,
      late: sql<boolean>`bool_or(${submissions.daysLate} > 0)`,
      firstCorrect: sql<boolean>`bool_or(${partResults.attempt} = 1 and ${partResults.verdict} = 'correct')`,
    })
    .from(partResults)
    .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
    .where(
      and(
        inArray(partResults.assignmentId, filter.assignmentIds),
        filter.userId === undefined ? undefined : eq(partResults.userId, filter.userId),
      ),
    )
    .groupBy(partResults.assignmentId, partResults.itemId, partResults.userId, partResults.findName)
  return rows.map((r) => ({
    ...r,
    correct: r.correct === true,
    late: r.late === true,
    firstCorrect: r.firstCorrect === true,
  }))
}

export type AssignmentTotalRow = {
  courseId: number
  assignmentId: number
  userId: number
  /** sum over finds of the best score (late penalties already taken off) */
  score: number
  /** the assignment's points (sum of its items' points) */
  maxScore: number
  /** answers still waiting for the grader */
  pending: number
  /** any counted answer after the student's due date */
  late: boolean
}

/**
 * Each student's total on each assignment of the given courses (students with no answer to
 * an assignment get a row with score 0). Students are the courses' current student members.
 */
export async function listAssignmentTotals(
  database: Database,
  filter: { courseIds: number[]; assignmentIds?: number[] },
): Promise<AssignmentTotalRow[]> {
  if (filter.courseIds.length === 0) return []
  const courseList = sql.join(
    filter.courseIds.map((id) => sql`${id}`),
    sql`, `,
  )
  const assignmentFilter = filter.assignmentIds
    ? sql`and a.id in (${sql.join(
        [0, ...filter.assignmentIds].map((id) => sql`${id}`),
        sql`, `,
      )})`
    : sql``
  const result = await database.execute<{
    course_id: number
    assignment_id: number
    user_id: number
    score: number
    max_score: number
    pending: number
    late: boolean
  }>(sql`
    with best as (
      select p.assignment_id, p.user_id, p.item_id, p.find_name,
             coalesce(max(p.score), 0) as score,
             count(*) filter (where p.verdict is null and s.status = 'queued') as pending,
             bool_or(s.days_late > 0) as late
      from part_results p join submissions s on s.id = p.submission_id
      join assignments a on a.id = p.assignment_id
      where a.course_id in (${courseList}) ${assignmentFilter}
      group by p.assignment_id, p.user_id, p.item_id, p.find_name
    ),
    per_student as (
      select assignment_id, user_id, sum(score) as score, sum(pending) as pending, bool_or(late) as late
      from best group by assignment_id, user_id
    ),
    points as (
      select a.id as assignment_id, a.course_id, coalesce(sum(i.points), 0) as max_score
      from assignments a left join assignment_items i on i.assignment_id = a.id
      where a.course_id in (${courseList}) ${assignmentFilter}
      group by a.id
    )
    select pt.course_id, pt.assignment_id, m.user_id,
           round(coalesce(ps.score, 0)::numeric, 6)::float8 as score, pt.max_score::float8 as max_score,
           coalesce(ps.pending, 0)::int as pending, coalesce(ps.late, false) as late
    from points pt
    join memberships m on m.course_id = pt.course_id and m.role = 'student'
    left join per_student ps on ps.assignment_id = pt.assignment_id and ps.user_id = m.user_id
    order by pt.course_id, pt.assignment_id, m.user_id`)
  return result.rows.map((r) => ({
    courseId: r.course_id,
    assignmentId: r.assignment_id,
    userId: r.user_id,
    score: Number(r.score),
    maxScore: Number(r.max_score),
    pending: Number(r.pending),
    late: r.late === true,
  }))
}
