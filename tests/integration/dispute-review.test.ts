/**
 * The staff side of disputes through its pages: the review queue's loader (filters, oldest
 * first, who may see what), the dispute page's resolve action, and the audit log page, all
 * with real Requests and session cookies. Graded answers and disputes are written straight
 * into the tables with known dates, so the order and the age filter have fixed answers.
 *
 * The course: the Otto problem (version 1) worth 7 points (shares T2 2, wNet 3, eta 2) in
 * assignment A, and again in assignment B. Disputes, by age:
 * - dB: S1 on eta in B, 10 days old, open
 * - d1: S1 on T2 in A, 5 days old, open (with a file)
 * - d2: S2 on wNet in A, 2 days old, open
 * - d4: S3 on T2 in A, 1 day old, rejected
 */
import { and, eq } from 'drizzle-orm'
import { beforeAll, describe, expect, test } from 'vitest'
import { loader as auditLoader } from '#app/routes/courses/audit.tsx'
import { action as disputeAction, loader as disputeLoader } from '#app/routes/courses/disputes/$disputeId.tsx'
import { loader as queueLoader } from '#app/routes/courses/disputes/index.tsx'
import { db } from '#app/server/db/client.server.ts'
import {
  assignmentItems,
  attachments,
  auditEvents,
  disputes,
  partResults,
  submissions,
} from '#app/server/db/schema.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import {
  addMember,
  createAssignment,
  createCourse,
  createCourseWithAssignment,
  createUser,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { sessionCookie } from '#tests/support/login.ts'

function status(thrown: unknown): number | undefined {
  if (thrown instanceof Response) return thrown.status
  return (thrown as { init?: { status?: number } }).init?.status
}

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.earlierVersions![0]!
const DAY = 86_400_000

type World = Awaited<ReturnType<typeof build>>
let world: World

async function build() {
  const made = await createCourseWithAssignment(db(), [otto], { students: 3 })
  const { course, instructor, assignment, students } = made
  const [s1, s2, s3] = students as [(typeof students)[0], (typeof students)[0], (typeof students)[0]]
  const item = made.items[0]!
  await db().update(assignmentItems).set({ points: 7 }).where(eq(assignmentItems.id, item.id))
  const second = await createAssignment(
    db(),
    course.id,
    instructor.id,
    [{ problemId: item.problemId, versionId: item.problemVersionId, points: 7 }],
    { title: 'Assignment B' },
  )
  const itemB = second.items[0]!
  const ta = await createUser(db(), { name: 'Course TA', password: null })
  await addMember(db(), ta.id, course.id, 'ta')
  const otherCourse = await createCourse(db())
  const otherTa = await createUser(db(), { name: 'Other TA', password: null })
  await addMember(db(), otherTa.id, otherCourse.id, 'ta')

  const maxOf = { T2: 2, wNet: 3, eta: 2 } as const
  async function graded(
    userId: number,
    it: { id: number; assignmentId: number },
    findName: keyof typeof maxOf,
    text: string,
    value: number,
    score = 0,
  ) {
    const [sub] = await db()
      .insert(submissions)
      .values({ assignmentId: it.assignmentId, itemId: it.id, userId, answers: { [findName]: text }, status: 'graded' })
      .returning({ id: submissions.id })
    const [part] = await db()
      .insert(partResults)
      .values({
        submissionId: sub!.id,
        assignmentId: it.assignmentId,
        itemId: it.id,
        userId,
        findName,
        answer: text,
        attempt: 1,
        verdict: score > 0 ? 'correct' : 'incorrect',
        value,
        score,
        maxScore: maxOf[findName],
        message: score > 0 ? 'Correct.' : 'Not within tolerance.',
      })
      .returning({ id: partResults.id })
    return part!.id
  }
  async function dispute(
    userId: number,
    it: { id: number; assignmentId: number },
    findName: string,
    partResultId: number,
    daysOld: number,
    extra: Partial<typeof disputes.$inferInsert> = {},
  ) {
    const [row] = await db()
      .insert(disputes)
      .values({
        courseId: course.id,
        assignmentId: it.assignmentId,
        itemId: it.id,
        userId,
        findName,
        partResultId,
        reason: `My ${findName} is right; see my working (${daysOld} days).`,
        createdAt: new Date(Date.now() - daysOld * DAY),
        ...extra,
      })
      .returning({ id: disputes.id })
    return row!.id
  }

  const p1 = await graded(s1.id, item, 'T2', '312 K', 312)
  const p2 = await graded(s2.id, item, 'wNet', '-412 kJ/kg', -412)
  const p3 = await graded(s3.id, item, 'T2', '300 K', 300)
  const pB = await graded(s1.id, itemB, 'eta', '0.4', 0.4)
  const [file] = await db()
    .insert(attachments)
    .values({
      userId: s1.id,
      courseId: course.id,
      fileName: 'working.png',
      contentType: 'image/png',
      size: 4,
      sha256: 'x',
      data: Buffer.from([0x89, 0x50, 0x4e, 0x47]),
    })
    .returning({ id: attachments.id })
  const d1 = await dispute(s1.id, item, 'T2', p1, 5, { attachmentId: file!.id })
  const d2 = await dispute(s2.id, item, 'wNet', p2, 2)
  const d4 = await dispute(s3.id, item, 'T2', p3, 1, {
    status: 'rejected',
    resolvedBy: instructor.id,
    resolvedAt: new Date(),
    scoreBefore: 0,
    scoreAfter: 0,
    comment: 'The key stands.',
  })
  const dB = await dispute(s1.id, itemB, 'eta', pB, 10)

  return {
    course,
    assignment,
    assignmentB: second.assignment,
    s1,
    s2,
    parts: { p1, p2 },
    ids: { d1, d2, d4, dB },
    cookies: {
      instructor: await sessionCookie(instructor),
      ta: await sessionCookie(ta),
      otherTa: await sessionCookie(otherTa),
      s1: await sessionCookie(s1),
      s2: await sessionCookie(s2),
    },
  }
}

