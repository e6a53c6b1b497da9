/**
 * The course's audit log as the audit page shows it: each entry with the names behind its ids
 * (who acted, whom it is about, the assignment, the question's label from the problem
 * definition, a regrade's version numbers, terms and problem versions named in its values),
 * ready for app/lib/audit-words.ts to put into words.
 */
import { and, count, desc, eq, inArray } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import type { AuditEntryFacts, AuditLookups } from '#app/lib/audit-words.ts'
import type { Db, Tx } from './db/client.server.ts'
import {
  assignmentItems,
  assignments,
  auditEvents,
  partResults,
  problems,
  problemVersions,
  regrades,
  terms,
  users,
} from './db/schema.server.ts'
import { frozenDefinitions } from './grading.server.ts'
import { isRecord } from './json-values.server.ts'

type Database = Db | Tx

export type AuditLogRow = AuditEntryFacts & { id: number; at: string; actor: string | null }

const REGRADE_NOTE = /^Regrade (\d{1,9})\b/

/** A page of the course's entries, newest first, with everything their wording needs. */
export async function listAuditLog(
  database: Database,
  input: { courseId: number; kind?: string; limit?: number; offset?: number },
): Promise<{ rows: AuditLogRow[]; total: number; lookups: Omit<AuditLookups, 'timeZone'> }> {
  const actor = alias(users, 'actor')
  const subject = alias(users, 'subject')
  const where = and(eq(auditEvents.courseId, input.courseId), input.kind ? eq(auditEvents.kind, input.kind) : undefined)
  const limit = Math.min(Math.max(1, Math.trunc(input.limit ?? 50)), 500)
  const offset = Math.max(0, Math.trunc(input.offset ?? 0))
  const rows = await database
    .select({
      id: auditEvents.id,
      at: auditEvents.at,
      actor: actor.name,
      kind: auditEvents.kind,
      subject: subject.name,
      assignmentTitle: assignments.title,
      assignmentDueAt: assignments.dueAt,
      before: auditEvents.before,
      after: auditEvents.after,
      note: auditEvents.note,
      findName: partResults.findName,
      maxScore: partResults.maxScore,
      gradedVersionId: partResults.gradedVersionId,
      position: assignmentItems.position,
      itemVersionId: assignmentItems.problemVersionId,
    })
    .from(auditEvents)
    .leftJoin(actor, eq(actor.id, auditEvents.actorId))
    .leftJoin(subject, eq(subject.id, auditEvents.userId))
    .leftJoin(assignments, eq(assignments.id, auditEvents.assignmentId))
    .leftJoin(partResults, eq(partResults.id, auditEvents.partResultId))
    .leftJoin(assignmentItems, eq(assignmentItems.id, partResults.itemId))
    .where(where)
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(limit)
    .offset(offset)
  const [total] = await database.select({ n: count() }).from(auditEvents).where(where)

  // Regrades named by their entries' notes ("Regrade 12"), with their versions' numbers.
  const regradeIds = [
    ...new Set(
      rows
        .filter((r) => r.kind === 'regrade')
        .map((r) => Number(REGRADE_NOTE.exec(r.note)?.[1] ?? NaN))
        .filter(Number.isFinite),
    ),
  ]
  const regradeRows = regradeIds.length
    ? await database
        .select({ id: regrades.id, fromVersionId: regrades.fromVersionId, toVersionId: regrades.toVersionId })
        .from(regrades)
        .where(inArray(regrades.id, regradeIds))
    : []
  const regradeOf = new Map(regradeRows.map((r) => [r.id, r]))

  // Problem versions named anywhere: the items' (for question labels), the regrades', and an
  // assignment change's lists of problems.
  const itemVersionIds = (v: unknown) =>
    Array.isArray(v) ? v.map((x) => (isRecord(x) ? Number(x.versionId) : NaN)).filter(Number.isInteger) : []
  const listed = rows
    .filter((r) => r.kind === 'assignment-changed')
    .flatMap((r) => [
      ...itemVersionIds(isRecord(r.before) ? r.before.items : null),
      ...itemVersionIds(isRecord(r.after) ? r.after.items : null),
    ])
  const versionIds = [
    ...new Set([
      ...rows.flatMap((r) => [r.itemVersionId, r.gradedVersionId]).filter((x): x is number => x !== null),
      ...regradeRows.flatMap((r) => [r.fromVersionId, r.toVersionId]),
      ...listed,
    ]),
  ]
  const versionRows = versionIds.length
    ? await database
        .select({ id: problemVersions.id, number: problemVersions.number, title: problems.title })
        .from(problemVersions)
        .innerJoin(problems, eq(problems.id, problemVersions.problemId))
        .where(inArray(problemVersions.id, versionIds))
    : []
  const versionInfo = new Map(versionRows.map((v) => [v.id, v]))
  const labelVersions = [
    ...new Set(
      rows
        .flatMap((r) => [r.itemVersionId, r.gradedVersionId])
        .filter((x): x is number => x !== null)
        .concat(regradeRows.map((r) => r.fromVersionId)),
    ),
  ]
  const definitions: Map<number, ProblemDefinition> = labelVersions.length
    ? await frozenDefinitions(database, labelVersions)
    : new Map()

  // Terms named by course entries.
  const termIds = [
    ...new Set(
      rows
        .filter((r) => r.kind === 'course-created' || r.kind === 'course-copied')
        .flatMap((r) => [isRecord(r.before) ? r.before.termId : null, isRecord(r.after) ? r.after.termId : null])
        .filter((x): x is number => typeof x === 'number' && Number.isInteger(x)),
    ),
  ]
  const termRows = termIds.length
    ? await database.select({ id: terms.id, name: terms.name }).from(terms).where(inArray(terms.id, termIds))
    : []

  const out: AuditLogRow[] = rows.map((r) => {
    const regradeId = r.kind === 'regrade' ? Number(REGRADE_NOTE.exec(r.note)?.[1] ?? NaN) : NaN
    const regrade = regradeOf.get(regradeId) ?? null
    const findName = r.findName ?? (isRecord(r.after) && typeof r.after.findName === 'string' ? r.after.findName : null)
    // The label from the version the item uses now, else the one the answer was graded on,
    // else the regrade's old version (a question a new version no longer asks).
    let label: string | null = null
    if (findName) {
      for (const v of [r.itemVersionId, r.gradedVersionId, regrade?.fromVersionId ?? null]) {
        const find = v === null ? undefined : definitions.get(v)?.finds.find((f) => f.name === findName)
        if (find) {
          label = find.label
          break
        }
      }
    }
    return {
      id: r.id,
      at: r.at.toISOString(),
      actor: r.actor,
      kind: r.kind,
      before: r.before,
      after: r.after,
      note: r.note,
      subject: r.subject,
      assignmentTitle: r.assignmentTitle,
      assignmentDueAt: r.assignmentDueAt?.toISOString() ?? null,
      question: findName ? { label: label ?? findName, position: r.position } : null,
      maxScore: r.maxScore,
      regrade: regrade
        ? {
            fromVersion: versionInfo.get(regrade.fromVersionId)?.number ?? null,
            toVersion: versionInfo.get(regrade.toVersionId)?.number ?? null,
          }
        : null,
    }
  })
  return {
    rows: out,
    total: total?.n ?? 0,
    lookups: {
      terms: Object.fromEntries(termRows.map((t) => [String(t.id), t.name])),
      versions: Object.fromEntries(versionRows.map((v) => [String(v.id), { title: v.title, number: v.number }])),
    },
  }
}
