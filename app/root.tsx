import '@fontsource/lora/500.css'
import '@fontsource/lora/600.css'
import 'katex/dist/katex.min.css'
import './app.css'
import { QueryClient, QueryClientProvider } from '@tanstack/react-query'
import { useState } from 'react'
import { Form, Links, Meta, NavLink, Outlet, Scripts, ScrollRestoration, useRouteLoaderData } from 'react-router'
import type { Route } from './+types/root'
import { CyclewrightMark } from './components/cyclewright-mark.tsx'
import { GeneralErrorBoundary } from './components/error-boundary.tsx'
import { navFor, type NavUser } from './lib/nav.ts'
import { useNonce } from './lib/nonce.ts'
import { getUser } from './server/auth.server.ts'

export const meta: Route.MetaFunction = () => [{ title: 'Cyclewright' }]

export const links: Route.LinksFunction = () => [{ rel: 'icon', href: '/favicon.svg', type: 'image/svg+xml' }]

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request)
  const navUser: NavUser | null = user
    ? {
        name: user.name,
        email: user.email,
        isAdmin: user.isAdmin,
        courses: user.courses.map((c) => ({ id: c.id, code: c.code, title: c.title, role: c.role })),
      }
    : null
  return { user: navUser }
}

export function Layout({ children }: { children: React.ReactNode }) {
  // The response's CSP nonce on the server; undefined in the browser (the scripts already ran).
  const nonce = useNonce()
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  )
}

function Shell({ children }: { children: React.ReactNode }) {
  const data = useRouteLoaderData<typeof loader>('root')
  const user = data?.user ?? null
  const items = navFor(user)
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:rounded focus:bg-white focus:px-3 focus:py-2"
      >
        Skip to content
      </a>
      <header className="border-b border-line bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
          <a href="/" className="font-serif text-xl font-semibold text-ink no-underline hover:no-underline">
            <CyclewrightMark className="mr-1.5 inline-block align-[-0.3em]" />
            <span aria-hidden="true">Cyclewright</span>
          </a>
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1 max-sm:order-last max-sm:basis-full">
            {items.map((item) => (
              <NavLink
                key={item.to}
                to={item.to}
                end={item.end}
                className={({ isActive }) =>
                  `inline-flex min-h-11 items-center rounded-md px-3 py-1.5 text-sm no-underline hover:bg-accent-soft hover:no-underline sm:min-h-0 ${isActive ? 'bg-accent-soft font-semibold text-accent-strong' : 'text-ink'}`
                }
              >
                {item.label}
              </NavLink>
            ))}
          </nav>
          {user ? (
            <div className="flex items-center gap-3 text-sm max-sm:ml-auto">
              <span className="text-muted max-sm:sr-only" title={user.email}>
                {user.name}
              </span>
              <Form method="post" action="/sign-out">
                <button
                  type="submit"
                  className="min-h-11 rounded-md border border-line px-3 py-1.5 hover:bg-paper sm:min-h-0"
                >
                  Sign out
                </button>
              </Form>
            </div>
          ) : null}
        </div>
      </header>
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-4 py-8">
        {children}
      </main>
      <footer className="border-t border-line py-4 text-center text-xs text-muted">
        Cyclewright is a teaching tool. Its numbers are for learning thermodynamics, not design data; for real plant
        follow the applicable codes and licensed engineering practice.
      </footer>
    </div>
  )
}

export default function App() {
  // One client per browser session (and per server render), so cached queries never leak
  // between people on the server.
  const [queryClient] = useState(() => new QueryClient())
  return (
    <QueryClientProvider client={queryClient}>
      <Shell>
        <Outlet />
      </Shell>
    </QueryClientProvider>
  )
}

export function ErrorBoundary() {
  return (
    <Shell>
      <GeneralErrorBoundary />
    </Shell>
  )
}
