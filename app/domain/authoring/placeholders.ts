/**
 * Placeholders in a problem's prompt: where a drawn given's value goes, and how it is shown.
 * The syntax is ours, a given's name in square brackets (docs/authoring.md):
 *
 *   [T1]                  the value with its unit, at the given's display precision
 *   [T1 in °C]            converted to another unit of the same dimension
 *   [p1, 3 sf]            three significant figures
 *   [q23, 2 dp]           two decimal places
 *   [T1 in °C, 1 dp]      both
 *   \[                    a bracket that is only a bracket
 *
 * Only a bracket with a letter right after it is read, and only up to the first "]" on the
 * same line. Never read as a placeholder: a bracket after a backslash or a TeX command
 * (`\[`, `\sqrt[n]`, `\left[`), a bracket holding another "[", one never closed on its line,
 * and (outside math) a Markdown link `[text](address)`.
 *
 * Definition format 1 wrote `@{T1 in °C, 1 dp}` and `@@{` for a literal "@{";
 * upgradeLegacyPrompt turns such a prompt into this syntax (the migration
 * drizzle/0007_prompt_placeholders.sql does the same to stored prompts, with the same
 * regular expressions: LEGACY_REWRITES).
 *
 * Inside math ($…$) a value is written as TeX (`350\,\mathrm{K}`), elsewhere as plain text
 * with a no-break space before the unit. Nothing here throws on author input: problems come
 * back as messages with the offset of the placeholder. Pure.
 */
import { formatUnitForDisplay } from '#app/domain/grading/units.ts'
import { resolveExpectedUnit } from '#app/domain/grading/units.ts'
import { math } from '#app/domain/thermo/units.ts'
import type { DrawnGiven } from './definition.ts'

export { LEGACY_REWRITES, placeholderText, upgradeLegacyPrompt } from './placeholder-syntax.ts'

export interface DisplayRule {
  readonly decimals?: number
  readonly sigFigs?: number
}

export interface PlaceholderOptions {
  readonly unit?: string
  readonly sigFigs?: number
  readonly decimals?: number
}

export interface Placeholder extends PlaceholderOptions {
  /** Offset of the "[" in the text. */
  readonly start: number
  /** Offset just past the closing "]". */
  readonly end: number
  readonly name: string
}

export interface PlaceholderSyntaxError {
  readonly offset: number
  readonly message: string
  /** The name the placeholder starts with, when it has one. */
  readonly name: string
}

export interface ParsedPlaceholders {
  readonly placeholders: Placeholder[]
  readonly errors: PlaceholderSyntaxError[]
}

export interface PlaceholderError {
  readonly name: string
  readonly message: string
  readonly offset: number
}

export type FormatResult =
  { readonly ok: true; readonly text: string } | { readonly ok: false; readonly message: string }

/** Limits that keep toFixed/toPrecision in range and the output readable. */
export const MAX_SIG_FIGS = 15
export const MAX_DECIMALS = 12
/** A placeholder never spans lines and stays short; a longer bracket is plain text. */
const MAX_PLACEHOLDER_LENGTH = 80

const NBSP = '\u00A0'
const MINUS = '\u2212'

// ---- Parsing ------------------------------------------------------------------------

type InnerParse =
  | { readonly ok: true; readonly name: string; readonly options: PlaceholderOptions }
  | { readonly ok: false; readonly message: string; readonly name: string }

const INNER = /^\s*([^\s,]+)\s*(?:\s+in\s+([^,]*?))?\s*(?:,\s*(.*?))?\s*$/
const NAME = /^[A-Za-z][A-Za-z0-9_]{0,31}$/
const OPTION = /^(\d{1,3})\s*(sf|dp)$/
const LETTER = /[A-Za-z]/

