import type { CourseRole } from '#app/domain/permissions.ts'

export type NavUser = {
  name: string
  email: string
  isAdmin: boolean
  courses: { id: number; code: string; title: string; role: CourseRole }[]
}

export type NavItem = { to: string; label: string; end?: boolean }

/** The main navigation for what the person is: signed out, admin, staff or student. */
export function navFor(user: NavUser | null): NavItem[] {
  if (!user) return [{ to: '/sign-in', label: 'Sign in' }]
  const items: NavItem[] = [{ to: '/', label: 'Home', end: true }]
  for (const c of user.courses) items.push({ to: `/courses/${c.id}`, label: c.code })
  // The same rule as canUseBank in app/domain/permissions.ts.
  if (user.isAdmin || user.courses.some((c) => c.role === 'instructor'))
    items.push({ to: '/bank', label: 'Problem bank' })
  if (user.isAdmin) {
    items.push({ to: '/admin', label: 'Department', end: true })
    items.push({ to: '/admin/outbox', label: 'Outbox' })
  }
  return items
}
