import { Link } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { roleLabels } from '#app/domain/permissions.ts'
import { conventionText } from '#app/lib/conventions.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { countMembersByRole } from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/$courseId'

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `${data.course.code} · Cyclewright` : 'Course · Cyclewright' }]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  const counts = course.role === 'student' ? null : await countMembersByRole(db(), courseId)
  return { course, counts }
}

export default function CourseRoute({ loaderData }: Route.ComponentProps) {
  const { course, counts } = loaderData
  const convention = conventionText[course.signConvention]
  const staff = course.role !== 'student'
  return (
    <div>
      <p className="text-sm text-muted">
        {course.departmentName} · {course.termName} · you are {roleLabels[course.role].toLowerCase()}
      </p>
      <h1 className="mt-1 text-3xl font-semibold">
        {course.code} {course.title}
      </h1>
      <dl className="mt-6 grid max-w-3xl gap-4 sm:grid-cols-3">
        <div className="rounded-lg border border-line bg-white p-4">
          <dt className="text-xs font-semibold tracking-wide text-muted uppercase">Sign convention</dt>
          <dd className="mt-1">
            {convention.label}: <span className="font-mono">{convention.equation}</span>
            <span className="block text-sm text-muted">{convention.meaning}</span>
          </dd>
        </div>
        <div className="rounded-lg border border-line bg-white p-4">
          <dt className="text-xs font-semibold tracking-wide text-muted uppercase">Time zone</dt>
          <dd className="mt-1">{course.timeZone}</dd>
        </div>
        {counts ? (
          <div className="rounded-lg border border-line bg-white p-4">
            <dt className="text-xs font-semibold tracking-wide text-muted uppercase">People</dt>
            <dd className="mt-1">
              {counts.student ?? 0} students, {(counts.instructor ?? 0) + (counts.ta ?? 0)} staff
            </dd>
          </div>
        ) : null}
      </dl>
      {staff ? (
        <p className="mt-6">
          <Link to={`/courses/${course.id}/people`}>People and invitations</Link>
        </p>
      ) : null}
      <section className="mt-8 rounded-lg border border-dashed border-line bg-white p-8 text-center text-muted" aria-label="Assignments">
        {staff ? 'No assignments yet. Assignments built from the problem bank will be listed here.' : 'No assignments have been set for you yet.'}
      </section>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
