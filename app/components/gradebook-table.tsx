/**
 * The staff gradebook tables and their filter form. Every control is a link or a GET form, so
 * filters, sorting and expanding work before (or without) JavaScript; the page swaps in fresh
 * data from its /api/ route while answers are being graded.
 */
import { Form, href, Link } from 'react-router'
import { formatInZone } from '#app/lib/dates.ts'
import { formatPoints } from '#app/lib/points.ts'
import type {
  AssignmentGradebook,
  CourseGradebook,
  DroppedStudent,
  GradebookSort,
  GradebookStatusFilter,
  GradebookView,
  StudentStatus,
} from '#app/server/gradebook.server.ts'
import { LATE_LABEL, STUDENT_STATUS_LABELS } from '#app/lib/labels.ts'

export const statusLabels: Readonly<Record<StudentStatus, string>> = STUDENT_STATUS_LABELS

const filterLabels = {
  all: 'All',
  ...STUDENT_STATUS_LABELS,
  late: LATE_LABEL,
} as const satisfies Record<GradebookStatusFilter, string>

/** The view as search params, leaving out defaults so links stay short. */
export function viewParams(view: GradebookView, change: Partial<GradebookView> = {}): URLSearchParams {
  const v = { ...view, ...change }
  const p = new URLSearchParams()
  if (v.section) p.set('section', v.section)
  if (v.status !== 'all') p.set('status', v.status)
  if (v.q) p.set('q', v.q)
  if (v.sort !== 'name') p.set('sort', v.sort)
  if (v.dir !== 'asc') p.set('dir', v.dir)
  if (v.expand) p.set('expand', v.expand)
  return p
}

function hrefFor(view: GradebookView, change: Partial<GradebookView>): string {
  const s = viewParams(view, change).toString()
  return s ? `?${s}` : '?'
}

/**
 * On a phone a gradebook scrolls inside its box: its caption stays in view above it (no wider
 * than the box: the screen less the page's padding and the box's border), and so does the
 * student column, so every score is read beside its student.
 */
const PHONE_CAPTION =
  'px-3 py-2 text-left text-sm text-muted max-sm:sticky max-sm:left-0 max-sm:max-w-[calc(100vw-2rem-2px)]'
const STUDENT_HEADER = 'sticky left-0 z-10 bg-paper px-3 py-2 shadow-[1px_0_0_var(--color-line)]'

function SortHeader({
  view,
  sort,
  children,
  className,
}: {
  view: GradebookView
  sort: GradebookSort
  children: React.ReactNode
  className?: string
}) {
  const active = view.sort === sort
  const nextDir = active && view.dir === 'asc' ? 'desc' : 'asc'
  return (
    <th
      scope="col"
      className={className ?? 'px-3 py-2'}
      aria-sort={active ? (view.dir === 'asc' ? 'ascending' : 'descending') : undefined}
    >
      <Link
        to={hrefFor(view, { sort, dir: nextDir })}
        preventScrollReset
        className="inline-flex items-center gap-1 underline-offset-2 hover:underline"
      >
        {children}
        <span aria-hidden="true">{active ? (view.dir === 'asc' ? '▲' : '▼') : '↕'}</span>
        <span className="sr-only">
          {active
            ? `, sorted ${view.dir === 'asc' ? 'ascending' : 'descending'}; sort the other way`
            : ', sort by this column'}
        </span>
      </Link>
    </th>
  )
}

