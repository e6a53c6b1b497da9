// Staff only (instructors and TAs of the course): how an assignment went, per problem and per
// question — mean, median, a histogram, right at the first attempt, common wrong answers.
import { data, href, Link } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { formatPoints } from '#app/lib/points.ts'
import { Histogram } from '#app/components/histogram.tsx'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getAssignmentStatistics, type FindStatistics, type ScoreSummary } from '#app/server/gradebook.server.ts'
import type { Route } from './+types/statistics'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Statistics: ${data.statistics.assignment.title} · Cyclewright` : 'Statistics · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const statistics = await getAssignmentStatistics(db(), assignmentId, courseId)
  if (!statistics) throw data('There is no such assignment in this course.', { status: 404 })
  return { course, statistics }
}

const pct = (x: number | null) => (x === null ? '—' : `${Math.round(x * 1000) / 10} %`)

function SummaryList({ summary, firstTry }: { summary: ScoreSummary; firstTry?: FindStatistics['firstTry'] }) {
  return (
    <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
      <div>
        <dt className="text-muted">Students graded</dt>
        <dd className="font-semibold">{summary.count}</dd>
      </div>
      <div>
        <dt className="text-muted">Mean</dt>
        <dd className="font-semibold">{pct(summary.mean)}</dd>
      </div>
      <div>
        <dt className="text-muted">Median</dt>
        <dd className="font-semibold">{pct(summary.median)}</dd>
      </div>
      {firstTry ? (
        <div>
          <dt className="text-muted">Right at the first attempt</dt>
          <dd className="font-semibold">
            {pct(firstTry.share)}
            {firstTry.of > 0 ? (
              <span className="font-normal text-muted">
                {' '}
                ({firstTry.correct} of {firstTry.of})
              </span>
            ) : null}
          </dd>
        </div>
      ) : null}
    </dl>
  )
}

type Group = FindStatistics['wrongAnswers'][number]

function multipleText(m: number): string {
  return `× ${m.toLocaleString('en', { maximumSignificantDigits: 3 })}`
}

/** One table of grouped wrong answers: by multiple of each student's key, or by value. */
function GroupTable({
  groups,
  caption,
  first,
  show,
}: {
  groups: readonly Group[]
  caption: string
  first: string
  show: (g: Group) => string
}) {
  return (
    <table className="mt-2 w-full text-left text-sm">
      <caption className="text-left text-sm font-medium">{caption}</caption>
      <thead className="text-xs tracking-wide text-muted uppercase">
        <tr>
          <th scope="col" className="py-1 pr-3">
            {first}
          </th>
          <th scope="col" className="py-1 pr-3">
            Answers
          </th>
          <th scope="col" className="py-1 pr-3">
            As typed
          </th>
          <th scope="col" className="py-1">
            Pitfall that explains it
          </th>
        </tr>
      </thead>
      <tbody>
        {groups.map((g) => (
          <tr key={g.value} className="border-t border-line align-top">
            <td className="py-1 pr-3 tabular-nums">{show(g)}</td>
            <td className="py-1 pr-3 tabular-nums">{g.count}</td>
            <td className="min-w-24 py-1 pr-3 font-mono text-xs [overflow-wrap:anywhere]">{g.examples.join(' · ')}</td>
            <td className="py-1">
              {g.pitfall ? (
                <>
                  <span className="font-medium">{g.pitfall.title}</span>{' '}
                  <span className="text-muted">
                    ({g.pitfall.count} of {g.count})
                  </span>
                </>
              ) : (
                <span className="text-muted">None recognised</span>
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  )
}

function WrongAnswers({ find }: { find: FindStatistics }) {
  if (find.wrongAnswers.length === 0)
    return <p className="mt-2 text-sm text-muted">No wrong answers with a number yet.</p>
  return (
    <>
      {find.wrongMultiples.length > 0 ? (
        <GroupTable
          groups={find.wrongMultiples}
          caption="Most common wrong answers as a multiple of each student’s own key (the same slip gives the same multiple whatever the numbers)"
          first="Multiple of the key"
          show={(g) => multipleText(g.value)}
        />
      ) : null}
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer">Most common wrong values</summary>
        <GroupTable
          groups={find.wrongAnswers}
          caption="Values equal to 3 significant figures are grouped; students have different numbers, so equal values are rare"
          first={`Value${find.unit ? ` (${find.unit})` : ''}`}
          show={(g) => String(g.value)}
        />
      </details>
    </>
  )
}

export default function AssignmentStatisticsRoute({ loaderData }: Route.ComponentProps) {
  const { course, statistics } = loaderData
  const { assignment } = statistics
  const base = href('/courses/:courseId/assignments/:assignmentId', {
    courseId: String(course.id),
    assignmentId: String(assignment.id),
  })
  return (
    <div>
      <p className="text-sm text-muted">
        <Link to={base}>{assignment.title}</Link> · <Link to={`${base}/gradebook`}>Gradebook</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Statistics: {assignment.title}</h1>
      <p className="mt-1 text-sm text-muted">
        Scores are shares of the points: each student’s best answer to each question, late penalties included, over the
        students with a graded answer. Answers still being graded are not counted yet.
      </p>
      {statistics.items.length === 0 ? (
        <p className="mt-6 text-muted">This assignment has no problems yet.</p>
      ) : statistics.gradedAnswers === 0 ? (
        <p className="mt-6 text-muted">No answers yet.</p>
      ) : (
        statistics.items.map((item) => (
          <section
            key={item.position}
            aria-labelledby={`problem-${item.position}`}
            className="mt-8 rounded-lg border border-line bg-white p-4 shadow-sm sm:p-5"
          >
            <h2 id={`problem-${item.position}`} className="text-xl font-semibold">
              Problem {item.position}: {item.title}{' '}
              <span className="text-base font-normal text-muted">({formatPoints(item.points)} points)</span>
            </h2>
            <div className="mt-3">
              <SummaryList summary={item.summary} />
              <Histogram bins={item.summary.histogram} title={`Problem ${item.position}, scores`} />
            </div>
            {item.finds.map((f) => (
              <section
                key={f.name}
                aria-labelledby={`find-${item.position}-${f.name}`}
                className="mt-6 border-t border-line pt-4"
              >
                <h3 id={`find-${item.position}-${f.name}`} className="text-lg font-semibold">
                  {f.label}
                  {f.unit ? ` (${f.unit})` : ''}{' '}
                  <span className="text-sm font-normal text-muted">· {formatPoints(f.share)} points</span>
                </h3>
                <p className="text-sm">
                  <Link
                    to={`${base}/problems/${item.position}/answers?find=${encodeURIComponent(f.name)}`}
                    className="underline"
                  >
                    Every answer to this question
                  </Link>
                </p>
                {f.summary.count === 0 ? (
                  <p className="mt-2 text-sm text-muted">No answers yet.</p>
                ) : (
                  <>
                    <div className="mt-2">
                      <SummaryList summary={f.summary} firstTry={f.firstTry} />
                    </div>
                    <Histogram bins={f.summary.histogram} title={`${f.label}, scores`} />
                    <WrongAnswers find={f} />
                  </>
                )}
              </section>
            ))}
          </section>
        ))
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
