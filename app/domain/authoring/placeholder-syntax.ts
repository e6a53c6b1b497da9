/**
 * How a placeholder is written, with no dependencies, so the editor's page can use it
 * without the unit machinery of ./placeholders.ts: the text of a placeholder, and the
 * rewrite of a definition-format-1 prompt (`@{T1}`) into today's syntax (`[T1]`). Pure.
 */

export interface PlaceholderSpelling {
  readonly unit?: string
  readonly sigFigs?: number
  readonly decimals?: number
}

/** How a placeholder is written, for messages and the editor's "insert a given" list. */
export function placeholderText(name: string, options: PlaceholderSpelling = {}): string {
  const unit = options.unit !== undefined ? ` in ${options.unit}` : ''
  const round =
    options.sigFigs !== undefined
      ? `, ${options.sigFigs} sf`
      : options.decimals !== undefined
        ? `, ${options.decimals} dp`
        : ''
  return `[${name}${unit}${round}]`
}

// ---- Definition format 1 → 2 ------------------------------------------------------------

/**
 * The rewrite of a format-1 prompt, as ordered (pattern, replacement) pairs applied with the
 * global flag. Written so PostgreSQL's regexp_replace reads the same patterns (no named
 * groups; "\1" in the replacement), and the migration repeats them literally:
 *
 * 1. A "[" that the new syntax would read (a letter after it, no backslash or TeX command
 *    before it, not a Markdown link) gets a backslash, so it stays a bracket.
 * 2. "@@{" (a literal "@{") becomes a marker character that no prompt holds (control
 *    characters are refused in prompts), so step 3 leaves it alone.
 * 3. "@{name …}" directly before "(" becomes "[name …] (": "](" would be a Markdown link.
 * 4. Every other "@{name …}" on one line becomes "[name …]", spaces inside trimmed.
 * 5. The marker becomes "@{" again: in the new syntax "@{" is plain text.
 */
export const LEGACY_REWRITES: readonly (readonly [pattern: string, replacement: string])[] = [
  ['(?<!\\\\[A-Za-z]*)\\[(?=[A-Za-z])(?![^\\]\\n]*\\]\\()', '\\\\['],
  ['@@\\{', '\u0001'],
  ['@\\{[ \\t]*([A-Za-z][^}\\n]{0,78}?)[ \\t]*\\}(?=\\()', '[\\1] '],
  ['@\\{[ \\t]*([A-Za-z][^}\\n]{0,78}?)[ \\t]*\\}', '[\\1]'],
  ['\u0001', '@{'],
]

/** A prompt written for definition format 1 (`@{T1}`), in today's syntax (`[T1]`). */
export function upgradeLegacyPrompt(prompt: string): string {
  let out = prompt
  for (const [pattern, replacement] of LEGACY_REWRITES) {
    // PostgreSQL writes a group as \1 and a backslash as \\; JavaScript as $1 and \.
    const js = replacement.replace(/\\\\|\\(\d)|\$/g, (m, d: string | undefined) =>
      m === '\\\\' ? '\\' : m === '$' ? '$$' : `$${d}`,
    )
    out = out.replace(new RegExp(pattern, 'g'), js)
  }
  return out
}
