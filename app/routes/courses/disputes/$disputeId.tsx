// The prompt and the worked solution carry KaTeX markup; its stylesheet goes wherever they show.
import 'katex/dist/katex.min.css'
import { data, href, Link, redirect, useActionData } from 'react-router'
import { z } from 'zod'
import { DISPUTE_STATUS_MEANING, DisputeStatusBadge, disputeOutcomeText } from '#app/components/dispute-status.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { AttachmentView, StaffView } from '#app/components/dispute/staff-view.tsx'
import { Section } from '#app/components/dispute/section.tsx'
import { pointsText, verdictText } from '#app/components/dispute/words.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { type FieldErrors, parseForm, readFormData } from '#app/lib/form.ts'
import { DISPUTE_COMMENT_MAX } from '#app/lib/dispute-limits.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { echoValues, textField } from '#app/lib/text-field.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getDisputeDetail, resolveDispute } from '#app/server/disputes.server.ts'
import { appUrl } from '#app/server/env.server.ts'
import type { Route } from './+types/$disputeId'

export const meta: Route.MetaFunction = ({ data }) => [
  {
    title: data
      ? `Dispute: ${data.dispute.findLabel}, ${data.dispute.assignmentTitle} · Cyclewright`
      : 'Dispute · Cyclewright',
  },
]

const MAX_COMMENT = DISPUTE_COMMENT_MAX

const ResolveSchema = z
  .object({
    intent: z.literal('resolve', { error: 'Use the Resolve dispute button.' }),
    decision: z.enum(['reject', 'adjust', 'accept-for-variant'], { error: 'Choose what to do with this dispute.' }),
    newScore: textField('the new score').trim().max(30, 'Enter the new score as a number, e.g. 1.5.').default(''),
    comment: textField('the comment')
      .trim()
      .max(MAX_COMMENT, `Keep the comment to at most ${MAX_COMMENT.toLocaleString('en')} characters.`)
      .default(''),
  })
  .superRefine((v, ctx) => {
    if (v.decision !== 'adjust') return
    if (v.newScore === '')
      ctx.addIssue({ code: 'custom', path: ['newScore'], message: 'Enter the new score for this find.' })
    else if (!Number.isFinite(Number(v.newScore.replace(',', '.'))))
      ctx.addIssue({ code: 'custom', path: ['newScore'], message: 'Enter the new score as a number, e.g. 1.5.' })
    if (v.comment === '')
      ctx.addIssue({
        code: 'custom',
        path: ['comment'],
        message: 'Say why the score changes: a comment is required when you adjust a score.',
      })
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
  const base = {
    courseId,
    course: { code: course.code, title: course.title },
    changed,
    dispute: detail.dispute,
    timeZone: detail.timeZone,
    find: detail.find,
  }
  if (course.role === 'student') {
    // The key, the givens and the worked solution stay on the server: a student's view of
    // their own dispute must not reveal more than their problem page does.
    return {
      ...base,
      staff: null,
      mine: {
        answer: {
          text: detail.answer.text,
          attempt: detail.answer.attempt,
          verdict: detail.answer.verdict,
          score: detail.answer.score,
          maxScore: detail.answer.maxScore,
        },
        findScore: detail.findScore,
        attachment: detail.attachment
          ? {
              fileName: detail.attachment.fileName,
              contentType: detail.attachment.contentType,
              size: detail.attachment.size,
            }
          : null,
      },
    }
  }
  const { dispute: _d, timeZone: _t, find: _f, ...staff } = detail
  return { ...base, staff, mine: null }
}

export async function action({ request, params }: Route.ActionArgs) {
  const { courseId, disputeId, actor } = await guard(request, params, ['instructor', 'ta'])
  const parsed = parseForm(await readFormData(request), ResolveSchema)
  if (!parsed.ok)
    return data(
      {
        fieldErrors: parsed.fieldErrors,
        formError: parsed.formError ?? 'Check the fields marked below.',
        values: echoValues(parsed.values),
      },
      { status: 400 },
    )
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
    const fieldErrors: FieldErrors = result.fieldErrors
    return data(
      {
        fieldErrors,
        formError: result.formError ?? 'Check the fields marked below.',
        values,
      },
      { status: 400 },
    )
  }
  return redirect(
    `${href('/courses/:courseId/disputes/:disputeId', { courseId: String(courseId), disputeId: String(disputeId) })}?resolved=${result.changed}`,
  )
}

export default function DisputeRoute({ loaderData }: Route.ComponentProps) {
  const { courseId, dispute: d, timeZone, find, changed, staff, mine } = loaderData
  const fmt = (at: string) => formatInZone(at, timeZone)
  const problemHref = href('/courses/:courseId/assignments/:assignmentId/problems/:position', {
    courseId: String(courseId),
    assignmentId: String(d.assignmentId),
    position: String(d.position),
  })
  const outcome = disputeOutcomeText(d)
  const actionData = useActionData<typeof action>()
  return (
    <div className="space-y-8">
      <div>
        <p className="text-sm text-muted">
          <Link to={href('/courses/:courseId/disputes', { courseId: String(courseId) })}>
            {staff ? 'Review queue' : 'Your disputes'}
          </Link>
        </p>
        <h1 className="mt-1 text-3xl font-semibold">
          Dispute: {find.label}{' '}
          <span className="text-xl font-normal text-muted">
            ({d.assignmentTitle}, problem {d.position})
          </span>
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
          Resolved: {changed === 0 ? 'no answers' : changed === 1 ? '1 answer' : `${changed} answers`} changed; the
          student is e-mailed.
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
          {mine.attachment ? (
            <AttachmentView
              href={href('/courses/:courseId/disputes/:disputeId/attachment', {
                courseId: String(courseId),
                disputeId: String(d.id),
              })}
              file={mine.attachment}
              alt={`Your worked solution, sent as ${mine.attachment.fileName}`}
            />
          ) : null}
          <p className="mt-3">
            <Link to={problemHref}>Back to the problem</Link>
          </p>
        </Section>
      ) : null}

      {staff ? (
        <StaffView
          courseId={courseId}
          detail={staff}
          dispute={d}
          find={find}
          fmt={fmt}
          problemHref={problemHref}
          resolveResult={actionData}
        />
      ) : null}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
