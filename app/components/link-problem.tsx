import { href } from 'react-router'
import type { LinkProblem } from '#app/server/access-links.server.ts'

const texts: Record<LinkProblem, string> = {
  unknown: 'This link is not one we know. Check that the whole address from the e-mail was copied.',
  used: 'This link has already been used. Each link works once.',
  expired: 'This link has expired.',
  revoked: 'This invitation was withdrawn by the course staff, so the link no longer works.',
}

export function LinkProblemPanel({ problem, what }: { problem: LinkProblem; what: 'invitation' | 'password-reset' }) {
  return (
    <section
      className="mx-auto max-w-md rounded-lg border border-line bg-white p-6 shadow-sm"
      aria-labelledby="link-title"
    >
      <h1 id="link-title" className="text-2xl font-semibold">
        {what === 'invitation' ? 'This invitation cannot be used' : 'This reset link cannot be used'}
      </h1>
      <p className="mt-3">{texts[problem]}</p>
      <p className="mt-3 text-muted">
        {what === 'invitation'
          ? 'Ask your instructor to send a new invitation. If you already have an account, sign in.'
          : 'You can ask for a new link.'}
      </p>
      <p className="mt-4 flex gap-4">
        <a href={href('/sign-in')}>Sign in</a>
        {what === 'password-reset' ? <a href={href('/forgot-password')}>Ask for a new link</a> : null}
      </p>
    </section>
  )
}
