import { and, asc, count, desc, eq, gt, isNull, ne, sql } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { data } from 'react-router'
import { z } from 'zod'
import type { FieldErrors } from '#app/lib/form.ts'
import { readTimeZone } from '#app/lib/time-zones.ts'
import { EmailSchema } from '#app/lib/validation.ts'
import { inviteToCourse } from './access-links.server.ts'
import type { Db, Tx } from './db/client.server.ts'
import { isUniqueViolation } from './db/pg-errors.server.ts'
import {
  accessTokens,
  assignmentItems,
  assignments,
  auditEvents,
  courses,
  departments,
  memberships,
  problemVersions,
  submissions,
  terms,
  users,
} from './db/schema.server.ts'
import { fieldOf, listField } from './json-values.server.ts'
import { normaliseEmail } from './users.server.ts'

type Database = Db | Tx

export async function findCourse(database: Db, courseId: number) {
  const rows = await database
    .select({
      id: courses.id,
      code: courses.code,
      title: courses.title,
      timeZone: courses.timeZone,
      signConvention: courses.signConvention,
      termName: terms.name,
      departmentName: departments.name,
    })
    .from(courses)
    .innerJoin(terms, eq(terms.id, courses.termId))
    .innerJoin(departments, eq(departments.id, courses.departmentId))
    .where(eq(courses.id, courseId))
    .limit(1)
  return rows[0] ?? null
}

export async function listCourseMembers(database: Db, courseId: number) {
  return database
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      section: memberships.section,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.courseId, courseId))
    .orderBy(sql`case ${memberships.role} when 'instructor' then 0 when 'ta' then 1 else 2 end`, asc(users.name))
}

export async function countMembersByRole(database: Database, courseId: number) {
  const rows = await database
    .select({ role: memberships.role, n: count() })
    .from(memberships)
    .where(eq(memberships.courseId, courseId))
    .groupBy(memberships.role)
  const counts: Partial<Record<(typeof rows)[number]['role'], number>> = {}
  for (const r of rows) counts[r.role] = r.n
  return counts
}

/** Every course of the installation with its head counts, for department admins. */
export async function listAllCourses(database: Db) {
  return database
    .select({
      id: courses.id,
      code: courses.code,
      title: courses.title,
      termName: terms.name,
      departmentName: departments.name,
      signConvention: courses.signConvention,
      timeZone: courses.timeZone,
      students: sql<number>`count(*) filter (where ${memberships.role} = 'student')::int`,
      staff: sql<number>`count(*) filter (where ${memberships.role} in ('instructor', 'ta'))::int`,
    })
    .from(courses)
    .innerJoin(terms, eq(terms.id, courses.termId))
    .innerJoin(departments, eq(departments.id, courses.departmentId))
    .leftJoin(memberships, eq(memberships.courseId, courses.id))
    .groupBy(courses.id, terms.name, departments.name)
    .orderBy(asc(terms.name), asc(courses.code))
}

// ---- Terms and courses for department admins; a course's settings for its instructors ----

/** Form rules shared by the admin's new-course form, the settings form and the copy form. */
export const CourseCodeSchema = z
  .string({ message: 'Enter a course code, such as ENTH 210.' })
  .trim()
  .min(2, 'Enter a course code, such as ENTH 210.')
  .max(24, 'Keep the code to 24 characters.')
  .regex(
    /^[\p{L}\p{N}][\p{L}\p{N} .&/_-]*$/u,
    'Use letters, digits, spaces and . - / & _ in the code, starting with a letter or digit.',
  )

export const CourseTitleSchema = z
  .string({ message: 'Enter the course title.' })
  .trim()
  .min(2, 'Enter the course title.')
  .max(120, 'Keep the title to 120 characters.')

export const TimeZoneSchema = z
  .string({ message: 'Choose or type a time zone, such as Europe/Oslo.' })
  .transform((text, ctx) => {
    const read = readTimeZone(text)
    if (!read.ok) {
      ctx.addIssue({ code: 'custom', message: read.message })
      return z.NEVER
    }
    return read.timeZone
  })

export const SignConventionSchema = z.enum(['chemistry', 'engineering'], { message: 'Choose a sign convention.' })

const idField = (message: string) =>
  z
    .string({ message })
    .regex(/^\d{1,9}$/, message)
    .transform(Number)

