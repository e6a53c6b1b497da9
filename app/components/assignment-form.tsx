/**
 * The assignment form for the new and edit pages. One plain form: the rows of problems are
 * added and removed by submit buttons with an intent, so the whole form works without
 * JavaScript and everything typed comes back with the page.
 */
import { useEffect, useRef, type ReactNode } from 'react'
import { Form, href, Link, useNavigation } from 'react-router'
import { Button } from '#app/components/ui/button.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { VersionPicker } from '#app/components/version-picker.tsx'
import { cn } from '#app/lib/cn.ts'
import type { FieldErrors } from '#app/lib/form.ts'
import type { AssignmentFormState, BankChoice, LockedItem } from '#app/server/assignments.server.ts'

export interface AssignmentFormProps {
  readonly state: AssignmentFormState
  readonly fieldErrors: FieldErrors
  readonly formError?: string
  readonly choices: readonly BankChoice[]
  readonly locked: readonly LockedItem[]
  /** item id → the version it holds on the saved assignment (edit page): keeping it asks for no override */
  readonly stored?: Readonly<Record<string, string>>
  readonly timeZone: string
  readonly submitLabel: string
  /** The page where an answered item is regraded (edit page); absent for a new assignment. */
  readonly regradeTo?: (position: number) => string
  readonly cancelTo: string
}

const inputClass = (invalid: boolean) =>
  cn('rounded-md border bg-white px-3 py-2 shadow-sm', invalid ? 'border-danger' : 'border-line focus:border-accent')

const LABELS: Record<string, string> = {
  title: 'Title',
  instructions: 'Instructions',
  opensAt: 'Opens',
  dueAt: 'Due',
  attemptsPerFind: 'Attempts per find',
  latePolicy: 'After the due date',
  latePenaltyPercentPerDay: 'Penalty per day',
  lateDaysAllowed: 'Days late accepted',
  keyRelease: 'Key and worked solutions',
  disputeDays: 'Days for disputes',
  items: 'Problems',
}

function labelFor(key: string): string {
  const m = /^items\.(\d+)\.(versionId|points)$/.exec(key)
  if (m) return `Problem ${Number(m[1]) + 1}, ${m[2] === 'points' ? 'points' : 'problem'}`
  return LABELS[key] ?? key
}

function fieldDomId(key: string) {
  return `af-${key.replace(/\./g, '-')}`
}

