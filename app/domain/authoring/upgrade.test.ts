/**
 * The definition-format upgrade (1 → 2) against the demo bank: each demo problem written the
 * old way (`@{T1}`) upgrades to exactly its prompt of today, renders the same text, and draws
 * the same givens and key, so a frozen version upgraded in place keeps every student's numbers.
 */
import { describe, expect, test } from 'vitest'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { DEFINITION_FORMAT, upgradeDefinition, type ProblemDefinition } from './definition.ts'
import { renderPrompt } from './prompt.ts'
import { drawVariant } from './variant.ts'

/** A prompt of today written as format 1 would have: [name …] → @{name …}, "@{" → "@@{". */
function asFormatOne(prompt: string): string {
  return prompt.replace(/@\{/g, '@@{').replace(/(?<!\\[A-Za-z]*)\[([A-Za-z][^\]\n]*)\](?!\()/g, '@{$1}')
}

const all = DEMO_PROBLEMS.flatMap((d) => [d.definition, ...(d.earlierVersions ?? [])])

describe('every demo problem upgraded from format 1', () => {
  test('the demo bank is written in today’s format and has placeholders to upgrade', () => {
    for (const def of all) expect(def.format).toBe(DEFINITION_FORMAT)
    expect(all.filter((d) => asFormatOne(d.prompt) !== d.prompt).length).toBe(all.length)
  })

  test.each(all.map((d) => [d.title, d] as const))('%s: same prompt, same text, same givens and key', (_title, def) => {
    const old = { ...def, format: 1, prompt: asFormatOne(def.prompt) }
    const upgraded = upgradeDefinition(old) as ProblemDefinition
    expect(upgraded).toEqual(def)
    for (const seed of [1, 2, 3, 17, 4242]) {
      for (const convention of ['engineering', 'chemistry'] as const) {
        const a = drawVariant(def, seed, { convention })
        const b = drawVariant(upgraded, seed, { convention })
        expect(a.ok && b.ok).toBe(true)
        if (!a.ok || !b.ok) continue
        expect(b.variant.givens).toEqual(a.variant.givens)
        expect(b.variant.key).toEqual(a.variant.key)
        if (seed === 1 && convention === 'engineering') {
          const shown = renderPrompt(upgraded.prompt, b.variant.givens)
          expect(shown.errors).toEqual([])
          expect(shown.html).not.toMatch(/\[[A-Za-z]/)
        }
      }
    }
  })
})
