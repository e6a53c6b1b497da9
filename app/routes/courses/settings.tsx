import { data, Form, href, Link, redirect, useNavigation } from 'react-router'
import { ConventionChoice, TimeZoneField } from '#app/components/course-fields.tsx'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { SelectField } from '#app/components/ui/select-field.tsx'
import { formatCalendarDate, formatDayOffset } from '#app/lib/calendar-dates.ts'
import { CONVENTIONS } from '#app/domain/thermo/conventions.ts'
import { type FieldErrors, parseForm, readFormData } from '#app/lib/form.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { CopyCourseFormSchema, copyCourse } from '#app/server/course-copy.server.ts'
import {
  CourseSettingsFormSchema,
  courseSettingsPage,
  updateCourseSettings,
  formValues,
} from '#app/server/courses.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/settings'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Settings · ${data.course.code} · Cyclewright` : 'Course settings · Cyclewright' },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  await requireCourseRole(request, courseId, ['instructor'])
  const page = await courseSettingsPage(db(), courseId)
  if (!page) throw data('There is no such course.', { status: 404 })
  const search = new URL(request.url).searchParams
  return { ...page, saved: search.get('saved') === '1', copied: search.get('copied') === '1' }
}

type Answer = { intent: 'save' | 'copy'; fieldErrors: FieldErrors; values: Record<string, string> }

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user } = await requireCourseRole(request, courseId, ['instructor'])
  const formData = await readFormData(request)
  const intent = formData.get('intent')
  if (intent === 'copy') {
    const form = parseForm(formData, CopyCourseFormSchema)
    if (!form.ok)
      return data<Answer>({ intent: 'copy', fieldErrors: form.fieldErrors, values: form.values }, { status: 400 })
    const copied = await copyCourse(db(), { actorId: user.id, courseId, input: form.value })
    if (!copied.ok)
      return data<Answer>(
        { intent: 'copy', fieldErrors: copied.fieldErrors, values: formValues(formData) },
        { status: 400 },
      )
    return redirect(`${href('/courses/:courseId/settings', { courseId: String(copied.courseId) })}?copied=1`)
  }
  if (intent !== 'save')
    throw data('This form could not be read. Go back to the page and send it from there.', { status: 400 })
  const form = parseForm(formData, CourseSettingsFormSchema)
  if (!form.ok)
    return data<Answer>({ intent: 'save', fieldErrors: form.fieldErrors, values: form.values }, { status: 400 })
  const saved = await updateCourseSettings(db(), { actorId: user.id, courseId, input: form.value })
  if (!saved.ok)
    return data<Answer>(
      { intent: 'save', fieldErrors: saved.fieldErrors, values: formValues(formData) },
      { status: 400 },
    )
  return redirect(`${href('/courses/:courseId/settings', { courseId: String(courseId) })}?saved=1`)
}

export default function CourseSettingsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, impact, copyTerms, assignmentCount, instructorCount, copyOf, saved, copied } = loaderData
  const navigation = useNavigation()
  const busyIntent = navigation.state === 'submitting' ? navigation.formData?.get('intent') : null
  const save = actionData?.intent === 'save' ? actionData : null
  const copy = actionData?.intent === 'copy' ? actionData : null
  const sv = save?.values ?? {}
  const se = save?.fieldErrors ?? {}
  const cv = copy?.values ?? {}
  const ce = copy?.fieldErrors ?? {}
  // Saved settings come back as new defaults: the forms start afresh when they change.
  const savedKey = [course.code, course.title, course.timeZone, course.signConvention].join('|')
  return (
    <div>
      <p className="text-sm text-muted">{course.termName}</p>
      <h1 className="mt-1 text-3xl font-semibold">Course settings</h1>
      {copied && copyOf ? (
        <Notice tone="ok" className="mt-4">
          This is the copy of {copyOf.code} ({copyOf.termName}) for {course.termName}: {copyOf.assignments} assignment
          {copyOf.assignments === 1 ? '' : 's'}, dates moved by {formatDayOffset(copyOf.offsetDays)}. Keys and grades
          are not released.{' '}
          <Link to={href('/courses/:courseId', { courseId: String(course.id) })}>Open the course page</Link> to check
          the assignments.
        </Notice>
      ) : null}
      {saved ? (
        <Notice tone="ok" className="mt-4">
          The settings were saved.
        </Notice>
      ) : null}

      <section
        aria-labelledby="settings-title"
        className="mt-6 max-w-2xl rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6"
      >
        <h2 id="settings-title" className="text-xl font-semibold">
          Settings
        </h2>
        <Form key={savedKey} method="post" noValidate className="mt-4 grid gap-5">
          <input type="hidden" name="intent" value="save" />
          <div className="grid gap-5 sm:grid-cols-[10rem_1fr]">
            <Field
              label="Code"
              name="code"
              required
              maxLength={24}
              defaultValue={sv.code ?? course.code}
              error={se.code}
            />
            <Field
              label="Title"
              name="title"
              required
              maxLength={120}
              defaultValue={sv.title ?? course.title}
              error={se.title}
            />
          </div>
          <TimeZoneField
            defaultValue={sv.timeZone ?? course.timeZone}
            error={se.timeZone}
            hint="A zone name such as Europe/Oslo. Dates already set stay the same moments; from then on the course shows and reads times in the new zone."
          />
          <ConventionChoice
            defaultValue={sv.signConvention ?? course.signConvention}
            error={se.signConvention}
            hint={<ConventionWarning impact={impact} current={course.signConvention} />}
          />
          {impact.answers > 0 ? (
            <ConfirmConvention
              error={se.confirmConvention}
              checked={sv.confirmConvention === 'yes'}
              answers={impact.answers}
            />
          ) : null}
          <div>
            <Button type="submit" disabled={busyIntent === 'save'}>
              {busyIntent === 'save' ? 'Saving…' : 'Save settings'}
            </Button>
          </div>
        </Form>
      </section>

      <section
        aria-labelledby="copy-title"
        className="mt-8 max-w-2xl rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6"
      >
        <h2 id="copy-title" className="text-xl font-semibold">
          Copy to another term
        </h2>
        <p className="mt-1 text-sm text-muted">
          Makes a new course with these settings, its {instructorCount} instructor{instructorCount === 1 ? '' : 's'} and
          its {assignmentCount} assignment
          {assignmentCount === 1 ? '' : 's'}: the same problem versions, points and tolerances, with every date moved by
          the same number of days. Students, teaching assistants, extensions, answers, grades and disputes stay here;
          the copy’s keys and grades start unreleased.
        </p>
        {copyTerms.length === 0 ? (
          <p className="mt-4 rounded-lg border border-dashed border-line p-4 text-center text-muted">
            No terms yet — the department’s admins add them.
          </p>
        ) : (
          <Form key={savedKey} method="post" noValidate className="mt-4 grid gap-5">
            <input type="hidden" name="intent" value="copy" />
            <SelectField
              label="Term to copy to"
              name="termId"
              required
              defaultValue={cv.termId ?? ''}
              error={ce.termId}
            >
              <option value="">Choose a term…</option>
              {copyTerms.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}, from {formatCalendarDate(t.startsOn)}
                  {t.current ? ' (this course’s term)' : ` (dates ${formatDayOffset(t.defaultOffsetDays)})`}
                </option>
              ))}
            </SelectField>
            <div className="grid gap-5 sm:grid-cols-[10rem_1fr]">
              <Field
                label="Code of the copy"
                name="code"
                required
                maxLength={24}
                defaultValue={cv.code ?? course.code}
                error={ce.code}
              />
              <Field
                label="Title of the copy"
                name="title"
                required
                maxLength={120}
                defaultValue={cv.title ?? course.title}
                error={ce.title}
              />
            </div>
            <Field
              label="Move dates by (days)"
              name="offsetDays"
              inputMode="numeric"
              autoComplete="off"
              defaultValue={cv.offsetDays ?? ''}
              error={ce.offsetDays}
              hint={`Leave blank to move every date by the days between the two terms’ first days (shown beside each term). A time of day stays the same in ${course.timeZone}.`}
            />
            <div>
              <Button type="submit" disabled={busyIntent === 'copy'}>
                {busyIntent === 'copy' ? 'Copying…' : 'Copy the course'}
              </Button>
            </div>
          </Form>
        )}
      </section>
    </div>
  )
}

type Impact = Route.ComponentProps['loaderData']['impact']

/** What changing the convention changes, in the course's own numbers. */
function ConventionWarning({ impact, current }: { impact: Impact; current: 'chemistry' | 'engineering' }) {
  const other = current === 'chemistry' ? 'engineering' : 'chemistry'
  const problems = (n: number) => `${n} problem${n === 1 ? '' : 's'}`
  return (
    <div className="space-y-1">
      <p>
        The keys are signed by the course’s convention. Changing it re-signs the key of every problem that follows the
        course
        {impact.followingProblems + impact.fixedProblems > 0
          ? ` (here ${impact.followingProblems} of the ${problems(impact.followingProblems + impact.fixedProblems)} set in this course)`
          : ''}
        : each work value changes sign, because the chemistry w is the work done on the system and the engineering W the
        work done by it (W = −w). Heat keeps its sign (q and Q both count the heat into the system), and so do
        temperatures, pressures and efficiencies. Keys and worked solutions are then shown with the {other} symbols (
        {CONVENTIONS[other].equation}).
      </p>
      {impact.fixedProblems > 0 ? (
        <p>{problems(impact.fixedProblems)} fix their own convention and do not change.</p>
      ) : null}
      {impact.answers > 0 ? (
        <p className="font-medium text-warn">
          {impact.students} student{impact.students === 1 ? ' has' : 's have'} already sent {impact.answers} answer
          {impact.answers === 1 ? '' : 's'}. Answers already graded keep their verdicts and scores, even where the key
          they now see has the other sign; answers graded after the change, including any still waiting to be graded,
          are checked against the re-signed key.
        </p>
      ) : null}
    </div>
  )
}

function ConfirmConvention({ error, checked, answers }: { error?: string; checked: boolean; answers: number }) {
  return (
    <div className="flex flex-col gap-1">
      <label className="flex items-start gap-3">
        <input
          type="checkbox"
          name="confirmConvention"
          value="yes"
          defaultChecked={checked}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? 'confirm-convention-error' : undefined}
          className="mt-1"
        />
        <span className="text-sm">
          Change the sign convention even though {answers} answer
          {answers === 1 ? ' has' : 's have'} been sent (only needed when you choose the other convention).
        </span>
      </label>
      {error ? (
        <p id="confirm-convention-error" className="text-sm text-danger">
          {error}
        </p>
      ) : null}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
