/**
 * React Router's request handler for Express. It does what `@react-router/express` does,
 * with three differences that package has no hook for:
 * - the body React Router reads is the bounded stream from body-limit.ts, never the raw
 *   socket, so no route can read more than its limit;
 * - the URL React Router sees is built from APP_URL when it is set, so a forged Host or
 *   X-Forwarded-Host header cannot change links or redirects;
 * - a route's own Content-Security-Policy (the dispute attachment's sandbox) replaces the
 *   page policy instead of being added to it.
 */
import { createReadableStreamFromReadable, writeReadableStreamToWritable } from '@react-router/node'
import type { NextFunction, Request as ExpressRequest, Response as ExpressResponse } from 'express'
import { createRequestHandler as createReactRouterHandler, type AppLoadContext, type ServerBuild } from 'react-router'
import { RETRY_AFTER_SECONDS } from '#app/server/db/unavailable.server.ts'
import { BodyTooLargeError, type BodyLocals } from './body-limit.ts'

/** Headers that the server sets for every response and that a route may replace. */
const REPLACEABLE = new Set(['content-security-policy', 'cache-control', 'x-frame-options'])

export function requestUrl(req: ExpressRequest, canonicalOrigin: string | undefined): string {
  // Development without APP_URL: the address the browser used (as @react-router/express does).
  const origin = canonicalOrigin ?? `${req.protocol}://${req.get('host') ?? 'localhost'}`
  // Joined as text: resolving "//elsewhere.example/x" against the origin would change the host.
  const path = req.originalUrl.startsWith('/') ? req.originalUrl : `/${req.originalUrl}`
  return new URL(`${origin}${path}`).href
}

export function createRequestHandler(opts: {
  build: ServerBuild | (() => Promise<ServerBuild>)
  mode: string
  canonicalOrigin: string | undefined
  getLoadContext: (req: ExpressRequest, res: ExpressResponse) => AppLoadContext
}) {
  const handle = createReactRouterHandler(opts.build, opts.mode)
  return async (req: ExpressRequest, res: ExpressResponse, next: NextFunction) => {
    try {
      const controller = new AbortController()
      res.on('close', () => {
        if (!res.writableFinished) controller.abort()
      })
      const init: RequestInit & { duplex?: 'half' } = {
        method: req.method,
        headers: headersOf(req),
        signal: controller.signal,
      }
      if (req.method !== 'GET' && req.method !== 'HEAD') {
        const body = (res.locals as BodyLocals).body
        if (!body) throw new Error('The body limit middleware must run before the React Router handler.')
        // Over its limit the body has been answered with 413: stop the route's work too.
        body.once('error', (error) => {
          if (error instanceof BodyTooLargeError) controller.abort(error)
        })
        init.body = createReadableStreamFromReadable(body)
        init.duplex = 'half'
      }
      const request = new Request(requestUrl(req, opts.canonicalOrigin), init)
      const response = await handle(request, opts.getLoadContext(req, res))
      await send(req, res, response)
    } catch (error) {
      next(error)
    }
  }
}

function headersOf(req: ExpressRequest): Headers {
  const headers = new Headers()
  for (const [key, value] of Object.entries(req.headers)) {
    if (value === undefined) continue
    if (Array.isArray(value)) for (const v of value) headers.append(key, v)
    else headers.set(key, value)
  }
  return headers
}

async function send(req: ExpressRequest, res: ExpressResponse, response: Response) {
  // Already answered (a body over its limit) or the client has gone.
  if (res.headersSent || res.writableEnded || res.destroyed) {
    await response.body?.cancel().catch(() => {})
    return
  }
  res.statusMessage = response.statusText
  res.status(response.status)
  for (const key of new Set(response.headers.keys())) {
    if (REPLACEABLE.has(key)) res.removeHeader(key)
  }
  for (const [key, value] of response.headers.entries()) res.append(key, value)
  // A database outage (scripts/http/outage.ts): tell clients and balancers when to retry.
  if (response.status === 503 && !response.headers.has('retry-after'))
    res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS))
  // A body still arriving that nobody read (a chunked post to a page that ignores it): do
  // not keep reading it for the next request on this connection.
  if (req.method !== 'GET' && req.method !== 'HEAD' && !req.complete) res.setHeader('Connection', 'close')
  if (response.headers.get('Content-Type')?.match(/text\/event-stream/i)) res.flushHeaders()
  if (!response.body) {
    res.end()
    return
  }
  try {
    await writeReadableStreamToWritable(response.body, res)
  } catch (error) {
    if (res.destroyed || res.writableEnded) return
    throw error
  }
}
