/**
 * The Content-Security-Policy nonce of the response being rendered, for the framework's
 * inline scripts (root.tsx). Set on the server only (entry.server.tsx); in the browser it
 * is undefined, and the scripts are already running.
 */
import { createContext, useContext } from 'react'

export const NonceContext = createContext<string | undefined>(undefined)

export function useNonce(): string | undefined {
  return useContext(NonceContext)
}
