/**
 * A gradebook table that follows its /api/ route (TanStack Query): every 1.5 s while answers
 * are being graded, otherwise every 10 s so that answers submitted after the page opened
 * appear too. Both stop while the tab is hidden (TanStack's default). The loader's data is
 * the first value, so the page renders without JavaScript.
 */
import { useQuery } from '@tanstack/react-query'

export const GRADEBOOK_POLL_MS = 1500
export const GRADEBOOK_IDLE_POLL_MS = 10_000

/** The freshest gradebook, and why the last refresh failed (the table keeps the last grades read). */
export function useLiveGradebook<T extends { pendingCount: number }>(
  key: readonly unknown[],
  url: string,
  initial: T,
): { gradebook: T; refreshError: string | null } {
  const live = useQuery({
    queryKey: [...key, url],
    queryFn: async (): Promise<T> => {
      const res = await fetch(url, { headers: { Accept: 'application/json' } })
      if (!res.ok) throw new Error(`The gradebook could not be refreshed (${res.status}).`)
      return (await res.json()) as T
    },
    initialData: initial,
    // The loader just read these grades; no need to ask again at once.
    staleTime: GRADEBOOK_POLL_MS,
    refetchInterval: (q) => ((q.state.data?.pendingCount ?? 0) > 0 ? GRADEBOOK_POLL_MS : GRADEBOOK_IDLE_POLL_MS),
  })
  return { gradebook: live.data ?? initial, refreshError: live.isError ? live.error.message : null }
}
