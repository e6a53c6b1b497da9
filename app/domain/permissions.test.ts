import { describe, expect, test } from 'vitest'
import { canInvite, canReadOutbox, canSeeCourseAsStaff, primaryRole, type Actor, type CourseRole } from './permissions.ts'

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
