// Staff only (instructors and TAs of the course): one student's record — who they are, their
// own variant of every problem with its givens and key, every answer they sent with its grade,
// their extensions and their disputes. Times in the course's zone.
import { data, href, Link } from 'react-router'
import { DisputeStatusBadge, disputeOutcomeText } from '#app/components/dispute-status.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { AnswerKeyTable } from '#app/components/answer-key-table.tsx'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { formatPoints, formatScore } from '#app/lib/points.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import {
  getStudentRecord,
  type RecordAnswer,
  type RecordAssignment,
  type RecordItem,
} from '#app/server/student-record.server.ts'
import type { Route } from './+types/$userId'
import { answerResultLabel, TONE_TEXT, VERDICT_TONES } from '#app/lib/labels.ts'
import { Table, TableHead } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `${data.record.student.name} · ${data.record.course.code} · Cyclewright` : 'Student · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const userId = requireIdParam(params.userId, 'student')
  await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const record = await getStudentRecord(db(), { courseId, userId })
  if (!record) throw data('There is no such student in this course.', { status: 404 })
  return { record }
}

function verdictOf(a: RecordAnswer): string {
  return answerResultLabel(a)
}

function lateText(a: RecordAnswer): string {
  if (a.daysLate <= 0) return 'On time'
  const pct = Math.round(a.latePenalty * 1000) / 10
  return `${a.daysLate} day${a.daysLate === 1 ? '' : 's'} late, ${pct} % off`
}

