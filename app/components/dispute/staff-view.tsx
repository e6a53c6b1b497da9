import { href, Link } from 'react-router'
import { AnswerKeyTable } from '#app/components/answer-key-table.tsx'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { formatPoints } from '#app/lib/points.ts'
import type { DisputeDetail } from '#app/server/disputes.server.ts'
import { ResolveForm, type ResolveResult } from './resolve-form.tsx'
import { Section } from './section.tsx'
import { pointsText, verdictText } from './words.ts'

export type StaffDetail = Omit<DisputeDetail, 'dispute' | 'timeZone' | 'find'>

/** What staff see of a dispute: the answer and all attempts, the file, the variant with its key and worked solution, the history, and the form to resolve it. */
export function StaffView({
  courseId,
  detail,
  dispute: d,
  find,
  fmt,
  problemHref,
  resolveResult,
}: {
  courseId: number
  detail: StaffDetail
  dispute: DisputeDetail['dispute']
  find: DisputeDetail['find']
  fmt: (at: string) => string
  problemHref: string
  resolveResult?: ResolveResult
}) {
  const a = detail.answer
  const attachmentHref = href('/courses/:courseId/disputes/:disputeId/attachment', {
    courseId: String(courseId),
    disputeId: String(d.id),
  })
  return (
    <>
      {d.status === 'open' ? <ResolveForm detail={detail} find={find} result={resolveResult} /> : null}

      <Section id="answer" title="The disputed answer">
        <dl className="grid gap-2 sm:grid-cols-[12rem_1fr]">
          <dt className="font-medium">Student</dt>
          <dd className="[overflow-wrap:anywhere]">
            {d.student.name} <span className="text-muted">({d.student.email})</span>
          </dd>
          <dt className="font-medium">Where</dt>
          <dd>
            {d.assignmentTitle},{' '}
            <Link to={problemHref}>
              problem {d.position}: {d.problemTitle}
            </Link>
            , find {find.label} (<code>{find.name}</code>, {find.unit || 'pure number'}, worth{' '}
            {formatPoints(find.share)} points)
          </dd>
          <dt className="font-medium">Answer</dt>
          <dd>
            <code>{a.text}</code> — attempt {a.attempt}, submitted {fmt(a.submittedAt)}
            {a.daysLate > 0 ? `, ${a.daysLate} ${a.daysLate === 1 ? 'day' : 'days'} late` : ''}
          </dd>
          <dt className="font-medium">Verdict</dt>
          <dd>
            {verdictText(a.verdict)}, {pointsText(a.score, a.maxScore)}
          </dd>
          <dt className="font-medium">Checker’s message</dt>
          <dd>{a.message ?? '—'}</dd>
          <dt className="font-medium">Pitfall</dt>
          <dd>
            {a.pitfallId ? (
              <>
                <span className="font-medium">{a.pitfallTitle ?? a.pitfallId}</span>
                {a.pitfallFeedback ? <span className="block text-muted">{a.pitfallFeedback}</span> : null}
              </>
            ) : (
              'None recognised'
            )}
          </dd>
          <dt className="font-medium">Find’s score now</dt>
          <dd>{pointsText(detail.findScore, find.share)} (the best of the graded answers)</dd>
        </dl>
        <div className="relative mt-4 overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="pb-1 text-left font-semibold max-sm:sticky max-sm:left-0 max-sm:max-w-[calc(100vw-4rem-2px)]">
              Every answer of this student to {find.label}, oldest first
            </caption>
            <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Attempt
                </th>
                <th scope="col" className="px-3 py-2">
                  Answer
                </th>
                <th scope="col" className="px-3 py-2">
                  Verdict
                </th>
                <th scope="col" className="px-3 py-2">
                  Score
                </th>
                <th scope="col" className="px-3 py-2">
                  Submitted
                </th>
              </tr>
            </thead>
            <tbody>
              {detail.attempts.map((t) => (
                <tr
                  key={`${t.attempt}-${t.submittedAt}`}
                  className={`border-t border-line ${t.attempt === a.attempt ? 'bg-warn-soft' : ''}`}
                >
                  <th scope="row" className="px-3 py-2 font-normal">
                    {t.attempt}
                    {t.attempt === a.attempt ? <span className="block text-xs text-muted">disputed</span> : null}
                  </th>
                  <td className="px-3 py-2">
                    <code>{t.text}</code>
                  </td>
                  <td className="px-3 py-2">{verdictText(t.verdict)}</td>
                  <td className="px-3 py-2 tabular-nums">{pointsText(t.score)}</td>
                  <td className="px-3 py-2">{fmt(t.submittedAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Section>

      <Section id="file" title="The student’s file">
        {detail.attachment ? (
          <AttachmentView
            href={attachmentHref}
            file={detail.attachment}
            alt={`The student’s worked solution, uploaded as ${detail.attachment.fileName}`}
          />
        ) : (
          <p className="text-muted">The student uploaded no file with this dispute.</p>
        )}
      </Section>

      <Section id="variant" title="The student’s variant">
        <div className="grid gap-6 lg:grid-cols-2">
          <div>
            <h3 className="font-semibold">Givens</h3>
            {detail.givens.length === 0 ? (
              <p className="text-sm text-muted">This problem draws no givens.</p>
            ) : (
              <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
                {detail.givens.map((g) => (
                  <div key={g.name} className="contents">
                    <dt>
                      <code>{g.name}</code> <span className="text-muted">{g.label}</span>
                    </dt>
                    <dd className="whitespace-nowrap">{g.text}</dd>
                  </div>
                ))}
              </dl>
            )}
          </div>
          <div className="relative self-start overflow-x-auto">
            <AnswerKeyTable
              caption="Key"
              captionClassName="text-left font-semibold"
              entries={detail.key}
              highlight={find.name}
              showNames
              showPoints
            />
          </div>
        </div>
        <h3 className="mt-6 font-semibold">The prompt as the student saw it</h3>
        {detail.promptHtml ? (
          // Rendered and sanitised on the server (Markdown + KaTeX, tags allowed by a list).
          <div
            className="prompt-html relative mt-1 overflow-x-auto leading-relaxed [overflow-wrap:anywhere] [&_p]:mt-2"
            dangerouslySetInnerHTML={{ __html: detail.promptHtml }}
          />
        ) : (
          <p className="text-sm text-muted">The prompt could not be drawn for this student.</p>
        )}
        <details className="mt-6">
          <summary className="cursor-pointer font-semibold">Worked solution</summary>
          {detail.workedHtml ? (
            <div
              className="relative mt-2 overflow-x-auto leading-relaxed"
              dangerouslySetInnerHTML={{ __html: detail.workedHtml }}
            />
          ) : (
            <p className="mt-2 text-sm text-muted">No worked solution is available for this variant.</p>
          )}
        </details>
        {detail.diagrams ? (
          <CycleDiagrams diagrams={detail.diagrams} caption={`Diagrams of ${d.student.name}’s variant`} />
        ) : null}
      </Section>

      <Section id="history" title="History">
        {detail.history.length === 0 ? (
          <p className="text-muted">Nothing has happened to this dispute since it was raised.</p>
        ) : (
          <ol className="space-y-2">
            {detail.history.map((h, i) => (
              <li key={i} className="border-l-2 border-line pl-3">
                <span className="text-sm text-muted">
                  {fmt(h.at)}
                  {h.who ? ` · ${h.who}` : ''}
                </span>
                <span className="block whitespace-pre-wrap">{h.text}</span>
              </li>
            ))}
          </ol>
        )}
      </Section>
    </>
  )
}

type AttachmentInfo = { fileName: string; contentType: string; size: number }

const TYPE_WORDS: Record<string, string> = {
  'application/pdf': 'PDF',
  'image/png': 'PNG image',
  'image/jpeg': 'JPEG image',
}

/** Why a PDF is a download: told plainly wherever one is offered. */
export const PDF_DOWNLOAD_NOTE =
  'PDF files are downloaded, not opened here, so nothing inside them runs in this site. Open it with a PDF reader you trust.'

/**
 * A dispute's file. A PDF is offered as a download only (the server sends it as one): a PDF
 * can carry scripts that a browser's viewer may run, so it is never opened inside the page.
 * An image is shown, with its name as the text alternative.
 */
export function AttachmentView({ href, file, alt }: { href: string; file: AttachmentInfo; alt: string }) {
  const kind = TYPE_WORDS[file.contentType] ?? 'File'
  if (file.contentType === 'application/pdf') {
    return (
      <div className="mt-2">
        <p>
          <a href={href} download={file.fileName}>
            Download {file.fileName}
          </a>{' '}
          <span className="text-sm text-muted">
            ({kind}, {sizeText(file.size)})
          </span>
        </p>
        <p className="mt-1 text-sm text-muted">{PDF_DOWNLOAD_NOTE}</p>
      </div>
    )
  }
  return (
    <div className="mt-2">
      <p className="text-sm text-muted">
        {file.fileName} · {kind} · {sizeText(file.size)} ·{' '}
        <a href={href} download={file.fileName}>
          Download the file
        </a>
      </p>
      <img src={href} alt={alt} className="mt-3 max-h-[48rem] max-w-full rounded border border-line" />
    </div>
  )
}

function sizeText(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`
  if (bytes < 1024 * 1024) return `${Math.round(bytes / 1024)} KB`
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`
}
