/**
 * A student disputes the verdict on one find of one problem: a reason in words and, if they
 * like, their own worked solution as a PDF or an image. The server reads the file's type from
 * its bytes; this page only keeps an oversized body from being read at all.
 */
import { useState } from 'react'
import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { cn } from '#app/lib/cn.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { forbidden, requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { DISPUTE_REASON_MAX, DISPUTE_REASON_MIN, MAX_ATTACHMENT_BYTES } from '#app/lib/dispute-limits.ts'
import { textParamProblem } from '#app/lib/query-params.ts'
import { textField, withoutNul } from '#app/lib/text-field.ts'
import { disputeAllowance, raiseDispute } from '#app/server/disputes.server.ts'
import { getStudentProblem } from '#app/server/submissions.server.ts'
import type { Route } from './+types/dispute'
import { formatScore } from '#app/lib/points.ts'
import { verdictLabel } from '#app/lib/labels.ts'
import { formText } from '#app/lib/form.ts'

export const REASON_MIN = DISPUTE_REASON_MIN
export const REASON_MAX = DISPUTE_REASON_MAX
const MAX_MB = MAX_ATTACHMENT_BYTES / 1024 / 1024
/** Room for the reason, the other fields and the multipart framing around the file. */
export const MAX_DISPUTE_BODY_BYTES = MAX_ATTACHMENT_BYTES + 64 * 1024
const FILE_ACCEPT = '.pdf,.png,.jpg,.jpeg,application/pdf,image/png,image/jpeg'
const FIND_NAME = /^[A-Za-z][A-Za-z0-9_]{0,39}$/

