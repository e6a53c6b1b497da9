import { eq } from 'drizzle-orm'
import { describe, expect, test } from 'vitest'
import { db } from '#app/server/db/client.server.ts'
import { sessions, signInAttempts } from '#app/server/db/schema.server.ts'
import { getUser, WRONG_CREDENTIALS } from '#app/server/auth.server.ts'
import { action as signInAction } from '#app/routes/sign-in.tsx'
import { action as signOutAction } from '#app/routes/sign-out.tsx'
import { createUser } from '#tests/support/factories.ts'
import { args, cookieFrom, formRequest, getRequest, settle } from '#tests/support/requests.ts'

async function signIn(email: string, password: string, client = '10.0.0.1') {
  const r = await settle(signInAction(args(formRequest('/sign-in', { email, password }, { 'x-cyclewright-client-address': client }))))
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
    const wrong = (await signIn(user.email, 'not the password')) as { data: { error: string }; init: { status: number } }
    const unknown = (await signIn('nobody@test.example', 'whatever it is')) as { data: { error: string }; init: { status: number } }
    expect(wrong.init.status).toBe(400)
    expect(wrong.data.error).toBe(WRONG_CREDENTIALS)
    expect(unknown.data.error).toBe(WRONG_CREDENTIALS)
  })

  test('after five failures for one address even the right password waits, with a clear time', async () => {
    const user = await createUser(db(), { password: 'the right password' })
    for (let i = 0; i < 5; i++) await signIn(user.email, `wrong ${i}`, `10.1.0.${i}`)
    const blocked = (await signIn(user.email, 'the right password', '10.9.9.9')) as { data: { error: string } }
    expect(blocked.data.error).toMatch(/^Too many sign-in attempts\. Try again in (1[0-5]|[1-9]) minutes?\.$/)
    const counted = await db().select().from(signInAttempts).where(eq(signInAttempts.email, user.email))
    expect(counted.length).toBe(5)
  })

  test('one client address failing for many accounts is limited too', async () => {
    for (let i = 0; i < 20; i++) await signIn(`stranger${i}@test.example`, 'guess', '10.7.7.7')
    const user = await createUser(db(), { password: 'the right password' })
    const blocked = (await signIn(user.email, 'the right password', '10.7.7.7')) as { data: { error: string } }
    expect(blocked.data.error).toMatch(/Too many sign-in attempts/)
    const elsewhere = (await signIn(user.email, 'the right password', '10.7.7.8')) as Response
    expect(elsewhere.status).toBe(302)
  })

  test('signing out deletes the session row, so the old cookie no longer works', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    const res = (await signIn(user.email, 'a good long password')) as Response
    const cookie = cookieFrom(res)
    const out = await signOutAction(args(new Request('http://127.0.0.1:9/sign-out', { method: 'POST', headers: { Cookie: cookie } })))
    expect((out as Response).status).toBe(302)
    expect(await db().select().from(sessions).where(eq(sessions.userId, user.id))).toHaveLength(0)
    expect(await getUser(getRequest('/', { Cookie: cookie }))).toBeNull()
  })

  test('an expired session row is not accepted', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    const cookie = cookieFrom((await signIn(user.email, 'a good long password')) as Response)
    await db().update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.userId, user.id))
    expect(await getUser(getRequest('/', { Cookie: cookie }))).toBeNull()
  })

  test('a forged cookie is ignored', async () => {
    expect(await getUser(getRequest('/', { Cookie: '__cyclewright=eyJzaWQiOiJ4In0.forged' }))).toBeNull()
  })

  test('the sign-in redirect never leaves the site', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    const req = formRequest('/sign-in?redirectTo=//evil.example/x', { email: user.email, password: 'a good long password' })
    const r = await settle(signInAction(args(req)))
    const res = ('thrown' in r ? r.thrown : r.value) as Response
    expect(res.headers.get('Location')).toBe('/')
  })

  test.each([
    ['CR LF', '/courses\r\nSet-Cookie: x=1', '/'],
    ['an encoded tab before a host', '/%09/evil.example', '/'],
    ['a non-Latin-1 path', '/ä', '/%C3%A4'],
  ])('a redirectTo with %s signs in to a safe path, with no server error and one session', async (_what, redirectTo, location) => {
    const user = await createUser(db(), { password: 'a good long password' })
    const req = formRequest(`/sign-in?${new URLSearchParams({ redirectTo })}`, { email: user.email, password: 'a good long password' })
    const r = await settle(signInAction(args(req)))
    const res = ('thrown' in r ? r.thrown : r.value) as Response
    expect(res).toBeInstanceOf(Response)
    expect(res.status).toBe(302)
    expect(res.headers.get('Location')).toBe(location)
    expect(await db().select().from(sessions).where(eq(sessions.userId, user.id))).toHaveLength(1)
  })

  test('passwords are stored as argon2id hashes', async () => {
    const user = await createUser(db(), { password: 'a good long password' })
    expect(user.passwordHash).toMatch(/^\$argon2id\$/)
  })
})
