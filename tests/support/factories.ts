/**
 * Building blocks for test data and for the demo seed. Each returns the row it made;
 * unique values come from a counter so tests never collide.
 */
import { eq } from 'drizzle-orm'
import type { Db } from '#app/server/db/client.server.ts'
import { courses, departments, memberships, terms, users, type CourseRole, type SignConvention } from '#app/server/db/schema.server.ts'
import { hashPassword } from '#app/server/passwords.server.ts'

let counter = 0
const next = () => `${process.pid}-${++counter}-${Math.random().toString(36).slice(2, 7)}`

export async function createDepartment(db: Db, overrides: Partial<{ slug: string; name: string }> = {}) {
  const slug = overrides.slug ?? `dept-${next()}`
  const [row] = await db.insert(departments).values({ slug, name: overrides.name ?? `Department ${slug}` }).returning()
  return row!
}

export async function createTerm(db: Db, departmentId: number, overrides: Partial<{ name: string; startsOn: string; endsOn: string }> = {}) {
  const [row] = await db
    .insert(terms)
    .values({ departmentId, name: overrides.name ?? `Term ${next()}`, startsOn: overrides.startsOn ?? '2026-09-01', endsOn: overrides.endsOn ?? '2026-12-20' })
    .returning()
  return row!
}

export async function createCourse(
  db: Db,
  overrides: Partial<{ departmentId: number; termId: number; code: string; title: string; timeZone: string; signConvention: SignConvention }> = {},
) {
  const departmentId = overrides.departmentId ?? (await createDepartment(db)).id
  const termId = overrides.termId ?? (await createTerm(db, departmentId)).id
  const [row] = await db
    .insert(courses)
    .values({
      departmentId,
      termId,
      code: overrides.code ?? `TH ${next()}`,
      title: overrides.title ?? 'Thermodynamics',
      timeZone: overrides.timeZone ?? 'UTC',
      signConvention: overrides.signConvention ?? 'engineering',
    })
    .returning()
  return row!
}

export async function createUser(
  db: Db,
  overrides: Partial<{ email: string; name: string; password: string | null; isAdmin: boolean; departmentId: number | null }> = {},
) {
  const email = (overrides.email ?? `person-${next()}@test.example`).toLowerCase()
  const password = overrides.password === undefined ? 'correct horse battery' : overrides.password
  const [row] = await db
    .insert(users)
    .values({
      email,
      name: overrides.name ?? 'Test Person',
      passwordHash: password === null ? null : await hashPassword(password),
      isAdmin: overrides.isAdmin ?? false,
      departmentId: overrides.departmentId ?? null,
    })
    .returning()
  return { ...row!, password }
}

export async function addMember(db: Db, userId: number, courseId: number, role: CourseRole, section: string | null = null) {
  const [row] = await db
    .insert(memberships)
    .values({ userId, courseId, role, section })
    .onConflictDoUpdate({ target: [memberships.userId, memberships.courseId], set: { role, section } })
    .returning()
  return row!
}

export async function findUserIdByEmail(db: Db, email: string) {
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, email.toLowerCase()))
  return row?.id ?? null
}

/**
 * Someone who may use the problem bank: an instructor of a fresh course in their department
 * (or an admin). Returns the user and the BankViewer the bank functions take.
 */
export async function createBankUser(db: Db, overrides: Partial<{ name: string; departmentId: number | null; isAdmin: boolean }> = {}) {
  const departmentId = overrides.departmentId === undefined ? (await createDepartment(db)).id : overrides.departmentId
  const user = await createUser(db, { name: overrides.name ?? 'Bank Instructor', departmentId, isAdmin: overrides.isAdmin ?? false, password: null })
  const course = await createCourse(db, departmentId === null ? {} : { departmentId })
  await addMember(db, user.id, course.id, 'instructor')
  return { user, viewer: { id: user.id, isAdmin: user.isAdmin, departmentId } }
}
