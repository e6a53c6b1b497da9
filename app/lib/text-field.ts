/**
 * Text that people type, checked for characters that cannot be stored or shown. PostgreSQL
 * refuses the NUL character (U+0000) in text and jsonb, and the other C0 control codes
 * (except tab, line feed and carriage return, which forms use for line breaks) are invisible
 * and never meant. Isomorphic: the same rule and message in the browser and on the server.
 */
import { z } from 'zod'

/** C0 control characters and DEL, except tab (U+0009), line feed (U+000A) and carriage return (U+000D). */
export const REFUSED_CONTROL_CHARS = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/

export type ControlChar = { index: number; code: string }

/** The first refused control character in a text, with its position (from 1) and its U+ code. */
export function findControlChar(text: string): ControlChar | null {
  const m = REFUSED_CONTROL_CHARS.exec(text)
  if (!m) return null
  return { index: m.index + 1, code: `U+${m[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}` }
}

export function hasControlChar(text: string): boolean {
  return REFUSED_CONTROL_CHARS.test(text)
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1)
}

/**
 * What to tell someone whose text holds a refused character. `echoed` says whether the page
 * shows their text back (without its NUL characters, which a web page cannot show).
 */
export function controlCharMessage(what: string, text: string, options: { echoed?: boolean } = {}): string {
  const found = findControlChar(text)
  const subject = capitalise(what)
  if (!found) return `${subject} cannot be saved as it is.`
  if (text.includes('\u0000')) {
    const rest = hasControlChar(withoutNul(text))
      ? ' It also has other invisible control characters: remove them too.'
      : ''
    return options.echoed === false
      ? `${subject} has a NUL character (an invisible control code, often left by copying from another program), which cannot be accepted. Remove it and try again.`
      : `${subject} had a NUL character (an invisible control code, often left by copying from another program), which cannot be accepted. It has been taken out of the text shown here: check the text and send it again.${rest}`
  }
  return `${subject} has an invisible control character (${found.code}, at character ${found.index}), which cannot be accepted. Remove it and try again.`
}

/** The text without its NUL characters, for showing back what was typed: HTML cannot carry a NUL. */
export function withoutNul(text: string): string {
  return text.replace(/\u0000/g, '')
}

/** Every value of a form's echo without NUL characters (see withoutNul). */
export function echoValues<K extends string>(values: Readonly<Record<K, string>>): Record<K, string> {
  const out: Record<K, string> = { ...values }
  for (const k in out) out[k] = withoutNul(values[k])
  return out
}

/**
 * A zod string that refuses control characters with a plain message naming the field ("the
 * reason"). Chain `.trim()`, `.min()`, `.max()` after it as with `z.string()`.
 */
export function textField(what: string, options: { echoed?: boolean; required?: string } = {}) {
  return z.string({ error: options.required ?? `Write ${what} as text.` }).refine((s) => !hasControlChar(s), {
    error: (iss) => controlCharMessage(what, String(iss.input ?? ''), options),
    abort: true,
  })
}

export type ControlCharIssue = { path: string; message: string }

/**
 * Every string inside a JSON-like value (an import, an editor draft) that holds a refused
 * control character, with its dotted path ('finds.0.label'); keys are checked as well.
 */
export function controlCharIssues(
  value: unknown,
  describe: (path: string) => string = (p) => (p ? `the field ${p}` : 'the text'),
  options: { echoed?: boolean } = {},
): ControlCharIssue[] {
  const echoed = options.echoed ?? false
  const out: ControlCharIssue[] = []
  const seen = new Set<object>()
  const walk = (v: unknown, path: string) => {
    if (out.length >= 50) return
    if (typeof v === 'string') {
      if (hasControlChar(v)) out.push({ path, message: controlCharMessage(describe(path), v, { echoed }) })
      return
    }
    if (!v || typeof v !== 'object' || seen.has(v)) return
    seen.add(v)
    const entries = Array.isArray(v) ? v.map((x, i) => [String(i), x] as const) : Object.entries(v)
    for (const [k, x] of entries) {
      const at = path ? `${path}.${k}` : k
      if (hasControlChar(k))
        out.push({ path: at, message: controlCharMessage(`the name of ${describe(at)}`, k, { echoed }) })
      walk(x, at)
    }
  }
  walk(value, '')
  return out
}
