import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { formatInZone, toLocalDateTimeValue } from '#app/lib/dates.ts'
import { type FieldErrors, parseForm, readFormData } from '#app/lib/form.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { echoValues, textField } from '#app/lib/text-field.ts'
import {
  ExtensionFormSchema,
  listExtensions,
  removeExtension,
  setExtension,
} from '#app/server/assignment-extensions.server.ts'
import { orErrorPage } from '#app/server/error-page.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/extensions'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Extensions · ${data.assignment.title} · Cyclewright` : 'Extensions · Cyclewright' },
]

const RemoveSchema = z.object({
  userId: z
    .string()
    .regex(/^\d{1,9}$/)
    .transform(Number),
})

/** The server's extension rules, with the reason refused when it holds control characters (a NUL cannot be stored). */
const ExtensionPageSchema = ExtensionFormSchema.extend({
  reason: textField('the reason').trim().max(500, 'Keep the reason under 500 characters.'),
})

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const list = await orErrorPage(listExtensions(db(), { courseId, assignmentId }))
  const url = new URL(request.url)
  const student = url.searchParams.get('student') ?? ''
  return { course, ...list, chosen: /^\d{1,9}$/.test(student) ? student : '', done: url.searchParams.get('done') }
}

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { user } = await requireCourseRole(request, courseId, ['instructor'])
  const formData = await readFormData(request)
  const here = href('/courses/:courseId/assignments/:assignmentId/extensions', {
    courseId: String(courseId),
    assignmentId: String(assignmentId),
  })
  if (formData.get('intent') === 'remove') {
    const parsed = RemoveSchema.safeParse({ userId: formData.get('userId') })
    if (!parsed.success) throw data('Choose a student’s extension to remove.', { status: 400 })
    await orErrorPage(removeExtension(db(), { courseId, assignmentId, actorId: user.id, userId: parsed.data.userId }))
    return redirect(`${here}?done=removed`)
  }
  const form = parseForm(formData, ExtensionPageSchema)
  if (!form.ok) return data({ fieldErrors: form.fieldErrors, values: echoValues(form.values) }, { status: 400 })
  const result = await orErrorPage(setExtension(db(), { courseId, assignmentId, actorId: user.id, input: form.value }))
  if (!result.ok) {
    const typed = echoValues(
      Object.fromEntries(['userId', 'dueAt', 'extraAttempts', 'reason'].map((k) => [k, String(formData.get(k) ?? '')])),
    )
    return data({ fieldErrors: result.fieldErrors, values: typed }, { status: 400 })
  }
  return redirect(`${here}?done=saved`)
}

export default function ExtensionsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, assignment, timeZone, students, extensions, chosen, done } = loaderData
  const busy = useNavigation().state === 'submitting'
  const mayChange = course.role === 'instructor'
  const errors: FieldErrors = actionData?.fieldErrors ?? {}
  const prefill = extensions.find((e) => String(e.userId) === chosen)
  const values: Record<string, string> = actionData?.values ?? {
    userId: chosen,
    dueAt: prefill?.dueAt ? toLocalDateTimeValue(prefill.dueAt, timeZone) : '',
    extraAttempts: prefill ? String(prefill.extraAttempts) : '0',
    reason: prefill?.reason ?? '',
  }
  const base = href('/courses/:courseId/assignments/:assignmentId', {
    courseId: String(course.id),
    assignmentId: String(assignment.id),
  })
  const errorOf = (key: string) =>
    errors[key] ? (
      <p id={`ext-${key}-error`} className="text-sm text-danger">
        {errors[key]}
      </p>
    ) : null
  const aria = (key: string, hint?: string) => ({
    'aria-invalid': errors[key] ? true : undefined,
    'aria-describedby': [hint, errors[key] ? `ext-${key}-error` : null].filter(Boolean).join(' ') || undefined,
  })
  const input = (key: string) =>
    `min-w-0 rounded-md border bg-white px-3 py-2 shadow-sm ${errors[key] ? 'border-danger' : 'border-line'}`
  return (
    <div>
      <p className="text-sm text-muted">
        <a href={base}>{assignment.title}</a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Extensions</h1>
      <p className="mt-2 text-muted">
        The assignment is due {formatInZone(assignment.dueAt, timeZone)} with {assignment.attemptsPerFind} attempt
        {assignment.attemptsPerFind === 1 ? '' : 's'} per find. An extension gives one student a later due date, extra
        attempts, or both.
      </p>
      {done === 'saved' ? (
        <Notice tone="ok" className="mt-4">
          Extension saved.
        </Notice>
      ) : null}
      {done === 'removed' ? (
        <Notice tone="ok" className="mt-4">
          Extension removed.
        </Notice>
      ) : null}
      {mayChange ? (
        <section
          aria-labelledby="ext-form-title"
          className="mt-6 max-w-3xl rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6"
        >
          <h2 id="ext-form-title" className="text-xl font-semibold">
            Give or change an extension
          </h2>
          {students.length === 0 ? (
            <p className="mt-3 text-muted">This course has no students yet.</p>
          ) : (
            <Form method="post" className="mt-4 grid grid-cols-1 gap-4 sm:grid-cols-2" key={chosen}>
              {Object.keys(errors).length ? (
                <Notice tone="error" className="sm:col-span-2">
                  The extension was not saved: {Object.values(errors).filter(Boolean).join(' ')}
                </Notice>
              ) : null}
              <div className="flex flex-col gap-1">
                <label htmlFor="ext-userId" className="text-sm font-medium">
                  Student
                </label>
                <select
                  id="ext-userId"
                  name="userId"
                  defaultValue={values.userId ?? ''}
                  className={input('userId')}
                  {...aria('userId')}
                >
                  <option value="">Choose a student…</option>
                  {students.map((s) => (
                    <option key={s.userId} value={String(s.userId)}>
                      {s.name} ({s.email}){s.section ? `, section ${s.section}` : ''}
                    </option>
                  ))}
                </select>
                {errorOf('userId')}
              </div>
              <div className="flex flex-col gap-1">
                <label htmlFor="ext-dueAt" className="text-sm font-medium">
                  New due date <span className="font-normal text-muted">({timeZone}; optional)</span>
                </label>
                <input
                  id="ext-dueAt"
                  type="datetime-local"
                  name="dueAt"
                  defaultValue={values.dueAt ?? ''}
                  className={input('dueAt')}
                  {...aria('dueAt', 'ext-dueAt-hint')}
                />
                <p id="ext-dueAt-hint" className="text-sm text-muted">
                  Leave empty to keep the assignment’s due date.
                </p>
                {errorOf('dueAt')}
              </div>
              <div className="flex flex-col gap-1">
                <label htmlFor="ext-extraAttempts" className="text-sm font-medium">
                  Extra attempts per find
                </label>
                <input
                  id="ext-extraAttempts"
                  name="extraAttempts"
                  inputMode="numeric"
                  defaultValue={values.extraAttempts ?? '0'}
                  className={input('extraAttempts')}
                  {...aria('extraAttempts')}
                />
                {errorOf('extraAttempts')}
              </div>
              <div className="flex flex-col gap-1">
                <label htmlFor="ext-reason" className="text-sm font-medium">
                  Reason <span className="font-normal text-muted">(staff only)</span>
                </label>
                <input
                  id="ext-reason"
                  name="reason"
                  maxLength={500}
                  defaultValue={values.reason ?? ''}
                  className={input('reason')}
                  {...aria('reason')}
                />
                {errorOf('reason')}
              </div>
              <div className="sm:col-span-2">
                <Button type="submit" name="intent" value="save" disabled={busy}>
                  {busy ? 'Saving…' : 'Save extension'}
                </Button>
              </div>
            </Form>
          )}
        </section>
      ) : null}
      <section aria-labelledby="ext-list-title" className="mt-8">
        <h2 id="ext-list-title" className="text-xl font-semibold">
          Extensions given ({extensions.length})
        </h2>
        {extensions.length === 0 ? (
          <p className="mt-3 text-muted">No student has an extension on this assignment.</p>
        ) : (
          <div className="relative mt-3 overflow-x-auto rounded-lg border border-line bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Extensions on {assignment.title}</caption>
              <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-4 py-2">
                    Student
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Due ({timeZone})
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Extra attempts
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Reason
                  </th>
                  {mayChange ? (
                    <th scope="col" className="px-4 py-2">
                      <span className="sr-only">Actions</span>
                    </th>
                  ) : null}
                </tr>
              </thead>
              <tbody>
                {extensions.map((e) => (
                  <tr key={e.userId} className="border-t border-line">
                    <th scope="row" className="px-4 py-2 font-normal">
                      {e.name}
                    </th>
                    <td className="px-4 py-2">
                      {e.dueAt ? formatInZone(e.dueAt, timeZone, { withZone: false }) : 'Assignment’s'}
                    </td>
                    <td className="px-4 py-2">{e.extraAttempts}</td>
                    <td className="px-4 py-2">{e.reason || '—'}</td>
                    {mayChange ? (
                      <td className="px-4 py-2">
                        <span className="flex flex-wrap items-center gap-3">
                          <Link to={`?student=${e.userId}`}>
                            Change<span className="sr-only"> {e.name}’s extension</span>
                          </Link>
                          <Form method="post">
                            <input type="hidden" name="userId" value={e.userId} />
                            <Button type="submit" name="intent" value="remove" variant="quiet" disabled={busy}>
                              Remove<span className="sr-only"> {e.name}’s extension</span>
                            </Button>
                          </Form>
                        </span>
                      </td>
                    ) : null}
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
