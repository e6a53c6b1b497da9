import { count, eq } from 'drizzle-orm'
import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { db, pool } from '#app/server/db/client.server.ts'
import { problems, problemVersions } from '#app/server/db/schema.server.ts'
import {
  BankQuerySchema,
  bankViewerFor,
  copyProblem,
  createProblem,
  exportBank,
  freezeProblemVersion,
  getProblemDetail,
  getVersionForViewer,
  importBank,
  listBankProblems,
  ProblemAccessError,
  saveProblem,
  type BankViewer,
} from '#app/server/problems.server.ts'
import { loadSignedInUser } from '#app/server/users.server.ts'
import { createBankUser, createDepartment } from '#tests/support/factories.ts'

// Demo data: a Carnot engine whose reservoir temperatures are drawn per student.
function carnot(overrides: Partial<ProblemDefinition> = {}): ProblemDefinition {
  return {
    format: 2,
    title: 'Carnot engine efficiency',
    tags: { topics: ['carnot', 'second law'], difficulty: 'introductory', level: 'first-year' },
    convention: 'course',
    prompt: 'A Carnot engine runs between @{TH} and @{TL}. Find its thermal efficiency.',
    givens: [
      {
        name: 'TH',
        label: 'hot reservoir temperature',
        unit: 'K',
        rule: { kind: 'range', min: 600, max: 1200, step: 50 },
      },
      {
        name: 'TL',
        label: 'cold reservoir temperature',
        unit: 'K',
        rule: { kind: 'range', min: 280, max: 350, step: 10 },
      },
    ],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'carnot-engine',
      inputs: { Th: 'TH', Tc: 'TL', p1: '100 kPa', expansionRatio: '3' },
    },
    finds: [
      {
        name: 'eta',
        label: 'Thermal efficiency',
        source: { kind: 'output', path: 'totals.efficiency' },
        unit: '',
        points: 10,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: ['celsius-for-kelvin'],
      },
    ],
    ...overrides,
  }
}

const word = () => `zq${Math.random().toString(36).slice(2, 8)}`
const query = (params: Record<string, string> = {}) => BankQuerySchema.parse(params)

async function versionCount(problemId: number) {
  const [r] = await db().select({ n: count() }).from(problemVersions).where(eq(problemVersions.problemId, problemId))
  return r!.n
}

