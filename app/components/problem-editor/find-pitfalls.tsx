import { fieldId, type EditorOptions } from '#app/lib/problem-form.ts'
import type { FieldKit } from './fields.tsx'

/**
 * The pitfalls a find recognises in wrong answers: those that can fire for it are offered;
 * one ticked before that can never fire is named, as saving drops it.
 */
export function FindPitfalls({
  kit,
  values,
  i,
  offered,
  pitfalls,
}: {
  kit: FieldKit
  values: Readonly<Record<string, string>>
  i: number
  offered: EditorOptions['pitfalls']
  pitfalls: EditorOptions['pitfalls']
}) {
  const { hasError, errorText } = kit
  const p = `finds.${i}`
  const picked = new Set((values[`${p}.pitfalls`] ?? '').split(',').filter(Boolean))
  return (
    <fieldset
      id={fieldId(`${p}.pitfalls`)}
      tabIndex={-1}
      aria-describedby={hasError(`${p}.pitfalls`) ? `${fieldId(`${p}.pitfalls`)}-error` : undefined}
      className="mt-3"
    >
      <legend className="text-sm font-medium">Pitfalls to recognise in wrong answers</legend>
      <div className="mt-1 grid gap-1 text-sm sm:grid-cols-2">
        {offered.length === 0 ? (
          <p className="text-muted">None can be recognised for this find (pitfalls need a solver output).</p>
        ) : null}
        {offered.map((pf) => (
          <label key={pf.id} className="flex items-center gap-2">
            <input
              type="checkbox"
              name={`${p}.pitfalls`}
              value={pf.id}
              defaultChecked={picked.has(pf.id)}
              className="size-4"
            />
            {pf.title}
          </label>
        ))}
      </div>
      {(() => {
        const dropped = pitfalls.filter((pf) => picked.has(pf.id) && !offered.some((o) => o.id === pf.id))
        return dropped.length > 0 ? (
          <p className="mt-1 text-xs text-warn">
            Ticked before but never recognised for this find, so saving drops it:{' '}
            {dropped.map((pf) => pf.title).join(', ')}.
          </p>
        ) : null
      })()}
      {errorText(`${p}.pitfalls`)}
    </fieldset>
  )
}
