import type { ReactNode } from 'react'
import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { windowMessage } from '#app/domain/assignments/policy.ts'
import { renderMarkdown } from '#app/domain/authoring/prompt.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { formatPoints, formatScore } from '#app/lib/points.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { keyReleaseText, latePolicyText } from '#app/lib/assignment-text.ts'
import {
  deletionSentence,
  earlyReleaseLabel,
  gradesReleaseSentence,
  keyReleaseSentence,
  studentsWord,
} from '#app/domain/assignments/releases.ts'
import { AssignmentInUseError, AssignmentNotOpenError } from '#app/server/assignment-access.server.ts'
import { deleteAssignment, deletionSummary, getAssignmentDetail } from '#app/server/assignments.server.ts'
import { orErrorPage } from '#app/server/error-page.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { appUrl } from '#app/server/env.server.ts'
import {
  getReleaseChecks,
  orReleaseErrorPage,
  releaseGrades,
  releaseKey,
  ReleaseRefusedError,
} from '#app/server/releases.server.ts'
import type { Route } from './+types/$assignmentId'
import { readFormData } from '#app/lib/form.ts'
import { STUDENT_STATUS_LABELS } from '#app/lib/labels.ts'

export const meta: Route.MetaFunction = ({ data }) => [
  {
    title: data
      ? `${data.notOpen ? data.notOpen.title : data.detail.assignment.title} · Cyclewright`
      : 'Assignment · Cyclewright',
  },
]

const IntentSchema = z.enum(['release-key', 'release-grades', 'delete'])
const ConfirmSchema = z.enum(['release-key', 'release-grades', 'delete'])
export type ConfirmStep = z.infer<typeof ConfirmSchema>

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  let detail
  try {
    detail = await getAssignmentDetail(db(), { courseId, assignmentId, role: course.role, userId: user.id })
  } catch (e) {
    // Not open yet: the page says when it opens (nothing of its content is sent).
    if (e instanceof AssignmentNotOpenError) return { notOpen: { title: e.opening.title, message: e.message }, course }
    return orErrorPage(Promise.reject(e))
  }
  const instructions = detail.assignment.instructions ? renderMarkdown(detail.assignment.instructions).html : null
  const search = new URL(request.url).searchParams
  const notice = search.get('done')
  const instructor = course.role === 'instructor'
  // The instructor's release and delete controls: the same checks the server functions apply.
  const releases = instructor ? await orErrorPage(getReleaseChecks(db(), { courseId, assignmentId })) : null
  const deletion = instructor ? await orErrorPage(deletionSummary(db(), { courseId, assignmentId })) : null
  const confirmParsed = ConfirmSchema.safeParse(search.get('confirm'))
  const confirm = instructor && confirmParsed.success ? confirmParsed.data : null
  return { notOpen: null, course, detail, instructions, notice, releases, deletion, confirm }
}

export type AssignmentActionData = { formError: string; step: ConfirmStep }

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { user } = await requireCourseRole(request, courseId, ['instructor'])
  const form = await readFormData(request)
  const intent = IntentSchema.safeParse(form.get('intent'))
  if (!intent.success) throw data('Use one of the buttons on the page.', { status: 400 })
  const confirmed = form.get('confirm') === 'yes'
  const base = href('/courses/:courseId/assignments/:assignmentId', {
    courseId: String(courseId),
    assignmentId: String(assignmentId),
  })
  try {
    if (intent.data === 'release-key') {
      await releaseKey(db(), { courseId, assignmentId, actorId: user.id, confirmed })
      return redirect(`${base}?done=key`)
    }
    if (intent.data === 'release-grades') {
      await releaseGrades(db(), {
        courseId,
        assignmentId,
        actorId: user.id,
        confirmed,
        early: form.get('early') === 'yes',
        baseUrl: appUrl(),
      })
      return redirect(`${base}?done=grades`)
    }
    if (!confirmed)
      throw new AssignmentInUseError(
        'Nothing was deleted: deleting cannot be undone, so it needs the confirmation step. Use the button on the assignment page and confirm.',
        400,
      )
    await deleteAssignment(db(), { courseId, assignmentId, actorId: user.id })
    return redirect(`${href('/courses/:courseId', { courseId: String(courseId) })}?deleted=1`)
  } catch (e) {
    // A refusal (not confirmed, too early, answered) is shown in the confirmation panel.
    if (e instanceof ReleaseRefusedError || e instanceof AssignmentInUseError) {
      return data<AssignmentActionData>({ formError: e.message, step: intent.data }, { status: e.status })
    }
    return orReleaseErrorPage(Promise.reject(e))
  }
}

