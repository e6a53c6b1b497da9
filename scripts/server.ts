/**
 * The HTTP server: Express with React Router's request handler, serving the production
 * build (or Vite's dev middleware in development). It also starts the local fake SMTP
 * server when no SMTP_URL is configured, so the demo's mail lands in the outbox.
 *
 * In front of React Router, in order: the client's address (TRUST_PROXY hops), security
 * headers with a per-response CSP nonce (http/security.ts), static files, no caching of
 * pages, posts only from this site's own pages, and bodies bounded per URL
 * (http/body-limit.ts). Loaders and actions that cannot reach the database answer 503
 * (http/outage.ts).
 */
import path from 'node:path'
import { pathToFileURL } from 'node:url'
import compression from 'compression'
import express from 'express'
import type { ServerBuild } from 'react-router'
import { CLIENT_ADDRESS_HEADER } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { env } from '#app/server/env.server.ts'
import { startFakeSmtp, type FakeSmtp } from '#app/server/fake-smtp.server.ts'
import { limitBodies } from './http/body-limit.ts'
import { withOutagePages, withOutagePagesLazy } from './http/outage.ts'
import { refuse } from './http/refusal.ts'
import { createRequestHandler } from './http/request-handler.ts'
import { noStore, nonceOf, sameOriginWrites, securityHeaders } from './http/security.ts'
import { projectRoot } from './postgres.ts'

export type RunningServer = {
  port: number
  url: string
  close: () => Promise<void>
  smtp: FakeSmtp | null
  server: import('node:http').Server
}

/** Idle keep-alive connections are kept this long. */
export const KEEP_ALIVE_MS = 65_000

export type ServerOptions = {
  port: number
  mode: 'production' | 'development'
  log?: (line: string) => void
  /** Defaults from the environment (TRUST_PROXY, HOST, APP_URL); tests set them per server. */
  trustProxy?: number
  host?: string
  appUrl?: string
}

export async function startServer(opts: ServerOptions): Promise<RunningServer> {
  const log = opts.log ?? console.log
  const e = env()
  let smtp: FakeSmtp | null = null
  if (!e.SMTP_URL) {
    try {
      smtp = await startFakeSmtp(db(), e.FAKE_SMTP_PORT, log)
    } catch (err) {
      // Another web process on this machine already runs the catcher: share it.
      if ((err as NodeJS.ErrnoException).code !== 'EADDRINUSE') throw err
      log(`The local mail catcher is already running on port ${e.FAKE_SMTP_PORT}; using that one.`)
    }
  }

  const trustProxy = opts.trustProxy ?? e.TRUST_PROXY
  const host = opts.host ?? e.HOST
  const appUrl = () => opts.appUrl ?? env().APP_URL
  const app = express()
  app.disable('x-powered-by')
  // A hop count, never `true`: only the addresses our own proxies appended are believed,
  // so a client cannot choose its address by sending X-Forwarded-For itself.
  app.set('trust proxy', trustProxy > 0 ? trustProxy : false)
  app.use((req, _res, next) => {
    // Our own header, always overwritten, so a client cannot choose its rate-limit bucket.
    req.headers[CLIENT_ADDRESS_HEADER] = req.ip ?? req.socket.remoteAddress ?? 'unknown'
    next()
  })
  app.use(securityHeaders(opts.mode))
  app.use(compression())

  let closeVite: (() => Promise<void>) | undefined
  let build: ServerBuild | (() => Promise<ServerBuild>)
  if (opts.mode === 'development') {
    const vite = await import('vite')
    const devServer = await vite.createServer({ server: { middlewareMode: true }, root: projectRoot })
    closeVite = () => devServer.close()
    app.use(devServer.middlewares)
    build = withOutagePagesLazy(
      () => devServer.ssrLoadModule('virtual:react-router/server-build') as Promise<ServerBuild>,
      log,
    )
  } else {
    const buildDir = path.join(projectRoot, 'build')
    build = withOutagePages(
      (await import(pathToFileURL(path.join(buildDir, 'server', 'index.js')).href)) as ServerBuild,
      log,
    )
    app.use('/assets', express.static(path.join(buildDir, 'client', 'assets'), { immutable: true, maxAge: '1y' }))
    app.use(express.static(path.join(buildDir, 'client'), { maxAge: '1h' }))
  }
  // Everything below is a page or an API answer, made for whoever asks.
  app.use(noStore())
  app.use(sameOriginWrites(appUrl))
  app.use(limitBodies())
  const configured = appUrl()
  app.all(
    '*',
    createRequestHandler({
      build,
      mode: opts.mode === 'development' ? 'development' : e.NODE_ENV === 'test' ? 'test' : 'production',
      canonicalOrigin: configured ? new URL(configured).origin : undefined,
      getLoadContext: (_req, res) => ({ cspNonce: nonceOf(res) }),
    }),
  )

  // Last resort (a build that cannot load, a broken header): a short page, never a stack trace.
  app.use((error: unknown, req: express.Request, res: express.Response, _next: express.NextFunction) => {
    log(
      `Unexpected error during ${req.method} ${req.path}: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`,
    )
    if (res.headersSent) {
      res.destroy()
      return
    }
    refuse(
      req,
      res,
      500,
      'Something went wrong',
      'Something went wrong on our side. Your saved work is safe; please try again in a moment.',
      { close: true },
    )
  })

  const server = await new Promise<import('node:http').Server>((resolve, reject) => {
    const s = app.listen(opts.port, host, () => resolve(s))
    s.once('error', reject)
  })
  // Longer than the idle timeout of common load balancers (60 s), so a balancer never sends
  // a request on a connection we are closing; headers must arrive a little sooner than that.
  server.keepAliveTimeout = KEEP_ALIVE_MS
  server.headersTimeout = KEEP_ALIVE_MS + 1_000
  const address = server.address()
  const port = typeof address === 'object' && address ? address.port : opts.port
  const shownHost = host === '0.0.0.0' || host === '::' ? '127.0.0.1' : host.includes(':') ? `[${host}]` : host
  return {
    port,
    url: `http://${shownHost}:${port}`,
    smtp,
    server,
    close: async () => {
      const closed = new Promise<void>((r) => server.close(() => r()))
      // Idle keep-alive connections would hold close() for up to KEEP_ALIVE_MS.
      server.closeIdleConnections()
      await closed
      await closeVite?.()
      await smtp?.close()
    },
  }
}
