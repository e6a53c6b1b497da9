/**
 * A prompt as HTML: `[T1]` placeholders (./placeholders.ts), Markdown (markdown-it, raw HTML
 * escaped, links only http/https/mailto) and math ($…$ inline, $$…$$ display) rendered by
 * KaTeX with MathML beside the visual HTML, so screen readers read the formulas.
 *
 * Math and placeholders are markdown-it rules rather than a pre-pass over the text, so code
 * spans and code blocks keep "$" and "[" literal, and Markdown never sees the inside of a
 * formula (an "_" in TeX is not emphasis). Never throws on author input: problems come back
 * in `errors` and show in place as a marked span. Pure (no DOM needed).
 */
import katex from 'katex'
import MarkdownIt from 'markdown-it'
import type { MarkdownIt as MarkdownItInstance, StateBlock, StateInline } from 'markdown-it'
import { isRecord } from '#app/domain/thermo/json.ts'
import type { DrawnGiven } from './definition.ts'
import {
  expandPlaceholders,
  markerText,
  placeholderText,
  readPlaceholderAt,
  resolvePlaceholder,
} from './placeholders.ts'
import type { DisplayRule } from './placeholders.ts'

export interface RenderResult {
  readonly html: string
  readonly errors: { readonly message: string }[]
}

/** Longest prompt we render; a bank prompt is a paragraph or two. */
export const MAX_PROMPT_LENGTH = 100_000
/** Longest single formula handed to KaTeX. */
const MAX_TEX_LENGTH = 5_000

// A type alias, not an interface, so it fits markdown-it's `Env` (an index signature).
type RenderEnv = {
  readonly givens: ReadonlyMap<string, DrawnGiven>
  readonly displays: Readonly<Record<string, DisplayRule>> | undefined
  readonly errors: { message: string }[]
}

/** Our env object as markdown-it hands it back to a rule (its types say `any`). */
function isRenderEnv(x: unknown): x is RenderEnv {
  return (
    isRecord(x) &&
    x.givens instanceof Map &&
    (x.displays === undefined || isRecord(x.displays)) &&
    Array.isArray(x.errors)
  )
}

/** The env of a render call; only renderPrompt and renderGuide start one, so anything else is a bug. */
function renderEnv(env: unknown): RenderEnv {
  if (!isRenderEnv(env)) throw new Error("markdown-it was called without the prompt renderer's env")
  return env
}

/** `token.meta` of a cw_math token: `{ display }`. */
function isDisplayMath(meta: unknown): boolean {
  return isRecord(meta) && Boolean(meta.display)
}

/** `token.meta` of a cw_placeholder token: `{ ok, message? }`. */
function placeholderMeta(meta: unknown): { readonly ok: boolean; readonly message?: string } {
  if (!isRecord(meta)) return { ok: false }
  return { ok: Boolean(meta.ok), ...(typeof meta.message === 'string' ? { message: meta.message } : {}) }
}

export function escapeHtml(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c,
  )
}

/**
 * One formula as KaTeX HTML + MathML. A TeX error is reported and the formula still shows,
 * with KaTeX's own error colouring, so the author sees where it went wrong.
 */
export function renderMath(tex: string, displayMode: boolean): { html: string; error?: string } {
  if (tex.length > MAX_TEX_LENGTH) {
    return {
      html: `<span class="math-error">${escapeHtml(markerText('formula too long', false))}</span>`,
      error: `a formula is longer than ${MAX_TEX_LENGTH} characters`,
    }
  }
  // trust: false keeps \href, \url, \htmlClass and friends out; maxSize/maxExpand bound the
  // work and size a formula can cause. strict 'ignore' keeps KaTeX from writing to the console.
  const options = {
    output: 'htmlAndMathml',
    displayMode,
    throwOnError: true,
    strict: 'ignore',
    trust: false,
    maxSize: 20,
    maxExpand: 1000,
  } as const
  try {
    return { html: katex.renderToString(tex, options) }
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e)
    try {
      return { html: katex.renderToString(tex, { ...options, throwOnError: false }), error: message }
    } catch {
      return { html: `<span class="math-error">${escapeHtml(tex)}</span>`, error: message }
    }
  }
}

function isSpace(c: string | undefined): boolean {
  return c === undefined || /\s/.test(c)
}