export default function AssignmentRoute({ loaderData, actionData }: Route.ComponentProps) {
  if (loaderData.notOpen !== null) return <NotYetOpen info={loaderData.notOpen} />
  return <AssignmentPage loaderData={loaderData} actionData={actionData} />
}

function NotYetOpen({ info }: { info: { title: string; message: string } }) {
  return (
    <div>
      <h1 className="mt-1 text-3xl font-semibold">{info.title}</h1>
      <Notice tone="info" className="mt-4 max-w-3xl">
        {info.message}
      </Notice>
    </div>
  )
}

type PageData = Extract<Route.ComponentProps['loaderData'], { notOpen: null }>

function AssignmentPage({
  loaderData,
  actionData,
}: {
  loaderData: PageData
  actionData: Route.ComponentProps['actionData']
}) {
  const { course, detail, instructions, notice, releases, deletion, confirm } = loaderData
  const { assignment: a, timeZone } = detail
  const fmt = (d: Date) => formatInZone(d, timeZone)
  const ids = { courseId: String(course.id), assignmentId: String(a.id) }
  const base = href('/courses/:courseId/assignments/:assignmentId', ids)
  return (
    <div>
      <h1 className="mt-1 text-3xl font-semibold">{a.title}</h1>
      {notice === 'key' ? (
        <Notice tone="ok" className="mt-4">
          The key and worked solutions are released.
        </Notice>
      ) : null}
      {notice === 'grades' ? (
        <Notice tone="ok" className="mt-4">
          The grades are released; students are being e-mailed their scores.
        </Notice>
      ) : null}
      {instructions ? (
        <div
          className="prompt-html mt-4 max-w-3xl leading-relaxed [&_p]:mt-2"
          dangerouslySetInnerHTML={{ __html: instructions }}
        />
      ) : null}
      {detail.student ? (
        <StudentView detail={detail} ids={ids} fmt={fmt} />
      ) : (
        <StaffView
          detail={detail}
          base={base}
          ids={ids}
          fmt={fmt}
          mayChange={course.role === 'instructor'}
          controls={
            releases && deletion
              ? { releases, deletion, step: actionData?.step ?? confirm, error: actionData?.formError ?? null }
              : null
          }
        />
      )}
    </div>
  )
}

type Detail = PageData['detail']
type Controls = {
  releases: NonNullable<PageData['releases']>
  deletion: NonNullable<PageData['deletion']>
  step: ConfirmStep | null
  error: string | null
}

