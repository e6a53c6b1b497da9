/**
 * Bad input from people (and from hand-edited addresses) against every route that passes
 * typed text or a number from the address to PostgreSQL: NUL characters, which PostgreSQL
 * refuses in text and jsonb, and page numbers far beyond any list (10^20, 1e308, -1), which
 * overflow an offset. Called with real Requests as the right signed-in role; each must answer
 * 400 (never 500), name the field, and show back what was typed (without its NUL, and saying so).
 */
import { count, eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { formValuesFromDefinition } from '#app/lib/problem-form.ts'
import { loader as outboxLoader } from '#app/routes/admin/outbox.tsx'
import { action as importAction } from '#app/routes/bank/import.tsx'
import { loader as bankLoader } from '#app/routes/bank/index.tsx'
import { action as newProblemAction } from '#app/routes/bank/new.tsx'
import { loader as answersLoader } from '#app/routes/courses/assignments/answers.tsx'
import {
  action as disputeAction,
  loader as disputePageLoader,
  type DisputeActionData,
} from '#app/routes/courses/assignments/dispute.tsx'
import { action as extensionsAction } from '#app/routes/courses/assignments/extensions.tsx'
import { loader as assignmentGradebookLoader } from '#app/routes/courses/assignments/gradebook.tsx'
import { action as problemAction } from '#app/routes/courses/assignments/problem.tsx'
import { loader as auditLoader } from '#app/routes/courses/audit.tsx'
import { action as resolveAction } from '#app/routes/courses/disputes/$disputeId.tsx'
import { loader as queueLoader } from '#app/routes/courses/disputes/index.tsx'
import { loader as courseGradebookLoader } from '#app/routes/courses/gradebook.tsx'
import { action as forgotAction } from '#app/routes/forgot-password.tsx'
import { loader as apiAssignmentGradebook } from '#app/routes/resources/api-assignment-gradebook.ts'
import { loader as apiCourseGradebook } from '#app/routes/resources/api-course-gradebook.ts'
import { loader as apiFindAnswers } from '#app/routes/resources/api-find-answers.ts'
import { loader as apiProblems } from '#app/routes/resources/api-problems.ts'
import { action as signInAction } from '#app/routes/sign-in.tsx'
import { db } from '#app/server/db/client.server.ts'
import { disputes, extensions, problems } from '#app/server/db/schema.server.ts'
import { raiseDispute } from '#app/server/disputes.server.ts'
import { gradeSubmission } from '#app/server/grading.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import {
  addMember,
  createBankUser,
  createCourseWithAssignment,
  createUser,
  drawnVariant,
} from '#tests/support/factories.ts'
import { args, BASE, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { carnotDrill } from '#tests/support/definitions.ts'
import { sessionCookie } from '#tests/support/login.ts'

const NUL = '\u0000'
const HUGE_PAGES = ['99999999999999999999', '1e308', '-1', '0', '2.5', '100001', `3${NUL}`]

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition

afterAll(async () => {
  await stopBoss()
})

type Outcome = { status: number; body: unknown; thrown: boolean }

/** What a loader or action answered, returned or thrown: a Response, data(), or a plain value (200). */
async function outcome(p: Promise<unknown>): Promise<Outcome> {
  const r = await settle(p)
  const v = 'thrown' in r ? r.thrown : r.value
  const thrown = 'thrown' in r
  if (v instanceof Response) {
    const text = await v.text()
    let body: unknown = text
    try {
      body = JSON.parse(text)
    } catch {
      // not JSON
    }
    return { status: v.status, body, thrown }
  }
  if (v && typeof v === 'object' && (v as { type?: string }).type === 'DataWithResponseInit') {
    const d = v as { data: unknown; init: { status?: number } | null }
    return { status: d.init?.status ?? 200, body: d.data, thrown }
  }
  if (thrown) throw v
  return { status: 200, body: v, thrown }
}

/** A course with an assignment, a graded wrong answer to wNet and an open dispute on it, and its people signed in. */
let world: Awaited<ReturnType<typeof makeWorld>>

async function makeWorld() {
  const made = await createCourseWithAssignment(db(), [ottoV1], { students: 2 })
  const student = made.students[0]!
  const item = made.items[0]!
  const variant = drawnVariant(made, ottoV1, { student, item })
  const key = Object.fromEntries(variant.key.map((k) => [k.name, k]))
  const courseId = made.course.id
  const assignmentId = made.assignment.id
  const problemPath = `/courses/${courseId}/assignments/${assignmentId}/problems/1`
  const problemParams = { courseId: String(courseId), assignmentId: String(assignmentId), position: '1' }
  const studentCookie = await sessionCookie(student)
  // Two graded answers: wNet wrong (disputed below, through the page), T2 wrong (disputed here, for the staff's page).
  const submitted = (await problemAction(
    args(
      formRequest(
        problemPath,
        { 'answer.T2': `${key.T2!.value * 2} K`, 'answer.wNet': `${-key.wNet!.value} kJ/kg` },
        { Cookie: studentCookie },
      ),
      problemParams,
    ),
  )) as Response
  const submissionId = Number(new URL(submitted.headers.get('Location')!, BASE).searchParams.get('receipt'))
  expect(await gradeSubmission(db(), submissionId)).toBe('graded')
  const raised = await raiseDispute(db(), {
    courseId,
    assignmentId,
    position: 1,
    userId: student.id,
    findName: 'T2',
    reason: 'My T2 follows from the compression ratio.',
    upload: null,
  })
  if (!raised.ok) throw new Error(JSON.stringify(raised))
  const [open] = await db().select({ id: disputes.id }).from(disputes).where(eq(disputes.userId, student.id))
  const ta = await createUser(db(), { name: 'Course TA', password: null })
  await addMember(db(), ta.id, courseId, 'ta')
  const admin = await createUser(db(), { name: 'Site Admin', password: null, isAdmin: true })
  const bank = await createBankUser(db())
  return {
    ...made,
    student,
    courseId,
    assignmentId,
    problemPath,
    problemParams,
    disputeId: open!.id,
    cookies: {
      student: studentCookie,
      instructor: await sessionCookie(made.instructor),
      ta: await sessionCookie(ta),
      admin: await sessionCookie(admin),
      bank: await sessionCookie(bank.user),
    },
    bankUserId: bank.user.id,
  }
}

beforeAll(async () => {
  world = await makeWorld()
})

function withPage(path: string, page: string): string {
  return `${path}${path.includes('?') ? '&' : '?'}page=${encodeURIComponent(page)}`
}

describe('page numbers beyond use are refused with 400, the part of the address named', () => {
  test('bank, audit log and outbox pages, and the bank API', async () => {
    const pages: [string, (r: Request) => Promise<unknown>, string, Record<string, string>][] = [
      ['/bank', (r) => bankLoader(args(r)), world.cookies.bank, {}],
      ['/api/problems', (r) => apiProblems(args(r)), world.cookies.bank, {}],
      [
        `/courses/${world.courseId}/audit`,
        (r) => auditLoader(args(r, { courseId: String(world.courseId) })),
        world.cookies.instructor,
        {},
      ],
      ['/admin/outbox', (r) => outboxLoader(args(r)), world.cookies.admin, {}],
    ]
    for (const [path, call, cookie] of pages) {
      // A real page number first, so a 400 below is about the number and not the caller.
      expect((await outcome(call(getRequest(withPage(path, '1'), { Cookie: cookie })))).status, path).toBe(200)
      for (const page of HUGE_PAGES) {
        const out = await outcome(call(getRequest(withPage(path, page), { Cookie: cookie })))
        expect(out.status, `${path}?page=${page}`).toBe(400)
        const message = typeof out.body === 'string' ? out.body : (out.body as { error: string }).error
        expect(message, `${path}?page=${page}`).toMatch(
          /page number in the address \(page=.*\) must be a whole number from 1 to 100,000/,
        )
        expect(message).not.toContain(NUL)
      }
    }
  })

  test('the review queue treats odd filters as no filter, never as an error of the server', async () => {
    for (const query of [
      '?assignment=99999999999999999999',
      '?assignment=1e308&age=1e308',
      '?age=-1',
      '?status=open%00',
      '?assignment=1%00',
      '?age=%00&status=%00',
    ]) {
      const out = await outcome(
        queueLoader(
          args(getRequest(`/courses/${world.courseId}/disputes${query}`, { Cookie: world.cookies.ta }), {
            courseId: String(world.courseId),
          }),
        ),
      )
      expect(out.status, query).toBe(200)
      expect((out.body as { query: unknown }).query, query).toEqual({ assignment: null, status: 'open', age: null })
    }
  })
})

describe('NUL characters in searches and address parameters', () => {
  test('the bank search keeps the words in the box, marked, with a 400 and no list', async () => {
    const out = await outcome(
      bankLoader(
        args(
          getRequest(`/bank?q=${encodeURIComponent(`otto${NUL} cycle`)}&cycle=otto`, { Cookie: world.cookies.bank }),
        ),
      ),
    )
    expect(out.status).toBe(400)
    const body = out.body as { searchError: string; query: { q: string; cycle?: string }; rows: unknown[] }
    expect(body.searchError).toMatch(/^The search had a NUL character .* taken out of the text shown here/)
    expect(body.query.q).toBe('otto cycle')
    expect(body.query.cycle).toBe('otto')
    expect(body.rows).toEqual([])
    // Another control character is named by its code and place, and stays in the box.
    const bell = await outcome(
      bankLoader(args(getRequest(`/bank?q=${encodeURIComponent('ot\u0007to')}`, { Cookie: world.cookies.bank }))),
    )
    expect(bell.status).toBe(400)
    expect((bell.body as { searchError: string }).searchError).toMatch(/U\+0007, at character 3/)
    // Tabs and line breaks are ordinary.
    expect(
      (
        await outcome(
          bankLoader(args(getRequest(`/bank?q=${encodeURIComponent('otto\tcycle')}`, { Cookie: world.cookies.bank }))),
        )
      ).status,
    ).toBe(200)

    const api = await outcome(
      apiProblems(args(getRequest(`/api/problems?q=${encodeURIComponent(`a${NUL}`)}`, { Cookie: world.cookies.bank }))),
    )
    expect(api.status).toBe(400)
    expect((api.body as { error: string }).error).toMatch(
      /^The search in the address \(q\) has a NUL character .* Remove it/,
    )
  })

  test('gradebook searches, the answers page and their APIs answer 400 naming the part of the address', async () => {
    const c = String(world.courseId)
    const a = String(world.assignmentId)
    const cases: [string, (r: Request) => Promise<unknown>, RegExp][] = [
      [
        `/courses/${c}/gradebook?q=${encodeURIComponent(`Stu${NUL}`)}`,
        (r) => courseGradebookLoader(args(r, { courseId: c })),
        /search in the address \(q\)/,
      ],
      [
        `/courses/${c}/assignments/${a}/gradebook?section=${encodeURIComponent(`A${NUL}`)}`,
        (r) => assignmentGradebookLoader(args(r, { courseId: c, assignmentId: a })),
        /section in the address \(section\)/,
      ],
      [
        `/api/courses/${c}/gradebook?q=${encodeURIComponent(NUL)}`,
        (r) => apiCourseGradebook(args(r, { courseId: c })),
        /search in the address \(q\)/,
      ],
      [
        `/api/assignments/${a}/gradebook?q=${encodeURIComponent(NUL)}`,
        (r) => apiAssignmentGradebook(args(r, { assignmentId: a })),
        /search in the address \(q\)/,
      ],
      [
        `/courses/${c}/assignments/${a}/problems/1/answers?find=${encodeURIComponent(`wNet${NUL}`)}`,
        (r) => answersLoader(args(r, { ...world.problemParams })),
        /question in the address \(find\)/,
      ],
      [
        `/api/assignments/${a}/problems/1/answers?find=${encodeURIComponent(`wNet${NUL}`)}`,
        (r) => apiFindAnswers(args(r, { assignmentId: a, position: '1' })),
        /question in the address \(find\)/,
      ],
    ]
    for (const [path, call, named] of cases) {
      const out = await outcome(call(getRequest(path, { Cookie: world.cookies.ta })))
      expect(out.status, path).toBe(400)
      const message = typeof out.body === 'string' ? out.body : (out.body as { error: string }).error
      expect(message, path).toMatch(named)
      expect(message, path).toMatch(/NUL character/)
      // The same page without the NUL is fine.
      expect(
        (await outcome(call(getRequest(path.replace('%00', ''), { Cookie: world.cookies.ta })))).status,
        path,
      ).toBe(200)
    }
  })

  test('the student’s dispute page refuses a NUL in the question named in the address', async () => {
    const path = `${world.problemPath}/dispute?find=${encodeURIComponent(`wNet${NUL}`)}`
    const out = await outcome(
      disputePageLoader(args(getRequest(path, { Cookie: world.cookies.student }), world.problemParams)),
    )
    expect(out.status).toBe(400)
    expect(out.body).toMatch(/question in the address \(find\) has a NUL character/)
  })
})

describe('NUL characters in forms', () => {
  test('an extension’s reason: 400 beside the field, every typed value back (the NUL taken out), nothing saved', async () => {
    const c = String(world.courseId)
    const a = String(world.assignmentId)
    const path = `/courses/${c}/assignments/${a}/extensions`
    const typed = {
      intent: 'save',
      userId: String(world.student.id),
      dueAt: '',
      extraAttempts: '2',
      reason: `Ill${NUL} in week 9`,
    }
    const out = await outcome(
      extensionsAction(
        args(formRequest(path, typed, { Cookie: world.cookies.instructor }), { courseId: c, assignmentId: a }),
      ),
    )
    expect(out.status).toBe(400)
    const body = out.body as { fieldErrors: Record<string, string>; values: Record<string, string> }
    expect(body.fieldErrors.reason).toMatch(/^The reason had a NUL character/)
    expect(body.values).toEqual({
      intent: 'save',
      userId: String(world.student.id),
      dueAt: '',
      extraAttempts: '2',
      reason: 'Ill in week 9',
    })
    const [n] = await db().select({ n: count() }).from(extensions).where(eq(extensions.userId, world.student.id))
    expect(n!.n).toBe(0)
    // Without the NUL the same form saves.
    const ok = await outcome(
      extensionsAction(
        args(formRequest(path, { ...typed, reason: 'Ill in week 9' }, { Cookie: world.cookies.instructor }), {
          courseId: c,
          assignmentId: a,
        }),
      ),
    )
    expect(ok.status).toBe(302)
  })

  test('a dispute’s reason: 400 beside the field, the reason back without its NUL, nothing written', async () => {
    const form = new FormData()
    form.set('find', 'wNet')
    form.set('reason', `The sign${NUL} follows our lecture notes.`)
    form.set('file', new File([], '', { type: 'application/octet-stream' }))
    const encoded = new Response(form)
    const bytes = await encoded.arrayBuffer()
    const request = new Request(`${BASE}${world.problemPath}/dispute?find=wNet`, {
      method: 'POST',
      body: bytes,
      headers: {
        'Content-Type': encoded.headers.get('Content-Type')!,
        'Content-Length': String(bytes.byteLength),
        Cookie: world.cookies.student,
      },
    })
    const out = await outcome(disputeAction(args(request, world.problemParams)))
    expect(out.status).toBe(400)
    const body = out.body as DisputeActionData
    expect(body.fieldErrors.reason).toMatch(/^The reason had a NUL character .* taken out of the text shown here/)
    expect(body.reason).toBe('The sign follows our lecture notes.')
    const rows = await db()
      .select({ find: disputes.findName })
      .from(disputes)
      .where(eq(disputes.userId, world.student.id))
    expect(rows.map((r) => r.find)).toEqual(['T2'])
  })

  test('a dispute’s resolution comment and new score: 400 beside the field, typed values back, the dispute still open', async () => {
    const c = String(world.courseId)
    const params = { courseId: c, disputeId: String(world.disputeId) }
    const path = `/courses/${c}/disputes/${world.disputeId}`
    for (const [fields, field] of [
      [{ intent: 'resolve', decision: 'adjust', newScore: '1', comment: `Half${NUL} marks` }, 'comment'],
      [{ intent: 'resolve', decision: 'reject', comment: `Keep${NUL}` }, 'comment'],
      [{ intent: 'resolve', decision: 'adjust', newScore: `1${NUL}`, comment: 'Half marks' }, 'newScore'],
    ] as const) {
      const out = await outcome(resolveAction(args(formRequest(path, fields, { Cookie: world.cookies.ta }), params)))
      expect(out.status, JSON.stringify(fields)).toBe(400)
      const body = out.body as { fieldErrors: Record<string, string>; values: Record<string, string> }
      expect(body.fieldErrors[field]).toMatch(/had a NUL character/)
      expect(body.values).toEqual(Object.fromEntries(Object.entries(fields).map(([k, v]) => [k, v.replace(NUL, '')])))
    }
    const [row] = await db().select({ status: disputes.status }).from(disputes).where(eq(disputes.id, world.disputeId))
    expect(row!.status).toBe('open')
  })

  test('the comment limit is one number in the form and on the server', async () => {
    const c = String(world.courseId)
    const params = { courseId: c, disputeId: String(world.disputeId) }
    const path = `/courses/${c}/disputes/${world.disputeId}`
    const { DISPUTE_COMMENT_MAX } = await import('#app/lib/dispute-limits.ts')
    const { COMMENT_MAX } = await import('#app/server/disputes.server.ts')
    expect(COMMENT_MAX).toBe(DISPUTE_COMMENT_MAX)
    const long = await outcome(
      resolveAction(
        args(
          formRequest(
            path,
            { intent: 'resolve', decision: 'reject', comment: 'x'.repeat(DISPUTE_COMMENT_MAX + 1) },
            { Cookie: world.cookies.ta },
          ),
          params,
        ),
      ),
    )
    expect(long.status).toBe(400)
    expect((long.body as { fieldErrors: Record<string, string> }).fieldErrors.comment).toMatch(
      /at most 2,000 characters/,
    )
  })

  test('sign-in and forgot-password: a NUL in the e-mail gets a 400 and the address back without it', async () => {
    const signIn = await outcome(
      signInAction(
        args(formRequest('/sign-in', { email: `someone${NUL}@example.org`, password: 'a long enough password' })),
      ),
    )
    expect(signIn.status).toBe(400)
    expect((signIn.body as { email: string }).email).toBe('someone@example.org')
    const forgot = await outcome(
      forgotAction(args(formRequest('/forgot-password', { email: `someone${NUL}@example.org` }))),
    )
    expect(forgot.status).toBe(400)
    const body = forgot.body as { fieldErrors: Record<string, string>; values: Record<string, string> }
    expect(body.fieldErrors.email).toMatch(/NUL character/)
    expect(body.values.email).toBe('someone@example.org')
  })
})

describe('NUL characters in problems', () => {
  const carnot = carnotDrill

  async function problemCount() {
    const [n] = await db().select({ n: count() }).from(problems).where(eq(problems.ownerId, world.bankUserId))
    return n!.n
  }

  test('the editor: 400 with the issue beside the field, the text back without its NUL, nothing saved', async () => {
    const before = await problemCount()
    for (const field of ['title', 'prompt', 'finds.0.label', 'givens.0.unit']) {
      const values: Record<string, string> = {
        ...formValuesFromDefinition(carnot()),
        visibility: 'private',
        intent: 'save',
      }
      values[field] = `${values[field]}${NUL}!`
      const request = new Request(`${BASE}/bank/new`, {
        method: 'POST',
        body: new URLSearchParams(values),
        headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: world.cookies.bank },
      })
      const out = await outcome(newProblemAction(args(request)))
      expect(out.status, field).toBe(400)
      const body = out.body as {
        issues: { path: string; message: string }[]
        state: { values: Record<string, string> }
      }
      expect(body.issues, field).toEqual([
        expect.objectContaining({ path: field, message: expect.stringMatching(/had a NUL character/) }),
      ])
      expect(body.state.values[field]).toBe(values[field]!.replace(NUL, ''))
    }
    expect(await problemCount()).toBe(before)
  })

  test('a bank document with a NUL in a string is refused naming the problem and the field, nothing imported', async () => {
    const before = await problemCount()
    const definition = carnot(`Carnot${NUL} drill`)
    const doc = {
      format: 'cyclewright-bank',
      version: 1,
      exportedAt: '2026-12-02T10:00:00Z',
      problems: [
        { title: 'Carnot drill', definition },
        {
          title: 'B',
          definition: {
            ...carnot('Other'),
            physics: { kind: 'cycle', cycle: { gas: `air${NUL}`, states: [], steps: [] } },
          },
        },
      ],
    }
    const form = new FormData()
    form.set('document', new File([JSON.stringify(doc)], 'bank.json', { type: 'application/json' }))
    const encoded = new Response(form)
    const bytes = await encoded.arrayBuffer()
    const request = new Request(`${BASE}/bank/import`, {
      method: 'POST',
      body: bytes,
      headers: {
        'Content-Type': encoded.headers.get('Content-Type')!,
        'Content-Length': String(bytes.byteLength),
        Cookie: world.cookies.bank,
      },
    })
    const out = await outcome(importAction(args(request)))
    expect(out.status).toBe(400)
    const body = out.body as { formError: string; errors: { problem: string; field: string; message: string }[] }
    expect(body.formError).toMatch(/Nothing was imported: 2 problems/)
    expect(body.errors).toEqual([
      {
        problem: 'Problem 1 (Carnot drill)',
        field: 'definition.title',
        message: expect.stringMatching(/NUL character .* Remove it/),
      },
      {
        problem: 'Problem 2 (Other)',
        field: 'definition.physics.cycle.gas',
        message: expect.stringMatching(/NUL character/),
      },
    ])
    expect(await problemCount()).toBe(before)
  })
})
