// Staff only (instructors and TAs of the course): an assignment's gradebook. Filters, sort
// and expansion are URL search params, so the page works without JavaScript; with it, the
// table follows GET /api/assignments/:id/gradebook: every 1.5 s while answers are being graded,
// every 10 s otherwise.
import { data, href, Link, useLocation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import {
  AssignmentGradebookTable,
  DroppedStudents,
  ExpandLink,
  GradebookFilters,
} from '#app/components/gradebook-table.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { formatPoints } from '#app/lib/points.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { useLiveGradebook } from '#app/lib/use-live-gradebook.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAssignmentGradebook, gradebookViewProblem, readGradebookView } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/gradebook'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Gradebook: ${data.gradebook.assignment.title} · Cyclewright` : 'Gradebook · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const url = new URL(request.url)
  const odd = gradebookViewProblem(url)
  if (odd) throw data(odd.message, { status: 400 })
  const gradebook = await getAssignmentGradebook(db(), { assignmentId, courseId, view: readGradebookView(url) })
  if (!gradebook) throw data('There is no such assignment in this course.', { status: 404 })
  return { course, gradebook }
}

export default function AssignmentGradebookRoute({ loaderData }: Route.ComponentProps) {
  const { course } = loaderData
  const { search } = useLocation()
  const id = loaderData.gradebook.assignment.id
  const { gradebook, refreshError } = useLiveGradebook(
    ['assignment-gradebook', id],
    `${href('/api/assignments/:assignmentId/gradebook', { assignmentId: String(id) })}${search}`,
    loaderData.gradebook,
  )
  const { assignment } = gradebook
  const base = href('/courses/:courseId/assignments/:assignmentId', {
    courseId: String(course.id),
    assignmentId: String(assignment.id),
  })
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={base}>{assignment.title}</Link> ·{' '}
        <Link to={href('/courses/:courseId/gradebook', { courseId: String(course.id) })}>Course gradebook</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Gradebook: {assignment.title}</h1>
      <p className="mt-1 text-sm text-muted">
        Due {formatInZone(assignment.dueAt, assignment.timeZone)}
        {assignment.stage === 'due' ? '' : ' (not due yet: not counted in the course total)'} ·{' '}
        {formatPoints(assignment.points)} points · {assignment.attemptsPerFind} attempts per question ·{' '}
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
        {refreshError ? <p className="text-danger">{refreshError} The table shows the last grades read.</p> : null}
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
      <DroppedStudents dropped={gradebook.dropped} timeZone={assignment.timeZone} />
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