describe('versions', () => {
  test('a new problem is version 1 with its listing columns and the owner department', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId, versionId } = await createProblem(db(), viewer, { definition: carnot(), visibility: 'private' })
    const [row] = await db().select().from(problems).where(eq(problems.id, problemId))
    expect(row).toMatchObject({
      ownerId: viewer.id,
      departmentId: viewer.departmentId,
      cycle: 'carnot-engine',
      topics: ['carnot', 'second law'],
      difficulty: 'introductory',
      level: 'first-year',
    })
    const detail = await getProblemDetail(db(), viewer, problemId)
    expect(detail?.latest).toMatchObject({ id: versionId, number: 1, frozenAt: null, createdByName: 'Bank Instructor' })
    expect(detail?.latest.definition).toEqual(carnot())
    expect(detail?.canEdit).toBe(true)
    expect(detail?.origin).toBeNull()
  })

  test('saving an unfrozen version changes it in place', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId, versionId } = await createProblem(db(), viewer, { definition: carnot(), visibility: 'private' })
    const saved = await saveProblem(db(), viewer, problemId, {
      definition: carnot({ title: 'Carnot engine: efficiency' }),
      visibility: 'installation',
    })
    expect(saved).toEqual({ versionId, versionNumber: 1, newVersion: false })
    expect(await versionCount(problemId)).toBe(1)
    const detail = await getProblemDetail(db(), viewer, problemId)
    expect(detail).toMatchObject({ title: 'Carnot engine: efficiency', visibility: 'installation' })
    expect(detail?.latest.definition?.title).toBe('Carnot engine: efficiency')
  })

  test('after freezing, a save makes version 2 and leaves version 1 as it was', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId, versionId } = await createProblem(db(), viewer, { definition: carnot(), visibility: 'private' })
    await freezeProblemVersion(db(), versionId)
    const [first] = await db()
      .select({ frozenAt: problemVersions.frozenAt })
      .from(problemVersions)
      .where(eq(problemVersions.id, versionId))
    expect(first?.frozenAt).toBeInstanceOf(Date)
    await freezeProblemVersion(db(), versionId)
    const [again] = await db()
      .select({ frozenAt: problemVersions.frozenAt })
      .from(problemVersions)
      .where(eq(problemVersions.id, versionId))
    expect(again?.frozenAt).toEqual(first?.frozenAt)

    const harder = carnot({ tags: { topics: ['carnot'], difficulty: 'standard', level: 'second-year' } })
    const saved = await saveProblem(db(), viewer, problemId, { definition: harder, visibility: 'private' })
    expect(saved.newVersion).toBe(true)
    expect(saved.versionNumber).toBe(2)
    expect(saved.versionId).not.toBe(versionId)

    const detail = await getProblemDetail(db(), viewer, problemId)
    expect(detail?.versions.map((v) => v.number)).toEqual([2, 1])
    expect(detail?.versions[1]?.definition).toEqual(carnot())
    expect(detail?.latest.definition).toEqual(harder)
    const [row] = await db()
      .select({ difficulty: problems.difficulty, level: problems.level })
      .from(problems)
      .where(eq(problems.id, problemId))
    expect(row).toEqual({ difficulty: 'standard', level: 'second-year' })

    // Version 2 is not frozen: the next save stays on it.
    const next = await saveProblem(db(), viewer, problemId, { definition: harder, visibility: 'private' })
    expect(next).toEqual({ versionId: saved.versionId, versionNumber: 2, newVersion: false })
  })

  test('saves at the same moment after a freeze make one new version, not a duplicate number', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId, versionId } = await createProblem(db(), viewer, { definition: carnot(), visibility: 'private' })
    await freezeProblemVersion(db(), versionId)
    // Hold back every write to problem_versions (reads still pass) until all saves have
    // started, so that they truly overlap: without the row lock in saveProblem, each would
    // read version 1 as the latest and insert number 2.
    const blocker = await pool().connect()
    await blocker.query('begin')
    await blocker.query('lock table problem_versions in share row exclusive mode')
    const saving = Promise.allSettled(
      Array.from({ length: 6 }, (_, i) =>
        saveProblem(db(), viewer, problemId, { definition: carnot({ title: `Save ${i}` }), visibility: 'private' }),
      ),
    )
    await new Promise((resolve) => setTimeout(resolve, 500))
    await blocker.query('commit')
    blocker.release()
    const settled = await saving
    expect(settled.map((r) => r.status)).toEqual(Array(6).fill('fulfilled'))
    const results = settled.map((r) => (r as PromiseFulfilledResult<Awaited<ReturnType<typeof saveProblem>>>).value)
    expect(results.map((r) => r.versionNumber)).toEqual(Array(6).fill(2))
    expect(results.filter((r) => r.newVersion)).toHaveLength(1)
    expect(await versionCount(problemId)).toBe(2)
  })

  test('only the owner saves: another instructor and an admin are refused, and a missing problem too', async () => {
    const dept = await createDepartment(db())
    const { viewer: owner } = await createBankUser(db(), { departmentId: dept.id })
    const { viewer: colleague } = await createBankUser(db(), { departmentId: dept.id })
    const { viewer: admin } = await createBankUser(db(), { isAdmin: true })
    const { problemId } = await createProblem(db(), owner, { definition: carnot(), visibility: 'department' })
    const input = { definition: carnot({ title: 'Hijacked' }), visibility: 'installation' as const }
    await expect(saveProblem(db(), colleague, problemId, input)).rejects.toBeInstanceOf(ProblemAccessError)
    await expect(saveProblem(db(), admin, problemId, input)).rejects.toBeInstanceOf(ProblemAccessError)
    await expect(saveProblem(db(), owner, 987_654, input)).rejects.toBeInstanceOf(ProblemAccessError)
    expect((await getProblemDetail(db(), owner, problemId))?.title).toBe('Carnot engine efficiency')
    expect((await getProblemDetail(db(), colleague, problemId))?.canEdit).toBe(false)
  })

  test('an invalid definition is refused before anything is written', async () => {
    const { viewer } = await createBankUser(db())
    const before = await db().select({ n: count() }).from(problems)
    await expect(
      createProblem(db(), viewer, { definition: carnot({ title: 'x' }), visibility: 'private' }),
    ).rejects.toThrow(/title/)
    expect(await db().select({ n: count() }).from(problems)).toEqual(before)
  })
})

