/**
 * One student's record in a course, for the staff's student page: who they are (name, student
 * ID, e-mail, section, dropped or not), and for every assignment their own variant of every
 * problem (givens and key, drawn from the seed by the same pure code the problem page and the
 * regrade use), every answer they sent with its grade, their extension, and their disputes.
 *
 * Callers check the viewer's role first; this module only answers "what is there".
 */
import { and, asc, eq, inArray } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { findShares } from '#app/domain/assignments/scoring.ts'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { formatGivenValue, unitToText } from '#app/domain/authoring/placeholders.ts'
import { PITFALLS } from '#app/domain/grading/pitfalls.ts'
import type { Db, Tx } from './db/client.server.ts'
import {
  assignmentItems,
  assignments,
  courses,
  disputes,
  extensions,
  memberships,
  partResults,
  submissions,
  users,
  type DisputeStatus,
} from './db/schema.server.ts'
import { frozenDefinitions, studentVariant } from './grading.server.ts'
import { studentNames } from './gradebook.server.ts'

type Database = Db | Tx

export type RecordVerdict = 'correct' | 'incorrect' | 'unreadable' | 'wrong-dimension'

export type RecordAnswer = {
  partResultId: number
  attempt: number
  /** exactly as typed */
  answer: string
  submittedAt: string
  /** null until graded */
  verdict: RecordVerdict | null
  /** the press's grading state: a failed one will not be graded */
  status: 'queued' | 'graded' | 'failed'
  score: number | null
  maxScore: number
  daysLate: number
  /** the share of points lost to lateness, 0…1 */
  latePenalty: number
  pitfall: { id: string; title: string; feedback: string } | null
  message: string | null
}

export type RecordFind = {
  name: string
  label: string
  /** the unit for reading (kJ/kg, °C), '' for a pure number */
  unit: string
  /** the most this find can earn in the assignment */
  share: number
  /** the best graded score, null when nothing is graded yet */
  best: number | null
  answers: RecordAnswer[]
}

export type RecordItem = {
  position: number
  title: string
  points: number
  /** the student's variant: givens as text with units, the key in each find's unit */
  variant:
    | {
        ok: true
        givens: { name: string; label: string; text: string }[]
        key: { name: string; label: string; value: number; unit: string }[]
      }
    | { ok: false; message: string }
  finds: RecordFind[]
  /** answers to finds the current version no longer has (kept after a regrade to a new version) */
  otherAnswers: (RecordAnswer & { findName: string })[]
}

export type RecordExtension = {
  dueAt: string | null
  extraAttempts: number
  reason: string
  grantedBy: string
  updatedAt: string
}

export type RecordAssignment = {
  id: number
  title: string
  opensAt: string
  dueAt: string
  attemptsPerFind: number
  points: number
  /** the sum of the best scores, graded answers only */
  score: number
  answered: number
  extension: RecordExtension | null
  items: RecordItem[]
}

export type RecordDispute = {
  id: number
  assignmentId: number
  assignmentTitle: string
  position: number
  findName: string
  findLabel: string
  status: DisputeStatus
  reason: string
  createdAt: string
  resolvedAt: string | null
  resolvedBy: string | null
  scoreBefore: number | null
  scoreAfter: number | null
}

export type StudentRecord = {
  course: { id: number; code: string; title: string; timeZone: string }
  student: {
    id: number
    name: string
    familyName: string
    givenName: string
    email: string
    studentNumber: string | null
    section: string | null
    droppedAt: string | null
    /** has set a password */
    joined: boolean
  }
  assignments: RecordAssignment[]
  disputes: RecordDispute[]
}

const pitfallTitle = (id: string) => PITFALLS.find((p) => p.id === id)?.title ?? id

/**
 * The record of student `userId` in course `courseId`, or null when they are not a student of
 * that course (never a member, staff, or a member of another course only).
 */
