/**
 * The problem bank: problems and their versions, who sees them, search, copying, and the
 * bank document (docs/bank-format.md). Visibility rules are app/domain/permissions.ts;
 * list queries apply the same rules in SQL so that paging counts only visible problems.
 *
 * Versions: a version is edited in place until an assignment uses it (frozenAt set by
 * freezeProblemVersion); the next save after that makes version n + 1, so grades already
 * given keep pointing at exactly what students saw.
 */
import { and, asc, desc, eq, ilike, inArray, isNotNull, isNull, ne, or, sql, type SQL } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { z } from 'zod'
import { cycleOf, DIFFICULTIES, LEVELS, type ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { canEditProblem, canSeeProblem } from '#app/domain/permissions.ts'
import {
  BANK_FORMAT_ID,
  BANK_FORMAT_VERSION,
  BANK_MAX_PROBLEMS,
  parseDefinition,
  readBankDocument,
  type BankDocument,
  type BankError,
} from '#app/lib/problem-schema.ts'
import { readPageParam, readTextParam, type ParamProblem } from '#app/lib/query-params.ts'
import type { Db, Tx } from './db/client.server.ts'
import { tryReadDefinition, type StoredDefinitionProblem } from './definitions.server.ts'
import { problems, problemVersions, users, type ProblemVisibility } from './db/schema.server.ts'
import { PageError } from './error-page.server.ts'
import type { SignedInUser } from './users.server.ts'

type Database = Db | Tx

export type BankViewer = { id: number; isAdmin: boolean; departmentId: number | null }

/**
 * The version asked for has a stored document that fails the definition check
 * (definitions.server.ts), so it cannot be copied or used; the message names the version and
 * what can be done instead. Status 422: the request is understood, the stored version is not.
 */
export class UnreadableVersionError extends PageError {
  constructor(
    readonly versionNumber: number,
    what: 'copied' | 'used',
  ) {
    super(unreadableVersionMessage(versionNumber, what), 422)
    this.name = 'UnreadableVersionError'
  }
}

/** What a person is told about an unreadable version: which one, and what to do instead. */
export function unreadableVersionMessage(versionNumber: number, what: 'shown' | 'copied' | 'used'): string {
  return (
    `Version ${versionNumber} of this problem cannot be ${what}: its stored definition does not pass the problem check ` +
    '(it was changed outside Cyclewright or saved under older rules). Nothing was changed. Open another version of the ' +
    'problem; its owner can edit the problem from a version that reads, which saves a readable version, or an ' +
    'administrator can restore this one from a backup.'
  )
}

/** The problem is missing, not visible to the viewer, or not theirs to change. */
export class ProblemAccessError extends Error {
  constructor(message = 'That problem is not in your bank or shared with you.') {
    super(message)
    this.name = 'ProblemAccessError'
  }
}

/** A definition that fails the schema reached the server: the route should have checked it. */
export class InvalidDefinitionError extends Error {
  constructor(readonly issues: { path: string; message: string }[]) {
    super(
      `The problem definition is not valid: ${issues.map((i) => `${i.path || '(whole)'}: ${i.message}`).join('; ')}`,
    )
    this.name = 'InvalidDefinitionError'
  }
}

/** An export that cannot be made (nothing to export, or more than a document holds). */
/** The problem was saved again after the editor loaded it; `savedAt` is that save's time. */
export class ProblemConflictError extends Error {
  readonly savedAt: string
  constructor(savedAt: string) {
    super('This problem was saved elsewhere after you opened it.')
    this.name = 'ProblemConflictError'
    this.savedAt = savedAt
  }
}

export class BankExportError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'BankExportError'
  }
}

export async function bankViewerFor(database: Database, user: SignedInUser): Promise<BankViewer> {
  const [row] = await database
    .select({ departmentId: users.departmentId })
    .from(users)
    .where(eq(users.id, user.id))
    .limit(1)
  return { id: user.id, isAdmin: user.isAdmin, departmentId: row?.departmentId ?? null }
}

/** The visibility rule of canSeeProblem, as SQL over the problems table. */
function visibleTo(viewer: BankViewer): SQL | undefined {
  if (viewer.isAdmin) return undefined
  const department =
    viewer.departmentId === null
      ? undefined
      : and(eq(problems.visibility, 'department'), eq(problems.departmentId, viewer.departmentId))
  return or(eq(problems.ownerId, viewer.id), eq(problems.visibility, 'installation'), department)
}

