import { useId, type ReactNode } from 'react'
import { cn } from '#app/lib/cn.ts'

export interface ControlProps {
  id: string
  'aria-invalid': true | undefined
  'aria-describedby': string | undefined
}

interface FormControlProps {
  label: ReactNode
  error?: string
  hint?: ReactNode
  id?: string
  className?: string
  /** More ids that describe the control (e.g. a message for the whole form). */
  describedBy?: string
  /** Renders the control with the ids that tie it to its label, hint and error. */
  children: (control: ControlProps) => ReactNode
}

/**
 * The one wiring of a form control: a label, an optional hint and an error tied to the control
 * for screen readers (aria-describedby, aria-invalid). Field, SelectField and TextareaField are
 * this with an input, a select and a textarea.
 */
export function FormControl({ label, error, hint, id, className, describedBy, children }: FormControlProps) {
  const auto = useId()
  const controlId = id ?? auto
  const hintId = hint ? `${controlId}-hint` : undefined
  const errorId = error ? `${controlId}-error` : undefined
  return (
    <div className={cn('flex flex-col gap-1', className)}>
      <label htmlFor={controlId} className="text-sm font-medium text-ink">
        {label}
      </label>
      {children({
        id: controlId,
        'aria-invalid': error ? true : undefined,
        'aria-describedby': [hintId, errorId, describedBy].filter(Boolean).join(' ') || undefined,
      })}
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

/** The look shared by inputs, selects and textareas: a red border for an error. */
export function controlClass(error: string | undefined, extra?: string): string {
  return cn(
    'rounded-md border bg-white px-3 py-2 text-base shadow-sm',
    error ? 'border-danger' : 'border-line focus:border-accent',
    extra,
  )
}