function StaffView({
  detail,
  base,
  ids,
  fmt,
  mayChange,
  controls,
}: {
  detail: Detail
  base: string
  ids: { courseId: string; assignmentId: string }
  fmt: (d: Date) => string
  mayChange: boolean
  controls: Controls | null
}) {
  const { assignment: a, items, staff } = detail
  const busy = useNavigation().state === 'submitting'
  return (
    <>
      <nav aria-label="Assignment pages" className="mt-4 flex flex-wrap gap-4">
        <Link to={href('/courses/:courseId/assignments/:assignmentId/gradebook', ids)}>Gradebook</Link>
        <Link to={href('/courses/:courseId/assignments/:assignmentId/statistics', ids)}>Statistics</Link>
        <Link to={href('/courses/:courseId/assignments/:assignmentId/extensions', ids)}>
          Extensions ({staff?.extensionCount ?? 0})
        </Link>
        <Link to={`${href('/courses/:courseId/disputes', ids)}?assignment=${a.id}`}>Disputes in the review queue</Link>
        {mayChange ? <Link to={href('/courses/:courseId/assignments/:assignmentId/edit', ids)}>Edit</Link> : null}
        <Link to={href('/courses/:courseId/gradebook', ids)}>Course gradebook</Link>
      </nav>
      <section
        aria-labelledby="settings-title"
        className="mt-6 max-w-3xl rounded-lg border border-line bg-white p-6 shadow-sm"
      >
        <h2 id="settings-title" className="text-xl font-semibold">
          Settings
        </h2>
        <dl className="mt-3 grid gap-2 sm:grid-cols-[12rem_1fr]">
          <dt className="font-medium">Opens</dt>
          <dd>{fmt(a.opensAt)}</dd>
          <dt className="font-medium">Due</dt>
          <dd>
            {fmt(a.dueAt)}
            {staff && staff.extensionCount > 0
              ? ` (${staff.extensionCount} student${staff.extensionCount === 1 ? ' has' : 's have'} an extension)`
              : ''}
          </dd>
          <dt className="font-medium">Attempts per find</dt>
          <dd>{a.attemptsPerFind}</dd>
          <dt className="font-medium">Late answers</dt>
          <dd>{latePolicyText(a)}</dd>
          <dt className="font-medium">Key and worked solutions</dt>
          <dd>{keyReleaseText(a, detail.timeZone)}</dd>
          <dt className="font-medium">Grades</dt>
          <dd>
            {a.gradesReleasedAt
              ? `Released on ${fmt(a.gradesReleasedAt)}; students were e-mailed their scores.`
              : 'Not released yet.'}
          </dd>
          <dt className="font-medium">Points</dt>
          <dd>
            {detail.maxScore} over {items.length} problem{items.length === 1 ? '' : 's'}; {staff?.studentCount ?? 0}{' '}
            student{staff?.studentCount === 1 ? '' : 's'}
          </dd>
        </dl>
        {mayChange && controls ? (
          <ReleaseControls title={a.title} base={base} controls={controls} busy={busy} fmt={fmt} />
        ) : null}
      </section>
      <section aria-labelledby="problems-title" className="mt-8">
        <h2 id="problems-title" className="text-xl font-semibold">
          Problems
        </h2>
        {items.length === 0 ? (
          <p className="mt-3 text-muted">This assignment has no problems.</p>
        ) : (
          <div className="mt-3 overflow-x-auto rounded-lg border border-line bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Problems of {a.title}</caption>
              <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-4 py-2">
                    #
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Problem
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Version
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Points
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Pages
                  </th>
                </tr>
              </thead>
              <tbody>
                {items.map((it) => (
                  <tr key={it.id} className="border-t border-line">
                    <td className="px-4 py-2">{it.position}</td>
                    <th scope="row" className="px-4 py-2 font-normal">
                      {it.title}
                    </th>
                    <td className="px-4 py-2">{it.versionNumber}</td>
                    <td className="px-4 py-2">{formatPoints(it.points)}</td>
                    <td className="px-4 py-2">
                      <span className="flex flex-wrap gap-3">
                        <Link
                          to={href('/courses/:courseId/assignments/:assignmentId/problems/:position', {
                            ...ids,
                            position: String(it.position),
                          })}
                        >
                          Problem page<span className="sr-only"> of problem {it.position}</span>
                        </Link>
                        <Link
                          to={href('/courses/:courseId/assignments/:assignmentId/problems/:position/answers', {
                            ...ids,
                            position: String(it.position),
                          })}
                        >
                          Answers<span className="sr-only"> to problem {it.position}</span>
                        </Link>
                        {mayChange ? (
                          <Link
                            to={href('/courses/:courseId/assignments/:assignmentId/problems/:position/regrade', {
                              ...ids,
                              position: String(it.position),
                            })}
                          >
                            Regrade<span className="sr-only"> problem {it.position}</span>
                          </Link>
                        ) : null}
                      </span>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </>
  )
}

/**
 * Releasing the key and the grades, and deleting: each button leads to a confirmation panel
 * (?confirm=…) that says what will happen and to how many, with a second submit carrying
 * confirm=yes. Only what the rules allow now is offered; otherwise a sentence says when.
 */
function ReleaseControls({
  title,
  base,
  controls,
  busy,
  fmt,
}: {
  title: string
  base: string
  controls: Controls
  busy: boolean
  fmt: (d: Date) => string
}) {
  const { releases: r, deletion, step, error } = controls
  const keyOffered = r.key.state === 'offered'
  const gradesOffered = r.grades.state === 'offered'
  const early = r.grades.state === 'offered' && r.grades.early
  const deletable = !deletion.answered
  const ask = (value: ConfirmStep, label: string, variant: 'primary' | 'secondary' = 'secondary') => (
    <Form method="get" action={base}>
      <input type="hidden" name="confirm" value={value} />
      <Button type="submit" variant={variant}>
        {label}
      </Button>
    </Form>
  )
  const panel = (value: ConfirmStep, heading: string, sentence: string, yes: string, extra?: ReactNode) => (
    <section
      aria-labelledby={`confirm-${value}`}
      className="mt-4 rounded-md border border-warn/40 bg-warn-soft p-4"
      data-confirm={value}
    >
      <h3 id={`confirm-${value}`} className="font-semibold text-warn">
        {heading}
      </h3>
      <p className="mt-1">{sentence}</p>
      {error ? (
        <Notice tone="error" className="mt-2">
          {error}
        </Notice>
      ) : null}
      <Form method="post" action={`${base}?confirm=${value}`} className="mt-3 grid gap-3">
        <input type="hidden" name="intent" value={value} />
        <input type="hidden" name="confirm" value="yes" />
        {extra}
        <div className="flex flex-wrap items-center gap-4">
          <Button type="submit" disabled={busy}>
            {yes}
          </Button>
          <Link to={base}>Cancel</Link>
        </div>
      </Form>
    </section>
  )
  return (
    <div className="mt-4 grid gap-3">
      <div className="flex flex-wrap gap-6">
        {keyOffered ? ask('release-key', 'Release key…') : null}
        {gradesOffered ? ask('release-grades', 'Release grades…', 'primary') : null}
        {deletable ? ask('delete', 'Delete assignment…') : null}
      </div>
      {r.key.state === 'not-yet' ? (
        <p className="text-sm text-muted" data-key-release="not-yet">
          {r.key.reason}
        </p>
      ) : null}
      {r.grades.state === 'not-yet' ? <p className="text-sm text-muted">{r.grades.reason}</p> : null}
      {early ? (
        <p className="text-sm text-muted">
          {studentsWord(r.stillAnswering)} can still answer (the last window closes {fmt(r.closesAt)}); releasing the
          grades before then needs an explicit choice.
        </p>
      ) : null}
      {!deletable ? (
        <p className="text-sm text-muted">Students have answered this assignment, so it cannot be deleted.</p>
      ) : null}
      {step === 'release-key' && keyOffered
        ? panel('release-key', 'Release the key?', keyReleaseSentence(title, r.studentCount), 'Yes, release the key')
        : null}
      {step === 'release-grades' && gradesOffered
        ? panel(
            'release-grades',
            'Release the grades?',
            gradesReleaseSentence(title, r.studentCount),
            'Yes, release the grades',
            early ? (
              <label className="flex items-start gap-2">
                <input type="checkbox" name="early" value="yes" required className="mt-1" />
                <span>{earlyReleaseLabel(r.stillAnswering)}</span>
              </label>
            ) : undefined,
          )
        : null}
      {step === 'delete' && deletable
        ? panel('delete', 'Delete this assignment?', deletionSentence(deletion), 'Yes, delete it')
        : null}
      {step &&
      error &&
      !(step === 'release-key' ? keyOffered : step === 'release-grades' ? gradesOffered : deletable) ? (
        <Notice tone="error">{error}</Notice>
      ) : null}
    </div>
  )
}

function StudentView({
  detail,
  ids,
  fmt,
}: {
  detail: Detail
  ids: { courseId: string; assignmentId: string }
  fmt: (d: Date) => string
}) {
  const { assignment: a, items, student } = detail
  if (!student) return null
  const extended = student.extension?.dueAt != null
  return (
    <>
      <Notice tone={student.window.state === 'closed' ? 'warn' : 'info'} className="mt-4 max-w-3xl">
        {windowMessage(student.window, fmt)}
      </Notice>
      <dl className="mt-4 grid max-w-3xl gap-2 sm:grid-cols-[12rem_1fr]">
        <dt className="font-medium">Due</dt>
        <dd>
          {fmt(student.dueAt)}
          {extended ? ' (your extension)' : ''}
        </dd>
        <dt className="font-medium">Attempts per find</dt>
        <dd>
          {student.attempts}
          {student.extension && student.extension.extraAttempts > 0
            ? ` (including ${student.extension.extraAttempts} extra for you)`
            : ''}
        </dd>
        <dt className="font-medium">Late answers</dt>
        <dd>{latePolicyText(a)}</dd>
        {a.gradesReleasedAt ? (
          <>
            <dt className="font-medium">Your grade</dt>
            <dd>
              <strong>{formatScore(student.total, detail.maxScore)} points</strong> (released {fmt(a.gradesReleasedAt)})
            </dd>
          </>
        ) : null}
      </dl>
      <section aria-labelledby="problems-title" className="mt-8">
        <h2 id="problems-title" className="text-xl font-semibold">
          Problems
        </h2>
        {items.length === 0 ? (
          <p className="mt-3 text-muted">This assignment has no problems yet.</p>
        ) : (
          <div className="mt-3 overflow-x-auto rounded-lg border border-line bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Your problems in {a.title}</caption>
              <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-4 py-2">
                    #
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Problem
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Your score
                  </th>
                  <th scope="col" className="px-4 py-2">
                    Status
                  </th>
                </tr>
              </thead>
              <tbody>
                {items.map((it) => (
                  <tr key={it.id} className="border-t border-line">
                    <td className="px-4 py-2">{it.position}</td>
                    <th scope="row" className="px-4 py-2 font-normal">
                      <Link
                        to={href('/courses/:courseId/assignments/:assignmentId/problems/:position', {
                          ...ids,
                          position: String(it.position),
                        })}
                      >
                        {it.title}
                      </Link>
                    </th>
                    <td className="px-4 py-2">{formatScore(it.mine?.score ?? 0, it.points)}</td>
                    <td className="px-4 py-2">{statusText(it.mine)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </>
  )
}

function statusText(mine: Detail['items'][number]['mine']): string {
  if (!mine || !mine.started) return STUDENT_STATUS_LABELS['not-started']
  if (mine.pending > 0) return STUDENT_STATUS_LABELS['being-graded']
  return STUDENT_STATUS_LABELS[mine.finished ? 'finished' : 'in-progress']
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
