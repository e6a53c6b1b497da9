import { asc, count, eq, sql } from 'drizzle-orm'
import type { Db } from './db/client.server.ts'
import { courses, departments, memberships, terms, users } from './db/schema.server.ts'

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
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, section: memberships.section })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.courseId, courseId))
    .orderBy(sql`case ${memberships.role} when 'instructor' then 0 when 'ta' then 1 else 2 end`, asc(users.name))
}

export async function countMembersByRole(database: Db, courseId: number) {
  const rows = await database
    .select({ role: memberships.role, n: count() })
    .from(memberships)
    .where(eq(memberships.courseId, courseId))
    .groupBy(memberships.role)
  return Object.fromEntries(rows.map((r) => [r.role, r.n])) as Partial<Record<'instructor' | 'ta' | 'student', number>>
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
