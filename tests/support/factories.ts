/**
 * Building blocks for test data and for the demo seed. Each returns the row it made;
 * unique values come from a counter so tests never collide.
 */
import { eq } from 'drizzle-orm'
import type { Db } from '#app/server/db/client.server.ts'
import { cycleOf, type ProblemDefinition } from '#app/domain/authoring/definition.ts'
import type { Tolerance } from '#app/domain/grading/index.ts'
import {
  assignmentItems,
  assignments,
  courses,
  departments,
  memberships,
  problems,
  problemSweeps,
  problemVersions,
  terms,
  users,
  type CourseRole,
  type NewAssignment,
  type SignConvention,
} from '#app/server/db/schema.server.ts'
import { studentVariant } from '#app/server/grading.server.ts'
import { hashPassword } from '#app/server/passwords.server.ts'

let counter = 0
const next = () => `${process.pid}-${++counter}-${Math.random().toString(36).slice(2, 7)}`

export async function createDepartment(db: Db, overrides: Partial<{ slug: string; name: string }> = {}) {
  const slug = overrides.slug ?? `dept-${next()}`
  const [row] = await db
    .insert(departments)
    .values({ slug, name: overrides.name ?? `Department ${slug}` })
    .returning()
  return row!
}

export async function createTerm(
  db: Db,
  departmentId: number,
  overrides: Partial<{ name: string; startsOn: string; endsOn: string }> = {},
) {
  const [row] = await db
    .insert(terms)
    .values({
      departmentId,
      name: overrides.name ?? `Term ${next()}`,
      startsOn: overrides.startsOn ?? '2026-09-01',
      endsOn: overrides.endsOn ?? '2026-12-20',
    })
    .returning()
  return row!
}

