// The prompt and the worked solution carry KaTeX markup; its stylesheet goes wherever they show.
import 'katex/dist/katex.min.css'
import type { ReactNode } from 'react'
import { data, Form, href, Link, redirect, useActionData, useNavigation } from 'react-router'
import { z } from 'zod'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { DISPUTE_STATUS_MEANING, DisputeStatusBadge, disputeOutcomeText } from '#app/components/dispute-status.tsx'
import { formatPoints } from '#app/lib/points.ts'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { AnswerKeyTable } from '#app/components/answer-key-table.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { type FieldErrors, parseForm, readFormData } from '#app/lib/form.ts'
import { DISPUTE_COMMENT_MAX } from '#app/lib/dispute-limits.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { echoValues, textField } from '#app/lib/text-field.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getDisputeDetail, resolveDispute, type DisputeDetail } from '#app/server/disputes.server.ts'
import { appUrl } from '#app/server/env.server.ts'
import type { Route } from './+types/$disputeId'
import { SUBMISSION_STATUS_LABELS, verdictLabel } from '#app/lib/labels.ts'

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Dispute: ${data.dispute.findLabel}, ${data.dispute.assignmentTitle} · Cyclewright` : 'Dispute · Cyclewright' }]

const MAX_COMMENT = DISPUTE_COMMENT_MAX

const ResolveSchema = z
  .object({
    intent: z.literal('resolve', { error: 'Use the Resolve dispute button.' }),
    decision: z.enum(['reject', 'adjust', 'accept-for-variant'], { error: 'Choose what to do with this dispute.' }),
    newScore: textField('the new score').trim().max(30, 'Enter the new score as a number, e.g. 1.5.').default(''),
    comment: textField('the comment').trim().max(MAX_COMMENT, `Keep the comment to at most ${MAX_COMMENT.toLocaleString('en')} characters.`).default(''),
  })
  .superRefine((v, ctx) => {
    if (v.decision !== 'adjust') return
    if (v.newScore === '') ctx.addIssue({ code: 'custom', path: ['newScore'], message: 'Enter the new score for this find.' })
    else if (!Number.isFinite(Number(v.newScore.replace(',', '.')))) ctx.addIssue({ code: 'custom', path: ['newScore'], message: 'Enter the new score as a number, e.g. 1.5.' })
    if (v.comment === '') ctx.addIssue({ code: 'custom', path: ['comment'], message: 'Say why the score changes: a comment is required when you adjust a score.' })
  })

async function guard(request: Request, params: Route.LoaderArgs['params'], roles: ('instructor' | 'ta' | 'student')[]) {
  const courseId = requireIdParam(params.courseId, 'course')
  const disputeId = requireIdParam(params.disputeId, 'dispute')
  const { user, course } = await requireCourseRole(request, courseId, roles)
  return { courseId, disputeId, course, actor: { id: user.id, isAdmin: user.isAdmin, role: course.role } }
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { courseId, disputeId, course, actor } = await guard(request, params, ['instructor', 'ta', 'student'])
  const detail = await getDisputeDetail(db(), { courseId, disputeId, viewer: actor })
  if (!detail) throw data('There is no such dispute.', { status: 404 })
  const resolved = new URL(request.url).searchParams.get('resolved')
  const changed = resolved !== null && /^\d{1,6}$/.test(resolved) ? Number(resolved) : null
  const base = { courseId, course: { code: course.code, title: course.title }, changed, dispute: detail.dispute, timeZone: detail.timeZone, find: detail.find }
  if (course.role === 'student') {
    // The key, the givens and the worked solution stay on the server: a student's view of
    // their own dispute must not reveal more than their problem page does.
    return {
      ...base,
      staff: null,
      mine: {
        answer: { text: detail.answer.text, attempt: detail.answer.attempt, verdict: detail.answer.verdict, score: detail.answer.score, maxScore: detail.answer.maxScore },
        findScore: detail.findScore,
        attachment: detail.attachment ? { fileName: detail.attachment.fileName, contentType: detail.attachment.contentType, size: detail.attachment.size } : null,
      },
    }
  }
  const { dispute: _d, timeZone: _t, find: _f, ...staff } = detail
  return { ...base, staff, mine: null }
}

export async function action({ request, params }: Route.ActionArgs) {
  const { courseId, disputeId, actor } = await guard(request, params, ['instructor', 'ta'])
  const parsed = parseForm(await readFormData(request), ResolveSchema)
  if (!parsed.ok) return data({ fieldErrors: parsed.fieldErrors, formError: parsed.formError ?? 'Check the fields marked below.', values: echoValues(parsed.values) }, { status: 400 })
  const v = parsed.value
  const result = await resolveDispute(db(), {
    courseId,
    disputeId,
    actor,
    decision: v.decision,
    newScore: v.decision === 'adjust' ? Number(v.newScore.replace(',', '.')) : undefined,
    comment: v.comment,
    baseUrl: appUrl(),
  })
  if (!result.ok) {
    const values = { decision: v.decision, newScore: v.newScore, comment: v.comment }
    return data({ fieldErrors: result.fieldErrors as FieldErrors, formError: result.formError ?? 'Check the fields marked below.', values }, { status: 400 })
  }
  return redirect(`/courses/${courseId}/disputes/${disputeId}?resolved=${result.changed}`)
}

function verdictText(verdict: string | null): string {
  return verdict === null ? SUBMISSION_STATUS_LABELS.queued : verdictLabel(verdict)
}

function pointsText(n: number | null, max?: number): string {
  if (n === null) return '—'
  return max === undefined ? `${formatPoints(n)} ${n === 1 ? 'point' : 'points'}` : `${formatPoints(n)} of ${formatPoints(max)}`
}

export default function DisputeRoute({ loaderData }: Route.ComponentProps) {
  const { courseId, course, dispute: d, timeZone, find, changed, staff, mine } = loaderData
  const fmt = (at: string) => formatInZone(at, timeZone)
  const problemHref = href('/courses/:courseId/assignments/:assignmentId/problems/:position', { courseId: String(courseId), assignmentId: String(d.assignmentId), position: String(d.position) })
  const outcome = disputeOutcomeText(d)
  const actionData = useActionData<typeof action>()
  return (
    <div className="space-y-8">
      <div>
        <p className="text-sm text-muted">
          <Link to={href('/courses/:courseId/disputes', { courseId: String(courseId) })}>{staff ? 'Review queue' : 'Your disputes'}</Link>
        </p>
        <h1 className="mt-1 text-3xl font-semibold">
          Dispute: {find.label} <span className="text-xl font-normal text-muted">({d.assignmentTitle}, problem {d.position})</span>
        </h1>
        <p className="mt-2 flex flex-wrap items-center gap-2">
          <DisputeStatusBadge status={d.status} />
          <span className="text-muted">
            Raised {fmt(d.createdAt)}
            {staff ? ` by ${d.student.name} (${d.student.email})` : ''}
          </span>
        </p>
      </div>

      {changed !== null ? (
        <Notice tone="ok">
          Resolved: {changed === 0 ? 'no answers' : changed === 1 ? '1 answer' : `${changed} answers`} changed; the student is e-mailed.
        </Notice>
      ) : null}

      {actionData?.formError && d.status !== 'open' ? <Notice tone="error">{actionData.formError}</Notice> : null}

      <Section id="reason" title={staff ? 'The student’s reason' : 'Your reason'}>
        <p className="whitespace-pre-wrap">{d.reason}</p>
      </Section>

      {d.status !== 'open' || mine ? (
        <Section id="outcome" title="Outcome">
          <p>{DISPUTE_STATUS_MEANING[d.status]}</p>
          <dl className="mt-3 grid gap-2 sm:grid-cols-[12rem_1fr]">
            {outcome ? (
              <>
                <dt className="font-medium">Score of this find</dt>
                <dd>{outcome}</dd>
              </>
            ) : null}
            {d.resolvedAt ? (
              <>
                <dt className="font-medium">Resolved</dt>
                <dd>
                  {fmt(d.resolvedAt)}
                  {d.resolvedBy ? ` by ${d.resolvedBy}` : ''}
                </dd>
              </>
            ) : null}
            {d.comment ? (
              <>
                <dt className="font-medium">Comment</dt>
                <dd className="whitespace-pre-wrap">{d.comment}</dd>
              </>
            ) : null}
          </dl>
        </Section>
      ) : null}

      {mine ? (
        <Section id="answer" title="The answer you disputed">
          <dl className="grid gap-2 sm:grid-cols-[12rem_1fr]">
            <dt className="font-medium">Your answer</dt>
            <dd>
              <code>{mine.answer.text}</code> (attempt {mine.answer.attempt})
            </dd>
            <dt className="font-medium">Verdict</dt>
            <dd>
              {verdictText(mine.answer.verdict)}, {pointsText(mine.answer.score, mine.answer.maxScore)}
            </dd>
            <dt className="font-medium">Your score for this find now</dt>
            <dd>{pointsText(mine.findScore, find.share)}</dd>
            <dt className="font-medium">Your file</dt>
            <dd>{mine.attachment ? null : 'None sent'}</dd>
          </dl>
          {mine.attachment ? <AttachmentView href={href('/courses/:courseId/disputes/:disputeId/attachment', { courseId: String(courseId), disputeId: String(d.id) })} file={mine.attachment} alt={`Your worked solution, sent as ${mine.attachment.fileName}`} /> : null}
          <p className="mt-3">
            <Link to={problemHref}>Back to the problem</Link>
          </p>
        </Section>
      ) : null}

      {staff ? <StaffView courseId={courseId} detail={staff} dispute={d} find={find} fmt={fmt} problemHref={problemHref} /> : null}
    </div>
  )
}

type StaffDetail = Omit<DisputeDetail, 'dispute' | 'timeZone' | 'find'>

function StaffView({
  courseId,
  detail,
  dispute: d,
  find,
  fmt,
  problemHref,
}: {
  courseId: number
  detail: StaffDetail
  dispute: DisputeDetail['dispute']
  find: DisputeDetail['find']
  fmt: (at: string) => string
  problemHref: string
}) {
  const a = detail.answer
  const attachmentHref = href('/courses/:courseId/disputes/:disputeId/attachment', { courseId: String(courseId), disputeId: String(d.id) })
  return (
    <>
      {d.status === 'open' ? <ResolveForm detail={detail} find={find} /> : null}

      <Section id="answer" title="The disputed answer">
        <dl className="grid gap-2 sm:grid-cols-[12rem_1fr]">
          <dt className="font-medium">Student</dt>
          <dd className="[overflow-wrap:anywhere]">
            {d.student.name} <span className="text-muted">({d.student.email})</span>
          </dd>
          <dt className="font-medium">Where</dt>
          <dd>
            {d.assignmentTitle}, <Link to={problemHref}>problem {d.position}: {d.problemTitle}</Link>, find {find.label} (<code>{find.name}</code>, {find.unit || 'pure number'}, worth {formatPoints(find.share)} points)
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
            <caption className="pb-1 text-left font-semibold max-sm:sticky max-sm:left-0 max-sm:max-w-[calc(100vw-4rem-2px)]">Every answer of this student to {find.label}, oldest first</caption>
            <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-3 py-2">Attempt</th>
                <th scope="col" className="px-3 py-2">Answer</th>
                <th scope="col" className="px-3 py-2">Verdict</th>
                <th scope="col" className="px-3 py-2">Score</th>
                <th scope="col" className="px-3 py-2">Submitted</th>
              </tr>
            </thead>
            <tbody>
              {detail.attempts.map((t) => (
                <tr key={`${t.attempt}-${t.submittedAt}`} className={`border-t border-line ${t.attempt === a.attempt ? 'bg-warn-soft' : ''}`}>
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
          <AttachmentView href={attachmentHref} file={detail.attachment} alt={`The student’s worked solution, uploaded as ${detail.attachment.fileName}`} />
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
            <AnswerKeyTable caption="Key" captionClassName="text-left font-semibold" entries={detail.key} highlight={find.name} showNames showPoints />
          </div>
        </div>
        <h3 className="mt-6 font-semibold">The prompt as the student saw it</h3>
        {detail.promptHtml ? (
          // Rendered and sanitised on the server (Markdown + KaTeX, tags allowed by a list).
          <div className="prompt-html relative mt-1 overflow-x-auto leading-relaxed [overflow-wrap:anywhere] [&_p]:mt-2" dangerouslySetInnerHTML={{ __html: detail.promptHtml }} />
        ) : (
          <p className="text-sm text-muted">The prompt could not be drawn for this student.</p>
        )}
        <details className="mt-6">
          <summary className="cursor-pointer font-semibold">Worked solution</summary>
          {detail.workedHtml ? (
            <div className="relative mt-2 overflow-x-auto leading-relaxed" dangerouslySetInnerHTML={{ __html: detail.workedHtml }} />
          ) : (
            <p className="mt-2 text-sm text-muted">No worked solution is available for this variant.</p>
          )}
        </details>
        {detail.diagrams ? <CycleDiagrams diagrams={detail.diagrams} caption={`P–v and T–s diagrams of ${d.student.name}’s variant`} /> : null}
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

const TYPE_WORDS: Record<string, string> = { 'application/pdf': 'PDF', 'image/png': 'PNG image', 'image/jpeg': 'JPEG image' }

/** Why a PDF is a download: told plainly wherever one is offered. */
export const PDF_DOWNLOAD_NOTE = 'PDF files are downloaded, not opened here, so nothing inside them runs in this site. Open it with a PDF reader you trust.'

/**
 * A dispute's file. A PDF is offered as a download only (the server sends it as one): a PDF
 * can carry scripts that a browser's viewer may run, so it is never opened inside the page.
 * An image is shown, with its name as the text alternative.
 */
function AttachmentView({ href, file, alt }: { href: string; file: AttachmentInfo; alt: string }) {
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

function ResolveForm({ detail, find }: { detail: StaffDetail; find: DisputeDetail['find'] }) {
  const actionData = useActionData<typeof action>()
  const navigation = useNavigation()
  const busy = navigation.state === 'submitting'
  const errors: FieldErrors = actionData?.fieldErrors ?? {}
  const values: Record<string, string> = actionData?.values ?? {}
  const described = (key: string, hint?: string) => [hint, errors[key] ? `resolve-${key}-error` : null].filter(Boolean).join(' ') || undefined
  const errorText = (key: string) =>
    errors[key] ? (
      <p id={`resolve-${key}-error`} className="text-sm text-danger">
        {errors[key]}
      </p>
    ) : null
  const others = detail.sameAnswerOnVariant
  return (
    <section aria-labelledby="resolve-title" className="rounded-lg border-2 border-accent/40 bg-white p-4 shadow-sm sm:p-6">
      <h2 id="resolve-title" className="text-xl font-semibold">
        Resolve this dispute
      </h2>
      {actionData?.formError ? (
        <Notice tone="error" className="mt-3">
          {actionData.formError}
        </Notice>
      ) : null}
      <Form method="post" className="mt-4 grid gap-5" noValidate>
        <fieldset aria-describedby={described('decision')} className="grid gap-3">
          <legend className="font-medium">Decision</legend>
          <label className="flex items-start gap-2">
            <input type="radio" name="decision" value="reject" defaultChecked={values.decision === 'reject'} className="mt-1" />
            <span>Keep the score — reject the dispute.</span>
          </label>
          <div className="flex items-start gap-2">
            <input id="resolve-adjust" type="radio" name="decision" value="adjust" defaultChecked={values.decision === 'adjust'} className="mt-1" />
            <span className="grid min-w-0 gap-1">
              <label htmlFor="resolve-adjust">Adjust this find’s score</label>
              <span className="flex flex-wrap items-center gap-2">
                <label htmlFor="resolve-newScore" className="text-sm">
                  New score
                </label>
                <input
                  id="resolve-newScore"
                  name="newScore"
                  type="number"
                  inputMode="decimal"
                  min={0}
                  max={find.share}
                  step="any"
                  defaultValue={values.newScore ?? ''}
                  aria-invalid={errors.newScore ? true : undefined}
                  aria-describedby={described('newScore', 'resolve-newScore-hint')}
                  className={`w-24 rounded-md border bg-white px-2 py-1 ${errors.newScore ? 'border-danger' : 'border-line'}`}
                />
                <span id="resolve-newScore-hint" className="text-sm text-muted">
                  points, from 0 to {formatPoints(find.share)} (now {formatPoints(detail.findScore)})
                </span>
              </span>
              {errorText('newScore')}
            </span>
          </div>
          <label className="flex items-start gap-2">
            <input type="radio" name="decision" value="accept-for-variant" defaultChecked={values.decision === 'accept-for-variant'} className="mt-1" />
            <span>
              Accept this answer for every student who gave it on the same variant{' '}
              <span className="text-muted">
                (this student{others === 0 ? ' only' : ` and ${others} ${others === 1 ? 'other' : 'others'}`}).
              </span>
            </span>
          </label>
          {errorText('decision')}
        </fieldset>
        <div className="grid gap-1">
          <label htmlFor="resolve-comment" className="font-medium">
            Comment to the student
          </label>
          <textarea
            id="resolve-comment"
            name="comment"
            rows={4}
            maxLength={MAX_COMMENT}
            defaultValue={values.comment ?? ''}
            aria-invalid={errors.comment ? true : undefined}
            aria-describedby={described('comment', 'resolve-comment-hint')}
            className={`rounded-md border bg-white px-3 py-2 ${errors.comment ? 'border-danger' : 'border-line'}`}
          />
          <p id="resolve-comment-hint" className="text-sm text-muted">
            Required when you adjust the score; optional otherwise. The student reads it in the e-mail and on the problem page, and it is kept in the audit log.
          </p>
          {errorText('comment')}
        </div>
        <div>
          <Button type="submit" name="intent" value="resolve" disabled={busy}>
            {busy ? 'Resolving…' : 'Resolve dispute'}
          </Button>
        </div>
      </Form>
    </section>
  )
}

function Section({ id, title, children }: { id: string; title: string; children: ReactNode }) {
  return (
    <section aria-labelledby={`${id}-title`} className="rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6">
      <h2 id={`${id}-title`} className="mb-3 text-xl font-semibold">
        {title}
      </h2>
      {children}
    </section>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