/** The text between "[" and "]" → name and options, or why not. */
export function parsePlaceholderBody(body: string): InnerParse {
  if (body.trim() === '') return { ok: false, name: '', message: 'empty placeholder: write [name]' }
  const m = INNER.exec(body)
  if (!m || m[1] === undefined) {
    const first = /^\s*([A-Za-z][A-Za-z0-9_]*)/.exec(body)?.[1] ?? ''
    const n = first || 'name'
    return {
      ok: false,
      name: first,
      message: `cannot read [${body.trim()}]: write [${n}], [${n} in unit], [${n}, 3 sf] or [${n}, 2 dp], or \\[ for a bracket that is only a bracket`,
    }
  }
  const name = m[1]
  if (!NAME.test(name))
    return {
      ok: false,
      name: /^[A-Za-z][A-Za-z0-9_]*/.exec(name)?.[0] ?? '',
      message: `cannot read [${body.trim()}]: "${name}" is not a given name (a letter, then letters, digits or _); write \\[ for a bracket that is only a bracket`,
    }
  const options: { unit?: string; sigFigs?: number; decimals?: number } = {}
  if (m[2] !== undefined) {
    const unit = m[2].trim()
    if (unit === '') return { ok: false, name, message: `[${name} in …] needs a unit after "in"` }
    options.unit = unit
  }
  if (m[3] !== undefined) {
    const opt = m[3].trim()
    const o = OPTION.exec(opt)
    if (!o || o[1] === undefined)
      return {
        ok: false,
        name,
        message: `unknown option "${opt}" in [${body.trim()}]: write ", 3 sf" for significant figures or ", 2 dp" for decimal places`,
      }
    const n = Number(o[1])
    if (o[2] === 'sf') {
      if (n < 1 || n > MAX_SIG_FIGS)
        return { ok: false, name, message: `significant figures must be 1 to ${MAX_SIG_FIGS}, not ${n}` }
      options.sigFigs = n
    } else {
      if (n > MAX_DECIMALS) return { ok: false, name, message: `decimal places must be 0 to ${MAX_DECIMALS}, not ${n}` }
      options.decimals = n
    }
  }
  return { ok: true, name, options }
}

export type PlaceholderPiece =
  | { readonly kind: 'text'; readonly text: string; readonly offset: number }
  | { readonly kind: 'placeholder'; readonly placeholder: Placeholder }
  | {
      readonly kind: 'error'
      readonly offset: number
      readonly end: number
      readonly name: string
      readonly message: string
    }

export type PlaceholderAt =
  | { readonly kind: 'placeholder'; readonly placeholder: Placeholder }
  | {
      readonly kind: 'error'
      readonly offset: number
      readonly end: number
      readonly name: string
      readonly message: string
    }

/** The "[" at `i` follows a backslash, or a TeX command such as \sqrt or \left. */
function afterBackslash(text: string, i: number): boolean {
  let j = i - 1
  while (j >= 0 && LETTER.test(text[j]!)) j--
  return j >= 0 && text[j] === '\\'
}

/**
 * The placeholder starting at offset `i` of `text`, or null when the character there is not
 * the start of one (the bracket is then plain text). `math`: inside $…$, where a "](" is
 * not a Markdown link.
 */
export function readPlaceholderAt(text: string, i: number, limit = text.length, math = false): PlaceholderAt | null {
  if (text[i] !== '[' || !LETTER.test(text[i + 1] ?? '') || afterBackslash(text, i)) return null
  const close = text.indexOf(']', i + 1)
  const newline = text.indexOf('\n', i + 1)
  if (close < 0 || close >= limit || (newline >= 0 && newline < close) || close - i > MAX_PLACEHOLDER_LENGTH)
    return null
  const body = text.slice(i + 1, close)
  if (body.includes('[')) return null
  if (!math && text[close + 1] === '(') return null
  const inner = parsePlaceholderBody(body)
  if (inner.ok)
    return { kind: 'placeholder', placeholder: { start: i, end: close + 1, name: inner.name, ...inner.options } }
  return { kind: 'error', offset: i, end: close + 1, name: inner.name, message: inner.message }
}

/**
 * Splits a text into literal runs (the escape "\[" already turned into "["), placeholders and
 * unreadable placeholders. The one scanner behind every function here.
 */
export function scanPlaceholders(text: string, options: { readonly math?: boolean } = {}): PlaceholderPiece[] {
  const pieces: PlaceholderPiece[] = []
  let buf = ''
  let bufStart = 0
  let i = 0
  while (i < text.length) {
    if (text.startsWith('\\[', i)) {
      if (buf === '') bufStart = i
      buf += '['
      i += 2
      continue
    }
    const p = text[i] === '[' ? readPlaceholderAt(text, i, text.length, options.math === true) : null
    if (p) {
      if (buf !== '') pieces.push({ kind: 'text', text: buf, offset: bufStart })
      buf = ''
      pieces.push(p)
      i = p.kind === 'placeholder' ? p.placeholder.end : p.end
      continue
    }
    if (buf === '') bufStart = i
    buf += text[i]
    i++
  }
  if (buf !== '') pieces.push({ kind: 'text', text: buf, offset: bufStart })
  return pieces
}

