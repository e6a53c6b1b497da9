import { data, Form, href, Link, useNavigation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { formatCalendarDate } from '#app/lib/calendar-dates.ts'
import { conventionText } from '#app/lib/conventions.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { type FieldErrors, noFieldErrors, noValues, parseForm, readFormData } from '#app/lib/form.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import {
  adminCoursePage,
  AssignInstructorFormSchema,
  assignInstructor,
  formValues,
} from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/$courseId'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `${data.course.code} · Department · Cyclewright` : 'Course · Cyclewright' },
]

async function loadPage(courseId: number) {
  const page = await adminCoursePage(db(), courseId)
  if (!page) throw data('There is no such course.', { status: 404 })
  return page
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  await requireAdmin(request)
  const page = await loadPage(courseId)
  return { ...page, created: new URL(request.url).searchParams.get('created') === '1' }
}

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const user = await requireAdmin(request)
  await loadPage(courseId)
  const formData = await readFormData(request)
  const form = parseForm(formData, AssignInstructorFormSchema)
  if (!form.ok) return data({ done: null, fieldErrors: form.fieldErrors, values: form.values }, { status: 400 })
  try {
    const done = await assignInstructor(db(), { actorId: user.id, courseId, email: form.value.email })
    if (!done.ok)
      return data({ done: null, fieldErrors: done.fieldErrors, values: formValues(formData) }, { status: 400 })
    return { done, fieldErrors: noFieldErrors, values: noValues }
  } catch (e) {
    console.error('Assigning an instructor failed:', e)
    return data(
      {
        done: null,
        fieldErrors: {
          email: 'The invitation could not be sent just now. Please try again in a minute.',
        } satisfies FieldErrors,
        values: formValues(formData),
      },
      { status: 503 },
    )
  }
}

const OUTCOME_WORDS = {
  added: (who: string) => `${who} is now an instructor of this course.`,
  already: (who: string) => `${who} is already an instructor of this course.`,
  invited: (who: string) =>
    `An invitation to join as instructor was sent to ${who}: nobody has signed in with that address yet.`,
} as const

