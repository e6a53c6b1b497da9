import { formatDistanceStrict } from 'date-fns'
import { Form, href, Link, useNavigation } from 'react-router'
import { z } from 'zod'
import {
  DISPUTE_STATUS_MEANING,
  DISPUTE_STATUS_WORDS,
  DisputeStatusBadge,
  disputeOutcomeText,
} from '#app/components/dispute-status.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { isKeyOf } from '#app/lib/guards.ts'
import { Button } from '#app/components/ui/button.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { listAssignmentsForCourse } from '#app/server/assignments.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { listDisputes, type DisputeListRow } from '#app/server/disputes.server.ts'
import type { Route } from './+types/index'
import { EmptyState, Table, TableHead } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.staff ? 'Review queue' : 'Your disputes'} · Cyclewright` },
]

const STATUSES = ['open', 'upheld', 'adjusted', 'rejected', 'all'] as const

// Search params are typed by hand into the address bar too: anything odd falls back to "no filter".
const QuerySchema = z.object({
  assignment: z.coerce.number().int().positive().max(2_147_483_647).optional().catch(undefined),
  status: z.enum(STATUSES).catch('open'),
  age: z.coerce.number().int().min(0).max(3650).optional().catch(undefined),
})

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  const staff = course.role !== 'student'
  const viewer = { id: user.id, isAdmin: user.isAdmin, role: course.role }
  const now = new Date()
  const search = new URL(request.url).searchParams
  const query = QuerySchema.parse({
    assignment: search.get('assignment') || undefined,
    status: search.get('status') || 'open',
    age: search.get('age') || undefined,
  })
  const filters = staff
    ? { assignmentId: query.assignment, status: query.status, olderThanDays: query.age || undefined }
    : { status: 'all' as const }
  const rows = await listDisputes(db(), { courseId, viewer, filters, now })
  const assignments = staff
    ? (await listAssignmentsForCourse(db(), { courseId, role: course.role, userId: user.id, now })).map((a) => ({
        id: a.id,
        title: a.title,
      }))
    : []
  return {
    course,
    staff,
    query: { assignment: query.assignment ?? null, status: query.status, age: query.age ?? null },
    assignments,
    rows: rows.map((r) => ({ ...r, age: formatDistanceStrict(new Date(r.createdAt), now) })),
  }
}

type Row = DisputeListRow & { age: string }

function excerpt(text: string, max = 140): string {
  const flat = text.replace(/\s+/g, ' ').trim()
  return flat.length <= max ? flat : `${flat.slice(0, max - 1).trimEnd()}…`
}

export default function DisputesRoute({ loaderData }: Route.ComponentProps) {
  const { staff } = loaderData
  return <div>{staff ? <StaffQueue data={loaderData} /> : <StudentList data={loaderData} />}</div>
}

type Data = Route.ComponentProps['loaderData']

function StaffQueue({ data }: { data: Data }) {
  const { course, query, assignments, rows } = data
  const navigation = useNavigation()
  const filtering =
    navigation.state === 'loading' &&
    navigation.location?.pathname === href('/courses/:courseId/disputes', { courseId: String(course.id) })
  const filtered = query.assignment !== null || query.age !== null || query.status !== 'open'
  const assignmentTitle = assignments.find((a) => a.id === query.assignment)?.title
  return (
    <>
      <h1 className="mt-1 text-3xl font-semibold">Review queue</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Students’ disputes of a verdict, oldest first. Open one to see the student’s answer, their givens, the key and
        their file, and to resolve it.
      </p>
      <Form
        method="get"
        className="mt-6 flex flex-wrap items-end gap-4 rounded-lg border border-line bg-white p-4 shadow-sm"
        aria-label="Filter the review queue"
      >
        <div className="flex flex-col gap-1">
          <label htmlFor="q-assignment" className="text-sm font-medium">
            Assignment
          </label>
          <select
            id="q-assignment"
            name="assignment"
            defaultValue={query.assignment ?? ''}
            className="rounded-md border border-line bg-white px-3 py-2"
          >
            <option value="">All assignments</option>
            {assignments.map((a) => (
              <option key={a.id} value={a.id}>
                {a.title}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="q-status" className="text-sm font-medium">
            Status
          </label>
          <select
            id="q-status"
            name="status"
            defaultValue={query.status}
            className="rounded-md border border-line bg-white px-3 py-2"
          >
            {STATUSES.map((s) => (
              <option key={s} value={s}>
                {s === 'all' ? 'Any status' : DISPUTE_STATUS_WORDS[s]}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="q-age" className="text-sm font-medium">
            Older than <span className="font-normal text-muted">(days)</span>
          </label>
          <input
            id="q-age"
            name="age"
            type="number"
            inputMode="numeric"
            min={0}
            max={3650}
            defaultValue={query.age ?? ''}
            className="w-28 rounded-md border border-line bg-white px-3 py-2"
          />
        </div>
        <Button type="submit" variant="secondary" disabled={filtering}>
          {filtering ? 'Filtering…' : 'Filter'}
        </Button>
        {filtered ? (
          <Link to={href('/courses/:courseId/disputes', { courseId: String(course.id) })}>
            Show open disputes of all assignments
          </Link>
        ) : null}
      </Form>
      {rows.length === 0 ? (
        <EmptyState className="mt-6">
          {!filtered
            ? 'No open disputes — nothing waits for review.'
            : `No disputes match these filters${assignmentTitle ? ` in ${assignmentTitle}` : ''}.`}
        </EmptyState>
      ) : (
        <div className="relative mt-6 overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-left text-sm">
            {/* On a phone the caption stays in view while the table scrolls, and so does the Review link. */}
            <caption className="px-4 py-2 text-left text-sm text-muted max-sm:sticky max-sm:left-0 max-sm:max-w-[calc(100vw-2rem-2px)]">
              {rows.length} {rows.length === 1 ? 'dispute' : 'disputes'}
              {query.status === 'all' ? '' : `, ${DISPUTE_STATUS_WORDS[query.status].toLowerCase()}`}
              {assignmentTitle ? `, in ${assignmentTitle}` : ''}
              {query.age ? `, older than ${query.age} ${query.age === 1 ? 'day' : 'days'}` : ''}; oldest first; times in{' '}
              {course.timeZone}
            </caption>
            <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-4 py-2">
                  Raised
                </th>
                <th scope="col" className="px-4 py-2">
                  Student
                </th>
                <th scope="col" className="px-4 py-2">
                  Assignment, problem, find
                </th>
                <th scope="col" className="px-4 py-2">
                  Reason
                </th>
                <th scope="col" className="px-4 py-2">
                  File
                </th>
                <th scope="col" className="px-4 py-2">
                  Status
                </th>
                <th scope="col" className="sticky right-0 bg-paper px-4 py-2 shadow-[-1px_0_0_var(--color-line)]">
                  <span className="sr-only">Open</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-line align-top">
                  <td className="px-4 py-2">
                    <span className="whitespace-nowrap">{r.age} ago</span>
                    <span className="block text-xs text-muted">{formatInZone(r.createdAt, course.timeZone)}</span>
                  </td>
                  <th scope="row" className="min-w-40 px-4 py-2 font-normal">
                    {r.student.name}
                    <span className="block text-xs [overflow-wrap:anywhere] text-muted">{r.student.email}</span>
                  </th>
                  <td className="min-w-48 px-4 py-2">
                    {r.assignmentTitle}
                    <span className="block text-xs text-muted">
                      Problem {r.position}: {r.problemTitle} · {r.findLabel} (<code>{r.findName}</code>)
                    </span>
                  </td>
                  <td className="max-w-xs min-w-56 px-4 py-2">{excerpt(r.reason)}</td>
                  <td className="px-4 py-2">{r.hasAttachment ? 'Yes' : 'No'}</td>
                  <td className="px-4 py-2">
                    <DisputeStatusBadge status={r.status} />
                    {disputeOutcomeText(r) ? (
                      <span className="block text-xs text-muted">{disputeOutcomeText(r)}</span>
                    ) : null}
                  </td>
                  <td className="sticky right-0 bg-white px-4 py-2 shadow-[-1px_0_0_var(--color-line)]">
                    <Link
                      to={href('/courses/:courseId/disputes/:disputeId', {
                        courseId: String(course.id),
                        disputeId: String(r.id),
                      })}
                      className="whitespace-nowrap"
                    >
                      {r.status === 'open' ? 'Review' : 'View'}
                      <span className="sr-only">
                        {' '}
                        the dispute of {r.student.name} on {r.findLabel}
                      </span>
                    </Link>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  )
}

function StudentList({ data }: { data: Data }) {
  const { course, rows } = data
  return (
    <>
      <h1 className="mt-1 text-3xl font-semibold">Your disputes</h1>
      <p className="mt-2 max-w-3xl text-muted">
        The verdicts you have disputed and what became of them. To dispute another answer, open its problem page once it
        is graded.
      </p>
      {rows.length === 0 ? (
        <EmptyState className="mt-6">You have not disputed any verdict in this course.</EmptyState>
      ) : (
        <Table boxClassName="mt-6" caption={<>Your disputes, oldest first; times in {course.timeZone}</>}>
          <TableHead>
            <tr>
              <th scope="col" className="px-4 py-2">
                Raised
              </th>
              <th scope="col" className="px-4 py-2">
                Problem and find
              </th>
              <th scope="col" className="px-4 py-2">
                Status
              </th>
              <th scope="col" className="px-4 py-2">
                Outcome
              </th>
              <th scope="col" className="px-4 py-2">
                <span className="sr-only">Details</span>
              </th>
            </tr>
          </TableHead>
          <tbody>
            {rows.map((r) => (
              <StudentRow key={r.id} row={r} courseId={course.id} timeZone={course.timeZone} />
            ))}
          </tbody>
        </Table>
      )}
    </>
  )
}

function StudentRow({ row: r, courseId, timeZone }: { row: Row; courseId: number; timeZone: string }) {
  const problemHref = href('/courses/:courseId/assignments/:assignmentId/problems/:position', {
    courseId: String(courseId),
    assignmentId: String(r.assignmentId),
    position: String(r.position),
  })
  return (
    <tr className="border-t border-line align-top">
      <td className="px-4 py-2">
        <span className="whitespace-nowrap">{r.age} ago</span>
        <span className="block text-xs text-muted">{formatInZone(r.createdAt, timeZone)}</span>
      </td>
      <th scope="row" className="px-4 py-2 font-normal">
        <Link to={problemHref}>
          {r.assignmentTitle}, problem {r.position}: {r.problemTitle}
        </Link>
        <span className="block text-xs text-muted">{r.findLabel}</span>
      </th>
      <td className="px-4 py-2">
        <DisputeStatusBadge status={r.status} />
        <span className="block text-xs text-muted">
          {isKeyOf(DISPUTE_STATUS_MEANING, r.status) ? DISPUTE_STATUS_MEANING[r.status] : null}
        </span>
      </td>
      <td className="px-4 py-2">
        {disputeOutcomeText(r) ?? '—'}
        {r.resolvedAt ? <span className="block text-xs text-muted">{formatInZone(r.resolvedAt, timeZone)}</span> : null}
      </td>
      <td className="px-4 py-2">
        <Link
          to={href('/courses/:courseId/disputes/:disputeId', { courseId: String(courseId), disputeId: String(r.id) })}
        >
          Details<span className="sr-only"> of your dispute on {r.findLabel}</span>
        </Link>
      </td>
    </tr>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
