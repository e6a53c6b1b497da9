import type { RefObject } from 'react'
import { describeField, fieldId, fieldPathForIssue, type FormIssue } from '#app/lib/problem-form.ts'

/** The refused save's summary: each issue links to its field (and moves focus there). */
export function IssueSummary({
  issues,
  summaryRef,
}: {
  issues: readonly FormIssue[]
  summaryRef: RefObject<HTMLDivElement | null>
}) {
  return (
    <div
      ref={summaryRef}
      tabIndex={-1}
      aria-labelledby="editor-issues-title"
      className="rounded-md border border-danger/30 bg-danger-soft px-4 py-3 text-sm text-danger xl:col-span-2"
    >
      <h2 id="editor-issues-title" className="font-semibold">
        Nothing was saved: {issues.length === 1 ? 'one thing needs' : `${issues.length} things need`} your attention
      </h2>
      <ul className="mt-2 list-disc pl-5">
        {issues.map((issue, i) => (
          <li key={i}>
            <a
              href={`#${fieldId(fieldPathForIssue(issue.path))}`}
              className="text-danger underline"
              onClick={(e) => {
                const target = document.getElementById(fieldId(fieldPathForIssue(issue.path)))
                if (!target) return
                e.preventDefault()
                target.scrollIntoView({ block: 'center' })
                target.focus()
              }}
            >
              {describeField(issue.path)}
            </a>
            : {issue.message}
          </li>
        ))}
      </ul>
    </div>
  )
}
