/**
 * The preview of a problem: a few seeded variants, each with the prompt as the student sees
 * it, the key, the worked solution and the diagrams. Used by POST /api/preview (the editor's
 * live preview), the editor's no-JavaScript preview button and the problem page. The
 * definition may be a half-written draft: shape problems and lint findings come back as
 * issues by dotted path; nothing here throws for bad input.
 */
import type { Convention } from '#app/domain/thermo/index.ts'
import { cycleDiagrams } from '#app/domain/authoring/diagrams.ts'
import { lintDefinition } from '#app/domain/authoring/lint.ts'
import { renderPrompt } from '#app/domain/authoring/prompt.ts'
import { checkVariantSanity } from '#app/domain/authoring/sweep.ts'
import { drawVariant, resolveConvention } from '#app/domain/authoring/variant.ts'
import { renderWorkedSolution, workedSolution } from '#app/domain/authoring/worked-solution.ts'
import { parseDefinition } from '#app/lib/problem-schema.ts'
import { controlCharIssues } from '#app/lib/text-field.ts'
import { PREVIEW_SEEDS, type PreviewResult, type PreviewVariant } from '#app/lib/preview.ts'

export interface PreviewOptions {
  readonly seeds?: readonly number[]
  /** The convention a 'course' problem is previewed in. */
  readonly convention?: Convention
}

/** At most this many variants per request, so a preview stays quick. */
export const MAX_PREVIEW_SEEDS = 6

export function previewProblem(raw: unknown, options: PreviewOptions = {}): PreviewResult {
  // Checked first, with the words of a preview (the draft is not shown back without its NULs).
  const control = controlCharIssues(raw, () => 'this text')
  if (control.length > 0) return { issues: control, variants: [] }
  // The draft is parsed, not trusted: what is drawn is the definition saving would store
  // (upgraded from format 1, trimmed), and every shape problem comes back as a message.
  const parsed = parseDefinition(raw)
  if (!parsed.ok) return { issues: parsed.issues, variants: [] }
  const def = parsed.value
  let issues: { path: string; message: string }[]
  try {
    issues = lintDefinition(def)
  } catch (e) {
    console.error('lintDefinition failed', e)
    issues = [{ path: 'physics', message: 'The problem could not be checked; please report this.' }]
  }
  const convention = resolveConvention(def, options.convention ?? 'engineering')
  const seeds = (options.seeds && options.seeds.length > 0 ? options.seeds : PREVIEW_SEEDS).slice(0, MAX_PREVIEW_SEEDS)
  const displays = Object.fromEntries(def.givens.filter((g) => g.display).map((g) => [g.name, g.display!]))
  const variants = seeds.map((seed): PreviewVariant => {
    try {
      const drawn = drawVariant(def, seed, { convention })
      if (!drawn.ok) return { seed, ok: false, error: drawn.error }
      const v = drawn.variant
      const prompt = renderPrompt(def.prompt, v.givens, displays)
      return {
        seed,
        ok: true,
        convention: v.convention,
        givens: v.givens,
        promptHtml: prompt.html,
        key: v.key,
        workedHtml: renderWorkedSolution(workedSolution(v, def)),
        diagrams: cycleDiagrams(v.solution),
        warnings: [...prompt.errors.map((e) => e.message), ...checkVariantSanity(drawn).map((f) => f.message)],
      }
    } catch (e) {
      console.error('preview failed for seed', seed, e)
      return {
        seed,
        ok: false,
        error: { code: 'invalid-definition', message: 'This variant could not be previewed; please report this.' },
      }
    }
  })
  return { issues, variants }
}