function isCalendarDate(text: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text)
  if (!m) return false
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])]
  const date = new Date(Date.UTC(y, mo - 1, d))
  return (
    date.getUTCFullYear() === y && date.getUTCMonth() === mo - 1 && date.getUTCDate() === d && y >= 2000 && y <= 2200
  )
}

const dateField = (message: string) => z.string({ message }).trim().refine(isCalendarDate, message)

/** Whole days from one calendar date (YYYY-MM-DD) to another. */
export function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000)
}

export const MAX_TERM_DAYS = 731

export const TermFormSchema = z
  .object({
    name: z
      .string({ message: 'Name the term, such as Spring 2027.' })
      .trim()
      .min(2, 'Name the term, such as Spring 2027.')
      .max(60, 'Keep the name to 60 characters.'),
    startsOn: dateField('Enter the first day of the term.'),
    endsOn: dateField('Enter the last day of the term.'),
  })
  .superRefine((v, ctx) => {
    if (!isCalendarDate(v.startsOn) || !isCalendarDate(v.endsOn)) return
    const days = daysBetween(v.startsOn, v.endsOn)
    if (days <= 0)
      ctx.addIssue({ code: 'custom', path: ['endsOn'], message: 'The last day must come after the first day.' })
    else if (days > MAX_TERM_DAYS)
      ctx.addIssue({
        code: 'custom',
        path: ['endsOn'],
        message: 'A term is at most two years long: check the year of the last day.',
      })
  })

export const NewCourseFormSchema = z.object({
  termId: idField('Choose the term.'),
  code: CourseCodeSchema,
  title: CourseTitleSchema,
  signConvention: SignConventionSchema,
  timeZone: TimeZoneSchema,
})

export const AssignInstructorFormSchema = z.object({ email: EmailSchema })

export const CourseSettingsFormSchema = z.object({
  code: CourseCodeSchema,
  title: CourseTitleSchema,
  signConvention: SignConventionSchema,
  timeZone: TimeZoneSchema,
  /** the instructor's explicit yes to changing the convention after students have answered */
  confirmConvention: z.literal('yes').optional().catch(undefined),
})

export type Outcome<T> = ({ ok: true } & T) | { ok: false; fieldErrors: FieldErrors }

/** The admin's own department (terms and new courses belong to it), or null. */
export async function findUserDepartment(database: Database, userId: number) {
  const [row] = await database
    .select({ id: departments.id, name: departments.name, timeZone: departments.timeZone })
    .from(users)
    .innerJoin(departments, eq(departments.id, users.departmentId))
    .where(eq(users.id, userId))
  return row ?? null
}

/** A department's terms, latest first, with how many courses each holds. */
export async function listTerms(database: Database, departmentId: number) {
  return database
    .select({
      id: terms.id,
      name: terms.name,
      startsOn: terms.startsOn,
      endsOn: terms.endsOn,
      courses: sql<number>`(select count(*) from ${courses} where ${courses.termId} = ${terms.id})::int`,
    })
    .from(terms)
    .where(eq(terms.departmentId, departmentId))
    .orderBy(desc(terms.startsOn), asc(terms.name))
}

export async function createTermFor(
  database: Database,
  departmentId: number,
  input: z.output<typeof TermFormSchema>,
): Promise<Outcome<{ termId: number }>> {
  const [clash] = await database
    .select({ id: terms.id })
    .from(terms)
    .where(and(eq(terms.departmentId, departmentId), sql`lower(${terms.name}) = lower(${input.name})`))
  if (clash)
    return { ok: false, fieldErrors: { name: `There is already a term called ${input.name}. Choose another name.` } }
  const [row] = await database
    .insert(terms)
    .values({ departmentId, name: input.name, startsOn: input.startsOn, endsOn: input.endsOn })
    .returning({ id: terms.id })
  return { ok: true, termId: row!.id }
}

async function codeTaken(database: Database, termId: number, code: string, exceptCourseId?: number) {
  const [row] = await database
    .select({ id: courses.id })
    .from(courses)
    .where(
      and(
        eq(courses.termId, termId),
        sql`lower(${courses.code}) = lower(${code})`,
        exceptCourseId ? ne(courses.id, exceptCourseId) : undefined,
      ),
    )
  return Boolean(row)
}

export const codeTakenMessage = (code: string, termName: string) =>
  `${termName} already has a course ${code}. Choose another code or another term.`