beforeAll(async () => {
  world = await build()
})

type QueueData = Awaited<ReturnType<typeof queueLoader>>

async function queue(query: string, cookie: string) {
  const path = `/courses/${world.course.id}/disputes${query}`
  return settle(
    queueLoader(
      args(getRequest(path, { Cookie: cookie }), { courseId: String(world.course.id) }),
    ) as Promise<QueueData>,
  )
}

async function queueIds(query: string, cookie = world.cookies.ta): Promise<number[]> {
  const out = await queue(query, cookie)
  if (!('value' in out)) throw new Error(`the queue refused (${status(out.thrown)})`)
  return out.value.rows.map((r) => r.id)
}

describe('the review queue', () => {
  test('lists the open disputes of the course oldest first by default, with their age in words', async () => {
    const { dB, d1, d2 } = world.ids
    expect(await queueIds('')).toEqual([dB, d1, d2])
    const out = await queue('', world.cookies.instructor)
    if (!('value' in out)) throw new Error('refused')
    expect(out.value.staff).toBe(true)
    expect(out.value.rows[0]!.age).toBe('10 days')
    expect(out.value.rows.find((r) => r.id === d1)!.hasAttachment).toBe(true)
    expect(out.value.rows.find((r) => r.id === d2)!.hasAttachment).toBe(false)
    // The assignment select offers both assignments.
    expect(out.value.assignments.map((a) => a.id).sort()).toEqual([world.assignment.id, world.assignmentB.id].sort())
  })

  test.each([
    ['?assignment=A', ['d1', 'd2']],
    ['?assignment=B', ['dB']],
    ['?age=3', ['dB', 'd1']],
    ['?age=6', ['dB']],
    ['?status=rejected', ['d4']],
    ['?status=all', ['dB', 'd1', 'd2', 'd4']],
    ['?status=all&assignment=A&age=2', ['d1', 'd2']],
    ['?status=nonsense&age=-4&assignment=x', ['dB', 'd1', 'd2']],
  ])('the filter %s lists %j', async (query, expected) => {
    const q = query
      .replace('assignment=A', `assignment=${world.assignment.id}`)
      .replace('assignment=B', `assignment=${world.assignmentB.id}`)
    const names = new Map(Object.entries(world.ids).map(([k, v]) => [v, k]))
    expect((await queueIds(q)).map((id) => names.get(id))).toEqual(expected)
  })

  test('a TA of another course gets 403, and no rows', async () => {
    const out = await queue('', world.cookies.otherTa)
    expect('thrown' in out && status(out.thrown)).toBe(403)
  })

  test('a student sees only their own disputes, of every status, as "Your disputes"', async () => {
    const out = await queue('?status=open&assignment=999', world.cookies.s1)
    if (!('value' in out)) throw new Error('refused')
    expect(out.value.staff).toBe(false)
    expect(out.value.assignments).toEqual([])
    expect(out.value.rows.map((r) => r.id)).toEqual([world.ids.dB, world.ids.d1])
    expect(out.value.rows.every((r) => r.student.id === world.s1.id)).toBe(true)
  })
})

