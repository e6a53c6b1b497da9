// Staff only (instructors and TAs of the course): the course gradebook, students × assignments.
// Filters and sort are URL search params (works without JavaScript); with it, the table
// follows GET /api/courses/:id/gradebook: every 1.5 s while answers are being graded, every
// 10 s otherwise.
import { useQuery } from '@tanstack/react-query'
import { data, Link, useLocation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { CourseGradebookTable, GradebookFilters } from '#app/components/gradebook-table.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getCourseGradebook, readGradebookView, type CourseGradebook } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/gradebook'

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Gradebook: ${data.course.code} · Cyclewright` : 'Gradebook · Cyclewright' }]

const POLL_MS = 1500
const IDLE_POLL_MS = 10_000

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const gradebook = await getCourseGradebook(db(), courseId, readGradebookView(new URL(request.url)))
  if (!gradebook) throw data('There is no such course.', { status: 404 })
  return { course, gradebook }
}

async function fetchGradebook(courseId: number, search: string): Promise<CourseGradebook> {
  const res = await fetch(`/api/courses/${courseId}/gradebook${search}`, { headers: { Accept: 'application/json' } })
  if (!res.ok) throw new Error(`The gradebook could not be refreshed (${res.status}).`)
  return (await res.json()) as CourseGradebook
}

export default function CourseGradebookRoute({ loaderData }: Route.ComponentProps) {
  const { course } = loaderData
  const { search } = useLocation()
  const live = useQuery({
    queryKey: ['course-gradebook', course.id, search],
    queryFn: () => fetchGradebook(course.id, search),
    initialData: loaderData.gradebook,
    // The loader just read these grades; no need to ask again at once.
    staleTime: POLL_MS,
    // Quickly while answers are being graded; otherwise now and then, so answers submitted
    // after the page opened appear too. Both stop while the tab is hidden (TanStack's default).
    refetchInterval: (q) => ((q.state.data?.pendingCount ?? 0) > 0 ? POLL_MS : IDLE_POLL_MS),
  })
  const gradebook = live.data
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={`/courses/${course.id}`}>
          {course.code} {course.title}
        </Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Gradebook</h1>
      <p className="mt-1 text-sm">
        {/* A plain link: the CSV is a file download, not a page for the router. */}
        <a href={`/courses/${course.id}/gradebook.csv`} className="underline" download>
          Download CSV
        </a>
      </p>
      <div aria-live="polite" className="mt-3 text-sm">
        {gradebook.pendingCount > 0 ? (
          <p>
            {gradebook.pendingCount} answer{gradebook.pendingCount === 1 ? ' is' : 's are'} being graded.
            <noscript> Reload the page to see the results.</noscript>
          </p>
        ) : null}
        {live.isError ? <p className="text-danger">{live.error.message} The table shows the last grades read.</p> : null}
      </div>
      {gradebook.assignments.length === 0 ? (
        <p className="mt-6 text-muted">This course has no assignments yet.</p>
      ) : (
        <>
          <GradebookFilters view={gradebook.view} sections={gradebook.sections} />
          <CourseGradebookTable data={gradebook} />
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
