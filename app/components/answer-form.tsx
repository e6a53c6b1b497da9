/**
 * A student's answers to one problem: one labelled input per find with its unit, and beside
 * each find where it stands (attempts, the last verdict with its feedback, grading in
 * progress). A real form that posts without JavaScript; the page passes a fetcher's Form so
 * that with JavaScript it submits in place.
 *
 * Inputs are uncontrolled with stable keys, so what the student typed stays in the box while
 * results arrive around it; the server's values (after a refused post without JavaScript)
 * come in as the default values.
 */
import { useEffect, useRef } from 'react'
import { Link, type FetcherWithComponents } from 'react-router'
import { Button } from '#app/components/ui/button.tsx'
import { cn } from '#app/lib/cn.ts'
import { formatInZone } from '#app/lib/dates.ts'
import {
  DISPUTE_STATUS_LABELS,
  SUBMISSION_STATUS_LABELS,
  TONE_TEXT,
  VERDICT_LABELS,
  VERDICT_TONES,
} from '#app/lib/labels.ts'
import { formatPoints } from '#app/lib/points.ts'
import type { MyDispute } from '#app/server/disputes.server.ts'
import type { FindView } from '#app/server/submissions.server.ts'

/** The form field that carries a find's answer. */
export function answerField(findName: string): string {
  return `answer.${findName}`
}

function inputId(findName: string): string {
  return `answer-${findName}`
}

export type AnswerFormMode =
  /** the student may submit */
  | 'submit'
  /** the window is closed (or not open): shown, not submittable */
  | 'closed'
  /** staff previewing their own variant: nothing is recorded */
  | 'preview'

type FormComponent = FetcherWithComponents<unknown>['Form']

/** The student's own disputes on this problem and where to raise one; absent in staff preview. */
export type AnswerFormDisputes = {
  /** newest first per find */
  list: readonly MyDispute[]
  /** per find: whether it may be disputed now (the server's rule), and why not */
  offers?: Readonly<Record<string, { allowed: boolean; reason?: string; code?: string }>>
  timeZone: string
  href: (findName: string) => string
}

