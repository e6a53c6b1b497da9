import { href, isRouteErrorResponse, useRouteError } from 'react-router'

const titles: Record<number, string> = {
  400: 'That request could not be read',
  403: 'You do not have access to this page',
  404: 'We could not find that page',
  405: 'That action is not available here',
  413: 'That upload is too large',
  429: 'Too many requests',
  503: 'Briefly unavailable',
}

/**
 * One friendly page for every error. Expected errors (thrown `data(message, { status })`)
 * show their message; unexpected ones show a calm apology, and the stack only in
 * development.
 */
export function GeneralErrorBoundary() {
  const error = useRouteError()
  let status = 500
  let message = 'Something went wrong on our side. Your saved work is safe; please try again in a moment.'
  let details: string | undefined
  if (isRouteErrorResponse(error)) {
    status = error.status
    if (typeof error.data === 'string' && error.data.length > 0 && error.data.length < 300) message = error.data
    else if (status === 404) message = 'The address may be mistyped, or the page may have moved.'
    else if (status === 403)
      message = 'Your account does not have a role that allows this. If you think it should, ask your instructor.'
  } else if (import.meta.env.DEV && error instanceof Error) {
    details = error.stack
  }
  const title = titles[status] ?? 'Something went wrong'
  return (
    <section
      aria-labelledby="error-title"
      className="mx-auto max-w-xl rounded-lg border border-line bg-white p-8 shadow-sm"
    >
      <p className="text-sm font-semibold tracking-wide text-muted uppercase">Error {status}</p>
      <h1 id="error-title" className="mt-2 text-2xl font-semibold">
        {title}
      </h1>
      <p className="mt-3 text-ink">{message}</p>
      <p className="mt-6">
        <a href={href('/')}>Go to your home page</a>
      </p>
      {details ? <pre className="mt-6 overflow-auto rounded bg-paper p-3 text-xs">{details}</pre> : null}
    </section>
  )
}