describe('the dispute page', () => {
  const params = (id: number) => ({ courseId: String(world.course.id), disputeId: String(id) })
  const path = (id: number) => `/courses/${world.course.id}/disputes/${id}`

  test('a student opening another student’s dispute gets 404; their own shows without the key', async () => {
    const other = await settle(
      disputeLoader(args(getRequest(path(world.ids.d2), { Cookie: world.cookies.s1 }), params(world.ids.d2))),
    )
    expect('thrown' in other && status(other.thrown)).toBe(404)
    const own = await settle(
      disputeLoader(args(getRequest(path(world.ids.d1), { Cookie: world.cookies.s1 }), params(world.ids.d1))),
    )
    if (!('value' in own)) throw new Error('refused')
    expect(own.value.staff).toBeNull()
    expect(own.value.mine?.answer.text).toBe('312 K')
    expect(JSON.stringify(own.value)).not.toContain('workedHtml')
  })

  test('staff see the answer, the key and the file', async () => {
    const out = await settle(
      disputeLoader(args(getRequest(path(world.ids.d1), { Cookie: world.cookies.ta }), params(world.ids.d1))),
    )
    if (!('value' in out)) throw new Error('refused')
    const staff = out.value.staff!
    expect(staff.answer.text).toBe('312 K')
    expect(staff.key.map((k) => k.name)).toContain('T2')
    expect(staff.attachment?.contentType).toBe('image/png')
    expect(out.value.find.share).toBe(2)
  })

  test('adjusting without a comment is refused beside the field, values kept, nothing changed', async () => {
    const id = world.ids.d1
    const result = (await disputeAction(
      args(
        formRequest(
          path(id),
          { intent: 'resolve', decision: 'adjust', newScore: '1.5', comment: '  ' },
          { Cookie: world.cookies.ta },
        ),
        params(id),
      ),
    )) as unknown as {
      data: { fieldErrors: Record<string, string>; values: Record<string, string> }
      init: { status: number }
    }
    expect(result.init.status).toBe(400)
    expect(result.data.fieldErrors.comment).toMatch(/comment is required/)
    expect(result.data.values.newScore).toBe('1.5')
    expect(result.data.values.decision).toBe('adjust')
    const [d] = await db().select().from(disputes).where(eq(disputes.id, id))
    expect(d!.status).toBe('open')
    const [p] = await db()
      .select({ score: partResults.score })
      .from(partResults)
      .where(eq(partResults.id, world.parts.p1))
    expect(p!.score).toBe(0)
  })

  test('a score above the find’s share is refused beside the score', async () => {
    const id = world.ids.d1
    const result = (await disputeAction(
      args(
        formRequest(
          path(id),
          { intent: 'resolve', decision: 'adjust', newScore: '5', comment: 'Too generous' },
          { Cookie: world.cookies.ta },
        ),
        params(id),
      ),
    )) as unknown as {
      data: { fieldErrors: Record<string, string> }
      init: { status: number }
    }
    expect(result.init.status).toBe(400)
    expect(result.data.fieldErrors.newScore).toMatch(/between 0 and 2/)
    const [d] = await db().select().from(disputes).where(eq(disputes.id, id))
    expect(d!.status).toBe('open')
  })

  test('a student cannot resolve, not even their own dispute', async () => {
    const id = world.ids.d1
    const out = await settle(
      disputeAction(
        args(
          formRequest(
            path(id),
            { intent: 'resolve', decision: 'adjust', newScore: '2', comment: 'Mine' },
            { Cookie: world.cookies.s1 },
          ),
          params(id),
        ),
      ),
    )
    expect('thrown' in out && status(out.thrown)).toBe(403)
    const [d] = await db().select().from(disputes).where(eq(disputes.id, id))
    expect(d!.status).toBe('open')
  })

  test('adjusting with a comment changes the score, writes the audit row and redirects to the page with a notice', async () => {
    const id = world.ids.d1
    const res = (await disputeAction(
      args(
        formRequest(
          path(id),
          { intent: 'resolve', decision: 'adjust', newScore: '1.5', comment: 'Right method, one slip in the ratio.' },
          { Cookie: world.cookies.ta },
        ),
        params(id),
      ),
    )) as Response
    expect(res.status).toBe(302)
    expect(res.headers.get('Location')).toBe(`${path(id)}?resolved=1`)
    const [p] = await db()
      .select({ score: partResults.score })
      .from(partResults)
      .where(eq(partResults.id, world.parts.p1))
    expect(p!.score).toBe(1.5)
    const [d] = await db().select().from(disputes).where(eq(disputes.id, id))
    expect(d!.status).toBe('adjusted')
    expect(d!.comment).toBe('Right method, one slip in the ratio.')
    const audit = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.kind, 'dispute'), eq(auditEvents.partResultId, world.parts.p1)))
    expect(audit).toHaveLength(1)
    expect(audit[0]!.before).toEqual({ verdict: 'incorrect', score: 0 })
    expect(audit[0]!.note).toBe('Right method, one slip in the ratio.')

    // The page after the redirect shows the outcome; the form is gone and the queue is shorter.
    const page = await settle(
      disputeLoader(args(getRequest(`${path(id)}?resolved=1`, { Cookie: world.cookies.ta }), params(id))),
    )
    if (!('value' in page)) throw new Error('refused')
    expect(page.value.changed).toBe(1)
    expect(page.value.dispute.status).toBe('adjusted')
    expect(await queueIds('')).toEqual([world.ids.dB, world.ids.d2])

    // Pressing again is refused with a message, and nothing changes twice.
    const again = (await disputeAction(
      args(
        formRequest(path(id), { intent: 'resolve', decision: 'reject', comment: '' }, { Cookie: world.cookies.ta }),
        params(id),
      ),
    )) as unknown as {
      data: { formError: string }
      init: { status: number }
    }
    expect(again.init.status).toBe(400)
    expect(again.data.formError).toMatch(/already resolved/)
  })
})

