// Staff only (instructors and TAs of the course): every answer submitted to one question
// (find) of an assignment's problem, with its verdict and the pitfall that explains it.
import { data, href, Link } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { formatPoints } from '#app/lib/points.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { textParamProblem } from '#app/lib/query-params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getFindAnswers, type FindAnswer } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/answers'
import { answerResultLabel, TONE_TEXT, VERDICT_TONES } from '#app/lib/labels.ts'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Answers: ${data.answers.item.title} · Cyclewright` : 'Answers · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const position = requireIdParam(params.position, 'problem')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const search = new URL(request.url).searchParams
  const odd = textParamProblem(search, { find: 'the question' })
  if (odd) throw data(odd.message, { status: 400 })
  const findName = search.get('find')?.slice(0, 100) ?? undefined
  const answers = await getFindAnswers(db(), { assignmentId, position, findName, courseId })
  if (!answers) throw data('This assignment has no problem at that position.', { status: 404 })
  return { course, answers }
}

function verdictOf(a: FindAnswer): string {
  return answerResultLabel(a)
}

export default function FindAnswersRoute({ loaderData }: Route.ComponentProps) {
  const { course, answers } = loaderData
  const { assignment, item, find, finds } = answers
  const base = href('/courses/:courseId/assignments/:assignmentId', {
    courseId: String(course.id),
    assignmentId: String(assignment.id),
  })
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={base}>{assignment.title}</Link> · <Link to={`${base}/gradebook`}>Gradebook</Link> ·{' '}
        <Link to={`${base}/statistics`}>Statistics</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">
        Answers to problem {item.position}: {item.title}
      </h1>
      <nav aria-label="Questions of this problem" className="mt-4">
        <ul className="flex flex-wrap gap-2">
          {finds.map((f) => {
            const current = find?.name === f.name
            return (
              <li key={f.name}>
                <Link
                  to={`?find=${encodeURIComponent(f.name)}`}
                  aria-current={current ? 'page' : undefined}
                  className={
                    current
                      ? 'rounded-md bg-accent px-3 py-1.5 text-sm font-semibold text-white'
                      : 'rounded-md border border-line bg-white px-3 py-1.5 text-sm hover:bg-paper'
                  }
                >
                  {f.label}
                  {f.unit ? ` (${f.unit})` : ''}
                </Link>
              </li>
            )
          })}
        </ul>
      </nav>
      {!find ? (
        <p className="mt-6 text-muted">This problem has no question by that name. Pick one above.</p>
      ) : answers.answers.length === 0 ? (
        <p className="mt-6 text-muted">No answers yet.</p>
      ) : (
        <div className="relative mt-6 overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-left text-sm">
            <caption className="px-3 py-2 text-left text-sm text-muted max-sm:sticky max-sm:left-0 max-sm:max-w-[calc(100vw-2rem-2px)]">
              {answers.answers.length} answer{answers.answers.length === 1 ? '' : 's'} to “{find.label}”, worth{' '}
              {formatPoints(find.share)} points · times in {assignment.timeZone}
            </caption>
            <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Student
                </th>
                <th scope="col" className="px-3 py-2">
                  Attempt
                </th>
                <th scope="col" className="px-3 py-2">
                  Answer as typed
                </th>
                <th scope="col" className="px-3 py-2">
                  Verdict
                </th>
                <th scope="col" className="px-3 py-2">
                  Score
                </th>
                <th scope="col" className="px-3 py-2">
                  Pitfall and message
                </th>
                <th scope="col" className="px-3 py-2">
                  Submitted
                </th>
              </tr>
            </thead>
            <tbody>
              {answers.answers.map((a) => (
                <tr key={a.partResultId} className="border-t border-line align-top">
                  <th scope="row" className="min-w-40 px-3 py-2 text-left font-normal">
                    <span className="font-medium">{a.name}</span>
                    <span className="block text-xs [overflow-wrap:anywhere] text-muted">
                      {a.email}
                      {a.section ? ` · section ${a.section}` : ''}
                    </span>
                  </th>
                  <td className="px-3 py-2 tabular-nums">{a.attempt}</td>
                  <td className="px-3 py-2 font-mono whitespace-pre-wrap">{a.answer}</td>
                  <td className={`px-3 py-2 ${TONE_TEXT[a.verdict ? VERDICT_TONES[a.verdict] : 'muted']}`}>
                    {verdictOf(a)}
                  </td>
                  <td className="px-3 py-2 tabular-nums">
                    {a.score === null ? '—' : `${formatPoints(a.score)} / ${formatPoints(a.maxScore)}`}
                  </td>
                  <td className="px-3 py-2">
                    {a.pitfall ? (
                      <>
                        <span className="font-medium">{a.pitfall.title}</span>
                        <span className="block text-xs text-muted">{a.pitfall.feedback}</span>
                      </>
                    ) : null}
                    {a.message ? <span className="block text-xs">{a.message}</span> : null}
                  </td>
                  <td className="px-3 py-2 whitespace-nowrap">
                    {formatInZone(a.submittedAt, assignment.timeZone, { withZone: false })}
                    {a.late ? (
                      <span className="ml-2 rounded bg-warn-soft px-1.5 py-0.5 text-xs font-semibold text-warn">
                        {a.daysLate} day{a.daysLate === 1 ? '' : 's'} late
                      </span>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
