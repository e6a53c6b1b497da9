import { and, eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { action as joinAction, loader as joinLoader } from '#app/routes/join.tsx'
import { action as peopleAction } from '#app/routes/courses/people.tsx'
import { action as forgotAction } from '#app/routes/forgot-password.tsx'
import { action as resetAction, loader as resetLoader } from '#app/routes/reset-password.tsx'
import { loader as outboxLoader } from '#app/routes/admin/outbox.tsx'
import { startSession } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { resetEnv } from '#app/server/env.server.ts'
import { accessTokens, memberships, sessions, users } from '#app/server/db/schema.server.ts'
import { findLastMailTo, linksIn } from '#app/server/outbox.server.ts'
import { verifyPassword } from '#app/server/passwords.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import { addMember, createCourse, createUser } from '#tests/support/factories.ts'
import { args, cookieFrom, formRequest, getRequest, settle } from '#tests/support/requests.ts'

// Mail goes through the queue: a real worker sends it to this file's fake SMTP server.
let worker: RunningWorker
beforeAll(async () => {
  worker = await startWorker({ log: () => {} })
})
afterAll(async () => {
  await worker.stop()
  await stopBoss()
})

async function mailTo(address: string) {
  const until = Date.now() + 15_000
  for (;;) {
    const mail = await findLastMailTo(db(), address)
    if (mail || Date.now() > until) return mail
    await new Promise((r) => setTimeout(r, 100))
  }
}

/** Send-mail jobs to the address, whether sent yet or not (pg-boss archives old ones). */
async function queuedMailsTo(address: string) {
  const r = await db().execute(sql`
    select count(*)::int as n from (
      select id from pgboss.job where name = 'send-mail' and data->>'to' = ${address}
      union all
      select id from pgboss.archive where name = 'send-mail' and data->>'to' = ${address}
    ) mails`)
  return (r.rows[0] as { n: number }).n
}

async function cookieOf(userId: number) {
  return cookieFrom(await startSession(userId, '/'))
}

function tokenFromMail(text: string, prefix: string) {
  const link = linksIn(text).find((l) => l.includes(prefix))
  expect(link, `a ${prefix} link in the message`).toBeTruthy()
  return new URL(link!).pathname.split('/').pop()!
}

describe('invitations', () => {
  test('an instructor invites a student: the mail arrives over SMTP, the link makes the account and the membership once', async () => {
    const course = await createCourse(db(), { code: 'TH 101' })
    const instructor = await createUser(db(), { name: 'Ada Instructor' })
    await addMember(db(), instructor.id, course.id, 'instructor')
    const cookie = await cookieOf(instructor.id)
    const email = 'New.Student@Test.Example'

    const sent = await peopleAction(
      args(formRequest(`/courses/${course.id}/people`, { email, role: 'student' }, { Cookie: cookie }), {
        courseId: String(course.id),
      }),
    )
    expect(sent).toMatchObject({ ok: true, sentTo: 'New.Student@Test.Example' })

    const mail = await mailTo('new.student@test.example')
    expect(mail?.subject).toContain('TH 101')
    expect(mail?.text).toContain('Ada Instructor')
    const token = tokenFromMail(mail!.text, '/join/')

    const page = await joinLoader(args(getRequest(`/join/${token}`), { token }))
    expect(page.invitation).toMatchObject({ email: 'new.student@test.example', role: 'Student', hasAccount: false })

    const bad = await joinAction(
      args(formRequest(`/join/${token}`, { name: 'N', password: 'short', confirm: 'other' }), { token }),
    )
    expect((bad as { init: { status: number } }).init.status).toBe(400)

    const done = (await settle(
      joinAction(
        args(
          formRequest(`/join/${token}`, {
            name: 'Nia Student',
            password: 'a long enough password',
            confirm: 'a long enough password',
          }),
          { token },
        ),
      ),
    )) as { value?: Response; thrown?: Response }
    const res = (done.value ?? done.thrown)!
    expect(res.status).toBe(302)
    expect(res.headers.get('Location')).toBe(`/courses/${course.id}`)
    const [u] = await db().select().from(users).where(eq(users.email, 'new.student@test.example'))
    expect(u?.name).toBe('Nia Student')
    expect(await verifyPassword(u!.passwordHash!, 'a long enough password')).toBe(true)
    const m = await db()
      .select()
      .from(memberships)
      .where(and(eq(memberships.userId, u!.id), eq(memberships.courseId, course.id)))
    expect(m[0]?.role).toBe('student')

    const again = await joinLoader(args(getRequest(`/join/${token}`), { token }))
    expect(again.problem).toBe('used')
  })

  test('an expired invitation is refused', async () => {
    const course = await createCourse(db())
    const instructor = await createUser(db())
    await addMember(db(), instructor.id, course.id, 'instructor')
    await peopleAction(
      args(
        formRequest(
          `/courses/${course.id}/people`,
          { email: 'late@test.example', role: 'ta' },
          { Cookie: await cookieOf(instructor.id) },
        ),
        { courseId: String(course.id) },
      ),
    )
    await db()
      .update(accessTokens)
      .set({ expiresAt: new Date(Date.now() - 60_000) })
      .where(eq(accessTokens.email, 'late@test.example'))
    const token = tokenFromMail((await mailTo('late@test.example'))!.text, '/join/')
    expect((await joinLoader(args(getRequest(`/join/${token}`), { token }))).problem).toBe('expired')
  })

  test('a TA cannot invite, and bad input gets field messages', async () => {
    const course = await createCourse(db())
    const ta = await createUser(db())
    await addMember(db(), ta.id, course.id, 'ta')
    const instructor = await createUser(db())
    await addMember(db(), instructor.id, course.id, 'instructor')
    const byTa = await settle(
      peopleAction(
        args(
          formRequest(
            `/courses/${course.id}/people`,
            { email: 'x@test.example', role: 'student' },
            { Cookie: await cookieOf(ta.id) },
          ),
          { courseId: String(course.id) },
        ),
      ),
    )
    expect('thrown' in byTa && (byTa.thrown as { init: { status: number } }).init.status).toBe(403)
    const junk = await peopleAction(
      args(
        formRequest(
          `/courses/${course.id}/people`,
          { email: 'not an address', role: 'wizard' },
          { Cookie: await cookieOf(instructor.id) },
        ),
        { courseId: String(course.id) },
      ),
    )
    expect((junk as { data: { fieldErrors: Record<string, string> } }).data.fieldErrors).toMatchObject({
      email: expect.any(String),
      role: 'Choose a role.',
    })
  })

  test('a student of the course is refused the people page actions with 403, a stranger too', async () => {
    const course = await createCourse(db())
    const student = await createUser(db())
    await addMember(db(), student.id, course.id, 'student')
    const stranger = await createUser(db())
    for (const who of [student, stranger]) {
      const r = await settle(
        peopleAction(
          args(
            formRequest(
              `/courses/${course.id}/people`,
              { email: 'y@test.example', role: 'student' },
              { Cookie: await cookieOf(who.id) },
            ),
            { courseId: String(course.id) },
          ),
        ),
      )
      expect('thrown' in r && (r.thrown as { init: { status: number } }).init.status).toBe(403)
    }
  })

  test('the outbox is for admins only', async () => {
    const plain = await createUser(db())
    const r = await settle(outboxLoader(args(getRequest('/admin/outbox', { Cookie: await cookieOf(plain.id) }))))
    expect('thrown' in r && (r.thrown as { init: { status: number } }).init.status).toBe(403)
    const admin = await createUser(db(), { isAdmin: true })
    const ok = await outboxLoader(args(getRequest('/admin/outbox', { Cookie: await cookieOf(admin.id) })))
    expect(ok.total).toBeGreaterThanOrEqual(0)
  })
})

describe('password reset', () => {
  test('the link sets a new password once and signs out every other session', async () => {
    const user = await createUser(db(), { password: 'the old password' })
    const oldCookie = await cookieOf(user.id)
    const answer = await forgotAction(args(formRequest('/forgot-password', { email: user.email.toUpperCase() })))
    expect(answer).toMatchObject({ sent: true })
    const token = tokenFromMail((await mailTo(user.email))!.text, '/reset-password/')
    expect((await resetLoader(args(getRequest(`/reset-password/${token}`), { token }))).email).toBe(user.email)
    const r = await settle(
      resetAction(
        args(formRequest(`/reset-password/${token}`, { password: 'the new password!', confirm: 'the new password!' }), {
          token,
        }),
      ),
    )
    expect(('value' in r ? (r.value as Response) : (r.thrown as Response)).headers.get('Location')).toBe(
      '/sign-in?reset=1',
    )
    const [u] = await db().select().from(users).where(eq(users.id, user.id))
    expect(await verifyPassword(u!.passwordHash!, 'the new password!')).toBe(true)
    expect(await db().select().from(sessions).where(eq(sessions.userId, user.id))).toHaveLength(0)
    expect(oldCookie).toBeTruthy()
    expect((await resetLoader(args(getRequest(`/reset-password/${token}`), { token }))).problem).toBe('used')
  })

  test('a forged Host or X-Forwarded-Host never reaches the link: it uses the configured origin', async () => {
    const forged = (email: string) =>
      new Request('http://evil.example/forgot-password', {
        method: 'POST',
        body: new URLSearchParams({ email }),
        headers: {
          'Content-Type': 'application/x-www-form-urlencoded',
          Host: 'evil.example',
          'X-Forwarded-Host': 'evil.example',
          'X-Forwarded-Proto': 'https',
          'x-cyclewright-client-address': '10.44.0.1',
        },
      })
    const saved = { APP_URL: process.env.APP_URL, PORT: process.env.PORT }
    try {
      // Configured: APP_URL.
      process.env.APP_URL = 'https://cyclewright.example.org/'
      resetEnv()
      const a = await createUser(db())
      await forgotAction(args(forged(a.email)))
      const linkA = linksIn((await mailTo(a.email))!.text).find((l) => l.includes('/reset-password/'))!
      expect(new URL(linkA).origin).toBe('https://cyclewright.example.org')
      // Unset (allowed outside production): the local server, still not the request's host.
      delete process.env.APP_URL
      process.env.PORT = '4123'
      resetEnv()
      const b = await createUser(db())
      await forgotAction(args(forged(b.email)))
      const linkB = linksIn((await mailTo(b.email))!.text).find((l) => l.includes('/reset-password/'))!
      expect(new URL(linkB).origin).toBe('http://127.0.0.1:4123')
    } finally {
      for (const [k, v] of Object.entries(saved)) {
        if (v === undefined) delete process.env[k]
        else process.env[k] = v
      }
      resetEnv()
    }
  })

  test('thirty requests for one address queue three mails, and every answer is the same', async () => {
    const user = await createUser(db())
    const answers = await Promise.all(
      Array.from({ length: 30 }, (_, i) =>
        forgotAction(
          args(
            formRequest('/forgot-password', { email: user.email }, { 'x-cyclewright-client-address': `10.60.0.${i}` }),
          ),
        ),
      ),
    )
    for (const a of answers) expect(a).toEqual({ sent: true, fieldErrors: {}, values: {} })
    expect(await queuedMailsTo(user.email)).toBe(3)
  })

  test('one client address asking for many addresses is limited too, with the same answer', async () => {
    const client = { 'x-cyclewright-client-address': '10.61.0.1' }
    for (let i = 0; i < 20; i++)
      await forgotAction(args(formRequest('/forgot-password', { email: `someone${i}@test.example` }, client)))
    const user = await createUser(db())
    const answer = await forgotAction(args(formRequest('/forgot-password', { email: user.email }, client)))
    expect(answer).toEqual({ sent: true, fieldErrors: {}, values: {} })
    expect(await queuedMailsTo(user.email)).toBe(0)
    // From another address the same person gets their link.
    await forgotAction(
      args(formRequest('/forgot-password', { email: user.email }, { 'x-cyclewright-client-address': '10.61.0.2' })),
    )
    expect(await queuedMailsTo(user.email)).toBe(1)
  })

  test('an unknown address gets the same answer and no mail', async () => {
    const answer = await forgotAction(args(formRequest('/forgot-password', { email: 'ghost@test.example' })))
    expect(answer).toMatchObject({ sent: true })
    const queued = await db().execute(
      sql`select id from pgboss.job where name = 'send-mail' and data->>'to' = 'ghost@test.example'`,
    )
    expect(queued.rows).toHaveLength(0)
    expect(await findLastMailTo(db(), 'ghost@test.example')).toBeNull()
  })
})
