import { data, href } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { ProblemEditor } from '#app/components/problem-editor/index.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { requireIdParam } from '#app/lib/params.ts'
import { editorStateFromDefinition } from '#app/lib/problem-form.ts'
import { requireBankUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { editorOptions, runEditorAction } from '#app/server/problem-editor.server.ts'
import { bankViewerFor, getProblemDetail, saveProblem } from '#app/server/problems.server.ts'
import type { Route } from './+types/edit'
import { readFormData } from '#app/lib/form.ts'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.problem.title ? `Edit ${data.problem.title}` : 'Edit problem'} · Problem bank · Cyclewright` },
]

/** The save the form starts from, sent back with the form to detect a save made meanwhile. */
function withBase<S extends { values: Record<string, string> }>(state: S, updatedAt: string): S {
  return { ...state, values: { ...state.values, _basedOn: updatedAt } }
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const problemId = requireIdParam(params.problemId, 'problem')
  const user = await requireBankUser(request)
  const database = db()
  const detail = await getProblemDetail(database, await bankViewerFor(database, user), problemId)
  if (!detail) throw data('There is no such problem in your bank, or it is not shared with you.', { status: 404 })
  if (!detail.canEdit)
    throw data('Only the owner of a problem can change it; make a copy to change your own.', { status: 403 })
  const { latest } = detail
  // A newest version whose stored document fails the definition check cannot fill the form;
  // the newest one that reads does, and saving it gives the problem a readable newest version.
  const base = detail.versions.find((v) => v.definition !== null)
  if (!base?.definition)
    throw data(
      `No version of this problem can be edited: their stored definitions do not pass the problem check. Nothing was changed; an administrator can restore a version from a backup.`,
      { status: 422 },
    )
  return {
    problem: { id: detail.id, title: detail.title, versionNumber: latest.number, frozen: latest.frozenAt !== null },
    startedFrom: latest.definition === null ? { unreadable: latest.number, from: base.number } : null,
    state: withBase(editorStateFromDefinition(base.definition, detail.visibility), detail.updatedAt),
    options: editorOptions(),
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const problemId = requireIdParam(params.problemId, 'problem')
  const user = await requireBankUser(request)
  const form = await readFormData(request)
  return runEditorAction(form, async (problem) => {
    const database = db()
    await saveProblem(database, await bankViewerFor(database, user), problemId, problem)
    return problemId
  })
}

export default function EditProblemRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { problem } = loaderData
  const state = actionData?.state ?? loaderData.state
  return (
    <div>
      <p className="text-sm text-muted">
        <a href={href('/bank')}>Problem bank</a> ·{' '}
        <a href={href('/bank/:problemId', { problemId: String(problem.id) })}>{problem.title}</a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Edit problem</h1>
      <p className="mt-2 text-muted">
        Version {problem.versionNumber}
        {problem.frozen ? ', used in an assignment' : ''}.
      </p>
      {loaderData.startedFrom ? (
        <Notice tone="warn" className="mt-4">
          Version {loaderData.startedFrom.unreadable} cannot be read (its stored definition does not pass the problem
          check), so the form starts from version {loaderData.startedFrom.from}, the newest that reads. Saving gives the
          problem a readable newest version.
        </Notice>
      ) : null}
      <div className="mt-6">
        <ProblemEditor
          key={actionData?.nonce ?? 'start'}
          state={state}
          issues={actionData?.issues ?? []}
          options={loaderData.options}
          preview={actionData?.preview ?? null}
          focusSummary={(actionData?.issues.length ?? 0) > 0}
          saveLabel={problem.frozen ? `Save as version ${problem.versionNumber + 1}` : 'Save changes'}
          saveNote={
            problem.frozen ? (
              <Notice tone="info">
                Version {problem.versionNumber} is used in an assignment, so it stays as it is. Saving makes version{' '}
                {problem.versionNumber + 1}; assignments keep version {problem.versionNumber}.
              </Notice>
            ) : null
          }
        />
      </div>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