describe('visibility and the bank list', () => {
  async function setting() {
    const dept = await createDepartment(db())
    const other = await createDepartment(db())
    const owner = (await createBankUser(db(), { departmentId: dept.id, name: 'Owner' })).viewer
    const sameDept = (await createBankUser(db(), { departmentId: dept.id })).viewer
    const otherDept = (await createBankUser(db(), { departmentId: other.id })).viewer
    const noDept = (await createBankUser(db(), { departmentId: null })).viewer
    const admin = (await createBankUser(db(), { isAdmin: true, departmentId: other.id })).viewer
    const tag = word()
    const make = (visibility: 'private' | 'department' | 'installation') =>
      createProblem(db(), owner, { definition: carnot({ title: `${visibility} ${tag}` }), visibility }).then(
        (r) => r.problemId,
      )
    const ids = {
      private: await make('private'),
      department: await make('department'),
      installation: await make('installation'),
    }
    return { owner, sameDept, otherDept, noDept, admin, tag, ids }
  }

  async function seen(viewer: BankViewer, ids: Record<string, number>) {
    const out: string[] = []
    for (const [k, id] of Object.entries(ids)) if (await getProblemDetail(db(), viewer, id)) out.push(k)
    return out.sort()
  }

  test('private for the owner, department for the same department, installation for every bank user, all for admins', async () => {
    const s = await setting()
    expect(await seen(s.owner, s.ids)).toEqual(['department', 'installation', 'private'])
    expect(await seen(s.sameDept, s.ids)).toEqual(['department', 'installation'])
    expect(await seen(s.otherDept, s.ids)).toEqual(['installation'])
    expect(await seen(s.noDept, s.ids)).toEqual(['installation'])
    expect(await seen(s.admin, s.ids)).toEqual(['department', 'installation', 'private'])
    for (const viewer of [s.owner, s.sameDept, s.otherDept, s.noDept, s.admin]) {
      const list = await listBankProblems(db(), viewer, query({ q: s.tag, sort: 'title' }))
      expect(list.rows.map((r) => r.title.split(' ')[0]).sort()).toEqual(await seen(viewer, s.ids))
      expect(list.total).toBe(list.rows.length)
    }
  })

  test('a version is shown only to those who see its problem', async () => {
    const s = await setting()
    const detail = await getProblemDetail(db(), s.owner, s.ids.private)
    const versionId = detail!.latest.id
    expect(await getVersionForViewer(db(), s.owner, versionId)).toMatchObject({
      problemId: s.ids.private,
      version: { number: 1 },
    })
    expect(await getVersionForViewer(db(), s.sameDept, versionId)).toBeNull()
    expect(await getVersionForViewer(db(), s.owner, 987_654)).toBeNull()
  })

  test('rows carry the owner, the version number and whether they are mine', async () => {
    const s = await setting()
    const mine = await listBankProblems(db(), s.owner, query({ q: s.tag, scope: 'mine' }))
    expect(mine.rows).toHaveLength(3)
    expect(
      mine.rows.every(
        (r) => r.isOwn && r.ownerName === 'Owner' && r.latestVersionNumber === 1 && r.originProblemId === null,
      ),
    ).toBe(true)
    expect(mine.rows[0]?.updatedAt).toMatch(/^\d{4}-\d\d-\d\dT/)
    const shared = await listBankProblems(db(), s.sameDept, query({ q: s.tag, scope: 'shared' }))
    expect(shared.rows.map((r) => r.visibility).sort()).toEqual(['department', 'installation'])
    expect(shared.rows.every((r) => !r.isOwn)).toBe(true)
    expect((await listBankProblems(db(), s.sameDept, query({ q: s.tag, scope: 'mine' }))).total).toBe(0)
  })

  test('search matches title, topics and cycle without regard to case, and % is not a wildcard', async () => {
    const { viewer } = await createBankUser(db())
    const tag = word()
    const otto: ProblemDefinition = carnot({
      title: `Spark engine ${tag}`,
      tags: { topics: ['air standard', `topic${tag}`], difficulty: 'standard', level: 'second-year' },
      physics: {
        kind: 'template',
        template: 'otto',
        inputs: { p1: '100 kPa', T1: '300 K', compressionRatio: '8', T3: '1800 K' },
      },
      givens: [],
    })
    const a = (await createProblem(db(), viewer, { definition: otto, visibility: 'private' })).problemId
    const b = (
      await createProblem(db(), viewer, { definition: carnot({ title: `Carnot 100% ${tag}` }), visibility: 'private' })
    ).problemId
    const ids = async (q: string) =>
      (await listBankProblems(db(), viewer, query({ q, scope: 'mine' }))).rows.map((r) => r.id).sort()
    expect(await ids(`SPARK ${tag}`)).toEqual([a])
    expect(await ids(`TOPIC${tag.toUpperCase()}`)).toEqual([a])
    expect(await ids(`otto ${tag}`)).toEqual([a])
    expect(await ids(`carnot-engine ${tag}`)).toEqual([b])
    expect(await ids(`100% ${tag}`)).toEqual([b])
    expect(await ids(`1_0 ${tag}`)).toEqual([])
    expect(await ids(tag)).toEqual([a, b].sort())
  })

  test('filters, sorting with a stable tie-break, and pages', async () => {
    const { viewer } = await createBankUser(db())
    const tag = word()
    const levels = ['first-year', 'graduate'] as const
    const difficulties = ['challenging', 'introductory', 'standard'] as const
    const made: { id: number; title: string; difficulty: string; level: string }[] = []
    for (let i = 0; i < 12; i++) {
      const difficulty = difficulties[i % 3]!
      const level = levels[i % 2]!
      const title = `${String.fromCharCode(76 - i)} item ${tag}`
      const { problemId } = await createProblem(db(), viewer, {
        definition: carnot({ title, tags: { topics: [], difficulty, level } }),
        visibility: 'private',
      })
      made.push({ id: problemId, title, difficulty, level })
    }
    const list = (p: Record<string, string>) => listBankProblems(db(), viewer, query({ q: tag, ...p }))

    const graduate = await list({ level: 'graduate', difficulty: 'standard' })
    expect(graduate.rows.map((r) => r.id).sort()).toEqual(
      made
        .filter((m) => m.level === 'graduate' && m.difficulty === 'standard')
        .map((m) => m.id)
        .sort(),
    )

    const byTitle = await list({ sort: 'title', pageSize: '50' })
    expect(byTitle.rows.map((r) => r.title)).toEqual(made.map((m) => m.title).sort())

    // introductory < standard < challenging, not the alphabet; ties by title.
    const byDifficulty = await list({ sort: 'difficulty', dir: 'asc', pageSize: '50' })
    const rank = { introductory: 0, standard: 1, challenging: 2 } as Record<string, number>
    const expected = [...made]
      .sort((x, y) => rank[x.difficulty]! - rank[y.difficulty]! || x.title.localeCompare(y.title))
      .map((m) => m.id)
    expect(byDifficulty.rows.map((r) => r.id)).toEqual(expected)

    // Created one after another in one second or less: equal timestamps are possible, and the
    // id tie-break keeps pages from repeating or skipping rows.
    await db()
      .update(problems)
      .set({ updatedAt: new Date('2026-11-30T12:00:00Z') })
      .where(eq(problems.ownerId, viewer.id))
    const pages = [await list({ pageSize: '10', page: '1' }), await list({ pageSize: '10', page: '2' })]
    expect(pages.map((p) => p.total)).toEqual([12, 12])
    expect(pages.map((p) => p.rows.length)).toEqual([10, 2])
    expect(pages.flatMap((p) => p.rows.map((r) => r.id))).toEqual(made.map((m) => m.id).sort((x, y) => y - x))

    const beyond = await list({ pageSize: '10', page: '9' })
    expect(beyond.page).toBe(2)
    expect(beyond.rows).toHaveLength(2)
  })

  test('junk in the URL falls back to the defaults', () => {
    expect(
      query({
        q: '  otto  ',
        scope: 'everyone',
        sort: 'price',
        dir: 'up',
        page: '-3',
        pageSize: '1000',
        difficulty: 'hard',
        level: '',
        cycle: 'DROP TABLE',
      }),
    ).toEqual({
      q: 'otto',
      scope: 'all',
      sort: 'updated',
      dir: 'desc',
      page: 1,
      pageSize: 25,
      difficulty: undefined,
      level: undefined,
      cycle: undefined,
    })
    expect(query({ sort: 'title' }).dir).toBe('asc')
    expect(query({ page: '3', pageSize: '50', cycle: 'otto' })).toMatchObject({ page: 3, pageSize: 50, cycle: 'otto' })
  })

  test('the viewer of a signed-in user carries their department', async () => {
    const { user, viewer } = await createBankUser(db())
    const signedIn = await loadSignedInUser(db(), user.id)
    expect(await bankViewerFor(db(), signedIn!)).toEqual(viewer)
  })
})