/** A new course in one of the department's terms; writes a course-created audit row. */
export async function createCourseFor(
  database: Db,
  opts: { actorId: number; departmentId: number; input: z.output<typeof NewCourseFormSchema> },
): Promise<Outcome<{ courseId: number }>> {
  const { input } = opts
  const [term] = await database
    .select({ id: terms.id, name: terms.name })
    .from(terms)
    .where(and(eq(terms.id, input.termId), eq(terms.departmentId, opts.departmentId)))
  if (!term) return { ok: false, fieldErrors: { termId: 'Choose one of your department’s terms.' } }
  if (await codeTaken(database, term.id, input.code))
    return { ok: false, fieldErrors: { code: codeTakenMessage(input.code, term.name) } }
  try {
    return await database.transaction(async (tx) => {
      const [row] = await tx
        .insert(courses)
        .values({
          departmentId: opts.departmentId,
          termId: term.id,
          code: input.code,
          title: input.title,
          signConvention: input.signConvention,
          timeZone: input.timeZone,
        })
        .returning({ id: courses.id })
      await tx.insert(auditEvents).values({
        actorId: opts.actorId,
        courseId: row!.id,
        kind: 'course-created',
        after: {
          code: input.code,
          title: input.title,
          termId: term.id,
          signConvention: input.signConvention,
          timeZone: input.timeZone,
        },
      })
      return { ok: true as const, courseId: row!.id }
    })
  } catch (e) {
    if (isUniqueViolation(e, 'courses_term_code_key'))
      return { ok: false, fieldErrors: { code: codeTakenMessage(input.code, term.name) } }
    throw e
  }
}

/** Everything the admin's page of one course shows: the course, its instructors, invitations waiting and assignments. */
export async function adminCoursePage(database: Database, courseId: number, now = new Date()) {
  const source = alias(courses, 'source')
  const sourceTerm = alias(terms, 'source_term')
  const [course] = await database
    .select({
      id: courses.id,
      code: courses.code,
      title: courses.title,
      timeZone: courses.timeZone,
      signConvention: courses.signConvention,
      createdAt: courses.createdAt,
      termName: terms.name,
      termStartsOn: terms.startsOn,
      termEndsOn: terms.endsOn,
      departmentName: departments.name,
      copiedFrom: sql<{
        id: number
        code: string
        termName: string
      } | null>`case when ${source.id} is null then null else json_build_object('id', ${source.id}, 'code', ${source.code}, 'termName', ${sourceTerm.name}) end`,
    })
    .from(courses)
    .innerJoin(terms, eq(terms.id, courses.termId))
    .innerJoin(departments, eq(departments.id, courses.departmentId))
    .leftJoin(source, eq(source.id, courses.copiedFromId))
    .leftJoin(sourceTerm, eq(sourceTerm.id, source.termId))
    .where(eq(courses.id, courseId))
  if (!course) return null
  const instructors = await database
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      hasPassword: sql<boolean>`${users.passwordHash} is not null`,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.courseId, courseId), eq(memberships.role, 'instructor')))
    .orderBy(asc(users.name))
  const invitations = await database
    .select({
      id: accessTokens.id,
      email: accessTokens.email,
      sentAt: sql<Date>`coalesce(${accessTokens.lastSentAt}, ${accessTokens.createdAt})`.mapWith(courses.createdAt),
      expiresAt: accessTokens.expiresAt,
    })
    .from(accessTokens)
    .where(
      and(
        eq(accessTokens.courseId, courseId),
        eq(accessTokens.purpose, 'invitation'),
        eq(accessTokens.role, 'instructor'),
        isNull(accessTokens.usedAt),
        isNull(accessTokens.revokedAt),
        gt(accessTokens.expiresAt, now),
      ),
    )
    .orderBy(desc(accessTokens.createdAt))
  const assignmentRows = await database
    .select({ id: assignments.id, title: assignments.title, opensAt: assignments.opensAt, dueAt: assignments.dueAt })
    .from(assignments)
    .where(eq(assignments.courseId, courseId))
    .orderBy(asc(assignments.dueAt), asc(assignments.id))
  const counts = await countMembersByRole(database, courseId)
  return { course, instructors, invitations, assignments: assignmentRows, counts }
}

export type AssignInstructorOutcome = Outcome<{
  outcome: 'added' | 'already' | 'invited'
  email: string
  name: string | null
}>

