/** Builds real Requests for calling loaders and actions directly, as the router would. */
export const BASE = 'http://127.0.0.1:9'

export function formRequest(path: string, fields: Record<string, string>, headers: Record<string, string> = {}) {
  return new Request(`${BASE}${path}`, {
    method: 'POST',
    body: new URLSearchParams(fields),
    headers: {
      'Content-Type': 'application/x-www-form-urlencoded',
      'x-cyclewright-client-address': '10.0.0.1',
      ...headers,
    },
  })
}

export function getRequest(path: string, headers: Record<string, string> = {}) {
  return new Request(`${BASE}${path}`, { headers })
}

/** The cookie pair from a Set-Cookie header, ready for a Cookie header. */
export function cookieFrom(response: Response): string {
  const set = response.headers.get('Set-Cookie')
  if (!set) throw new Error('response set no cookie')
  return set.split(';')[0]!
}

// Loader/action arguments as the router passes them; the tests only use request and params.
export function args<P extends Record<string, string>>(request: Request, params: P = {} as P) {
  return { request, params, context: {}, unstable_pattern: '' } as never
}

/** Runs a loader or action and returns what it threw (a Response) or returned. */
export async function settle<T>(p: Promise<T>): Promise<{ thrown: unknown } | { value: T }> {
  try {
    return { value: await p }
  } catch (thrown) {
    return { thrown }
  }
}
