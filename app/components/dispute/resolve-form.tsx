import { Form, useNavigation } from 'react-router'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { DISPUTE_COMMENT_MAX as MAX_COMMENT } from '#app/lib/dispute-limits.ts'
import type { FieldErrors } from '#app/lib/form.ts'
import { formatPoints } from '#app/lib/points.ts'
import type { DisputeDetail } from '#app/server/disputes.server.ts'
import type { StaffDetail } from './staff-view.tsx'

/** What the resolve action answered when it refused the form: the messages and what was typed. */
export interface ResolveResult {
  readonly fieldErrors?: FieldErrors
  readonly formError?: string
  readonly values?: Record<string, string>
}

/**
 * The TA's decision on an open dispute: keep the score, adjust it (with a required comment), or
 * accept the same answer for every student with the same givens. Works without JavaScript.
 */
export function ResolveForm({
  detail,
  find,
  result,
}: {
  detail: StaffDetail
  find: DisputeDetail['find']
  result?: ResolveResult
}) {
  const actionData = result
  const navigation = useNavigation()
  const busy = navigation.state === 'submitting'
  const errors: FieldErrors = actionData?.fieldErrors ?? {}
  const values: Record<string, string> = actionData?.values ?? {}
  const described = (key: string, hint?: string) =>
    [hint, errors[key] ? `resolve-${key}-error` : null].filter(Boolean).join(' ') || undefined
  const errorText = (key: string) =>
    errors[key] ? (
      <p id={`resolve-${key}-error`} className="text-sm text-danger">
        {errors[key]}
      </p>
    ) : null
  const others = detail.sameAnswerOnVariant
  return (
    <section
      aria-labelledby="resolve-title"
      className="rounded-lg border-2 border-accent/40 bg-white p-4 shadow-sm sm:p-6"
    >
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
            <input
              type="radio"
              name="decision"
              value="reject"
              defaultChecked={values.decision === 'reject'}
              className="mt-1"
            />
            <span>Keep the score — reject the dispute.</span>
          </label>
          <div className="flex items-start gap-2">
            <input
              id="resolve-adjust"
              type="radio"
              name="decision"
              value="adjust"
              defaultChecked={values.decision === 'adjust'}
              className="mt-1"
            />
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
            <input
              type="radio"
              name="decision"
              value="accept-for-variant"
              defaultChecked={values.decision === 'accept-for-variant'}
              className="mt-1"
            />
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
            Required when you adjust the score; optional otherwise. The student reads it in the e-mail and on the
            problem page, and it is kept in the audit log.
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
