/**
 * Customised only to log unexpected errors once, with a request id, and to keep the
 * default streaming render. See React Router's "entry.server" docs.
 */
import { PassThrough } from 'node:stream'
import { createReadableStreamFromReadable } from '@react-router/node'
import { isbot } from 'isbot'
import { renderToPipeableStream } from 'react-dom/server'
import { ServerRouter, type EntryContext, type HandleErrorFunction } from 'react-router'

export const streamTimeout = 5_000

export default function handleRequest(request: Request, status: number, headers: Headers, context: EntryContext) {
  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false
    const ready = isbot(request.headers.get('user-agent') ?? '') || context.isSpaMode ? 'onAllReady' : 'onShellReady'
    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={context} url={request.url} />, {
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
  console.error(`[request ${id}] ${request.method} ${new URL(request.url).pathname}:`, error)
}
