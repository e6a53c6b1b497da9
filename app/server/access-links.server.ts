/**
 * Single-use, expiring links: invitations to a course (with a role) and password resets.
 * Tokens are nanoid strings; a link is used once and then refused.
 */
import { and, eq, gt, isNull } from 'drizzle-orm'
import { nanoid } from 'nanoid'
import type { CourseRole } from '#app/domain/permissions.ts'
import { roleLabels } from '#app/domain/permissions.ts'
import type { Db, Tx } from './db/client.server.ts'
import { accessTokens, courses, memberships, sessions, users } from './db/schema.server.ts'
import { linkMail, queueMail } from './email.server.ts'
import { appUrl } from './env.server.ts'
import { hashPassword } from './passwords.server.ts'
import { claimResetRequest } from './rate-limit.server.ts'
import { normaliseEmail } from './users.server.ts'

export const INVITATION_DAYS = 7
export const RESET_MINUTES = 60

export async function inviteToCourse(
  database: Db,
  opts: { email: string; courseId: number; role: CourseRole; invitedBy: number; baseUrl?: string; now?: Date },
) {
  const email = normaliseEmail(opts.email)
  const now = opts.now ?? new Date()
  const [course] = await database
    .select({ id: courses.id, code: courses.code, title: courses.title })
    .from(courses)
    .where(eq(courses.id, opts.courseId))
  if (!course) throw new Error(`No course ${opts.courseId}`)
  const [inviter] = await database.select({ name: users.name }).from(users).where(eq(users.id, opts.invitedBy))
  const token = nanoid(32)
  await database.insert(accessTokens).values({
    token,
    purpose: 'invitation',
    email,
    courseId: course.id,
    role: opts.role,
    createdBy: opts.invitedBy,
    expiresAt: new Date(now.getTime() + INVITATION_DAYS * 86_400_000),
  })
  const link = `${opts.baseUrl ?? appUrl()}/join/${token}`
  await queueMail(
    linkMail({
      to: email,
      subject: `You are invited to ${course.code} on Cyclewright`,
      lines: [
        `${inviter?.name ?? 'An instructor'} has invited you to ${course.code} ${course.title} as ${roleLabels[opts.role].toLowerCase()}.`,
        'Open the link to set your name and password and go to the course.',
      ],
      link,
      linkLabel: 'Accept the invitation',
      after: [`The link works once and expires in ${INVITATION_DAYS} days.`],
    }),
  )
  return { token, link }
}

export type LinkProblem = 'unknown' | 'used' | 'expired' | 'revoked'

const refused = (problem: LinkProblem) => ({ ok: false as const, problem })

export async function findAccessLink(
  database: Db,
  token: string,
  purpose: 'invitation' | 'password-reset',
  now = new Date(),
) {
  if (!/^[A-Za-z0-9_-]{10,64}$/.test(token)) return refused('unknown')
  const [row] = await database
    .select({
      id: accessTokens.id,
      email: accessTokens.email,
      courseId: accessTokens.courseId,
      role: accessTokens.role,
      expiresAt: accessTokens.expiresAt,
      usedAt: accessTokens.usedAt,
      revokedAt: accessTokens.revokedAt,
      courseCode: courses.code,
      courseTitle: courses.title,
    })
    .from(accessTokens)
    .leftJoin(courses, eq(courses.id, accessTokens.courseId))
    .where(and(eq(accessTokens.token, token), eq(accessTokens.purpose, purpose)))
  if (!row) return refused('unknown')
  if (row.revokedAt) return refused('revoked')
  if (row.usedAt) return refused('used')
  if (row.expiresAt <= now) return refused('expired')
  const [existing] = await database
    .select({ id: users.id, name: users.name, hasPassword: users.passwordHash })
    .from(users)
    .where(eq(users.email, row.email))
  return {
    ok: true as const,
    link: row,
    existingUser: existing
      ? { id: existing.id, name: existing.name, hasPassword: existing.hasPassword !== null }
      : null,
  }
}

