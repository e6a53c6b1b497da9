import { href } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { ProblemEditor } from '#app/components/problem-editor/index.tsx'
import { emptyEditorState } from '#app/lib/problem-form.ts'
import { requireBankUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { editorOptions, runEditorAction } from '#app/server/problem-editor.server.ts'
import { bankViewerFor, createProblem } from '#app/server/problems.server.ts'
import type { Route } from './+types/new'
import { readFormData } from '#app/lib/form.ts'

export const meta: Route.MetaFunction = () => [{ title: 'New problem · Problem bank · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  await requireBankUser(request)
  return { state: emptyEditorState(), options: editorOptions() }
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireBankUser(request)
  const form = await readFormData(request)
  return runEditorAction(form, async (problem) => {
    const database = db()
    const { problemId } = await createProblem(database, await bankViewerFor(database, user), problem)
    return problemId
  })
}

export default function NewProblemRoute({ loaderData, actionData }: Route.ComponentProps) {
  const state = actionData?.state ?? loaderData.state
  return (
    <div>
      <p className="text-sm text-muted">
        <a href={href('/bank')}>Problem bank</a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">New problem</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Givens are drawn per student, the physics turns them into a key, and finds are what students answer. Save when
        the preview looks right; you can edit it until it is used in an assignment.
      </p>
      <div className="mt-6">
        <ProblemEditor
          key={actionData?.nonce ?? 'start'}
          state={state}
          issues={actionData?.issues ?? []}
          options={loaderData.options}
          preview={actionData?.preview ?? null}
          focusSummary={(actionData?.issues.length ?? 0) > 0}
          saveLabel="Save the problem"
        />
      </div>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
