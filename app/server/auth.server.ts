/**
 * Sign-in and the guards every loader and action uses. The client is never trusted:
 * each guard reads the session row and the memberships from PostgreSQL.
 */
import { data, redirect } from 'react-router'
import { Authenticator } from 'remix-auth'
import { FormStrategy } from 'remix-auth-form'
import { z } from 'zod'
import { canUseBank, hasCourseRole, type CourseRole } from '#app/domain/permissions.ts'
import { db } from './db/client.server.ts'
import { checkPassword } from './passwords.server.ts'
import { beginSignInAttempt, markSignInSucceeded, waitInWords } from './rate-limit.server.ts'
import {
  createSessionRow,
  deleteSessionRow,
  findLiveSession,
  getCookieSession,
  sessionStorage,
} from './session.server.ts'
import { findUserByEmail, loadSignedInUser, normaliseEmail, toActor, type SignedInUser } from './users.server.ts'

/** A sign-in that failed for a reason the person may be told. */
export class SignInError extends Error {}

/** Deliberately says nothing about which of the two was wrong. */
export const WRONG_CREDENTIALS = 'That e-mail address and password do not match an account. Check both and try again.'

export const CLIENT_ADDRESS_HEADER = 'x-cyclewright-client-address'

/** The client address, as put on the request by our own server (see scripts/server.ts). */
export function clientAddress(request: Request): string {
  return request.headers.get(CLIENT_ADDRESS_HEADER) ?? 'unknown'
}

const SignInFormSchema = z.object({
  email: z.string().trim().min(1, 'Enter your e-mail address.').max(320).email('Enter a valid e-mail address.'),
  password: z.string().min(1, 'Enter your password.').max(1000),
})

export const authenticator = new Authenticator<{ userId: number }>()

authenticator.use(
  new FormStrategy(async ({ form, request }) => {
    const parsed = SignInFormSchema.safeParse({ email: form.get('email'), password: form.get('password') })
    if (!parsed.success) throw new SignInError(parsed.error.issues[0]?.message ?? WRONG_CREDENTIALS)
    const email = normaliseEmail(parsed.data.email)
    const address = clientAddress(request)
    const database = db()
    // Counted and recorded in one step before any password is checked (rate-limit.server.ts).
    const gate = await beginSignInAttempt(database, email, address)
    if (!gate.allowed)
      throw new SignInError(`Too many sign-in attempts. Try again in ${waitInWords(gate.retryInSeconds)}.`)
    const user = await findUserByEmail(database, email)
    // Always one argon2 verify, against a dummy hash when there is no account to check.
    const ok = await checkPassword(user?.passwordHash, parsed.data.password)
    if (!user || !ok) throw new SignInError(WRONG_CREDENTIALS)
    await markSignInSucceeded(database, gate.attemptId)
    return { userId: user.id }
  }),
  'password',
)

/** Starts a session for the user and redirects; used after sign-in and after accepting a link. */
export async function startSession(userId: number, redirectTo: string, notice?: string) {
  // Checked before the session row exists, so a bad target can never leave a row behind.
  const target = safeRedirect(redirectTo)
  const row = await createSessionRow(db(), userId)
  const session = await sessionStorage().getSession()
  session.set('sid', row.id)
  if (notice) session.flash('notice', notice)
  return redirect(target, {
    headers: { 'Set-Cookie': await sessionStorage().commitSession(session, { expires: row.expiresAt }) },
  })
}

export async function getUser(request: Request): Promise<SignedInUser | null> {
  const session = await getCookieSession(request)
  const sid = session.get('sid')
  if (!sid) return null
  const live = await findLiveSession(db(), sid)
  if (!live) return null
  return loadSignedInUser(db(), live.userId)
}

/** Returns the signed-in user, or throws a redirect to the sign-in page. */
export async function requireUser(request: Request): Promise<SignedInUser> {
  const user = await getUser(request)
  if (user) return user
  const url = new URL(request.url)
  const redirectTo = url.pathname + url.search
  throw redirect(`/sign-in?${new URLSearchParams({ redirectTo })}`)
}

/** Throws a redirect home when someone is already signed in. */
export async function requireAnonymous(request: Request) {
  if (await getUser(request)) throw redirect('/')
}

export function forbidden(message = 'You do not have access to this page.'): never {
  throw data(message, { status: 403 })
}

/** Returns the user when they hold one of `roles` in the course; else throws a 403 page. */
export async function requireCourseRole(request: Request, courseId: number, roles: readonly CourseRole[]) {
  const user = await requireUser(request)
  if (!Number.isInteger(courseId) || courseId <= 0) throw data('No such course.', { status: 404 })
  if (!hasCourseRole(toActor(user), courseId, roles)) forbidden()
  const course = user.courses.find((c) => c.id === courseId)!
  return { user, course }
}

/** People who may use the problem bank (canUseBank): department admins and anyone who instructs a course. */
export async function requireBankUser(request: Request) {
  const user = await requireUser(request)
  if (!canUseBank(toActor(user))) forbidden('The problem bank is for instructors.')
  return user
}

/** Department admins only. */
export async function requireAdmin(request: Request) {
  const user = await requireUser(request)
  if (!user.isAdmin) forbidden()
  return user
}

export async function signOut(request: Request) {
  const session = await getCookieSession(request)
  const sid = session.get('sid')
  if (sid) await deleteSessionRow(db(), sid)
  return redirect('/sign-in', { headers: { 'Set-Cookie': await sessionStorage().destroySession(session) } })
}

const REDIRECT_ORIGIN = 'http://redirect-check.invalid'
/** Control characters (C0, DEL, C1), any whitespace, and the backslash browsers read as `/`. */
const UNSAFE_CHAR = /[\u0000-\u001f\u007f-\u009f\s\\]/u
const MAX_REDIRECT_LENGTH = 2000

/**
 * Only a path on this site: never an open redirect to another host, and never a value
 * that cannot go into a Location header. Refused (→ `fallback`): anything not starting
 * with one `/`; `//` or `\` in the path, control characters or whitespace anywhere,
 * and the same written percent-encoded (decoded up to three times, so `%252F` counts
 * too); undecodable percent escapes. What passes is resolved against a placeholder
 * origin with `new URL`, must keep that origin, and comes back percent-encoded (so
 * `/ä` becomes `/%C3%A4`). Spaces inside the query (`?q=a%20b`) are allowed: they stay
 * encoded and cannot change the host.
 */
export function safeRedirect(to: FormDataEntryValue | string | null | undefined, fallback = '/'): string {
  if (typeof to !== 'string' || to.length === 0 || to.length > MAX_REDIRECT_LENGTH) return fallback
  if (!to.startsWith('/') || UNSAFE_CHAR.test(to)) return fallback
  let decoded = to
  for (let round = 0; round < 3; round++) {
    let next: string
    try {
      next = decodeURIComponent(decoded)
    } catch {
      return fallback
    }
    const cut = next.search(/[?#]/)
    const path = cut === -1 ? next : next.slice(0, cut)
    const rest = cut === -1 ? '' : next.slice(cut)
    if (!path.startsWith('/') || path.includes('//') || UNSAFE_CHAR.test(path)) return fallback
    if (/[\u0000-\u001f\u007f-\u009f\\]/u.test(rest)) return fallback
    if (next === decoded) break
    decoded = next
  }
  let url: URL
  try {
    url = new URL(to, REDIRECT_ORIGIN)
  } catch {
    return fallback
  }
  if (url.origin !== REDIRECT_ORIGIN) return fallback
  const safe = url.pathname + url.search + url.hash
  return safe.startsWith('/') && !safe.startsWith('//') ? safe : fallback
}
