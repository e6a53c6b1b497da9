import type { UseQueryResult } from '@tanstack/react-query'
import { Notice } from '#app/components/ui/notice.tsx'
import { VariantPreview } from '#app/components/variant-preview.tsx'
import { conventionText } from '#app/lib/conventions.ts'
import type { PreviewResult } from '#app/lib/preview.ts'
import { describeField, fieldId, fieldPathForIssue, type FormIssue } from '#app/lib/problem-form.ts'
import { FORM_ID } from './fields.tsx'

/**
 * The preview beside the form (below it on narrower screens): a few seeded variants as
 * students would see them, what is not finished yet, and with a course convention the
 * convention to preview in.
 */
export function SidePreview({
  hydrated,
  previewQuery,
  shownPreview,
  previewIssues,
  courseConvention,
  previewConvention,
  setPreviewConvention,
}: {
  hydrated: boolean
  previewQuery: UseQueryResult<PreviewResult>
  shownPreview: PreviewResult | null
  previewIssues: readonly FormIssue[]
  courseConvention: boolean
  previewConvention: string
  setPreviewConvention: (convention: string) => void
}) {
  return (
    <section
      id="preview"
      aria-labelledby="preview-title"
      className="flex min-w-0 flex-col gap-3 xl:sticky xl:top-4 xl:max-h-[calc(100vh-2rem)] xl:overflow-y-auto xl:rounded-lg xl:border xl:border-line xl:bg-white xl:p-4 xl:shadow-sm"
    >
      <h2 id="preview-title" className="text-xl font-semibold">
        Preview
      </h2>
      <p className="text-sm text-muted">
        {hydrated
          ? 'A few seeded variants, as students would see them, updated as you type.'
          : 'Press “Preview variants” (below the form) to see a few seeded variants as students would see them.'}
      </p>
      {courseConvention ? (
        <div className="flex items-center gap-2 text-sm">
          <label htmlFor="preview-convention">Preview in</label>
          <select
            id="preview-convention"
            form={FORM_ID}
            name="_previewConvention"
            value={previewConvention}
            onChange={(e) => setPreviewConvention(e.target.value)}
            className="rounded-md border border-line bg-white px-2 py-1"
          >
            <option value="engineering">{conventionText.engineering.label}</option>
            <option value="chemistry">{conventionText.chemistry.label}</option>
          </select>
        </div>
      ) : null}
      <p aria-live="polite" className="min-h-5 text-sm text-muted">
        {hydrated && previewQuery.isFetching ? 'Updating preview…' : ''}
      </p>
      {hydrated && previewQuery.isError ? <Notice tone="error">{previewQuery.error.message}</Notice> : null}
      {previewIssues.length > 0 ? (
        <Notice tone="warn">
          <p className="font-semibold">The problem is not finished yet</p>
          <ul className="mt-1 list-disc pl-5">
            {previewIssues.map((issue, i) => (
              <li key={i}>
                <a href={`#${fieldId(fieldPathForIssue(issue.path))}`}>{describeField(issue.path)}</a>: {issue.message}
              </li>
            ))}
          </ul>
        </Notice>
      ) : null}
      {shownPreview ? <VariantPreview variants={shownPreview.variants} /> : null}
    </section>
  )
}