// ---- Listing ------------------------------------------------------------------------------

const SORTS = ['updated', 'title', 'cycle', 'difficulty'] as const
const PAGE_SIZES = [10, 25, 50] as const

// URL search params come from people editing URLs: anything odd means "the default".
export const BankQuerySchema = z
  .object({
    q: z.string().trim().max(200).catch(''),
    cycle: z
      .string()
      .regex(/^[a-z][a-z0-9-]{0,39}$/)
      .optional()
      .catch(undefined),
    difficulty: z.enum(DIFFICULTIES).optional().catch(undefined),
    level: z.enum(LEVELS).optional().catch(undefined),
    scope: z.enum(['all', 'mine', 'shared']).catch('all'),
    /** '1': the archived problems instead of the others */
    archived: z.enum(['1']).optional().catch(undefined),
    sort: z.enum(SORTS).catch('updated'),
    dir: z.enum(['asc', 'desc']).optional().catch(undefined),
    page: z.coerce.number().int().min(1).max(100_000).catch(1),
    pageSize: z.coerce.number().pipe(z.literal(PAGE_SIZES)).catch(25),
  })
  .catch({ q: '', scope: 'all', sort: 'updated', page: 1, pageSize: 25 })
  .transform((v) => ({
    ...v,
    q: v.q ?? '',
    // Newest first is what people want from "updated"; A→Z from the others.
    dir: v.dir ?? (v.sort === 'updated' ? ('desc' as const) : ('asc' as const)),
  }))
export type BankQuery = z.output<typeof BankQuerySchema>

/**
 * The bank's search from an address. Odd filters fall back to their defaults (BankQuerySchema);
 * a page number that is not a whole number from 1 to MAX_PAGE, and a search holding control
 * characters (PostgreSQL refuses a NUL), are refused so the caller can answer 400. On a refused
 * search, `query.q` is the text as typed without its NUL characters, to show back in the box.
 */
export function readBankSearch(
  search: URLSearchParams,
): { ok: true; query: BankQuery } | { ok: false; query: BankQuery; problem: ParamProblem } {
  const page = readPageParam(search)
  const q = readTextParam(search, 'q', 'the search')
  const query = BankQuerySchema.parse({
    ...Object.fromEntries(search),
    page: page.ok ? String(page.page) : '1',
    q: q.ok ? q.value : '',
  })
  if (!page.ok) return { ok: false, query, problem: page.problem }
  if (!q.ok) return { ok: false, query: { ...query, q: q.value.trim().slice(0, 200) }, problem: q.problem }
  return { ok: true, query }
}

