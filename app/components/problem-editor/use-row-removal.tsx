import { useState, type RefObject } from 'react'
import { Button } from '#app/components/ui/button.tsx'
import { editorStateWithout, removeIntent, type EditorState, type RowTable } from '#app/lib/problem-form.ts'

const TABLE_WORDS: Record<RowTable, string> = { givens: 'given', constraints: 'constraint', finds: 'find' }

export type OnRemoved = (state: EditorState, focus: RowTable, said: string) => void
export type RemoveButton = (table: RowTable, i: number) => React.JSX.Element

/**
 * Each table row's "Remove" button: a submit button without JavaScript (the server drops
 * the row); with it, the row goes at once (`onRemoved` gets the state without it). The
 * button names its row by the name as typed (`noteTyped`), even before the draft catches up.
 */
export function useRowRemoval(
  values: Readonly<Record<string, string>>,
  formRef: RefObject<HTMLFormElement | null>,
  onRemoved: OnRemoved,
) {
  const [typedNames, setTypedNames] = useState<Record<string, string>>({})
  const noteTyped = (t: HTMLInputElement) => {
    if (/^(givens|finds)\.\d+\.name$/.test(t.name ?? '')) setTypedNames((n) => ({ ...n, [t.name]: t.value }))
  }
  const rowName = (table: RowTable, i: number) =>
    (typedNames[`${table}.${i}.name`] ?? values[`${table}.${i}.name`] ?? '').trim()
  const removeLabel = (table: RowTable, i: number) => {
    const name = table === 'constraints' ? '' : rowName(table, i)
    return name
      ? `Remove ${TABLE_WORDS[table]} ${name}`
      : `Remove ${TABLE_WORDS[table]} ${i + 1}${table === 'constraints' ? '' : ' (no name yet)'}`
  }
  const removeButton: RemoveButton = (table, i) => (
    <Button
      type="submit"
      name="intent"
      value={removeIntent(table, i)}
      variant="secondary"
      formNoValidate
      aria-label={removeLabel(table, i)}
      onClick={(e) => {
        if (!formRef.current) return
        e.preventDefault()
        const label = removeLabel(table, i).replace(/^Remove /, '')
        onRemoved(
          editorStateWithout(new FormData(formRef.current), table, i),
          table,
          `${label.charAt(0).toUpperCase()}${label.slice(1)} removed.`,
        )
      }}
    >
      Remove
    </Button>
  )
  return { noteTyped, removeButton }
}
