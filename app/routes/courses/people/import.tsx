/**
 * Importing a class list: upload or paste → a preview with every row's problems, before
 * anything is written → confirm → one transaction.
 *
 * Without JavaScript the preview must survive to the confirm press, and a file input cannot
 * be filled in again by the server. So the preview page carries the text it read: once in
 * an editable box (to fix a row and check again) and once in a hidden field of the import
 * form. The import reads and checks that text again from the start inside its transaction;
 * nothing from the preview is trusted.
 */
import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { MAX_ROSTER_BYTES, MAX_ROSTER_ROWS } from '#app/lib/roster-limits.ts'
import { parseRosterCsv, tooLarge } from '#app/server/roster-csv.server.ts'
import { importRoster, previewRoster, type PlannedRow, type RosterPlan } from '#app/server/roster.server.ts'
import type { Route } from './+types/import'
import { Table, TableHead } from '#app/components/ui/table.tsx'
import { TextareaField } from '#app/components/ui/textarea-field.tsx'
import { formText } from '#app/lib/form.ts'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Import a class list · ${data.course.code} · Cyclewright` : 'Import a class list · Cyclewright' },
]

const MAX_MB = MAX_ROSTER_BYTES / 1024 / 1024
/** Rows without problems listed in the preview; the rest are counted. */
const SHOWN_READY_ROWS = 300

type ActionData = {
  formError: string | null
  csv: string
  fileName: string
  note: string | null
  plan: RosterPlan | null
}

function reply(body: Partial<ActionData>, status = 200) {
  return data<ActionData>({ formError: null, csv: '', fileName: '', note: null, plan: null, ...body }, { status })
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor'])
  return { course }
}

/** The text of an uploaded file: UTF-8 (with or without a BOM), UTF-16 with a BOM, or else Windows-1252 (older spreadsheet exports). */
function decode(bytes: Uint8Array): { text: string; note: string | null } {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { text: new TextDecoder('utf-16le').decode(bytes), note: null }
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { text: new TextDecoder('utf-16be').decode(bytes), note: null }
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(bytes), note: null }
  } catch {
    return {
      text: new TextDecoder('windows-1252').decode(bytes),
      note: 'The file is not UTF-8, so it was read as Windows-1252 (as older spreadsheets save CSV). Check that accented names look right below.',
    }
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user } = await requireCourseRole(request, courseId, ['instructor'])
  // Refuse an oversized body before reading it. The form may carry a file and the text box
  // (each at most the limit) plus a little multipart framing.
  const header = request.headers.get('content-length')
  if (header === null)
    return reply({ formError: 'The upload did not say how large it is. Choose the file again and retry.' }, 411)
  const length = Number(header)
  if (!Number.isFinite(length) || length > 2 * MAX_ROSTER_BYTES + 64 * 1024)
    return reply({ formError: tooLarge() }, 413)
  let form: FormData
  try {
    form = await request.formData()
  } catch {
    return reply({ formError: 'The form could not be read. Choose the file again and retry.' }, 400)
  }
  const intent = form.get('intent') === 'import' ? 'import' : 'preview'
  const file = form.get('file')
  const pasted = formText(form, 'csv')
  let csv = pasted
  let fileName = formText(form, 'fileName').slice(0, 200)
  let note: string | null = null
  if (intent === 'preview' && file instanceof File && file.size > 0) {
    if (file.size > MAX_ROSTER_BYTES) return reply({ formError: tooLarge() }, 413)
    const decoded = decode(new Uint8Array(await file.arrayBuffer()))
    csv = decoded.text
    note = decoded.note
    fileName = file.name.slice(0, 200)
  } else if (intent === 'preview') {
    fileName = ''
  }
  csv = csv.replace(/^\uFEFF/, '')
  if (Buffer.byteLength(csv, 'utf8') > MAX_ROSTER_BYTES) return reply({ formError: tooLarge() }, 413)
  if (csv.trim() === '') return reply({ formError: 'Choose a CSV file, or paste the class list into the box.' }, 400)
  const parsed = parseRosterCsv(csv)
  if (!parsed.ok) return reply({ formError: parsed.formError, csv, fileName, note }, 400)

  if (intent === 'preview') {
    const plan = await previewRoster(db(), courseId, parsed)
    return reply({ csv, fileName, note, plan }, plan.counts.error > 0 ? 400 : 200)
  }
  const outcome = await importRoster(db(), { courseId, actorId: user.id, parsed, fileName })
  if (!outcome.ok) return reply({ formError: outcome.formError, csv, fileName, plan: outcome.plan }, 409)
  const c = outcome.counts
  const search = new URLSearchParams({
    imported: String(c.new + c.add),
    updated: String(c.update),
    invited: String(outcome.invited),
  })
  return redirect(`${href('/courses/:courseId/people', { courseId: String(courseId) })}?${search}`)
}

const statusWords: Record<PlannedRow['status'], string> = {
  new: 'New: account made, invitation sent',
  add: 'Has an account: added to the course, invitation sent',
  update: 'Already here: updated',
  unchanged: 'Already here: no change',
  error: 'To fix',
}

function RowsTable({ rows, caption, showSection }: { rows: PlannedRow[]; caption: string; showSection: boolean }) {
  return (
    <Table boxClassName="mt-3" caption={<>{caption}</>}>
      <TableHead>
        <tr>
          <th scope="col" className="px-3 py-2">
            Line
          </th>
          <th scope="col" className="px-3 py-2">
            Student ID
          </th>
          <th scope="col" className="px-3 py-2">
            Family name
          </th>
          <th scope="col" className="px-3 py-2">
            Given name
          </th>
          <th scope="col" className="px-3 py-2">
            E-mail
          </th>
          {showSection ? (
            <th scope="col" className="px-3 py-2">
              Section
            </th>
          ) : null}
          <th scope="col" className="px-3 py-2">
            What happens
          </th>
        </tr>
      </TableHead>
      <tbody>
        {rows.map((r) => (
          <tr
            key={r.line}
            className={r.status === 'error' ? 'border-t border-line bg-danger-soft/40' : 'border-t border-line'}
          >
            <th scope="row" className="px-3 py-2 font-normal">
              {r.line}
            </th>
            <td className="px-3 py-2">{r.studentNumber || '—'}</td>
            <td className="px-3 py-2">{r.familyName || '—'}</td>
            <td className="px-3 py-2">{r.givenName || '—'}</td>
            <td className="px-3 py-2 break-all">{r.email || '—'}</td>
            {showSection ? <td className="px-3 py-2">{r.section || '—'}</td> : null}
            <td className="min-w-56 px-3 py-2">
              {r.status === 'error' ? (
                <ul className="list-disc space-y-1 pl-4 text-danger">
                  {r.errors.map((e, i) => (
                    <li key={i}>{e}</li>
                  ))}
                </ul>
              ) : (
                <>
                  <span>{statusWords[r.status]}</span>
                  {r.changes.length > 0 ? <span className="block text-muted">{r.changes.join('; ')}</span> : null}
                  {r.dropped ? <span className="block text-warn">Dropped from the course; stays dropped.</span> : null}
                </>
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </Table>
  )
}

export default function ImportRosterRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course } = loaderData
  const navigation = useNavigation()
  const busy = navigation.state === 'submitting'
  const plan = actionData?.plan ?? null
  const errorRows = plan?.rows.filter((r) => r.status === 'error') ?? []
  const readyRows = plan?.rows.filter((r) => r.status !== 'error') ?? []
  const showSection = plan?.rows.some((r) => r.section !== '') ?? false
  const toWrite = plan ? plan.counts.new + plan.counts.add + plan.counts.update : 0
  const formErrorId = actionData?.formError ? 'roster-form-error' : undefined
  return (
    <div className="max-w-5xl">
      <p className="text-sm text-muted">
        <Link to={href('/courses/:courseId/people', { courseId: String(course.id) })}>People</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Import a class list</h1>
      <p className="mt-2 text-muted">
        A CSV with one student per line and a first line naming the columns: student ID, family name, given name and
        e-mail, and optionally section. Commas, semicolons or tabs between the columns all work. At most {MAX_MB} MB and{' '}
        {MAX_ROSTER_ROWS.toLocaleString('en')} students. You see what would happen before anything is saved. Students
        already on the course are matched by student ID, then by e-mail, and updated; an empty section cell leaves their
        section as it is. New students are on the course at once and get an e-mail inviting them to choose a password.
      </p>

      {actionData?.formError ? (
        <Notice tone="error" className="mt-6">
          <p id="roster-form-error" className="font-semibold">
            {actionData.formError}
          </p>
        </Notice>
      ) : null}
      {actionData?.note ? (
        <Notice tone="warn" className="mt-4">
          {actionData.note}
        </Notice>
      ) : null}

      {plan ? (
        <section aria-labelledby="preview-title" className="mt-8">
          <h2 id="preview-title" className="text-xl font-semibold">
            Preview{actionData?.fileName ? ` of ${actionData.fileName}` : ''}
          </h2>
          <p className="mt-1">
            {plan.rows.length} row{plan.rows.length === 1 ? '' : 's'}: {plan.counts.new} new, {plan.counts.add} with an
            account already, {plan.counts.update} to update, {plan.counts.unchanged} unchanged
            {plan.counts.error > 0 ? (
              <>
                , <strong className="text-danger">{plan.counts.error} to fix</strong>
              </>
            ) : null}
            .{plan.newSections.length > 0 ? ` New sections: ${plan.newSections.join(', ')}.` : ''}
            {plan.ignoredColumns.length > 0 ? ` Columns left out: ${plan.ignoredColumns.join(', ')}.` : ''}
          </p>
          {errorRows.length > 0 ? (
            <>
              <h3 className="mt-6 text-lg font-semibold text-danger">Rows to fix ({errorRows.length})</h3>
              <p className="text-sm text-muted">
                Nothing is saved until every row is right. Fix the lines in the box below (or in the file) and check
                again.
              </p>
              <RowsTable rows={errorRows} caption="Rows to fix, with what is wrong" showSection={showSection} />
            </>
          ) : null}
          {readyRows.length > 0 ? (
            <>
              <h3 className="mt-6 text-lg font-semibold">Rows ready ({readyRows.length})</h3>
              <RowsTable
                rows={readyRows.slice(0, SHOWN_READY_ROWS)}
                caption="Rows ready to import, with what will happen"
                showSection={showSection}
              />
              {readyRows.length > SHOWN_READY_ROWS ? (
                <p className="mt-2 text-sm text-muted">
                  … and {readyRows.length - SHOWN_READY_ROWS} more rows without problems.
                </p>
              ) : null}
            </>
          ) : null}
          {plan.counts.error === 0 ? (
            toWrite > 0 ? (
              <Form method="post" encType="multipart/form-data" className="mt-6">
                <input type="hidden" name="intent" value="import" />
                <input type="hidden" name="csv" value={actionData?.csv ?? ''} />
                <input type="hidden" name="fileName" value={actionData?.fileName ?? ''} />
                <Button type="submit" disabled={busy}>
                  {busy ? 'Importing…' : `Import ${toWrite} student${toWrite === 1 ? '' : 's'}`}
                </Button>
              </Form>
            ) : (
              <Notice tone="info" className="mt-6">
                Everyone in this list is already on the course as written; there is nothing to import.
              </Notice>
            )
          ) : null}
        </section>
      ) : null}

      {/* Made anew for each list read, so a file chosen before does not override the fixed text in the box. */}
      <Form
        key={actionData?.csv ?? ''}
        method="post"
        encType="multipart/form-data"
        className="mt-8 flex flex-col gap-4 rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6"
      >
        <h2 className="text-lg font-semibold">{plan ? 'Change the list and check again' : 'Choose the class list'}</h2>
        <input type="hidden" name="intent" value="preview" />
        <div className="flex flex-col gap-1">
          <label htmlFor="roster-file" className="text-sm font-medium">
            CSV file
          </label>
          <input
            id="roster-file"
            name="file"
            type="file"
            accept=".csv,.txt,text/csv,text/plain"
            aria-describedby={['roster-file-hint', formErrorId].filter(Boolean).join(' ')}
            aria-invalid={actionData?.formError ? true : undefined}
            className="max-w-full rounded-md border border-line px-3 py-2"
          />
          <p id="roster-file-hint" className="text-sm text-muted">
            A file chosen here is read instead of the box below.
          </p>
        </div>
        <TextareaField
          id="roster-csv"
          label="Or paste the class list"
          name="csv"
          rows={10}
          spellCheck={false}
          defaultValue={actionData?.csv ?? ''}
          aria-describedby={formErrorId}
          className="[&_textarea]:font-mono [&_textarea]:text-sm"
          hint={
            <>
              For example: <code>Student ID,Family name,Given name,E-mail,Section</code>, then one line per student.
            </>
          }
        />
        <div>
          <Button type="submit" variant={plan && plan.counts.error === 0 ? 'secondary' : 'primary'} disabled={busy}>
            {busy ? 'Checking…' : 'Check the list'}
          </Button>
        </div>
      </Form>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