export async function createCourse(
  db: Db,
  overrides: Partial<{
    departmentId: number
    termId: number
    code: string
    title: string
    timeZone: string
    signConvention: SignConvention
  }> = {},
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
  overrides: Partial<{
    email: string
    name: string
    password: string | null
    isAdmin: boolean
    departmentId: number | null
  }> = {},
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

export async function addMember(
  db: Db,
  userId: number,
  courseId: number,
  role: CourseRole,
  section: string | null = null,
) {
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
export async function createBankUser(
  db: Db,
  overrides: Partial<{ name: string; departmentId: number | null; isAdmin: boolean }> = {},
) {
  const departmentId = overrides.departmentId === undefined ? (await createDepartment(db)).id : overrides.departmentId
  const user = await createUser(db, {
    name: overrides.name ?? 'Bank Instructor',
    departmentId,
    isAdmin: overrides.isAdmin ?? false,
    password: null,
  })
  const course = await createCourse(db, departmentId === null ? {} : { departmentId })
  await addMember(db, user.id, course.id, 'instructor')
  return { user, viewer: { id: user.id, isAdmin: user.isAdmin, departmentId } }
}

/**
 * A bank problem with one version (frozen, as an assignment uses it) owned by `ownerId`,
 * from a definition (a demo problem's, usually). Returns the problem and version ids.
 */
export async function createProblemWithVersion(
  db: Db,
  ownerId: number,
  definition: ProblemDefinition,
  options: { frozen?: boolean } = {},
) {
  const [problem] = await db
    .insert(problems)
    .values({
      ownerId,
      title: definition.title,
      cycle: cycleOf(definition.physics),
      topics: [...definition.tags.topics],
      difficulty: definition.tags.difficulty,
      level: definition.tags.level,
    })
    .returning({ id: problems.id })
  const [version] = await db
    .insert(problemVersions)
    .values({
      problemId: problem!.id,
      number: 1,
      definition,
      createdBy: ownerId,
      frozenAt: options.frozen === false ? null : new Date(),
    })
    .returning({ id: problemVersions.id })
  return { problemId: problem!.id, versionId: version!.id }
}

/**
 * A finished (or running, or broken) check of a version, as the sweep job leaves it: by
 * default 500 of 500 variants passed. The assignment form refuses versions whose latest
 * check did not pass unless overridden (issue #15).
 */
export async function recordCheck(
  db: Db,
  versionId: number,
  requestedBy: number,
  options: {
    status?: 'queued' | 'running' | 'done' | 'failed'
    total?: number
    checked?: number
    failed?: number
    createdAt?: Date
  } = {},
) {
  const total = options.total ?? 500
  const [row] = await db
    .insert(problemSweeps)
    .values({
      problemVersionId: versionId,
      requestedBy,
      status: options.status ?? 'done',
      total,
      checked: options.checked ?? total,
      failed: options.failed ?? 0,
      ...(options.createdAt ? { createdAt: options.createdAt } : {}),
    })
    .returning({ id: problemSweeps.id })
  return row!
}

export type AssignmentOverrides = Partial<Omit<NewAssignment, 'courseId' | 'createdBy'>>

/**
 * An assignment in `courseId` with one item per problem ({ problemId, versionId, points }).
 * Defaults: opened a day ago, due in a week, 3 attempts per find, closed after due, key after due.
 */
export async function createAssignment(
  db: Db,
  courseId: number,
  createdBy: number,
  items: readonly {
    problemId: number
    versionId: number
    points?: number
    toleranceOverrides?: Record<string, Tolerance>
  }[],
  overrides: AssignmentOverrides = {},
) {
  const now = Date.now()
  const [assignment] = await db
    .insert(assignments)
    .values({
      courseId,
      createdBy,
      title: `Assignment ${next()}`,
      opensAt: new Date(now - 24 * 3600_000),
      dueAt: new Date(now + 7 * 24 * 3600_000),
      ...overrides,
    })
    .returning()
  const itemRows = items.length
    ? await db
        .insert(assignmentItems)
        .values(
          items.map((it, i) => ({
            assignmentId: assignment!.id,
            position: i + 1,
            problemId: it.problemId,
            problemVersionId: it.versionId,
            points: it.points ?? 10,
            toleranceOverrides: it.toleranceOverrides ?? {},
          })),
        )
        .returning()
    : []
  return { assignment: assignment!, items: itemRows }
}

/**
 * A course with an instructor, `students` students (sections A and B alternating) and one
 * assignment over the given demo problem definitions, each version with a passed check. For
 * integration tests and benches.
 */
export async function createCourseWithAssignment(
  db: Db,
  definitions: readonly ProblemDefinition[],
  options: {
    students?: number
    signConvention?: SignConvention
    timeZone?: string
    assignment?: AssignmentOverrides
    checked?: boolean
  } = {},
) {
  const course = await createCourse(db, {
    signConvention: options.signConvention ?? 'engineering',
    timeZone: options.timeZone ?? 'UTC',
  })
  const instructor = await createUser(db, {
    name: 'Course Instructor',
    departmentId: course.departmentId,
    password: null,
  })
  await addMember(db, instructor.id, course.id, 'instructor')
  const students = []
  for (let i = 0; i < (options.students ?? 3); i++) {
    const s = await createUser(db, { name: `Student ${String(i + 1).padStart(3, '0')}`, password: null })
    await addMember(db, s.id, course.id, 'student', i % 2 === 0 ? 'A' : 'B')
    students.push(s)
  }
  const made = []
  for (const d of definitions) made.push(await createProblemWithVersion(db, instructor.id, d))
  // Its versions passed their check, as the assignment form asks (checked: false leaves them never checked).
  if (options.checked !== false) for (const m of made) await recordCheck(db, m.versionId, instructor.id)
  const { assignment, items } = await createAssignment(db, course.id, instructor.id, made, options.assignment ?? {})
  return { course, instructor, students, assignment, items }
}

/**
 * The variant one student of a course made by createCourseWithAssignment draws for one item,
 * drawn as the problem page draws it (the course's convention). The first student and item
 * unless named. Throws when the variant cannot be drawn: a test set-up that cannot draw is broken.
 */
export function drawnVariant(
  made: Awaited<ReturnType<typeof createCourseWithAssignment>>,
  definition: ProblemDefinition,
  which: { student?: { id: number }; item?: { problemVersionId: number; problemId: number } } = {},
) {
  const student = which.student ?? made.students[0]!
  const item = which.item ?? made.items[0]!
  const drawn = studentVariant({
    versionId: item.problemVersionId,
    definition,
    assignmentId: made.assignment.id,
    problemId: item.problemId,
    userId: student.id,
    courseConvention: made.course.signConvention,
  })
  if (!drawn.ok) throw new Error(drawn.error.message)
  return drawn.variant
}
