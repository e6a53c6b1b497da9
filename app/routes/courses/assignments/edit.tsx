import { data, href, redirect } from 'react-router'
import { AssignmentForm } from '#app/components/assignment-form.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { requireIdParam } from '#app/lib/params.ts'
import { runAssignmentFormAction } from '#app/server/assignment-form.server.ts'
import { getEditAssignmentForm, listLockedItems, updateAssignment } from '#app/server/assignments.server.ts'
import { orErrorPage } from '#app/server/error-page.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/edit'
import { readFormData } from '#app/lib/form.ts'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Edit ${data.assignment.title} · Cyclewright` : 'Edit assignment · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor'])
  const form = await orErrorPage(getEditAssignmentForm(db(), { courseId, assignmentId, user }))
  return { course, ...form }
}

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { user } = await requireCourseRole(request, courseId, ['instructor'])
  const out = await orErrorPage(
    runAssignmentFormAction(await readFormData(request), {
      locked: await listLockedItems(db(), assignmentId),
      save: (state) => updateAssignment(db(), { courseId, assignmentId, user, state }),
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

export default function EditAssignmentRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, assignment, timeZone, choices, locked, stored } = loaderData
  const shown = actionData ?? { state: loaderData.state, fieldErrors: {}, formError: undefined, nonce: 'initial' }
  const ids = { courseId: String(course.id), assignmentId: String(assignment.id) }
  const base = href('/courses/:courseId/assignments/:assignmentId', ids)
  return (
    <div>
      <p className="text-sm text-muted">
        <a href={href('/courses/:courseId', ids)}>
          {course.code} {course.title}
        </a>{' '}
        · <a href={base}>{assignment.title}</a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Edit assignment</h1>
      <AssignmentForm
        key={shown.nonce}
        state={shown.state}
        fieldErrors={shown.fieldErrors}
        formError={shown.formError}
        choices={choices}
        locked={locked}
        stored={stored}
        timeZone={timeZone}
        submitLabel="Save changes"
        regradeTo={(position) =>
          href('/courses/:courseId/assignments/:assignmentId/problems/:position/regrade', {
            ...ids,
            position: String(position),
          })
        }
        cancelTo={base}
      />
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
