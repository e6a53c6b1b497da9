import { useId, type ReactNode, type SelectHTMLAttributes } from 'react'
import { cn } from '#app/lib/cn.ts'

type SelectFieldProps = SelectHTMLAttributes<HTMLSelectElement> & { label: ReactNode; error?: string; hint?: ReactNode; children: ReactNode }

/** A labelled select with its hint and error tied to it for screen readers (as Field does for inputs). */
export function SelectField({ label, error, hint, className, id, children, ...select }: SelectFieldProps) {
  const auto = useId()
  const selectId = id ?? auto
  const hintId = hint ? `${selectId}-hint` : undefined
  const errorId = error ? `${selectId}-error` : undefined
  return (
    <div className={cn('flex flex-col gap-1', className)}>
      <label htmlFor={selectId} className="text-sm font-medium text-ink">
        {label}
      </label>
      <select
        id={selectId}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hintId, errorId].filter(Boolean).join(' ') || undefined}
        className={cn('w-full rounded-md border bg-white px-3 py-2 text-base shadow-sm', error ? 'border-danger' : 'border-line focus:border-accent')}
        {...select}
      >
        {children}
      </select>
      {hint ? (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-sm text-danger">
          {error}
        </p>
      ) : null}
    </div>
  )
}
