/**
 * The confirmation a student gets for one press of Submit (stored at once, graded later), and
 * the list of their earlier submissions on a problem. Receipts come from
 * app/server/submissions.server.ts (Receipt).
 */
import { formatInZone } from '#app/lib/dates.ts'
import { SUBMISSION_STATUS_LABELS } from '#app/lib/labels.ts'
import type { Receipt } from '#app/server/submissions.server.ts'

function lateText(r: Pick<Receipt, 'daysLate' | 'latePenalty'>): string | null {
  if (r.daysLate <= 0) return null
  const pct = Math.round(r.latePenalty * 1000) / 10
  return `${r.daysLate} day${r.daysLate === 1 ? '' : 's'} late, ${pct} % off`
}

/**
 * The receipt box shown after a submission. `live` says the page polls for results (JavaScript
 * is running); without it the student is told to reload. Put it inside a live region that is
 * already on the page, so its arrival and its change to "Graded" are announced.
 */
export function ReceiptBox({ receipt, timeZone, live }: { receipt: Receipt; timeZone: string; live: boolean }) {
  const late = lateText(receipt)
  return (
    <section
      aria-labelledby="receipt-title"
      id="receipt"
      className="rounded-lg border border-ok/30 bg-ok-soft p-4 text-sm text-ink"
      data-receipt={receipt.submissionId}
    >
      <h2 id="receipt-title" className="text-base font-semibold text-ok">
        Answers received
      </h2>
      <p className="mt-1">
        Submitted <time dateTime={receipt.submittedAt}>{formatInZone(receipt.submittedAt, timeZone)}</time>.
      </p>
      {receipt.parts.length > 0 ? (
        <ul className="mt-2 list-disc pl-5">
          {receipt.parts.map((p) => (
            <li key={p.findName}>
              {p.label}: counted as attempt {p.attempt} of {p.of}
            </li>
          ))}
        </ul>
      ) : null}
      {late ? <p className="mt-2 font-medium text-warn">Submitted {late}.</p> : null}
      <div className="mt-2">
        {receipt.status === 'queued' ? (
          live ? (
            <p>Grading in the background — this page shows the result when it is ready.</p>
          ) : (
            <p>Grading in the background. Reload the page to see the result.</p>
          )
        ) : receipt.status === 'graded' ? (
          <p>Graded: the result is shown beside each answer.</p>
        ) : (
          <p>{SUBMISSION_STATUS_LABELS.failed}. Your answers are stored; your teacher has been told.</p>
        )}
      </div>
    </section>
  )
}

/** Every earlier submission on this problem, newest first. */
export function ReceiptList({ receipts, timeZone }: { receipts: readonly Receipt[]; timeZone: string }) {
  if (receipts.length === 0)
    return <p className="text-sm text-muted">You have not submitted answers to this problem yet.</p>
  return (
    <table className="w-full text-left text-sm">
      <caption className="text-left text-base font-semibold">Your submissions</caption>
      <thead className="text-xs text-muted">
        <tr>
          <th scope="col" className="py-1 pr-3">
            Submitted
          </th>
          <th scope="col" className="py-1 pr-3">
            Answers counted
          </th>
          <th scope="col" className="py-1 pr-3">
            Status
          </th>
          <th scope="col" className="py-1">
            Late
          </th>
        </tr>
      </thead>
      <tbody>
        {receipts.map((r) => (
          <tr key={r.submissionId} className="border-t border-line align-top">
            <td className="py-1 pr-3">
              <time dateTime={r.submittedAt}>{formatInZone(r.submittedAt, timeZone)}</time>
            </td>
            <td className="py-1 pr-3">
              {r.parts.length === 0
                ? '—'
                : r.parts.map((p) => `${p.label} (attempt ${p.attempt} of ${p.of})`).join('; ')}
            </td>
            <td className="py-1 pr-3">{SUBMISSION_STATUS_LABELS[r.status]}</td>
            <td className="py-1">{lateText(r) ?? 'On time'}</td>
          </tr>
        ))}
      </tbody>
    </table>
  )
}
