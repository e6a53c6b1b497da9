// Staff only (instructors and TAs of the course): the course gradebook, students × assignments.
// Filters and sort are URL search params (works without JavaScript); with it, the table
// follows GET /api/courses/:id/gradebook: every 1.5 s while answers are being graded, every
// 10 s otherwise.
import { data, href, useLocation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { CourseGradebookTable, DroppedStudents, GradebookFilters } from '#app/components/gradebook-table.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { useLiveGradebook } from '#app/lib/use-live-gradebook.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getCourseGradebook, gradebookViewProblem, readGradebookView } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/gradebook'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Gradebook: ${data.course.code} · Cyclewright` : 'Gradebook · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const url = new URL(request.url)
  const odd = gradebookViewProblem(url)
  if (odd) throw data(odd.message, { status: 400 })
  const gradebook = await getCourseGradebook(db(), courseId, readGradebookView(url))
  if (!gradebook) throw data('There is no such course.', { status: 404 })
  return { course, gradebook }
}

export default function CourseGradebookRoute({ loaderData }: Route.ComponentProps) {
  const { course } = loaderData
  const { search } = useLocation()
  const { gradebook, refreshError } = useLiveGradebook(
    ['course-gradebook', course.id],
    `${href('/api/courses/:courseId/gradebook', { courseId: String(course.id) })}${search}`,
    loaderData.gradebook,
  )
  return (
    <div>
      <h1 className="mt-1 text-3xl font-semibold">Gradebook</h1>
      <p className="mt-1 text-sm">
        {/* Plain links: the files are downloads, not pages for the router. */}
        <a
          href={href('/courses/:courseId/gradebook.csv', { courseId: String(course.id) })}
          className="underline"
          download
        >
          Download CSV
        </a>{' '}
        ·{' '}
        <a
          href={href('/courses/:courseId/gradebook.xlsx', { courseId: String(course.id) })}
          className="underline"
          download
        >
          Download XLSX
        </a>{' '}
        <span className="text-muted">(the same columns and figures as this table, every current student)</span>
      </p>
      <p className="mt-2 max-w-3xl text-sm" data-testid="counting-rule">
        {gradebook.rule}
      </p>
      <div aria-live="polite" className="mt-3 text-sm">
        {gradebook.pendingCount > 0 ? (
          <p>
            {gradebook.pendingCount} answer{gradebook.pendingCount === 1 ? ' is' : 's are'} being graded.
            <noscript> Reload the page to see the results.</noscript>
          </p>
        ) : null}
        {refreshError ? <p className="text-danger">{refreshError} The table shows the last grades read.</p> : null}
      </div>
      {gradebook.assignments.length === 0 ? (
        <p className="mt-6 text-muted">This course has no assignments yet.</p>
      ) : (
        <>
          <GradebookFilters view={gradebook.view} sections={gradebook.sections} />
          <CourseGradebookTable data={gradebook} />
          <DroppedStudents dropped={gradebook.dropped} timeZone={gradebook.course.timeZone} />
          <ul className="mt-3 text-xs text-muted">
            {gradebook.assignments.map((a) => (
              <li key={a.id}>
                {a.title}: due {formatInZone(a.dueAt, gradebook.course.timeZone)}
              </li>
            ))}
          </ul>
        </>
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