describe('the audit log page', () => {
  const path = () => `/courses/${world.course.id}/audit`
  const load = (cookie: string, query = '') =>
    settle(
      auditLoader(args(getRequest(`${path()}${query}`, { Cookie: cookie }), { courseId: String(world.course.id) })),
    )

  test('an instructor reads it, newest first, with the dispute’s change in words', async () => {
    // A rejection changes no answer, yet the decision itself is logged.
    const res = (await disputeAction(
      args(
        formRequest(
          `/courses/${world.course.id}/disputes/${world.ids.d2}`,
          { intent: 'resolve', decision: 'reject', comment: 'The sign follows the course convention.' },
          { Cookie: world.cookies.ta },
        ),
        {
          courseId: String(world.course.id),
          disputeId: String(world.ids.d2),
        },
      ),
    )) as Response
    expect(res.status).toBe(302)
    expect(res.headers.get('Location')).toMatch(/\?resolved=0$/)
    const out = await load(world.cookies.instructor)
    if (!('value' in out)) throw new Error(`refused (${status(out.thrown)})`)
    expect(out.value.total).toBeGreaterThanOrEqual(1)
    const newest = out.value.rows[0]!
    expect(newest.kind).toBe('dispute-resolved')
    expect(newest.note).toBe('The sign follows the course convention.')
    expect(newest.student).toBe('Student 002')
    const filtered = await load(world.cookies.instructor, '?kind=dispute')
    if (!('value' in filtered)) throw new Error('refused')
    expect(filtered.value.rows.every((r) => r.kind === 'dispute')).toBe(true)
    const adjusted = filtered.value.rows.find((r) => r.note === 'Right method, one slip in the ratio.')
    // Written by the adjusting test above (tests in a file run in order).
    expect(adjusted?.words.change).toBe('incorrect; score 0 → 1.5 of 2')
  })

  test('a TA and a student get 403', async () => {
    for (const cookie of [world.cookies.ta, world.cookies.s1]) {
      const out = await load(cookie)
      expect('thrown' in out && status(out.thrown)).toBe(403)
    }
  })
})
