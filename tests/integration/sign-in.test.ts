import { eq } from 'drizzle-orm'
import { describe, expect, test, vi } from 'vitest'
import { db } from '#app/server/db/client.server.ts'
import { sessions, signInAttempts } from '#app/server/db/schema.server.ts'
import { getUser, WRONG_CREDENTIALS } from '#app/server/auth.server.ts'
import { checkPassword } from '#app/server/passwords.server.ts'
import { checkSignInRate, pairDelaySeconds } from '#app/server/rate-limit.server.ts'
import { action as signInAction } from '#app/routes/sign-in.tsx'
import { action as signOutAction } from '#app/routes/sign-out.tsx'
import { createUser } from '#tests/support/factories.ts'
import { args, cookieFrom, formRequest, getRequest, settle } from '#tests/support/requests.ts'

vi.mock('#app/server/passwords.server.ts', async (importOriginal) => {
  const real = await importOriginal<typeof import('#app/server/passwords.server.ts')>()
  return { ...real, checkPassword: vi.fn(real.checkPassword) }
})

type Failure = { data: { error: string }; init: { status: number } }

/** Failed sign-in rows written directly, `n` of them one second apart from `from`. */
async function addAttempts(email: string, clientAddress: string, n: number, from: Date) {
  await db()
    .insert(signInAttempts)
    .values(
      Array.from({ length: n }, (_, i) => ({
        email,
        clientAddress,
        succeeded: false,
        kind: 'sign-in' as const,
        createdAt: new Date(from.getTime() + i * 1000),
      })),
    )
}

async function signIn(email: string, password: string, client = '10.0.0.1') {
  const r = await settle(
    signInAction(args(formRequest('/sign-in', { email, password }, { 'x-cyclewright-client-address': client }))),
  )
  if ('thrown' in r) return r.thrown as Response
  return r.value as unknown as { data: { error: string }; init: { status: number } } | Response
}

