import { describe, expect, test } from 'vitest'
import { z } from 'zod'
import { parseForm, readFormData } from './form.ts'

const Schema = z.object({
  email: z.string().email('Enter a valid e-mail address.'),
  password: z.string().min(10, 'Too short.'),
})

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

describe('readFormData', () => {
  test('reads a form post', async () => {
    const req = new Request('http://x/', { method: 'POST', body: new URLSearchParams({ a: '1' }) })
    expect((await readFormData(req)).get('a')).toBe('1')
  })

  test.each([
    ['JSON', { 'Content-Type': 'application/json' }, '{"a":1}'],
    ['no content type', {}, 'a=1'],
    ['a broken multipart body', { 'Content-Type': 'multipart/form-data; boundary=zz' }, '--zz\r\nnot a part'],
  ])('%s is a 400 page, not a server error', async (_name, headers, body) => {
    const req = new Request('http://x/', { method: 'POST', headers, body })
    const thrown = await readFormData(req).catch((e: unknown) => e)
    expect(thrown).toMatchObject({ init: { status: 400 } })
  })
})
