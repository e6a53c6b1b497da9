/**
 * Tidying the bank through its pages: an archived problem leaves the bank list and the
 * assignment picker (listBankChoices), shows under the "Archived" filter with a way back, and
 * an assignment already using it keeps it; a problem no assignment uses may be deleted after a
 * confirmation, one in use is refused with a message; only the owner may do any of it.
 */
import { eq } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import { loader as problemLoader, action as problemAction } from '#app/routes/bank/$problemId.tsx'
import { loader as bankLoader } from '#app/routes/bank/index.tsx'
import { listBankChoices } from '#app/server/assignments.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { problems } from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import {
  addMember,
  createAssignment,
  createBankUser,
  createCourse,
  createProblemWithVersion,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { sessionCookie } from '#tests/support/login.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition

function statusOf(out: { thrown: unknown } | { value: unknown }): number {
  const r = 'thrown' in out ? out.thrown : out.value
  if (r instanceof Response) return r.status
  if (r && typeof r === 'object' && 'init' in r) return (r as { init: { status?: number } | null }).init?.status ?? 200
  return 200
}

async function bankTitles(cookie: string, search = '') {
  const page = (await bankLoader(args(getRequest(`/bank${search}`, { Cookie: cookie })))) as {
    rows: { id: number; title: string }[]
  }
  return page.rows.map((r) => r.id)
}

describe('archiving a bank problem', () => {
  test('hides it from the bank list and the assignment picker, shows it under Archived, and restores it', async () => {
    const { user, viewer } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const p = await createProblemWithVersion(db(), user.id, { ...otto, title: 'Otto to archive' })
    const other = await createProblemWithVersion(db(), user.id, { ...otto, title: 'Otto to keep' })
    const path = `/bank/${p.problemId}`
    const params = { problemId: String(p.problemId) }
    expect(await bankTitles(cookie)).toEqual(expect.arrayContaining([p.problemId, other.problemId]))

    const done = (await problemAction(
      args(formRequest(path, { intent: 'archive' }, { Cookie: cookie }), params),
    )) as Response
    expect(done.headers.get('Location')).toBe(`${path}?done=archived`)
    expect(await bankTitles(cookie)).not.toContain(p.problemId)
    expect(await bankTitles(cookie)).toContain(other.problemId)
    expect(await bankTitles(cookie, '?archived=1')).toEqual([p.problemId])
    const choices = await listBankChoices(db(), viewer)
    expect(choices.map((c) => c.problemId)).not.toContain(p.problemId)
    expect(choices.map((c) => c.problemId)).toContain(other.problemId)
    // An assignment that already has the version still sees it among its choices.
    expect((await listBankChoices(db(), viewer, [p.versionId])).map((c) => c.problemId)).toContain(p.problemId)
    const page = (await problemLoader(args(getRequest(path, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof problemLoader>
    >
    expect(page.usage!.archivedAt).not.toBeNull()

    await problemAction(args(formRequest(path, { intent: 'restore' }, { Cookie: cookie }), params))
    expect(await bankTitles(cookie)).toContain(p.problemId)
    expect((await listBankChoices(db(), viewer)).map((c) => c.problemId)).toContain(p.problemId)
  })

  test('someone who may see but not own the problem cannot archive or delete it', async () => {
    const owner = await createBankUser(db())
    const p = await createProblemWithVersion(db(), owner.user.id, otto)
    await db().update(problems).set({ visibility: 'installation' }).where(eq(problems.id, p.problemId))
    const other = await createBankUser(db())
    const cookie = await sessionCookie(other.user)
    const params = { problemId: String(p.problemId) }
    for (const form of [{ intent: 'archive' }, { intent: 'delete', confirm: 'yes' }] as Record<string, string>[]) {
      const out = await settle(
        problemAction(args(formRequest(`/bank/${p.problemId}`, form, { Cookie: cookie }), params)),
      )
      expect(statusOf(out)).toBe(403)
    }
    const [row] = await db()
      .select({ archivedAt: problems.archivedAt })
      .from(problems)
      .where(eq(problems.id, p.problemId))
    expect(row).toEqual({ archivedAt: null })
  })
})

describe('deleting a bank problem', () => {
  test('one no assignment uses is deleted after confirmation; without confirm=yes it stays', async () => {
    const { user } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const p = await createProblemWithVersion(db(), user.id, otto)
    const path = `/bank/${p.problemId}`
    const params = { problemId: String(p.problemId) }
    const page = (await problemLoader(
      args(getRequest(`${path}?confirm=delete`, { Cookie: cookie }), params),
    )) as Awaited<ReturnType<typeof problemLoader>>
    expect(page.confirmDelete).toBe(true)
    expect(page.usage).toMatchObject({ deletable: true, assignmentCount: 0, versionCount: 1 })
    const refused = await settle(
      problemAction(args(formRequest(path, { intent: 'delete' }, { Cookie: cookie }), params)),
    )
    expect(statusOf(refused)).toBe(400)
    expect(await db().select({ id: problems.id }).from(problems).where(eq(problems.id, p.problemId))).toHaveLength(1)
    const done = (await problemAction(
      args(formRequest(path, { intent: 'delete', confirm: 'yes' }, { Cookie: cookie }), params),
    )) as Response
    expect(done.headers.get('Location')).toBe('/bank?deleted=1')
    expect(await db().select({ id: problems.id }).from(problems).where(eq(problems.id, p.problemId))).toEqual([])
  })

  test('one an assignment uses is refused with a message and kept', async () => {
    const { user } = await createBankUser(db())
    const course = await createCourse(db())
    await addMember(db(), user.id, course.id, 'instructor')
    const cookie = await sessionCookie(user)
    const p = await createProblemWithVersion(db(), user.id, otto)
    await createAssignment(db(), course.id, user.id, [p])
    const params = { problemId: String(p.problemId) }
    const page = (await problemLoader(args(getRequest(`/bank/${p.problemId}`, { Cookie: cookie }), params))) as Awaited<
      ReturnType<typeof problemLoader>
    >
    expect(page.usage).toMatchObject({ deletable: false, assignmentCount: 1 })
    const out = await settle(
      problemAction(
        args(formRequest(`/bank/${p.problemId}`, { intent: 'delete', confirm: 'yes' }, { Cookie: cookie }), params),
      ),
    )
    expect(statusOf(out)).toBe(409)
    expect((out as { value: { data: { formError: string } } }).value.data.formError).toMatch(
      /cannot be deleted: an assignment uses it\. Archive it instead/,
    )
    expect(await db().select({ id: problems.id }).from(problems).where(eq(problems.id, p.problemId))).toHaveLength(1)
  })
})
