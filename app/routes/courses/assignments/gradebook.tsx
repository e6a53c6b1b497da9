// Staff only (instructors and TAs of the course): an assignment's gradebook. Filters, sort
// and expansion are URL search params, so the page works without JavaScript; with it, the
// table follows GET /api/assignments/:id/gradebook: every 1.5 s while answers are being graded,
// every 10 s otherwise.
import { useQuery } from '@tanstack/react-query'
import { data, Link, useLocation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { AssignmentGradebookTable, ExpandLink, GradebookFilters } from '#app/components/gradebook-table.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAssignmentGradebook, readGradebookView, type AssignmentGradebook } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/gradebook'

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Gradebook: ${data.gradebook.assignment.title} · Cyclewright` : 'Gradebook · Cyclewright' }]

/** How often the table asks for fresh grades while any answer is waiting for the grader. */
const POLL_MS = 1500
const IDLE_POLL_MS = 10_000

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const gradebook = await getAssignmentGradebook(db(), { assignmentId, courseId, view: readGradebookView(new URL(request.url)) })
  if (!gradebook) throw data('There is no such assignment in this course.', { status: 404 })
  return { course, gradebook }
}

async function fetchGradebook(assignmentId: number, search: string): Promise<AssignmentGradebook> {
  const res = await fetch(`/api/assignments/${assignmentId}/gradebook${search}`, { headers: { Accept: 'application/json' } })
  if (!res.ok) throw new Error(`The gradebook could not be refreshed (${res.status}).`)
  return (await res.json()) as AssignmentGradebook
}

export default function AssignmentGradebookRoute({ loaderData }: Route.ComponentProps) {
  const { course } = loaderData
  const { search } = useLocation()
  const id = loaderData.gradebook.assignment.id
  const live = useQuery({
    queryKey: ['assignment-gradebook', id, search],
    queryFn: () => fetchGradebook(id, search),
    initialData: loaderData.gradebook,
    // The loader just read these grades; no need to ask again at once.
    staleTime: POLL_MS,
    // Quickly while answers are being graded; otherwise now and then, so answers submitted
    // after the page opened appear too. Both stop while the tab is hidden (TanStack's default).
    refetchInterval: (q) => ((q.state.data?.pendingCount ?? 0) > 0 ? POLL_MS : IDLE_POLL_MS),
  })
  const gradebook = live.data
  const { assignment } = gradebook
  const base = `/courses/${course.id}/assignments/${assignment.id}`
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={`/courses/${course.id}`}>
          {course.code} {course.title}
        </Link>{' '}
        · <Link to={base}>{assignment.title}</Link> · <Link to={`/courses/${course.id}/gradebook`}>Course gradebook</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Gradebook: {assignment.title}</h1>
      <p className="mt-1 text-sm text-muted">
        Due {formatInZone(assignment.dueAt, assignment.timeZone)} · {assignment.points} points · {assignment.attemptsPerFind} attempts per question ·{' '}
        <Link to={`${base}/statistics`} className="underline">
          Statistics
        </Link>
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
      <GradebookFilters view={gradebook.view} sections={gradebook.sections} />
      {gradebook.items.length === 0 ? (
        <p className="mt-6 text-muted">This assignment has no problems yet.</p>
      ) : (
        <>
          <p className="mt-4">
            <ExpandLink view={gradebook.view} />
          </p>
          <AssignmentGradebookTable data={gradebook} basePath={base} />
        </>
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
