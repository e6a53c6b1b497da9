/**
 * Errors a page may show as they are: each carries the HTTP status of the error page and a
 * message written for the person who asked. A route wraps the work in orErrorPage, and such an
 * error becomes that page (app/components/error-boundary.tsx shows the message) instead of a
 * bare 500; any other error is left to the error handler as a bug.
 */
import { data } from 'react-router'

export class PageError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message)
    this.name = 'PageError'
  }
}

/** Awaits `work`, turning a PageError into the error page (403, 404, 409, …); anything else is rethrown. */
export async function orErrorPage<T>(work: Promise<T>): Promise<T> {
  try {
    return await work
  } catch (e) {
    if (e instanceof PageError) throw data(e.message, { status: e.status })
    throw e
  }
}