/** Section, status and search as a GET form; the sort and expansion ride along hidden. */
export function GradebookFilters({ view, sections }: { view: GradebookView; sections: readonly string[] }) {
  return (
    <Form method="get" className="mt-4 flex flex-wrap items-end gap-3" role="search" aria-label="Filter the gradebook">
      <div className="flex flex-col gap-1">
        <label htmlFor="gb-section" className="text-sm font-medium">
          Section
        </label>
        <select
          id="gb-section"
          name="section"
          defaultValue={view.section}
          className="rounded-md border border-line bg-white px-3 py-2"
        >
          <option value="">All sections</option>
          {sections.map((s) => (
            <option key={s} value={s}>
              {s}
            </option>
          ))}
        </select>
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor="gb-status" className="text-sm font-medium">
          Status
        </label>
        <select
          id="gb-status"
          name="status"
          defaultValue={view.status}
          className="rounded-md border border-line bg-white px-3 py-2"
        >
          {Object.entries(filterLabels).map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </select>
      </div>
      <div className="flex w-full flex-col gap-1 sm:w-auto">
        <label htmlFor="gb-q" className="text-sm font-medium">
          Name, e-mail or student ID
        </label>
        <input
          id="gb-q"
          name="q"
          type="search"
          defaultValue={view.q}
          maxLength={200}
          className="w-full rounded-md border border-line px-3 py-2 sm:w-56"
        />
      </div>
      {view.sort !== 'name' ? <input type="hidden" name="sort" value={view.sort} /> : null}
      {view.dir !== 'asc' ? <input type="hidden" name="dir" value={view.dir} /> : null}
      {view.expand ? <input type="hidden" name="expand" value={view.expand} /> : null}
      <button
        type="submit"
        className="min-h-11 rounded-md bg-accent px-4 py-2 text-sm font-semibold text-white hover:bg-accent-strong sm:min-h-0"
      >
        Show
      </button>
      <Link to="?" className="inline-flex min-h-11 items-center text-sm underline sm:min-h-0 sm:py-2">
        Clear
      </Link>
    </Form>
  )
}

function StatusCell({ status, late, pending }: { status: StudentStatus; late: boolean; pending: number }) {
  return (
    <td className="px-3 py-2 whitespace-nowrap">
      {statusLabels[status]}
      {pending > 0 ? <span className="ml-1 text-muted">({pending} waiting)</span> : null}
      {late ? (
        <span className="ml-2 rounded bg-warn-soft px-1.5 py-0.5 text-xs font-semibold text-warn">{LATE_LABEL}</span>
      ) : null}
    </td>
  )
}

/** "Adams, Ada" (family name first, as the rows are sorted), or the display name alone. */
export function sortedName(s: { familyName: string; givenName: string }): string {
  return s.givenName ? `${s.familyName}, ${s.givenName}` : s.familyName
}

function StudentCell({
  student,
  href,
}: {
  student: { familyName: string; givenName: string; email: string; studentNumber: string | null }
  href: string
}) {
  return (
    <th
      scope="row"
      className="sticky left-0 min-w-40 bg-white px-3 py-2 text-left font-normal shadow-[1px_0_0_var(--color-line)]"
    >
      <Link to={href} className="font-medium">
        {sortedName(student)}
      </Link>
      <span className="block text-xs [overflow-wrap:anywhere] text-muted">
        {student.studentNumber ? <>ID {student.studentNumber} · </> : null}
        {student.email}
      </span>
    </th>
  )
}

/** Dropped students, apart from the table and from every total: collapsed until opened. */
export function DroppedStudents({ dropped, timeZone }: { dropped: readonly DroppedStudent[]; timeZone: string }) {
  if (dropped.length === 0) return null
  return (
    <details className="mt-6 rounded-lg border border-line bg-white px-3 py-2 text-sm">
      <summary className="cursor-pointer font-medium">
        Dropped students ({dropped.length}) — not in any total or export
      </summary>
      <ul className="mt-2 space-y-1">
        {dropped.map((d) => (
          <li key={d.userId} className="[overflow-wrap:anywhere]">
            {sortedName(d)}{' '}
            <span className="text-muted">
              · {d.studentNumber ? `ID ${d.studentNumber} · ` : ''}
              {d.email}
              {d.section ? ` · section ${d.section}` : ''} · dropped {formatInZone(d.droppedAt, timeZone)}
            </span>
          </li>
        ))}
      </ul>
    </details>
  )
}

function EmptyRows({ studentCount }: { studentCount: number }) {
  return (
    <p className="mt-4 text-muted">
      {studentCount === 0 ? 'No students have joined this course yet.' : 'No students match these filters.'}{' '}
      {studentCount > 0 ? (
        <Link to="?" className="underline">
          Show everyone
        </Link>
      ) : null}
    </p>
  )
}

/** Students × problems; with `view.expand` each problem opens into its finds. */
export function AssignmentGradebookTable({ data, basePath }: { data: AssignmentGradebook; basePath: string }) {
  const { view, items } = data
  const expanded = view.expand === '1'
  if (data.students.length === 0) return <EmptyRows studentCount={data.studentCount} />
  return (
    <div className="relative mt-4 overflow-x-auto rounded-lg border border-line bg-white">
      <table className="w-full text-left text-sm">
        <caption className={PHONE_CAPTION}>
          {data.students.length} of {data.studentCount} students · scores out of each problem’s points
          {expanded ? ', then each question’s score and attempts' : ''}
        </caption>
        <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
          <tr>
            <SortHeader view={view} sort="name" className={STUDENT_HEADER}>
              Student
            </SortHeader>
            <SortHeader view={view} sort="section">
              Section
            </SortHeader>
            {items.map((item) =>
              expanded ? (
                item.finds.map((f) => (
                  <th key={`${item.position}-${f.name}`} scope="col" className="px-3 py-2">
                    <Link
                      to={`${basePath}/problems/${item.position}/answers?find=${encodeURIComponent(f.name)}`}
                      className="underline-offset-2 hover:underline"
                    >
                      {item.position}. {f.name}
                    </Link>
                    <span className="block font-normal normal-case">/ {formatPoints(f.share)}</span>
                  </th>
                ))
              ) : (
                <th key={item.position} scope="col" className="px-3 py-2">
                  <Link
                    to={`${basePath}/problems/${item.position}/answers`}
                    className="underline-offset-2 hover:underline"
                    title={item.title}
                  >
                    Problem {item.position}
                  </Link>
                  <span className="block font-normal normal-case">/ {formatPoints(item.points)}</span>
                </th>
              ),
            )}
            <SortHeader view={view} sort="total">
              Total / {formatPoints(data.assignment.points)}
            </SortHeader>
            <th scope="col" className="px-3 py-2">
              Status
            </th>
          </tr>
        </thead>
        <tbody>
          {data.students.map((s) => (
            <tr key={s.userId} className="border-t border-line align-top">
              <StudentCell
                student={s}
                href={href('/courses/:courseId/students/:userId', {
                  courseId: String(data.assignment.courseId),
                  userId: String(s.userId),
                })}
              />
              <td className="px-3 py-2">{s.section ?? '—'}</td>
              {s.items.map((item) =>
                expanded ? (
                  item.finds.map((f) => (
                    <td key={`${item.position}-${f.name}`} className="px-3 py-2 whitespace-nowrap tabular-nums">
                      {f.attempts === 0 ? (
                        <>
                          0<span className="block text-xs text-muted">not answered</span>
                        </>
                      ) : (
                        <>
                          {formatPoints(f.score)}
                          {f.correct ? <span className="ml-1 text-ok">✓</span> : null}
                          <span className="block text-xs text-muted">
                            {f.attempts} attempt{f.attempts === 1 ? '' : 's'}
                            {f.pending > 0 ? ', grading…' : ''}
                          </span>
                        </>
                      )}
                    </td>
                  ))
                ) : (
                  <td key={item.position} className="px-3 py-2 tabular-nums">
                    {formatPoints(item.score)}
                  </td>
                ),
              )}
              <td className="px-3 py-2 font-semibold tabular-nums">
                {formatPoints(s.total)}
                {s.extension ? <span className="block text-xs font-normal text-muted">extension</span> : null}
              </td>
              <StatusCell status={s.status} late={s.late} pending={s.pending} />
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  )
}

export function ExpandLink({ view }: { view: GradebookView }) {
  const expanded = view.expand === '1'
  return (
    <Link to={hrefFor(view, { expand: expanded ? undefined : '1' })} preventScrollReset className="text-sm underline">
      {expanded ? 'Show problems only' : 'Show each question'}
    </Link>
  )
}

/** Students × assignments with the course total. */
export function CourseGradebookTable({ data }: { data: CourseGradebook }) {
  const { view } = data
  if (data.students.length === 0) return <EmptyRows studentCount={data.studentCount} />
  return (
    <div className="relative mt-4 overflow-x-auto rounded-lg border border-line bg-white">
      <table className="w-full text-left text-sm">
        <caption className={PHONE_CAPTION}>
          {data.students.length} of {data.studentCount} students · scores out of each assignment’s points; “—” marks an
          assignment not counted yet
        </caption>
        <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
          <tr>
            <SortHeader view={view} sort="name" className={STUDENT_HEADER}>
              Student
            </SortHeader>
            <SortHeader view={view} sort="section">
              Section
            </SortHeader>
            {data.assignments.map((a) => (
              <th key={a.id} scope="col" className="min-w-32 px-3 py-2">
                <Link
                  to={href('/courses/:courseId/assignments/:assignmentId/gradebook', {
                    courseId: String(data.course.id),
                    assignmentId: String(a.id),
                  })}
                  className="underline-offset-2 hover:underline"
                >
                  {a.title}
                </Link>
                <span className="block font-normal normal-case">/ {formatPoints(a.points)}</span>
                {a.counted ? null : (
                  <span className="block font-normal normal-case">
                    {a.stage === 'not-open' ? 'not open yet' : 'not due yet'}: not counted
                  </span>
                )}
              </th>
            ))}
            <SortHeader view={view} sort="total">
              Total / {formatPoints(data.points)}
            </SortHeader>
            <th scope="col" className="px-3 py-2">
              Status
            </th>
          </tr>
        </thead>
        <tbody>
          {data.students.map((s) => (
            <tr key={s.userId} className="border-t border-line align-top">
              <StudentCell
                student={s}
                href={href('/courses/:courseId/students/:userId', {
                  courseId: String(data.course.id),
                  userId: String(s.userId),
                })}
              />
              <td className="px-3 py-2">{s.section ?? '—'}</td>
              {s.assignments.map((c) => (
                <td key={c.assignmentId} className="px-3 py-2 whitespace-nowrap tabular-nums">
                  {c.counted ? (
                    formatPoints(c.score)
                  ) : (
                    <span className="text-muted" title="Not counted: not due yet">
                      —<span className="sr-only">not counted</span>
                    </span>
                  )}
                  {c.late ? <span className="ml-1 text-xs font-semibold text-warn">late</span> : null}
                  {c.pending > 0 ? <span className="block text-xs text-muted">grading…</span> : null}
                </td>
              ))}
              <td className="px-3 py-2 font-semibold tabular-nums">{formatPoints(s.total)}</td>
              <StatusCell status={s.status} late={s.late} pending={s.pending} />
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  )
}
