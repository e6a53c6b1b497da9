import { href } from 'react-router'
import type { CourseRole } from '#app/domain/permissions.ts'

export interface CourseNavItem {
  readonly to: string
  readonly label: string
  /** match the address exactly (the course's own page) */
  readonly end?: boolean
}

/** The pages of one course a member may open, in the order the course bar lists them. */
export function courseNavFor(courseId: number, role: CourseRole): CourseNavItem[] {
  const p = { courseId: String(courseId) }
  const items: CourseNavItem[] = [{ to: href('/courses/:courseId', p), label: 'Assignments', end: true }]
  if (role === 'student') {
    items.push({ to: href('/courses/:courseId/disputes', p), label: 'Your disputes' })
    return items
  }
  items.push(
    { to: href('/courses/:courseId/gradebook', p), label: 'Gradebook' },
    { to: href('/courses/:courseId/people', p), label: 'People' },
    { to: href('/courses/:courseId/disputes', p), label: 'Review queue' },
  )
  if (role === 'instructor')
    items.push(
      { to: href('/courses/:courseId/audit', p), label: 'Audit log' },
      { to: href('/courses/:courseId/settings', p), label: 'Settings' },
    )
  return items
}
