import type { InputHTMLAttributes, ReactNode } from 'react'
import { controlClass, FormControl } from './form-control.tsx'

type FieldProps = InputHTMLAttributes<HTMLInputElement> & {
  label: ReactNode
  error?: string
  hint?: ReactNode
}

/** A labelled input with its hint and error tied to it for screen readers. */
export function Field({ label, error, hint, className, id, 'aria-describedby': describedBy, ...input }: FieldProps) {
  return (
    <FormControl label={label} error={error} hint={hint} id={id} className={className} describedBy={describedBy}>
      {(control) => <input {...control} className={controlClass(error)} {...input} />}
    </FormControl>
  )
}
