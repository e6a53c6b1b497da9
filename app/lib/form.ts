import { data } from 'react-router'
import type { z } from 'zod'

export type FieldErrors = Record<string, string | undefined>

export type FormResult<T> =
  { ok: true; value: T } | { ok: false; fieldErrors: FieldErrors; formError?: string; values: Record<string, string> }

/** Parses a form body with a zod schema; on failure, one message per field and the typed values back. */
export function parseForm<S extends z.ZodType>(formData: FormData, schema: S): FormResult<z.infer<S>> {
  const values: Record<string, string> = {}
  for (const [k, v] of formData.entries()) if (typeof v === 'string' && !/password/i.test(k)) values[k] = v
  const raw: Record<string, unknown> = {}
  for (const [k, v] of formData.entries()) raw[k] = typeof v === 'string' ? v : undefined
  const parsed = schema.safeParse(raw)
  if (parsed.success) return { ok: true, value: parsed.data }
  const fieldErrors: FieldErrors = {}
  let formError: string | undefined
  for (const issue of parsed.error.issues) {
    const key = issue.path[0]
    if (typeof key === 'string') fieldErrors[key] ??= issue.message
    else formError ??= issue.message
  }
  return { ok: false, fieldErrors, formError, values }
}

/** Typed empties, so that success and failure results of an action share one shape. */
export const noFieldErrors: FieldErrors = {}
export const noValues: Record<string, string> = {}

/** A form field's text, or '' when it is missing or a file. */
export function formText(form: FormData, name: string): string {
  const v = form.get(name)
  return typeof v === 'string' ? v : ''
}

/**
 * The body of a form post, or a 400 page when it is not a form (another content type, or a
 * broken body): a request sent by hand must not end in a server error.
 */
export async function readFormData(request: Request): Promise<FormData> {
  try {
    return await request.formData()
  } catch {
    throw data('This form could not be read. Go back to the page and send it from there.', { status: 400 })
  }
}
