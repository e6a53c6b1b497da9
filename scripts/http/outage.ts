/**
 * A database outage answers 503 with a clear page and Retry-After, not 500. Every route's
 * loader and action is wrapped once when the build is loaded: an error that says PostgreSQL
 * cannot be reached (app/server/db/unavailable.server.ts) becomes a thrown 503 response,
 * which the app's error boundary shows with its message; any other error passes unchanged.
 */
import { data, type ServerBuild } from 'react-router'
import { isDatabaseUnavailable, RETRY_AFTER_SECONDS, UNAVAILABLE_MESSAGE } from '#app/server/db/unavailable.server.ts'

type Handler = (args: { request: Request }) => unknown

function guarded(handler: Handler, log: (line: string) => void): Handler {
  return async (args) => {
    try {
      return await handler(args)
    } catch (error) {
      if (!isDatabaseUnavailable(error)) throw error
      const url = new URL(args.request.url)
      const cause = error instanceof Error ? error.message : String(error)
      log(`Database unreachable during ${args.request.method} ${url.pathname}: ${cause.split('\n')[0]}`)
      throw data(UNAVAILABLE_MESSAGE, { status: 503, headers: { 'Retry-After': String(RETRY_AFTER_SECONDS) } })
    }
  }
}

export function withOutagePages(build: ServerBuild, log: (line: string) => void = console.error): ServerBuild {
  const routes: ServerBuild['routes'] = {}
  for (const [id, route] of Object.entries(build.routes)) {
    if (!route) continue
    const module = { ...route.module }
    if (module.loader) module.loader = guarded(module.loader as Handler, log) as typeof module.loader
    if (module.action) module.action = guarded(module.action as Handler, log) as typeof module.action
    routes[id] = { ...route, module }
  }
  return { ...build, routes }
}

/** The same for a build loaded on each request (development): wrapped once per build. */
export function withOutagePagesLazy(
  load: () => Promise<ServerBuild>,
  log?: (line: string) => void,
): () => Promise<ServerBuild> {
  const wrapped = new WeakMap<ServerBuild, ServerBuild>()
  return async () => {
    const build = await load()
    let w = wrapped.get(build)
    if (!w) {
      w = withOutagePages(build, log)
      wrapped.set(build, w)
    }
    return w
  }
}
