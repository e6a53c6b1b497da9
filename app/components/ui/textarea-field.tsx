import type { ReactNode, TextareaHTMLAttributes } from 'react'
import { controlClass, FormControl } from './form-control.tsx'

type TextareaFieldProps = TextareaHTMLAttributes<HTMLTextAreaElement> & {
  label: ReactNode
  error?: string
  hint?: ReactNode
}

/** A labelled textarea with its hint and error tied to it for screen readers. */
export function TextareaField({
  label,
  error,
  hint,
  className,
  id,
  'aria-describedby': describedBy,
  ...textarea
}: TextareaFieldProps) {
  return (
    <FormControl label={label} error={error} hint={hint} id={id} className={className} describedBy={describedBy}>
      {(control) => <textarea {...control} className={controlClass(error, 'w-full')} {...textarea} />}
    </FormControl>
  )
}
