/**
 * Copying a course to a new term: the course's settings, its instructors and its assignments
 * with their dates moved by a number of days. The copy keeps each assignment's problems on the
 * very same (frozen) problem versions, with their points and tolerance overrides, so a problem
 * behaves exactly as it did last term. Students, extensions, answers, grades and disputes stay
 * with the old course; the copy's keys and grades are not released. One transaction, with a
 * course-copied audit row on the new course.
 */
import { TZDate } from '@date-fns/tz'
import { addDays } from 'date-fns'
import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm'
import { data } from 'react-router'
import { z } from 'zod'
import type { FieldErrors } from '#app/lib/form.ts'
import { CourseCodeSchema, CourseTitleSchema, codeTakenMessage, daysBetween, type Outcome } from './courses.server.ts'
import type { Db } from './db/client.server.ts'
import { isUniqueViolation } from './db/pg-errors.server.ts'
import {
  assignmentItems,
  assignments,
  auditEvents,
  courses,
  memberships,
  problemVersions,
  terms,
} from './db/schema.server.ts'

export const MAX_OFFSET_DAYS = 3660

export const CopyCourseFormSchema = z.object({
  termId: z
    .string({ message: 'Choose the term to copy the course to.' })
    .regex(/^\d{1,9}$/, 'Choose the term to copy the course to.')
    .transform(Number),
  code: CourseCodeSchema,
  title: CourseTitleSchema,
  /** blank: the days between the two terms' first days */
  offsetDays: z
    .string()
    .trim()
    .optional()
    .transform((v, ctx) => {
      if (v === undefined || v === '') return null
      if (!/^[+\-−]?\d{1,5}$/.test(v)) {
        ctx.addIssue({ code: 'custom', message: 'Enter a whole number of days, such as 119 or −7, or leave it blank.' })
        return z.NEVER
      }
      const n = Number(v.replace('−', '-'))
      if (Math.abs(n) > MAX_OFFSET_DAYS) {
        ctx.addIssue({ code: 'custom', message: `Move the dates by at most ${MAX_OFFSET_DAYS} days either way.` })
        return z.NEVER
      }
      return n
    }),
})

export type CopyCourseInput = z.output<typeof CopyCourseFormSchema>

/**
 * The instant `days` calendar days later on the wall clock of `timeZone`: 23:59 stays 23:59
 * across a change to or from summer time. Should that land on a time the clock skips, the
 * zone's rules move it forward, as for any other date read in that zone.
 */
export function shiftDays(instant: Date, days: number, timeZone: string): Date {
  return new Date(addDays(new TZDate(instant.getTime(), timeZone), days).getTime())
}

/** An assignment's two dates moved together; the due date always stays after the opening. */
export function shiftWindow(
  opensAt: Date,
  dueAt: Date,
  days: number,
  timeZone: string,
): { opensAt: Date; dueAt: Date } {
  const opens = shiftDays(opensAt, days, timeZone)
  const due = shiftDays(dueAt, days, timeZone)
  if (due > opens) return { opensAt: opens, dueAt: due }
  // Only a window of an hour or so across a clock change can fold over; keep its length.
  return {
    opensAt: new Date(opensAt.getTime() + days * 86_400_000),
    dueAt: new Date(dueAt.getTime() + days * 86_400_000),
  }
}

/**
 * Copies the course to `input.termId` (a term of the same department) for an instructor of
 * the course. Bad input (another department's term, a code the term already has) comes back
 * as field errors and writes nothing.
 */
