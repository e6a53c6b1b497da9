import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { formatCalendarDate } from '#app/lib/calendar-dates.ts'
import { parseForm, readFormData } from '#app/lib/form.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import { createTermFor, findUserDepartment, listTerms, TermFormSchema, formValues } from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/terms'
import { EmptyState, Table, TableHead } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = () => [{ title: 'Terms · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireAdmin(request)
  const department = await findUserDepartment(db(), user.id)
  const created = new URL(request.url).searchParams.get('created')
  return {
    department,
    terms: department ? await listTerms(db(), department.id) : [],
    created: created && /^\d{1,9}$/.test(created) ? Number(created) : null,
  }
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireAdmin(request)
  const department = await findUserDepartment(db(), user.id)
  if (!department)
    throw data('Your account belongs to no department, so there is nowhere to add a term.', { status: 409 })
  const formData = await readFormData(request)
  const form = parseForm(formData, TermFormSchema)
  if (!form.ok) return data({ fieldErrors: form.fieldErrors, values: form.values }, { status: 400 })
  const made = await createTermFor(db(), department.id, form.value)
  if (!made.ok) return data({ fieldErrors: made.fieldErrors, values: formValues(formData) }, { status: 400 })
  return redirect(`${href('/admin/terms')}?created=${made.termId}`)
}

export default function AdminTermsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { department, terms, created } = loaderData
  const busy = useNavigation().state === 'submitting'
  const errors = actionData?.fieldErrors ?? {}
  const values = actionData?.values ?? {}
  const createdTerm = created ? terms.find((t) => t.id === created) : undefined
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={href('/admin')}>Department</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Terms</h1>
      {department ? (
        <p className="mt-2 text-muted">
          The terms of {department.name}. Dates are calendar days; each course shows its times in its own time zone.
        </p>
      ) : (
        <Notice tone="warn" className="mt-4">
          Your account belongs to no department, so you cannot add terms. Ask whoever runs this installation to set your
          department.
        </Notice>
      )}
      {createdTerm ? (
        <Notice tone="ok" className="mt-4">
          {createdTerm.name} was added.{' '}
          <Link to={`${href('/admin/courses/new')}?termId=${createdTerm.id}`}>Create a course in it</Link>.
        </Notice>
      ) : null}
      {department ? (
        terms.length === 0 ? (
          <EmptyState className="mt-6">No terms yet — create the first below.</EmptyState>
        ) : (
          <Table boxClassName="mt-6" caption="Terms, latest first">
            <TableHead>
              <tr>
                <th scope="col" className="px-4 py-2">
                  Term
                </th>
                <th scope="col" className="px-4 py-2">
                  First day
                </th>
                <th scope="col" className="px-4 py-2">
                  Last day
                </th>
                <th scope="col" className="px-4 py-2 text-right">
                  Courses
                </th>
              </tr>
            </TableHead>
            <tbody>
              {terms.map((t) => (
                <tr key={t.id} className="border-t border-line">
                  <th scope="row" className="px-4 py-2 font-normal">
                    {t.name}
                  </th>
                  <td className="px-4 py-2 whitespace-nowrap">{formatCalendarDate(t.startsOn)}</td>
                  <td className="px-4 py-2 whitespace-nowrap">{formatCalendarDate(t.endsOn)}</td>
                  <td className="px-4 py-2 text-right tabular-nums">{t.courses}</td>
                </tr>
              ))}
            </tbody>
          </Table>
        )
      ) : null}
      {department ? (
        <section
          aria-labelledby="new-term-title"
          className="mt-8 max-w-2xl rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6"
        >
          <h2 id="new-term-title" className="text-xl font-semibold">
            New term
          </h2>
          <Form method="post" className="mt-4 grid gap-4 sm:grid-cols-3" noValidate>
            <Field
              label="Name"
              name="name"
              required
              maxLength={60}
              placeholder="Spring 2027"
              defaultValue={values.name}
              error={errors.name}
              className="sm:col-span-3"
            />
            <Field
              label="First day"
              name="startsOn"
              type="date"
              required
              defaultValue={values.startsOn}
              error={errors.startsOn}
            />
            <Field
              label="Last day"
              name="endsOn"
              type="date"
              required
              defaultValue={values.endsOn}
              error={errors.endsOn}
            />
            <div className="flex items-end">
              <Button type="submit" disabled={busy} className="w-full sm:w-auto">
                {busy ? 'Adding…' : 'Add term'}
              </Button>
            </div>
          </Form>
        </section>
      ) : null}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