/** Index of the "$" (or "$$") closing math opened before `from`, or -1. */
function findClosing(src: string, from: number, max: number, display: boolean): number {
  let i = from
  while (i < max) {
    const c = src[i]
    if (c === '\\') {
      i += 2
      continue
    }
    if (c === '$') {
      if (display) {
        if (src[i + 1] === '$') return i
      } else if (!isSpace(src[i - 1]) && !/\d/.test(src[i + 1] ?? '')) {
        // Pandoc's rule (common practice): "$5 and $6" is money, not math.
        return i
      }
    }
    i++
  }
  return -1
}

export const UNCLOSED_INLINE = 'A $ starts math that is never closed; write \\$ for a dollar sign.'
export const UNCLOSED_DISPLAY =
  'A $$ starts display math that is never closed; close it with $$, or write \\$ for a dollar sign.'

function mathInline(state: StateInline, silent: boolean): boolean {
  const src = state.src
  const pos = state.pos
  if (src.charCodeAt(pos) !== 0x24 /* $ */) return false
  const display = src.charCodeAt(pos + 1) === 0x24
  const start = pos + (display ? 2 : 1)
  if (!display && isSpace(src[start])) return false
  const close = findClosing(src, start, state.posMax, display)
  if (close < 0) {
    // Shown as text either way; an author who meant math should hear that it never closed.
    // Pandoc's rule (common practice): "$5 and $6" is money, so a digit after the $ is no error.
    if (!silent && !/\d/.test(src[start] ?? '')) {
      const env = renderEnv(state.env)
      env.errors.push({ message: display ? UNCLOSED_DISPLAY : UNCLOSED_INLINE })
    }
    // Both dollars of "$$" are taken as text here, so the second is not read as a new opener.
    if (!silent) state.pending += display ? '$$' : '$'
    state.pos = start
    return true
  }
  const content = src.slice(start, close)
  if (content.trim() === '') return false
  if (!silent) {
    const token = state.push('cw_math', '', 0)
    token.content = content
    token.meta = { display }
  }
  state.pos = close + (display ? 2 : 1)
  return true
}

/** `$$` opening a line, up to a line ending in `$$`: a display formula of its own. */
function mathBlock(state: StateBlock, startLine: number, endLine: number, silent: boolean): boolean {
  if (state.sCount[startLine]! - state.blkIndent >= 4) return false
  const begin = state.bMarks[startLine]! + state.tShift[startLine]!
  const lineEnd = state.eMarks[startLine]!
  if (!state.src.startsWith('$$', begin)) return false
  const first = state.src.slice(begin + 2, lineEnd).trimEnd()
  let content: string
  let last = startLine
  if (first.endsWith('$$') && first.length >= 2) {
    content = first.slice(0, -2)
    // "$$a$$ and $$b$$" is running text with inline display formulas.
    if (content.includes('$$') || content.trim() === '') return false
  } else {
    const lines = [first]
    let found = false
    for (let next = startLine + 1; next < endLine; next++) {
      const s = state.bMarks[next]! + state.tShift[next]!
      const e = state.eMarks[next]!
      const line = state.src.slice(s, e).trimEnd()
      if (line.endsWith('$$')) {
        lines.push(line.slice(0, -2))
        last = next
        found = true
        break
      }
      lines.push(line)
    }
    if (!found) return false
    content = lines.join('\n')
  }
  if (silent) return true
  state.line = last + 1
  const token = state.push('cw_math_block', 'div', 0)
  token.block = true
  token.content = content
  token.map = [startLine, state.line]
  return true
}

function placeholderInline(state: StateInline, silent: boolean): boolean {
  const src = state.src
  const pos = state.pos
  if (src.charCodeAt(pos) !== 0x5b /* [ */) return false
  // Silent runs measure a link's text: a placeholder there must read as a bracket pair, or
  // markdown-it takes it for a link inside a link and gives up on "[text [T1]](address)".
  if (silent) return false
  const p = readPlaceholderAt(src, pos, state.posMax)
  if (p === null) return false
  if (!silent) {
    const env = renderEnv(state.env)
    const token = state.push('cw_placeholder', '', 0)
    if (p.kind === 'error') {
      env.errors.push({ message: `placeholder: ${p.message}` })
      token.meta = { ok: false, message: p.message }
    } else {
      const r = resolvePlaceholder(p.placeholder, env.givens, env.displays, false)
      if (r.ok) token.content = r.text
      else env.errors.push({ message: `placeholder ${placeholderText(p.placeholder.name)}: ${r.message}` })
      token.meta = r.ok ? { ok: true } : { ok: false, message: r.message }
    }
  }
  state.pos = p.kind === 'placeholder' ? p.placeholder.end : p.end
  return true
}

