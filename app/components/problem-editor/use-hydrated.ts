import { useEffect, useState } from 'react'

/** False on the server and in the first browser render, true once the page has hydrated. */
export function useHydrated() {
  const [hydrated, setHydrated] = useState(false)
  useEffect(() => setHydrated(true), [])
  return hydrated
}
