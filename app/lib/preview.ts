/**
 * What the preview of a problem returns (POST /api/preview, the editor's side-by-side
 * variants, the problem page): per seed, the prompt as the student sees it, the key, the
 * worked solution and the diagrams, or why that variant could not be drawn. Isomorphic types.
 */
import type { CycleDiagrams } from '#app/domain/authoring/diagram-plot.ts'
import type { DrawnGiven, KeyEntry, VariantError } from '#app/domain/authoring/definition.ts'

export type PreviewVariant =
  | {
      readonly seed: number
      readonly ok: true
      readonly convention: 'chemistry' | 'engineering'
      readonly givens: readonly DrawnGiven[]
      /** sanitised HTML (Markdown + KaTeX with MathML) */
      readonly promptHtml: string
      readonly key: readonly KeyEntry[]
      /** sanitised HTML */
      readonly workedHtml: string
      readonly diagrams: CycleDiagrams
      /** physical-sanity problems of this variant (same checks as the sweep) */
      readonly warnings: readonly string[]
    }
  | { readonly seed: number; readonly ok: false; readonly error: VariantError }

export interface PreviewResult {
  /** Problems with the definition itself, by dotted path ('givens.0.rule.min'). */
  readonly issues: readonly { readonly path: string; readonly message: string }[]
  readonly variants: readonly PreviewVariant[]
}

/** Seeds shown side by side in the editor and on the problem page. */
export const PREVIEW_SEEDS = [1, 2, 3] as const
