import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { SweepPanel } from '#app/components/sweep-panel.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { VariantPreview } from '#app/components/variant-preview.tsx'
import { cycleOf } from '#app/domain/authoring/definition.ts'
import { cycleName } from '#app/domain/thermo/catalog.ts'
import { difficultyLabel, levelLabel, visibilityLabel } from '#app/lib/bank-labels.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireBankUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { previewProblem } from '#app/server/preview.server.ts'
import {
  ProblemAccessError,
  UnreadableVersionError,
  bankViewerFor,
  copyProblem,
  getProblemDetail,
} from '#app/server/problems.server.ts'
import { latestSweepForVersion, startSweep } from '#app/server/sweeps.server.ts'
import { BankChangeError, deleteProblem, problemUsage, setProblemArchived } from '#app/server/bank-archive.server.ts'
import type { Route } from './+types/$problemId'
import { readFormData } from '#app/lib/form.ts'

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.problem.title ?? 'Problem'} · Cyclewright` }]

async function loadVisible(request: Request, problemIdParam: string | undefined) {
  const user = await requireBankUser(request)
  const problemId = requireIdParam(problemIdParam, 'problem')
  const viewer = await bankViewerFor(db(), user)
  const problem = await getProblemDetail(db(), viewer, problemId)
  if (!problem) throw data('There is no such problem in your bank, or it is not shared with you.', { status: 404 })
  return { user, viewer, problem }
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { problem } = await loadVisible(request, params.problemId)
  const url = new URL(request.url)
  const wanted = Number(url.searchParams.get('version') ?? problem.latest.number)
  const version = problem.versions.find((v) => v.number === wanted) ?? problem.latest
  const convention = url.searchParams.get('convention') === 'chemistry' ? 'chemistry' : 'engineering'
  // A version whose stored document fails the definition check is named, not drawn; the rest of the page stays.
  const preview = version.definition ? previewProblem(version.definition, { convention }) : null
  const sweep = await latestSweepForVersion(db(), version.id)
  const usage = await problemUsage(db(), problem.id)
  const confirmDelete = problem.canEdit && url.searchParams.get('confirm') === 'delete'
  const notice = url.searchParams.get('done')
  return {
    problem,
    version,
    preview,
    convention,
    sweep,
    usage,
    confirmDelete,
    notice,
    cycle: version.definition ? cycleName(cycleOf(version.definition.physics)) : null,
  }
}

const ActionSchema = z.discriminatedUnion('intent', [
  z.object({ intent: z.literal('sweep'), total: z.coerce.number().int().min(10).max(5000).catch(500) }),
  z.object({ intent: z.literal('copy') }),
  z.object({ intent: z.literal('archive') }),
  z.object({ intent: z.literal('restore') }),
  z.object({ intent: z.literal('delete'), confirm: z.string().optional() }),
])

export async function action({ request, params }: Route.ActionArgs) {
  const { user, viewer, problem } = await loadVisible(request, params.problemId)
  const parsed = ActionSchema.safeParse(Object.fromEntries(await readFormData(request)))
  if (!parsed.success) throw data('That action is not available here.', { status: 400 })
  const url = new URL(request.url)
  switch (parsed.data.intent) {
    case 'sweep': {
      const wanted = Number(url.searchParams.get('version') ?? problem.latest.number)
      const version = problem.versions.find((v) => v.number === wanted) ?? problem.latest
      await startSweep(db(), { versionId: version.id, requestedBy: user.id, total: parsed.data.total })
      return redirect(`${url.pathname}${url.search}#check`)
    }
    case 'archive':
    case 'restore':
    case 'delete': {
      try {
        if (parsed.data.intent === 'delete') {
          await deleteProblem(db(), viewer, problem.id, { confirmed: parsed.data.confirm === 'yes' })
          return redirect(`${href('/bank')}?deleted=1`)
        }
        await setProblemArchived(db(), viewer, problem.id, parsed.data.intent === 'archive')
        return redirect(
          `${href('/bank/:problemId', { problemId: String(problem.id) })}?done=${parsed.data.intent === 'archive' ? 'archived' : 'restored'}`,
        )
      } catch (e) {
        if (!(e instanceof BankChangeError)) throw e
        if (e.status === 403 || e.status === 404) throw data(e.message, { status: e.status })
        return data({ formError: e.message }, { status: e.status })
      }
    }
    case 'copy': {
      try {
        const copy = await copyProblem(db(), viewer, problem.id)
        return redirect(`${href('/bank/:problemId', { problemId: String(copy.problemId) })}?copied=1`)
      } catch (e) {
        if (e instanceof ProblemAccessError) throw data('That problem is not shared with you.', { status: 404 })
        if (e instanceof UnreadableVersionError) return data({ formError: e.message }, { status: e.status })
        throw e
      }
    }
  }
}

