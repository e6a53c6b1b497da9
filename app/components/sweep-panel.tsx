import { useQuery } from '@tanstack/react-query'
import { Form, href, useNavigation } from 'react-router'
import type { SweepFailure } from '#app/domain/authoring/definition.ts'
import { isKeyOf, isRecord, readJson } from '#app/lib/guards.ts'
import { SWEEP_STATUS_LABELS, type SweepStatus } from '#app/lib/labels.ts'

/** A sweep as the page and GET /api/sweeps/:id show it (app/server/sweeps.server.ts SweepView). */
export interface SweepSnapshot {
  readonly id: number
  readonly versionId: number
  readonly status: SweepStatus
  readonly total: number
  readonly checked: number
  readonly failed: number
  readonly failures: readonly SweepFailure[]
  readonly error: string | null
  readonly createdAt: string
  readonly finishedAt: string | null
}

const FAILURE_WORDS: Readonly<Record<string, string>> = {
  'invalid-definition': 'Problem definition',
  'given-error': 'Given could not be drawn',
  'constraint-never-met': 'Constraint never met',
  'solve-error': 'Cycle could not be solved',
  'find-undefined': 'Find undefined',
  'temperature-not-positive': 'Temperature ≤ 0',
  'pressure-not-positive': 'Pressure ≤ 0',
  'efficiency-out-of-range': 'Efficiency or COP out of range',
  'quality-out-of-range': 'Quality outside 0–1',
}

/** The worker writes the whole sentence ("The check stopped after 3 attempts: …"), ending as its reason ends. */
function stoppedText(error: string | null): string {
  if (error === null) return 'The check stopped for an unknown reason.'
  return /[.!?…]$/.test(error) ? error : `${error}.`
}

const isCount = (x: unknown) => typeof x === 'number' && Number.isFinite(x)
const isTextOrNull = (x: unknown) => x === null || typeof x === 'string'

function isSweepFailure(x: unknown): x is SweepFailure {
  return isRecord(x) && typeof x.seed === 'number' && typeof x.code === 'string' && typeof x.message === 'string'
}

function isSweepSnapshot(x: unknown): x is SweepSnapshot {
  return (
    isRecord(x) &&
    isCount(x.id) &&
    isCount(x.versionId) &&
    isKeyOf(SWEEP_STATUS_LABELS, x.status) &&
    isCount(x.total) &&
    isCount(x.checked) &&
    isCount(x.failed) &&
    Array.isArray(x.failures) &&
    x.failures.every(isSweepFailure) &&
    isTextOrNull(x.error) &&
    typeof x.createdAt === 'string' &&
    isTextOrNull(x.finishedAt)
  )
}

async function fetchSweep(id: number): Promise<SweepSnapshot> {
  const res = await fetch(href('/api/sweeps/:sweepId', { sweepId: String(id) }), {
    headers: { Accept: 'application/json' },
  })
  if (!res.ok) throw new Error(`The check's progress could not be read (${res.status}).`)
  return readJson(res, isSweepSnapshot, 'The check’s progress')
}

/**
 * Checking a problem over many sampled variants: start it (a plain form), then follow its
 * progress. With JavaScript the progress is polled from /api/sweeps/:id; without, the page
 * offers a refresh link.
 */
export function SweepPanel({ versionNumber, initial }: { versionNumber: number; initial: SweepSnapshot | null }) {
  const busy = useNavigation().state === 'submitting'
  const live = useQuery({
    queryKey: ['sweep', initial?.id],
    queryFn: () => fetchSweep(initial!.id),
    enabled: initial !== null,
    initialData: initial ?? undefined,
    refetchInterval: (q) => {
      const s = q.state.data?.status
      return s === 'queued' || s === 'running' ? 1000 : false
    },
  })
  const sweep = live.data ?? initial
  const running = sweep !== null && (sweep.status === 'queued' || sweep.status === 'running')
  return (
    <section aria-labelledby="check-title" id="check" className="rounded-lg border border-line bg-white p-5 shadow-sm">
      <h2 id="check-title" className="text-xl font-semibold">
        Check version {versionNumber} over many variants
      </h2>
      <p className="mt-1 text-sm text-muted">
        Draws variants with seeds 1 to N, solves each, and lists every one that is not physical (T ≤ 0, p ≤ 0,
        efficiency outside 0 to the Carnot bound, quality outside 0 to 1, a find that cannot be computed, a constraint
        never met), with its seed, so you can fix the ranges.
      </p>
      <Form method="post" className="mt-4 flex flex-wrap items-end gap-3">
        <input type="hidden" name="intent" value="sweep" />
        <div className="flex flex-col gap-1">
          <label htmlFor="sweep-total" className="text-sm font-medium">
            Variants to check
          </label>
          <input
            id="sweep-total"
            name="total"
            type="number"
            min={10}
            max={5000}
            step={10}
            defaultValue={500}
            className="w-32 rounded-md border border-line px-3 py-2"
          />
        </div>
        <button
          type="submit"
          disabled={busy || running}
          className="rounded-md bg-accent px-4 py-2 text-sm font-semibold text-white hover:bg-accent-strong disabled:opacity-60"
        >
          {busy ? 'Starting…' : running ? `${SWEEP_STATUS_LABELS.running}…` : 'Check this version'}
        </button>
      </Form>
      {sweep ? (
        <div className="mt-5" aria-live="polite">
          <p className="text-sm">
            {sweep.status === 'queued' ? (sweep.error ?? `${SWEEP_STATUS_LABELS.queued}…`) : null}
            {sweep.status === 'running' ? `Checked ${sweep.checked} of ${sweep.total} variants…` : null}
            {sweep.status === 'done'
              ? sweep.failed === 0
                ? `All ${sweep.checked} variants are physical.`
                : `${sweep.failed} of ${sweep.checked} variants failed a check.`
              : null}
            {sweep.status === 'failed' ? stoppedText(sweep.error) : null}
          </p>
          <progress className="mt-2 h-2 w-full" max={sweep.total} value={sweep.checked} aria-label="Variants checked">
            {sweep.checked} of {sweep.total}
          </progress>
          {running ? (
            <noscript>
              <p className="mt-2 text-sm">Reload the page to see the progress.</p>
            </noscript>
          ) : null}
          {sweep.failures.length > 0 ? (
            <div className="mt-4 max-h-96 overflow-auto rounded border border-line">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Variants that failed a check</caption>
                <thead className="sticky top-0 bg-paper text-xs tracking-wide text-muted uppercase">
                  <tr>
                    <th scope="col" className="px-3 py-2">
                      Seed
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Check
                    </th>
                    <th scope="col" className="px-3 py-2">
                      What went wrong
                    </th>
                    <th scope="col" className="px-3 py-2">
                      Givens
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {sweep.failures.map((f, i) => (
                    <tr key={`${f.seed}-${i}`} className="border-t border-line align-top">
                      <td className="px-3 py-2 font-mono">{f.seed}</td>
                      <td className="px-3 py-2">{FAILURE_WORDS[f.code] ?? f.code}</td>
                      <td className="px-3 py-2">{f.message}</td>
                      <td className="px-3 py-2 text-xs text-muted">{f.givens?.join(', ') ?? '—'}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {sweep.failed > sweep.failures.length ? (
                <p className="px-3 py-2 text-xs text-muted">
                  The first {sweep.failures.length} of {sweep.failed} failures are listed.
                </p>
              ) : null}
            </div>
          ) : null}
        </div>
      ) : (
        <p className="mt-4 text-sm text-muted">This version has not been checked yet.</p>
      )}
    </section>
  )
}
