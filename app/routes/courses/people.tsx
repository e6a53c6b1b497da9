import { data, Form, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { canInvite, roleLabels } from '#app/domain/permissions.ts'
import { type FieldErrors, noFieldErrors, noValues, parseForm, readFormData } from '#app/lib/form.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { EmailSchema } from '#app/lib/validation.ts'
import { inviteToCourse } from '#app/server/access-links.server.ts'
import { forbidden, requireCourseRole } from '#app/server/auth.server.ts'
import { listCourseMembers } from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { appUrl } from '#app/server/env.server.ts'
import { toActor } from '#app/server/users.server.ts'
import type { Route } from './+types/people'

export const meta: Route.MetaFunction = () => [{ title: 'People · Cyclewright' }]

const InviteFormSchema = z.object({
  email: EmailSchema,
  role: z.enum(['student', 'ta', 'instructor'], { message: 'Choose a role.' }),
})

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const members = await listCourseMembers(db(), courseId)
  return { course, members, mayInvite: canInvite(toActor(user), courseId, 'student') }
}

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const form = parseForm(await readFormData(request), InviteFormSchema)
  if (!form.ok) return data({ ok: false as const, fieldErrors: form.fieldErrors, values: form.values, sentTo: null }, { status: 400 })
  if (!canInvite(toActor(user), courseId, form.value.role)) forbidden('Only the course’s instructors can invite people.')
  try {
    await inviteToCourse(db(), { email: form.value.email, courseId, role: form.value.role, invitedBy: user.id, baseUrl: appUrl(request) })
  } catch (e) {
    console.error('Invitation mail failed:', e)
    return data(
      { ok: false as const, fieldErrors: { email: 'The invitation could not be e-mailed just now. Please try again in a minute.' } as FieldErrors, values: noValues, sentTo: null },
      { status: 503 },
    )
  }
  return { ok: true as const, fieldErrors: noFieldErrors, values: noValues, sentTo: form.value.email }
}

export default function PeopleRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, members, mayInvite } = loaderData
  const busy = useNavigation().state === 'submitting'
  return (
    <div>
      <p className="text-sm text-muted">
        <a href={`/courses/${course.id}`}>
          {course.code} {course.title}
        </a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">People</h1>
      {mayInvite ? (
        <section aria-labelledby="invite-title" className="mt-6 max-w-2xl rounded-lg border border-line bg-white p-6 shadow-sm">
          <h2 id="invite-title" className="text-xl font-semibold">
            Invite someone
          </h2>
          <p className="mt-1 text-sm text-muted">They receive an e-mail with a link that works once and expires in 7 days.</p>
          {actionData?.ok ? (
            <Notice tone="ok" className="mt-4">
              Invitation sent to {actionData.sentTo}.
            </Notice>
          ) : null}
          <Form method="post" className="mt-4 grid gap-4 sm:grid-cols-[1fr_auto_auto] sm:items-end">
            <Field label="E-mail address" name="email" type="email" required defaultValue={actionData?.values?.email} error={actionData?.fieldErrors?.email} />
            <div className="flex flex-col gap-1">
              <label htmlFor="invite-role" className="text-sm font-medium">
                Role
              </label>
              <select
                id="invite-role"
                name="role"
                defaultValue={actionData?.values?.role ?? 'student'}
                className="rounded-md border border-line bg-white px-3 py-2"
                aria-invalid={actionData?.fieldErrors?.role ? true : undefined}
              >
                <option value="student">{roleLabels.student}</option>
                <option value="ta">{roleLabels.ta}</option>
                <option value="instructor">{roleLabels.instructor}</option>
              </select>
            </div>
            <Button type="submit" disabled={busy}>
              {busy ? 'Sending…' : 'Send invitation'}
            </Button>
          </Form>
        </section>
      ) : null}
      <section aria-labelledby="roster-title" className="mt-8">
        <h2 id="roster-title" className="text-xl font-semibold">
          Roster ({members.length})
        </h2>
        {members.length === 0 ? (
          <p className="mt-4 text-muted">Nobody has joined this course yet.</p>
        ) : (
          <div className="mt-4 overflow-x-auto rounded-lg border border-line bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">People in {course.code}</caption>
              <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-4 py-2">Name</th>
                  <th scope="col" className="px-4 py-2">E-mail</th>
                  <th scope="col" className="px-4 py-2">Role</th>
                  <th scope="col" className="px-4 py-2">Section</th>
                </tr>
              </thead>
              <tbody>
                {members.map((m) => (
                  <tr key={m.userId} className="border-t border-line">
                    <td className="px-4 py-2">{m.name}</td>
                    <td className="px-4 py-2">{m.email}</td>
                    <td className="px-4 py-2">{roleLabels[m.role]}</td>
                    <td className="px-4 py-2">{m.section ?? '—'}</td>
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
