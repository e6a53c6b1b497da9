import { Form, href, Link, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { AUDIT_KIND_WORDS, describeAuditEntry } from '#app/lib/audit-words.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { pageParam } from '#app/lib/query-params.ts'
import { listAuditLog } from '#app/server/audit-log.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/audit'
import { EmptyState } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Audit log · ${data.course.code} · Cyclewright` : 'Audit log · Cyclewright' },
]

const PAGE_SIZE = 50

const KIND_WORDS = AUDIT_KIND_WORDS

const QuerySchema = z.object({
  kind: z
    .string()
    .regex(/^[a-z-]{1,40}$/)
    .optional()
    .catch(undefined),
})

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor'])
  const search = new URL(request.url).searchParams
  // A page number beyond use is refused with a message (an offset of 10^20 would fail in the database).
  const query = { ...QuerySchema.parse({ kind: search.get('kind') || undefined }), page: pageParam(search) }
  const { rows, total, lookups } = await listAuditLog(db(), {
    courseId,
    kind: query.kind,
    limit: PAGE_SIZE,
    offset: (query.page - 1) * PAGE_SIZE,
  })
  return {
    course: { id: course.id, code: course.code, title: course.title, timeZone: course.timeZone },
    // Worded on the server: the page gets sentences, never the stored field names or ids.
    rows: rows.map((r) => ({
      id: r.id,
      at: r.at,
      actor: r.actor,
      kind: r.kind,
      student: r.subject,
      note: r.note,
      assignmentTitle: r.assignmentTitle,
      words: describeAuditEntry(r, { ...lookups, timeZone: course.timeZone }),
    })),
    total,
    page: query.page,
    pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
    kind: query.kind ?? null,
  }
}

export default function AuditRoute({ loaderData }: Route.ComponentProps) {
  const { course, rows, total, page, pages, kind } = loaderData
  const navigation = useNavigation()
  const loading =
    navigation.state === 'loading' &&
    navigation.location?.pathname === href('/courses/:courseId/audit', { courseId: String(course.id) })
  const pageHref = (p: number) => `?${new URLSearchParams({ ...(kind ? { kind } : {}), page: String(p) })}`
  const first = total === 0 ? 0 : (page - 1) * PAGE_SIZE + 1
  const last = Math.min(total, page * PAGE_SIZE)
  return (
    <div>
      <h1 className="mt-1 text-3xl font-semibold">Audit log</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Every change of a score in this course, and the decisions around scores (extensions, releases, changed
        assignments): who, when, what it was and what it became, and why. Entries are written in the same transaction as
        the change and are never changed or deleted, not even by an administrator. Newest first; times in{' '}
        {course.timeZone}.
      </p>
      <Form
        method="get"
        className="mt-6 flex flex-wrap items-end gap-4 rounded-lg border border-line bg-white p-4 shadow-sm"
        aria-label="Filter the audit log"
      >
        <div className="flex flex-col gap-1">
          <label htmlFor="audit-kind" className="text-sm font-medium">
            Kind
          </label>
          <select
            id="audit-kind"
            name="kind"
            defaultValue={kind ?? ''}
            className="rounded-md border border-line bg-white px-3 py-2"
          >
            <option value="">Every kind</option>
            {Object.entries(KIND_WORDS).map(([value, words]) => (
              <option key={value} value={value}>
                {words}
              </option>
            ))}
          </select>
        </div>
        <Button type="submit" variant="secondary" disabled={loading}>
          {loading ? 'Loading…' : 'Show'}
        </Button>
      </Form>
      {rows.length === 0 ? (
        <EmptyState className="mt-6">
          {page > 1
            ? 'There are no entries on this page.'
            : kind
              ? `No entries of the kind “${KIND_WORDS[kind] ?? kind}” yet.`
              : 'Nothing has been recorded in this course yet.'}
        </EmptyState>
      ) : (
        <div className="mt-6 overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-left text-sm">
            <caption className="px-4 py-2 text-left text-muted">
              Entries {first}–{last} of {total}
              {kind ? ` of the kind “${KIND_WORDS[kind] ?? kind}”` : ''}, newest first; times in {course.timeZone}
            </caption>
            <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-4 py-2">
                  When
                </th>
                <th scope="col" className="px-4 py-2">
                  Who
                </th>
                <th scope="col" className="px-4 py-2">
                  What happened
                </th>
                <th scope="col" className="px-4 py-2">
                  Before → after
                </th>
                <th scope="col" className="px-4 py-2">
                  Why
                </th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-line align-top">
                  <th scope="row" className="px-4 py-2 font-normal whitespace-nowrap">
                    {formatInZone(r.at, course.timeZone, { withZone: false })}
                  </th>
                  <td className="px-4 py-2">{r.actor ?? 'The system'}</td>
                  <td className="min-w-64 px-4 py-2">
                    <span className="block text-xs font-semibold tracking-wide text-muted uppercase">
                      {r.words.kind}
                    </span>
                    {r.words.what}
                    {r.assignmentTitle ? <span className="block text-xs text-muted">{r.assignmentTitle}</span> : null}
                  </td>
                  <td className="min-w-48 px-4 py-2">{r.words.change ?? '—'}</td>
                  <td className="max-w-xs px-4 py-2 whitespace-pre-wrap">{r.words.note || '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {pages > 1 ? (
        <nav aria-label="Pages of the audit log" className="mt-4 flex flex-wrap items-center gap-4 text-sm">
          {page > 1 ? <Link to={pageHref(page - 1)}>Newer entries</Link> : null}
          <span>
            Page {page} of {pages}
          </span>
          {page < pages ? <Link to={pageHref(page + 1)}>Older entries</Link> : null}
        </nav>
      ) : null}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
