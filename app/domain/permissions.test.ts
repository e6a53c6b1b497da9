import { describe, expect, test } from 'vitest'
import {
  canEditProblem,
  canInvite,
  canReadOutbox,
  canSeeCourseAsStaff,
  canSeeProblem,
  canUseBank,
  primaryRole,
  type Actor,
  type CourseRole,
  type ProblemVisibility,
} from './permissions.ts'

function actor(roles: [number, CourseRole][], isAdmin = false): Actor {
  return { id: 1, isAdmin, roles: new Map(roles) }
}

describe('permissions', () => {
  test.each([
    [actor([[1, 'instructor']]), 1, 'student', true],
    [actor([[1, 'instructor']]), 2, 'student', false],
    [actor([[1, 'ta']]), 1, 'student', false],
    [actor([[1, 'student']]), 1, 'student', false],
    [actor([], true), 7, 'instructor', true],
  ] as const)('canInvite %#', (a, course, role, expected) => {
    expect(canInvite(a, course, role)).toBe(expected)
  })

  test('a person can be instructor in one course and TA in another', () => {
    const a = actor([
      [1, 'instructor'],
      [2, 'ta'],
    ])
    expect(canInvite(a, 1, 'ta')).toBe(true)
    expect(canInvite(a, 2, 'student')).toBe(false)
    expect(canSeeCourseAsStaff(a, 2)).toBe(true)
    expect(primaryRole(a)).toBe('instructor')
  })

  test('only admins read the outbox', () => {
    expect(canReadOutbox(actor([[1, 'instructor']]))).toBe(false)
    expect(canReadOutbox(actor([], true))).toBe(true)
  })

  test('primary role falls back to none', () => {
    expect(primaryRole(actor([]))).toBe('none')
    expect(primaryRole(actor([[3, 'student']]))).toBe('student')
  })
})

describe('the problem bank', () => {
  test.each([
    [
      'an instructor of one course',
      actor([
        [1, 'student'],
        [2, 'instructor'],
      ]),
      true,
    ],
    ['an admin without courses', actor([], true), true],
    ['a TA only', actor([[1, 'ta']]), false],
    ['a student only', actor([[1, 'student']]), false],
    ['nobody in particular', actor([]), false],
  ] as const)('canUseBank: %s → %s', (_, a, expected) => {
    expect(canUseBank(a)).toBe(expected)
  })

  const owner = { id: 1, isAdmin: false, departmentId: 10 }
  const colleague = { id: 2, isAdmin: false, departmentId: 10 }
  const elsewhere = { id: 3, isAdmin: false, departmentId: 20 }
  const homeless = { id: 4, isAdmin: false, departmentId: null }
  const admin = { id: 5, isAdmin: true, departmentId: 20 }
  const problem = (visibility: ProblemVisibility, departmentId: number | null = 10) => ({
    ownerId: 1,
    visibility,
    departmentId,
  })

  test.each([
    ['private', owner, true],
    ['private', colleague, false],
    ['private', admin, true],
    ['department', colleague, true],
    ['department', elsewhere, false],
    ['department', homeless, false],
    ['department', admin, true],
    ['installation', elsewhere, true],
    ['installation', homeless, true],
  ] as const)('canSeeProblem: %s problem, viewer %#', (visibility, viewer, expected) => {
    expect(canSeeProblem(viewer, problem(visibility))).toBe(expected)
  })

  test('a department problem whose owner had no department is seen by nobody else, even viewers without one', () => {
    expect(canSeeProblem(homeless, problem('department', null))).toBe(false)
    expect(canSeeProblem(owner, { ownerId: 4, visibility: 'department', departmentId: null })).toBe(false)
  })

  test('only the owner edits, not even an admin', () => {
    expect(canEditProblem(owner, problem('installation'))).toBe(true)
    expect(canEditProblem(colleague, problem('installation'))).toBe(false)
    expect(canEditProblem(admin, problem('private'))).toBe(false)
  })
})
