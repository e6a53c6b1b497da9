/**
 * Fields shared by the admin's new-course form and the instructors' settings form: the sign
 * convention as two labelled choices, and the time zone as a text field with a list of
 * common zones (any other IANA zone may be typed).
 */
import { useId, type ReactNode } from 'react'
import { Field } from '#app/components/ui/field.tsx'
import { cn } from '#app/lib/cn.ts'
import { conventionText, type SignConventionName } from '#app/lib/conventions.ts'
import { COMMON_TIME_ZONES, TIME_ZONE_HINT } from '#app/lib/time-zones.ts'

export function ConventionChoice({
  defaultValue,
  error,
  hint,
  name = 'signConvention',
}: {
  defaultValue?: string
  error?: string
  hint?: ReactNode
  name?: string
}) {
  const id = useId()
  const hintId = hint ? `${id}-hint` : undefined
  const errorId = error ? `${id}-error` : undefined
  return (
    <fieldset
      aria-describedby={[hintId, errorId].filter(Boolean).join(' ') || undefined}
      className="flex flex-col gap-2"
    >
      <legend className="text-sm font-medium text-ink">Sign convention</legend>
      {(['engineering', 'chemistry'] as const satisfies readonly SignConventionName[]).map((c) => (
        <label
          key={c}
          className={cn(
            'flex items-start gap-3 rounded-md border bg-white px-3 py-2',
            error ? 'border-danger' : 'border-line',
          )}
        >
          <input
            type="radio"
            name={name}
            value={c}
            defaultChecked={defaultValue === c}
            aria-invalid={error ? true : undefined}
            className="mt-1"
          />
          <span>
            {conventionText[c].label}: <span className="font-mono whitespace-nowrap">{conventionText[c].equation}</span>
            <span className="block text-sm text-muted">{conventionText[c].meaning}</span>
          </span>
        </label>
      ))}
      {hint ? (
        <div id={hintId} className="text-sm text-muted">
          {hint}
        </div>
      ) : null}
      {error ? (
        <p id={errorId} className="text-sm text-danger">
          {error}
        </p>
      ) : null}
    </fieldset>
  )
}

export function TimeZoneField({
  defaultValue,
  error,
  hint,
}: {
  defaultValue?: string
  error?: string
  hint?: ReactNode
}) {
  const listId = useId()
  return (
    <>
      <Field
        label="Time zone"
        name="timeZone"
        list={listId}
        autoComplete="off"
        spellCheck={false}
        required
        maxLength={64}
        defaultValue={defaultValue}
        error={error}
        hint={hint ?? TIME_ZONE_HINT}
      />
      <datalist id={listId}>
        {COMMON_TIME_ZONES.map((z) => (
          <option key={z} value={z} />
        ))}
      </datalist>
    </>
  )
}
