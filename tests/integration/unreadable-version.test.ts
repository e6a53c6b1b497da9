/**
 * A problem version whose stored document fails the definition check (changed by hand in the
 * database, here a find without its unit and points) on the pages and routes that show one
 * version: the bank problem page names it and what to do and keeps the rest of the page
 * (other versions, archive, check panel); "Copy into my bank" answers with a message, not an
 * error page; the editor starts from the newest version that reads; the version-check JSON
 * route answers 422 with an { error } body.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query'
import { createElement } from 'react'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { sql } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import ProblemRoute, { action as problemAction, loader as problemLoader } from '#app/routes/bank/$problemId.tsx'
import { action as editAction, loader as editLoader } from '#app/routes/bank/edit.tsx'
import { loader as versionCheckLoader } from '#app/routes/resources/api-version-check.ts'
import { db } from '#app/server/db/client.server.ts'
import { problemVersions } from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { createBankUser, createProblemWithVersion, createUser } from '#tests/support/factories.ts'
import { loginAs } from '#tests/support/login.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition

/**
 * An installation-wide problem whose version 1 reads and whose version 2 (the newest) does not:
 * its one find lost its unit, points and tolerance, as a hand edit in the database might leave it.
 */
async function problemWithBrokenNewest() {
  const { user: owner } = await createBankUser(db(), { name: 'Olga Owner' })
  const made = await createProblemWithVersion(db(), owner.id, { ...otto, title: 'Otto with a broken version' })
  await db().execute(sql`update problems set visibility = 'installation' where id = ${made.problemId}`)
  const broken = { ...otto, finds: [{ name: 'T2', label: 'Temperature after compression' }] }
  const [v2] = await db()
    .insert(problemVersions)
    .values({ problemId: made.problemId, number: 2, definition: otto, createdBy: owner.id })
    .returning({ id: problemVersions.id })
  await db().execute(
    sql`update problem_versions set definition = ${JSON.stringify(broken)}::jsonb where id = ${v2!.id}`,
  )
  const path = `/bank/${made.problemId}`
  return {
    owner,
    problemId: made.problemId,
    v1: made.versionId,
    v2: v2!.id,
    path,
    params: { problemId: String(made.problemId) },
  }
}

type PageData = Awaited<ReturnType<typeof problemLoader>>

function render(path: string, loaderData: PageData): string {
  const Stub = createRoutesStub([
    {
      path: '/bank/:problemId',
      Component: ProblemRoute as never,
      loader: () => loaderData,
      HydrateFallback: () => null,
    },
  ])
  return renderToString(
    createElement(
      QueryClientProvider,
      { client: new QueryClient() },
      createElement(Stub, { initialEntries: [path], hydrationData: { loaderData: { 0: loaderData } } }),
    ),
  ).replaceAll('<!-- -->', '')
}

function statusOf(out: { thrown: unknown } | { value: unknown }): number | undefined {
  const r = 'thrown' in out ? out.thrown : out.value
  if (r instanceof Response) return r.status
  if (r && typeof r === 'object' && 'init' in r) return (r as { init: { status?: number } | null }).init?.status ?? 200
  return 200
}

