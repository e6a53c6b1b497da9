import { href, Link, redirect } from 'react-router'
import { primaryRole, roleLabels } from '#app/domain/permissions.ts'
import { conventionText } from '#app/lib/conventions.ts'
import { inSentence, LATE_LABEL, SWEEP_STATUS_LABELS } from '#app/lib/labels.ts'
import { getUser } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { getHomeData, type HomeData } from '#app/server/home.server.ts'
import { toActor } from '#app/server/users.server.ts'
import type { Route } from './+types/home'
import { EmptyState } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = () => [{ title: 'Home · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request)
  if (!user) throw redirect(href('/sign-in'))
  const home = await getHomeData(db(), user)
  return { name: user.name, role: primaryRole(toActor(user)), courses: user.courses, home }
}

const intros = {
  admin: 'You look after the department: its courses, people and grade exports.',
  instructor: 'Your courses. Build problem banks, set assignments and follow your gradebooks.',
  ta: 'The courses you assist in. Review disputed answers and follow the gradebooks.',
  student: 'Your courses and the problems set for you.',
  none: 'You are not in any course yet. When an instructor invites you, the course appears here.',
} as const

const headings = {
  admin: 'Department overview',
  instructor: 'Teaching',
  ta: 'Assisting',
  student: 'Your courses',
  none: 'Welcome',
} as const

export default function HomeRoute({ loaderData }: Route.ComponentProps) {
  const { name, role, courses, home } = loaderData
  return (
    <div data-home-role={role}>
      <p className="text-sm text-muted">Signed in as {name}</p>
      <h1 className="mt-1 text-3xl font-semibold">{headings[role]}</h1>
      <p className="mt-2 max-w-2xl text-muted">{intros[role]}</p>
      {role === 'instructor' ? (
        <p className="mt-4">
          <Link to={href('/bank')}>Your problem bank</Link>: write randomised problems once and reuse them in any
          course.
        </p>
      ) : null}
      {role === 'admin' ? (
        <p className="mt-4 flex gap-4">
          <Link to={href('/admin')}>All courses of the department</Link>
          <Link to={href('/admin/outbox')}>Outbox (mail sent by the demo)</Link>
        </p>
      ) : null}
      <ToDo home={home} />
      {courses.length === 0 ? (
        role === 'admin' ? null : (
          <EmptyState className="mt-8">No courses yet.</EmptyState>
        )
      ) : (
        <ul className="mt-8 grid gap-4 sm:grid-cols-2" aria-label="Courses">
          {courses.map((c) => (
            <li key={c.id} className="rounded-lg border border-line bg-white p-5 shadow-sm">
              <p className="text-xs font-semibold tracking-wide text-muted uppercase">
                {c.termName} · {roleLabels[c.role]}
              </p>
              <h2 className="mt-1 text-xl font-semibold">
                <Link to={href('/courses/:courseId', { courseId: String(c.id) })}>
                  {c.code} {c.title}
                </Link>
              </h2>
              <p className="mt-2 text-sm text-muted">
                {conventionText[c.signConvention].label}: {conventionText[c.signConvention].equation}
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  )
}

/** What needs doing, per role: due work for students, the review queue for TAs, what waits on instructors. */
function ToDo({ home }: { home: HomeData }) {
  const waiting = home.staff.filter((c) => c.openDisputes > 0 || c.unreleased.length > 0 || c.pendingInvitations > 0)
  return (
    <>
      {home.student.length > 0 ? (
        <section aria-labelledby="due-title" className="mt-8">
          <h2 id="due-title" className="text-xl font-semibold">
            Due next
          </h2>
          {home.student.every((c) => c.due.length === 0) ? (
            <p className="mt-2 text-muted">Nothing is due right now.</p>
          ) : null}
          <div className="mt-3 grid gap-4">
            {home.student.map((c) =>
              c.dropped ? (
                <p key={c.courseId} className="text-sm text-muted">
                  {c.code}: you have been dropped from this course; your past work can still be read there.
                </p>
              ) : c.due.length === 0 && c.opening.length === 0 ? null : (
                <div key={c.courseId} className="rounded-lg border border-line bg-white p-4" data-due-course={c.code}>
                  <h3 className="font-semibold">
                    <Link to={href('/courses/:courseId', { courseId: String(c.courseId) })}>
                      {c.code} {c.title}
                    </Link>
                  </h3>
                  {c.due.length > 0 ? (
                    <ul className="mt-2 grid gap-2">
                      {c.due.map((d) => (
                        <li
                          key={d.assignmentId}
                          data-due={d.title}
                          className={d.late ? 'rounded border-l-4 border-warn pl-2' : 'pl-3'}
                        >
                          <Link to={d.href} className="font-medium">
                            {d.title}
                          </Link>
                          {d.late ? (
                            <span className="ml-2 rounded bg-warn-soft px-1.5 py-0.5 text-xs font-semibold text-warn">
                              {LATE_LABEL}
                            </span>
                          ) : null}
                          <div className="text-sm text-muted">
                            Due {d.dueText} · {d.timeLeft} · {d.progress}
                          </div>
                        </li>
                      ))}
                    </ul>
                  ) : (
                    <p className="mt-2 text-sm text-muted">Nothing due in this course right now.</p>
                  )}
                  {c.opening.length > 0 ? (
                    <p className="mt-2 text-sm text-muted">
                      Opening next: {c.opening.map((o) => `${o.title} (${o.opensText})`).join('; ')}
                    </p>
                  ) : null}
                </div>
              ),
            )}
          </div>
        </section>
      ) : null}
      {home.staff.length > 0 || home.failedChecks.length > 0 ? (
        <section aria-labelledby="waiting-title" className="mt-8">
          <h2 id="waiting-title" className="text-xl font-semibold">
            Waiting for you
          </h2>
          {waiting.length === 0 && home.failedChecks.length === 0 ? (
            <p className="mt-2 text-muted">
              Nothing is waiting: no open disputes, no grades to release, no failed checks.
            </p>
          ) : null}
          <ul className="mt-3 grid gap-3">
            {waiting.map((c) => (
              <li key={c.courseId} className="rounded-lg border border-line bg-white p-4" data-waiting-course={c.code}>
                <h3 className="font-semibold">
                  <Link to={href('/courses/:courseId', { courseId: String(c.courseId) })}>
                    {c.code} {c.title}
                  </Link>
                </h3>
                <ul className="mt-1 list-disc pl-5 text-sm">
                  {c.openDisputes > 0 ? (
                    <li>
                      <Link to={c.reviewHref}>
                        {c.openDisputes} open dispute{c.openDisputes === 1 ? '' : 's'} in the review queue
                      </Link>
                      {c.oldestDisputeText ? `, ${c.oldestDisputeText}` : ''} (oldest first)
                    </li>
                  ) : null}
                  {c.unreleased.map((u) => (
                    <li key={u.assignmentId}>
                      <Link to={u.href}>{u.title}</Link>: due {u.dueText}, grades not released
                    </li>
                  ))}
                  {c.pendingInvitations > 0 ? (
                    <li>
                      <Link to={href('/courses/:courseId/people', { courseId: String(c.courseId) })}>
                        {c.pendingInvitations} invitation{c.pendingInvitations === 1 ? '' : 's'} not yet accepted
                      </Link>
                    </li>
                  ) : null}
                </ul>
              </li>
            ))}
            {home.failedChecks.length > 0 ? (
              <li className="rounded-lg border border-line bg-white p-4">
                <h3 className="font-semibold">Checks of your problems that failed</h3>
                <ul className="mt-1 list-disc pl-5 text-sm">
                  {home.failedChecks.map((f) => (
                    <li key={f.problemId}>
                      <Link to={`${href('/bank/:problemId', { problemId: String(f.problemId) })}#check`}>
                        {f.title}
                      </Link>
                      :{' '}
                      {f.status === 'failed'
                        ? `the check ${inSentence(SWEEP_STATUS_LABELS.failed)} before it finished`
                        : `${f.failed} of ${f.total} variants failed`}
                    </li>
                  ))}
                </ul>
              </li>
            ) : null}
          </ul>
        </section>
      ) : null}
    </>
  )
}
