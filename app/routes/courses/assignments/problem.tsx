// The prompt and the worked solution carry KaTeX markup; its stylesheet goes wherever they show.
import 'katex/dist/katex.min.css'
import { useQuery, useQueryClient } from '@tanstack/react-query'
import { useEffect, useMemo, useState } from 'react'
import { data, href, Link, redirect, useFetcher } from 'react-router'
import { z } from 'zod'
import { AnswerForm, type AnswerFormMode } from '#app/components/answer-form.tsx'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { isRecord, readJson } from '#app/lib/guards.ts'
import { ReceiptBox, ReceiptList } from '#app/components/receipt.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { AnswerKeyTable } from '#app/components/answer-key-table.tsx'
import { windowMessage } from '#app/domain/assignments/policy.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { forbidden, requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { disputeOffers, listMyDisputes } from '#app/server/disputes.server.ts'
import { DROPPED_SUBMIT_MESSAGE } from '#app/lib/dropped.ts'
import { droppedFrom } from '#app/server/membership-state.server.ts'
import { notOpenSentence, notYetOpen } from '#app/server/assignment-access.server.ts'
import {
  FORM_TOKEN_PATTERN,
  getStudentProblem,
  newFormToken,
  submitAnswers,
  type MyResults,
  type Receipt,
} from '#app/server/submissions.server.ts'
import type { Route } from './+types/problem'
import { formatScore } from '#app/lib/points.ts'
import { readFormData } from '#app/lib/form.ts'

const NOT_FOUND = 'There is no such problem, or it is not open yet.'

export const meta: Route.MetaFunction = ({ data }) => [
  {
    title: data
      ? data.notOpen
        ? `${data.notOpen.title} · Cyclewright`
        : `${data.problem.item.title} · ${data.problem.assignment.title} · Cyclewright`
      : 'Problem · Cyclewright',
  },
]

async function guard(request: Request, params: Route.LoaderArgs['params']) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const position = requireIdParam(params.position, 'problem')
  return { user, course, ref: { courseId, assignmentId, position, userId: user.id } }
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { course, ref } = await guard(request, params)
  const staff = course.role !== 'student'
  const receiptParam = new URL(request.url).searchParams.get('receipt')
  const receiptId = !staff && receiptParam && /^\d{1,9}$/.test(receiptParam) ? Number(receiptParam) : null
  // Staff see their own variant with its key, before it opens too; nothing they do is recorded.
  const problem = await getStudentProblem(
    db(),
    staff ? { ...ref, showKey: true, allowBeforeOpen: true } : { ...ref, receiptId },
  )
  if (!problem) {
    // Not open yet: say when, rather than that it does not exist.
    const opening = staff ? null : await notYetOpen(db(), ref)
    if (opening)
      return {
        notOpen: {
          title: opening.title,
          message: notOpenSentence(opening),
          back: href('/courses/:courseId/assignments/:assignmentId', {
            courseId: String(course.id),
            assignmentId: String(ref.assignmentId),
          }),
        },
      }
    throw data(NOT_FOUND, { status: 404 })
  }
  // Staff preview their own variant: they have no disputes of their own here.
  const disputes = staff ? [] : await listMyDisputes(db(), { itemId: problem.item.id, userId: ref.userId })
  // Which questions may be disputed now: the same rule the dispute page and raiseDispute apply.
  const offers = staff ? {} : await disputeOffers(db(), ref)
  // A dropped student reads their past work; the form is closed and says why.
  const dropped = !staff && (await droppedFrom(db(), ref.userId, ref.courseId)) !== null
  const disputedParam = new URL(request.url).searchParams.get('disputed')
  const disputed =
    !staff && disputedParam && problem.results.finds.some((f) => f.name === disputedParam) ? disputedParam : null
  // Each rendered form gets its own one-time token: posting it again (a reload, a double click) stores nothing new.
  const formToken = staff ? null : newFormToken()
  return {
    notOpen: null,
    course: { id: course.id, code: course.code, title: course.title },
    staff,
    problem,
    receiptId,
    disputes,
    offers,
    dropped,
    disputed,
    formToken,
  }
}

