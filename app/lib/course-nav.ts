import type { CourseRole } from '#app/domain/permissions.ts'

export interface CourseNavItem {
  readonly to: string
  readonly label: string
  /** match the address exactly (the course's own page) */
  readonly end?: boolean
}

/** The pages of one course a member may open, in the order the course bar lists them. */
export function courseNavFor(courseId: number, role: CourseRole): CourseNavItem[] {
  const base = `/courses/${courseId}`
  const items: CourseNavItem[] = [{ to: base, label: 'Assignments', end: true }]
  if (role === 'student') {
    items.push({ to: `${base}/disputes`, label: 'Your disputes' })
    return items
  }
  items.push({ to: `${base}/gradebook`, label: 'Gradebook' }, { to: `${base}/people`, label: 'People' }, { to: `${base}/disputes`, label: 'Review queue' })
  if (role === 'instructor') items.push({ to: `${base}/audit`, label: 'Audit log' }, { to: `${base}/settings`, label: 'Settings' })
  return items
}
