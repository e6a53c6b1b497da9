/**
 * Customised to log unexpected errors once, with a request id, to keep the default
 * streaming render, and to put the response's Content-Security-Policy nonce (made by the
 * HTTP server, passed in the load context) on every inline script React and React Router
 * write. See React Router's "entry.server" and "Security" docs.
 */
import { PassThrough } from 'node:stream'
import { createReadableStreamFromReadable } from '@react-router/node'
import { isbot } from 'isbot'
import { renderToPipeableStream } from 'react-dom/server'
import { ServerRouter, type AppLoadContext, type EntryContext, type HandleErrorFunction } from 'react-router'
import { NonceContext } from './lib/nonce.ts'
import { isDatabaseUnavailable } from './server/db/unavailable.server.ts'

export const streamTimeout = 5_000

export default function handleRequest(
  request: Request,
  status: number,
  headers: Headers,
  context: EntryContext,
  loadContext?: AppLoadContext,
) {
  const nonce = loadContext?.cspNonce
  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false
    const ready = isbot(request.headers.get('user-agent') ?? '') || context.isSpaMode ? 'onAllReady' : 'onShellReady'
    const app = (
      <NonceContext.Provider value={nonce}>
        <ServerRouter context={context} url={request.url} nonce={nonce} />
      </NonceContext.Provider>
    )
    const { pipe, abort } = renderToPipeableStream(app, {
      nonce,
      [ready]() {
        shellRendered = true
        const body = new PassThrough()
        headers.set('Content-Type', 'text/html; charset=utf-8')
        resolve(new Response(createReadableStreamFromReadable(body), { headers, status }))
        pipe(body)
      },
      onShellError(error: unknown) {
        reject(error)
      },
      onError(error: unknown) {
        status = 500
        if (shellRendered) console.error(error)
      },
    })
    setTimeout(abort, streamTimeout + 1000)
  })
}

export const handleError: HandleErrorFunction = (error, { request }) => {
  if (request.signal.aborted) return
  const id = request.headers.get('x-request-id') ?? '-'
  // An outage is not a bug: one line, no stack (the page itself answers 503, scripts/http/outage.ts).
  if (isDatabaseUnavailable(error)) {
    console.error(`[request ${id}] ${request.method} ${new URL(request.url).pathname}: database unreachable`)
    return
  }
  console.error(`[request ${id}] ${request.method} ${new URL(request.url).pathname}:`, error)
}