/** Longest text read per answer field; the server refuses anything over its own limit with a message. */
const MAX_TYPED = 2000
const MAX_FIELDS = 100
const ANSWER_PREFIX = 'answer.'

const SubmitFormSchema = z.object({
  inPlace: z.literal('1').optional().catch(undefined),
  // A malformed token is treated as none (a fresh press), never as an error.
  formToken: z.string().regex(FORM_TOKEN_PATTERN).optional().catch(undefined),
  answers: z.record(
    z.string().regex(/^[A-Za-z][A-Za-z0-9_]{0,39}$/),
    z.string().transform((s) => s.slice(0, MAX_TYPED)),
  ),
})

function readSubmitForm(form: FormData) {
  const answers: Record<string, string> = {}
  let n = 0
  for (const [key, value] of form.entries()) {
    if (!key.startsWith(ANSWER_PREFIX) || typeof value !== 'string') continue
    const name = key.slice(ANSWER_PREFIX.length)
    if (!/^[A-Za-z][A-Za-z0-9_]{0,39}$/.test(name) || ++n > MAX_FIELDS) continue
    answers[name] = value
  }
  const inPlace = form.get('inPlace')
  const formToken = form.get('formToken')
  return SubmitFormSchema.parse({
    inPlace: typeof inPlace === 'string' ? inPlace : undefined,
    formToken: typeof formToken === 'string' ? formToken : undefined,
    answers,
  })
}

export type SubmitActionData = {
  ok: boolean
  formError: string | null
  fieldErrors: Record<string, string>
  values: Record<string, string>
  receipt: Receipt | null
}

export async function action({ request, params }: Route.ActionArgs) {
  const { course, ref } = await guard(request, params)
  if (course.role !== 'student')
    forbidden('Staff preview: your answers are not recorded. Only the course’s students submit answers.')
  const form = readSubmitForm(await readFormData(request))
  const result = await submitAnswers(db(), { ...ref, answers: form.answers, formToken: form.formToken ?? null })
  if (result.ok && !form.inPlace) {
    // Post/redirect/get, also when some answers were refused: reloading the page after it does
    // not post again. The receipt page shows what this press refused, beside the text typed
    // (both come back from the stored submission). A repeated token lands on the same page.
    const url = new URL(request.url)
    return redirect(`${url.pathname}?receipt=${result.receipt.submissionId}`, 303)
  }
  const body: SubmitActionData = result.ok
    ? { ok: true, formError: null, fieldErrors: result.fieldErrors, values: result.values, receipt: result.receipt }
    : { ok: false, formError: result.formError, fieldErrors: result.fieldErrors, values: result.values, receipt: null }
  return data(body, { status: result.ok ? 200 : 400 })
}

function useHydrated() {
  const [hydrated, setHydrated] = useState(false)
  useEffect(() => setHydrated(true), [])
  return hydrated
}

async function fetchMyResults(assignmentId: number, position: number): Promise<MyResults> {
  const res = await fetch(
    href('/api/assignments/:assignmentId/problems/:position/mine', {
      assignmentId: String(assignmentId),
      position: String(position),
    }),
    {
      headers: { Accept: 'application/json' },
    },
  )
  if (!res.ok) throw new Error(`Your results could not be read just now (${res.status}).`)
  return readJson(res, isMyResults, 'Your results')
}

/** Whether a refreshed body has the shape of a student's results (their lists, counts and flag). */
function isMyResults(x: unknown): x is MyResults {
  return (
    isRecord(x) &&
    Array.isArray(x.finds) &&
    Array.isArray(x.receipts) &&
    typeof x.pending === 'boolean' &&
    typeof x.score === 'number' &&
    typeof x.points === 'number' &&
    isRecord(x.lastTyped)
  )
}