describe('sign-in', () => {
  test('a right password starts a session held in PostgreSQL, with an httpOnly SameSite=Lax cookie', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    const res = (await signIn(user.email, 'a good long password')) as Response
    expect(res.status).toBe(302)
    const setCookie = res.headers.get('Set-Cookie')!
    expect(setCookie).toMatch(/HttpOnly/i)
    expect(setCookie).toMatch(/SameSite=Lax/i)
    const rows = await db().select().from(sessions).where(eq(sessions.userId, user.id))
    expect(rows).toHaveLength(1)
    const me = await getUser(getRequest('/', { Cookie: cookieFrom(res) }))
    expect(me?.email).toBe(user.email)
  })

  test('a wrong password and an unknown address get the same message', async () => {
    const user = await createUser(db())
    const wrong = (await signIn(user.email, 'not the password')) as {
      data: { error: string }
      init: { status: number }
    }
    const unknown = (await signIn('nobody@test.example', 'whatever it is')) as {
      data: { error: string }
      init: { status: number }
    }
    expect(wrong.init.status).toBe(400)
    expect(wrong.data.error).toBe(WRONG_CREDENTIALS)
    expect(unknown.data.error).toBe(WRONG_CREDENTIALS)
  })

  test('five wrong passwords slow that address for that account (2 s, then doubling); the owner elsewhere signs in at once', async () => {
    const user = await createUser(db(), { password: 'the right password' })
    for (let i = 0; i < 5; i++)
      expect(((await signIn(user.email, `wrong ${i}`, '10.1.0.1')) as Failure).data.error).toBe(WRONG_CREDENTIALS)
    const blocked = (await signIn(user.email, 'the right password', '10.1.0.1')) as Failure
    expect(blocked.init.status).toBe(400)
    expect(blocked.data.error).toMatch(/^Too many sign-in attempts\. Try again in [12] seconds?\.$/)
    const owner = (await signIn(user.email, 'the right password', '10.9.9.9')) as Response
    expect(owner.status).toBe(302)
    // The blocked try checked no password and is not counted.
    const counted = await db().select().from(signInAttempts).where(eq(signInAttempts.email, user.email))
    expect(counted.map((r) => r.succeeded).sort()).toEqual([false, false, false, false, false, true])
  })

  test('each further failure of a pair doubles its wait, up to the window', async () => {
    const email = 'pair@test.example'
    const t0 = new Date('2026-12-01T10:00:00Z')
    const at = (s: number) => new Date(t0.getTime() + s * 1000)
    // Seven failures, at 0 … 6 s: the wait after the last is 2^(7 − 5 + 1) = 8 s.
    await addAttempts(email, '10.2.0.1', 7, t0)
    expect(await checkSignInRate(db(), email, '10.2.0.1', at(13))).toEqual({ allowed: false, retryInSeconds: 1 })
    expect(await checkSignInRate(db(), email, '10.2.0.1', at(14))).toEqual({ allowed: true })
    expect(await checkSignInRate(db(), email, '10.2.0.2', at(7))).toEqual({ allowed: true })
    // The eighth: 16 s.
    await addAttempts(email, '10.2.0.1', 1, at(14))
    expect(await checkSignInRate(db(), email, '10.2.0.1', at(14))).toEqual({ allowed: false, retryInSeconds: 16 })
    // Many failures: capped at SIGNIN_WINDOW_MINUTES (15 minutes).
    await addAttempts(email, '10.2.0.1', 30, at(15))
    expect(await checkSignInRate(db(), email, '10.2.0.1', at(44))).toEqual({ allowed: false, retryInSeconds: 15 * 60 })
    expect(pairDelaySeconds(4, 5, 900)).toBe(0)
    expect(pairDelaySeconds(5, 5, 900)).toBe(2)
    expect(pairDelaySeconds(6, 5, 900)).toBe(4)
    expect(pairDelaySeconds(500, 5, 900)).toBe(900)
  })

  test('a success clears the pair: earlier failures no longer slow it', async () => {
    const user = await createUser(db(), { password: 'the right password' })
    for (let i = 0; i < 4; i++) await signIn(user.email, `wrong ${i}`, '10.3.0.1')
    expect(((await signIn(user.email, 'the right password', '10.3.0.1')) as Response).status).toBe(302)
    for (let i = 0; i < 4; i++)
      expect(((await signIn(user.email, `wrong again ${i}`, '10.3.0.1')) as Failure).data.error).toBe(WRONG_CREDENTIALS)
    expect(((await signIn(user.email, 'the right password', '10.3.0.1')) as Response).status).toBe(302)
  })

  test('twenty wrong passwords at once: at most five get a password check', async () => {
    const user = await createUser(db(), { password: 'the right password' })
    vi.mocked(checkPassword).mockClear()
    const results = (await Promise.all(
      Array.from({ length: 20 }, (_, i) => signIn(user.email, `parallel ${i}`, '10.4.0.1')),
    )) as Failure[]
    const errors = results.map((r) => r.data.error)
    expect(errors.filter((e) => e === WRONG_CREDENTIALS)).toHaveLength(5)
    expect(errors.filter((e) => /^Too many sign-in attempts/.test(e))).toHaveLength(15)
    expect(vi.mocked(checkPassword)).toHaveBeenCalledTimes(5)
    expect(await db().select().from(signInAttempts).where(eq(signInAttempts.email, user.email))).toHaveLength(5)
  })

  test('one client address failing for many accounts is limited, generously (a lab shares one address)', async () => {
    const now = new Date()
    for (let i = 0; i < 49; i++)
      await addAttempts(`stranger${i}@test.example`, '10.7.7.7', 1, new Date(now.getTime() - 60_000))
    const user = await createUser(db(), { password: 'the right password' })
    // 49 failures: the lab still signs in.
    expect(((await signIn(user.email, 'the right password', '10.7.7.7')) as Response).status).toBe(302)
    await signIn('stranger49@test.example', 'guess', '10.7.7.7')
    const blocked = (await signIn(user.email, 'the right password', '10.7.7.7')) as Failure
    expect(blocked.data.error).toMatch(/^Too many sign-in attempts\. Try again in 1[45] minutes\.$/)
    const elsewhere = (await signIn(user.email, 'the right password', '10.7.7.8')) as Response
    expect(elsewhere.status).toBe(302)
  })

  test('only a very high count of failures from many addresses slows the account for everyone', async () => {
    const user = await createUser(db(), { password: 'the right password' })
    const recent = new Date(Date.now() - 60_000)
    for (let i = 0; i < 99; i++) await addAttempts(user.email, `10.8.${Math.floor(i / 200)}.${i % 200}`, 1, recent)
    expect(((await signIn(user.email, 'the right password', '10.8.9.9')) as Response).status).toBe(302)
    await addAttempts(user.email, '10.8.1.1', 1, recent)
    const blocked = (await signIn(user.email, 'the right password', '10.8.9.10')) as Failure
    expect(blocked.data.error).toMatch(/^Too many sign-in attempts\. Try again in 1[45] minutes\.$/)
  })

  test('an unknown address costs the same password work as a wrong password', async () => {
    const user = await createUser(db(), { password: 'the right password' })
    const time = async (email: string, client: string) => {
      const started = performance.now()
      await signIn(email, 'not the password', client)
      return performance.now() - started
    }
    const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)]!
    const known: number[] = []
    const unknown: number[] = []
    for (let i = 0; i < 4; i++) {
      known.push(await time(user.email, `10.5.0.${i}`))
      unknown.push(await time(`nobody${i}@test.example`, `10.5.1.${i}`))
    }
    // Without the dummy hash an unknown address answers in a few milliseconds, an argon2
    // verify takes tens; the bound is loose so a busy machine does not make it flaky.
    expect(median(unknown)).toBeGreaterThan(median(known) * 0.4)
  })

  test('signing out deletes the session row, so the old cookie no longer works', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    const res = (await signIn(user.email, 'a good long password')) as Response
    const cookie = cookieFrom(res)
    const out = await signOutAction(
      args(new Request('http://127.0.0.1:9/sign-out', { method: 'POST', headers: { Cookie: cookie } })),
    )
    expect((out as Response).status).toBe(302)
    expect(await db().select().from(sessions).where(eq(sessions.userId, user.id))).toHaveLength(0)
    expect(await getUser(getRequest('/', { Cookie: cookie }))).toBeNull()
  })

  test('an expired session row is not accepted', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    const cookie = cookieFrom((await signIn(user.email, 'a good long password')) as Response)
    await db()
      .update(sessions)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(sessions.userId, user.id))
    expect(await getUser(getRequest('/', { Cookie: cookie }))).toBeNull()
  })

  test('a forged cookie is ignored', async () => {
    expect(await getUser(getRequest('/', { Cookie: '__cyclewright=eyJzaWQiOiJ4In0.forged' }))).toBeNull()
  })

  test('the sign-in redirect never leaves the site', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    const req = formRequest('/sign-in?redirectTo=//evil.example/x', {
      email: user.email,
      password: 'a good long password',
    })
    const r = await settle(signInAction(args(req)))
    const res = ('thrown' in r ? r.thrown : r.value) as Response
    expect(res.headers.get('Location')).toBe('/')
  })

  test.each([
    ['CR LF', '/courses\r\nSet-Cookie: x=1', '/'],
    ['an encoded tab before a host', '/%09/evil.example', '/'],
    ['a non-Latin-1 path', '/ä', '/%C3%A4'],
  ])(
    'a redirectTo with %s signs in to a safe path, with no server error and one session',
    async (_what, redirectTo, location) => {
      const user = await createUser(db(), { password: 'a good long password' })
      const req = formRequest(`/sign-in?${new URLSearchParams({ redirectTo })}`, {
        email: user.email,
        password: 'a good long password',
      })
      const r = await settle(signInAction(args(req)))
      const res = ('thrown' in r ? r.thrown : r.value) as Response
      expect(res).toBeInstanceOf(Response)
      expect(res.status).toBe(302)
      expect(res.headers.get('Location')).toBe(location)
      expect(await db().select().from(sessions).where(eq(sessions.userId, user.id))).toHaveLength(1)
    },
  )

  test('passwords are stored as argon2id hashes', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    expect(user.passwordHash).toMatch(/^\$argon2id\$/)
  })
})
