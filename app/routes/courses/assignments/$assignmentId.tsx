import { data, Form, Link, redirect, useNavigation } from 'react-router'
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
import { getAssignmentDetail, orErrorPage, releaseGrades, releaseKey } from '#app/server/assignments.server.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { appUrl } from '#app/server/env.server.ts'
import type { Route } from './+types/$assignmentId'
import { readFormData } from '#app/lib/form.ts'

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `${data.detail.assignment.title} · Cyclewright` : 'Assignment · Cyclewright' }]

const IntentSchema = z.enum(['release-key', 'release-grades'])

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta', 'student'])
  const detail = await orErrorPage(getAssignmentDetail(db(), { courseId, assignmentId, role: course.role, userId: user.id }))
  const instructions = detail.assignment.instructions ? renderMarkdown(detail.assignment.instructions).html : null
  const notice = new URL(request.url).searchParams.get('done')
  return { course, detail, instructions, notice }
}

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { user } = await requireCourseRole(request, courseId, ['instructor'])
  const intent = IntentSchema.safeParse((await readFormData(request)).get('intent'))
  if (!intent.success) throw data('Use one of the buttons on the page.', { status: 400 })
  const base = `/courses/${courseId}/assignments/${assignmentId}`
  if (intent.data === 'release-key') {
    await orErrorPage(releaseKey(db(), { courseId, assignmentId, actorId: user.id }))
    return redirect(`${base}?done=key`)
  }
  await orErrorPage(releaseGrades(db(), { courseId, assignmentId, actorId: user.id, baseUrl: appUrl() }))
  return redirect(`${base}?done=grades`)
}

export default function AssignmentRoute({ loaderData }: Route.ComponentProps) {
  const { course, detail, instructions, notice } = loaderData
  const { assignment: a, timeZone } = detail
  const fmt = (d: Date) => formatInZone(d, timeZone)
  const base = `/courses/${course.id}/assignments/${a.id}`
  return (
    <div>
      <p className="text-sm text-muted">
        <a href={`/courses/${course.id}`}>
          {course.code} {course.title}
        </a>
      </p>
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
      {instructions ? <div className="prompt-html mt-4 max-w-3xl leading-relaxed [&_p]:mt-2" dangerouslySetInnerHTML={{ __html: instructions }} /> : null}
      {detail.student ? <StudentView detail={detail} base={base} fmt={fmt} /> : <StaffView detail={detail} base={base} courseId={course.id} fmt={fmt} mayChange={course.role === 'instructor'} />}
    </div>
  )
}

type Detail = Route.ComponentProps['loaderData']['detail']