describe('the bank problem page with an unreadable version', () => {
  test('names the version and what to do, links the version that reads, and keeps the rest of the page', async () => {
    const s = await problemWithBrokenNewest()
    const page = await problemLoader(args(getRequest(s.path, await loginAs(s.owner)), s.params))
    expect(page.version.number).toBe(2)
    expect(page.version.definition).toBeNull()
    expect(page.preview).toBeNull()
    expect(page.problem.versions.map((v) => [v.number, v.definition === null])).toEqual([
      [2, true],
      [1, false],
    ])
    const html = render(s.path, page)
    expect(html).toContain('Version 2 cannot be shown')
    expect(html).toContain('does not pass the problem check')
    expect(html).toContain(`href="${s.path}?version=1"`)
    expect(html).toContain('press Edit: the form starts from the newest version that reads')
    expect(html).toContain('Otto with a broken version')
    // The rest of the page: archive, the check panel, the versions list marking the broken one.
    expect(html).toContain('Archive or delete')
    expect(html).toContain('Editable · cannot be read')
    expect(html).not.toContain('Three variants side by side')

    // Version 1 still shows its variants.
    const v1 = await problemLoader(args(getRequest(`${s.path}?version=1`, await loginAs(s.owner)), s.params))
    expect(v1.version.number).toBe(1)
    expect(v1.preview?.variants.length).toBeGreaterThan(0)
    expect(v1.preview?.variants.every((v) => v.ok)).toBe(true)
  })

  test('“Copy into my bank” answers 422 with a message naming the version, and copies nothing', async () => {
    const s = await problemWithBrokenNewest()
    const { user: colleague } = await createBankUser(db(), { name: 'Colin Colleague' })
    const before = await db().execute<{ n: number }>(sql`select count(*)::int as n from problems`)
    const out = await settle(
      problemAction(args(formRequest(s.path, { intent: 'copy' }, await loginAs(colleague)), s.params)),
    )
    expect(statusOf(out)).toBe(422)
    const value = 'value' in out ? (out.value as { data: { formError: string } }) : null
    expect(value?.data.formError).toMatch(/^Version 2 of this problem cannot be copied: its stored definition/)
    expect(value?.data.formError).toContain('Open another version')
    const after = await db().execute<{ n: number }>(sql`select count(*)::int as n from problems`)
    expect(after.rows[0]!.n).toBe(before.rows[0]!.n)
    // The page the colleague is sent back to still loads.
    const page = await problemLoader(args(getRequest(s.path, await loginAs(colleague)), s.params))
    expect(page.problem.canEdit).toBe(false)
    expect(render(s.path, page)).toContain('Version 2 cannot be shown')
  })

  test('the editor starts from the newest version that reads, and says so', async () => {
    const s = await problemWithBrokenNewest()
    const page = await editLoader(args(getRequest(`${s.path}/edit`, await loginAs(s.owner)), s.params))
    expect(page.startedFrom).toEqual({ unreadable: 2, from: 1 })
    expect(page.state.values['title']).toBe('Otto with a broken version')
  })

  test('saving from the editor gives the problem a newest version that reads again', async () => {
    const s = await problemWithBrokenNewest()
    const cookie = await loginAs(s.owner)
    const page = await editLoader(args(getRequest(`${s.path}/edit`, cookie), s.params))
    expect(page.startedFrom).toEqual({ unreadable: 2, from: 1 })
    // The form as served (version 1's fields), sent back unchanged with Save.
    const out = await settle(
      editAction(args(formRequest(`${s.path}/edit`, { ...page.state.values, intent: 'save' }, cookie), s.params)),
    )
    const saved = 'value' in out ? out.value : out.thrown
    expect(saved).toBeInstanceOf(Response)
    expect((saved as Response).headers.get('Location')).toMatch(new RegExp(`^/bank/${s.problemId}(\\?|$)`))
    // The newest version now reads: the page shows it with its variants, the editor starts from it.
    const after = await problemLoader(args(getRequest(s.path, cookie), s.params))
    expect(after.version.definition).not.toBeNull()
    expect(after.preview?.variants.every((v) => v.ok)).toBe(true)
    const again = await editLoader(args(getRequest(`${s.path}/edit`, cookie), s.params))
    expect(again.startedFrom).toBeNull()
    expect(again.problem.versionNumber).toBe(after.version.number)
  })

  test('the editor of a problem with no readable version is a 422 page with a message', async () => {
    const s = await problemWithBrokenNewest()
    await db().execute(sql`update problem_versions set definition = 'null'::jsonb where id = ${s.v1}`)
    const out = await settle(editLoader(args(getRequest(`${s.path}/edit`, await loginAs(s.owner)), s.params)))
    expect(statusOf(out)).toBe(422)
    expect('thrown' in out && (out.thrown as { data: string }).data).toMatch(
      /^No version of this problem can be edited/,
    )
  })
})

describe('GET /api/versions/:versionId/check for an unreadable version', () => {
  test('answers 422 with a JSON error naming the version; the readable version answers as before', async () => {
    const s = await problemWithBrokenNewest()
    const cookie = await loginAs(s.owner)
    const ask = async (versionId: number) => {
      const out = await settle(
        versionCheckLoader(
          args(getRequest(`/api/versions/${versionId}/check`, { ...cookie, Accept: 'application/json' }), {
            versionId: String(versionId),
          }),
        ),
      )
      const response = ('value' in out ? out.value : out.thrown) as Response
      return { status: response.status, body: (await response.json()) as unknown }
    }
    const broken = await ask(s.v2)
    expect(broken.status).toBe(422)
    expect(broken.body).toEqual({ error: expect.stringMatching(/^Version 2 of this problem cannot be used: /) })
    expect(await ask(s.v1)).toEqual({ status: 200, body: { check: { state: 'never' } } })
    // Someone who may not see the problem learns nothing about its versions.
    const stranger = await createUser(db(), { name: 'No Bank', password: null })
    const out = await settle(
      versionCheckLoader(
        args(getRequest(`/api/versions/${s.v2}/check`, await loginAs(stranger)), { versionId: String(s.v2) }),
      ),
    )
    expect(statusOf(out)).toBe(403)
  })
})
