/**
 * What the editor's two pages (new problem, edit problem) share on the server: the template
 * and pitfall lists the form offers, and the action for every button of the form — adding or
 * removing a row, switching template, previewing without JavaScript, and checking a draft before it is
 * saved. Only the save itself differs (create or new version), so the routes pass it in.
 */
import { data, redirect } from 'react-router'
import { z } from 'zod'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { lintDefinition } from '#app/domain/authoring/lint.ts'
import { PITFALLS } from '#app/domain/grading/pitfalls.ts'
import { TEMPLATE_CATALOG, type TemplateFamily } from '#app/domain/thermo/catalog.ts'
import {
  buildEditorOptions,
  definitionFromForm,
  editorStateFromForm,
  editorStateWithout,
  editorStateWithoutHeater,
  findTemplate,
  keepTemplateInputs,
  mergeIssues,
  readHeaterIntent,
  readRemoveIntent,
  type EditorState,
  type FormIssue,
} from '#app/lib/problem-form.ts'
import { parseDefinition, VISIBILITIES } from '#app/lib/problem-schema.ts'
import type { PreviewResult } from '#app/lib/preview.ts'
import { echoValues } from '#app/lib/text-field.ts'
import { previewProblem } from './preview.server.ts'
import { InvalidDefinitionError, ProblemAccessError, ProblemConflictError } from './problems.server.ts'

const IntentSchema = z.enum(['save', 'preview', 'add-given', 'add-constraint', 'add-find', 'change-template'])
const VisibilitySchema = z.enum(VISIBILITIES)
const PreviewConventionSchema = z.enum(['chemistry', 'engineering']).catch('engineering')

export type EditorAnswer = { state: EditorState; issues: FormIssue[]; preview: PreviewResult | null; nonce: string }
export type SavableProblem = {
  definition: ProblemDefinition
  visibility: z.infer<typeof VisibilitySchema>
  basedOn?: string
}

/** The editor's group heading for each family (a Record, so a new family fails the typecheck until it has one). */
const FAMILY_LABELS: Readonly<Record<TemplateFamily, string>> = {
  'ideal-gas': 'Ideal gas',
  steam: 'Water and steam',
  refrigeration: 'Refrigeration',
  combined: 'Combined gas and steam',
  'steady-flow': 'Steady flow',
}

/** The templates bank problems may use (the catalog's `bank` flag), grouped by family. */
export function editorOptions() {
  const groups = Object.entries(FAMILY_LABELS).map(([family, label]) => ({
    label,
    templates: TEMPLATE_CATALOG.filter((e) => e.bank && e.family === family),
  }))
  return buildEditorOptions(groups, PITFALLS)
}

function answer(state: EditorState, issues: FormIssue[] = [], preview: PreviewResult | null = null): EditorAnswer {
  // A fresh nonce remounts the editor, so the refilled values replace what the browser kept.
  // A NUL cannot be shown in a page, so it is left out of the refill (the issue says so).
  return { state: { ...state, values: echoValues(state.values) }, issues, preview, nonce: crypto.randomUUID() }
}

/**
 * Handles one submission of the editor form. `save` stores a checked problem and returns the
 * problem's id; it may throw ProblemAccessError (403) or InvalidDefinitionError (shown on the form).
 */
export async function runEditorAction(form: FormData, save: (problem: SavableProblem) => Promise<number>) {
  const removal = readRemoveIntent(form.get('intent'))
  if (removal) return answer(editorStateWithout(form, removal.table, removal.index))
  // A heater list's rows (a steam plant's feedwater heaters): add one, or drop the one named.
  const heater = readHeaterIntent(form.get('intent'))
  if (heater)
    return answer(
      heater.action === 'add'
        ? editorStateFromForm(form, { heaters: heater.input })
        : editorStateWithoutHeater(form, heater.input, heater.index),
    )
  const intent = IntentSchema.safeParse(form.get('intent'))
  if (!intent.success)
    return data(
      answer(editorStateFromForm(form), [
        { path: 'title', message: 'Use one of the buttons at the bottom of the form.' },
      ]),
      { status: 400 },
    )
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
      const result = previewProblem(draft, {
        convention: PreviewConventionSchema.parse(form.get('_previewConvention')),
      })
      return answer(editorStateFromForm(form), [], { ...result, issues: mergeIssues(formIssues, result.issues) })
    }
    case 'save': {
      const checked = checkForSave(form)
      if (!checked.ok) return data(answer(editorStateFromForm(form), checked.issues), { status: 400 })
      let problemId: number
      try {
        problemId = await save(checked.value)
      } catch (e) {
        if (e instanceof ProblemAccessError) throw data(e.message, { status: 403 })
        if (e instanceof ProblemConflictError) {
          // Keep everything typed, and take the newer save as the base: saving again replaces it on purpose.
          const state = editorStateFromForm(form)
          const message = `Someone saved this problem after you opened it (at ${e.savedAt.slice(11, 16)} UTC, perhaps in another tab). Your changes are still here; open the problem in a new tab to compare, then save again to replace that version.`
          return data(
            answer({ ...state, values: { ...state.values, _basedOn: e.savedAt } }, [{ path: '_basedOn', message }]),
            { status: 409 },
          )
        }
        if (!(e instanceof InvalidDefinitionError)) throw e
        return data(answer(editorStateFromForm(form), [{ path: 'title', message: e.message }]), { status: 400 })
      }
      return redirect(`/bank/${problemId}`)
    }
  }
}

/** The form's definition when it passes the shape check and the lint, else every issue by field. */
function checkForSave(form: FormData): { ok: true; value: SavableProblem } | { ok: false; issues: FormIssue[] } {
  const { draft, visibility, formIssues } = definitionFromForm(form)
  const vis = VisibilitySchema.safeParse(visibility)
  const own = vis.success
    ? formIssues
    : [...formIssues, { path: 'visibility', message: 'Choose who can use the problem.' }]
  const parsed = parseDefinition(draft)
  if (!parsed.ok) return { ok: false, issues: mergeIssues(own, parsed.issues) }
  if (own.length > 0 || !vis.success) return { ok: false, issues: own }
  let lint: FormIssue[]
  try {
    lint = lintDefinition(parsed.value)
  } catch (e) {
    console.error('lintDefinition failed', e)
    lint = [
      {
        path: 'physics.template',
        message: 'The problem could not be checked just now; please try again, and report it if it persists.',
      },
    ]
  }
  if (lint.length > 0) return { ok: false, issues: lint }
  const basedOn = form.get('_basedOn')
  return {
    ok: true,
    value: {
      definition: parsed.value,
      visibility: vis.data,
      ...(typeof basedOn === 'string' && basedOn !== '' ? { basedOn } : {}),
    },
  }
}
