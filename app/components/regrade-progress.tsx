import { useQuery } from '@tanstack/react-query'
import { href } from 'react-router'
import { isKeyOf, isRecord, readJson } from '#app/lib/guards.ts'
import { REGRADE_STATUS_LABELS, type RegradeStatus } from '#app/lib/labels.ts'

/** A regrade as the page and GET /api/regrades/:id show it (app/server/regrades.server.ts RegradeProgress). */
export interface RegradeSnapshot {
  readonly id: number
  readonly status: RegradeStatus
  readonly total: number
  readonly done: number
  readonly changed: number
  readonly error: string | null
  readonly fromVersionNumber: number | null
  readonly toVersionNumber: number | null
}

export const REGRADE_STATUS_WORDS: Readonly<Record<RegradeSnapshot['status'], string>> = REGRADE_STATUS_LABELS

export function isRegradeActive(status: RegradeSnapshot['status']): boolean {
  return status === 'queued' || status === 'running'
}

const isCount = (x: unknown) => typeof x === 'number' && Number.isFinite(x)
const isNumberOrNull = (x: unknown) => x === null || isCount(x)

function isRegradeSnapshot(x: unknown): x is RegradeSnapshot {
  return (
    isRecord(x) &&
    isCount(x.id) &&
    isKeyOf(REGRADE_STATUS_LABELS, x.status) &&
    isCount(x.total) &&
    isCount(x.done) &&
    isCount(x.changed) &&
    (x.error === null || typeof x.error === 'string') &&
    isNumberOrNull(x.fromVersionNumber) &&
    isNumberOrNull(x.toVersionNumber)
  )
}

async function fetchRegrade(id: number): Promise<RegradeSnapshot> {
  const res = await fetch(href('/api/regrades/:regradeId', { regradeId: String(id) }), {
    headers: { Accept: 'application/json' },
  })
  if (!res.ok) throw new Error(`The regrade’s progress could not be read (${res.status}).`)
  return readJson(res, isRegradeSnapshot, 'The regrade’s progress')
}

function answersText(n: number) {
  return `${n} answer${n === 1 ? '' : 's'}`
}

/**
 * A regrade's progress. With JavaScript it polls /api/regrades/:id every second until the
 * regrade is done or stopped; without, the loader's numbers and a link that reloads them.
 */
export function RegradeProgress({ initial, refreshHref }: { initial: RegradeSnapshot; refreshHref: string }) {
  const live = useQuery({
    queryKey: ['regrade', initial.id],
    queryFn: () => fetchRegrade(initial.id),
    initialData: initial,
    refetchInterval: (q) => (q.state.data && isRegradeActive(q.state.data.status) ? 1000 : false),
  })
  const r = live.data ?? initial
  const active = isRegradeActive(r.status)
  return (
    <section aria-labelledby="regrade-progress-title" className="rounded-lg border border-line bg-white p-5 shadow-sm">
      <h2 id="regrade-progress-title" className="text-xl font-semibold">
        Regrade {r.id}: version {r.fromVersionNumber ?? '?'} → {r.toVersionNumber ?? '?'}
      </h2>
      <div aria-live="polite" className="mt-2">
        <p className="text-sm">
          <span className="font-semibold">{REGRADE_STATUS_WORDS[r.status]}.</span> {r.done} of {r.total}{' '}
          {r.total === 1 ? 'answer' : 'answers'} regraded, {r.changed} changed.
        </p>
        <progress
          className="mt-2 h-2 w-full"
          max={Math.max(1, r.total)}
          value={r.total === 0 && r.status === 'done' ? 1 : r.done}
          aria-label="Answers regraded"
        >
          {r.done} of {r.total}
        </progress>
        {r.status === 'done' ? (
          <p className="mt-2 text-sm text-muted">
            {r.changed === 0
              ? 'No answer’s grade changed.'
              : `${answersText(r.changed)} changed grade; each change is in the audit log.`}{' '}
            Answers submitted from now on are graded with the new version and tolerances.
          </p>
        ) : null}
        {r.error ? (
          <p className={`mt-2 text-sm ${r.status === 'failed' ? 'text-danger' : 'text-muted'}`}>{r.error}</p>
        ) : null}
        {live.isError ? (
          <p className="mt-2 text-sm text-danger">{live.error.message} Use Refresh to try again.</p>
        ) : null}
      </div>
      {active || live.isError ? (
        <p className="mt-3 text-sm">
          <a href={refreshHref}>Refresh</a>{' '}
          <span className="text-muted">(the numbers update by themselves when JavaScript is on)</span>
        </p>
      ) : null}
    </section>
  )
}
