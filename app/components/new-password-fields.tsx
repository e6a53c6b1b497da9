import { rules } from '#app/lib/validation.ts'
import { Field } from './ui/field.tsx'

/** A new password typed twice (joining a course, resetting a password). */
export function NewPasswordFields({
  label,
  errors,
}: {
  label: string
  errors?: { password?: string; confirm?: string }
}) {
  return (
    <>
      <Field
        label={label}
        name="password"
        type="password"
        autoComplete="new-password"
        required
        minLength={rules.password.minLength}
        hint={`At least ${rules.password.minLength} characters.`}
        error={errors?.password}
      />
      <Field
        label="The same password again"
        name="confirm"
        type="password"
        autoComplete="new-password"
        required
        error={errors?.confirm}
      />
    </>
  )
}
