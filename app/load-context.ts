/**
 * What the HTTP server (scripts/server.ts) hands every loader, action and the server entry:
 * the nonce that this response's Content-Security-Policy allows inline scripts with.
 */
declare module 'react-router' {
  interface AppLoadContext {
    cspNonce?: string
  }
}

export {}
