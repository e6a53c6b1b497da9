import { data, Form, href, Link, redirect, useActionData, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { isRegradeActive, REGRADE_STATUS_WORDS, RegradeProgress } from '#app/components/regrade-progress.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import type { Tolerance } from '#app/domain/grading/index.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { applyRegrade, loadRegradePage, RegradeError, type ToleranceFields } from '#app/server/regrades.server.ts'
import type { Route } from './+types/regrade'
import { formatPoints } from '#app/lib/points.ts'
import { type FieldErrors, readFormData } from '#app/lib/form.ts'
import { inSentence, verdictLabel } from '#app/lib/labels.ts'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Regrade ${data?.item.problemTitle ?? 'problem'} · Cyclewright` },
]

const Id = z.coerce.number().int().positive().max(2_147_483_647)

const QuerySchema = z.object({
  version: Id.optional().catch(undefined),
  regrade: Id.optional().catch(undefined),
  preview: z.string().optional(),
})

const ApplySchema = z.object({ intent: z.literal('apply'), version: Id })

/** The per-find tolerance fields (kind.<find>, value.<find>, unit.<find>) of a form or a query. */
function typedOverrides(entries: Iterable<[string, FormDataEntryValue]>): Record<string, ToleranceFields> | undefined {
  // A Map, not an object: a find name typed as "__proto__" must not reach Object.prototype.
  const typed = new Map<string, ToleranceFields>()
  for (const [key, raw] of entries) {
    const m = /^(kind|value|unit)\.(.{1,64})$/.exec(key)
    const field = m?.[1]
    const find = m?.[2]
    if (find === undefined || typeof raw !== 'string') continue
    if (field !== 'kind' && field !== 'value' && field !== 'unit') continue
    const entry = typed.get(find) ?? { kind: '', value: '', unit: '' }
    entry[field] = raw.slice(0, 100)
    typed.set(find, entry)
  }
  return typed.size > 0 ? Object.fromEntries(typed) : undefined
}

async function guard(request: Request, params: Route.LoaderArgs['params']) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor'])
  const assignmentId = requireIdParam(params.assignmentId, 'assignment')
  const position = requireIdParam(params.position, 'problem')
  return { user, course, courseId, assignmentId, position }
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { course, courseId, assignmentId, position } = await guard(request, params)
  const url = new URL(request.url)
  const query = QuerySchema.parse(Object.fromEntries(url.searchParams))
  const page = await loadRegradePage(db(), {
    courseId,
    assignmentId,
    position,
    versionId: query.version,
    typed: typedOverrides(url.searchParams.entries()),
    preview: query.preview !== undefined,
    regradeId: query.regrade,
  })
  if (!page) throw data('There is no such problem in this assignment.', { status: 404 })
  return { ...page, timeZone: course.timeZone, path: url.pathname, search: url.search }
}

export async function action({ request, params }: Route.ActionArgs) {
  const { user, courseId, assignmentId, position } = await guard(request, params)
  const form = await readFormData(request)
  const values: Record<string, string> = {}
  for (const [k, v] of form.entries()) if (typeof v === 'string') values[k] = v
  const parsed = ApplySchema.safeParse(values)
  if (!parsed.success)
    return data(
      {
        formError: 'Choose a version to regrade to.',
        fieldErrors: { version: 'Choose a version.' } satisfies FieldErrors,
        values,
      },
      { status: 400 },
    )
  try {
    const regradeId = await applyRegrade(db(), {
      courseId,
      assignmentId,
      position,
      toVersionId: parsed.data.version,
      toleranceOverrides: typedOverrides(form.entries()) ?? {},
      requestedBy: user.id,
    })
    return redirect(`${new URL(request.url).pathname}?regrade=${regradeId}`)
  } catch (e) {
    if (!(e instanceof RegradeError)) throw e
    return data({ formError: e.message, fieldErrors: e.fieldErrors, values }, { status: 400 })
  }
}

function toleranceText(t: Tolerance): string {
  if (t.kind === 'relative') return `within ${Math.round(t.value * 100 * 1e6) / 1e6} %`
  return `within ± ${t.value}${t.unit ? ` ${t.unit}` : ''}`
}

/** A verdict inside the preview's sentence: "incorrect → correct", "no longer asked (0)". */
function verdictWords(v: string): string {
  return `${inSentence(verdictLabel(v))}${v === 'removed' ? ' (0)' : ''}`
}

const points = formatPoints

function signed(n: number) {
  return `${n > 0 ? '+' : n < 0 ? '−' : '±'}${points(Math.abs(n))}`
}

export default function RegradeRoute({ loaderData }: Route.ComponentProps) {
  const { item, targetVersion, finds, preview, previewError, regrades, progress, timeZone, path } = loaderData
  const actionData = useActionData<typeof action>()
  const navigation = useNavigation()
  const applying = navigation.state === 'submitting' && navigation.formMethod?.toUpperCase() === 'POST'
  const previewing =
    navigation.state === 'loading' &&
    navigation.location?.pathname === path &&
    navigation.location.search.includes('preview')
  const values = actionData?.values ?? loaderData.values
  const fieldErrors: Record<string, string> = actionData?.fieldErrors ?? previewError?.fieldErrors ?? {}
  const busy = regrades.some((r) => isRegradeActive(r.status))
  const problemHref = href('/courses/:courseId/assignments/:assignmentId/problems/:position', {
    courseId: String(item.courseId),
    assignmentId: String(item.assignmentId),
    position: String(item.position),
  })

  const errorId = (field: string) => `${field.replace(/[^A-Za-z0-9_-]/g, '-')}-error`
  const fieldProps = (field: string) => ({
    'aria-invalid': fieldErrors[field] ? true : undefined,
    'aria-describedby': fieldErrors[field] ? errorId(field) : undefined,
  })
  const errorText = (field: string) =>
    fieldErrors[field] ? (
      <p id={errorId(field)} className="mt-1 text-sm text-danger">
        {fieldErrors[field]}
      </p>
    ) : null
  const inputClass = (field: string, minWidth = 'min-w-24') =>
    `w-full ${minWidth} rounded-md border bg-white px-2 py-1.5 ${fieldErrors[field] ? 'border-danger' : 'border-line'}`

  return (
    <div className="space-y-8">
      <div>
        <p className="text-sm text-muted">
          <Link
            to={href('/courses/:courseId/assignments/:assignmentId', {
              courseId: String(item.courseId),
              assignmentId: String(item.assignmentId),
            })}
          >
            {item.assignmentTitle}
          </Link>{' '}
          · <Link to={`${problemHref}/answers`}>Answers to problem {item.position}</Link>
        </p>
        <h1 className="mt-1 text-3xl font-semibold">
          Regrade problem {item.position}: {item.problemTitle}
        </h1>
        <p className="mt-2 max-w-3xl text-muted">
          Move this problem to another version (a corrected key, other points) or change a find’s tolerance for this
          assignment. The preview shows whose scores would change before anything is written; students keep the same
          numbers, since their variant comes from the problem, not the version. The problem is worth{' '}
          {points(item.points)} points in this assignment.
        </p>
      </div>

      {progress ? (
        <RegradeProgress key={progress.id} initial={progress} refreshHref={`${path}?regrade=${progress.id}`} />
      ) : null}

      <Form
        method="get"
        className="space-y-6 rounded-lg border border-line bg-white p-4 shadow-sm sm:p-5"
        aria-labelledby="regrade-form-title"
      >
        <h2 id="regrade-form-title" className="text-xl font-semibold">
          What to regrade with
        </h2>
        <fieldset aria-describedby={fieldErrors.version ? errorId('version') : undefined}>
          <legend className="font-semibold">Version</legend>
          <ul className="mt-2 space-y-1">
            {item.versions.map((v) => (
              <li key={v.id} className="flex flex-wrap items-center gap-x-3">
                <label className="flex items-center gap-2">
                  <input
                    type="radio"
                    name="version"
                    value={v.id}
                    defaultChecked={String(v.id) === values.version}
                    className="size-4"
                  />
                  Version {v.number}
                  {v.current ? ' (used now)' : ''}
                </label>
                <span className="text-sm text-muted">
                  {v.frozen ? 'frozen' : 'not frozen yet (regrading to it freezes it)'} · saved{' '}
                  {formatInZone(v.createdAt, timeZone)}
                </span>
                <Link
                  to={`${href('/bank/:problemId', { problemId: String(item.problemId) })}?version=${v.number}`}
                  className="text-sm"
                >
                  See version {v.number} in the bank
                </Link>
              </li>
            ))}
          </ul>
          {errorText('version')}
        </fieldset>

        <div>
          {/* Said above the table rather than in its caption, which is as wide as the table and would scroll with it on a phone. */}
          <p id="tolerances-note" className="pb-2 text-sm">
            <span className="font-semibold">Tolerances for this assignment</span>{' '}
            <span className="text-muted">
              (the finds of version {targetVersion.number}; after choosing another version, press Preview to see its
              finds). Relative: a fraction (0.05) or a percentage (5 %). Absolute: a value in the unit given, or in the
              find’s unit when the unit is empty.
            </span>
          </p>
          <div className="relative overflow-x-auto">
            <table className="w-full text-left text-sm" aria-describedby="tolerances-note">
              <caption className="sr-only">Tolerances for this assignment</caption>
              <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-2 py-2">
                    Find
                  </th>
                  <th scope="col" className="px-2 py-2">
                    Version’s tolerance
                  </th>
                  <th scope="col" className="px-2 py-2">
                    Use
                  </th>
                  <th scope="col" className="px-2 py-2">
                    Value
                  </th>
                  <th scope="col" className="px-2 py-2">
                    Unit (absolute)
                  </th>
                </tr>
              </thead>
              <tbody>
                {finds.map((f) => (
                  <tr key={f.name} className="border-t border-line align-top">
                    <th scope="row" className="min-w-36 px-2 py-2 font-normal">
                      {f.label}{' '}
                      <span className="text-muted">
                        ({f.unit || 'pure number'}, {points(f.points)} pt)
                      </span>
                    </th>
                    <td className="px-2 py-2">{toleranceText(f.tolerance)}</td>
                    <td className="px-2 py-2">
                      <label htmlFor={`kind-${f.name}`} className="sr-only">
                        Tolerance for {f.label}
                      </label>
                      <select
                        id={`kind-${f.name}`}
                        name={`kind.${f.name}`}
                        defaultValue={values[`kind.${f.name}`] ?? 'default'}
                        className={inputClass(`kind.${f.name}`, 'min-w-36')}
                        {...fieldProps(`kind.${f.name}`)}
                      >
                        <option value="default">The version’s</option>
                        <option value="relative">Relative</option>
                        <option value="absolute">Absolute</option>
                      </select>
                      {errorText(`kind.${f.name}`)}
                    </td>
                    <td className="px-2 py-2">
                      <label htmlFor={`value-${f.name}`} className="sr-only">
                        Tolerance value for {f.label}
                      </label>
                      <input
                        id={`value-${f.name}`}
                        name={`value.${f.name}`}
                        defaultValue={values[`value.${f.name}`] ?? ''}
                        className={inputClass(`value.${f.name}`)}
                        {...fieldProps(`value.${f.name}`)}
                      />
                      {errorText(`value.${f.name}`)}
                    </td>
                    <td className="px-2 py-2">
                      <label htmlFor={`unit-${f.name}`} className="sr-only">
                        Tolerance unit for {f.label}
                      </label>
                      <input
                        id={`unit-${f.name}`}
                        name={`unit.${f.name}`}
                        defaultValue={values[`unit.${f.name}`] ?? ''}
                        placeholder={f.unit}
                        className={inputClass(`unit.${f.name}`)}
                        {...fieldProps(`unit.${f.name}`)}
                      />
                      {errorText(`unit.${f.name}`)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </div>
        <Button type="submit" name="preview" value="1" disabled={previewing}>
          {previewing ? 'Computing…' : 'Preview'}
        </Button>
      </Form>

      {previewError ? <Notice tone="error">{previewError.message}</Notice> : null}
      {preview ? (
        <section
          aria-labelledby="preview-title"
          className="space-y-4 rounded-lg border border-line bg-white p-4 shadow-sm sm:p-5"
        >
          <h2 id="preview-title" className="text-xl font-semibold">
            Preview: version {item.versions.find((v) => v.current)?.number} → {preview.toVersion.number}
          </h2>
          <p className="text-sm">
            {preview.totals.students === 0
              ? 'Nobody has a graded answer to this problem yet: applying only changes what new answers are graded against.'
              : `${preview.totals.affected} of ${preview.totals.students} students with graded answers would change score (mean change ${signed(preview.totals.meanChange)} points); ${preview.totals.partsChanged} of ${preview.totals.parts} graded answers would change; ${preview.unchanged} students are unchanged.`}
          </p>
          {preview.removedFinds.map((f) => (
            <Notice key={f.name} tone="warn">
              “{f.label}” is not part of version {preview.toVersion.number}: its {f.parts} graded{' '}
              {f.parts === 1 ? 'answer' : 'answers'} ({f.students} {f.students === 1 ? 'student' : 'students'}) would
              score 0.
            </Notice>
          ))}
          {preview.notRegraded.length > 0 ? (
            <Notice tone="warn">
              Version {preview.toVersion.number} cannot be solved for{' '}
              {preview.notRegraded.map((s) => s.name).join(', ')}: their answers would keep their current grades.
            </Notice>
          ) : null}
          {preview.ignoredOverrides.length > 0 ? (
            <Notice tone="info">
              Version {preview.toVersion.number} has no find named {preview.ignoredOverrides.join(', ')}: those
              tolerances are not used.
            </Notice>
          ) : null}
          {preview.pending > 0 ? (
            <p className="text-sm text-muted">
              {preview.pending} {preview.pending === 1 ? 'answer is' : 'answers are'} still waiting for the grader; once
              the regrade starts they are graded with the new version.
            </p>
          ) : null}
          {preview.changed.length > 0 ? (
            <div className="relative max-h-[32rem] overflow-auto rounded border border-line">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Students whose score would change, largest change first</caption>
                <thead className="sticky top-0 bg-paper text-xs tracking-wide text-muted uppercase">
                  <tr>
                    <th scope="col" className="px-3 py-2">
                      Student
                    </th>
                    <th scope="col" className="px-3 py-2 text-right">
                      Old
                    </th>
                    <th scope="col" className="px-3 py-2 text-right">
                      New
                    </th>
                    <th scope="col" className="px-3 py-2 text-right">
                      Change
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Finds whose verdict changes
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {preview.changed.map((s) => (
                    <tr key={s.userId} className="border-t border-line align-top">
                      <th scope="row" className="min-w-40 px-3 py-2 font-normal">
                        {s.name}
                        <span className="block text-xs [overflow-wrap:anywhere] text-muted">
                          {s.email}
                          {s.section ? ` · section ${s.section}` : ''}
                        </span>
                      </th>
                      <td className="px-3 py-2 text-right tabular-nums">{points(s.oldScore)}</td>
                      <td className="px-3 py-2 text-right tabular-nums">{points(s.newScore)}</td>
                      <td
                        className={`px-3 py-2 text-right font-semibold tabular-nums ${s.change < 0 ? 'text-danger' : s.change > 0 ? 'text-ok' : ''}`}
                      >
                        {signed(s.change)}
                      </td>
                      <td className="min-w-72 px-3 py-2">
                        {s.finds.length === 0
                          ? '—'
                          : s.finds.map((f) => (
                              <span key={f.name} className="block">
                                {f.label}: {verdictWords(f.oldVerdict)} → {verdictWords(f.newVerdict)}
                              </span>
                            ))}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          ) : preview.totals.students > 0 ? (
            <p className="text-sm">No student’s score would change.</p>
          ) : null}
          <Form method="post" className="flex flex-wrap items-center gap-3">
            <input type="hidden" name="intent" value="apply" />
            <input type="hidden" name="version" value={preview.toVersion.id} />
            {finds.map((f) => (
              <span key={f.name} hidden>
                <input type="hidden" name={`kind.${f.name}`} value={values[`kind.${f.name}`] ?? 'default'} />
                <input type="hidden" name={`value.${f.name}`} value={values[`value.${f.name}`] ?? ''} />
                <input type="hidden" name={`unit.${f.name}`} value={values[`unit.${f.name}`] ?? ''} />
              </span>
            ))}
            <Button type="submit" disabled={applying || busy}>
              {applying ? 'Queuing…' : 'Apply regrade'}
            </Button>
            <span className="text-sm text-muted">
              {busy
                ? 'Another regrade of this problem is under way; wait until it has finished.'
                : `Moves the problem to version ${preview.toVersion.number} with these tolerances and regrades every graded answer; each changed grade is recorded in the audit log.`}
            </span>
          </Form>
        </section>
      ) : null}
      {actionData?.formError ? <Notice tone="error">{actionData.formError}</Notice> : null}

      <section aria-labelledby="history-title">
        <h2 id="history-title" className="text-xl font-semibold">
          Regrades of this problem
        </h2>
        {regrades.length === 0 ? (
          <p className="mt-2 text-sm text-muted">This problem has not been regraded.</p>
        ) : (
          <div className="relative mt-2 overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">The latest regrades of this problem, newest first</caption>
              <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-3 py-2">
                    Requested
                  </th>
                  <th scope="col" className="px-3 py-2">
                    By
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Versions
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Status
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Answers
                  </th>
                </tr>
              </thead>
              <tbody>
                {regrades.map((r) => (
                  <tr key={r.id} className="border-t border-line">
                    <td className="px-3 py-2">
                      <Link to={`${path}?regrade=${r.id}`}>{formatInZone(r.createdAt, timeZone)}</Link>
                    </td>
                    <td className="px-3 py-2">{r.requestedByName}</td>
                    <td className="px-3 py-2">
                      {r.fromVersionNumber ?? '?'} → {r.toVersionNumber ?? '?'}
                      {Object.keys(r.toleranceOverrides).length > 0 ? (
                        <span className="block text-xs text-muted">
                          {Object.entries(r.toleranceOverrides)
                            .map(([name, t]) => `${name} ${toleranceText(t)}`)
                            .join('; ')}
                        </span>
                      ) : null}
                    </td>
                    <td className="px-3 py-2">{REGRADE_STATUS_WORDS[r.status]}</td>
                    <td className="px-3 py-2 tabular-nums">
                      {r.done} of {r.total}, {r.changed} changed
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
