/**
 * Choosing a problem's version for one row of the assignment form (issue #15): radio rows
 * grouped by problem, each naming the version, when it was saved and by whom, its latest
 * check in words with an icon, and a link to preview it. Works without JavaScript: the list
 * sits in a <details> that is open while nothing is chosen or the row has an error. A
 * version whose check did not pass needs the override checkbox, which names the reason.
 *
 * A check still running when the page was served is followed: with JavaScript its result is
 * polled from GET /api/versions/:versionId/check and announced politely as it changes;
 * without, the badge says to reload.
 */
import { useQueries } from '@tanstack/react-query'
import { href, Link } from 'react-router'
import { formatInZone } from '#app/lib/dates.ts'
import { cn } from '#app/lib/cn.ts'
import { checkWords, isVersionCheck, overrideLabel, type VersionCheck } from '#app/lib/check-words.ts'
import { isRecord, readJson } from '#app/lib/guards.ts'
import type { BankChoice } from '#app/server/assignments.server.ts'

const ICONS: Record<VersionCheck['state'], string> = { passed: '✓', failed: '✗', broken: '!', running: '…', never: '?' }
const TONES: Record<VersionCheck['state'], string> = {
  passed: 'border-ok/40 text-ok',
  failed: 'border-danger/40 text-danger',
  broken: 'border-danger/40 text-danger',
  running: 'border-line text-muted',
  never: 'border-warn/40 text-warn',
}

const POLL_MS = 2000

async function fetchCheck(versionId: number): Promise<VersionCheck> {
  const res = await fetch(href('/api/versions/:versionId/check', { versionId: String(versionId) }), {
    headers: { Accept: 'application/json' },
  })
  if (!res.ok) {
    // The route says why in a sentence (a version whose document no longer reads is a 422).
    const said = await res.json().then(
      (b: unknown) => (isRecord(b) && typeof b.error === 'string' ? b.error : null),
      () => null,
    )
    throw new Error(said ?? `The check's result could not be read (${res.status}).`)
  }
  const body = await readJson(
    res,
    (b): b is { check: VersionCheck } => isRecord(b) && isVersionCheck(b.check),
    'The check’s result',
  )
  return body.check
}

/**
 * The latest check of each offered version: as served, except that a check running then is
 * polled until it ends (or its result cannot be read). Pickers of the same form share the polls.
 */
function useLiveChecks(choices: readonly BankChoice[]): {
  checkOf: (version: { id: number; check: VersionCheck }) => VersionCheck
  problemOf: (version: { id: number }) => string | null
} {
  const running = choices.flatMap((c) => c.versions).filter((v) => v.check.state === 'running')
  const results = useQueries({
    queries: running.map((v) => ({
      queryKey: ['version-check', v.id],
      queryFn: () => fetchCheck(v.id),
      initialData: v.check,
      retry: 1,
      refetchInterval: (q: { state: { status: string; data: VersionCheck | undefined } }) =>
        q.state.status !== 'error' && q.state.data?.state === 'running' ? POLL_MS : false,
    })),
  })
  const live = new Map(running.map((v, i) => [v.id, results[i]?.data ?? v.check]))
  const problems = new Map(running.map((v, i) => [v.id, results[i]?.error?.message ?? null]))
  return { checkOf: (v) => live.get(v.id) ?? v.check, problemOf: (v) => problems.get(v.id) ?? null }
}

/**
 * A version's check; one that was running when the page was served is a polite live region
 * (its result is announced when it arrives) and, without JavaScript, says to reload.
 */
function LiveCheckBadge({
  served,
  check,
  problem,
}: {
  served: VersionCheck
  check: VersionCheck
  problem: string | null
}) {
  if (served.state !== 'running') return <CheckBadge check={check} />
  return (
    <span aria-live="polite">
      <CheckBadge check={check} />
      {problem !== null ? <span className="ml-1 text-xs text-warn">{problem}</span> : null}
      <noscript>
        <span className="ml-1 text-xs text-muted">checking — reload to see the result</span>
      </noscript>
    </span>
  )
}

