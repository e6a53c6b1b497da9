/**
 * GET /api/versions/:versionId/check, which the assignment picker polls while a version's
 * check is running, and the picker's markup for such a version (a polite live region; a
 * "reload" note for pages without JavaScript), against PostgreSQL.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query'
import { eq } from 'drizzle-orm'
import { createElement } from 'react'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { afterAll, describe, expect, test } from 'vitest'
import { VersionPicker } from '#app/components/version-picker.tsx'
import type { VersionCheck } from '#app/lib/check-words.ts'
import { loader } from '#app/routes/resources/api-version-check.ts'
import { db } from '#app/server/db/client.server.ts'
import { problemSweeps } from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { addMember, createCourse, createProblemWithVersion, createUser, recordCheck } from '#tests/support/factories.ts'
import { sessionCookie } from '#tests/support/login.ts'
import { args, getRequest, settle } from '#tests/support/requests.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition

async function instructor() {
  const course = await createCourse(db(), { timeZone: 'UTC' })
  const user = await createUser(db(), { name: 'Ingrid Instructor', departmentId: course.departmentId })
  await addMember(db(), user.id, course.id, 'instructor')
  return { user, cookie: await sessionCookie(user) }
}

async function checkOf(versionId: number, cookie: string): Promise<{ status: number; body: unknown }> {
  const out = await settle(
    loader(
      args(getRequest(`/api/versions/${versionId}/check`, { Cookie: cookie, Accept: 'application/json' }), {
        versionId: String(versionId),
      }),
    ),
  )
  const response = ('value' in out ? out.value : out.thrown) as Response
  return { status: response.status, body: await response.json() }
}

describe('the version check the picker polls', () => {
  test('a running check, then the same check finished: passed, then a later check that failed', async () => {
    const { user, cookie } = await instructor()
    const { versionId } = await createProblemWithVersion(db(), user.id, otto)
    expect(await checkOf(versionId, cookie)).toEqual({ status: 200, body: { check: { state: 'never' } } })

    const sweep = await recordCheck(db(), versionId, user.id, { status: 'running', total: 200, checked: 40 })
    expect(await checkOf(versionId, cookie)).toEqual({
      status: 200,
      body: { check: { state: 'running', total: 200, checked: 40, failed: 0 } },
    })

    await db().update(problemSweeps).set({ status: 'done', checked: 200 }).where(eq(problemSweeps.id, sweep.id))
    expect(await checkOf(versionId, cookie)).toEqual({
      status: 200,
      body: { check: { state: 'passed', total: 200, checked: 200, failed: 0 } },
    })

    await recordCheck(db(), versionId, user.id, {
      status: 'done',
      total: 100,
      checked: 100,
      failed: 3,
      createdAt: new Date(Date.now() + 60_000),
    })
    expect((await checkOf(versionId, cookie)).body).toEqual({
      check: { state: 'failed', total: 100, checked: 100, failed: 3 },
    })
  })

  test('another instructor’s private version, and a version that does not exist, are both 404 with a message', async () => {
    const owner = await instructor()
    const other = await instructor()
    const { versionId } = await createProblemWithVersion(db(), owner.user.id, otto)
    const hidden = await checkOf(versionId, other.cookie)
    const missing = await checkOf(999_999_999, other.cookie)
    expect(hidden).toEqual({ status: 404, body: { error: 'There is no such version.' } })
    expect(missing).toEqual(hidden)
  })
})

function renderPicker(check: VersionCheck): string {
  const choices = [
    {
      problemId: 7,
      title: 'Otto drill',
      versions: [{ id: 71, number: 2, savedAt: new Date('2027-01-05T10:00:00Z'), author: 'Ingrid', check }],
    },
  ]
  const Picker = () =>
    createElement(VersionPicker, {
      index: 0,
      name: 'items.0.versionId',
      overrideName: 'items.0.override',
      domId: 'items-0',
      value: '71',
      override: '',
      storedVersionId: '',
      choices,
      timeZone: 'UTC',
      invalid: false,
    })
  const Stub = createRoutesStub([{ path: '/', Component: Picker }])
  return renderToString(createElement(QueryClientProvider, { client: new QueryClient() }, createElement(Stub)))
}

describe('the picker’s markup for a running check', () => {
  test('a running check is a polite live region and, without JavaScript, says to reload', () => {
    const html = renderPicker({ state: 'running', total: 500, checked: 120, failed: 0 })
    expect(html).toContain('aria-live="polite"')
    expect(html).toMatch(/<noscript>.*checking — reload to see the result.*<\/noscript>/)
    expect(html).toContain('Check running: 120 of 500 variants so far')
    expect(html).toContain('Assign although the check has not finished')
  })

  test('a finished check has neither', () => {
    const html = renderPicker({ state: 'passed', total: 500, checked: 500, failed: 0 })
    expect(html).not.toContain('aria-live')
    expect(html).not.toContain('reload to see the result')
    expect(html).not.toContain('Assign although')
  })
})
