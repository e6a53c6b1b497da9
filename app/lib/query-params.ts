/**
 * Numbers and words read from a page's address (?page=3, ?q=otto). People edit addresses
 * by hand, so what cannot be used is refused with a 400 that names the part of the address,
 * never passed on to the database (a page of 10^20 overflows its offset; a NUL is refused by
 * PostgreSQL). Isomorphic.
 */
import { data } from 'react-router'
import { controlCharMessage, hasControlChar, withoutNul } from '#app/lib/text-field.ts'

/** The highest page number any list accepts: far beyond any real list, well within an offset. */
export const MAX_PAGE = 100_000

export type ParamProblem = { param: string; message: string }

/** How an odd value is quoted back: short, one line, without control characters. */
function quoted(raw: string): string {
  const plain = withoutNul(raw).replace(/[\u0000-\u001F\u007F]/g, '')
  return plain.length > 24 ? `“${plain.slice(0, 23)}…”` : `“${plain}”`
}

/**
 * Reads a page number: absent or empty means 1; otherwise a whole number from 1 to max.
 * Returns the number, or the problem to report.
 */
export function readPageParam(
  search: URLSearchParams,
  name = 'page',
  max = MAX_PAGE,
): { ok: true; page: number } | { ok: false; problem: ParamProblem } {
  const raw = search.get(name)
  if (raw === null || raw.trim() === '') return { ok: true, page: 1 }
  const text = raw.trim()
  if (/^\d{1,7}$/.test(text)) {
    const n = Number(text)
    if (n >= 1 && n <= max) return { ok: true, page: n }
  }
  return {
    ok: false,
    problem: {
      param: name,
      message: `The page number in the address (${name}=${quoted(raw)}) must be a whole number from 1 to ${max.toLocaleString('en')}. Go back to the list and use its page links.`,
    },
  }
}

/** A page number for a page's loader: the number, or a thrown 400 shown by the error boundary. */
export function pageParam(search: URLSearchParams, name = 'page', max = MAX_PAGE): number {
  const read = readPageParam(search, name, max)
  if (!read.ok) throw data(read.problem.message, { status: 400 })
  return read.page
}

/**
 * A free-text parameter (a search): the text, or the problem when it holds control
 * characters. `what` names it for the person ("the search").
 */
export function readTextParam(
  search: URLSearchParams,
  name: string,
  what: string,
): { ok: true; value: string } | { ok: false; value: string; problem: ParamProblem } {
  const raw = search.get(name) ?? ''
  if (!hasControlChar(raw)) return { ok: true, value: raw }
  return { ok: false, value: withoutNul(raw), problem: { param: name, message: controlCharMessage(what, raw) } }
}

/** The first free-text parameter of these that holds control characters, worded for an error page or a JSON error. */
export function textParamProblem(search: URLSearchParams, params: Record<string, string>): ParamProblem | null {
  for (const [name, what] of Object.entries(params)) {
    const raw = search.get(name)
    if (raw !== null && hasControlChar(raw))
      return { param: name, message: controlCharMessage(`${what} in the address (${name})`, raw, { echoed: false }) }
  }
  return null
}
