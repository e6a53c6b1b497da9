import { href, Link } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { pageParam } from '#app/lib/query-params.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { countOutbox, listOutbox } from '#app/server/outbox.server.ts'
import type { Route } from './+types/outbox'
import { EmptyState } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = () => [{ title: 'Outbox · Cyclewright' }]

const PAGE = 50

export async function loader({ request }: Route.LoaderArgs) {
  await requireAdmin(request)
  // A page number beyond use is refused with a message rather than sent to the database as an offset.
  const page = pageParam(new URL(request.url).searchParams)
  const [messages, total] = await Promise.all([
    listOutbox(db(), { limit: PAGE, offset: (page - 1) * PAGE }),
    countOutbox(db()),
  ])
  return { messages, total, page, pages: Math.max(1, Math.ceil(total / PAGE)) }
}

const when = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' })

export default function OutboxRoute({ loaderData }: Route.ComponentProps) {
  const { messages, total, page, pages } = loaderData
  return (
    <div>
      <h1 className="text-3xl font-semibold">Outbox</h1>
      <p className="mt-2 max-w-2xl text-muted">
        Mail caught by the local mail server of this installation ({total} message{total === 1 ? '' : 's'}). Nothing
        here left the machine. Times in UTC.
      </p>
      {messages.length === 0 ? (
        <EmptyState className="mt-8">No mail yet. Invitations and password resets appear here.</EmptyState>
      ) : (
        <ul className="mt-6 divide-y divide-line rounded-lg border border-line bg-white" aria-label="Messages">
          {messages.map((m) => (
            <li key={m.id} className="flex flex-wrap items-baseline justify-between gap-2 px-4 py-3">
              <Link to={href('/admin/outbox/:messageId', { messageId: String(m.id) })} className="font-medium">
                {m.subject || '(no subject)'}
              </Link>
              <span className="text-sm text-muted">
                to {m.envelopeTo.join(', ')} ·{' '}
                <time dateTime={new Date(m.receivedAt).toISOString()}>{when.format(new Date(m.receivedAt))}</time>
              </span>
            </li>
          ))}
        </ul>
      )}
      {pages > 1 ? (
        <nav aria-label="Pages" className="mt-4 flex gap-4 text-sm">
          {page > 1 ? <Link to={`?page=${page - 1}`}>Newer</Link> : null}
          <span className="text-muted">
            Page {page} of {pages}
          </span>
          {page < pages ? <Link to={`?page=${page + 1}`}>Older</Link> : null}
        </nav>
      ) : null}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
