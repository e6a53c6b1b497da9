/**
 * A few variants of a problem side by side: the givens drawn, the prompt as a student reads
 * it, the key, the worked solution and the diagrams. Used by the problem editor's preview and
 * the problem page.
 */
// The prompt and the worked solution carry KaTeX markup; its stylesheet goes wherever they show.
import 'katex/dist/katex.min.css'
import { AnswerKeyTable } from '#app/components/answer-key-table.tsx'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import type { PreviewVariant } from '#app/lib/preview.ts'

export { KeyValue } from '#app/components/answer-key-table.tsx'

export function VariantPreview({
  variants,
  showKey = true,
}: {
  variants: readonly PreviewVariant[]
  showKey?: boolean
}) {
  if (variants.length === 0) return <p className="text-sm text-muted">No variants to show.</p>
  return (
    <div className="grid grid-cols-1 gap-4 lg:grid-cols-[repeat(auto-fit,minmax(18rem,1fr))]">
      {variants.map((v) => (
        <VariantColumn key={v.seed} variant={v} showKey={showKey} />
      ))}
    </div>
  )
}

function VariantColumn({ variant: v, showKey }: { variant: PreviewVariant; showKey: boolean }) {
  const headingId = `variant-${v.seed}-title`
  return (
    <article
      aria-labelledby={headingId}
      data-variant-seed={v.seed}
      className="flex min-w-0 flex-col gap-3 rounded-lg border border-line bg-white p-4 shadow-sm"
    >
      <h3 id={headingId} className="text-lg font-semibold">
        Variant (seed {v.seed})
      </h3>
      {!v.ok ? (
        <Notice tone="error">
          <p className="font-semibold">This variant could not be drawn.</p>
          <p className="mt-1">{v.error.message}</p>
          {v.error.property ? (
            <p className="mt-1">
              About: <code>{v.error.property}</code>
            </p>
          ) : null}
        </Notice>
      ) : (
        <>
          {v.givens.length > 0 ? (
            <section aria-label={`Givens of seed ${v.seed}`}>
              <h4 className="text-sm font-semibold text-muted">Givens</h4>
              <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
                {v.givens.map((g) => (
                  <div key={g.name} className="contents">
                    <dt title={g.label}>
                      <code>{g.name}</code>
                    </dt>
                    <dd>{g.text}</dd>
                  </div>
                ))}
              </dl>
            </section>
          ) : null}
          <section aria-label={`Prompt of seed ${v.seed}`}>
            <h4 className="text-sm font-semibold text-muted">Prompt</h4>
            {/* Rendered and sanitised on the server (Markdown + KaTeX, tags and attributes
                allowed by a list), so it is safe to insert as it is. */}
            <div
              className="prompt-html mt-1 text-sm leading-relaxed [&_p]:mt-2"
              dangerouslySetInnerHTML={{ __html: v.promptHtml }}
            />
          </section>
          {showKey ? <AnswerKeyTable entries={v.key} caption="Key" showNames /> : null}
          {v.warnings.length > 0 ? (
            <Notice tone="warn">
              <p className="font-semibold">Check this variant</p>
              <ul className="mt-1 list-disc pl-5">
                {v.warnings.map((w, i) => (
                  <li key={i}>{w}</li>
                ))}
              </ul>
            </Notice>
          ) : null}
          {showKey ? (
            <details className="text-sm">
              <summary className="cursor-pointer font-semibold">Worked solution</summary>
              {/* Sanitised on the server, like the prompt. */}
              <div
                className="mt-2 overflow-x-auto leading-relaxed"
                dangerouslySetInnerHTML={{ __html: v.workedHtml }}
              />
            </details>
          ) : null}
          <CycleDiagrams diagrams={v.diagrams} caption={`Diagrams of seed ${v.seed}`} stacked />
        </>
      )}
    </article>
  )
}
