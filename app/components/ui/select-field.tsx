import type { ReactNode, SelectHTMLAttributes } from 'react'
import { controlClass, FormControl } from './form-control.tsx'

type SelectFieldProps = SelectHTMLAttributes<HTMLSelectElement> & {
  label: ReactNode
  error?: string
  hint?: ReactNode
  children: ReactNode
}

/** A labelled select with its hint and error tied to it for screen readers. */
export function SelectField({
  label,
  error,
  hint,
  className,
  id,
  'aria-describedby': describedBy,
  children,
  ...select
}: SelectFieldProps) {
  return (
    <FormControl label={label} error={error} hint={hint} id={id} className={className} describedBy={describedBy}>
      {(control) => (
        <select {...control} className={controlClass(error, 'w-full')} {...select}>
          {children}
        </select>
      )}
    </FormControl>
  )
}
