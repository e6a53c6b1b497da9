import { data, redirect } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { ProblemEditor } from '#app/components/problem-editor.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { lintDefinition } from '#app/domain/authoring/lint.ts'
import { PITFALLS } from '#app/domain/grading/pitfalls.ts'
import { RANKINE_TEMPLATES, templates } from '#app/domain/thermo/templates/index.ts'
import {
  buildEditorOptions,
  definitionFromForm,
  editorStateFromDefinition,
  editorStateFromForm,
  findTemplate,
  keepTemplateInputs,
  mergeIssues,
  type EditorState,
  type FormIssue,
} from '#app/lib/problem-form.ts'
import { parseDefinition, VISIBILITIES } from '#app/lib/problem-schema.ts'
import type { PreviewResult } from '#app/lib/preview.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireBankUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { previewProblem } from '#app/server/preview.server.ts'
import { bankViewerFor, getProblemDetail, InvalidDefinitionError, ProblemAccessError, saveProblem } from '#app/server/problems.server.ts'
import type { Route } from './+types/edit'

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.problem.title ? `Edit ${data.problem.title}` : 'Edit problem'} · Problem bank · Cyclewright` }]

const IntentSchema = z.enum(['save', 'preview', 'add-given', 'add-constraint', 'add-find', 'change-template'])
const VisibilitySchema = z.enum(VISIBILITIES)
const PreviewConventionSchema = z.enum(['chemistry', 'engineering']).catch('engineering')

type EditorAnswer = { state: EditorState; issues: FormIssue[]; preview: PreviewResult | null; nonce: string }

function editorOptions() {
  return buildEditorOptions(Object.values(templates), RANKINE_TEMPLATES, PITFALLS)
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const problemId = requireIdParam(params.problemId, 'problem')
  const user = await requireBankUser(request)
  const database = db()
  const detail = await getProblemDetail(database, await bankViewerFor(database, user), problemId)
  if (!detail) throw data('There is no such problem in your bank, or it is not shared with you.', { status: 404 })
  if (!detail.canEdit) throw data('Only the owner of a problem can change it; make a copy to change your own.', { status: 403 })
  const { latest } = detail
  return {
    problem: { id: detail.id, title: detail.title, versionNumber: latest.number, frozen: latest.frozenAt !== null },
    state: editorStateFromDefinition(latest.definition, detail.visibility),
    options: editorOptions(),
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const problemId = requireIdParam(params.problemId, 'problem')
  const user = await requireBankUser(request)
  const form = await request.formData()
  const answer = (state: EditorState, issues: FormIssue[] = [], preview: PreviewResult | null = null): EditorAnswer => ({
    state,
    issues,
    preview,
    nonce: crypto.randomUUID(),
  })
  const intent = IntentSchema.safeParse(form.get('intent'))
  if (!intent.success) return data(answer(editorStateFromForm(form), [{ path: 'title', message: 'Use one of the buttons at the bottom of the form.' }]), { status: 400 })
  switch (intent.data) {
    case 'add-given':
      return answer(editorStateFromForm(form, 'givens'))
    case 'add-constraint':
      return answer(editorStateFromForm(form, 'constraints'))
    case 'add-find':
      return answer(editorStateFromForm(form, 'finds'))
    case 'change-template': {
      const state = editorStateFromForm(form)
      const chosen = findTemplate(editorOptions(), state.values['physics.template'] ?? '')
      return answer({ ...state, values: keepTemplateInputs(state.values, chosen?.inputs.map((i) => i.name) ?? []) })
    }
    case 'preview': {
      const { draft, formIssues } = definitionFromForm(form)
      const result = previewProblem(draft, { convention: PreviewConventionSchema.parse(form.get('_previewConvention')) })
      return answer(editorStateFromForm(form), [], { ...result, issues: mergeIssues(formIssues, result.issues) })
    }
    case 'save': {
      const checked = checkForSave(form)
      if (!checked.ok) return data(answer(editorStateFromForm(form), checked.issues), { status: 400 })
      try {
        const database = db()
        await saveProblem(database, await bankViewerFor(database, user), problemId, checked.value)
      } catch (e) {
        if (e instanceof ProblemAccessError) throw data(e.message, { status: 403 })
        if (!(e instanceof InvalidDefinitionError)) throw e
        return data(answer(editorStateFromForm(form), [{ path: 'title', message: e.message }]), { status: 400 })
      }
      return redirect(`/bank/${problemId}`)
    }
  }
}

/** The form's definition when it passes the shape check and the lint, else every issue by field. */
function checkForSave(form: FormData): { ok: true; value: { definition: ProblemDefinition; visibility: z.infer<typeof VisibilitySchema> } } | { ok: false; issues: FormIssue[] } {
  const { draft, visibility, formIssues } = definitionFromForm(form)
  const vis = VisibilitySchema.safeParse(visibility)
  const own = vis.success ? formIssues : [...formIssues, { path: 'visibility', message: 'Choose who can use the problem.' }]
  const parsed = parseDefinition(draft)
  if (!parsed.ok) return { ok: false, issues: mergeIssues(own, parsed.issues) }
  if (own.length > 0 || !vis.success) return { ok: false, issues: own }
  let lint: FormIssue[]
  try {
    lint = lintDefinition(parsed.value)
  } catch (e) {
    console.error('lintDefinition failed', e)
    lint = [{ path: 'physics.template', message: 'The problem could not be checked just now; please try again, and report it if it persists.' }]
  }
  if (lint.length > 0) return { ok: false, issues: lint }
  return { ok: true, value: { definition: parsed.value, visibility: vis.data } }
}

export default function EditProblemRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { problem } = loaderData
  const state = actionData?.state ?? loaderData.state
  return (
    <div>
      <p className="text-sm text-muted">
        <a href="/bank">Problem bank</a> · <a href={`/bank/${problem.id}`}>{problem.title}</a>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Edit problem</h1>
      <p className="mt-2 text-muted">Version {problem.versionNumber}{problem.frozen ? ', used in an assignment' : ''}.</p>
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
                Version {problem.versionNumber} is used in an assignment, so it stays as it is. Saving makes version {problem.versionNumber + 1};
                assignments keep version {problem.versionNumber}.
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