export default function ProblemRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { problem, version, preview, convention, sweep, usage, confirmDelete, notice, cycle } = loaderData
  const formError = actionData && 'formError' in actionData ? actionData.formError : null
  const def = version.definition
  const busy = useNavigation().state === 'submitting'
  const isLatest = version.number === problem.latest.number
  const fixedConvention = def !== null && def.convention !== 'course'
  const readable = problem.versions.filter((v) => v.definition !== null && v.number !== version.number)
  return (
    <div className="space-y-8">
      <div>
        <p className="text-sm text-muted">
          <Link to={href('/bank')}>Problem bank</Link>
        </p>
        <div className="mt-1 flex flex-wrap items-start justify-between gap-4">
          <div>
            <h1 className="text-3xl font-semibold">{def?.title ?? problem.title}</h1>
            {def ? (
              <p className="mt-1 text-sm text-muted">
                {cycle} · {difficultyLabel[def.tags.difficulty]} · {levelLabel[def.tags.level]}
                {def.tags.topics.length > 0 ? ` · ${def.tags.topics.join(', ')}` : ''}
              </p>
            ) : null}
            <p className="mt-1 text-sm text-muted">
              By {problem.canEdit ? 'you' : problem.ownerName} · {visibilityLabel[problem.visibility]} · version{' '}
              {version.number}
              {version.frozenAt ? ' (frozen: used by an assignment)' : ''}
            </p>
            {problem.origin ? (
              <p className="mt-1 text-sm text-muted">
                Copied from{' '}
                {problem.origin.problemId ? (
                  <Link to={href('/bank/:problemId', { problemId: String(problem.origin.problemId) })}>
                    {problem.origin.title ?? 'another problem'}
                  </Link>
                ) : (
                  (problem.origin.title ?? 'a problem that no longer exists')
                )}
                {problem.origin.versionNumber ? `, version ${problem.origin.versionNumber}` : ''}
              </p>
            ) : null}
            {problem.importedFrom ? (
              <p className="mt-1 text-sm text-muted">
                Imported; the document credits “{problem.importedFrom.title}” by {problem.importedFrom.author}
              </p>
            ) : null}
          </div>
          <div className="flex flex-wrap gap-2">
            {problem.canEdit ? (
              <Link
                to={href('/bank/:problemId/edit', { problemId: String(problem.id) })}
                className="rounded-md bg-accent px-4 py-2 text-sm font-semibold text-white no-underline hover:bg-accent-strong hover:no-underline"
              >
                Edit
              </Link>
            ) : (
              <Form method="post">
                <input type="hidden" name="intent" value="copy" />
                <button
                  type="submit"
                  disabled={busy}
                  className="rounded-md bg-accent px-4 py-2 text-sm font-semibold text-white hover:bg-accent-strong"
                >
                  Copy into my bank
                </button>
              </Form>
            )}
            <a
              href={`${href('/bank/export')}?ids=${problem.id}`}
              className="rounded-md border border-line bg-white px-4 py-2 text-sm font-semibold text-ink no-underline hover:bg-paper hover:no-underline"
            >
              Export
            </a>
          </div>
        </div>
      </div>

      {notice === 'archived' ? (
        <Notice tone="ok">
          Archived: this problem no longer shows in the bank list or the assignment picker. Assignments that use it keep
          it.
        </Notice>
      ) : null}
      {notice === 'restored' ? (
        <Notice tone="ok">Restored: this problem is back in the bank list and the assignment picker.</Notice>
      ) : null}
      {usage?.archivedAt ? (
        <Notice tone="warn">
          This problem is archived: it is hidden from the bank list and the assignment picker.
        </Notice>
      ) : null}
      {formError && !confirmDelete ? <Notice tone="error">{formError}</Notice> : null}

      {problem.canEdit && usage ? (
        <section aria-labelledby="tidy-title" className="rounded-lg border border-line bg-white p-4">
          <h2 id="tidy-title" className="text-lg font-semibold">
            Archive or delete
          </h2>
          <p className="mt-1 text-sm text-muted">
            {usage.assignmentCount === 0
              ? 'No assignment uses this problem.'
              : `${usage.assignmentCount} assignment${usage.assignmentCount === 1 ? ' uses' : 's use'} this problem, so it can be archived but not deleted.`}
          </p>
          <div className="mt-3 flex flex-wrap gap-3">
            <Form method="post">
              <input type="hidden" name="intent" value={usage.archivedAt ? 'restore' : 'archive'} />
              <button
                type="submit"
                disabled={busy}
                className="rounded-md border border-line bg-white px-4 py-2 text-sm font-semibold hover:bg-paper"
              >
                {usage.archivedAt ? 'Restore' : 'Archive'}
              </button>
            </Form>
            {usage.deletable && !confirmDelete ? (
              <Form method="get">
                <input type="hidden" name="confirm" value="delete" />
                <button
                  type="submit"
                  className="rounded-md border border-line bg-white px-4 py-2 text-sm font-semibold text-danger hover:bg-paper"
                >
                  Delete…
                </button>
              </Form>
            ) : null}
          </div>
          {confirmDelete && usage.deletable ? (
            <div className="mt-4 rounded-md border border-warn/40 bg-warn-soft p-4" data-confirm="delete">
              <p className="font-semibold text-warn">Delete this problem?</p>
              <p className="mt-1">
                Deletes “{def?.title ?? problem.title}” with its {usage.versionCount} version
                {usage.versionCount === 1 ? '' : 's'} and their checks; this cannot be undone.
              </p>
              {formError ? (
                <Notice tone="error" className="mt-2">
                  {formError}
                </Notice>
              ) : null}
              <Form
                method="post"
                action={`${href('/bank/:problemId', { problemId: String(problem.id) })}?confirm=delete`}
                className="mt-3 flex flex-wrap items-center gap-4"
              >
                <input type="hidden" name="intent" value="delete" />
                <input type="hidden" name="confirm" value="yes" />
                <button
                  type="submit"
                  disabled={busy}
                  className="rounded-md bg-danger px-4 py-2 text-sm font-semibold text-white"
                >
                  Yes, delete it
                </button>
                <Link to={href('/bank/:problemId', { problemId: String(problem.id) })}>Cancel</Link>
              </Form>
            </div>
          ) : null}
        </section>
      ) : null}

      {!isLatest ? (
        <Notice tone="warn">
          You are looking at version {version.number}. The newest is{' '}
          <Link to={href('/bank/:problemId', { problemId: String(problem.id) })}>version {problem.latest.number}</Link>.
        </Notice>
      ) : null}

      {preview === null ? (
        <UnreadableVersionNotice
          versionNumber={version.number}
          problemId={problem.id}
          canEdit={problem.canEdit}
          others={readable.map((v) => v.number)}
          latestNumber={problem.latest.number}
        />
      ) : (
        <>
          {preview.issues.length > 0 ? (
            <Notice tone="warn">
              <p className="font-semibold">This version has problems to fix:</p>
              <ul className="mt-1 list-disc pl-5">
                {preview.issues.map((i, n) => (
                  <li key={n}>
                    <code>{i.path}</code>: {i.message}
                  </li>
                ))}
              </ul>
            </Notice>
          ) : null}

          <section aria-labelledby="preview-title">
            <div className="flex flex-wrap items-end justify-between gap-3">
              <h2 id="preview-title" className="text-xl font-semibold">
                Three variants side by side
              </h2>
              {fixedConvention ? (
                <p className="text-sm text-muted">Sign convention: {def.convention} (fixed by the problem)</p>
              ) : (
                <Form method="get" className="flex items-end gap-2 text-sm">
                  {!isLatest ? <input type="hidden" name="version" value={version.number} /> : null}
                  <label htmlFor="preview-convention">Preview in the convention of</label>
                  <select
                    id="preview-convention"
                    name="convention"
                    defaultValue={convention}
                    className="rounded-md border border-line bg-white px-2 py-1"
                  >
                    <option value="engineering">an engineering course (ΔU = Q − W)</option>
                    <option value="chemistry">a chemistry course (ΔU = q + w)</option>
                  </select>
                  <button type="submit" className="rounded-md border border-line bg-white px-3 py-1 hover:bg-paper">
                    Show
                  </button>
                </Form>
              )}
            </div>
            <div className="mt-4">
              <VariantPreview variants={preview.variants} />
            </div>
          </section>
        </>
      )}

      <SweepPanel versionNumber={version.number} initial={sweep} />

      <section aria-labelledby="versions-title">
        <h2 id="versions-title" className="text-xl font-semibold">
          Versions
        </h2>
        <p className="mt-1 text-sm text-muted">
          A version is frozen once an assignment uses it; editing a frozen version makes a new one, and assignments keep
          theirs until you move them.
        </p>
        <ol className="mt-3 divide-y divide-line rounded-lg border border-line bg-white text-sm">
          {problem.versions.map((v) => (
            <li key={v.id} className="flex flex-wrap items-center justify-between gap-2 px-4 py-2">
              <span>
                {v.number === version.number ? (
                  <strong>Version {v.number}</strong>
                ) : (
                  <Link
                    to={
                      v.number === problem.latest.number
                        ? href('/bank/:problemId', { problemId: String(problem.id) })
                        : `${href('/bank/:problemId', { problemId: String(problem.id) })}?version=${v.number}`
                    }
                  >
                    Version {v.number}
                  </Link>
                )}{' '}
                <span className="text-muted">
                  · {v.createdByName} · <time dateTime={v.createdAt}>{v.createdAt.slice(0, 10)}</time>
                </span>
              </span>
              <span className="text-muted">
                {v.frozenAt ? 'Frozen' : 'Editable'}
                {v.definition === null ? ' · cannot be read' : ''}
              </span>
            </li>
          ))}
        </ol>
      </section>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}

