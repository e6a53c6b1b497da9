import { z } from 'zod'
import { textField } from '#app/lib/text-field.ts'

/** Field rules shared by the HTML attributes and the server checks. */
export const rules = {
  name: { minLength: 2, maxLength: 120 },
  password: { minLength: 10, maxLength: 200 },
  email: { maxLength: 320 },
} as const

export const EmailSchema = textField('the e-mail address', { required: 'Enter an e-mail address.' })
  .trim()
  .min(1, 'Enter an e-mail address.')
  .max(rules.email.maxLength, 'That e-mail address is too long.')
  .email('Enter a valid e-mail address, like name@example.org.')

export const NameSchema = z
  .string({ message: 'Enter your name.' })
  .trim()
  .min(rules.name.minLength, 'Enter your name as you would like it shown to your instructors.')
  .max(rules.name.maxLength, `Keep your name under ${rules.name.maxLength} characters.`)

export const NewPasswordSchema = z
  .string({ message: 'Choose a password.' })
  .min(rules.password.minLength, `Choose a password of at least ${rules.password.minLength} characters.`)
  .max(rules.password.maxLength, `Keep the password under ${rules.password.maxLength} characters.`)

/** A new password typed twice. */
export const PasswordPairSchema = z
  .object({ password: NewPasswordSchema, confirm: z.string({ message: 'Type the password again.' }) })
  .refine((v) => v.password === v.confirm, { message: 'The two passwords are not the same.', path: ['confirm'] })
