import { Link, redirect } from 'react-router'
import { primaryRole, roleLabels } from '#app/domain/permissions.ts'
import { conventionText } from '#app/lib/conventions.ts'
import { getUser } from '#app/server/auth.server.ts'
import { toActor } from '#app/server/users.server.ts'
import type { Route } from './+types/home'

export const meta: Route.MetaFunction = () => [{ title: 'Home · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request)
  if (!user) throw redirect('/sign-in')
  return { name: user.name, role: primaryRole(toActor(user)), courses: user.courses }
}

const intros = {
  admin: 'You look after the department: its courses, people and grade exports.',
  instructor: 'Your courses. Build problem banks, set assignments and follow your gradebooks.',
  ta: 'The courses you assist in. Review disputed answers and follow the gradebooks.',
  student: 'Your courses and the problems set for you.',
  none: 'You are not in any course yet. When an instructor invites you, the course appears here.',
} as const

const headings = {
  admin: 'Department overview',
  instructor: 'Teaching',
  ta: 'Assisting',
  student: 'Your courses',
  none: 'Welcome',
} as const

export default function HomeRoute({ loaderData }: Route.ComponentProps) {
  const { name, role, courses } = loaderData
  return (
    <div data-home-role={role}>
      <p className="text-sm text-muted">Signed in as {name}</p>
      <h1 className="mt-1 text-3xl font-semibold">{headings[role]}</h1>
      <p className="mt-2 max-w-2xl text-muted">{intros[role]}</p>
      {role === 'instructor' ? (
        <p className="mt-4">
          <Link to="/bank">Your problem bank</Link>: write randomised problems once and reuse them in any course.
        </p>
      ) : null}
      {role === 'admin' ? (
        <p className="mt-4 flex gap-4">
          <Link to="/admin">All courses of the department</Link>
          <Link to="/admin/outbox">Outbox (mail sent by the demo)</Link>
        </p>
      ) : null}
      {courses.length === 0 ? (
        role === 'admin' ? null : (
          <div className="mt-8 rounded-lg border border-dashed border-line bg-white p-8 text-center text-muted">No courses yet.</div>
        )
      ) : (
        <ul className="mt-8 grid gap-4 sm:grid-cols-2" aria-label="Courses">
          {courses.map((c) => (
            <li key={c.id} className="rounded-lg border border-line bg-white p-5 shadow-sm">
              <p className="text-xs font-semibold tracking-wide text-muted uppercase">
                {c.termName} · {roleLabels[c.role]}
              </p>
              <h2 className="mt-1 text-xl font-semibold">
                <Link to={`/courses/${c.id}`}>
                  {c.code} {c.title}
                </Link>
              </h2>
              <p className="mt-2 text-sm text-muted">
                {conventionText[c.signConvention].label}: {conventionText[c.signConvention].equation}
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  )
}