export function AssignmentForm({
  state,
  fieldErrors,
  formError,
  choices,
  locked,
  stored = {},
  timeZone,
  submitLabel,
  regradeTo,
  cancelTo,
}: AssignmentFormProps) {
  const navigation = useNavigation()
  const busy = navigation.state === 'submitting'
  const saving = busy && navigation.formData?.get('intent') === 'save'
  const summaryRef = useRef<HTMLDivElement>(null)
  const errorKeys = Object.keys(fieldErrors).filter((k) => fieldErrors[k])
  useEffect(() => {
    if (formError && errorKeys.length) summaryRef.current?.focus()
  }, [formError, errorKeys.length])

  const v = state.values
  const err = (key: string) => fieldErrors[key]
  const describedBy = (key: string, hint?: string) =>
    [hint, err(key) ? `${fieldDomId(key)}-error` : null].filter(Boolean).join(' ') || undefined
  const errorText = (key: string) =>
    err(key) ? (
      <p id={`${fieldDomId(key)}-error`} className="text-sm text-danger">
        {err(key)}
      </p>
    ) : null
  const lockedById = new Map(locked.map((l) => [String(l.itemId), l]))
  const storedById = new Map(Object.entries(stored))

  return (
    <Form method="post" className="mt-6 grid max-w-4xl gap-6" noValidate>
      {/* Enter in a field submits with the form's first submit button; without this it would be a row's Remove. */}
      <button
        type="submit"
        name="intent"
        value="save"
        tabIndex={-1}
        aria-hidden="true"
        className="absolute -left-[9999px] h-px w-px overflow-hidden"
      />
      {formError && errorKeys.length ? (
        <div
          ref={summaryRef}
          tabIndex={-1}
          role="alert"
          aria-labelledby="af-summary-title"
          className="rounded-md border border-danger/30 bg-danger-soft px-4 py-3 text-sm text-danger"
        >
          <p id="af-summary-title" className="font-semibold">
            {formError}
          </p>
          <ul className="mt-2 list-disc pl-5">
            {errorKeys.map((k) => (
              <li key={k}>
                <a href={`#${fieldDomId(k)}`} className="text-danger underline">
                  {labelFor(k)}: {fieldErrors[k]}
                </a>
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      <Section title="About">
        <div className="flex flex-col gap-1">
          <label htmlFor={fieldDomId('title')} className="text-sm font-medium">
            Title
          </label>
          <input
            id={fieldDomId('title')}
            name="title"
            defaultValue={v.title}
            maxLength={200}
            required
            aria-invalid={err('title') ? true : undefined}
            aria-describedby={describedBy('title')}
            className={inputClass(!!err('title'))}
          />
          {errorText('title')}
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={fieldDomId('instructions')} className="text-sm font-medium">
            Instructions <span className="font-normal text-muted">(optional)</span>
          </label>
          <textarea
            id={fieldDomId('instructions')}
            name="instructions"
            rows={4}
            defaultValue={v.instructions}
            aria-invalid={err('instructions') ? true : undefined}
            aria-describedby={describedBy('instructions', 'af-instructions-hint')}
            className={inputClass(!!err('instructions'))}
          />
          <p id="af-instructions-hint" className="text-sm text-muted">
            Markdown, with $…$ for math. Shown to students above the problems.
          </p>
          {errorText('instructions')}
        </div>
      </Section>

      <Section title="Dates and attempts">
        <p id="af-zone-hint" className="text-sm text-muted">
          Dates and times are in the course’s time zone, <strong>{timeZone}</strong>.
        </p>
        <div className="grid gap-4 sm:grid-cols-2">
          {(['opensAt', 'dueAt'] as const).map((key) => (
            <div key={key} className="flex flex-col gap-1">
              <label htmlFor={fieldDomId(key)} className="text-sm font-medium">
                {key === 'opensAt' ? 'Opens' : 'Due'} <span className="font-normal text-muted">({timeZone})</span>
              </label>
              <input
                id={fieldDomId(key)}
                type="datetime-local"
                name={key}
                defaultValue={v[key]}
                required
                aria-invalid={err(key) ? true : undefined}
                aria-describedby={describedBy(key, 'af-zone-hint')}
                className={inputClass(!!err(key))}
              />
              {errorText(key)}
            </div>
          ))}
        </div>
        <div className="flex max-w-xs flex-col gap-1">
          <label htmlFor={fieldDomId('attemptsPerFind')} className="text-sm font-medium">
            Attempts per find
          </label>
          <input
            id={fieldDomId('attemptsPerFind')}
            name="attemptsPerFind"
            type="number"
            inputMode="numeric"
            min={1}
            max={100}
            defaultValue={v.attemptsPerFind}
            aria-invalid={err('attemptsPerFind') ? true : undefined}
            aria-describedby={describedBy('attemptsPerFind', 'af-attempts-hint')}
            className={inputClass(!!err('attemptsPerFind'))}
          />
          <p id="af-attempts-hint" className="text-sm text-muted">
            Unreadable answers and answers with the wrong unit do not use an attempt.
          </p>
          {errorText('attemptsPerFind')}
        </div>
      </Section>

      <Section title="Late answers">
        <fieldset aria-describedby={describedBy('latePolicy')} className="grid gap-3">
          <legend className="text-sm font-medium">After the due date</legend>
          <label className="flex items-start gap-2">
            <input
              type="radio"
              name="latePolicy"
              value="closed"
              defaultChecked={v.latePolicy !== 'penalty'}
              className="mt-1"
            />
            <span>Closed: no answers are accepted after the due date.</span>
          </label>
          <div className="flex flex-wrap items-start gap-2">
            <input
              id="af-late-penalty"
              type="radio"
              name="latePolicy"
              value="penalty"
              defaultChecked={v.latePolicy === 'penalty'}
              className="mt-3"
            />
            <label htmlFor="af-late-penalty" className="mt-2">
              Accepted with a penalty of
            </label>
            <span className="flex flex-col">
              <label htmlFor={fieldDomId('latePenaltyPercentPerDay')} className="sr-only">
                Penalty per day late, in percent
              </label>
              <input
                id={fieldDomId('latePenaltyPercentPerDay')}
                name="latePenaltyPercentPerDay"
                inputMode="decimal"
                size={5}
                defaultValue={v.latePenaltyPercentPerDay}
                aria-invalid={err('latePenaltyPercentPerDay') ? true : undefined}
                aria-describedby={describedBy('latePenaltyPercentPerDay')}
                className={cn(inputClass(!!err('latePenaltyPercentPerDay')), 'w-20')}
              />
            </span>
            <span className="mt-2">% per day, for up to</span>
            <span className="flex flex-col">
              <label htmlFor={fieldDomId('lateDaysAllowed')} className="sr-only">
                Days late accepted
              </label>
              <input
                id={fieldDomId('lateDaysAllowed')}
                name="lateDaysAllowed"
                inputMode="numeric"
                size={4}
                defaultValue={v.lateDaysAllowed}
                aria-invalid={err('lateDaysAllowed') ? true : undefined}
                aria-describedby={describedBy('lateDaysAllowed')}
                className={cn(inputClass(!!err('lateDaysAllowed')), 'w-20')}
              />
            </span>
            <span className="mt-2">days (0–60). A started day counts as a day.</span>
          </div>
          {errorText('latePolicy')}
          {errorText('latePenaltyPercentPerDay')}
          {errorText('lateDaysAllowed')}
        </fieldset>
      </Section>

      <Section title="Key and worked solutions">
        <fieldset aria-describedby={describedBy('keyRelease')} className="grid gap-3">
          <legend className="sr-only">When students see the key and worked solutions</legend>
          <label className="flex items-start gap-2">
            <input
              type="radio"
              name="keyRelease"
              value="after-due"
              defaultChecked={v.keyRelease !== 'manual'}
              className="mt-1"
            />
            <span>
              After the due date: each student sees them once they can no longer submit (their extension and any late
              window included).
            </span>
          </label>
          <label className="flex items-start gap-2">
            <input
              type="radio"
              name="keyRelease"
              value="manual"
              defaultChecked={v.keyRelease === 'manual'}
              className="mt-1"
            />
            <span>
              By hand: when an instructor presses “Release key now”. Releasing it closes the assignment to answers.
            </span>
          </label>
          {errorText('keyRelease')}
        </fieldset>
      </Section>

      <Section title="Disputes">
        <div className="flex max-w-md flex-col gap-1">
          <label htmlFor={fieldDomId('disputeDays')} className="text-sm font-medium">
            Disputes allowed for this many days after grades are released
          </label>
          <span className="flex items-center gap-2">
            <input
              id={fieldDomId('disputeDays')}
              name="disputeDays"
              type="number"
              inputMode="numeric"
              min={0}
              max={60}
              step={1}
              defaultValue={disputeDaysOf(v)}
              aria-invalid={err('disputeDays') ? true : undefined}
              aria-describedby={describedBy('disputeDays', 'af-dispute-days-hint')}
              className={cn(inputClass(!!err('disputeDays')), 'w-24')}
            />
            <span>days (0–60)</span>
          </span>
          <p id="af-dispute-days-hint" className="text-sm text-muted">
            Students may dispute the verdict on a graded answer until grades are released and for this many days after;
            0 closes disputes when grades are released.
          </p>
          {errorText('disputeDays')}
        </div>
      </Section>

      <Section title="Problems">
        {choices.length === 0 ? (
          <Notice tone="warn">
            Your bank has no problems yet. <Link to={href('/bank/new')}>Write a problem</Link> or{' '}
            <Link to={href('/bank/import')}>import some</Link> first.
          </Notice>
        ) : null}
        {locked.length > 0 ? (
          <p className="text-sm text-muted">
            Students have answered the problems marked “answered”: their version and points stay as they are here. To
            move them to another version or change their points or tolerance, use Regrade, which shows whose scores
            would change first.
          </p>
        ) : null}
        {errorText('items')}
        <div className="overflow-x-auto rounded-lg border border-line bg-white">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Problems in this assignment, in the order students see them</caption>
            <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-3 py-2">
                  #
                </th>
                <th scope="col" className="px-3 py-2">
                  Problem and version
                </th>
                <th scope="col" className="px-3 py-2">
                  Points
                </th>
                <th scope="col" className="px-3 py-2">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {state.items.length === 0 ? (
                <tr>
                  <td colSpan={4} className="px-3 py-4 text-muted">
                    No problems yet. Add one below.
                  </td>
                </tr>
              ) : null}
              {state.items.map((row, i) => {
                const lockedItem = lockedById.get(row.itemId)
                const vKey = `items.${i}.versionId`
                const pKey = `items.${i}.points`
                return (
                  <tr key={i} className="border-t border-line align-top">
                    <th scope="row" className="px-3 py-2 font-normal">
                      {i + 1}
                    </th>
                    <td className="px-3 py-2">
                      <input type="hidden" name={`items.${i}.itemId`} value={row.itemId} />
                      {lockedItem ? (
                        <>
                          <input type="hidden" name={vKey} value={row.versionId} />
                          <span id={fieldDomId(vKey)}>
                            {lockedItem.title}, version {lockedItem.versionNumber}{' '}
                            <span className="rounded bg-accent-soft px-1.5 py-0.5 text-xs text-accent-strong">
                              answered
                            </span>
                          </span>
                          {regradeTo ? (
                            <span className="block text-xs">
                              <Link to={regradeTo(lockedItem.position)}>Regrade to change its version or points</Link>
                            </span>
                          ) : null}
                        </>
                      ) : (
                        <>
                          <VersionPicker
                            index={i}
                            name={vKey}
                            overrideName={`items.${i}.override`}
                            domId={fieldDomId(vKey)}
                            value={row.versionId}
                            override={row.override ?? ''}
                            storedVersionId={storedById.get(row.itemId) ?? ''}
                            choices={choices}
                            timeZone={timeZone}
                            invalid={!!err(vKey)}
                            describedBy={describedBy(vKey)}
                          />
                        </>
                      )}
                      {errorText(vKey)}
                    </td>
                    <td className="px-3 py-2">
                      {lockedItem ? (
                        <>
                          <input type="hidden" name={pKey} value={row.points} />
                          <span id={fieldDomId(pKey)}>{lockedItem.points}</span>
                        </>
                      ) : (
                        <>
                          <label htmlFor={fieldDomId(pKey)} className="sr-only">
                            Points for problem {i + 1}
                          </label>
                          <input
                            id={fieldDomId(pKey)}
                            name={pKey}
                            inputMode="decimal"
                            defaultValue={row.points}
                            aria-invalid={err(pKey) ? true : undefined}
                            aria-describedby={describedBy(pKey)}
                            className={cn(inputClass(!!err(pKey)), 'w-24')}
                          />
                        </>
                      )}
                      {errorText(pKey)}
                    </td>
                    <td className="px-3 py-2">
                      {lockedItem ? null : (
                        <Button type="submit" name="intent" value={`remove-item:${i}`} variant="quiet" disabled={busy}>
                          Remove<span className="sr-only"> problem {i + 1}</span>
                        </Button>
                      )}
                    </td>
                  </tr>
                )
              })}
            </tbody>
          </table>
        </div>
        <div>
          <Button type="submit" name="intent" value="add-item" variant="secondary" disabled={busy}>
            Add a problem
          </Button>
        </div>
      </Section>

      <div className="flex flex-wrap items-center gap-4">
        <Button type="submit" name="intent" value="save" disabled={busy}>
          {saving ? 'Saving…' : submitLabel}
        </Button>
        <Link to={cancelTo}>Cancel</Link>
      </div>
    </Form>
  )
}

/** The dispute window as typed; a form state saved before the field existed starts at the usual 7 days. */
function disputeDaysOf(values: AssignmentFormState['values']): string {
  const typed = 'disputeDays' in values ? values.disputeDays : undefined
  return typeof typed === 'string' || typeof typed === 'number' ? String(typed) : '7'
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="grid gap-4 rounded-lg border border-line bg-white p-6 shadow-sm">
      <h2 className="text-lg font-semibold">{title}</h2>
      {children}
    </section>
  )
}
