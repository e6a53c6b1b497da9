import { useEffect } from 'react'
import { data, Form, href, Link, redirect, useNavigation, useRevalidator } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { parseForm, readFormData } from '#app/lib/form.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { adminExportsPage, ExportRequestError, requestTermExport } from '#app/server/exports.server.ts'
import type { Route } from './+types/exports'
import { EmptyState, Table, TableHead } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = () => [{ title: 'Grade exports · Cyclewright' }]

const RequestExportSchema = z.object({
  termId: z
    .string({ error: 'Choose a term.' })
    .regex(/^\d{1,9}$/, 'Choose a term.')
    .transform(Number),
})

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireAdmin(request)
  const requested = new URL(request.url).searchParams.get('requested')
  return {
    ...(await adminExportsPage(db(), user.id)),
    requested: requested && /^\d{1,9}$/.test(requested) ? Number(requested) : null,
  }
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireAdmin(request)
  const form = parseForm(await readFormData(request), RequestExportSchema)
  if (!form.ok) return data({ fieldErrors: form.fieldErrors, values: form.values }, { status: 400 })
  try {
    const { exportId } = await requestTermExport(db(), { adminUser: user, termId: form.value.termId })
    return redirect(`${href('/admin/exports')}?requested=${exportId}`)
  } catch (e) {
    if (e instanceof ExportRequestError)
      return data(
        { fieldErrors: { termId: e.message }, values: { termId: String(form.value.termId) } },
        { status: 400 },
      )
    throw e
  }
}

const when = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' })
const POLL_MS = 2000

type ExportRow = Route.ComponentProps['loaderData']['exports'][number]

function Progress({ row }: { row: ExportRow }) {
  switch (row.status) {
    case 'queued':
      return <span>{row.error ? row.error : 'Waiting for the worker to pick it up.'}</span>
    case 'running':
      return <span>Being built: {row.rows.toLocaleString('en-GB')} rows written so far.</span>
    case 'failed':
      return <span className="text-danger">{row.error ?? 'The export stopped.'}</span>
    case 'done':
      return (
        <span>
          Done: {row.rows.toLocaleString('en-GB')} row{row.rows === 1 ? '' : 's'}.
        </span>
      )
  }
}

export default function AdminExportsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { terms, exports, requested } = loaderData
  const navigation = useNavigation()
  const revalidator = useRevalidator()
  const unfinished = exports.filter((e) => e.status === 'queued' || e.status === 'running').length
  const busy = navigation.state === 'submitting'

  // Polls while an export is waiting or being built; without JavaScript the Refresh link does it.
  useEffect(() => {
    if (unfinished === 0) return
    const timer = setInterval(() => {
      if (revalidator.state === 'idle' && document.visibilityState === 'visible') void revalidator.revalidate()
    }, POLL_MS)
    return () => clearInterval(timer)
  }, [unfinished, revalidator])

  const error = actionData?.fieldErrors.termId
  const chosen = actionData?.values.termId ?? ''
  return (
    <div>
      <p className="text-sm">
        <Link to={href('/admin')}>Department</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Grade exports</h1>
      <p className="mt-2 max-w-2xl text-muted">
        The grades of every course of a term, as two CSV files a grade system can import one at a time: the assignment
        rows (each student’s score on each assignment) and the course totals (one row per student). Totals count only
        assignments whose due date has passed when the export is built; the others are listed with an empty score.
        Dropped students are left out. The files are built in the background and appear below when they are ready. Times
        in UTC.
      </p>

      {terms.length === 0 ? (
        <EmptyState className="mt-8">There are no terms to export yet.</EmptyState>
      ) : (
        <Form method="post" className="mt-6 flex flex-wrap items-end gap-4 rounded-lg border border-line bg-white p-4">
          <div className="flex max-w-full min-w-0 flex-col gap-1">
            <label htmlFor="termId" className="text-sm font-medium text-ink">
              Term
            </label>
            <select
              id="termId"
              name="termId"
              defaultValue={chosen}
              required
              aria-invalid={error ? true : undefined}
              aria-describedby={error ? 'termId-error' : undefined}
              className={`max-w-full min-w-0 rounded-md border bg-white px-3 py-2 text-base shadow-sm ${error ? 'border-danger' : 'border-line'}`}
            >
              <option value="" disabled>
                Choose a term…
              </option>
              {terms.map((t) => (
                <option key={t.id} value={String(t.id)}>
                  {t.name} · {t.departmentName} ({t.startsOn} to {t.endsOn})
                </option>
              ))}
            </select>
            {error ? (
              <p id="termId-error" className="text-sm text-danger">
                {error}
              </p>
            ) : null}
          </div>
          <Button type="submit" disabled={busy}>
            {busy ? 'Requesting…' : 'Export grades'}
          </Button>
        </Form>
      )}

      {requested !== null && exports.some((e) => e.id === requested) ? (
        <Notice className="mt-4">Export requested. It is listed below and updates as it is built.</Notice>
      ) : null}

      <h2 className="mt-8 text-xl font-semibold">Your exports</h2>
      {unfinished > 0 ? (
        <p role="status" className="mt-2 text-sm text-muted">
          {unfinished === 1 ? 'One export is' : `${unfinished} exports are`} not finished yet; this page checks every
          few seconds. <Link to={href('/admin/exports')}>Refresh</Link>
        </p>
      ) : null}
      {exports.length === 0 ? (
        <EmptyState className="mt-4">You have not exported any grades yet. Choose a term above.</EmptyState>
      ) : (
        <Table boxClassName="mt-4" caption="Your grade exports, newest first">
          <TableHead>
            <tr>
              <th scope="col" className="px-4 py-2">
                Term
              </th>
              <th scope="col" className="px-4 py-2">
                Requested
              </th>
              <th scope="col" className="px-4 py-2">
                Status
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                Rows
              </th>
              <th scope="col" className="px-4 py-2">
                Files
              </th>
            </tr>
          </TableHead>
          <tbody>
            {exports.map((e) => (
              <tr key={e.id} className="border-t border-line align-top">
                <th scope="row" className="min-w-44 px-4 py-2 font-normal">
                  {e.termName} · {e.departmentName}
                </th>
                <td className="px-4 py-2">
                  <time dateTime={new Date(e.createdAt).toISOString()}>{when.format(new Date(e.createdAt))} UTC</time>
                </td>
                <td className="min-w-36 px-4 py-2">
                  <Progress row={e} />
                </td>
                <td className="px-4 py-2 text-right tabular-nums">
                  {e.status === 'done' || e.status === 'running' ? e.rows.toLocaleString('en-GB') : '—'}
                </td>
                <td className="min-w-56 px-4 py-2">
                  {e.status === 'done' ? (
                    <ul>
                      {e.files.map((f) => (
                        <li key={f.name}>
                          <a href={f.href} download={f.name}>
                            {f.label}
                          </a>{' '}
                          <span className="[overflow-wrap:anywhere] text-muted">({f.name})</span>
                        </li>
                      ))}
                    </ul>
                  ) : (
                    <span className="text-muted">Not ready</span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
