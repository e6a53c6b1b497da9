import { expect, test } from 'vitest'
import { z } from 'zod'
import { parseForm } from './form.ts'

const Schema = z.object({ email: z.string().email('Enter a valid e-mail address.'), password: z.string().min(10, 'Too short.') })

test('returns the typed value when the form is valid', () => {
  const fd = new FormData()
  fd.set('email', 'a@b.example')
  fd.set('password', '0123456789')
  expect(parseForm(fd, Schema)).toEqual({ ok: true, value: { email: 'a@b.example', password: '0123456789' } })
})

test('returns one message per field and never echoes a password back', () => {
  const fd = new FormData()
  fd.set('email', 'nope')
  fd.set('password', 'short')
  const r = parseForm(fd, Schema)
  expect(r.ok).toBe(false)
  if (r.ok) return
  expect(r.fieldErrors).toEqual({ email: 'Enter a valid e-mail address.', password: 'Too short.' })
  expect(r.values).toEqual({ email: 'nope' })
})