function errorSpan(message: string): string {
  return `<span class="placeholder-error" role="note">${escapeHtml(markerText(message, false))}</span>`
}

function mathHtml(tex: string, display: boolean, env: RenderEnv): string {
  const expanded = expandPlaceholders(tex, [...env.givens.values()], env.displays, { tex: true })
  for (const e of expanded.errors) env.errors.push({ message: `placeholder in math: ${e.message}` })
  const r = renderMath(expanded.text, display)
  if (r.error) env.errors.push({ message: `math: ${r.error}` })
  return r.html
}

const SAFE_LINK = /^(https?:|mailto:)/i

function createRenderer(): MarkdownItInstance {
  const md = new MarkdownIt({ html: false, linkify: false, typographer: false })
  // Images would load third-party content into a student's page; links to them still work.
  md.disable('image')
  md.validateLink = (url: string) => SAFE_LINK.test(url.trim())
  md.block.ruler.before('fence', 'cw_math_block', mathBlock, { alt: ['paragraph', 'reference', 'blockquote', 'list'] })
  md.inline.ruler.after('escape', 'cw_math', mathInline)
  // After the link rule: "[text](address)" stays a link, and a placeholder inside its text still works.
  md.inline.ruler.after('link', 'cw_placeholder', placeholderInline)
  md.renderer.rules.cw_math = (tokens, idx, _options, env) => {
    const t = tokens[idx]!
    return mathHtml(t.content, isDisplayMath(t.meta), renderEnv(env))
  }
  md.renderer.rules.cw_math_block = (tokens, idx, _options, env) =>
    `<div class="math-display">${mathHtml(tokens[idx]!.content, true, renderEnv(env))}</div>\n`
  md.renderer.rules.cw_placeholder = (tokens, idx) => {
    const t = tokens[idx]!
    const meta = placeholderMeta(t.meta)
    return meta.ok ? escapeHtml(t.content) : errorSpan(meta.message ?? 'placeholder')
  }
  const defaultLinkOpen = md.renderer.rules.link_open
  md.renderer.rules.link_open = (tokens, idx, options, env, self) => {
    tokens[idx]!.attrSet('rel', 'nofollow noopener noreferrer')
    return defaultLinkOpen ? defaultLinkOpen(tokens, idx, options, env, self) : self.renderToken(tokens, idx, options)
  }
  return md
}

const md = createRenderer()

/** A prompt with the givens of one variant, as HTML. */
export function renderPrompt(
  markdown: string,
  givens: readonly DrawnGiven[],
  displays?: Readonly<Record<string, DisplayRule>>,
): RenderResult {
  if (typeof markdown !== 'string') return { html: '', errors: [{ message: 'the prompt must be text' }] }
  if (markdown.length > MAX_PROMPT_LENGTH)
    return {
      html: `<p>${errorSpan('prompt too long')}</p>`,
      errors: [{ message: `the prompt is longer than ${MAX_PROMPT_LENGTH} characters` }],
    }
  const env: RenderEnv = { givens: new Map(givens.map((g) => [g.name, g])), displays, errors: [] }
  try {
    return { html: md.render(markdown, env), errors: env.errors }
  } catch (e) {
    // Not expected; keeps the promise that a prompt never takes a page down.
    return {
      html: `<p>${errorSpan('the prompt could not be rendered')}</p>`,
      errors: [...env.errors, { message: `internal error: ${e instanceof Error ? e.message : String(e)}` }],
    }
  }
}

/** Markdown and math without givens (feedback texts, notes): the same pipeline. */
export function renderMarkdown(markdown: string): RenderResult {
  return renderPrompt(markdown, [])
}

// ---- Guides (docs/*.md served as help pages) ---------------------------------------------

/** A heading's anchor: "Placeholder syntax" → "placeholder-syntax" (as GitHub makes them). */
export function headingSlug(text: string): string {
  return text
    .trim()
    .toLowerCase()
    .replace(/[^\p{L}\p{N}\s-]/gu, '')
    .replace(/\s/g, '-')
}