/**
 * Makes the person with this address an instructor of the course: an existing account gains
 * (or is moved to) the instructor role at once; an unknown address, or an account that has
 * never set a password, gets an invitation as instructor, through the same links as every
 * other invitation.
 */
export async function assignInstructor(
  database: Db,
  opts: { actorId: number; courseId: number; email: string },
): Promise<AssignInstructorOutcome> {
  const email = normaliseEmail(opts.email)
  const [existing] = await database
    .select({ id: users.id, name: users.name, hasPassword: sql<boolean>`${users.passwordHash} is not null` })
    .from(users)
    .where(eq(users.email, email))
  // No account, or one never signed in to (no password yet): the invitation's link sets it up.
  if (!existing || !existing.hasPassword) {
    await inviteToCourse(database, { email, courseId: opts.courseId, role: 'instructor', invitedBy: opts.actorId })
    return { ok: true, outcome: 'invited', email, name: null }
  }
  return database.transaction(async (tx) => {
    const [membership] = await tx
      .select({ role: memberships.role })
      .from(memberships)
      .where(and(eq(memberships.userId, existing.id), eq(memberships.courseId, opts.courseId)))
      .for('update')
    if (membership?.role === 'instructor')
      return { ok: true as const, outcome: 'already' as const, email, name: existing.name }
    await tx
      .insert(memberships)
      .values({ userId: existing.id, courseId: opts.courseId, role: 'instructor' })
      .onConflictDoUpdate({
        target: [memberships.userId, memberships.courseId],
        set: { role: 'instructor', droppedAt: null },
      })
    await tx.insert(auditEvents).values({
      actorId: opts.actorId,
      courseId: opts.courseId,
      userId: existing.id,
      kind: 'instructor-added',
      before: membership ? { role: membership.role } : null,
      after: { role: 'instructor' },
    })
    return { ok: true as const, outcome: 'added' as const, email, name: existing.name }
  })
}

/**
 * What changing the sign convention would touch: answers already sent, and the problems
 * that take the course's convention (a problem may fix its own, and then nothing changes).
 */
export async function conventionImpact(database: Database, courseId: number) {
  const [answers] = await database
    .select({ answers: sql<number>`count(*)::int`, students: sql<number>`count(distinct ${submissions.userId})::int` })
    .from(submissions)
    .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
    .where(eq(assignments.courseId, courseId))
  const [items] = await database
    .select({
      follow: sql<number>`count(*) filter (where ${problemVersions.definition}->>'convention' = 'course')::int`,
      fixed: sql<number>`count(*) filter (where ${problemVersions.definition}->>'convention' <> 'course')::int`,
    })
    .from(assignmentItems)
    .innerJoin(assignments, eq(assignments.id, assignmentItems.assignmentId))
    .innerJoin(problemVersions, eq(problemVersions.id, assignmentItems.problemVersionId))
    .where(eq(assignments.courseId, courseId))
  return {
    answers: answers?.answers ?? 0,
    students: answers?.students ?? 0,
    followingProblems: items?.follow ?? 0,
    fixedProblems: items?.fixed ?? 0,
  }
}

/** The settings page of a course: its settings, what a convention change would touch, and the terms it may be copied to. */
export async function courseSettingsPage(database: Database, courseId: number) {
  const [course] = await database
    .select({
      id: courses.id,
      code: courses.code,
      title: courses.title,
      timeZone: courses.timeZone,
      signConvention: courses.signConvention,
      departmentId: courses.departmentId,
      termId: courses.termId,
      termName: terms.name,
      termStartsOn: terms.startsOn,
    })
    .from(courses)
    .innerJoin(terms, eq(terms.id, courses.termId))
    .where(eq(courses.id, courseId))
  if (!course) return null
  const impact = await conventionImpact(database, courseId)
  const termRows = await listTerms(database, course.departmentId)
  const copyTerms = termRows.map((t) => ({
    id: t.id,
    name: t.name,
    startsOn: t.startsOn,
    endsOn: t.endsOn,
    defaultOffsetDays: daysBetween(course.termStartsOn, t.startsOn),
    current: t.id === course.termId,
  }))
  const [assignmentCount] = await database
    .select({ n: count() })
    .from(assignments)
    .where(eq(assignments.courseId, courseId))
  const [instructorCount] = await database
    .select({ n: count() })
    .from(memberships)
    .where(and(eq(memberships.courseId, courseId), eq(memberships.role, 'instructor'), isNull(memberships.droppedAt)))
  // A copy: where it came from and how its dates were moved (from its course-copied audit row).
  const [copied] = await database
    .select({ after: auditEvents.after, at: auditEvents.at, code: courses.code, termName: terms.name })
    .from(auditEvents)
    .leftJoin(courses, sql`${courses.id} = (${auditEvents.before}->>'courseId')::int`)
    .leftJoin(terms, eq(terms.id, courses.termId))
    .where(and(eq(auditEvents.courseId, courseId), eq(auditEvents.kind, 'course-copied')))
    .orderBy(desc(auditEvents.id))
    .limit(1)
  const copyOf = copied
    ? {
        code: copied.code,
        termName: copied.termName,
        offsetDays: Number(fieldOf(copied.after, 'offsetDays') ?? 0),
        assignments: listField(copied.after, 'assignments')?.length ?? 0,
      }
    : null
  return {
    course,
    impact,
    copyTerms,
    assignmentCount: assignmentCount?.n ?? 0,
    instructorCount: instructorCount?.n ?? 0,
    copyOf,
  }
}

