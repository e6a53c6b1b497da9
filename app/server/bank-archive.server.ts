/**
 * Tidying the bank: a problem's owner may archive it (hidden from the bank list and the
 * assignment picker, kept for every assignment that uses it), restore it, or delete it when
 * no assignment uses it (so nobody has answered it). Deleting asks for confirmation on the page
 * and needs `confirmed` here. Bank problems belong to a person, not a course, so there is no
 * course audit log to write to.
 */
import { and, eq, isNotNull, isNull, sql } from 'drizzle-orm'
import { canEditProblem } from '#app/domain/permissions.ts'
import type { Db, Tx } from './db/client.server.ts'
import { assignmentItems, problems, problemVersions } from './db/schema.server.ts'
import type { BankViewer } from './problems.server.ts'

type Database = Db | Tx

/** A refused archive, restore or delete: the message says why; status for the page. */
export class BankChangeError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 403 | 404 | 409,
  ) {
    super(message)
    this.name = 'BankChangeError'
  }
}

export type ProblemUsage = {
  archivedAt: string | null
  assignmentCount: number
  answered: boolean
  versionCount: number
  deletable: boolean
}

/** Whether the problem is archived, how many assignments use it, and whether it may be deleted. */
export async function problemUsage(database: Database, problemId: number): Promise<ProblemUsage | null> {
  const [row] = await database
    .select({
      archivedAt: problems.archivedAt,
      // Qualified by hand: Drizzle leaves columns unqualified in a select without joins.
      assignmentCount: sql<number>`(select count(distinct ai.assignment_id) from ${assignmentItems} ai where ai.problem_id = "problems"."id")::int`,
      answered: sql<boolean>`exists (select 1 from part_results pr join ${assignmentItems} ai on ai.id = pr.item_id where ai.problem_id = "problems"."id")`,
      versionCount: sql<number>`(select count(*) from ${problemVersions} pv where pv.problem_id = "problems"."id")::int`,
    })
    .from(problems)
    .where(eq(problems.id, problemId))
  if (!row) return null
  return {
    archivedAt: row.archivedAt?.toISOString() ?? null,
    assignmentCount: row.assignmentCount,
    answered: row.answered === true,
    versionCount: row.versionCount,
    deletable: row.assignmentCount === 0 && row.answered !== true,
  }
}

async function ownProblem(database: Database, viewer: BankViewer, problemId: number) {
  const [row] = await database
    .select({ id: problems.id, ownerId: problems.ownerId, title: problems.title, archivedAt: problems.archivedAt })
    .from(problems)
    .where(eq(problems.id, problemId))
    .for('update')
  if (!row) throw new BankChangeError('There is no such problem in your bank.', 404)
  if (!canEditProblem(viewer, row))
    throw new BankChangeError('Only the problem’s owner can archive, restore or delete it.', 403)
  return row
}

/** Archives (true) or restores (false) the viewer's own problem. Doing it twice changes nothing. */
export async function setProblemArchived(
  database: Db,
  viewer: BankViewer,
  problemId: number,
  archived: boolean,
  now = new Date(),
): Promise<{ changed: boolean }> {
  return database.transaction(async (tx) => {
    await ownProblem(tx, viewer, problemId)
    const rows = await tx
      .update(problems)
      .set({ archivedAt: archived ? now : null })
      .where(and(eq(problems.id, problemId), archived ? isNull(problems.archivedAt) : isNotNull(problems.archivedAt)))
      .returning({ id: problems.id })
    return { changed: rows.length > 0 }
  })
}

/**
 * Deletes the viewer's own problem with its versions and checks, when no assignment uses it.
 * The problem row is locked first; an assignment saved at that moment waits on its versions'
 * freezing and then finds the problem gone.
 */
export async function deleteProblem(
  database: Db,
  viewer: BankViewer,
  problemId: number,
  opts: { confirmed: boolean },
): Promise<{ title: string }> {
  return database.transaction(async (tx) => {
    const p = await ownProblem(tx, viewer, problemId)
    const usage = await problemUsage(tx, problemId)
    if (!usage?.deletable) {
      const n = usage?.assignmentCount ?? 0
      throw new BankChangeError(
        `“${p.title}” cannot be deleted: ${n === 1 ? 'an assignment uses it' : `${n} assignments use it`}. Archive it instead: it leaves the bank list and the assignment picker, and those assignments keep it.`,
        409,
      )
    }
    if (!opts.confirmed)
      throw new BankChangeError(
        'Nothing was deleted: deleting cannot be undone, so it needs the confirmation step. Use the button on the problem page and confirm.',
        400,
      )
    await tx.delete(problems).where(eq(problems.id, problemId))
    return { title: p.title }
  })
}
