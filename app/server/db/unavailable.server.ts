/**
 * Telling a database outage from a bug. A page whose loader or action cannot reach
 * PostgreSQL answers 503 (try again soon) instead of 500 (something is broken); the HTTP
 * server (scripts/http/outage.ts) uses this to turn such errors into a clear page.
 */

/** Network failures of the connection itself (Node's error codes). */
const NETWORK_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'ENOTFOUND',
  'EAI_AGAIN',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'EHOSTDOWN',
])

/**
 * PostgreSQL SQLSTATEs that mean "not now" rather than "wrong query": class 08 (connection
 * exception), 57P01 admin shutdown, 57P02 crash shutdown, 57P03 cannot connect now (starting
 * up, in recovery), 53300 too many connections.
 */
const POSTGRES_CODES = /^(08\d{3}|57P0[123]|53300)$/

/** Messages of node-postgres's own connection failures, which carry no code. */
const PG_MESSAGES = [
  /^Connection terminated/i, // "Connection terminated unexpectedly", "… due to connection timeout"
  /timeout exceeded when trying to connect/i, // the pool's connectionTimeoutMillis
  /Client has encountered a connection error and is not queryable/i,
  /Client was closed and is not queryable/i,
  /Cannot use a pool after calling end on the pool/i,
]

/**
 * True when the error (or what it wraps: drizzle puts the driver's error in `cause`, Node's
 * dual-stack connect puts one per address in `errors`) says the database cannot be reached.
 */
export function isDatabaseUnavailable(error: unknown, depth = 0): boolean {
  if (depth > 5 || typeof error !== 'object' || error === null) return false
  const code: unknown = Reflect.get(error, 'code')
  const message: unknown = Reflect.get(error, 'message')
  const errors: unknown = Reflect.get(error, 'errors')
  if (typeof code === 'string' && (NETWORK_CODES.has(code) || POSTGRES_CODES.test(code))) return true
  if (typeof message === 'string' && PG_MESSAGES.some((m) => m.test(message))) return true
  if (Array.isArray(errors) && errors.some((inner) => isDatabaseUnavailable(inner, depth + 1))) return true
  return isDatabaseUnavailable(Reflect.get(error, 'cause'), depth + 1)
}

/** Seconds a client is told to wait before trying again (the Retry-After header). */
export const RETRY_AFTER_SECONDS = 30

export const UNAVAILABLE_MESSAGE =
  'Cyclewright cannot reach its database just now, so this page could not be shown and nothing you sent was saved. Please try again in a minute.'
