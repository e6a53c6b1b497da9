import { and, asc, eq } from 'drizzle-orm'
import type { Actor, CourseRole } from '#app/domain/permissions.ts'
import type { Db } from './db/client.server.ts'
import { courses, departments, memberships, terms, users } from './db/schema.server.ts'

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase()
}

export async function findUserByEmail(database: Db, email: string) {
  const rows = await database
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      passwordHash: users.passwordHash,
      isAdmin: users.isAdmin,
    })
    .from(users)
    .where(eq(users.email, normaliseEmail(email)))
    .limit(1)
  return rows[0] ?? null
}

export type CourseOfUser = {
  id: number
  code: string
  title: string
  termName: string
  departmentName: string
  timeZone: string
  signConvention: 'chemistry' | 'engineering'
  role: CourseRole
}

export type SignedInUser = {
  id: number
  email: string
  name: string
  isAdmin: boolean
  courses: CourseOfUser[]
}

export async function loadSignedInUser(database: Db, userId: number): Promise<SignedInUser | null> {
  const [user] = await database
    .select({ id: users.id, email: users.email, name: users.name, isAdmin: users.isAdmin })
    .from(users)
    .where(eq(users.id, userId))
    .limit(1)
  if (!user) return null
  const rows = await database
    .select({
      id: courses.id,
      code: courses.code,
      title: courses.title,
      termName: terms.name,
      departmentName: departments.name,
      timeZone: courses.timeZone,
      signConvention: courses.signConvention,
      role: memberships.role,
    })
    .from(memberships)
    .innerJoin(courses, eq(courses.id, memberships.courseId))
    .innerJoin(terms, eq(terms.id, courses.termId))
    .innerJoin(departments, eq(departments.id, courses.departmentId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(courses.code))
  return { ...user, courses: rows }
}

export function toActor(user: SignedInUser): Actor {
  return { id: user.id, isAdmin: user.isAdmin, roles: new Map(user.courses.map((c) => [c.id, c.role])) }
}

export async function findMembership(database: Db, userId: number, courseId: number) {
  const rows = await database
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), eq(memberships.courseId, courseId)))
    .limit(1)
  return rows[0] ?? null
}
