import { useCallback, useEffect, useRef, useState, type RefObject } from 'react'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { isRecord } from '#app/lib/guards.ts'
import { definitionFromForm, type FormIssue } from '#app/lib/problem-form.ts'
import { parseDefinition } from '#app/lib/problem-schema.ts'

const PREVIEW_DEBOUNCE_MS = 600

/** The definition drafted from the form as the author types (JavaScript only). */
export interface EditorDraft {
  readonly json: string
  readonly convention: string
  readonly formIssues: FormIssue[]
  /** The draft as a definition once it reads as one (the problem schema); null while it does not. */
  readonly definition: ProblemDefinition | null
  readonly visibility: string
  /** The givens as typed (name and label), read from the draft even while it does not yet parse. */
  readonly givens: readonly { readonly name: string; readonly label: string }[]
}

/**
 * Reads the form into a draft once on mount and again a moment after the author stops
 * typing (`scheduleDraft`, wired to the form's input and change events).
 */
function typedGivens(draft: unknown): { name: string; label: string }[] {
  if (!isRecord(draft) || !Array.isArray(draft.givens)) return []
  return draft.givens.filter(isRecord).map((g) => ({
    name: typeof g.name === 'string' ? g.name : '',
    label: typeof g.label === 'string' ? g.label : '',
  }))
}

export function useDraft(formRef: RefObject<HTMLFormElement | null>) {
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined)
  const [draft, setDraft] = useState<EditorDraft | null>(null)

  const readDraft = useCallback(() => {
    if (!formRef.current) return
    const { draft: d, formIssues, visibility } = definitionFromForm(new FormData(formRef.current))
    const parsed = parseDefinition(d)
    setDraft({
      json: JSON.stringify(d),
      convention: isRecord(d) && typeof d.convention === 'string' ? d.convention : '',
      formIssues,
      definition: parsed.ok ? parsed.value : null,
      visibility,
      givens: typedGivens(d),
    })
  }, [formRef])
  function scheduleDraft() {
    clearTimeout(timer.current)
    timer.current = setTimeout(readDraft, PREVIEW_DEBOUNCE_MS)
  }
  useEffect(() => {
    readDraft()
    return () => clearTimeout(timer.current)
  }, [readDraft])

  return { draft, scheduleDraft }
}
