/**
 * A gradebook table that follows its /api/ route (TanStack Query): every 1.5 s while answers
 * are being graded, otherwise every 10 s so that answers submitted after the page opened
 * appear too. Both stop while the tab is hidden (TanStack's default). The loader's data is
 * the first value, so the page renders without JavaScript.
 */
import { useQuery } from '@tanstack/react-query'
import { isRecord, readJson } from '#app/lib/guards.ts'

export const GRADEBOOK_POLL_MS = 1500
export const GRADEBOOK_IDLE_POLL_MS = 10_000

/** The parts both gradebooks share, checked on every refresh before the table takes it. */
type GradebookEnvelope = {
  pendingCount: number
  studentCount: number
  sections: readonly string[]
  students: readonly unknown[]
  dropped: readonly unknown[]
}

/**
 * Whether a refreshed body has the gradebook's shape (its counts and lists). The rows are
 * the server's own; what is checked here is that the answer is a gradebook at all, not a
 * proxy's page or an error from a server in the middle of a deploy.
 */
function isGradebookLike<T extends GradebookEnvelope>(x: unknown): x is T {
  return (
    isRecord(x) &&
    typeof x.pendingCount === 'number' &&
    typeof x.studentCount === 'number' &&
    Array.isArray(x.sections) &&
    Array.isArray(x.students) &&
    Array.isArray(x.dropped)
  )
}

/** The freshest gradebook, and why the last refresh failed (the table keeps the last grades read). */
export function useLiveGradebook<T extends GradebookEnvelope>(
  key: readonly unknown[],
  url: string,
  initial: T,
): { gradebook: T; refreshError: string | null } {
  const live = useQuery({
    queryKey: [...key, url],
    queryFn: async (): Promise<T> => {
      const res = await fetch(url, { headers: { Accept: 'application/json' } })
      if (!res.ok) throw new Error(`The gradebook could not be refreshed (${res.status}).`)
      return readJson(res, isGradebookLike<T>, 'The gradebook')
    },
    initialData: initial,
    // The loader just read these grades; no need to ask again at once.
    staleTime: GRADEBOOK_POLL_MS,
    refetchInterval: (q) => ((q.state.data?.pendingCount ?? 0) > 0 ? GRADEBOOK_POLL_MS : GRADEBOOK_IDLE_POLL_MS),
  })
  return { gradebook: live.data ?? initial, refreshError: live.isError ? live.error.message : null }
}
