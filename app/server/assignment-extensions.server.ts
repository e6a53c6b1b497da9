/**
 * Per-student extensions of an assignment: a later due date and/or extra attempts, given or
 * taken away by an instructor, each change with an 'extension' audit row. Dates are read in
 * the course's time zone.
 */
import { and, asc, eq, sql } from 'drizzle-orm'
import { z } from 'zod'
import { formatInZone, parseLocalDateTime } from '#app/lib/dates.ts'
import type { FieldErrors } from '#app/lib/form.ts'
import { courseZone, findAssignment, requireInstructor, roleInCourse } from './assignment-access.server.ts'
import type { Db, Tx } from './db/client.server.ts'
import { auditEvents, extensions, memberships, users } from './db/schema.server.ts'

type Database = Db | Tx

export type ExtensionRow = {
  userId: number
  name: string
  email: string
  section: string | null
  dueAt: Date | null
  extraAttempts: number
  reason: string
}

/** The course's students, each with their extension on this assignment if any. */
export async function listExtensions(database: Database, opts: { courseId: number; assignmentId: number }) {
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const rows = await database
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      section: memberships.section,
      dueAt: extensions.dueAt,
      extraAttempts: extensions.extraAttempts,
      reason: extensions.reason,
      hasExtension: sql<boolean>`${extensions.id} is not null`,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .leftJoin(extensions, and(eq(extensions.userId, users.id), eq(extensions.assignmentId, a.id)))
    .where(and(eq(memberships.courseId, opts.courseId), eq(memberships.role, 'student')))
    .orderBy(asc(users.name), asc(users.id))
  const students = rows.map((r) => ({ userId: r.userId, name: r.name, email: r.email, section: r.section }))
  const granted: ExtensionRow[] = rows
    .filter((r) => r.hasExtension)
    .map((r) => ({
      userId: r.userId,
      name: r.name,
      email: r.email,
      section: r.section,
      dueAt: r.dueAt,
      extraAttempts: r.extraAttempts ?? 0,
      reason: r.reason ?? '',
    }))
  return { assignment: a, timeZone, students, extensions: granted }
}

export const ExtensionFormSchema = z.object({
  userId: z
    .string()
    .regex(/^\d{1,9}$/, 'Choose a student.')
    .transform(Number),
  dueAt: z.string().trim(),
  extraAttempts: z
    .string()
    .trim()
    .transform((s) => (s === '' ? '0' : s))
    .pipe(
      z
        .string()
        .regex(/^\d{1,3}$/, 'Enter extra attempts as a whole number from 0 to 100.')
        .transform(Number),
    )
    .pipe(z.number().max(100, 'At most 100 extra attempts.')),
  reason: z.string().trim().max(500, 'Keep the reason under 500 characters.'),
})
export type ExtensionForm = z.infer<typeof ExtensionFormSchema>

export type ExtensionResult = { ok: true } | { ok: false; fieldErrors: FieldErrors }

/**
 * Gives a student a later due date and/or extra attempts (replacing any extension they had),
 * with an 'extension' audit row. The due date is read in the course's zone.
 */
export async function setExtension(
  database: Db,
  opts: { courseId: number; assignmentId: number; actorId: number; input: ExtensionForm },
): Promise<ExtensionResult> {
  await requireInstructor(database, opts.actorId, opts.courseId)
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  const { timeZone } = await courseZone(database, opts.courseId)
  const fieldErrors: FieldErrors = {}
  if ((await roleInCourse(database, opts.input.userId, opts.courseId)) !== 'student')
    fieldErrors.userId = 'Choose a student of this course.'
  let dueAt: Date | null = null
  if (opts.input.dueAt !== '') {
    dueAt = parseLocalDateTime(opts.input.dueAt, timeZone)
    if (!dueAt) fieldErrors.dueAt = `Enter a date and time that exists in ${timeZone}.`
    else if (dueAt.getTime() <= a.dueAt.getTime())
      fieldErrors.dueAt = `An extension’s due date must be after the assignment’s (${formatInZone(a.dueAt, timeZone)}).`
  }
  if (dueAt === null && !fieldErrors.dueAt && opts.input.extraAttempts === 0)
    fieldErrors.dueAt = 'Give a later due date, extra attempts, or both.'
  if (Object.keys(fieldErrors).length) return { ok: false, fieldErrors }
  await database.transaction(async (tx) => {
    const [prev] = await tx
      .select({ dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts, reason: extensions.reason })
      .from(extensions)
      .where(and(eq(extensions.assignmentId, a.id), eq(extensions.userId, opts.input.userId)))
      .for('update')
    const values = { dueAt, extraAttempts: opts.input.extraAttempts, reason: opts.input.reason }
    await tx
      .insert(extensions)
      .values({ assignmentId: a.id, userId: opts.input.userId, createdBy: opts.actorId, ...values })
      .onConflictDoUpdate({
        target: [extensions.assignmentId, extensions.userId],
        set: { ...values, updatedAt: new Date() },
      })
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      assignmentId: a.id,
      userId: opts.input.userId,
      kind: 'extension',
      before: prev
        ? { dueAt: prev.dueAt?.toISOString() ?? null, extraAttempts: prev.extraAttempts, reason: prev.reason }
        : null,
      after: { dueAt: dueAt?.toISOString() ?? null, extraAttempts: values.extraAttempts, reason: values.reason },
      note: opts.input.reason,
    })
  })
  return { ok: true }
}

/** Takes a student's extension away (an 'extension' audit row with after null). False when they had none. */
export async function removeExtension(
  database: Db,
  opts: { courseId: number; assignmentId: number; actorId: number; userId: number },
): Promise<boolean> {
  await requireInstructor(database, opts.actorId, opts.courseId)
  const a = await findAssignment(database, opts.courseId, opts.assignmentId)
  return database.transaction(async (tx) => {
    const [gone] = await tx
      .delete(extensions)
      .where(and(eq(extensions.assignmentId, a.id), eq(extensions.userId, opts.userId)))
      .returning({ dueAt: extensions.dueAt, extraAttempts: extensions.extraAttempts, reason: extensions.reason })
    if (!gone) return false
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      assignmentId: a.id,
      userId: opts.userId,
      kind: 'extension',
      before: { dueAt: gone.dueAt?.toISOString() ?? null, extraAttempts: gone.extraAttempts, reason: gone.reason },
      after: null,
    })
    return true
  })
}
