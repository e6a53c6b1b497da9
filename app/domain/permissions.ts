/**
 * Who may do what, as plain functions. Server helpers enforce these rules; components
 * consult the same functions to decide what to show. Pure: no framework, no database.
 */
export type CourseRole = 'instructor' | 'ta' | 'student'

export type Actor = {
  id: number
  isAdmin: boolean
  /** courseId → the person's role in that course */
  roles: ReadonlyMap<number, CourseRole>
}

export const roleLabels: Record<CourseRole, string> = {
  instructor: 'Instructor',
  ta: 'Teaching assistant',
  student: 'Student',
}

export function roleIn(actor: Actor, courseId: number): CourseRole | null {
  return actor.roles.get(courseId) ?? null
}

export function hasCourseRole(actor: Actor, courseId: number, allowed: readonly CourseRole[]): boolean {
  const role = roleIn(actor, courseId)
  return role !== null && allowed.includes(role)
}

/** Staff see the whole course: its roster, gradebook and review queue. */
export function canSeeCourseAsStaff(actor: Actor, courseId: number): boolean {
  return hasCourseRole(actor, courseId, ['instructor', 'ta'])
}

/**
 * Who may invite whom: a department admin invites anyone to any course; an instructor
 * invites students, TAs and fellow instructors to their own course; nobody else invites.
 */
export function canInvite(actor: Actor, courseId: number, role: CourseRole): boolean {
  if (actor.isAdmin) return true
  if (!hasCourseRole(actor, courseId, ['instructor'])) return false
  return role === 'student' || role === 'ta' || role === 'instructor'
}

export function canReadOutbox(actor: Actor): boolean {
  return actor.isAdmin
}

/** The home page a person lands on: their strongest role decides the layout. */
export function primaryRole(actor: Actor): 'admin' | CourseRole | 'none' {
  if (actor.isAdmin) return 'admin'
  const roles = new Set(actor.roles.values())
  if (roles.has('instructor')) return 'instructor'
  if (roles.has('ta')) return 'ta'
  if (roles.has('student')) return 'student'
  return 'none'
}

// ---- The problem bank -------------------------------------------------------------------

/** Who a bank problem is shown to; mirrors the problem_visibility enum. */
export type ProblemVisibility = 'private' | 'department' | 'installation'

export type BankViewerFacts = { id: number; isAdmin: boolean; departmentId: number | null }
export type BankProblemFacts = { ownerId: number; visibility: ProblemVisibility; departmentId: number | null }

/** The bank is for people who set work: admins, and anyone teaching some course. */
export function canUseBank(actor: Actor): boolean {
  if (actor.isAdmin) return true
  for (const role of actor.roles.values()) if (role === 'instructor') return true
  return false
}

/**
 * Whether a bank user sees a problem. The viewer is assumed to be a bank user already
 * (canUseBank): students never reach the bank, so 'installation' means every bank user.
 * A viewer without a department shares no department with anyone.
 */
export function canSeeProblem(viewer: BankViewerFacts, problem: BankProblemFacts): boolean {
  if (viewer.isAdmin || problem.ownerId === viewer.id) return true
  if (problem.visibility === 'installation') return true
  if (problem.visibility === 'department')
    return viewer.departmentId !== null && viewer.departmentId === problem.departmentId
  return false
}

/**
 * Only the owner edits. Admins see everything but do not edit others' problems: a version
 * is the author's work, and students' grades are tied to what the author wrote. Anyone who
 * wants a variant makes a copy, which records where it came from.
 */
export function canEditProblem(viewer: { id: number }, problem: { ownerId: number }): boolean {
  return problem.ownerId === viewer.id
}
