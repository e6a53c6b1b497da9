import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { requireBankUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { bankViewerFor, importBank } from '#app/server/problems.server.ts'
import type { Route } from './+types/import'

export const meta: Route.MetaFunction = () => [{ title: 'Import problems · Cyclewright' }]

/** Largest bank document accepted (docs/bank-format.md). */
export const MAX_IMPORT_BYTES = 2 * 1024 * 1024
const MAX_IMPORT_MB = MAX_IMPORT_BYTES / 1024 / 1024

type ImportError = { problem: string; field: string; message: string }
type ActionResult = { formError: string; errors: ImportError[] }

export async function loader({ request }: Route.LoaderArgs) {
  await requireBankUser(request)
  return null
}

function fail(formError: string, errors: ImportError[] = [], status = 400) {
  return data<ActionResult>({ formError, errors }, { status })
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireBankUser(request)
  // Refuse oversized uploads before reading them; the multipart overhead is small.
  // Browsers always state the length of a form upload; without it the body could be any size.
  const header = request.headers.get('content-length')
  if (header === null) return fail('The upload did not say how large it is. Choose the file again and retry.', [], 411)
  const length = Number(header)
  if (!Number.isFinite(length) || length > MAX_IMPORT_BYTES + 64 * 1024)
    return fail(`That file is larger than ${MAX_IMPORT_MB} MB. Export fewer problems at a time.`, [], 413)
  let form: FormData
  try {
    form = await request.formData()
  } catch {
    return fail('The upload could not be read. Choose the file again and retry.')
  }
  const file = form.get('document')
  if (!(file instanceof File) || file.size === 0) return fail('Choose a bank document (a .json file) to import.')
  if (file.size > MAX_IMPORT_BYTES)
    return fail(`That file is larger than ${MAX_IMPORT_MB} MB. Export fewer problems at a time.`, [], 413)
  let raw: unknown
  try {
    raw = JSON.parse(await file.text())
  } catch {
    return fail(`“${file.name}” is not a JSON document. Bank documents are the .json files Cyclewright exports.`)
  }
  const viewer = await bankViewerFor(db(), user)
  const result = await importBank(db(), viewer, raw)
  if (!result.ok) {
    const n = result.errors.length
    return fail(`Nothing was imported: ${n} problem${n === 1 ? '' : 's'} to fix in “${file.name}”.`, result.errors)
  }
  return redirect(`${href('/bank')}?imported=${result.problemIds.length}`)
}

export default function ImportRoute({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === 'submitting'
  const errorId = actionData?.formError ? 'import-error' : undefined
  return (
    <div className="max-w-3xl">
      <p className="text-sm text-muted">
        <Link to={href('/bank')}>Problem bank</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Import problems</h1>
      <p className="mt-2 text-muted">
        Upload a bank document exported from Cyclewright (a .json file, at most {MAX_IMPORT_MB} MB). Every problem is
        checked first; if any is invalid, nothing is written and each problem is listed here with what to fix. Imported
        problems are private to you until you share them. The file’s layout is described in{' '}
        <Link to={href('/help/:page', { page: 'bank-format' })}>the bank format</Link>; how to write a problem is in{' '}
        <Link to={href('/help/:page', { page: 'authoring' })}>the author guide</Link>.
      </p>
      {actionData?.formError ? (
        <Notice tone="error" className="mt-6">
          <p id="import-error" className="font-semibold">
            {actionData.formError}
          </p>
          {actionData.errors.length > 0 ? (
            <ul className="mt-2 list-disc space-y-1 pl-5">
              {actionData.errors.map((e, i) => (
                <li key={i}>
                  <span className="font-semibold">{e.problem}</span>
                  {e.field ? (
                    <>
                      {' '}
                      · <code>{e.field}</code>
                    </>
                  ) : null}
                  : {e.message}
                </li>
              ))}
            </ul>
          ) : null}
        </Notice>
      ) : null}
      <Form
        method="post"
        encType="multipart/form-data"
        className="mt-6 flex flex-col gap-4 rounded-lg border border-line bg-white p-6 shadow-sm"
      >
        <div className="flex flex-col gap-1">
          <label htmlFor="import-document" className="text-sm font-medium">
            Bank document
          </label>
          <input
            id="import-document"
            name="document"
            type="file"
            accept="application/json,.json"
            required
            aria-invalid={actionData?.formError ? true : undefined}
            aria-describedby={['import-hint', errorId].filter(Boolean).join(' ')}
            className="rounded-md border border-line px-3 py-2"
          />
          <p id="import-hint" className="text-sm text-muted">
            At most {MAX_IMPORT_MB} MB.
          </p>
        </div>
        <div>
          <Button type="submit" disabled={busy}>
            {busy ? 'Checking and importing…' : 'Import'}
          </Button>
        </div>
      </Form>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