export default function AdminCourseRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, instructors, invitations, assignments, counts, created } = loaderData
  const busy = useNavigation().state === 'submitting'
  const zone = course.timeZone
  const fmt = (d: Date | string) => formatInZone(d, zone, { withZone: false })
  const done = actionData?.done
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={href('/admin')}>Department</Link> · {course.termName}
      </p>
      <h1 className="mt-1 text-3xl font-semibold">
        {course.code} {course.title}
      </h1>
      {created ? (
        <Notice tone="ok" className="mt-4">
          The course was created. Make someone its instructor below.
        </Notice>
      ) : null}
      <dl className="mt-6 grid max-w-4xl gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <div className="rounded-lg border border-line bg-white p-4">
          <dt className="text-xs font-semibold tracking-wide text-muted uppercase">Term</dt>
          <dd className="mt-1">
            {course.termName}
            <span className="block text-sm text-muted">
              {formatCalendarDate(course.termStartsOn)} to {formatCalendarDate(course.termEndsOn)}
            </span>
          </dd>
        </div>
        <div className="rounded-lg border border-line bg-white p-4">
          <dt className="text-xs font-semibold tracking-wide text-muted uppercase">Sign convention</dt>
          <dd className="mt-1">
            {conventionText[course.signConvention].label}:{' '}
            <span className="font-mono">{conventionText[course.signConvention].equation}</span>
          </dd>
        </div>
        <div className="rounded-lg border border-line bg-white p-4">
          <dt className="text-xs font-semibold tracking-wide text-muted uppercase">Time zone</dt>
          <dd className="mt-1">{zone}</dd>
        </div>
        <div className="rounded-lg border border-line bg-white p-4">
          <dt className="text-xs font-semibold tracking-wide text-muted uppercase">People</dt>
          <dd className="mt-1">
            {counts.student ?? 0} students, {counts.ta ?? 0} teaching assistants
          </dd>
        </div>
      </dl>
      <p className="mt-4 text-sm text-muted">
        Created {fmt(course.createdAt)} ({zone}).
        {course.copiedFrom ? (
          <>
            {' '}
            Copied from{' '}
            <Link to={href('/admin/courses/:courseId', { courseId: String(course.copiedFrom.id) })}>
              {course.copiedFrom.code}
            </Link>{' '}
            of {course.copiedFrom.termName}.
          </>
        ) : null}
      </p>

      <section aria-labelledby="instructors-title" className="mt-8 max-w-3xl">
        <h2 id="instructors-title" className="text-xl font-semibold">
          Instructors ({instructors.length})
        </h2>
        {instructors.length === 0 ? (
          <p className="mt-3 rounded-lg border border-dashed border-line bg-white p-6 text-center text-muted">
            No instructors yet — add the first below.
          </p>
        ) : (
          <ul className="mt-3 divide-y divide-line rounded-lg border border-line bg-white">
            {instructors.map((i) => (
              <li key={i.userId} className="flex flex-wrap justify-between gap-x-4 px-4 py-2">
                <span>{i.name}</span>
                <span className="break-all text-muted">
                  {i.email}
                  {i.hasPassword ? '' : ' (has not set a password yet)'}
                </span>
              </li>
            ))}
          </ul>
        )}
        {invitations.length > 0 ? (
          <>
            <h3 className="mt-6 font-semibold">Invitations waiting to be accepted</h3>
            <ul className="mt-2 divide-y divide-line rounded-lg border border-line bg-white text-sm">
              {invitations.map((inv) => (
                <li key={inv.id} className="flex flex-wrap justify-between gap-x-4 px-4 py-2">
                  <span className="break-all">{inv.email}</span>
                  <span className="text-muted">
                    sent {fmt(inv.sentAt)}, expires {fmt(inv.expiresAt)} ({zone})
                  </span>
                </li>
              ))}
            </ul>
          </>
        ) : null}
        <div className="mt-6 rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6">
          <h3 className="text-lg font-semibold">Add an instructor</h3>
          <p className="mt-1 text-sm text-muted">
            Someone with an account becomes an instructor at once. Any other address gets an e-mail invitation to join
            as instructor (the link works once and expires in 7 days).
          </p>
          {done ? (
            <Notice tone="ok" className="mt-4">
              {OUTCOME_WORDS[done.outcome](done.name ? `${done.name} (${done.email})` : done.email)}
            </Notice>
          ) : null}
          <Form method="post" noValidate className="mt-4 grid gap-4 sm:grid-cols-[1fr_auto] sm:items-end">
            <Field
              label="Instructor’s e-mail address"
              name="email"
              type="email"
              required
              autoComplete="off"
              defaultValue={actionData?.values?.email}
              error={actionData?.fieldErrors?.email}
            />
            <Button type="submit" disabled={busy}>
              {busy ? 'Adding…' : 'Add instructor'}
            </Button>
          </Form>
        </div>
      </section>

      <section aria-labelledby="assignments-title" className="mt-8">
        <h2 id="assignments-title" className="text-xl font-semibold">
          Assignments ({assignments.length})
        </h2>
        {assignments.length === 0 ? (
          <p className="mt-3 rounded-lg border border-dashed border-line bg-white p-6 text-center text-muted">
            No assignments yet. The instructors set them on the course’s own page.
          </p>
        ) : (
          <div className="mt-3 overflow-x-auto rounded-lg border border-line bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Assignments, by due date; times in {zone}</caption>
              <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-4 py-2">
                    Title
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Opens ({zone})
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Due ({zone})
                  </th>
                </tr>
              </thead>
              <tbody>
                {assignments.map((a) => (
                  <tr key={a.id} className="border-t border-line">
                    <th scope="row" className="px-4 py-2 font-normal">
                      {a.title}
                    </th>
                    <td className="px-4 py-2 whitespace-nowrap">{fmt(a.opensAt)}</td>
                    <td className="px-4 py-2 whitespace-nowrap">{fmt(a.dueAt)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