export async function getStudentRecord(
  database: Database,
  input: { courseId: number; userId: number },
): Promise<StudentRecord | null> {
  const [who] = await database
    .select({
      course: {
        id: courses.id,
        code: courses.code,
        title: courses.title,
        timeZone: courses.timeZone,
        convention: courses.signConvention,
      },
      user: {
        id: users.id,
        name: users.name,
        email: users.email,
        studentNumber: users.studentNumber,
        familyName: users.familyName,
        givenName: users.givenName,
        passwordHash: users.passwordHash,
      },
      section: memberships.section,
      droppedAt: memberships.droppedAt,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .innerJoin(courses, eq(courses.id, memberships.courseId))
    .where(
      and(
        eq(memberships.courseId, input.courseId),
        eq(memberships.userId, input.userId),
        eq(memberships.role, 'student'),
      ),
    )
    .limit(1)
  if (!who) return null
  const { course, user } = who

  const assignmentRows = await database
    .select({
      id: assignments.id,
      title: assignments.title,
      opensAt: assignments.opensAt,
      dueAt: assignments.dueAt,
      attemptsPerFind: assignments.attemptsPerFind,
    })
    .from(assignments)
    .where(eq(assignments.courseId, course.id))
    .orderBy(asc(assignments.dueAt), asc(assignments.id))
  const assignmentIds = assignmentRows.map((a) => a.id)

  const [itemRows, answerRows, extensionRows, disputeRows] = assignmentIds.length
    ? await Promise.all([
        database
          .select({
            id: assignmentItems.id,
            assignmentId: assignmentItems.assignmentId,
            position: assignmentItems.position,
            problemId: assignmentItems.problemId,
            versionId: assignmentItems.problemVersionId,
            points: assignmentItems.points,
          })
          .from(assignmentItems)
          .where(inArray(assignmentItems.assignmentId, assignmentIds))
          .orderBy(asc(assignmentItems.assignmentId), asc(assignmentItems.position)),
        database
          .select({
            partResultId: partResults.id,
            itemId: partResults.itemId,
            findName: partResults.findName,
            attempt: partResults.attempt,
            answer: partResults.answer,
            verdict: partResults.verdict,
            score: partResults.score,
            maxScore: partResults.maxScore,
            message: partResults.message,
            pitfallId: partResults.pitfallId,
            pitfallFeedback: partResults.pitfallFeedback,
            status: submissions.status,
            submittedAt: submissions.submittedAt,
            daysLate: submissions.daysLate,
            latePenalty: submissions.latePenalty,
          })
          .from(partResults)
          .innerJoin(submissions, eq(submissions.id, partResults.submissionId))
          .where(and(eq(partResults.userId, user.id), inArray(partResults.assignmentId, assignmentIds)))
          .orderBy(asc(partResults.itemId), asc(partResults.findName), asc(partResults.attempt), asc(partResults.id)),
        (() => {
          const granter = alias(users, 'granter')
          return database
            .select({
              assignmentId: extensions.assignmentId,
              dueAt: extensions.dueAt,
              extraAttempts: extensions.extraAttempts,
              reason: extensions.reason,
              grantedBy: granter.name,
              updatedAt: extensions.updatedAt,
            })
            .from(extensions)
            .innerJoin(granter, eq(granter.id, extensions.createdBy))
            .where(and(eq(extensions.userId, user.id), inArray(extensions.assignmentId, assignmentIds)))
        })(),
        (() => {
          const resolver = alias(users, 'resolver')
          return database
            .select({
              id: disputes.id,
              assignmentId: disputes.assignmentId,
              itemId: disputes.itemId,
              findName: disputes.findName,
              status: disputes.status,
              reason: disputes.reason,
              createdAt: disputes.createdAt,
              resolvedAt: disputes.resolvedAt,
              resolvedBy: resolver.name,
              scoreBefore: disputes.scoreBefore,
              scoreAfter: disputes.scoreAfter,
            })
            .from(disputes)
            .leftJoin(resolver, eq(resolver.id, disputes.resolvedBy))
            .where(and(eq(disputes.userId, user.id), eq(disputes.courseId, course.id)))
            .orderBy(asc(disputes.createdAt), asc(disputes.id))
        })(),
      ])
    : [[], [], [], []]

  const definitions = await frozenDefinitions(
    database,
    itemRows.map((i) => i.versionId),
  )
  const answersOf = new Map<number, typeof answerRows>()
  for (const a of answerRows) answersOf.set(a.itemId, [...(answersOf.get(a.itemId) ?? []), a])
  const toAnswer = (a: (typeof answerRows)[number]): RecordAnswer => ({
    partResultId: a.partResultId,
    attempt: a.attempt,
    answer: a.answer,
    submittedAt: a.submittedAt.toISOString(),
    verdict: a.verdict,
    status: a.status,
    score: a.score,
    maxScore: a.maxScore,
    daysLate: a.daysLate,
    latePenalty: a.latePenalty,
    pitfall: a.pitfallId
      ? { id: a.pitfallId, title: pitfallTitle(a.pitfallId), feedback: a.pitfallFeedback ?? '' }
      : null,
    message: a.message,
  })

  const itemInfo = new Map<
    number,
    { position: number; assignmentId: number; definition: ProblemDefinition | undefined }
  >()
  const itemsOf = new Map<number, RecordItem[]>()
  for (const row of itemRows) {
    const definition = definitions.get(row.versionId)
    itemInfo.set(row.id, { position: row.position, assignmentId: row.assignmentId, definition })
    const mine = answersOf.get(row.id) ?? []
    let item: RecordItem
    if (!definition) {
      item = {
        position: row.position,
        title: 'A problem whose version is missing',
        points: row.points,
        variant: { ok: false, message: 'Its problem version is missing.' },
        finds: [],
        otherAnswers: mine.map((a) => ({ ...toAnswer(a), findName: a.findName })),
      }
    } else {
      const drawn = studentVariant({
        versionId: row.versionId,
        definition,
        assignmentId: row.assignmentId,
        problemId: row.problemId,
        userId: user.id,
        courseConvention: course.convention,
      })
      const displays = new Map(definition.givens.map((g) => [g.name, g.display]))
      const shares = findShares(
        row.points,
        definition.finds.map((f) => f.points),
      )
      const names = new Set(definition.finds.map((f) => f.name))
      item = {
        position: row.position,
        title: definition.title,
        points: row.points,
        variant: drawn.ok
          ? {
              ok: true,
              givens: drawn.variant.givens.map((g) => {
                const shown = formatGivenValue(g, displays.get(g.name), { tex: false })
                return { name: g.name, label: g.label, text: shown.ok ? shown.text : g.text }
              }),
              key: drawn.variant.key.map((k) => ({
                name: k.name,
                label: k.label,
                value: k.value,
                unit: unitToText(k.unit),
              })),
            }
          : { ok: false, message: drawn.error.message },
        finds: definition.finds.map((f, i) => {
          const answers = mine.filter((a) => a.findName === f.name).map(toAnswer)
          const graded = answers.filter((a) => a.score !== null).map((a) => a.score!)
          return {
            name: f.name,
            label: f.label,
            unit: unitToText(f.unit),
            share: shares[i] ?? 0,
            best: graded.length ? Math.max(...graded) : null,
            answers,
          }
        }),
        otherAnswers: mine.filter((a) => !names.has(a.findName)).map((a) => ({ ...toAnswer(a), findName: a.findName })),
      }
    }
    itemsOf.set(row.assignmentId, [...(itemsOf.get(row.assignmentId) ?? []), item])
  }

  const extensionOf = new Map(extensionRows.map((e) => [e.assignmentId, e]))
  const recordAssignments: RecordAssignment[] = assignmentRows.map((a) => {
    const items = itemsOf.get(a.id) ?? []
    const ext = extensionOf.get(a.id)
    return {
      id: a.id,
      title: a.title,
      opensAt: a.opensAt.toISOString(),
      dueAt: a.dueAt.toISOString(),
      attemptsPerFind: a.attemptsPerFind,
      points: items.reduce((s, i) => s + i.points, 0),
      score: items.reduce((s, i) => s + i.finds.reduce((t, f) => t + (f.best ?? 0), 0), 0),
      answered: items.reduce(
        (s, i) => s + i.finds.reduce((t, f) => t + f.answers.length, 0) + i.otherAnswers.length,
        0,
      ),
      extension: ext
        ? {
            dueAt: ext.dueAt?.toISOString() ?? null,
            extraAttempts: ext.extraAttempts,
            reason: ext.reason,
            grantedBy: ext.grantedBy,
            updatedAt: ext.updatedAt.toISOString(),
          }
        : null,
      items,
    }
  })

  const titleOf = new Map(assignmentRows.map((a) => [a.id, a.title]))
  const recordDisputes: RecordDispute[] = disputeRows.map((d) => {
    const info = itemInfo.get(d.itemId)
    return {
      id: d.id,
      assignmentId: d.assignmentId,
      assignmentTitle: titleOf.get(d.assignmentId) ?? '',
      position: info?.position ?? 0,
      findName: d.findName,
      findLabel: info?.definition?.finds.find((f) => f.name === d.findName)?.label ?? d.findName,
      status: d.status,
      reason: d.reason,
      createdAt: d.createdAt.toISOString(),
      resolvedAt: d.resolvedAt?.toISOString() ?? null,
      resolvedBy: d.resolvedBy,
      scoreBefore: d.scoreBefore,
      scoreAfter: d.scoreAfter,
    }
  })

  const names = studentNames(user)
  return {
    course: { id: course.id, code: course.code, title: course.title, timeZone: course.timeZone },
    student: {
      id: user.id,
      name: user.name,
      familyName: names.familyName,
      givenName: names.givenName,
      email: user.email,
      studentNumber: names.studentNumber,
      section: who.section,
      droppedAt: who.droppedAt?.toISOString() ?? null,
      joined: user.passwordHash !== null,
    },
    assignments: recordAssignments,
    disputes: recordDisputes,
  }
}