describe('copies', () => {
  test('a copy is private to the copier, version 1 of the latest definition, and remembers its origin', async () => {
    const { viewer: author } = await createBankUser(db(), { name: 'Original Author' })
    const { viewer: copier } = await createBankUser(db())
    const { problemId, versionId } = await createProblem(db(), author, {
      definition: carnot(),
      visibility: 'installation',
    })
    await freezeProblemVersion(db(), versionId)
    const v2 = await saveProblem(db(), author, problemId, {
      definition: carnot({ title: 'Carnot engine, second take' }),
      visibility: 'installation',
    })

    const copy = await copyProblem(db(), copier, problemId)
    const detail = await getProblemDetail(db(), copier, copy.problemId)
    expect(detail).toMatchObject({
      ownerId: copier.id,
      visibility: 'private',
      canEdit: true,
      origin: { problemId, title: 'Carnot engine, second take', versionNumber: 2 },
    })
    expect(detail?.versions).toHaveLength(1)
    expect(detail?.latest.definition).toEqual(carnot({ title: 'Carnot engine, second take' }))
    const [row] = await db()
      .select({ originProblemId: problems.originProblemId, originVersionId: problems.originVersionId })
      .from(problems)
      .where(eq(problems.id, copy.problemId))
    expect(row).toEqual({ originProblemId: problemId, originVersionId: v2.versionId })
    expect(await getProblemDetail(db(), author, copy.problemId)).toBeNull()
  })

  test('a problem one cannot see cannot be copied', async () => {
    const { viewer: author } = await createBankUser(db())
    const { viewer: other } = await createBankUser(db())
    const { problemId } = await createProblem(db(), author, { definition: carnot(), visibility: 'private' })
    await expect(copyProblem(db(), other, problemId)).rejects.toBeInstanceOf(ProblemAccessError)
  })
})

