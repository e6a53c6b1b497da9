import { data, href, redirect } from 'react-router'
import { AssignmentForm } from '#app/components/assignment-form.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { requireIdParam } from '#app/lib/params.ts'
import { runAssignmentFormAction } from '#app/server/assignment-form.server.ts'
import { createAssignment, getNewAssignmentForm } from '#app/server/assignments.server.ts'
import { orErrorPage } from '#app/server/error-page.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/new'
import { readFormData } from '#app/lib/form.ts'

export const meta: Route.MetaFunction = () => [{ title: 'New assignment · Cyclewright' }]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor'])
  const form = await orErrorPage(getNewAssignmentForm(db(), { courseId, user }))
  return { course, ...form }
}

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user } = await requireCourseRole(request, courseId, ['instructor'])
  const out = await orErrorPage(
    runAssignmentFormAction(await readFormData(request), {
      locked: [],
      save: (state) => createAssignment(db(), { courseId, user, state }),
    }),
  )
  if (out.status === 'saved')
    return redirect(
      href('/courses/:courseId/assignments/:assignmentId', {
        courseId: String(courseId),
        assignmentId: String(out.assignmentId),
      }),
    )
  return data(out.answer, { status: out.status })
}

export default function NewAssignmentRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, timeZone, choices, locked } = loaderData
  const shown = actionData ?? { state: loaderData.state, fieldErrors: {}, formError: undefined, nonce: 'initial' }
  return (
    <div>
      <p className="text-sm text-muted">
        <a href={href('/courses/:courseId', { courseId: String(course.id) })}>
          {course.code} {course.title}
        </a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">New assignment</h1>
      <AssignmentForm
        key={shown.nonce}
        state={shown.state}
        fieldErrors={shown.fieldErrors}
        formError={shown.formError}
        choices={choices}
        locked={locked}
        timeZone={timeZone}
        submitLabel="Create assignment"
        cancelTo={href('/courses/:courseId', { courseId: String(course.id) })}
      />
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