const STAFF_REFUSAL = 'Only the course’s students raise disputes. Staff settle them from the course’s review queue.'
const NOT_FOUND = 'There is no such question on this problem, or the problem is not open yet.'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Dispute: ${data.find.label} · ${data.assignment.title} · Cyclewright` : 'Dispute · Cyclewright' },
]

async function guard(request: Request, params: Route.LoaderArgs['params']) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  if (course.role !== 'student') forbidden(STAFF_REFUSAL)
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const position = requireIdParam(params.position, 'problem')
  return { user, course, ref: { courseId, assignmentId, position, userId: user.id } }
}

function problemPath(ref: { courseId: number; assignmentId: number; position: number }) {
  return href('/courses/:courseId/assignments/:assignmentId/problems/:position', {
    courseId: String(ref.courseId),
    assignmentId: String(ref.assignmentId),
    position: String(ref.position),
  })
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { ref } = await guard(request, params)
  const search = new URL(request.url).searchParams
  const odd = textParamProblem(search, { find: 'the question' })
  if (odd) throw data(odd.message, { status: 400 })
  const findName = search.get('find') ?? ''
  if (!FIND_NAME.test(findName)) throw data(NOT_FOUND, { status: 404 })
  const problem = await getStudentProblem(db(), ref)
  const find = problem?.results.finds.find((f) => f.name === findName)
  if (!problem || !find) throw data(NOT_FOUND, { status: 404 })
  const allowance = await disputeAllowance(db(), { ...ref, findName })
  return {
    courseId: ref.courseId,
    assignment: { id: problem.assignment.id, title: problem.assignment.title, timeZone: problem.assignment.timeZone },
    item: { position: problem.item.position, title: problem.item.title },
    find: {
      name: find.name,
      label: find.label,
      unitHint: find.unitHint,
      score: find.score,
      share: find.share,
      last: find.last,
    },
    allowance,
    back: problemPath(ref),
  }
}

const DisputeFormSchema = z.object({
  find: z.string().regex(FIND_NAME, 'Choose the question to dispute from the problem page.'),
  reason: textField('the reason')
    .trim()
    .min(REASON_MIN, `Say in at least ${REASON_MIN} characters why you think the verdict is wrong.`)
    .max(REASON_MAX, `Keep the reason to at most ${REASON_MAX} characters.`),
})

export type DisputeActionData = {
  formError: string | null
  fieldErrors: { reason?: string; file?: string; findName?: string }
  /** the reason as typed, to refill the box */
  reason: string
  /** a file was sent but not kept: a file input cannot be refilled */
  fileNotKept: string | null
}

function refuse(status: number, body: Partial<DisputeActionData> & { reason: string }) {
  return data<DisputeActionData>({ formError: null, fieldErrors: {}, fileNotKept: null, ...body }, { status })
}

export async function action({ request, params }: Route.ActionArgs) {
  const { ref } = await guard(request, params)
  // Refuse an oversized body before reading it. Browsers state the length of every form they post.
  const header = request.headers.get('content-length')
  const length = header === null ? Number.NaN : Number(header)
  if (header === null || !Number.isFinite(length) || length > MAX_DISPUTE_BODY_BYTES) {
    const reason = await salvageReason(request)
    const again = 'Your reason is kept below; choose the file again and send.'
    return header === null
      ? refuse(411, { reason, formError: `The upload did not say how large it is, so it was not read. ${again}` })
      : refuse(413, {
          reason,
          formError: `That upload is larger than ${MAX_MB} MB, so it was not read and nothing was sent. ${again}`,
          fieldErrors: { file: `The file must be at most ${MAX_MB} MB.` },
        })
  }

  let form: FormData
  try {
    form = await request.formData()
  } catch {
    return refuse(400, {
      reason: '',
      formError: 'The upload could not be read. Type your reason again, choose the file again, and send.',
    })
  }
  const typedReason = formText(form, 'reason')
  const entry = form.get('file')
  const file = entry instanceof File && entry.size > 0 ? entry : null
  const fileNotKept = file ? `Your file “${file.name}” was not kept: choose the file again before sending.` : null

  const parsed = DisputeFormSchema.safeParse({ find: form.get('find'), reason: typedReason })
  if (!parsed.success) {
    const fieldErrors: DisputeActionData['fieldErrors'] = {}
    for (const issue of parsed.error.issues) {
      if (issue.path[0] === 'reason') fieldErrors.reason ??= issue.message
      else fieldErrors.findName ??= issue.message
    }
    return refuse(400, {
      reason: withoutNul(typedReason),
      fieldErrors,
      formError: fieldErrors.findName ?? null,
      fileNotKept,
    })
  }
  if (file && file.size > MAX_ATTACHMENT_BYTES) {
    return refuse(413, {
      reason: withoutNul(typedReason),
      fieldErrors: { file: `The file must be at most ${MAX_MB} MB; “${file.name}” is larger.` },
      fileNotKept,
    })
  }

  const result = await raiseDispute(db(), {
    ...ref,
    findName: parsed.data.find,
    reason: parsed.data.reason,
    upload: file ? { fileName: file.name, bytes: new Uint8Array(await file.arrayBuffer()) } : null,
  })
  if (result.ok) return redirect(`${problemPath(ref)}?disputed=${encodeURIComponent(parsed.data.find)}`)
  return refuse(400, {
    reason: withoutNul(typedReason),
    formError: result.formError ?? result.fieldErrors.findName ?? null,
    fieldErrors: result.fieldErrors,
    fileNotKept,
  })
}

const SALVAGE_BYTES = 16 * 1024

/**
 * The reason from the first few kilobytes of a refused multipart body, so that what the
 * student typed is not lost with the file. The form puts the reason before the file, so the
 * prefix holds it whole; the platform's own parser reads the prefix once it is closed after its
 * last complete part. The rest of the body is read and dropped without being kept, as Node
 * does with any unread body, so the connection can answer.
 */
async function salvageReason(request: Request): Promise<string> {
  const type = request.headers.get('content-type') ?? ''
  const boundary = /boundary=(?:"([^"]+)"|([^\s;]+))/i.exec(type)
  const b = boundary?.[1] ?? boundary?.[2]
  if (!request.body || !b) return ''
  const encoder = new TextEncoder()
  const delimiter = encoder.encode(`\r\n--${b}`)
  const closing = encoder.encode(`\r\n--${b}--\r\n`)
  const reader = request.body.getReader()
  const chunks: Uint8Array[] = []
  let size = 0
  let reason = ''
  try {
    // Stop as soon as the reason's part is complete: the rest may not have been sent yet.
    while (size < SALVAGE_BYTES && reason === '') {
      const { done, value } = await reader.read()
      if (done) break
      chunks.push(value)
      size += value.byteLength
      const head = concat(chunks).subarray(0, SALVAGE_BYTES)
      const cut = lastIndexOf(head, delimiter)
      if (cut >= 0) reason = await reasonIn(concat([head.subarray(0, cut), closing]), type)
    }
  } catch {
    return reason
  }
  void discardRest(reader)
  return reason
}

async function reasonIn(body: Uint8Array<ArrayBuffer>, type: string): Promise<string> {
  try {
    const form = await new Response(body, { headers: { 'Content-Type': type } }).formData()
    const reason = form.get('reason')
    return typeof reason === 'string' ? withoutNul(reason).slice(0, REASON_MAX) : ''
  } catch {
    return ''
  }
}

async function discardRest(reader: ReadableStreamDefaultReader<Uint8Array>) {
  try {
    for (;;) if ((await reader.read()).done) return
  } catch {
    // The client went away; nothing to answer.
  }
}

function concat(parts: readonly Uint8Array[]): Uint8Array<ArrayBuffer> {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.byteLength, 0))
  let at = 0
  for (const p of parts) {
    out.set(p, at)
    at += p.byteLength
  }
  return out
}

function lastIndexOf(haystack: Uint8Array, needle: Uint8Array): number {
  outer: for (let i = haystack.length - needle.length; i >= 0; i--) {
    for (let j = 0; j < needle.length; j++) if (haystack[i + j] !== needle[j]) continue outer
    return i
  }
  return -1
}

export default function DisputeRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { courseId, assignment, item, find, allowance, back } = loaderData
  const busy = useNavigation().state === 'submitting'
  const [length, setLength] = useState<number | null>(null)
  const [fileError, setFileError] = useState<string | null>(null)
  const reasonError = actionData?.fieldErrors.reason
  const shownFileError = fileError ?? actionData?.fieldErrors.file ?? null
  const typedLength = length ?? actionData?.reason.length ?? 0
  const last = find.last

  return (
    <div className="max-w-3xl space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <ol className="flex flex-wrap gap-1">
          <li>
            <Link
              to={href('/courses/:courseId/assignments/:assignmentId', {
                courseId: String(courseId),
                assignmentId: String(assignment.id),
              })}
            >
              {assignment.title}
            </Link>
            <span aria-hidden="true"> › </span>
          </li>
          <li>
            <Link to={back}>
              Problem {item.position}: {item.title}
            </Link>
          </li>
        </ol>
      </nav>

      <header>
        <h1 className="text-2xl font-semibold">Dispute the verdict on “{find.label}”</h1>
        <p className="mt-2 text-sm text-muted">
          Tell the course staff why you think your answer was graded wrongly. They see your answer, your own numbers and
          the key, and you get an e-mail when they have decided.
        </p>
      </header>

      <section aria-labelledby="answer-title" className="rounded-lg border border-line bg-white p-5 shadow-sm">
        <h2 id="answer-title" className="text-lg font-semibold">
          Your answer
        </h2>
        {last === null ? (
          <p className="mt-2 text-sm">You have not answered this question yet.</p>
        ) : last.verdict === null ? (
          <p className="mt-2 text-sm">
            Your latest answer “{last.answer}” is still being graded. A dispute is about a graded answer: wait for its
            verdict.
          </p>
        ) : (
          <dl className="mt-2 grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-muted">Answer (attempt {last.attempt})</dt>
            <dd className="font-mono">
              {last.answer}{' '}
              {find.unitHint ? <span className="font-sans text-muted">(unit: {find.unitHint})</span> : null}
            </dd>
            <dt className="text-muted">Verdict</dt>
            <dd>
              <span className={cn('font-semibold', last.verdict === 'correct' ? 'text-ok' : 'text-danger')}>
                {verdictLabel(last.verdict)}
              </span>
              {last.message && last.verdict !== 'correct' ? <>: {last.message}</> : null}
            </dd>
            {last.pitfallFeedback ? (
              <>
                <dt className="text-muted">Feedback</dt>
                <dd>{last.pitfallFeedback}</dd>
              </>
            ) : null}
            <dt className="text-muted">Score for this question</dt>
            <dd>{formatScore(find.score, find.share)} points</dd>
          </dl>
        )}
      </section>

      {!allowance.allowed ? (
        <Notice tone="warn">
          <p className="font-semibold">You cannot dispute this verdict now.</p>
          <p className="mt-1">{allowance.reason}</p>
          <p className="mt-2">
            <Link to={back}>Back to the problem</Link>
          </p>
        </Notice>
      ) : (
        <>
          {allowance.until ? (
            <p className="text-sm">
              Disputes on this assignment are open until {formatInZone(allowance.until, assignment.timeZone)}.
            </p>
          ) : null}
          {actionData?.formError ? (
            <Notice tone="error">
              <p id="dispute-form-error" className="font-semibold">
                {actionData.formError}
              </p>
            </Notice>
          ) : null}
          <Form
            method="post"
            encType="multipart/form-data"
            className="space-y-5 rounded-lg border border-line bg-white p-5 shadow-sm"
            aria-label="Dispute"
            aria-describedby={actionData?.formError ? 'dispute-form-error' : undefined}
          >
            <input type="hidden" name="find" value={find.name} />
            <div className="flex flex-col gap-1">
              <label htmlFor="dispute-reason" className="text-sm font-medium">
                Why do you think the verdict is wrong?
              </label>
              {/* The reason comes before the file: a refused oversized upload still yields it from the start of the body. */}
              <textarea
                id="dispute-reason"
                name="reason"
                rows={7}
                required
                minLength={REASON_MIN}
                maxLength={REASON_MAX}
                defaultValue={actionData?.reason ?? ''}
                onChange={(e) => setLength(e.currentTarget.value.length)}
                aria-invalid={reasonError ? true : undefined}
                aria-describedby={['dispute-reason-count', reasonError ? 'dispute-reason-error' : null]
                  .filter(Boolean)
                  .join(' ')}
                className={cn(
                  'rounded-md border bg-white px-3 py-2 text-base shadow-sm',
                  reasonError ? 'border-danger' : 'border-line focus:border-accent',
                )}
              />
              <p id="dispute-reason-count" className="text-sm text-muted">
                {REASON_MIN} to {REASON_MAX} characters; {typedLength} typed.
              </p>
              {reasonError ? (
                <p id="dispute-reason-error" className="text-sm text-danger">
                  {reasonError}
                </p>
              ) : null}
            </div>

            <div className="flex flex-col gap-1">
              <label htmlFor="dispute-file" className="text-sm font-medium">
                Your worked solution (optional)
              </label>
              <input
                id="dispute-file"
                name="file"
                type="file"
                accept={FILE_ACCEPT}
                onChange={(e) => {
                  const input = e.currentTarget
                  const chosen = input.files?.[0]
                  // Checked here too so an oversized file is never posted and the reason stays in the box.
                  const message =
                    chosen && chosen.size > MAX_ATTACHMENT_BYTES
                      ? `The file must be at most ${MAX_MB} MB; “${chosen.name}” is larger.`
                      : null
                  input.setCustomValidity(message ?? '')
                  setFileError(message)
                }}
                aria-invalid={shownFileError ? true : undefined}
                aria-describedby={[
                  'dispute-file-hint',
                  shownFileError ? 'dispute-file-error' : null,
                  actionData?.fileNotKept ? 'dispute-file-again' : null,
                ]
                  .filter(Boolean)
                  .join(' ')}
                className={cn('rounded-md border px-3 py-2', shownFileError ? 'border-danger' : 'border-line')}
              />
              <p id="dispute-file-hint" className="text-sm text-muted">
                PDF, PNG or JPEG, at most {MAX_MB} MB. A PDF is offered to the staff as a download and is never opened
                inside this site, so nothing inside it runs here.
              </p>
              {shownFileError ? (
                <p id="dispute-file-error" className="text-sm text-danger">
                  {shownFileError}
                </p>
              ) : null}
              {actionData?.fileNotKept ? (
                <p id="dispute-file-again" className="text-sm text-warn">
                  {actionData.fileNotKept}
                </p>
              ) : null}
            </div>

            <div className="flex flex-wrap items-center gap-3">
              <Button type="submit" disabled={busy}>
                {busy ? 'Sending…' : 'Send dispute'}
              </Button>
              <Link to={back}>Cancel</Link>
            </div>
          </Form>
        </>
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
