import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { ConventionChoice, TimeZoneField } from '#app/components/course-fields.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { SelectField } from '#app/components/ui/select-field.tsx'
import { formatCalendarDate } from '#app/lib/calendar-dates.ts'
import { parseForm, readFormData } from '#app/lib/form.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import {
  createCourseFor,
  findUserDepartment,
  listTerms,
  NewCourseFormSchema,
  formValues,
} from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/new'
import { EmptyState } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = () => [{ title: 'New course · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireAdmin(request)
  const department = await findUserDepartment(db(), user.id)
  const termId = new URL(request.url).searchParams.get('termId')
  return {
    department,
    terms: department ? await listTerms(db(), department.id) : [],
    termId: termId && /^\d{1,9}$/.test(termId) ? termId : '',
  }
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireAdmin(request)
  const department = await findUserDepartment(db(), user.id)
  if (!department)
    throw data('Your account belongs to no department, so there is nowhere to add a course.', { status: 409 })
  const formData = await readFormData(request)
  const form = parseForm(formData, NewCourseFormSchema)
  if (!form.ok) return data({ fieldErrors: form.fieldErrors, values: form.values }, { status: 400 })
  const made = await createCourseFor(db(), { actorId: user.id, departmentId: department.id, input: form.value })
  if (!made.ok) return data({ fieldErrors: made.fieldErrors, values: formValues(formData) }, { status: 400 })
  return redirect(`${href('/admin/courses/:courseId', { courseId: String(made.courseId) })}?created=1`)
}

export default function NewCourseRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { department, terms, termId } = loaderData
  const busy = useNavigation().state === 'submitting'
  const errors = actionData?.fieldErrors ?? {}
  const values = actionData?.values ?? {}
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={href('/admin')}>Department</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">New course</h1>
      {!department ? (
        <Notice tone="warn" className="mt-4">
          Your account belongs to no department, so you cannot add courses. Ask whoever runs this installation to set
          your department.
        </Notice>
      ) : terms.length === 0 ? (
        <EmptyState className="mt-6">
          No terms yet — <Link to={href('/admin/terms')}>create the first term</Link>, then add its courses.
        </EmptyState>
      ) : (
        <Form
          method="post"
          noValidate
          className="mt-6 grid max-w-2xl gap-5 rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6"
        >
          <p className="text-sm text-muted">
            The course belongs to {department.name}. You can make people its instructors on the next page.
          </p>
          <SelectField label="Term" name="termId" required defaultValue={values.termId ?? termId} error={errors.termId}>
            <option value="">Choose a term…</option>
            {terms.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name} ({formatCalendarDate(t.startsOn)} to {formatCalendarDate(t.endsOn)})
              </option>
            ))}
          </SelectField>
          <div className="grid gap-5 sm:grid-cols-[10rem_1fr]">
            <Field
              label="Code"
              name="code"
              required
              maxLength={24}
              placeholder="ENTH 210"
              defaultValue={values.code}
              error={errors.code}
            />
            <Field
              label="Title"
              name="title"
              required
              maxLength={120}
              placeholder="Engineering Thermodynamics I"
              defaultValue={values.title}
              error={errors.title}
            />
          </div>
          <ConventionChoice defaultValue={values.signConvention ?? 'engineering'} error={errors.signConvention} />
          <TimeZoneField defaultValue={values.timeZone ?? department.timeZone} error={errors.timeZone} />
          <div className="flex flex-wrap gap-3">
            <Button type="submit" disabled={busy}>
              {busy ? 'Creating…' : 'Create course'}
            </Button>
            <Link to={href('/admin')} className="self-center">
              Cancel
            </Link>
          </div>
        </Form>
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