function StaffView({ detail, base, courseId, fmt, mayChange }: { detail: Detail; base: string; courseId: number; fmt: (d: Date) => string; mayChange: boolean }) {
  const { assignment: a, items, staff } = detail
  const busy = useNavigation().state === 'submitting'
  return (
    <>
      <nav aria-label="Assignment pages" className="mt-4 flex flex-wrap gap-4">
        <Link to={`${base}/gradebook`}>Gradebook</Link>
        <Link to={`${base}/statistics`}>Statistics</Link>
        <Link to={`${base}/extensions`}>Extensions ({staff?.extensionCount ?? 0})</Link>
        <Link to={`/courses/${courseId}/disputes?assignment=${a.id}`}>Disputes in the review queue</Link>
        {mayChange ? <Link to={`${base}/edit`}>Edit</Link> : null}
        <Link to={`/courses/${courseId}/gradebook`}>Course gradebook</Link>
      </nav>
      <section aria-labelledby="settings-title" className="mt-6 max-w-3xl rounded-lg border border-line bg-white p-6 shadow-sm">
        <h2 id="settings-title" className="text-xl font-semibold">
          Settings
        </h2>
        <dl className="mt-3 grid gap-2 sm:grid-cols-[12rem_1fr]">
          <dt className="font-medium">Opens</dt>
          <dd>{fmt(a.opensAt)}</dd>
          <dt className="font-medium">Due</dt>
          <dd>
            {fmt(a.dueAt)}
            {staff && staff.extensionCount > 0 ? ` (${staff.extensionCount} student${staff.extensionCount === 1 ? ' has' : 's have'} an extension)` : ''}
          </dd>
          <dt className="font-medium">Attempts per find</dt>
          <dd>{a.attemptsPerFind}</dd>
          <dt className="font-medium">Late answers</dt>
          <dd>{latePolicyText(a)}</dd>
          <dt className="font-medium">Key and worked solutions</dt>
          <dd>{keyReleaseText(a, detail.timeZone)}</dd>
          <dt className="font-medium">Grades</dt>
          <dd>{a.gradesReleasedAt ? `Released on ${fmt(a.gradesReleasedAt)}; students were e-mailed their scores.` : 'Not released yet.'}</dd>
          <dt className="font-medium">Points</dt>
          <dd>
            {detail.maxScore} over {items.length} problem{items.length === 1 ? '' : 's'}; {staff?.studentCount ?? 0} student{staff?.studentCount === 1 ? '' : 's'}
          </dd>
        </dl>
        {mayChange ? (
          <div className="mt-4 flex flex-wrap gap-6">
            {a.keyRelease === 'manual' && !a.keyReleasedAt ? (
              <Form method="post" className="grid gap-1">
                <Button type="submit" name="intent" value="release-key" variant="secondary" disabled={busy}>
                  Release key now
                </Button>
                <span className="text-xs text-muted">Students see the key and worked solutions, and can no longer submit.</span>
              </Form>
            ) : null}
            {!a.gradesReleasedAt ? (
              <Form method="post" className="grid gap-1">
                <Button type="submit" name="intent" value="release-grades" disabled={busy}>
                  Release grades
                </Button>
                <span className="text-xs text-muted">E-mails each student their score, once.</span>
              </Form>
            ) : null}
          </div>
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
                  <th scope="col" className="px-4 py-2">#</th>
                  <th scope="col" className="px-4 py-2">Problem</th>
                  <th scope="col" className="px-4 py-2">Version</th>
                  <th scope="col" className="px-4 py-2">Points</th>
                  <th scope="col" className="px-4 py-2">Pages</th>
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
                        <Link to={`${base}/problems/${it.position}`}>
                          Problem page<span className="sr-only"> of problem {it.position}</span>
                        </Link>
                        <Link to={`${base}/problems/${it.position}/answers`}>
                          Answers<span className="sr-only"> to problem {it.position}</span>
                        </Link>
                        {mayChange ? (
                          <Link to={`${base}/problems/${it.position}/regrade`}>
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

function StudentView({ detail, base, fmt }: { detail: Detail; base: string; fmt: (d: Date) => string }) {
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
          {student.extension && student.extension.extraAttempts > 0 ? ` (including ${student.extension.extraAttempts} extra for you)` : ''}
        </dd>
        <dt className="font-medium">Late answers</dt>
        <dd>{latePolicyText(a)}</dd>
        {a.gradesReleasedAt ? (
          <>
            <dt className="font-medium">Your grade</dt>
            <dd>
              <strong>
                {formatScore(student.total, detail.maxScore)} points
              </strong>{' '}
              (released {fmt(a.gradesReleasedAt)})
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
                  <th scope="col" className="px-4 py-2">#</th>
                  <th scope="col" className="px-4 py-2">Problem</th>
                  <th scope="col" className="px-4 py-2">Your score</th>
                  <th scope="col" className="px-4 py-2">Status</th>
                </tr>
              </thead>
              <tbody>
                {items.map((it) => (
                  <tr key={it.id} className="border-t border-line">
                    <td className="px-4 py-2">{it.position}</td>
                    <th scope="row" className="px-4 py-2 font-normal">
                      <Link to={`${base}/problems/${it.position}`}>{it.title}</Link>
                    </th>
                    <td className="px-4 py-2">
                      {formatScore(it.mine?.score ?? 0, it.points)}
                    </td>
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
  if (!mine || !mine.started) return 'Not started'
  if (mine.pending > 0) return 'Being graded'
  return mine.finished ? 'Finished' : 'In progress'
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