export async function copyCourse(
  database: Db,
  opts: { actorId: number; courseId: number; input: CopyCourseInput },
): Promise<Outcome<{ courseId: number; offsetDays: number; assignments: number }>> {
  const { input } = opts
  try {
    return await database.transaction(async (tx) => {
      const [source] = await tx
        .select({
          id: courses.id,
          departmentId: courses.departmentId,
          code: courses.code,
          timeZone: courses.timeZone,
          signConvention: courses.signConvention,
          termId: courses.termId,
          termStartsOn: terms.startsOn,
        })
        .from(courses)
        .innerJoin(terms, eq(terms.id, courses.termId))
        .where(eq(courses.id, opts.courseId))
        .for('share', { of: courses })
      if (!source) throw data('No such course.', { status: 404 })
      const [role] = await tx
        .select({ role: memberships.role })
        .from(memberships)
        .where(and(eq(memberships.userId, opts.actorId), eq(memberships.courseId, source.id)))
      if (role?.role !== 'instructor') throw data('Only the course’s instructors can copy it.', { status: 403 })

      const fieldErrors: FieldErrors = {}
      const [target] = await tx
        .select({ id: terms.id, name: terms.name, startsOn: terms.startsOn })
        .from(terms)
        .where(and(eq(terms.id, input.termId), eq(terms.departmentId, source.departmentId)))
      if (!target) fieldErrors.termId = 'Choose one of the department’s terms.'
      else {
        const [clash] = await tx
          .select({ id: courses.id })
          .from(courses)
          .where(and(eq(courses.termId, target.id), sql`lower(${courses.code}) = lower(${input.code})`))
        if (clash) fieldErrors.code = codeTakenMessage(input.code, target.name)
      }
      if (!target || Object.keys(fieldErrors).length) return { ok: false as const, fieldErrors }

      const offsetDays = input.offsetDays ?? daysBetween(source.termStartsOn, target.startsOn)
      const [copy] = await tx
        .insert(courses)
        .values({
          departmentId: source.departmentId,
          termId: target.id,
          code: input.code,
          title: input.title,
          timeZone: source.timeZone,
          signConvention: source.signConvention,
          copiedFromId: source.id,
        })
        .returning({ id: courses.id })
      const courseId = copy!.id

      const staff = await tx
        .select({ userId: memberships.userId })
        .from(memberships)
        .where(
          and(eq(memberships.courseId, source.id), eq(memberships.role, 'instructor'), isNull(memberships.droppedAt)),
        )
      if (staff.length)
        await tx
          .insert(memberships)
          .values(staff.map((s) => ({ userId: s.userId, courseId, role: 'instructor' as const })))

      const old = await tx
        .select()
        .from(assignments)
        .where(eq(assignments.courseId, source.id))
        .orderBy(asc(assignments.dueAt), asc(assignments.id))
      const items = old.length
        ? await tx
            .select()
            .from(assignmentItems)
            .where(
              inArray(
                assignmentItems.assignmentId,
                old.map((a) => a.id),
              ),
            )
            .orderBy(asc(assignmentItems.position))
        : []
      const versionIds = [...new Set(items.map((i) => i.problemVersionId))]
      // They are frozen already (an assignment froze them when it first used them); make sure.
      if (versionIds.length) {
        await tx
          .update(problemVersions)
          .set({ frozenAt: sql`coalesce(${problemVersions.frozenAt}, now())` })
          .where(inArray(problemVersions.id, versionIds))
      }
      const mapping: { from: number; to: number }[] = []
      for (const a of old) {
        const window = shiftWindow(a.opensAt, a.dueAt, offsetDays, source.timeZone)
        const [made] = await tx
          .insert(assignments)
          .values({
            courseId,
            title: a.title,
            instructions: a.instructions,
            opensAt: window.opensAt,
            dueAt: window.dueAt,
            attemptsPerFind: a.attemptsPerFind,
            latePolicy: a.latePolicy,
            latePenaltyPercentPerDay: a.latePenaltyPercentPerDay,
            lateDaysAllowed: a.lateDaysAllowed,
            keyRelease: a.keyRelease,
            keyReleasedAt: null,
            gradesReleasedAt: null,
            disputeDays: a.disputeDays,
            createdBy: opts.actorId,
          })
          .returning({ id: assignments.id })
        mapping.push({ from: a.id, to: made!.id })
        const own = items.filter((i) => i.assignmentId === a.id)
        if (own.length) {
          await tx.insert(assignmentItems).values(
            own.map((i) => ({
              assignmentId: made!.id,
              position: i.position,
              problemId: i.problemId,
              problemVersionId: i.problemVersionId,
              points: i.points,
              toleranceOverrides: i.toleranceOverrides,
            })),
          )
        }
      }

      await tx.insert(auditEvents).values({
        actorId: opts.actorId,
        courseId,
        kind: 'course-copied',
        before: { courseId: source.id, code: source.code, termId: source.termId },
        after: {
          courseId,
          code: input.code,
          termId: target.id,
          offsetDays,
          assignments: mapping,
          instructors: staff.length,
        },
        note: `Copied from ${source.code}; dates moved by ${offsetDays} day${Math.abs(offsetDays) === 1 ? '' : 's'}`,
      })
      return { ok: true as const, courseId, offsetDays, assignments: mapping.length }
    })
  } catch (e) {
    if (isUniqueViolation(e, 'courses_term_code_key'))
      return {
        ok: false,
        fieldErrors: { code: `That term already has a course ${input.code}. Choose another code or another term.` },
      }
    throw e
  }
}