/** Marks the link used, atomically: a second use (even a concurrent one) gets false. */
async function claim(tx: Tx, linkId: number, now: Date): Promise<boolean> {
  const claimed = await tx
    .update(accessTokens)
    .set({ usedAt: now })
    .where(
      and(
        eq(accessTokens.id, linkId),
        isNull(accessTokens.usedAt),
        isNull(accessTokens.revokedAt),
        gt(accessTokens.expiresAt, now),
      ),
    )
    .returning({ id: accessTokens.id })
  return claimed.length === 1
}

/**
 * Accepts an invitation: creates the account (or sets the name and password of one that
 * has none yet) and adds the membership. An existing account with a password keeps it
 * and only gains the course. Returns null when the link is no longer valid.
 */
export async function acceptInvitation(
  database: Db,
  token: string,
  input: { name?: string; password?: string },
  now = new Date(),
): Promise<{ userId: number; courseId: number | null } | null> {
  const found = await findAccessLink(database, token, 'invitation', now)
  if (!found.ok) return null
  const { link, existingUser } = found
  const passwordHash = input.password ? await hashPassword(input.password) : null
  return database.transaction(async (tx) => {
    if (!(await claim(tx, link.id, now))) return null
    let userId: number
    if (existingUser) {
      userId = existingUser.id
      if (!existingUser.hasPassword) {
        if (!passwordHash || !input.name) throw new Error('name and password are required for a new account')
        await tx.update(users).set({ name: input.name, passwordHash }).where(eq(users.id, userId))
      }
    } else {
      if (!passwordHash || !input.name) throw new Error('name and password are required for a new account')
      const [created] = await tx
        .insert(users)
        .values({ email: link.email, name: input.name, passwordHash })
        .returning({ id: users.id })
      userId = created!.id
    }
    if (link.courseId && link.role) {
      await tx
        .insert(memberships)
        .values({ userId, courseId: link.courseId, role: link.role })
        .onConflictDoUpdate({ target: [memberships.userId, memberships.courseId], set: { role: link.role } })
    }
    return { userId, courseId: link.courseId }
  })
}

/**
 * Sends a reset link when the address has an account and the request is within the
 * limits (per e-mail and per client address, rate-limit.server.ts). The caller shows the
 * same message in every case, so the form reveals neither who has an account nor who is
 * being throttled.
 */
export async function requestPasswordReset(
  database: Db,
  rawEmail: string,
  opts: { clientAddress: string; baseUrl?: string; now?: Date },
): Promise<{ sent: boolean; throttled: boolean }> {
  const email = normaliseEmail(rawEmail)
  const now = opts.now ?? new Date()
  const baseUrl = opts.baseUrl ?? appUrl()
  const allowed = await claimResetRequest(database, email, opts.clientAddress, now)
  if (!allowed.allowed) return { sent: false, throttled: true }
  const [user] = await database.select({ id: users.id }).from(users).where(eq(users.email, email))
  if (!user) return { sent: false, throttled: false }
  const token = nanoid(32)
  await database.insert(accessTokens).values({
    token,
    purpose: 'password-reset',
    email,
    createdBy: null,
    expiresAt: new Date(now.getTime() + RESET_MINUTES * 60_000),
  })
  const link = `${baseUrl}/reset-password/${token}`
  await queueMail(
    linkMail({
      to: email,
      subject: 'Reset your Cyclewright password',
      lines: [
        'Someone asked to reset the password of your Cyclewright account.',
        'If it was you, open the link and choose a new password.',
      ],
      link,
      linkLabel: 'Choose a new password',
      after: [
        `The link works once and expires in ${RESET_MINUTES} minutes. If you did not ask for this, ignore this message.`,
      ],
    }),
  )
  return { sent: true, throttled: false }
}

/** Sets the new password and ends every session of that account. */
export async function resetPassword(database: Db, token: string, password: string, now = new Date()) {
  const found = await findAccessLink(database, token, 'password-reset', now)
  if (!found.ok || !found.existingUser) return null
  const userId = found.existingUser.id
  const passwordHash = await hashPassword(password)
  return database.transaction(async (tx) => {
    if (!(await claim(tx, found.link.id, now))) return null
    await tx.update(users).set({ passwordHash }).where(eq(users.id, userId))
    await tx.delete(sessions).where(eq(sessions.userId, userId))
    return { userId }
  })
}