type GuideEnv = {
  readonly errors: { message: string }[]
  readonly givens: ReadonlyMap<string, DrawnGiven>
  readonly displays: undefined
  readonly links: Readonly<Record<string, string>>
  readonly dropped: boolean[]
  readonly slugs: Map<string, number>
}

function isGuideEnv(x: unknown): x is GuideEnv {
  return (
    isRecord(x) &&
    x.givens instanceof Map &&
    x.displays === undefined &&
    Array.isArray(x.errors) &&
    isRecord(x.links) &&
    Array.isArray(x.dropped) &&
    x.slugs instanceof Map
  )
}

/** The env of a renderGuide call as markdown-it hands it back to a rule. */
function guideEnv(env: unknown): GuideEnv {
  if (isGuideEnv(env)) return env
  throw new Error("markdown-it was called without the guide renderer's env")
}

/** The pages a guide may link to: "authoring.md#x" → "/help/authoring#x"; others lose their link. */
function guideHref(href: string, links: Readonly<Record<string, string>>): string | null {
  if (/^(https?:|mailto:)/i.test(href) || href.startsWith('#')) return href
  const [file, anchor] = href.split('#', 2)
  const page = links[(file ?? '').replace(/^\.\//, '')]
  return page === undefined ? null : anchor ? `${page}#${anchor}` : page
}

function createGuideRenderer(): MarkdownItInstance {
  const g = new MarkdownIt({ html: false, linkify: false, typographer: false })
  g.disable('image')
  // Every address is read; guideHref decides which stay links.
  g.validateLink = (url: string) => !/^\s*(javascript|vbscript|data|file):/i.test(url)
  g.block.ruler.before('fence', 'cw_math_block', mathBlock, { alt: ['paragraph', 'reference', 'blockquote', 'list'] })
  g.inline.ruler.after('escape', 'cw_math', mathInline)
  g.renderer.rules.cw_math = (tokens, idx, _options, env) => {
    const t = tokens[idx]!
    return mathHtml(t.content, isDisplayMath(t.meta), renderEnv(env))
  }
  g.renderer.rules.cw_math_block = (tokens, idx, _options, env) =>
    `<div class="math-display">${mathHtml(tokens[idx]!.content, true, renderEnv(env))}</div>\n`
  g.renderer.rules.heading_open = (tokens, idx, options, env, self) => {
    const e = guideEnv(env)
    const base = headingSlug(tokens[idx + 1]?.content ?? '') || 'section'
    const n = e.slugs.get(base) ?? 0
    e.slugs.set(base, n + 1)
    tokens[idx]!.attrSet('id', n === 0 ? base : `${base}-${n}`)
    return self.renderToken(tokens, idx, options)
  }
  g.renderer.rules.link_open = (tokens, idx, options, env, self) => {
    const e = guideEnv(env)
    const t = tokens[idx]!
    const href = guideHref(String(t.attrGet('href') ?? ''), e.links)
    e.dropped.push(href === null)
    if (href === null) return ''
    t.attrSet('href', href)
    if (/^https?:/i.test(href)) t.attrSet('rel', 'nofollow noopener noreferrer')
    return self.renderToken(tokens, idx, options)
  }
  g.renderer.rules.link_close = (tokens, idx, options, env, self) =>
    guideEnv(env).dropped.pop() ? '' : self.renderToken(tokens, idx, options)
  return g
}

const guide = createGuideRenderer()

/**
 * A guide (docs/*.md) as HTML: the same Markdown and KaTeX as prompts, without placeholders
 * (a guide shows them as examples), headings with anchors, and links to other guides mapped
 * by `links` ({ 'bank-format.md': '/help/bank-format' }); a link to anything else keeps its text.
 */
export function renderGuide(markdown: string, links: Readonly<Record<string, string>>): RenderResult {
  const env: GuideEnv = { errors: [], givens: new Map(), displays: undefined, links, dropped: [], slugs: new Map() }
  try {
    return { html: guide.render(markdown, env), errors: env.errors }
  } catch (e) {
    return {
      html: `<p>${errorSpan('the page could not be shown')}</p>`,
      errors: [{ message: `internal error: ${e instanceof Error ? e.message : String(e)}` }],
    }
  }
}