describe('export and import', () => {
  test('export then import gives the same definitions, as private problems of the importer', async () => {
    const { viewer: author } = await createBankUser(db(), { name: 'Exporting Author' })
    const { viewer: importer } = await createBankUser(db())
    const first = carnot()
    const second = carnot({
      title: 'Carnot engine with a given difference',
      constraints: [{ left: 'TH - TL', op: '>=', right: '200 K' }],
    })
    const a = (await createProblem(db(), author, { definition: first, visibility: 'installation' })).problemId
    const b = (await createProblem(db(), author, { definition: second, visibility: 'department' })).problemId

    const doc = await exportBank(db(), author, 'own')
    expect(doc).toMatchObject({ format: 'cyclewright-bank', version: 2 })
    expect(doc.problems.map((p) => p.definition)).toEqual([first, second])
    expect(doc.problems.map((p) => p.visibility)).toEqual(['installation', 'department'])
    expect(doc.problems[0]?.origin).toEqual({ title: first.title, author: 'Exporting Author' })
    expect((await exportBank(db(), author, [b])).problems.map((p) => p.title)).toEqual([second.title])

    // Through JSON text, as a download and an upload carry it.
    const result = await importBank(db(), importer, JSON.parse(JSON.stringify(doc)))
    expect(result.ok).toBe(true)
    if (!result.ok) return
    expect(result.problemIds).toHaveLength(2)
    expect(result.problemIds).not.toContain(a)
    const imported = await Promise.all(result.problemIds.map((id) => getProblemDetail(db(), importer, id)))
    expect(imported.map((d) => d?.latest.definition)).toEqual([first, second])
    expect(imported.map((d) => [d?.visibility, d?.ownerId, d?.latest.number])).toEqual([
      ['private', importer.id, 1],
      ['private', importer.id, 1],
    ])
  })

  test('exporting a problem one cannot see is refused', async () => {
    const { viewer: author } = await createBankUser(db())
    const { viewer: other } = await createBankUser(db())
    const mine = (await createProblem(db(), other, { definition: carnot(), visibility: 'private' })).problemId
    const hidden = (await createProblem(db(), author, { definition: carnot(), visibility: 'private' })).problemId
    await expect(exportBank(db(), other, [mine, hidden])).rejects.toBeInstanceOf(ProblemAccessError)
    await expect(exportBank(db(), other, [987_654])).rejects.toBeInstanceOf(ProblemAccessError)
  })

  test('an import with one invalid problem writes nothing and names the problem and field', async () => {
    const { viewer } = await createBankUser(db())
    const counts = async () => [
      (await db().select({ n: count() }).from(problems))[0]!.n,
      (await db().select({ n: count() }).from(problemVersions))[0]!.n,
    ]
    const before = await counts()
    const broken = carnot({ title: 'Otto cycle efficiency' }) as unknown as { finds: { tolerance: unknown }[] }
    broken.finds[0]!.tolerance = { kind: 'relative', value: 5 }
    const result = await importBank(db(), viewer, {
      format: 'cyclewright-bank',
      version: 1,
      exportedAt: '2026-12-02T10:00:00Z',
      problems: [
        { title: 'Carnot engine efficiency', definition: carnot() },
        { title: 'Carnot again', definition: carnot() },
        { title: 'Otto cycle efficiency', definition: broken },
      ],
    })
    expect(result).toEqual({
      ok: false,
      errors: [
        {
          problem: 'Problem 3 (Otto cycle efficiency)',
          field: 'definition.finds.0.tolerance.value',
          message: expect.stringMatching(/at most 1/),
        },
      ],
    })
    expect(await counts()).toEqual(before)
  })

  test('a failure while writing rolls back the problems already written', async () => {
    // A viewer id with no user row: the first insert breaks the foreign key. Everything
    // before it in the same import must be gone too.
    const ghost: BankViewer = { id: 987_654, isAdmin: false, departmentId: null }
    const before = (await db().select({ n: count() }).from(problems))[0]!.n
    const doc = {
      format: 'cyclewright-bank',
      version: 1,
      exportedAt: '2026-12-02T10:00:00Z',
      problems: [{ title: 'a', definition: carnot() }],
    }
    await expect(importBank(db(), ghost, doc)).rejects.toThrow()
    expect((await db().select({ n: count() }).from(problems))[0]!.n).toBe(before)
  })
})
