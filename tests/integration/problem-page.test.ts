/**
 * The student's problem page and its polling route, called with real Requests and a session
 * cookie against PostgreSQL: post/redirect/get after a submission, refused answers returned
 * with everything typed, staff refused, and GET …/mine answering only the student.
 */
import { and, eq, sql } from 'drizzle-orm'
import type pg from 'pg'
import { QueryClient, QueryClientProvider } from '@tanstack/react-query'
import { createElement } from 'react'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { afterAll, describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import ProblemRoute, {
  action,
  loader,
  type ProblemPageData,
  type SubmitActionData,
} from '#app/routes/courses/assignments/problem.tsx'
import { loader as mineLoader } from '#app/routes/resources/api-my-results.ts'
import { db } from '#app/server/db/client.server.ts'
import { assignments, partResults, submissions } from '#app/server/db/schema.server.ts'
import { gradeSubmission } from '#app/server/grading.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import type { MyResults } from '#app/server/submissions.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import {
  addMember,
  createCourse,
  createCourseWithAssignment,
  createUser,
  drawnVariant,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { sessionCookie } from '#tests/support/login.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition
const day = 24 * 3600_000

afterAll(async () => {
  await stopBoss()
})

async function setUp(options: Parameters<typeof createCourseWithAssignment>[2] = {}) {
  const made = await createCourseWithAssignment(db(), [ottoV1], { students: 2, ...options })
  const student = made.students[0]!
  const item = made.items[0]!
  const variant = drawnVariant(made, ottoV1, { student, item })
  const key = Object.fromEntries(variant.key.map((k) => [k.name, k]))
  const path = `/courses/${made.course.id}/assignments/${made.assignment.id}/problems/1`
  const params = { courseId: String(made.course.id), assignmentId: String(made.assignment.id), position: '1' }
  const mineParams = { assignmentId: String(made.assignment.id), position: '1' }
  const minePath = `/api/assignments/${made.assignment.id}/problems/1/mine`
  return { ...made, student, item, key, path, params, mineParams, minePath, cookie: await sessionCookie(student) }
}

type Setup = Awaited<ReturnType<typeof setUp>>

/** The one-time token of a fresh rendering of the student's page. */
async function tokenFor(s: Setup, cookie = s.cookie): Promise<string> {
  const page = await loader(args(getRequest(s.path, { Cookie: cookie }), s.params))
  expect(page.formToken).toBeTruthy()
  return page.formToken!
}

/** The page's server HTML for `url` (loader and component), as a browser without JavaScript gets it. */
async function renderProblemPage(s: Setup, url: string): Promise<string> {
  const loaderData = await loader(args(getRequest(url, { Cookie: s.cookie }), s.params))
  const Stub = createRoutesStub([
    {
      path: '/courses/:courseId/assignments/:assignmentId/problems/:position',
      Component: ProblemRoute as never,
      loader: () => loaderData,
      HydrateFallback: () => null,
    },
  ])
  const element = createElement(
    QueryClientProvider,
    { client: new QueryClient() },
    createElement(Stub, { initialEntries: [url], hydrationData: { loaderData: { 0: loaderData } } }),
  )
  return renderToString(element).replaceAll('<!-- -->', '')
}

function post(s: Setup, fields: Record<string, string>, cookie = s.cookie) {
  return action(args(formRequest(s.path, fields, { Cookie: cookie }), s.params))
}

/** What an action returned with data(…): its body and status. */
function asData(value: unknown): { data: SubmitActionData; status: number } {
  const v = value as { type?: string; data: SubmitActionData; init: { status: number } | null }
  expect(v.type).toBe('DataWithResponseInit')
  return { data: v.data, status: v.init?.status ?? 200 }
}

async function storedSubmissions(assignmentId: number) {
  return db().select().from(submissions).where(eq(submissions.assignmentId, assignmentId))
}

async function mine(s: Setup, cookie: string | null, params = s.mineParams) {
  const result = await settle(mineLoader(args(getRequest(s.minePath, cookie ? { Cookie: cookie } : {}), params)))
  const res = ('value' in result ? result.value : result.thrown) as Response
  return {
    status: res.status,
    cache: res.headers.get('Cache-Control'),
    body: (await res.json()) as MyResults & { error?: string },
  }
}

describe('submitting from the problem page', () => {
  test('good answers redirect to the receipt (post/redirect/get) and store one submission with the text as typed', async () => {
    const s = await setUp()
    const typed = {
      'answer.T2': ` ${s.key.T2!.value} K`,
      'answer.wNet': `${s.key.wNet!.value} kJ/kg`,
      'answer.eta': '',
    }
    const res = (await post(s, typed)) as Response
    expect(res).toBeInstanceOf(Response)
    expect(res.status).toBe(303)
    const rows = await storedSubmissions(s.assignment.id)
    expect(rows).toHaveLength(1)
    expect(res.headers.get('Location')).toBe(`${s.path}?receipt=${rows[0]!.id}`)
    expect(rows[0]!.answers).toEqual({ T2: typed['answer.T2'], wNet: typed['answer.wNet'], eta: '' })
    const parts = await db()
      .select({ findName: partResults.findName, attempt: partResults.attempt })
      .from(partResults)
      .where(eq(partResults.submissionId, rows[0]!.id))
    expect(parts.map((p) => [p.findName, p.attempt]).sort()).toEqual([
      ['T2', 1],
      ['wNet', 1],
    ])

    // The page the redirect lands on: the receipt, the answers back in the form, grading pending.
    const page = (await loader(
      args(getRequest(`${s.path}?receipt=${rows[0]!.id}`, { Cookie: s.cookie }), s.params),
    )) as ProblemPageData
    expect(page.staff).toBe(false)
    expect(page.receiptId).toBe(rows[0]!.id)
    expect(page.problem.results.pending).toBe(true)
    expect(page.problem.results.receipts[0]).toMatchObject({
      submissionId: rows[0]!.id,
      status: 'queued',
      parts: [
        { attempt: 1, of: 3 },
        { attempt: 1, of: 3 },
      ],
    })
    expect(page.problem.results.lastTyped.T2).toBe(typed['answer.T2'])
    expect(page.problem.key).toBeNull()
  })

  test('with JavaScript (inPlace) the same submission answers with its receipt instead of a redirect', async () => {
    const s = await setUp()
    const result = asData(await post(s, { inPlace: '1', 'answer.T2': `${s.key.T2!.value} K` }))
    expect(result.status).toBe(200)
    expect(result.data).toMatchObject({
      ok: true,
      formError: null,
      fieldErrors: {},
      receipt: { status: 'queued', parts: [{ findName: 'T2', attempt: 1, of: 3 }] },
    })
    expect(await storedSubmissions(s.assignment.id)).toHaveLength(1)
  })

  test('an unreadable answer beside a good one: the good one is stored, the POST redirects, and the page after it shows the message and both texts', async () => {
    const s = await setUp()
    const typed = { 'answer.T2': `${s.key.T2!.value} K`, 'answer.wNet': '12 kg', 'answer.eta': 'about half' }
    const res = (await post(s, { ...typed, formToken: await tokenFor(s) })) as Response
    expect(res).toBeInstanceOf(Response)
    expect(res.status).toBe(303)
    const rows = await storedSubmissions(s.assignment.id)
    expect(rows).toHaveLength(1)
    expect(res.headers.get('Location')).toBe(`${s.path}?receipt=${rows[0]!.id}`)
    const parts = await db().select().from(partResults).where(eq(partResults.submissionId, rows[0]!.id))
    expect(parts.map((p) => [p.findName, p.attempt])).toEqual([['T2', 1]])

    // The GET the redirect leads to: the refusals with why, and everything typed back in the form.
    const page = (await loader(
      args(getRequest(res.headers.get('Location')!, { Cookie: s.cookie }), s.params),
    )) as ProblemPageData
    expect(page.receiptId).toBe(rows[0]!.id)
    expect(page.problem.refused?.submissionId).toBe(rows[0]!.id)
    expect(Object.keys(page.problem.refused!.fieldErrors).sort()).toEqual(['eta', 'wNet'])
    expect(page.problem.refused!.fieldErrors.eta).toMatch(/did not use an attempt/)
    expect(page.problem.refused!.fieldErrors.wNet).toMatch(/did not use an attempt/)
    expect(page.problem.results.lastTyped).toEqual({ T2: typed['answer.T2'], wNet: '12 kg', eta: 'about half' })
    expect(page.problem.results.receipts[0]).toMatchObject({
      submissionId: rows[0]!.id,
      parts: [{ findName: 'T2', attempt: 1 }],
    })
    // Rendered on the server, the way a browser without JavaScript gets it.
    const html = await renderProblemPage(s, res.headers.get('Location')!)
    expect(html).toContain('Some answers were not submitted. They did not use an attempt.')
    expect(html).toMatch(/id="answer-eta"[^>]*value="about half"|value="about half"[^>]*id="answer-eta"/)
    expect(html).toMatch(/id="answer-wNet"[^>]*value="12 kg"|value="12 kg"[^>]*id="answer-wNet"/)
    expect(html).toContain('name="formToken"')

    // The refusals belong to that press: once another is stored, its receipt no longer shows them.
    await post(s, { 'answer.wNet': `${s.key.wNet!.value} kJ/kg`, formToken: await tokenFor(s) })
    const older = (await loader(
      args(getRequest(`${s.path}?receipt=${rows[0]!.id}`, { Cookie: s.cookie }), s.params),
    )) as ProblemPageData
    expect(older.problem.refused).toBeNull()
  })

  test('with JavaScript (inPlace) a mixed press answers in place with the refusals and the text typed', async () => {
    const s = await setUp()
    const result = asData(
      await post(s, {
        inPlace: '1',
        formToken: await tokenFor(s),
        'answer.T2': `${s.key.T2!.value} K`,
        'answer.eta': 'about half',
      }),
    )
    expect(result.status).toBe(200)
    expect(result.data.ok).toBe(true)
    expect(result.data.values).toMatchObject({ T2: `${s.key.T2!.value} K`, eta: 'about half' })
    expect(result.data.fieldErrors.eta).toMatch(/did not use an attempt/)
    expect(result.data.fieldErrors.T2).toBeUndefined()
    expect(result.data.receipt?.parts.map((p) => p.findName)).toEqual(['T2'])
    const rows = await storedSubmissions(s.assignment.id)
    expect(rows.map((r) => r.id)).toEqual([result.data.receipt!.submissionId])
  })

  test('only unreadable answers: 400, nothing stored, the typed text and the message returned', async () => {
    const s = await setUp()
    const result = asData(await post(s, { 'answer.wNet': '12 kg', 'answer.eta': 'about half' }))
    expect(result.status).toBe(400)
    expect(result.data).toMatchObject({ ok: false, receipt: null, values: { wNet: '12 kg', eta: 'about half' } })
    expect(result.data.formError).toMatch(/Nothing was submitted/)
    expect(result.data.fieldErrors.eta).toBeTruthy()
    expect(result.data.fieldErrors.wNet).toBeTruthy()
    expect(await storedSubmissions(s.assignment.id)).toHaveLength(0)
  })

  test('after the due date the answers are refused with 400 and kept in the form', async () => {
    const s = await setUp({
      assignment: { opensAt: new Date(Date.now() - 10 * day), dueAt: new Date(Date.now() - day) },
    })
    const result = asData(await post(s, { 'answer.T2': '500 K' }))
    expect(result.status).toBe(400)
    expect(result.data.formError).toMatch(/due date has passed/)
    expect(result.data.values.T2).toBe('500 K')
    expect(await storedSubmissions(s.assignment.id)).toHaveLength(0)
  })

  test('staff cannot submit (403) and nothing is stored; their page is a preview of their own variant with the key', async () => {
    const s = await setUp()
    const staffCookie = await sessionCookie(s.instructor)
    const refused = await settle(post(s, { 'answer.T2': '500 K' }, staffCookie))
    expect('thrown' in refused && (refused.thrown as { init: { status: number } }).init.status).toBe(403)
    expect(await storedSubmissions(s.assignment.id)).toHaveLength(0)

    const page = (await loader(args(getRequest(s.path, { Cookie: staffCookie }), s.params))) as ProblemPageData
    expect(page.staff).toBe(true)
    expect(page.problem.key?.entries.map((k) => k.name)).toEqual(['T2', 'wNet', 'eta'])
  })

  test('a problem that is not open yet tells a student when it opens (nothing of the problem) and is a preview to staff', async () => {
    const s = await setUp({
      assignment: { opensAt: new Date(Date.now() + day), dueAt: new Date(Date.now() + 7 * day) },
    })
    const student = await settle(loader(args(getRequest(s.path, { Cookie: s.cookie }), s.params)))
    expect('value' in student && Object.keys(student.value as object)).toEqual(['notOpen'])
    expect('value' in student && (student.value as { notOpen: { message: string } }).notOpen.message).toMatch(
      / opens .+ Its problems appear here then\.$/,
    )
    const staff = (await loader(
      args(getRequest(s.path, { Cookie: await sessionCookie(s.instructor) }), s.params),
    )) as ProblemPageData
    expect(staff.problem.window.state).toBe('not-open')
  })

  test('a problem position that does not exist is 404, on the page, to the action and in the API', async () => {
    const s = await setUp()
    const params = { ...s.params, position: '2' }
    const page = await settle(loader(args(getRequest(s.path.replace(/1$/, '2'), { Cookie: s.cookie }), params)))
    expect('thrown' in page && (page.thrown as { init: { status: number }; data: string }).init.status).toBe(404)
    expect((page as { thrown: { data: string } }).thrown.data).toBe('There is no such problem, or it is not open yet.')
    const posted = asData(
      await action(args(formRequest(s.path, { 'answer.T2': '500 K' }, { Cookie: s.cookie }), params)),
    )
    expect(posted.status).toBe(400)
    expect(await storedSubmissions(s.assignment.id)).toHaveLength(0)
    expect((await mine(s, s.cookie, { ...s.mineParams, position: '2' })).status).toBe(404)
    const junk = await settle(loader(args(getRequest(s.path, { Cookie: s.cookie }), { ...s.params, position: 'x' })))
    expect('thrown' in junk && (junk.thrown as { init: { status: number } }).init.status).toBe(404)
  })

  test('a student of another course gets 403 from the page and the action', async () => {
    const s = await setUp()
    const other = await createCourse(db())
    const outsider = await createUser(db(), { password: null })
    await addMember(db(), outsider.id, other.id, 'student')
    const cookie = await sessionCookie(outsider)
    const page = await settle(loader(args(getRequest(s.path, { Cookie: cookie }), s.params)))
    expect('thrown' in page && (page.thrown as { init: { status: number } }).init.status).toBe(403)
    const posted = await settle(post(s, { 'answer.T2': '500 K' }, cookie))
    expect('thrown' in posted && (posted.thrown as { init: { status: number } }).init.status).toBe(403)
  })
})

describe('one press, one submission (form tokens)', () => {
  test('each rendering of the page carries its own token; staff get none', async () => {
    const s = await setUp()
    const a = await tokenFor(s)
    const b = await tokenFor(s)
    expect(a).toMatch(/^[A-Za-z0-9_-]{21}$/)
    expect(b).not.toBe(a)
    const staff = (await loader(
      args(getRequest(s.path, { Cookie: await sessionCookie(s.instructor) }), s.params),
    )) as ProblemPageData
    expect(staff.formToken).toBeNull()
  })

  test('the same form posted twice (a reload, a double click) stores one submission and uses one attempt; both land on its receipt with its refusals', async () => {
    const s = await setUp()
    const formToken = await tokenFor(s)
    const fields = { formToken, 'answer.T2': `${s.key.T2!.value} K`, 'answer.eta': 'about half' }
    const first = (await post(s, fields)) as Response
    const second = (await post(s, fields)) as Response
    expect([first.status, second.status]).toEqual([303, 303])
    const rows = await storedSubmissions(s.assignment.id)
    expect(rows).toHaveLength(1)
    expect(rows[0]!.formToken).toBe(formToken)
    expect(second.headers.get('Location')).toBe(first.headers.get('Location'))
    const parts = await db().select().from(partResults).where(eq(partResults.itemId, s.item.id))
    expect(parts.map((p) => [p.findName, p.attempt])).toEqual([['T2', 1]])

    // With JavaScript the repeat answers with the first press's receipt and refusals too.
    const inPlace = asData(await post(s, { ...fields, inPlace: '1' }))
    expect(inPlace.status).toBe(200)
    expect(inPlace.data.receipt?.submissionId).toBe(rows[0]!.id)
    expect(inPlace.data.receipt?.parts).toMatchObject([{ findName: 'T2', attempt: 1 }])
    expect(inPlace.data.fieldErrors.eta).toMatch(/did not use an attempt/)
    expect(inPlace.data.values.eta).toBe('about half')
    expect(await storedSubmissions(s.assignment.id)).toHaveLength(1)

    // A new rendering's token is a new press: attempt 2.
    await post(s, { formToken: await tokenFor(s), 'answer.T2': '1 K' })
    const after = await db().select().from(partResults).where(eq(partResults.itemId, s.item.id))
    expect(after.map((p) => p.attempt).sort()).toEqual([1, 2])
  })

  test('ten posts of the same form at once store one submission', async () => {
    const s = await setUp()
    const formToken = await tokenFor(s)
    const fields = { formToken, 'answer.T2': `${s.key.T2!.value} K`, 'answer.wNet': `${s.key.wNet!.value} kJ/kg` }
    const responses = (await Promise.all(Array.from({ length: 10 }, () => post(s, fields)))) as Response[]
    expect(responses.map((r) => r.status)).toEqual(Array(10).fill(303))
    const rows = await storedSubmissions(s.assignment.id)
    expect(rows).toHaveLength(1)
    expect(new Set(responses.map((r) => r.headers.get('Location')))).toEqual(
      new Set([`${s.path}?receipt=${rows[0]!.id}`]),
    )
    const parts = await db().select().from(partResults).where(eq(partResults.itemId, s.item.id))
    expect(parts.map((p) => [p.findName, p.attempt]).sort()).toEqual([
      ['T2', 1],
      ['wNet', 1],
    ])
  })

  test('a repeat after the due date still lands on the stored receipt instead of a refusal', async () => {
    const s = await setUp()
    const formToken = await tokenFor(s)
    const first = (await post(s, { formToken, 'answer.T2': `${s.key.T2!.value} K` })) as Response
    await db()
      .update(assignments)
      .set({ dueAt: new Date(Date.now() - 1000) })
      .where(eq(assignments.id, s.assignment.id))
    const again = (await post(s, { formToken, 'answer.T2': `${s.key.T2!.value} K` })) as Response
    expect(again.status).toBe(303)
    expect(again.headers.get('Location')).toBe(first.headers.get('Location'))
    expect(await storedSubmissions(s.assignment.id)).toHaveLength(1)
  })

  test('a token already used on another problem is refused with a message and the text kept; nothing is stored', async () => {
    const made = await createCourseWithAssignment(db(), [ottoV1, ottoV1], { students: 1 })
    const cookie = await sessionCookie(made.students[0]!)
    const params = (position: number) => ({
      courseId: String(made.course.id),
      assignmentId: String(made.assignment.id),
      position: String(position),
    })
    const path = (position: number) =>
      `/courses/${made.course.id}/assignments/${made.assignment.id}/problems/${position}`
    const page = await loader(args(getRequest(path(1), { Cookie: cookie }), params(1)))
    const formToken = page.formToken!
    const one = (await action(
      args(formRequest(path(1), { formToken, 'answer.T2': '500 K' }, { Cookie: cookie }), params(1)),
    )) as Response
    expect(one.status).toBe(303)
    const two = asData(
      await action(args(formRequest(path(2), { formToken, 'answer.T2': '600 K' }, { Cookie: cookie }), params(2))),
    )
    expect(two.status).toBe(400)
    expect(two.data.formError).toMatch(/Reload this page/)
    expect(two.data.values.T2).toBe('600 K')
    expect(await storedSubmissions(made.assignment.id)).toHaveLength(1)

    // Both at once: each problem has its own lock, so the unique index decides. Problem 2's
    // press is held uncommitted while problem 1's is sent; problem 1's insert waits on it and,
    // once it commits, is told instead of failing.
    const fresh = (await loader(args(getRequest(path(1), { Cookie: cookie }), params(1)))).formToken!
    const client = await (db() as unknown as { $client: pg.Pool }).$client.connect()
    try {
      await client.query('begin')
      await client.query(
        `insert into submissions (assignment_id, item_id, user_id, answers, form_token) values ($1, $2, $3, '{}'::jsonb, $4)`,
        [made.assignment.id, made.items[1]!.id, made.students[0]!.id, fresh],
      )
      const pending = action(
        args(formRequest(path(1), { formToken: fresh, 'answer.T2': '401 K' }, { Cookie: cookie }), params(1)),
      )
      // Until problem 1's insert is waiting on the uncommitted row.
      for (let i = 0; i < 100; i++) {
        const waiting = await db().execute(
          sql`select 1 from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock' and query like '%insert into "submissions"%'`,
        )
        if (waiting.rows.length > 0) break
        if (i === 99) throw new Error('the second press never waited on the first')
        await new Promise((r) => setTimeout(r, 50))
      }
      await client.query('commit')
      const told = asData(await pending)
      expect(told.status).toBe(400)
      expect(told.data.formError).toMatch(/Reload this page/)
      expect(told.data.values).toEqual({ T2: '401 K', wNet: '', eta: '' })
    } finally {
      client.release()
    }
    expect(
      (await storedSubmissions(made.assignment.id)).filter((r) => r.formToken === fresh).map((r) => r.itemId),
    ).toEqual([made.items[1]!.id])
  })

  test('a form without a token (a page from before tokens) or with a malformed one is stored as a fresh press', async () => {
    const s = await setUp()
    const plain = (await post(s, { 'answer.T2': '500 K' })) as Response
    const junk = (await post(s, { formToken: 'x', 'answer.T2': '501 K' })) as Response
    expect([plain.status, junk.status]).toEqual([303, 303])
    const rows = await storedSubmissions(s.assignment.id)
    expect(rows.map((r) => r.formToken)).toEqual([null, null])
    const parts = await db().select().from(partResults).where(eq(partResults.itemId, s.item.id))
    expect(parts.map((p) => p.attempt).sort()).toEqual([1, 2])
  })
})

describe('GET /api/assignments/:a/problems/:p/mine', () => {
  test('answers the student with their results: pending while queued, verdicts once graded', async () => {
    const s = await setUp()
    const wrongSign = `${-s.key.wNet!.value} kJ/kg`
    const res = (await post(s, { 'answer.T2': `${s.key.T2!.value} K`, 'answer.wNet': wrongSign })) as Response
    const id = Number(new URL(res.headers.get('Location')!, 'http://x').searchParams.get('receipt'))

    const before = await mine(s, s.cookie)
    expect(before.status).toBe(200)
    expect(before.cache).toBe('no-store')
    expect(before.body.pending).toBe(true)
    expect(before.body.finds.find((f) => f.name === 'T2')).toMatchObject({
      state: 'grading',
      last: { verdict: null, attempt: 1 },
    })
    expect(before.body.receipts[0]).toMatchObject({ submissionId: id, status: 'queued' })

    expect(await gradeSubmission(db(), id)).toBe('graded')
    const after = await mine(s, s.cookie)
    expect(after.body.pending).toBe(false)
    const byName = Object.fromEntries(after.body.finds.map((f) => [f.name, f]))
    expect(byName.T2).toMatchObject({ state: 'correct', last: { verdict: 'correct' } })
    expect(byName.wNet).toMatchObject({
      state: 'try-again',
      attemptsUsed: 1,
      last: { verdict: 'incorrect', answer: wrongSign },
    })
    expect(byName.wNet!.last!.pitfallFeedback).toMatch(/sign/)
    expect(after.body.receipts[0]).toMatchObject({ submissionId: id, status: 'graded' })
    expect(after.body.score).toBeGreaterThan(0)
  })

  test('the other student of the same course sees only their own (empty) results', async () => {
    const s = await setUp()
    await post(s, { 'answer.T2': `${s.key.T2!.value} K` })
    const other = await mine(s, await sessionCookie(s.students[1]!))
    expect(other.status).toBe(200)
    expect(other.body.receipts).toEqual([])
    expect(other.body.pending).toBe(false)
    const [row] = await db()
      .select({ n: submissions.id })
      .from(submissions)
      .where(and(eq(submissions.assignmentId, s.assignment.id), eq(submissions.userId, s.student.id)))
    expect(row).toBeDefined()
  })

  test('a student of another course gets 404, staff with no student role 403, the signed-out 401', async () => {
    const s = await setUp()
    const other = await createCourse(db())
    const outsider = await createUser(db(), { password: null })
    await addMember(db(), outsider.id, other.id, 'student')
    const outsiderRes = await mine(s, await sessionCookie(outsider))
    expect(outsiderRes.status).toBe(404)
    expect(outsiderRes.body.error).toBeTruthy()
    expect(outsiderRes.body.finds).toBeUndefined()

    const staff = await mine(s, await sessionCookie(s.instructor))
    expect(staff.status).toBe(403)

    const signedOut = await mine(s, null)
    expect(signedOut.status).toBe(401)
    expect(signedOut.cache).toBe('no-store')

    const junk = await mine(s, s.cookie, { assignmentId: 'abc', position: '1' })
    expect(junk.status).toBe(404)
  })
})
