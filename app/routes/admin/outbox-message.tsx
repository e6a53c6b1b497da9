import { data, href, Link } from 'react-router'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { requireIdParam } from '#app/lib/params.ts'
import { requireAdmin } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { findOutboxMessage, linksIn } from '#app/server/outbox.server.ts'
import type { Route } from './+types/outbox-message'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.message.subject ?? 'Message'} · Outbox · Cyclewright` },
]

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireAdmin(request)
  const id = requireIdParam(params.messageId, 'message')
  const message = await findOutboxMessage(db(), id)
  if (!message) throw data('There is no such message in the outbox.', { status: 404 })
  return {
    message: {
      id: message.id,
      subject: message.subject,
      from: message.envelopeFrom,
      to: message.envelopeTo,
      text: message.text,
      receivedAt: message.receivedAt,
    },
    links: linksIn(message.text),
  }
}

export default function OutboxMessageRoute({ loaderData }: Route.ComponentProps) {
  const { message, links } = loaderData
  return (
    <article aria-labelledby="message-title">
      <p className="text-sm">
        <Link to={href('/admin/outbox')}>← Outbox</Link>
      </p>
      <h1 id="message-title" className="mt-2 text-2xl font-semibold">
        {message.subject || '(no subject)'}
      </h1>
      <dl className="mt-4 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-muted">From</dt>
        <dd>{message.from}</dd>
        <dt className="text-muted">To</dt>
        <dd>{message.to.join(', ')}</dd>
        <dt className="text-muted">Received</dt>
        <dd>{new Date(message.receivedAt).toISOString().replace('T', ' ').slice(0, 16)} UTC</dd>
      </dl>
      {links.length > 0 ? (
        <section className="mt-6" aria-labelledby="links-title">
          <h2 id="links-title" className="text-lg font-semibold">
            Links in this message
          </h2>
          <ul className="mt-2 list-disc pl-6">
            {links.map((l) => (
              <li key={l}>
                <a href={l} data-outbox-link>
                  {l}
                </a>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <pre className="mt-6 rounded-lg border border-line bg-white p-4 font-sans text-sm whitespace-pre-wrap">
        {message.text}
      </pre>
    </article>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
