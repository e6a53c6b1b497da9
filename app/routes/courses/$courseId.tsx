import { href, Link } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { windowMessage } from '#app/domain/assignments/policy.ts'
import { roleLabels } from '#app/domain/permissions.ts'
import { conventionText } from '#app/lib/conventions.ts'
import { formatPoints } from '#app/lib/points.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { listAssignmentsForCourse, type AssignmentListRow } from '#app/server/assignments.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { countMembersByRole } from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { listDisputes } from '#app/server/disputes.server.ts'
import type { Route } from './+types/$courseId'
import { EmptyState, Table, TableHead } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `${data.course.code} · Cyclewright` : 'Course · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  const counts = course.role === 'student' ? null : await countMembersByRole(db(), courseId)
  const assignments = await listAssignmentsForCourse(db(), { courseId, role: course.role, userId: user.id })
  const openDisputes =
    course.role === 'student'
      ? null
      : (
          await listDisputes(db(), {
            courseId,
            viewer: { id: user.id, isAdmin: user.isAdmin, role: course.role },
            filters: { status: 'open' },
          })
        ).length
  return { course, counts, assignments, openDisputes }
}

export default function CourseRoute({ loaderData }: Route.ComponentProps) {
  const { course, counts, assignments, openDisputes } = loaderData
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
      <dl className="mt-6 grid max-w-4xl gap-4 sm:grid-cols-2 lg:grid-cols-4">
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
        {openDisputes !== null ? (
          <div className="rounded-lg border border-line bg-white p-4">
            <dt className="text-xs font-semibold tracking-wide text-muted uppercase">Disputes</dt>
            <dd className="mt-1">
              <Link to={href('/courses/:courseId/disputes', { courseId: String(course.id) })}>
                {openDisputes === 1 ? '1 open dispute' : `${openDisputes} open disputes`}
              </Link>
            </dd>
          </div>
        ) : null}
        {counts ? (
          <div className="rounded-lg border border-line bg-white p-4">
            <dt className="text-xs font-semibold tracking-wide text-muted uppercase">People</dt>
            <dd className="mt-1">
              {counts.student ?? 0} students, {(counts.instructor ?? 0) + (counts.ta ?? 0)} staff
            </dd>
          </div>
        ) : null}
      </dl>
      <Assignments
        courseId={course.id}
        timeZone={course.timeZone}
        rows={assignments}
        staff={staff}
        instructor={course.role === 'instructor'}
      />
    </div>
  )
}

function Assignments({
  courseId,
  timeZone,
  rows,
  staff,
  instructor,
}: {
  courseId: number
  timeZone: string
  rows: AssignmentListRow[]
  staff: boolean
  instructor: boolean
}) {
  const fmt = (d: Date) => formatInZone(d, timeZone)
  return (
    <section aria-labelledby="assignments-title" className="mt-8">
      <div className="flex flex-wrap items-baseline justify-between gap-4">
        <h2 id="assignments-title" className="text-xl font-semibold">
          Assignments
        </h2>
        {staff ? (
          <p className="flex flex-wrap gap-4 text-sm">
            {instructor ? (
              <Link to={href('/courses/:courseId/assignments/new', { courseId: String(courseId) })}>
                New assignment
              </Link>
            ) : null}
            <Link to={href('/courses/:courseId/gradebook', { courseId: String(courseId) })}>Course gradebook</Link>
            <a href={href('/courses/:courseId/gradebook.csv', { courseId: String(courseId) })} download>
              Download grades (CSV)
            </a>
          </p>
        ) : null}
      </div>
      {rows.length === 0 ? (
        <EmptyState className="mt-4">
          {staff
            ? instructor
              ? 'No assignments yet. Create one from the problems in your bank.'
              : 'No assignments yet. The instructors will set them here.'
            : 'No assignments are open for you yet.'}
        </EmptyState>
      ) : (
        <Table boxClassName="mt-4" caption={<>Assignments, by due date; times in {timeZone}</>}>
          <TableHead>
            <tr>
              <th scope="col" className="px-4 py-2">
                Title
              </th>
              <th scope="col" className="px-4 py-2">
                Opens
              </th>
              <th scope="col" className="px-4 py-2">
                Due
              </th>
              {staff ? (
                <>
                  <th scope="col" className="px-4 py-2">
                    Problems
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Pages
                  </th>
                </>
              ) : (
                <>
                  <th scope="col" className="px-4 py-2">
                    Your score
                  </th>
                  <th scope="col" className="px-4 py-2">
                    State
                  </th>
                </>
              )}
            </tr>
          </TableHead>
          <tbody>
            {rows.map((a) => (
              <tr key={a.id} className="border-t border-line align-top">
                <th scope="row" className="min-w-40 px-4 py-2 font-normal">
                  <Link
                    to={href('/courses/:courseId/assignments/:assignmentId', {
                      courseId: String(courseId),
                      assignmentId: String(a.id),
                    })}
                  >
                    {a.title}
                  </Link>
                </th>
                <td className="px-4 py-2">{fmt(a.opensAt)}</td>
                <td className="px-4 py-2">
                  {fmt(a.dueAt)}
                  {a.mine?.extended ? <span className="block text-xs text-muted">your extension</span> : null}
                </td>
                {staff ? (
                  <>
                    <td className="px-4 py-2">
                      {a.itemCount} ({formatPoints(a.maxScore)} points)
                    </td>
                    <td className="px-4 py-2">
                      <span className="flex flex-wrap gap-3">
                        <Link
                          to={href('/courses/:courseId/assignments/:assignmentId', {
                            courseId: String(courseId),
                            assignmentId: String(a.id),
                          })}
                        >
                          Overview<span className="sr-only"> of {a.title}</span>
                        </Link>
                        <Link
                          to={href('/courses/:courseId/assignments/:assignmentId/gradebook', {
                            courseId: String(courseId),
                            assignmentId: String(a.id),
                          })}
                        >
                          Gradebook<span className="sr-only"> of {a.title}</span>
                        </Link>
                      </span>
                    </td>
                  </>
                ) : (
                  <>
                    <td className="px-4 py-2">
                      {a.mine?.score ?? 0} of {a.maxScore}
                      {a.mine && a.mine.pending > 0 ? (
                        <span className="block text-xs text-muted">some answers are being graded</span>
                      ) : null}
                      {a.gradesReleasedAt ? <span className="block text-xs text-muted">grades released</span> : null}
                    </td>
                    <td className="px-4 py-2">{a.mine ? windowMessage(a.mine.window, fmt) : null}</td>
                  </>
                )}
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </section>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
