import { Form, Link, useNavigation } from 'react-router'
import { z } from 'zod'
import { formatPoints } from '#app/lib/points.ts'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { pageParam } from '#app/lib/query-params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { listAuditEvents } from '#app/server/disputes.server.ts'
import type { Route } from './+types/audit'

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Audit log · ${data.course.code} · Cyclewright` : 'Audit log · Cyclewright' }]

const PAGE_SIZE = 50

/** The kinds of entry written today, in words; an unknown kind is shown as it is stored. */
const KIND_WORDS: Record<string, string> = {
  'dispute-raised': 'Dispute raised',
  dispute: 'Score changed by a dispute',
  'dispute-resolved': 'Dispute resolved',
  regrade: 'Regrade',
  extension: 'Extension',
  'key-released': 'Key released',
  'grades-released': 'Grades released',
  'assignment-changed': 'Assignment changed',
  'roster-import': 'Class list imported',
  'student-dropped': 'Student dropped',
  'student-undropped': 'Drop undone',
  'student-section': 'Student’s section changed',
  'section-created': 'Section added',
  'section-renamed': 'Section renamed',
  'section-deleted': 'Section deleted',
  'section-staff': 'TA of a section changed',
  'invitation-resent': 'Invitation sent again',
  'invitation-revoked': 'Invitation revoked',
}

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
  const { rows, total } = await listAuditEvents(db(), { courseId, kind: query.kind, limit: PAGE_SIZE, offset: (query.page - 1) * PAGE_SIZE })
  return {
    course: { id: course.id, code: course.code, title: course.title, timeZone: course.timeZone },
    rows: rows.map((r) => ({ ...r, change: changeText(r.before, r.after) })),
    total,
    page: query.page,
    pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
    kind: query.kind ?? null,
  }
}

const VERDICT_WORDS: Record<string, string> = { correct: 'correct', incorrect: 'incorrect', unreadable: 'unreadable', 'wrong-dimension': 'wrong dimension', removed: 'no longer asked' }

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v)
}

function valueText(key: string, v: unknown): string {
  if (v === null || v === undefined) return 'none'
  if (typeof v === 'number') return key === 'score' ? formatPoints(v) : String(v)
  if (typeof v === 'string') return key === 'verdict' ? (VERDICT_WORDS[v] ?? v) : /^\d{4}-\d{2}-\d{2}T/.test(v) ? `@${v}` : v
  if (Array.isArray(v)) return `${v.length} ${v.length === 1 ? 'entry' : 'entries'}`
  return JSON.stringify(v)
}

/**
 * One side of an entry in words: a grade as "incorrect, 0 points", anything else as
 * "key: value" pairs. Timestamps are marked with @ so the page can show them in the course zone.
 */
function sideText(side: unknown): string {
  if (side === null || side === undefined) return 'nothing'
  if (!isRecord(side)) return valueText('', side)
  const score = typeof side.score === 'number' ? `${formatPoints(side.score)} ${side.score === 1 ? 'point' : 'points'}` : null
  if ('verdict' in side) return `${side.verdict === null || side.verdict === undefined ? 'not graded' : valueText('verdict', side.verdict)}, ${score ?? 'no score'}`
  // A dispute's own entries: its status and the find's score; the ids behind them are for the dispute page.
  if (typeof side.status === 'string') {
    const changed = typeof side.changed === 'number' ? `; ${side.changed} ${side.changed === 1 ? 'answer' : 'answers'} changed` : ''
    return `${side.status}${score ? `, find’s score ${score}` : ''}${changed}`
  }
  return Object.entries(side)
    .filter(([k]) => k !== 'disputeId' && k !== 'partResultIds')
    .map(([k, v]) => `${k}: ${valueText(k, v)}`)
    .join('; ')
}

function changeText(before: unknown, after: unknown): { before: string; after: string } {
  return { before: sideText(before), after: sideText(after) }
}

/** Replaces the @-marked ISO timestamps of a change text with the time in the course's zone. */
function withZone(text: string, timeZone: string): string {
  return text.replace(/@(\d{4}-\d{2}-\d{2}T[0-9:.]+Z?)/g, (_, iso: string) => formatInZone(iso, timeZone, { withZone: false }))
}

export default function AuditRoute({ loaderData }: Route.ComponentProps) {
  const { course, rows, total, page, pages, kind } = loaderData
  const navigation = useNavigation()
  const loading = navigation.state === 'loading' && navigation.location?.pathname === `/courses/${course.id}/audit`
  const pageHref = (p: number) => `?${new URLSearchParams({ ...(kind ? { kind } : {}), page: String(p) })}`
  const first = total === 0 ? 0 : (page - 1) * PAGE_SIZE + 1
  const last = Math.min(total, page * PAGE_SIZE)
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={`/courses/${course.id}`}>
          {course.code} {course.title}
        </Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Audit log</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Every change of a score in this course, and the decisions around scores (extensions, releases, changed assignments): who, when, what it was and
        what it became, and why. Entries are written in the same transaction as the change and are never changed or deleted, not even by an
        administrator. Newest first; times in {course.timeZone}.
      </p>
      <Form method="get" className="mt-6 flex flex-wrap items-end gap-4 rounded-lg border border-line bg-white p-4 shadow-sm" aria-label="Filter the audit log">
        <div className="flex flex-col gap-1">
          <label htmlFor="audit-kind" className="text-sm font-medium">
            Kind
          </label>
          <select id="audit-kind" name="kind" defaultValue={kind ?? ''} className="rounded-md border border-line bg-white px-3 py-2">
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
        <p className="mt-6 rounded-lg border border-dashed border-line bg-white p-8 text-center text-muted">
          {page > 1 ? 'There are no entries on this page.' : kind ? `No entries of the kind “${KIND_WORDS[kind] ?? kind}” yet.` : 'Nothing has been recorded in this course yet.'}
        </p>
      ) : (
        <div className="mt-6 overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-left text-sm">
            <caption className="px-4 py-2 text-left text-muted">
              Entries {first}–{last} of {total}
              {kind ? ` of the kind “${KIND_WORDS[kind] ?? kind}”` : ''}, newest first; times in {course.timeZone}
            </caption>
            <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-4 py-2">When</th>
                <th scope="col" className="px-4 py-2">Who</th>
                <th scope="col" className="px-4 py-2">Kind</th>
                <th scope="col" className="px-4 py-2">Student</th>
                <th scope="col" className="px-4 py-2">Assignment</th>
                <th scope="col" className="px-4 py-2">Old → new</th>
                <th scope="col" className="px-4 py-2">Why</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-line align-top">
                  <th scope="row" className="px-4 py-2 font-normal whitespace-nowrap">
                    {formatInZone(r.at, course.timeZone, { withZone: false })}
                  </th>
                  <td className="px-4 py-2">{r.actor ?? 'The system'}</td>
                  <td className="px-4 py-2">{KIND_WORDS[r.kind] ?? r.kind}</td>
                  <td className="px-4 py-2">{r.student ?? '—'}</td>
                  <td className="px-4 py-2">{r.assignmentTitle ?? '—'}</td>
                  <td className="px-4 py-2">
                    {withZone(r.change.before, course.timeZone)} → {withZone(r.change.after, course.timeZone)}
                  </td>
                  <td className="max-w-xs px-4 py-2 whitespace-pre-wrap">{r.note || '—'}</td>
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
