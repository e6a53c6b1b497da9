/**
 * The demo's assignments and the answers its students gave, all invented. Dates are placed
 * around the seed's `now` (a past week, the current week, a coming week) in the course's time
 * zone. Answers go through submitAnswers, as a student's form does, with a `now` inside the
 * assignment's window, and are graded at once with gradeSubmission so the demo never waits
 * for a worker (their queued grading jobs are then skipped by the worker as already graded).
 *
 * Idempotent: an assignment is found again by its title in its course; one already there is
 * left as it is, with its answers. Deterministic: every choice comes from seedFrom, never
 * from Math.random, so two fresh databases seeded with the same `now` look the same.
 */
import { and, asc, eq, sql } from 'drizzle-orm'
import type { Find, KeyEntry, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { seedFrom } from '#app/domain/authoring/seed.ts'
import { mulberry32 } from '#app/domain/random.ts'
import { parseLocalDateTime, toLocalDateTimeValue } from '#app/lib/dates.ts'
import type { Db } from '#app/server/db/client.server.ts'
import {
  assignmentItems,
  assignments,
  courses,
  extensions,
  memberships,
  partResults,
  problemVersions,
  problems,
  submissions,
  type NewAssignment,
} from '#app/server/db/schema.server.ts'
import { gradeSubmission, studentVariant } from '#app/server/grading.server.ts'
import { readDefinition } from '#app/server/definitions.server.ts'
import { freezeProblemVersion } from '#app/server/problems.server.ts'
import { submitAnswers } from '#app/server/submissions.server.ts'
import type { DemoOwner } from './problems.ts'

const DAY_MS = 24 * 3600_000
const HOUR_MS = 3600_000

type CourseKey = 'engineering' | 'chemistry'

type DemoAssignment = {
  course: CourseKey
  title: string
  instructions: string
  /** [days from the seed's now, local wall-clock time] */
  opens: [number, string]
  due: [number, string]
  rules: Pick<
    NewAssignment,
    'attemptsPerFind' | 'latePolicy' | 'latePenaltyPercentPerDay' | 'lateDaysAllowed' | 'keyRelease'
  >
  /** Bank problems by owner and title; `version` pins an earlier (frozen) version, else the latest. */
  items: { owner: DemoOwner; title: string; version?: number; points: number }[]
  /** Whether the demo students have answered it. */
  answered: boolean
  extension?: { student: number; extraDays: number; extraAttempts: number; reason: string }
}

export const DEMO_ASSIGNMENTS: readonly DemoAssignment[] = [
  {
    course: 'engineering',
    title: 'Week 6: Otto and Diesel cycles',
    instructions:
      'Two air-standard engines. Keep four significant figures in intermediate results and give each answer with its unit.',
    opens: [-21, '08:00'],
    due: [-7, '23:59'],
    rules: {
      attemptsPerFind: 3,
      latePolicy: 'closed',
      latePenaltyPercentPerDay: 0,
      lateDaysAllowed: 0,
      keyRelease: 'after-due',
    },
    // Version 1 of the Otto problem is the one this assignment froze; the bank has moved on to version 2.
    items: [
      { owner: 'tobias', title: 'Air-standard Otto cycle', version: 1, points: 10 },
      { owner: 'tobias', title: 'Air-standard Diesel cycle with a given cutoff ratio', points: 10 },
    ],
    answered: true,
  },
  {
    course: 'engineering',
    title: 'Week 9: Gas turbines',
    instructions:
      'Simple and regenerative gas turbines. Late answers are accepted for three days at 10 % of the points per day.',
    opens: [-4, '08:00'],
    due: [7, '23:59'],
    rules: {
      attemptsPerFind: 3,
      latePolicy: 'penalty',
      latePenaltyPercentPerDay: 10,
      lateDaysAllowed: 3,
      keyRelease: 'manual',
    },
    items: [
      { owner: 'tobias', title: 'Gas-turbine (Brayton) cycle with component efficiencies', points: 10 },
      { owner: 'tobias', title: 'Regenerative gas turbine', points: 10 },
    ],
    answered: true,
    extension: { student: 3, extraDays: 2, extraAttempts: 1, reason: 'Documented accommodation' },
  },
  {
    course: 'engineering',
    title: 'Week 11: Rankine cycles',
    instructions: 'Steam power plants. Use the steam properties the problem gives you.',
    opens: [7, '08:00'],
    due: [21, '23:59'],
    rules: {
      attemptsPerFind: 3,
      latePolicy: 'closed',
      latePenaltyPercentPerDay: 0,
      lateDaysAllowed: 0,
      keyRelease: 'after-due',
    },
    items: [
      { owner: 'tobias', title: 'Ideal Rankine cycle with superheat', points: 10 },
      { owner: 'tobias', title: 'Reheat Rankine cycle', points: 10 },
    ],
    answered: false,
  },
  {
    course: 'chemistry',
    title: 'Problem set 3: The Carnot engine',
    instructions:
      'One mole of a monatomic gas. Work per mole in the chemistry convention: w is the work done on the gas.',
    opens: [-24, '09:00'],
    due: [-10, '17:00'],
    rules: {
      attemptsPerFind: 3,
      latePolicy: 'penalty',
      latePenaltyPercentPerDay: 20,
      lateDaysAllowed: 2,
      keyRelease: 'after-due',
    },
    items: [{ owner: 'amara', title: 'Carnot engine on one mole of a monatomic gas', points: 10 }],
    answered: true,
  },
  {
    course: 'chemistry',
    title: 'Problem set 4: Carnot heat pumps and refrigerators',
    instructions: 'Reversible machines run backwards. Mind the signs of q and w.',
    opens: [-2, '09:00'],
    due: [5, '17:00'],
    rules: {
      attemptsPerFind: 3,
      latePolicy: 'closed',
      latePenaltyPercentPerDay: 0,
      lateDaysAllowed: 0,
      keyRelease: 'after-due',
    },
    items: [
      { owner: 'amara', title: 'Reversible heat pump on a diatomic gas', points: 10 },
      { owner: 'tobias', title: 'Carnot refrigerator for a cold store', points: 10 },
    ],
    answered: true,
  },
]

/** A local wall-clock time `days` days from `now` in `timeZone`. */
function localDay(now: Date, days: number, time: string, timeZone: string): Date {
  const date = toLocalDateTimeValue(new Date(now.getTime() + days * DAY_MS), timeZone).slice(0, 10)
  const at = parseLocalDateTime(`${date}T${time}`, timeZone)
  if (!at) throw new Error(`Demo date ${date}T${time} does not exist in ${timeZone}`)
  return at
}

/** Four significant figures, as a student copies a calculator, with the find's unit. */
export function formatAnswer(value: number, unit: string): string {
  const text = String(Number(value.toPrecision(4)))
  return unit === '' ? text : `${text} ${unit}`
}

type Rand = () => number

/** The answer one student types to one find: mostly right, some catalogued slips, some careless. */
function typedAnswer(find: Find, key: KeyEntry, rand: Rand): string {
  const r = rand()
  if (r < 0.6) return formatAnswer(key.value, key.unit)
  if (r < 0.78) {
    if (find.pitfalls.includes('sign-convention-flipped')) return formatAnswer(-key.value, key.unit)
    if (find.pitfalls.includes('kilo-factor')) return formatAnswer(key.value * 1000, key.unit)
  }
  if (r < 0.9) {
    const off = (0.04 + 0.16 * rand()) * (rand() < 0.5 ? -1 : 1)
    return formatAnswer(key.value * (1 + off), key.unit)
  }
  if (r < 0.95) return ''
  // Refused before counting: no attempt is used and nothing is stored for this find.
  return rand() < 0.5 ? `about ${formatAnswer(key.value, '')}` : `${formatAnswer(key.value, '')}..`
}

type Resolved = {
  itemId: number
  position: number
  problemId: number
  versionId: number
  definition: ProblemDefinition
}

export type SeedAssignmentsResult = { assignmentIds: number[]; created: number; submissions: number }

/**
 * The demo assignments of both courses, with the students' graded answers. `owners` are the
 * instructors (the assignments' authors and the bank problems' owners).
 */
export async function seedDemoAssignments(
  db: Db,
  input: { now: Date; courseIds: Record<CourseKey, number>; owners: Record<DemoOwner, number> },
): Promise<SeedAssignmentsResult> {
  const { now } = input
  const ids: number[] = []
  let created = 0
  let submitted = 0
  for (const spec of DEMO_ASSIGNMENTS) {
    const courseId = input.courseIds[spec.course]
    const [found] = await db
      .select({ id: assignments.id })
      .from(assignments)
      .where(and(eq(assignments.courseId, courseId), eq(assignments.title, spec.title)))
    if (found) {
      ids.push(found.id)
      continue
    }
    const [course] = await db
      .select({ timeZone: courses.timeZone, convention: courses.signConvention })
      .from(courses)
      .where(eq(courses.id, courseId))
    const zone = course!.timeZone
    const author = input.owners[spec.course === 'engineering' ? 'tobias' : 'amara']
    const versions: { problemId: number; versionId: number; definition: unknown; points: number }[] = []
    for (const it of spec.items) {
      const [row] = await db
        .select({
          problemId: problems.id,
          versionId: problemVersions.id,
          number: problemVersions.number,
          definition: problemVersions.definition,
        })
        .from(problems)
        .innerJoin(problemVersions, eq(problemVersions.problemId, problems.id))
        .where(and(eq(problems.ownerId, input.owners[it.owner]), eq(problems.title, it.title)))
        .orderBy(sql`${problemVersions.number} = ${it.version ?? 0} desc`, sql`${problemVersions.number} desc`)
        .limit(1)
      if (!row || (it.version !== undefined && row.number !== it.version))
        throw new Error(
          `Demo assignment "${spec.title}" needs the bank problem "${it.title}"${it.version ? ` version ${it.version}` : ''}`,
        )
      versions.push({ ...row, points: it.points })
    }
    const opensAt = localDay(now, spec.opens[0], spec.opens[1], zone)
    const dueAt = localDay(now, spec.due[0], spec.due[1], zone)
    const made = await db.transaction(async (tx) => {
      const [a] = await tx
        .insert(assignments)
        .values({
          courseId,
          createdBy: author,
          title: spec.title,
          instructions: spec.instructions,
          opensAt,
          dueAt,
          ...spec.rules,
          createdAt: new Date(opensAt.getTime() - 3 * DAY_MS),
        })
        .returning({ id: assignments.id })
      const rows = await tx
        .insert(assignmentItems)
        .values(
          versions.map((v, i) => ({
            assignmentId: a!.id,
            position: i + 1,
            problemId: v.problemId,
            problemVersionId: v.versionId,
            points: v.points,
          })),
        )
        .returning({ id: assignmentItems.id, position: assignmentItems.position })
      for (const v of versions) await freezeProblemVersion(tx, v.versionId)
      return { id: a!.id, itemIds: rows.sort((x, y) => x.position - y.position).map((r) => r.id) }
    })
    const assignmentId = made.id
    ids.push(assignmentId)
    created++

    const students = await db
      .select({ userId: memberships.userId })
      .from(memberships)
      .where(and(eq(memberships.courseId, courseId), eq(memberships.role, 'student')))
      .orderBy(asc(memberships.userId))
    if (spec.extension) {
      const who = students[spec.extension.student % students.length]!
      await db.insert(extensions).values({
        assignmentId,
        userId: who.userId,
        dueAt: new Date(dueAt.getTime() + spec.extension.extraDays * DAY_MS),
        extraAttempts: spec.extension.extraAttempts,
        reason: spec.extension.reason,
        createdBy: author,
      })
    }
    if (!spec.answered) continue

    const items: Resolved[] = versions.map((v, i) => ({
      itemId: made.itemIds[i]!,
      position: i + 1,
      problemId: v.problemId,
      versionId: v.versionId,
      definition: readDefinition(v.definition, v.versionId),
    }))
    // The window the demo answers fall in: from opening to the seed's now, or to the end of
    // the late days for a past assignment (a few students answer late).
    const lateEnd =
      spec.rules.latePolicy === 'penalty'
        ? dueAt.getTime() + (spec.rules.lateDaysAllowed ?? 0) * DAY_MS
        : dueAt.getTime()
    const windowEnd = Math.min(now.getTime() - HOUR_MS, lateEnd)
    const stored: number[] = []
    for (const { userId } of students) {
      const rand = mulberry32(seedFrom('demo-answers', spec.title, userId))
      if (rand() >= 0.5) continue
      for (const item of items) {
        const drawn = studentVariant({
          versionId: item.versionId,
          definition: item.definition,
          assignmentId,
          problemId: item.problemId,
          userId,
          courseConvention: course!.convention,
        })
        if (!drawn.ok) continue
        const keys = new Map(drawn.variant.key.map((k) => [k.name, k]))
        const span = windowEnd - opensAt.getTime()
        // Most answer before the due date; under a penalty policy some answer late.
        const late = windowEnd > dueAt.getTime() && rand() < 0.15
        let at = late
          ? dueAt.getTime() + rand() * (windowEnd - dueAt.getTime()) * 0.8
          : opensAt.getTime() + span * (0.1 + 0.5 * rand())
        let answers: Record<string, string> = {}
        for (const f of item.definition.finds) answers[f.name] = typedAnswer(f, keys.get(f.name)!, rand)
        for (let attempt = 0; attempt < 3 && at < windowEnd; attempt++) {
          const result = await submitAnswers(db, {
            courseId,
            assignmentId,
            position: item.position,
            userId,
            answers,
            now: new Date(at),
          })
          if (result.ok) {
            await gradeSubmission(db, result.receipt.submissionId)
            stored.push(result.receipt.submissionId)
          }
          // Some come back to fix what was marked wrong (or refused), a few hours later.
          if (rand() >= 0.55) break
          const graded = await db
            .select({ findName: partResults.findName })
            .from(partResults)
            .where(
              and(
                eq(partResults.itemId, item.itemId),
                eq(partResults.userId, userId),
                eq(partResults.verdict, 'correct'),
              ),
            )
          const correct = new Set(graded.map((g) => g.findName))
          if (correct.size === item.definition.finds.length) break
          answers = Object.fromEntries(
            item.definition.finds.map((f) => [
              f.name,
              correct.has(f.name)
                ? answers[f.name]!
                : rand() < 0.75
                  ? formatAnswer(keys.get(f.name)!.value, keys.get(f.name)!.unit)
                  : typedAnswer(f, keys.get(f.name)!, rand),
            ]),
          )
          at += (2 + 20 * rand()) * HOUR_MS
        }
      }
    }
    if (stored.length > 0) {
      // Graded "a few seconds after submitting", as a running worker would have, not at seed time.
      await db.execute(
        sql`update ${submissions} set graded_at = submitted_at + make_interval(secs => 2 + id % 5) where id in (${sql.join(
          stored.map((id) => sql`${id}`),
          sql`, `,
        )})`,
      )
      await db.execute(
        sql`update ${partResults} p set graded_at = s.graded_at from ${submissions} s where s.id = p.submission_id and p.submission_id in (${sql.join(
          stored.map((id) => sql`${id}`),
          sql`, `,
        )})`,
      )
    }
    submitted += stored.length
  }
  return { assignmentIds: ids, created, submissions: submitted }
}