/**
 * In place of the preview, for a version whose stored document fails the definition check:
 * which version, why nothing is drawn, and where to go instead (links work without JavaScript).
 */
function UnreadableVersionNotice({
  versionNumber,
  problemId,
  canEdit,
  others,
  latestNumber,
}: {
  versionNumber: number
  problemId: number
  canEdit: boolean
  others: number[]
  latestNumber: number
}) {
  const page = href('/bank/:problemId', { problemId: String(problemId) })
  return (
    <Notice tone="warn">
      <h2 className="font-semibold">Version {versionNumber} cannot be shown</h2>
      <p className="mt-1">
        Its stored definition does not pass the problem check: it was changed outside Cyclewright or saved under older
        rules. No variants can be drawn from it, and nothing has been changed.
      </p>
      {others.length > 0 ? (
        <p className="mt-1">
          Open another version:{' '}
          {others.map((n, i) => (
            <span key={n}>
              {i > 0 ? ', ' : ''}
              <Link to={n === latestNumber ? page : `${page}?version=${n}`}>version {n}</Link>
            </span>
          ))}
          .
        </p>
      ) : (
        <p className="mt-1">This problem has no other version that can be read.</p>
      )}
      <p className="mt-1">
        {canEdit && others.length > 0
          ? 'To restore the problem, press Edit: the form starts from the newest version that reads, and saving it gives the problem a readable newest version. '
          : ''}
        An administrator can also restore this version from a backup.
      </p>
    </Notice>
  )
}