export default function StudentRecordRoute({ loaderData }: Route.ComponentProps) {
  const { record } = loaderData
  const { course, student } = record
  const tz = course.timeZone
  const when = (iso: string) => formatInZone(iso, tz, { withZone: false })
  return (
    <div className="space-y-8">
      <div>
        <p className="text-sm text-muted">
          <Link to={href('/courses/:courseId/gradebook', { courseId: String(course.id) })}>Gradebook</Link> ·{' '}
          <Link to={href('/courses/:courseId/people', { courseId: String(course.id) })}>People</Link>
        </p>
        <h1 className="mt-1 text-3xl font-semibold break-words">{student.name}</h1>
        {student.droppedAt ? (
          <p className="mt-2 inline-block rounded bg-warn-soft px-2 py-1 text-sm font-semibold text-warn">
            Dropped on {when(student.droppedAt)}: answers kept, in no total or export
          </p>
        ) : null}
        <dl className="mt-4 grid max-w-xl grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-muted">Student ID</dt>
          <dd>{student.studentNumber ?? '—'}</dd>
          <dt className="text-muted">Family, given name</dt>
          <dd>{student.givenName ? `${student.familyName}, ${student.givenName}` : student.familyName}</dd>
          <dt className="text-muted">E-mail</dt>
          <dd className="break-all">
            <a href={`mailto:${student.email}`}>{student.email}</a>
          </dd>
          <dt className="text-muted">Section</dt>
          <dd>{student.section ?? 'None'}</dd>
          <dt className="text-muted">On the roster</dt>
          <dd>
            {student.droppedAt ? 'Dropped' : 'Yes'}
            {student.joined ? '' : ' · has not joined yet'}
          </dd>
        </dl>
        <p className="mt-3 text-sm text-muted">Times in {tz}.</p>
      </div>

      <section aria-labelledby="disputes-title">
        <h2 id="disputes-title" className="text-xl font-semibold">
          Disputes
        </h2>
        {record.disputes.length === 0 ? (
          <p className="mt-2 text-muted">No disputes.</p>
        ) : (
          <Table boxClassName="mt-2" caption={<>Disputes of {student.name}</>}>
            <TableHead>
              <tr>
                <th scope="col" className="px-3 py-2">
                  Question
                </th>
                <th scope="col" className="px-3 py-2">
                  Status
                </th>
                <th scope="col" className="px-3 py-2">
                  Raised
                </th>
                <th scope="col" className="px-3 py-2">
                  Resolved
                </th>
              </tr>
            </TableHead>
            <tbody>
              {record.disputes.map((d) => (
                <tr key={d.id} className="border-t border-line align-top">
                  <th scope="row" className="px-3 py-2 text-left font-normal">
                    <Link
                      to={href('/courses/:courseId/disputes/:disputeId', {
                        courseId: String(course.id),
                        disputeId: String(d.id),
                      })}
                      className="font-medium"
                    >
                      {d.findLabel}
                    </Link>
                    <span className="block text-xs text-muted">
                      {d.assignmentTitle}, problem {d.position}
                    </span>
                  </th>
                  <td className="px-3 py-2">
                    <DisputeStatusBadge status={d.status} />
                    {disputeOutcomeText(d) ? (
                      <span className="block text-xs text-muted">{disputeOutcomeText(d)}</span>
                    ) : null}
                  </td>
                  <td className="px-3 py-2 whitespace-nowrap">{when(d.createdAt)}</td>
                  <td className="px-3 py-2">
                    {d.resolvedAt ? (
                      <>
                        <span className="whitespace-nowrap">{when(d.resolvedAt)}</span>
                        {d.resolvedBy ? <span className="block text-xs text-muted">by {d.resolvedBy}</span> : null}
                      </>
                    ) : (
                      '—'
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </Table>
        )}
      </section>

      {record.assignments.length === 0 ? (
        <p className="text-muted">This course has no assignments yet.</p>
      ) : (
        record.assignments.map((a) => (
          <AssignmentBlock key={a.id} assignment={a} courseId={course.id} when={when} studentName={student.name} />
        ))
      )}
    </div>
  )
}

function AssignmentBlock({
  assignment: a,
  courseId,
  when,
  studentName,
}: {
  assignment: RecordAssignment
  courseId: number
  when: (iso: string) => string
  studentName: string
}) {
  const headingId = `assignment-${a.id}`
  return (
    <section aria-labelledby={headingId} className="space-y-4 rounded-lg border border-line bg-white p-4 shadow-sm">
      <header>
        <h2 id={headingId} className="text-xl font-semibold">
          <Link
            to={href('/courses/:courseId/assignments/:assignmentId', {
              courseId: String(courseId),
              assignmentId: String(a.id),
            })}
          >
            {a.title}
          </Link>
        </h2>
        <p className="mt-1 text-sm text-muted">
          Due {when(a.dueAt)} · {a.attemptsPerFind} attempt{a.attemptsPerFind === 1 ? '' : 's'} per question · score{' '}
          {formatScore(a.score, a.points)}
          {a.answered === 0 ? ' · no answers yet' : ''}
        </p>
      </header>
      <div className="text-sm">
        <h3 className="font-semibold">Extension</h3>
        {a.extension ? (
          <p className="mt-1">
            {a.extension.dueAt ? `Due ${when(a.extension.dueAt)}` : 'The usual due date'}
            {a.extension.extraAttempts > 0
              ? `, ${a.extension.extraAttempts} more attempt${a.extension.extraAttempts === 1 ? '' : 's'} per question`
              : ''}
            {a.extension.reason ? ` — “${a.extension.reason}”` : ''}
            <span className="block text-xs text-muted">
              Set by {a.extension.grantedBy}, {when(a.extension.updatedAt)} ·{' '}
              <Link
                to={href('/courses/:courseId/assignments/:assignmentId/extensions', {
                  courseId: String(courseId),
                  assignmentId: String(a.id),
                })}
              >
                extensions of this assignment
              </Link>
            </span>
          </p>
        ) : (
          <p className="mt-1 text-muted">None.</p>
        )}
      </div>
      {a.items.length === 0 ? <p className="text-sm text-muted">This assignment has no problems.</p> : null}
      {a.items.map((item) => (
        <ProblemBlock key={item.position} item={item} assignmentId={a.id} when={when} studentName={studentName} />
      ))}
    </section>
  )
}

function ProblemBlock({
  item,
  assignmentId,
  when,
  studentName,
}: {
  item: RecordItem
  assignmentId: number
  when: (iso: string) => string
  studentName: string
}) {
  const headingId = `problem-${assignmentId}-${item.position}`
  return (
    <article aria-labelledby={headingId} className="space-y-3 border-t border-line pt-4">
      <h3 id={headingId} className="text-lg font-semibold">
        Problem {item.position}: {item.title}{' '}
        <span className="text-sm font-normal text-muted">({formatPoints(item.points)} points)</span>
      </h3>
      {!item.variant.ok ? (
        <p className="rounded border border-danger/30 bg-danger-soft p-2 text-sm text-danger">
          This student’s variant could not be drawn: {item.variant.message}
        </p>
      ) : (
        <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
          <section aria-label={`Givens of ${studentName}’s variant, problem ${item.position}`} className="min-w-0">
            <h4 className="text-sm font-semibold text-muted">Givens of this student’s variant</h4>
            {item.variant.givens.length === 0 ? (
              <p className="mt-1 text-sm text-muted">None.</p>
            ) : (
              <div className="mt-1 overflow-x-auto">
                <table className="w-full text-left text-sm">
                  <tbody>
                    {item.variant.givens.map((g) => (
                      <tr key={g.name} className="border-t border-line">
                        <th scope="row" className="py-1 pr-3 font-normal">
                          {g.label} <code className="text-xs text-muted">{g.name}</code>
                        </th>
                        <td className="py-1 tabular-nums">{g.text}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </section>
          <div className="min-w-0 overflow-x-auto">
            <AnswerKeyTable caption="Key of this student’s variant" entries={item.variant.key} />
          </div>
        </div>
      )}
      {item.finds.map((f) => (
        <div key={f.name}>
          <h4 className="text-sm font-semibold">
            {f.label}
            {f.unit ? <span className="font-normal text-muted"> ({f.unit})</span> : null}
            <span className="font-normal text-muted">
              {' '}
              · best {f.best === null ? '—' : formatScore(f.best, f.share)}
            </span>
          </h4>
          {f.answers.length === 0 ? (
            <p className="mt-1 text-sm text-muted">No answers yet.</p>
          ) : (
            <AnswerTable answers={f.answers} when={when} caption={`Answers to “${f.label}”`} />
          )}
        </div>
      ))}
      {item.otherAnswers.length > 0 ? (
        <div>
          <h4 className="text-sm font-semibold">Answers to questions this problem no longer asks</h4>
          <AnswerTable answers={item.otherAnswers} when={when} caption="Answers to questions no longer asked" />
        </div>
      ) : null}
    </article>
  )
}

function AnswerTable({
  answers,
  when,
  caption,
}: {
  answers: readonly RecordAnswer[]
  when: (iso: string) => string
  caption: string
}) {
  return (
    <div className="mt-1 overflow-x-auto rounded border border-line">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
          <tr>
            <th scope="col" className="px-3 py-1.5">
              Attempt
            </th>
            <th scope="col" className="px-3 py-1.5">
              Answer as typed
            </th>
            <th scope="col" className="px-3 py-1.5">
              Verdict
            </th>
            <th scope="col" className="px-3 py-1.5">
              Score
            </th>
            <th scope="col" className="px-3 py-1.5">
              Sent
            </th>
            <th scope="col" className="px-3 py-1.5">
              Late
            </th>
            <th scope="col" className="px-3 py-1.5">
              Pitfall and message
            </th>
          </tr>
        </thead>
        <tbody>
          {answers.map((a) => (
            <tr key={a.partResultId} className="border-t border-line align-top">
              <th scope="row" className="px-3 py-1.5 font-normal tabular-nums">
                {a.attempt}
              </th>
              <td className="px-3 py-1.5 font-mono whitespace-pre-wrap">{a.answer}</td>
              <td className={`px-3 py-1.5 ${TONE_TEXT[a.verdict ? VERDICT_TONES[a.verdict] : 'muted']}`}>
                {verdictOf(a)}
              </td>
              <td className="px-3 py-1.5 whitespace-nowrap tabular-nums">
                {a.score === null ? '—' : formatScore(a.score, a.maxScore)}
              </td>
              <td className="px-3 py-1.5 whitespace-nowrap">{when(a.submittedAt)}</td>
              <td className="px-3 py-1.5 whitespace-nowrap">{lateText(a)}</td>
              <td className="px-3 py-1.5">
                {a.pitfall ? (
                  <>
                    <span className="font-medium">{a.pitfall.title}</span>
                    <span className="block text-xs text-muted">{a.pitfall.feedback}</span>
                  </>
                ) : null}
                {a.message ? <span className="block text-xs">{a.message}</span> : null}
                {!a.pitfall && !a.message ? '—' : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
