import { expect, test } from 'vitest'
import { courseNavFor } from './course-nav.ts'

test('a student sees the assignments and their own disputes', () => {
  expect(courseNavFor(7, 'student').map((i) => i.label)).toEqual(['Assignments', 'Your disputes'])
})

test('a TA sees the staff pages but not the audit log or settings', () => {
  expect(courseNavFor(7, 'ta').map((i) => i.label)).toEqual(['Assignments', 'Gradebook', 'People', 'Review queue'])
})

test('an instructor sees every course page; the course page itself matches only exactly', () => {
  const items = courseNavFor(7, 'instructor')
  expect(items.map((i) => i.to)).toEqual([
    '/courses/7',
    '/courses/7/gradebook',
    '/courses/7/people',
    '/courses/7/disputes',
    '/courses/7/audit',
    '/courses/7/settings',
  ])
  expect(items[0]!.end).toBe(true)
})
