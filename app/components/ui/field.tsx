import { useId, type InputHTMLAttributes, type ReactNode } from 'react'
import { cn } from '#app/lib/cn.ts'

type FieldProps = InputHTMLAttributes<HTMLInputElement> & {
  label: ReactNode
  error?: string
  hint?: ReactNode
}

/** A labelled input with its hint and error tied to it for screen readers. */
export function Field({ label, error, hint, className, id, ...input }: FieldProps) {
  const auto = useId()
  const inputId = id ?? auto
  const hintId = hint ? `${inputId}-hint` : undefined
  const errorId = error ? `${inputId}-error` : undefined
  return (
    <div className={cn('flex flex-col gap-1', className)}>
      <label htmlFor={inputId} className="text-sm font-medium text-ink">
        {label}
      </label>
      <input
        id={inputId}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hintId, errorId].filter(Boolean).join(' ') || undefined}
        className={cn(
          'rounded-md border bg-white px-3 py-2 text-base shadow-sm',
          error ? 'border-danger' : 'border-line focus:border-accent',
        )}
        {...input}
      />
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