export function parsePlaceholders(text: string, options: { readonly math?: boolean } = {}): ParsedPlaceholders {
  const placeholders: Placeholder[] = []
  const errors: PlaceholderSyntaxError[] = []
  for (const p of scanPlaceholders(text, options)) {
    if (p.kind === 'placeholder') placeholders.push(p.placeholder)
    else if (p.kind === 'error') errors.push({ offset: p.offset, message: p.message, name: p.name })
  }
  return { placeholders, errors }
}

// ---- Numbers ------------------------------------------------------------------------

/** Float noise off: 12 significant digits is far below any tolerance (0.1 + 0.2 → 0.3). */
function clean(x: number): number {
  const c = Number(x.toPrecision(12))
  return c === 0 ? 0 : c
}

interface NumberParts {
  readonly negative: boolean
  /** Digits and point, no sign ("26.85", "1.23"). */
  readonly mantissa: string
  /** Power of ten for scientific notation, or null. */
  readonly exponent: number | null
}

/** Plain decimals for everyday magnitudes, scientific beyond (1e-4 … 1e9). */
function scientificNeeded(x: number): boolean {
  const a = Math.abs(x)
  return a !== 0 && (a < 1e-4 || a >= 1e9)
}

function partsOf(x: number, rule: { sigFigs?: number; decimals?: number }): NumberParts {
  const negative = x < 0
  const a = Math.abs(x)
  if (rule.decimals !== undefined) {
    const s = a.toFixed(rule.decimals)
    return { negative: negative && Number(s) !== 0, mantissa: s, exponent: null }
  }
  if (rule.sigFigs !== undefined) {
    const n = rule.sigFigs
    if (a === 0) return { negative: false, mantissa: n > 1 ? `0.${'0'.repeat(n - 1)}` : '0', exponent: null }
    const rounded = Number(a.toPrecision(n))
    if (scientificNeeded(rounded)) {
      const [m, e] = rounded.toExponential(n - 1).split('e')
      return { negative, mantissa: m ?? '', exponent: Number(e) }
    }
    const mag = Math.floor(Math.log10(rounded))
    return { negative, mantissa: rounded.toFixed(Math.max(0, n - 1 - mag)), exponent: null }
  }
  const c = clean(a)
  if (scientificNeeded(c)) {
    const [m, e] = c.toExponential().split('e')
    return { negative, mantissa: m ?? '', exponent: Number(e) }
  }
  // toFixed avoids String()'s own exponent form for, say, 1.5e-7 (excluded above) or 1e21.
  const s = String(c)
  return {
    negative: negative && c !== 0,
    mantissa: s.includes('e') ? c.toFixed(12).replace(/\.?0+$/, '') : s,
    exponent: null,
  }
}

const SUPERSCRIPT: Readonly<Record<string, string>> = {
  '-': '⁻',
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
}

/** A number as plain text ("−26.85", "1.23 × 10⁻⁵") or TeX ("-26.85", "1.23\times10^{-5}"). */
export function formatNumber(x: number, rule: { sigFigs?: number; decimals?: number }, tex: boolean): string {
  if (!Number.isFinite(x)) return tex ? '\\text{(not a number)}' : '(not a number)'
  const p = partsOf(x, rule)
  const sign = p.negative ? (tex ? '-' : MINUS) : ''
  if (p.exponent === null) return sign + p.mantissa
  if (tex) return `${sign}${p.mantissa}\\times10^{${p.exponent}}`
  return `${sign}${p.mantissa}${NBSP}×${NBSP}10${Array.from(String(p.exponent), (c) => SUPERSCRIPT[c] ?? c).join('')}`
}

// ---- Units --------------------------------------------------------------------------

/** Author unit text in a form mathjs reads: °C → degC, m³ → m^3, · → *. */
function normaliseUnit(text: string): string {
  return text
    .trim()
    .replace(/°\s*C\b/g, 'degC')
    .replace(/°\s*F\b/g, 'degF')
    .replace(/°\s*R\b/g, 'degR')
    .replace(/℃/g, 'degC')
    .replace(/³/g, '^3')
    .replace(/²/g, '^2')
    .replace(/[·⋅×]/g, '*')
}

const TEX_SPECIAL: Readonly<Record<string, string>> = {
  '\\': '\\textbackslash{}',
  '{': '\\{',
  '}': '\\}',
  $: '\\$',
  '&': '\\&',
  '#': '\\#',
  '%': '\\%',
  _: '\\_',
  '^': '\\textasciicircum{}',
  '~': '\\textasciitilde{}',
}