export function CheckBadge({ check }: { check: VersionCheck }) {
  return (
    <span className={cn('inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs', TONES[check.state])}>
      <span aria-hidden="true" className="font-bold">
        {ICONS[check.state]}
      </span>
      {checkWords(check)}
    </span>
  )
}

export interface VersionPickerProps {
  readonly index: number
  readonly name: string
  readonly overrideName: string
  readonly domId: string
  readonly value: string
  readonly override: string
  /** the version the row holds on the saved assignment (no override is asked to keep it) */
  readonly storedVersionId: string
  readonly choices: readonly BankChoice[]
  readonly timeZone: string
  readonly invalid: boolean
  readonly describedBy?: string
}

export function VersionPicker({
  index,
  name,
  overrideName,
  domId,
  value,
  override,
  storedVersionId,
  choices,
  timeZone,
  invalid,
  describedBy,
}: VersionPickerProps) {
  const { checkOf, problemOf } = useLiveChecks(choices)
  const chosen = choices.flatMap((c) => c.versions.map((v) => ({ c, v }))).find((x) => String(x.v.id) === value)
  const chosenCheck = chosen ? checkOf(chosen.v) : undefined
  const needsOverride = chosen && chosenCheck?.state !== 'passed' && String(chosen.v.id) !== storedVersionId
  return (
    <div className="grid min-w-0 gap-2">
      <details open={!chosen || invalid} className="min-w-0">
        <summary className="cursor-pointer">
          {chosen ? (
            <span>
              {chosen.c.title}, version {chosen.v.number}{' '}
              <LiveCheckBadge served={chosen.v.check} check={chosenCheck!} problem={problemOf(chosen.v)} />{' '}
              <span className="text-accent underline">Change</span>
            </span>
          ) : (
            <span>Choose a problem</span>
          )}
        </summary>
        <fieldset
          id={domId}
          tabIndex={-1}
          aria-invalid={invalid ? true : undefined}
          aria-describedby={describedBy}
          className={cn('mt-2 grid gap-3 rounded-md border p-2', invalid ? 'border-danger' : 'border-line')}
        >
          <legend className="px-1 text-sm font-medium">Problem {index + 1}: choose a problem and version</legend>
          {choices.map((c) => (
            <div key={c.problemId} role="group" aria-labelledby={`${domId}-p${c.problemId}`} className="grid gap-1">
              <p id={`${domId}-p${c.problemId}`} className="font-medium break-words">
                {c.title}
              </p>
              <ul className="grid gap-1">
                {c.versions.map((ver, j) => (
                  <li
                    key={ver.id}
                    className="flex flex-wrap items-start gap-x-3 gap-y-1 rounded px-1 py-1 hover:bg-paper"
                  >
                    <label className="flex min-w-0 flex-1 items-start gap-2">
                      <input
                        type="radio"
                        name={name}
                        value={String(ver.id)}
                        defaultChecked={String(ver.id) === value}
                        className="mt-1"
                      />
                      <span className="min-w-0 break-words">
                        <span className="sr-only">{c.title}, </span>
                        Version {ver.number}
                        {j === 0 ? ' (newest)' : ''}, saved {formatInZone(ver.savedAt, timeZone, { withZone: false })}{' '}
                        by {ver.author}
                        <span className="block">
                          <LiveCheckBadge served={ver.check} check={checkOf(ver)} problem={problemOf(ver)} />
                        </span>
                      </span>
                    </label>
                    <Link
                      to={`${href('/bank/:problemId', { problemId: String(c.problemId) })}?version=${ver.number}`}
                      className="text-sm"
                    >
                      Preview
                      <span className="sr-only">
                        {' '}
                        {c.title}, version {ver.number}
                      </span>
                    </Link>
                  </li>
                ))}
              </ul>
            </div>
          ))}
        </fieldset>
      </details>
      {needsOverride ? (
        <label className="flex items-start gap-2 text-sm">
          <input
            type="checkbox"
            name={overrideName}
            value={String(chosen.v.id)}
            defaultChecked={override === String(chosen.v.id)}
            className="mt-1"
          />
          <span>{overrideLabel(chosenCheck!)}</span>
        </label>
      ) : null}
    </div>
  )
}
