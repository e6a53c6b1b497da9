/**
 * The author guide and the bank format (docs/authoring.md, docs/bank-format.md) as pages of
 * the app, for the people who write and import problems: signed-in staff who may use the
 * bank, like the editor and the import page that link here. The documents are bundled into
 * the build, so the page shows the guide of the running release.
 */
import { data, href } from 'react-router'
import authoring from '../../docs/authoring.md?raw'
import bankFormat from '../../docs/bank-format.md?raw'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { renderGuide } from '#app/domain/authoring/prompt.ts'
import { isKeyOf } from '#app/lib/guards.ts'
import { requireBankUser } from '#app/server/auth.server.ts'
import type { Route } from './+types/help'

const GUIDES = {
  authoring: { title: 'Writing a problem', markdown: authoring },
  'bank-format': { title: 'The bank document', markdown: bankFormat },
} as const

const LINKS = {
  'authoring.md': href('/help/:page', { page: 'authoring' }),
  'bank-format.md': href('/help/:page', { page: 'bank-format' }),
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.title ?? 'Help'} · Cyclewright` }]

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireBankUser(request)
  const page = params.page
  if (!isKeyOf(GUIDES, page))
    throw data('There is no such help page. The guides are “Writing a problem” and “The bank document”.', {
      status: 404,
    })
  const g = GUIDES[page]
  return { title: g.title, html: renderGuide(g.markdown, LINKS).html }
}

export default function HelpRoute({ loaderData }: Route.ComponentProps) {
  return (
    <div className="max-w-3xl">
      <p className="text-sm text-muted">
        <a href={href('/bank')}>Problem bank</a> ·{' '}
        <a href={href('/help/:page', { page: 'authoring' })}>Writing a problem</a> ·{' '}
        <a href={href('/help/:page', { page: 'bank-format' })}>The bank document</a>
      </p>
      <article
        className="prompt-html mt-4 leading-relaxed [&_a]:text-accent [&_a]:underline [&_blockquote]:my-3 [&_blockquote]:border-l-4 [&_blockquote]:border-line [&_blockquote]:pl-3 [&_blockquote]:text-muted [&_h1]:text-3xl [&_h1]:font-semibold [&_h2]:mt-8 [&_h2]:text-2xl [&_h2]:font-semibold [&_h3]:mt-6 [&_h3]:text-lg [&_h3]:font-semibold [&_li]:mt-1 [&_p]:mt-3 [&_pre]:mt-3 [&_pre]:overflow-x-auto [&_pre]:rounded-md [&_pre]:bg-white [&_pre]:p-3 [&_pre]:text-xs [&_table]:mt-3 [&_table]:text-sm [&_td]:border [&_td]:border-line [&_td]:px-2 [&_td]:py-1 [&_th]:border [&_th]:border-line [&_th]:px-2 [&_th]:py-1 [&_th]:text-left"
        dangerouslySetInnerHTML={{ __html: loaderData.html }}
      />
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
