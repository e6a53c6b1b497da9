/**
 * The problem editor: one plain form whose field names are the definition's dotted paths
 * (app/lib/problem-form.ts), so it saves, adds rows, switches templates and previews without
 * JavaScript. With JavaScript it also drafts the definition from the form as the author
 * types and shows a live preview of a few seeded variants (POST /api/preview), removes a row
 * at once, and inserts a given's placeholder at the prompt's cursor.
 *
 * On wide screens (Tailwind's xl, 1280 px and up) the preview stays beside the form; below
 * that it follows the form.
 *
 * The pieces: editor-form.tsx (the form and its state), one file per section
 * (basics, prompt, givens, constraints, physics with its template inputs, finds), the side
 * preview, the field helpers (fields.tsx) and hooks (use-*.ts).
 */
import { useState, type ReactNode } from 'react'
import type { PreviewResult } from '#app/lib/preview.ts'
import type { EditorOptions, EditorState, FormIssue, RowTable } from '#app/lib/problem-form.ts'
import { EditorForm } from './editor-form.tsx'

export interface ProblemEditorProps {
  readonly state: EditorState
  /** Issues from the last submission, shown beside their fields and in the summary. */
  readonly issues: readonly FormIssue[]
  readonly options: EditorOptions
  /** The preview the "Preview variants" button asked for (the page without JavaScript). */
  readonly preview: PreviewResult | null
  /** Move focus to the error summary when the page shows a refused save. */
  readonly focusSummary: boolean
  readonly saveLabel: string
  /** Shown above the save button (e.g. what saving a frozen version does). */
  readonly saveNote?: ReactNode
}

/**
 * The editor, remounted with a new state when a row is removed in the browser (the fields are
 * uncontrolled, so a remount is what refills them renumbered, exactly as the server would).
 */
export function ProblemEditor(props: ProblemEditorProps) {
  const [local, setLocal] = useState<{ state: EditorState; count: number; focus: RowTable; said: string } | null>(null)
  return (
    <>
      <p className="sr-only" aria-live="polite">
        {local?.said ?? ''}
      </p>
      <EditorForm
        key={local?.count ?? 0}
        {...props}
        state={local?.state ?? props.state}
        // Issues and a no-JavaScript preview name rows by their old numbers: they go with the removal.
        issues={local ? [] : props.issues}
        preview={local ? null : props.preview}
        focusSummary={local ? false : props.focusSummary}
        focusTable={local?.focus}
        onRemoved={(state, focus, said) => setLocal((l) => ({ state, count: (l?.count ?? 0) + 1, focus, said }))}
      />
    </>
  )
}