export default function ProblemRoute({ loaderData, actionData }: Route.ComponentProps) {
  if (loaderData.notOpen !== null) {
    return (
      <div className="space-y-4">
        <h1 className="text-2xl font-semibold">{loaderData.notOpen.title}</h1>
        <Notice tone="info">{loaderData.notOpen.message}</Notice>
        <p>
          <Link to={loaderData.notOpen.back}>Back to the assignment</Link>
        </p>
      </div>
    )
  }
  return <ProblemPage loaderData={loaderData} actionData={actionData} />
}

/** The page's data when the problem is open (or staff preview it). */
export type ProblemPageData = Extract<Route.ComponentProps['loaderData'], { notOpen: null }>

function ProblemPage({
  loaderData,
  actionData,
}: {
  loaderData: ProblemPageData
  actionData: Route.ComponentProps['actionData']
}) {
  const { course, staff, problem, receiptId, disputes, offers, dropped, disputed, formToken } = loaderData
  const { assignment, item } = problem
  const tz = assignment.timeZone
  const hydrated = useHydrated()
  const fetcher = useFetcher<typeof action>()
  const queryClient = useQueryClient()
  const queryKey = useMemo(() => ['my-results', assignment.id, item.position] as const, [assignment.id, item.position])

  const query = useQuery({
    queryKey,
    queryFn: () => fetchMyResults(assignment.id, item.position),
    initialData: problem.results,
    // The loader's data is fresh; poll only while an answer waits for the grader.
    staleTime: 5_000,
    enabled: !staff,
    refetchInterval: (q) => (q.state.data?.pending ? 1_000 : false),
  })
  // After a submission the loader runs again; its results (now pending) restart the polling.
  useEffect(() => {
    if (!staff) queryClient.setQueryData(queryKey, problem.results)
  }, [problem.results, queryClient, queryKey, staff])

  const results = staff ? problem.results : query.data
  // A submission made in place (fetcher) is newer than one posted without JavaScript.
  const submitted: SubmitActionData | undefined = fetcher.data ?? actionData
  const shownReceiptId = submitted?.receipt?.submissionId ?? receiptId
  const receipt =
    (shownReceiptId !== null ? results.receipts.find((r) => r.submissionId === shownReceiptId) : undefined) ??
    submitted?.receipt ??
    null

  const base = href('/courses/:courseId/assignments/:assignmentId', {
    courseId: String(course.id),
    assignmentId: String(assignment.id),
  })
  const here = `${base}/problems/${item.position}`
  const mode: AnswerFormMode = staff
    ? 'preview'
    : !dropped && (problem.window.state === 'open' || problem.window.state === 'late')
      ? 'submit'
      : 'closed'
  const message = windowMessage(problem.window, (d) => formatInZone(d, tz))
  const unitOf = new Map(results.finds.map((f) => [f.name, f.unitHint]))
  const disputedLabel = disputed ? results.finds.find((f) => f.name === disputed)?.label : null

  return (
    <div className="space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <ol className="flex flex-wrap gap-1">
          <li>
            <Link to={href('/courses/:courseId', { courseId: String(course.id) })}>{course.code}</Link>
            <span aria-hidden="true"> › </span>
          </li>
          <li>
            <Link to={base}>{assignment.title}</Link>
          </li>
        </ol>
      </nav>

      <header>
        <p className="text-sm font-semibold tracking-wide text-muted uppercase">
          Problem {item.position} of {item.count}
        </p>
        <h1 className="mt-1 text-2xl font-semibold">{item.title}</h1>
        <p className="mt-2 text-sm">
          {message}
          {assignment.hasExtension ? ' This includes your extension.' : null}
        </p>
        {!staff ? (
          <p className="mt-1 text-sm text-muted">
            Score so far: {formatScore(results.score, results.points)} points
            {results.pending ? ' (some answers are still being graded)' : ''}.
          </p>
        ) : null}
      </header>

      {staff ? (
        <Notice tone="info">
          <p className="font-semibold">Staff preview: your answers are not recorded.</p>
          <p className="mt-1">This is the variant drawn for you, with its key. Each student sees their own numbers.</p>
        </Notice>
      ) : null}

      {dropped ? <Notice tone="warn">{DROPPED_SUBMIT_MESSAGE}</Notice> : null}

      {disputedLabel ? (
        <Notice tone="ok">
          <p className="font-semibold">Your dispute was sent; you will get an e-mail when it is resolved.</p>
          <p className="mt-1">It is about “{disputedLabel}”. Its state shows beside that question below.</p>
        </Notice>
      ) : null}

      {problem.promptHtml === null ? (
        <Notice tone="error">
          {staff
            ? 'This problem version could not draw a variant. Check it in the problem bank.'
            : problem.variantError}
        </Notice>
      ) : (
        <>
          <section aria-labelledby="prompt-title" className="rounded-lg border border-line bg-white p-5 shadow-sm">
            <h2 id="prompt-title" className="sr-only">
              Problem statement
            </h2>
            {/* Rendered and sanitised on the server (Markdown + KaTeX, tags and attributes allowed by a list). */}
            <div
              className="prompt-html leading-relaxed [&_p]:mt-2"
              dangerouslySetInnerHTML={{ __html: problem.promptHtml }}
            />
          </section>

          <div aria-live="polite">
            {receipt ? <ReceiptBox receipt={receipt} timeZone={tz} live={hydrated && !staff} /> : null}
          </div>

          <section aria-labelledby="answers-title" className="rounded-lg border border-line bg-white p-5 shadow-sm">
            <h2 id="answers-title" className="mb-3 text-lg font-semibold">
              Your answers
            </h2>
            <AnswerForm
              finds={results.finds}
              values={submitted?.values ?? results.lastTyped}
              fieldErrors={submitted?.fieldErrors ?? problem.refused?.fieldErrors ?? {}}
              formError={submitted?.formError ?? null}
              mode={mode}
              action={here}
              formToken={formToken}
              Form={fetcher.Form}
              busy={fetcher.state !== 'idle'}
              inPlace={hydrated}
              disputes={
                staff
                  ? null
                  : {
                      list: disputes,
                      offers,
                      timeZone: tz,
                      href: (findName) => `${here}/dispute?find=${encodeURIComponent(findName)}`,
                    }
              }
            />
            {query.isError && results.pending ? (
              <p className="mt-3 text-sm text-warn" role="status">
                {query.error.message} Trying again; reload the page if this goes on.
              </p>
            ) : null}
          </section>
        </>
      )}

      {!staff ? (
        <section aria-labelledby="history-title">
          <h2 id="history-title" className="sr-only">
            Earlier submissions
          </h2>
          <ReceiptList receipts={results.receipts} timeZone={tz} />
        </section>
      ) : null}

      {problem.key ? (
        <section aria-labelledby="key-title" className="space-y-4 rounded-lg border border-line bg-white p-5 shadow-sm">
          <h2 id="key-title" className="text-lg font-semibold">
            Key and worked solution
          </h2>
          <AnswerKeyTable
            className="w-full max-w-xl text-left text-sm"
            captionClassName="text-left text-sm text-muted"
            caption={staff ? 'The answers to your preview variant' : 'The answers to your variant'}
            entries={problem.key.entries}
            unitOf={(name) => unitOf.get(name)}
          />
          {/* Sanitised on the server, like the prompt. */}
          <div className="overflow-x-auto" dangerouslySetInnerHTML={{ __html: problem.key.workedHtml }} />
          <CycleDiagrams diagrams={problem.key.diagrams} caption="Diagrams of this variant" />
        </section>
      ) : null}

      <nav
        aria-label="Other problems in this assignment"
        className="flex flex-wrap justify-between gap-3 border-t border-line pt-4 text-sm"
      >
        {item.position > 1 ? (
          <Link to={`${base}/problems/${item.position - 1}`} rel="prev">
            ← Problem {item.position - 1}
          </Link>
        ) : (
          <span />
        )}
        <Link to={base}>All problems</Link>
        {item.position < item.count ? (
          <Link to={`${base}/problems/${item.position + 1}`} rel="next">
            Problem {item.position + 1} →
          </Link>
        ) : (
          <span />
        )}
      </nav>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