/** Any text safe inside \text{…}. */
export function texEscape(text: string): string {
  return text.replace(/[\\{}$&#%_^~]/g, (c) => TEX_SPECIAL[c] ?? c)
}

const DEGREE_TEX: Readonly<Record<string, string>> = {
  degC: '{}^{\\circ}\\mathrm{C}',
  degF: '{}^{\\circ}\\mathrm{F}',
  degR: '{}^{\\circ}\\mathrm{R}',
  celsius: '{}^{\\circ}\\mathrm{C}',
  fahrenheit: '{}^{\\circ}\\mathrm{F}',
}

/**
 * A unit as TeX: kJ/(kg·K) → \mathrm{kJ}/(\mathrm{kg}{\cdot}\mathrm{K}), m^3 → \mathrm{m}^{3},
 * °C → {}^{\circ}\mathrm{C}, % → \%. Unknown characters are dropped into \text{}.
 */
export function unitToTex(unit: string): string {
  const t = normaliseUnit(unit)
  let out = ''
  let i = 0
  let lastWasUnit = false
  while (i < t.length) {
    const rest = t.slice(i)
    const word = /^[A-Za-zµμΩ]+/.exec(rest)
    if (word) {
      if (lastWasUnit) out += '{\\cdot}'
      out +=
        DEGREE_TEX[word[0]] ??
        `\\mathrm{${word[0].replace('µ', '\\mu ').replace('μ', '\\mu ').replace('Ω', '\\Omega ')}}`
      i += word[0].length
      lastWasUnit = true
      continue
    }
    const pow = /^\^\s*\(?\s*(-?\d+(?:\.\d+)?)\s*\)?/.exec(rest)
    if (pow) {
      out += `^{${pow[1]}}`
      i += pow[0].length
      continue
    }
    const c = t[i]!
    if (c === ' ') {
      i++
      continue
    }
    lastWasUnit = false
    if (c === '*') out += '{\\cdot}'
    else if (c === '/' || c === '(' || c === ')') out += c
    else if (c === '%') out += '\\%'
    else if (/\d/.test(c)) out += c
    else out += `\\text{${texEscape(c)}}`
    i++
  }
  return out
}

/** A unit as plain text for reading: degC → °C, m^3 → m³, kJ/(kg K) → kJ/(kg·K). */
export function unitToText(unit: string): string {
  return formatUnitForDisplay(normaliseUnit(unit))
}

/** "<number> <unit>" in plain text (no-break space) or TeX (thin space). */
export function withUnit(number: string, unit: string, tex: boolean): string {
  if (unit.trim() === '') return number
  if (tex) return `${number}\\,${unitToTex(unit)}`
  // The degree sign stays spaced too: SI Brochure 9th ed., 5.4.3 (from memory) — "26.85 °C".
  return `${number}${NBSP}${unitToText(unit)}`
}

type Conversion = { readonly ok: true; readonly value: number } | { readonly ok: false; readonly message: string }

/** value in `from` → value in `to`; offsets (°C, °F) handled, dimensions checked. */
export function convertValue(value: number, from: string, to: string, name = 'the value'): Conversion {
  const a = resolveExpectedUnit(normaliseUnit(from), false)
  const b = resolveExpectedUnit(normaliseUnit(to), false)
  if (b === null) return { ok: false, message: `"${to}" is not a unit we know` }
  if (a === null) return { ok: false, message: `${name} has the unit "${from}", which we cannot convert` }
  if (a.kind === 'dimensionless' || b.kind === 'dimensionless') {
    if (a.kind === 'dimensionless' && b.kind === 'dimensionless')
      return { ok: true, value: (value * a.scale) / b.scale }
    return {
      ok: false,
      message: `cannot show ${name} (${from === '' ? 'a pure number' : from}) in ${to === '' ? 'a pure number' : to}: different dimensions`,
    }
  }
  if (!a.unit.equalBase(b.unit))
    return { ok: false, message: `cannot show ${name} (${from}) in ${to}: different dimensions` }
  try {
    const v = math.unit(value, a.unit.formatUnits()).toNumber(b.unit.formatUnits())
    return Number.isFinite(v)
      ? { ok: true, value: v }
      : { ok: false, message: `${name} in ${to} is not a finite number` }
  } catch {
    return { ok: false, message: `cannot convert ${name} from ${from} to ${to}` }
  }
}

// ---- One given ----------------------------------------------------------------------

/**
 * A drawn given as text: its unit or `options.unit`, rounded by the placeholder's sf/dp,
 * else (in its own unit only) by the given's display rule, else as drawn without float noise.
 * A display rule in one unit does not carry over to another (2 dp in K is not 2 dp in °C).
 */
export function formatGivenValue(
  given: DrawnGiven,
  display: DisplayRule | undefined,
  options: PlaceholderOptions & { readonly tex: boolean },
): FormatResult {
  if (options.sigFigs !== undefined && options.decimals !== undefined)
    return { ok: false, message: 'give significant figures or decimal places, not both' }
  if (
    options.sigFigs !== undefined &&
    !(Number.isInteger(options.sigFigs) && options.sigFigs >= 1 && options.sigFigs <= MAX_SIG_FIGS)
  )
    return { ok: false, message: `significant figures must be a whole number from 1 to ${MAX_SIG_FIGS}` }
  if (
    options.decimals !== undefined &&
    !(Number.isInteger(options.decimals) && options.decimals >= 0 && options.decimals <= MAX_DECIMALS)
  )
    return { ok: false, message: `decimal places must be a whole number from 0 to ${MAX_DECIMALS}` }
  if (Number.isNaN(given.value)) {
    if (options.unit !== undefined || options.sigFigs !== undefined || options.decimals !== undefined)
      return { ok: false, message: `${given.name} is a text choice: it takes no unit, sf or dp` }
    return { ok: true, text: options.tex ? `\\text{${texEscape(given.text)}}` : given.text }
  }
  let value = given.value
  let unit = given.unit
  let rule: DisplayRule = {}
  if (options.unit !== undefined) {
    const c = convertValue(given.value, given.unit, options.unit, given.name)
    if (!c.ok) return c
    value = c.value
    unit = options.unit
  } else if (display) {
    if (
      display.decimals !== undefined &&
      Number.isInteger(display.decimals) &&
      display.decimals >= 0 &&
      display.decimals <= MAX_DECIMALS
    )
      rule = { decimals: display.decimals }
    else if (
      display.sigFigs !== undefined &&
      Number.isInteger(display.sigFigs) &&
      display.sigFigs >= 1 &&
      display.sigFigs <= MAX_SIG_FIGS
    )
      rule = { sigFigs: display.sigFigs }
  }
  if (options.sigFigs !== undefined) rule = { sigFigs: options.sigFigs }
  if (options.decimals !== undefined) rule = { decimals: options.decimals }
  return { ok: true, text: withUnit(formatNumber(value, rule, options.tex), unit, options.tex) }
}

/** One placeholder against the givens: its text, or why it cannot be shown. */
export function resolvePlaceholder(
  p: Placeholder,
  givens: ReadonlyMap<string, DrawnGiven>,
  displays: Readonly<Record<string, DisplayRule>> | undefined,
  tex: boolean,
): FormatResult {
  const g = givens.get(p.name)
  if (!g) return { ok: false, message: `unknown given ${p.name}` }
  const display = displays && Object.hasOwn(displays, p.name) ? displays[p.name] : undefined
  return formatGivenValue(g, display, {
    tex,
    ...(p.unit !== undefined ? { unit: p.unit } : {}),
    ...(p.sigFigs !== undefined ? { sigFigs: p.sigFigs } : {}),
    ...(p.decimals !== undefined ? { decimals: p.decimals } : {}),
  })
}

/** What a placeholder that cannot be shown becomes in plain text or TeX. */
export function markerText(message: string, tex: boolean): string {
  return tex ? `\\textcolor{#b91c1c}{\\text{[${texEscape(message)}]}}` : `[${message}]`
}

/**
 * Every placeholder of a text replaced (plain text, or TeX with `tex`), escapes undone.
 * A placeholder that cannot be shown becomes a bracketed message ("[unknown given T9]") and
 * is listed in `errors` with its offset in `text`.
 */
export function expandPlaceholders(
  text: string,
  givens: readonly DrawnGiven[],
  displays?: Readonly<Record<string, DisplayRule>>,
  options: { readonly tex?: boolean } = {},
): { text: string; errors: PlaceholderError[] } {
  const tex = options.tex ?? false
  const byName = new Map(givens.map((g) => [g.name, g]))
  const errors: PlaceholderError[] = []
  let out = ''
  for (const piece of scanPlaceholders(text, { math: tex })) {
    if (piece.kind === 'text') out += piece.text
    else if (piece.kind === 'error') {
      errors.push({ name: piece.name, message: piece.message, offset: piece.offset })
      out += markerText(piece.message, tex)
    } else {
      const r = resolvePlaceholder(piece.placeholder, byName, displays, tex)
      if (r.ok) out += r.text
      else {
        errors.push({ name: piece.placeholder.name, message: r.message, offset: piece.placeholder.start })
        out += markerText(r.message, tex)
      }
    }
  }
  return { text: out, errors }
}
