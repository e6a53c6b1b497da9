import { href } from 'react-router'
import { useRef, useState } from 'react'
import { placeholderText } from '#app/domain/authoring/placeholder-syntax.ts'
import { cn } from '#app/lib/cn.ts'
import { fieldId, type EditorState } from '#app/lib/problem-form.ts'
import { inputClass, type FieldKit } from './fields.tsx'

/** The givens the prompt can name: from the draft with JavaScript, else as the page was served. */
function nameableGivens(draftGivens: readonly { name: string; label: string }[] | null, { values, rows }: EditorState) {
  return (
    draftGivens ??
    Array.from({ length: rows.givens }, (_, i) => ({
      name: (values[`givens.${i}.name`] ?? '').trim(),
      label: (values[`givens.${i}.label`] ?? '').trim(),
    }))
  ).filter((g) => /^[A-Za-z][A-Za-z0-9_]{0,31}$/.test(g.name))
}

/**
 * The prompt students read, with the insert-a-given control beside it: with JavaScript a
 * button puts the given's placeholder at the prompt's cursor; without, the placeholder is
 * there to copy.
 */
export function PromptSection({
  kit,
  state,
  draftGivens,
  hydrated,
}: {
  kit: FieldKit
  state: EditorState
  /** the givens as typed, with JavaScript; null before the first draft (then the served form's) */
  draftGivens: readonly { name: string; label: string }[] | null
  hydrated: boolean
}) {
  const { v, describedBy, invalid, hasError, labelled } = kit
  const promptRef = useRef<HTMLTextAreaElement>(null)
  const [inserted, setInserted] = useState('')
  function insertAtCursor(text: string) {
    const area = promptRef.current
    if (!area) return
    const start = area.selectionStart ?? area.value.length
    const end = area.selectionEnd ?? start
    area.focus()
    area.setRangeText(text, start, end, 'end')
    // The form listens for input: the live preview picks the change up like typing.
    area.dispatchEvent(new Event('input', { bubbles: true }))
    setInserted(`Inserted ${text} into the prompt.`)
  }
  const promptGivens = nameableGivens(draftGivens, state)
  return (
    <section aria-labelledby="prompt-title" className="rounded-lg border border-line bg-white p-6 shadow-sm">
      <h2 id="prompt-title" className="text-xl font-semibold">
        Prompt
      </h2>
      <div className="mt-4 grid gap-4 lg:grid-cols-[minmax(0,1fr)_14rem]">
        {labelled(
          'prompt',
          'What students read',
          <textarea
            ref={promptRef}
            id={fieldId('prompt')}
            name="prompt"
            rows={8}
            defaultValue={v('prompt')}
            aria-invalid={invalid('prompt')}
            aria-describedby={describedBy('prompt', true)}
            className={cn(inputClass(hasError('prompt')), 'font-mono')}
          />,
          <>
            Markdown. <code>[T1]</code> shows a given with its unit, <code>[p1 in kPa]</code> converts it,{' '}
            <code>[r, 3 sf]</code> or <code>[r, 2 dp]</code> rounds it; <code>\[</code> is a bracket that is only a
            bracket. Math goes between <code>$…$</code> (inline) or <code>$$…$$</code> (display). More in the{' '}
            <a href={`${href('/help/:page', { page: 'authoring' })}#placeholders`}>author guide</a>.
          </>,
        )}
        <div
          role="group"
          aria-labelledby="insert-given-title"
          aria-describedby="insert-given-hint"
          className="flex flex-col gap-1"
        >
          <h3 id="insert-given-title" className="text-sm font-medium">
            Insert a given
          </h3>
          <p id="insert-given-hint" className="text-xs text-muted">
            {hydrated ? 'Puts its placeholder at the cursor in the prompt.' : 'Copy a placeholder into the prompt.'}
          </p>
          {promptGivens.length === 0 ? (
            <p className="text-xs text-muted">Name a given below and it shows here.</p>
          ) : (
            <ul className="flex flex-col gap-1">
              {promptGivens.map((g) => {
                const text = placeholderText(g.name)
                const label = g.label ? <span className="truncate text-xs text-muted">{g.label}</span> : null
                return (
                  <li key={g.name}>
                    {hydrated ? (
                      <button
                        type="button"
                        onClick={() => insertAtCursor(text)}
                        className="flex w-full min-w-0 items-baseline gap-2 rounded-md border border-line bg-white px-2 py-1 text-left text-sm hover:bg-paper focus-visible:outline-2 focus-visible:outline-accent"
                      >
                        <span className="sr-only">Insert </span>
                        <code>{text}</code>
                        {label}
                      </button>
                    ) : (
                      <span className="flex min-w-0 items-baseline gap-2 px-2 py-1 text-sm">
                        <code className="select-all">{text}</code>
                        {label}
                      </span>
                    )}
                  </li>
                )
              })}
            </ul>
          )}
          <p className="sr-only" aria-live="polite">
            {inserted}
          </p>
        </div>
      </div>
    </section>
  )
}