export const CONFIRM_CONVENTION_MESSAGE =
  'Students have already answered in this course. Tick the box to confirm that you want to change the sign convention.'

/** The settings a course's page can change, in the order the audit lists them. */
const COURSE_SETTING_KEYS = ['code', 'title', 'timeZone', 'signConvention'] as const

/** Saves an instructor's changes to the course; writes a course-settings-changed audit row with what changed. */
export async function updateCourseSettings(
  database: Db,
  opts: { actorId: number; courseId: number; input: z.output<typeof CourseSettingsFormSchema> },
): Promise<Outcome<{ changed: string[] }>> {
  const { input } = opts
  try {
    return await database.transaction(async (tx) => {
      const [current] = await tx
        .select({
          code: courses.code,
          title: courses.title,
          timeZone: courses.timeZone,
          signConvention: courses.signConvention,
          termId: courses.termId,
          termName: terms.name,
        })
        .from(courses)
        .innerJoin(terms, eq(terms.id, courses.termId))
        .where(eq(courses.id, opts.courseId))
        .for('update', { of: courses })
      if (!current) throw data('No such course.', { status: 404 })
      const [role] = await tx
        .select({ role: memberships.role })
        .from(memberships)
        .where(and(eq(memberships.userId, opts.actorId), eq(memberships.courseId, opts.courseId)))
      if (role?.role !== 'instructor')
        throw data('Only the course’s instructors can change its settings.', { status: 403 })
      const fieldErrors: FieldErrors = {}
      if (input.signConvention !== current.signConvention && !input.confirmConvention) {
        const impact = await conventionImpact(tx, opts.courseId)
        if (impact.answers > 0) fieldErrors.confirmConvention = CONFIRM_CONVENTION_MESSAGE
      }
      if (input.code !== current.code && (await codeTaken(tx, current.termId, input.code, opts.courseId))) {
        fieldErrors.code = codeTakenMessage(input.code, current.termName)
      }
      if (Object.keys(fieldErrors).length) return { ok: false as const, fieldErrors }
      const next = {
        code: input.code,
        title: input.title,
        timeZone: input.timeZone,
        signConvention: input.signConvention,
      }
      const changed = COURSE_SETTING_KEYS.filter((k) => next[k] !== current[k])
      if (changed.length === 0) return { ok: true as const, changed: [] }
      await tx.update(courses).set(next).where(eq(courses.id, opts.courseId))
      await tx.insert(auditEvents).values({
        actorId: opts.actorId,
        courseId: opts.courseId,
        kind: 'course-settings-changed',
        before: Object.fromEntries(changed.map((k) => [k, current[k]])),
        after: Object.fromEntries(changed.map((k) => [k, next[k]])),
      })
      return { ok: true as const, changed }
    })
  } catch (e) {
    if (isUniqueViolation(e, 'courses_term_code_key'))
      return {
        ok: false,
        fieldErrors: { code: `Another course of this term already has the code ${input.code}. Choose another code.` },
      }
    throw e
  }
}

/** The text fields of a form, to show back beside field errors found after parsing. */
export function formValues(formData: FormData): Record<string, string> {
  const out: Record<string, string> = {}
  for (const [k, v] of formData.entries()) if (typeof v === 'string') out[k] = v
  return out
}