export function AnswerForm({
  finds,
  values,
  fieldErrors,
  formError,
  mode,
  action,
  formToken = null,
  Form,
  busy,
  inPlace,
  disputes = null,
}: {
  finds: readonly FindView[]
  /** what to put in each input (the last typed, or what the server sent back) */
  values: Readonly<Record<string, string>>
  fieldErrors: Readonly<Record<string, string>>
  formError: string | null
  mode: AnswerFormMode
  action: string
  /** this rendering's one-time token: the server stores a press with it once */
  formToken?: string | null
  Form: FormComponent
  busy: boolean
  /** JavaScript is running: ask the action to answer with data instead of a redirect */
  inPlace: boolean
  disputes?: AnswerFormDisputes | null
}) {
  const summaryRef = useRef<HTMLDivElement>(null)
  const errorNames = finds.filter((f) => fieldErrors[f.name]).map((f) => f.name)
  const hasErrors = formError !== null || errorNames.length > 0
  const errorKey = `${formError ?? ''}|${errorNames.map((n) => `${n}:${fieldErrors[n]}`).join('|')}`

  // A refused submission made in place leaves focus on the button; move it to the summary
  // so keyboard and screen-reader users land on what went wrong (a full page load does this
  // through the alert role alone).
  useEffect(() => {
    if (hasErrors && inPlace) summaryRef.current?.focus()
  }, [errorKey, hasErrors, inPlace])

  const fields = (
    <>
      {hasErrors ? (
        <div
          ref={summaryRef}
          tabIndex={-1}
          role="alert"
          className="rounded-md border border-danger/30 bg-danger-soft px-4 py-3 text-sm text-danger"
        >
          {formError ? (
            <p className="font-semibold">{formError}</p>
          ) : (
            <p className="font-semibold">Some answers were not submitted. They did not use an attempt.</p>
          )}
          {errorNames.length > 0 ? (
            <ul className="mt-1 list-disc pl-5">
              {errorNames.map((n) => (
                <li key={n}>
                  <a href={`#${inputId(n)}`} className="text-danger underline">
                    {finds.find((f) => f.name === n)?.label ?? n}
                  </a>
                  : {fieldErrors[n]}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      <ol className="space-y-4">
        {finds.map((f, i) => (
          <li key={f.name}>
            <FindRow
              find={f}
              index={i + 1}
              value={values[f.name] ?? ''}
              error={fieldErrors[f.name]}
              mode={mode}
              disputes={disputes}
            />
          </li>
        ))}
      </ol>
    </>
  )

  if (mode === 'preview') {
    return (
      <div className="space-y-4" aria-label="Answers (preview)" role="group">
        {fields}
      </div>
    )
  }

  const open = finds.some((f) => f.state !== 'correct' && f.state !== 'out-of-attempts')
  return (
    <Form method="post" action={action} noValidate className="space-y-4" aria-label="Your answers">
      {inPlace ? <input type="hidden" name="inPlace" value="1" /> : null}
      {formToken ? <input type="hidden" name="formToken" value={formToken} /> : null}
      {fields}
      {mode === 'submit' && open ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={busy}>
            {busy ? 'Submitting…' : 'Submit answers'}
          </Button>
          <p className="text-sm text-muted">Blank questions are not submitted and use no attempt.</p>
        </div>
      ) : null}
      {mode === 'submit' && !open ? (
        <p className="text-sm text-muted">
          Every question is answered correctly or out of attempts: nothing more to submit here.
        </p>
      ) : null}
    </Form>
  )
}

function FindRow({
  find: f,
  index,
  value,
  error,
  mode,
  disputes,
}: {
  find: FindView
  index: number
  value: string
  error: string | undefined
  mode: AnswerFormMode
  disputes: AnswerFormDisputes | null
}) {
  const id = inputId(f.name)
  const unitId = `${id}-unit`
  const statusId = `${id}-status`
  const errorId = `${id}-error`
  const locked = f.state === 'correct' || f.state === 'out-of-attempts'
  const editable = mode === 'submit' && !locked
  const shown = locked ? (f.last?.answer ?? value) : value
  const left = Math.max(0, f.attemptsAllowed - f.attemptsUsed)
  return (
    <div
      className={cn(
        'rounded-md border bg-white p-3',
        error ? 'border-danger' : f.state === 'correct' ? 'border-ok/40' : 'border-line',
      )}
      data-find={f.name}
      data-state={f.state}
    >
      <label htmlFor={id} className="block font-medium text-ink">
        <span className="text-muted">{index}. </span>
        {f.label}
      </label>
      <div className="mt-1 flex flex-wrap items-center gap-2">
        <input
          id={id}
          // A locked find has no name: its answer is already final and is not posted again.
          name={editable ? answerField(f.name) : undefined}
          type="text"
          inputMode="text"
          autoComplete="off"
          autoCapitalize="off"
          spellCheck={false}
          // The server's MAX_ANSWER_LENGTH; the server refuses longer text with a message anyway.
          maxLength={500}
          defaultValue={shown}
          readOnly={!editable}
          aria-invalid={error ? true : undefined}
          aria-describedby={[unitId, error ? errorId : null, statusId].filter(Boolean).join(' ')}
          className={cn(
            'w-56 rounded-md border px-3 py-2 font-mono text-base shadow-sm',
            editable ? 'bg-white' : 'bg-paper text-muted',
            error ? 'border-danger' : 'border-line focus:border-accent',
          )}
        />
        <span id={unitId} className="text-sm text-muted">
          {f.unitHint ? (
            <>
              <span className="sr-only">Unit: </span>
              {f.unitHint}
            </>
          ) : (
            'a number without a unit'
          )}
        </span>
      </div>
      {error ? (
        <p id={errorId} className="mt-1 text-sm text-danger">
          {error}
        </p>
      ) : null}
      <div id={statusId} className="mt-1 space-y-0.5 text-sm" aria-live="polite">
        <p className="text-muted">
          {f.attemptsUsed === 0
            ? `No attempts yet; ${f.attemptsAllowed} allowed.`
            : `Attempt ${f.last?.attempt ?? f.attemptsUsed} of ${f.attemptsAllowed}${f.state === 'correct' ? '' : `; ${left} left`}.`}
        </p>
        <LastVerdict find={f} />
        {f.state === 'out-of-attempts' ? (
          <p className="font-medium text-danger">You have used all {f.attemptsAllowed} attempts for this question.</p>
        ) : null}
        {disputes ? <DisputeState find={f} disputes={disputes} /> : null}
      </div>
    </div>
  )
}

function LastVerdict({ find: f }: { find: FindView }) {
  const last = f.last
  if (!last) return null
  if (last.verdict === null) {
    if (last.gradingFailed)
      return (
        <p className="text-danger">
          Your answer “{last.answer}” could not be graded. It is stored, and your teacher sees it among the answers to
          this problem; please tell them.
        </p>
      )
    return <p className="font-medium text-accent-strong">{SUBMISSION_STATUS_LABELS.queued}…</p>
  }
  return (
    <>
      <p>
        <span className={cn('font-semibold', TONE_TEXT[VERDICT_TONES[last.verdict]])}>
          {VERDICT_LABELS[last.verdict]}
        </span>
        {last.verdict === 'correct' ? null : <> — your answer “{last.answer}”</>}
        {last.message && last.verdict !== 'correct' ? <>: {last.message}</> : null}
      </p>
      {last.pitfallFeedback ? <p className="rounded bg-warn-soft px-2 py-1 text-warn">{last.pitfallFeedback}</p> : null}
    </>
  )
}

function withComment(text: string, comment: string | null) {
  return comment ? `${text} — ${comment}` : text
}

/** The outcome of a resolved dispute, in words. */
export function disputeOutcome(d: MyDispute): string {
  switch (d.status) {
    case 'upheld':
      return withComment(`${DISPUTE_STATUS_LABELS.upheld}: your answer counts as correct`, d.comment)
    case 'adjusted': {
      const from = d.scoreBefore === null ? '?' : formatPoints(d.scoreBefore)
      const to = d.scoreAfter === null ? '?' : formatPoints(d.scoreAfter)
      return withComment(`${DISPUTE_STATUS_LABELS.adjusted}: from ${from} to ${to}`, d.comment)
    }
    case 'rejected':
      return withComment(
        `${DISPUTE_STATUS_LABELS.rejected}${d.scoreAfter === null ? '' : ` at ${formatPoints(d.scoreAfter)}`}`,
        d.comment,
      )
    case 'open':
      return DISPUTE_STATUS_LABELS.open
  }
}

/**
 * Where the student's latest dispute on this find stands, and the way to raise one when the
 * server's rule (`offers`, from disputeWindow) allows it; otherwise the reason, in a sentence.
 */
function DisputeState({ find: f, disputes }: { find: FindView; disputes: AnswerFormDisputes }) {
  const latest = disputes.list.find((d) => d.findName === f.name)
  const graded = f.last !== null && f.last.verdict !== null
  const open = latest?.status === 'open'
  const offer = disputes.offers?.[f.name]
  return (
    <>
      {latest ? (
        <p
          className={cn('rounded px-2 py-1', open ? 'bg-accent-soft text-accent-strong' : 'bg-paper text-ink')}
          data-dispute={latest.status}
        >
          {open ? (
            <>Dispute open since {formatInZone(latest.createdAt, disputes.timeZone)}.</>
          ) : (
            <>
              <span className="font-semibold">
                Dispute{' '}
                {latest.resolvedAt ? `resolved ${formatInZone(latest.resolvedAt, disputes.timeZone)}` : 'resolved'}.
              </span>{' '}
              {disputeOutcome(latest)}
            </>
          )}
        </p>
      ) : null}
      {graded && !open && (offer ? offer.allowed : true) ? (
        <p>
          <Link to={disputes.href(f.name)} className="text-accent underline">
            Dispute this verdict<span className="sr-only"> on {f.label}</span>
          </Link>
        </p>
      ) : null}
      {graded && !open && offer && !offer.allowed && offer.code !== 'full-points' && offer.code !== 'not-graded' ? (
        <p className="text-muted" data-dispute-refused={offer.code}>
          {offer.reason}
        </p>
      ) : null}
    </>
  )
}