export type BankRow = {
  id: number
  title: string
  cycle: string
  topics: string[]
  difficulty: string
  level: string
  visibility: ProblemVisibility
  ownerId: number
  ownerName: string
  latestVersionNumber: number
  updatedAt: string
  originProblemId: number | null
  isOwn: boolean
}

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`)
}

export async function listBankProblems(
  database: Database,
  viewer: BankViewer,
  query: BankQuery,
): Promise<{ rows: BankRow[]; total: number; page: number; pageSize: number }> {
  // Archived problems are listed only under the "Archived" filter, and then only those.
  const conditions: (SQL | undefined)[] = [
    visibleTo(viewer),
    query.archived ? isNotNull(problems.archivedAt) : isNull(problems.archivedAt),
  ]
  if (query.scope === 'mine') conditions.push(eq(problems.ownerId, viewer.id))
  if (query.scope === 'shared') conditions.push(ne(problems.ownerId, viewer.id))
  if (query.cycle) conditions.push(eq(problems.cycle, query.cycle))
  if (query.difficulty) conditions.push(eq(problems.difficulty, query.difficulty))
  if (query.level) conditions.push(eq(problems.level, query.level))
  // Each word must appear somewhere, so "otto efficiency" narrows rather than widens.
  const words = query.q.split(/\s+/).filter(Boolean).slice(0, 8)
  for (const word of words) {
    const pattern = `%${escapeLike(word)}%`
    conditions.push(
      or(
        ilike(problems.title, pattern),
        ilike(problems.cycle, pattern),
        sql`array_to_string(${problems.topics}, ' ') ilike ${pattern}`,
      ),
    )
  }
  const where = and(...conditions)

  const [counted] = await database
    .select({ n: sql<number>`count(*)::int` })
    .from(problems)
    .where(where)
  const total = counted?.n ?? 0
  const lastPage = Math.max(1, Math.ceil(total / query.pageSize))
  const page = Math.min(query.page, lastPage)

  const by = query.dir === 'asc' ? asc : desc
  const difficultyRank = sql`array_position(array[${sql.join(
    DIFFICULTIES.map((d) => sql`${d}`),
    sql`, `,
  )}]::text[], ${problems.difficulty})`
  const order: SQL[] =
    query.sort === 'title'
      ? [by(sql`lower(${problems.title})`)]
      : query.sort === 'cycle'
        ? [by(problems.cycle), asc(sql`lower(${problems.title})`)]
        : query.sort === 'difficulty'
          ? [by(difficultyRank), asc(sql`lower(${problems.title})`)]
          : [by(problems.updatedAt)]
  order.push(by(problems.id))

  const rows = await database
    .select({
      id: problems.id,
      title: problems.title,
      cycle: problems.cycle,
      topics: problems.topics,
      difficulty: problems.difficulty,
      level: problems.level,
      visibility: problems.visibility,
      ownerId: problems.ownerId,
      ownerName: users.name,
      latestVersionNumber: sql<number>`(select max(${problemVersions.number}) from ${problemVersions} where ${problemVersions.problemId} = ${problems.id})::int`,
      updatedAt: problems.updatedAt,
      originProblemId: problems.originProblemId,
    })
    .from(problems)
    .innerJoin(users, eq(users.id, problems.ownerId))
    .where(where)
    .orderBy(...order)
    .limit(query.pageSize)
    .offset((page - 1) * query.pageSize)

  return {
    rows: rows.map((r) => ({ ...r, updatedAt: r.updatedAt.toISOString(), isOwn: r.ownerId === viewer.id })),
    total,
    page,
    pageSize: query.pageSize,
  }
}

// ---- One problem --------------------------------------------------------------------------

export type VersionInfo = {
  id: number
  number: number
  createdAt: string
  frozenAt: string | null
  createdByName: string
} & (
  | { definition: ProblemDefinition; unreadable: null }
  /** The stored document fails the definition check (definitions.server.ts): the version is listed, not shown. */
  | { definition: null; unreadable: StoredDefinitionProblem }
)

export type ProblemDetail = {
  id: number
  title: string
  visibility: ProblemVisibility
  ownerId: number
  ownerName: string
  departmentId: number | null
  canEdit: boolean
  /** Set on a copy. The origin's id and title only while the viewer may still see it. */
  origin: { problemId: number | null; title: string | null; versionNumber: number | null } | null
  /** Set on an import: whose problem the bank document said it was. */
  importedFrom: { title: string; author: string } | null
  /** When the problem was last saved; the editor sends it back to detect a save made meanwhile. */
  updatedAt: string
  latest: VersionInfo
  /** Newest first. */
  versions: VersionInfo[]
}

const creators = alias(users, 'creators')

function versionColumns() {
  return {
    id: problemVersions.id,
    number: problemVersions.number,
    createdAt: problemVersions.createdAt,
    frozenAt: problemVersions.frozenAt,
    createdByName: creators.name,
    definition: problemVersions.definition,
  }
}

type VersionRow = {
  id: number
  number: number
  createdAt: Date
  frozenAt: Date | null
  createdByName: string
  definition: unknown
}

function toVersionInfo(r: VersionRow): VersionInfo {
  const meta = {
    id: r.id,
    number: r.number,
    createdAt: r.createdAt.toISOString(),
    frozenAt: r.frozenAt ? r.frozenAt.toISOString() : null,
    createdByName: r.createdByName,
  }
  // One unreadable version must not take the others (or the problem's page) down with it.
  const read = tryReadDefinition(r.definition, r.id)
  return read.ok
    ? { ...meta, definition: read.definition, unreadable: null }
    : { ...meta, definition: null, unreadable: read.error }
}

async function findProblem(database: Database, problemId: number) {
  if (!Number.isInteger(problemId) || problemId <= 0) return null
  const [row] = await database
    .select({
      id: problems.id,
      title: problems.title,
      visibility: problems.visibility,
      ownerId: problems.ownerId,
      ownerName: users.name,
      departmentId: problems.departmentId,
      originProblemId: problems.originProblemId,
      originVersionId: problems.originVersionId,
      importedFrom: problems.importedFrom,
      updatedAt: problems.updatedAt,
    })
    .from(problems)
    .innerJoin(users, eq(users.id, problems.ownerId))
    .where(eq(problems.id, problemId))
    .limit(1)
  return row ?? null
}

export async function getProblemDetail(
  database: Database,
  viewer: BankViewer,
  problemId: number,
): Promise<ProblemDetail | null> {
  const problem = await findProblem(database, problemId)
  if (!problem || !canSeeProblem(viewer, problem)) return null
  const versionRows = await database
    .select(versionColumns())
    .from(problemVersions)
    .innerJoin(creators, eq(creators.id, problemVersions.createdBy))
    .where(eq(problemVersions.problemId, problemId))
    .orderBy(desc(problemVersions.number))
  const versions = versionRows.map(toVersionInfo)
  const latest = versions[0]
  if (!latest) return null

  let origin: ProblemDetail['origin'] = null
  if (problem.originProblemId !== null || problem.originVersionId !== null) {
    const source = problem.originProblemId === null ? null : await findProblem(database, problem.originProblemId)
    const visible = source !== null && canSeeProblem(viewer, source)
    const [version] =
      problem.originVersionId === null
        ? []
        : await database
            .select({ number: problemVersions.number })
            .from(problemVersions)
            .where(eq(problemVersions.id, problem.originVersionId))
            .limit(1)
    origin = {
      problemId: visible ? source.id : null,
      title: visible ? source.title : null,
      versionNumber: version?.number ?? null,
    }
  }

  return {
    id: problem.id,
    title: problem.title,
    visibility: problem.visibility,
    ownerId: problem.ownerId,
    ownerName: problem.ownerName,
    departmentId: problem.departmentId,
    canEdit: canEditProblem(viewer, problem),
    origin,
    importedFrom: problem.importedFrom ?? null,
    updatedAt: problem.updatedAt.toISOString(),
    latest,
    versions,
  }
}

export async function getVersionForViewer(
  database: Database,
  viewer: BankViewer,
  versionId: number,
): Promise<{ problemId: number; version: VersionInfo } | null> {
  if (!Number.isInteger(versionId) || versionId <= 0) return null
  const [row] = await database
    .select({
      ...versionColumns(),
      problemId: problems.id,
      ownerId: problems.ownerId,
      visibility: problems.visibility,
      departmentId: problems.departmentId,
    })
    .from(problemVersions)
    .innerJoin(problems, eq(problems.id, problemVersions.problemId))
    .innerJoin(creators, eq(creators.id, problemVersions.createdBy))
    .where(eq(problemVersions.id, versionId))
    .limit(1)
  if (!row || !canSeeProblem(viewer, row)) return null
  return { problemId: row.problemId, version: toVersionInfo(row) }
}

// ---- Writing ------------------------------------------------------------------------------

function checkedDefinition(definition: unknown): ProblemDefinition {
  const parsed = parseDefinition(definition)
  if (!parsed.ok) throw new InvalidDefinitionError(parsed.issues)
  return parsed.value
}

/** The columns the bank page searches and sorts on, copied from the definition. */
function listingColumns(d: ProblemDefinition) {
  return {
    title: d.title,
    cycle: cycleOf(d.physics),
    topics: [...d.tags.topics],
    difficulty: d.tags.difficulty,
    level: d.tags.level,
  }
}

async function insertProblem(
  database: Database,
  viewer: BankViewer,
  definition: ProblemDefinition,
  extra: {
    visibility: ProblemVisibility
    originProblemId?: number
    originVersionId?: number
    importedFrom?: { title: string; author: string }
  },
): Promise<{ problemId: number; versionId: number }> {
  const [problem] = await database
    .insert(problems)
    .values({ ownerId: viewer.id, departmentId: viewer.departmentId, ...extra, ...listingColumns(definition) })
    .returning({ id: problems.id })
  const [version] = await database
    .insert(problemVersions)
    .values({ problemId: problem!.id, number: 1, definition, createdBy: viewer.id })
    .returning({ id: problemVersions.id })
  return { problemId: problem!.id, versionId: version!.id }
}

/** A new problem owned by the viewer, as version 1. Throws InvalidDefinitionError for a bad definition. */
export async function createProblem(
  database: Database,
  viewer: BankViewer,
  input: { definition: ProblemDefinition; visibility: ProblemVisibility },
): Promise<{ problemId: number; versionId: number }> {
  const definition = checkedDefinition(input.definition)
  return database.transaction((tx) => insertProblem(tx, viewer, definition, { visibility: input.visibility }))
}

/**
 * Saves the owner's edit: in place while the latest version is unfrozen, else as a new
 * version. Throws ProblemAccessError when the problem is missing or not the viewer's.
 */
export async function saveProblem(
  database: Database,
  viewer: BankViewer,
  problemId: number,
  input: { definition: ProblemDefinition; visibility: ProblemVisibility; basedOn?: string },
): Promise<{ versionId: number; versionNumber: number; newVersion: boolean }> {
  const definition = checkedDefinition(input.definition)
  if (!Number.isInteger(problemId) || problemId <= 0) throw new ProblemAccessError()
  return database.transaction(async (tx) => {
    // The row lock makes concurrent saves queue up, so two cannot both pick number n + 1.
    const [problem] = await tx
      .select({ id: problems.id, ownerId: problems.ownerId, updatedAt: problems.updatedAt })
      .from(problems)
      .where(eq(problems.id, problemId))
      .for('update')
    if (!problem || !canEditProblem(viewer, problem))
      throw new ProblemAccessError('Only the owner of a problem can change it; make a copy to change your own.')
    // The editor says which save it started from; a later save (another tab, another device)
    // must not be overwritten without the author knowing.
    if (input.basedOn !== undefined && input.basedOn !== problem.updatedAt.toISOString())
      throw new ProblemConflictError(problem.updatedAt.toISOString())
    const [latest] = await tx
      .select({ id: problemVersions.id, number: problemVersions.number, frozenAt: problemVersions.frozenAt })
      .from(problemVersions)
      .where(eq(problemVersions.problemId, problemId))
      .orderBy(desc(problemVersions.number))
      .limit(1)
    let result: { versionId: number; versionNumber: number; newVersion: boolean }
    if (latest && latest.frozenAt === null) {
      await tx.update(problemVersions).set({ definition }).where(eq(problemVersions.id, latest.id))
      result = { versionId: latest.id, versionNumber: latest.number, newVersion: false }
    } else {
      const number = (latest?.number ?? 0) + 1
      const [row] = await tx
        .insert(problemVersions)
        .values({ problemId, number, definition, createdBy: viewer.id })
        .returning({ id: problemVersions.id })
      result = { versionId: row!.id, versionNumber: number, newVersion: true }
    }
    await tx
      .update(problems)
      .set({ ...listingColumns(definition), visibility: input.visibility, updatedAt: sql`now()` })
      .where(eq(problems.id, problemId))
    return result
  })
}

/** Marks a version as used by an assignment; later edits make a new version. Idempotent. */
export async function freezeProblemVersion(database: Database, versionId: number): Promise<void> {
  const rows = await database
    .update(problemVersions)
    .set({ frozenAt: sql`coalesce(${problemVersions.frozenAt}, now())` })
    .where(eq(problemVersions.id, versionId))
    .returning({ id: problemVersions.id })
  if (rows.length === 0) throw new Error(`freezeProblemVersion: there is no problem version ${versionId}`)
}

async function latestVersionOf(database: Database, problemId: number) {
  const [row] = await database
    .select({ id: problemVersions.id, number: problemVersions.number, definition: problemVersions.definition })
    .from(problemVersions)
    .where(eq(problemVersions.problemId, problemId))
    .orderBy(desc(problemVersions.number))
    .limit(1)
  return row ?? null
}

/** Copies a visible problem's latest version into the viewer's bank, private, remembering its origin. */
export async function copyProblem(
  database: Database,
  viewer: BankViewer,
  problemId: number,
): Promise<{ problemId: number }> {
  const source = await findProblem(database, problemId)
  if (!source || !canSeeProblem(viewer, source)) throw new ProblemAccessError()
  return database.transaction(async (tx) => {
    const latest = await latestVersionOf(tx, problemId)
    if (!latest) throw new ProblemAccessError()
    const read = tryReadDefinition(latest.definition, latest.id)
    if (!read.ok) throw new UnreadableVersionError(latest.number, 'copied')
    const definition = read.definition
    const made = await insertProblem(tx, viewer, definition, {
      visibility: 'private',
      originProblemId: problemId,
      originVersionId: latest.id,
    })
    return { problemId: made.problemId }
  })
}

// ---- The bank document --------------------------------------------------------------------

/**
 * The viewer's own problems ('own') or the listed ones, each at its latest version.
 * Throws ProblemAccessError naming nothing when a listed id is missing or not visible, and
 * BankExportError when there is nothing to export or more than one document holds.
 */
export async function exportBank(
  database: Database,
  viewer: BankViewer,
  problemIds: readonly number[] | 'own',
): Promise<BankDocument> {
  const ids = problemIds === 'own' ? null : [...new Set(problemIds)]
  if (ids && ids.some((id) => !Number.isInteger(id) || id <= 0)) throw new ProblemAccessError()
  if (ids && ids.length === 0) throw new BankExportError('Choose at least one problem to export.')
  if (ids && ids.length > BANK_MAX_PROBLEMS)
    throw new BankExportError(`Export at most ${BANK_MAX_PROBLEMS} problems at a time.`)

  const origins = alias(problems, 'origins')
  const originOwners = alias(users, 'origin_owners')
  const rows = await database
    .select({
      id: problems.id,
      title: problems.title,
      visibility: problems.visibility,
      ownerId: problems.ownerId,
      departmentId: problems.departmentId,
      ownerName: users.name,
      originTitle: origins.title,
      originAuthor: originOwners.name,
      originOwnerId: origins.ownerId,
      originVisibility: origins.visibility,
      originDepartmentId: origins.departmentId,
      importedFrom: problems.importedFrom,
      definition: sql<unknown>`(select ${problemVersions.definition} from ${problemVersions} where ${problemVersions.problemId} = ${problems.id} order by ${problemVersions.number} desc limit 1)`,
    })
    .from(problems)
    .innerJoin(users, eq(users.id, problems.ownerId))
    .leftJoin(origins, eq(origins.id, problems.originProblemId))
    .leftJoin(originOwners, eq(originOwners.id, origins.ownerId))
    .where(ids ? inArray(problems.id, ids) : eq(problems.ownerId, viewer.id))
    .orderBy(asc(problems.id))

  if (ids) {
    const found = new Map(rows.map((r) => [r.id, r]))
    for (const id of ids) {
      const r = found.get(id)
      if (!r || !canSeeProblem(viewer, r)) throw new ProblemAccessError()
    }
  }
  if (rows.length === 0) throw new BankExportError('There are no problems to export yet.')
  if (rows.length > BANK_MAX_PROBLEMS)
    throw new BankExportError(`You own more than ${BANK_MAX_PROBLEMS} problems: choose the ones to export.`)

  return {
    format: BANK_FORMAT_ID,
    version: BANK_FORMAT_VERSION,
    exportedAt: new Date().toISOString(),
    problems: rows.map((r) => {
      const read = tryReadDefinition(r.definition)
      if (!read.ok)
        throw new BankExportError(
          `“${r.title}” cannot be exported: its stored definition does not pass the problem check. Leave it out, or ask your administrator.`,
        )
      const definition = read.definition
      // The author a reader should credit: the problem this one was copied from when the
      // exporter may still see it, else the credit an import carried, else the problem itself
      // and its owner.
      const originVisible =
        r.originTitle !== null &&
        r.originAuthor !== null &&
        r.originOwnerId !== null &&
        r.originVisibility !== null &&
        canSeeProblem(viewer, {
          ownerId: r.originOwnerId,
          visibility: r.originVisibility,
          departmentId: r.originDepartmentId,
        })
      return {
        title: definition.title,
        visibility: r.visibility,
        origin: originVisible
          ? { title: r.originTitle!, author: r.originAuthor! }
          : (r.importedFrom ?? { title: definition.title, author: r.ownerName }),
        definition,
      }
    }),
  }
}

export type ImportResult = { ok: true; problemIds: number[] } | { ok: false; errors: BankError[] }

/** Checks the whole document, then writes every problem (private to the viewer) or none. */
export async function importBank(database: Database, viewer: BankViewer, raw: unknown): Promise<ImportResult> {
  const read = readBankDocument(raw)
  if (!read.ok) return read
  const problemIds = await database.transaction(async (tx) => {
    const made: number[] = []
    for (const p of read.problems) {
      const credit = p.origin ? { importedFrom: { title: p.origin.title, author: p.origin.author } } : {}
      made.push((await insertProblem(tx, viewer, p.definition, { visibility: 'private', ...credit })).problemId)
    }
    return made
  })
  return { ok: true, problemIds }
}
