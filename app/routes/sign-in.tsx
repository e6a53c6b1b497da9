import { data, Form, href, Link, useNavigation, useSearchParams } from 'react-router'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { readFormData } from '#app/lib/form.ts'
import { withoutNul } from '#app/lib/text-field.ts'
import { authenticator, requireAnonymous, safeRedirect, SignInError, startSession } from '#app/server/auth.server.ts'
import type { Route } from './+types/sign-in'

export const meta: Route.MetaFunction = () => [{ title: 'Sign in · Cyclewright' }]

export async function loader({ request }: Route.LoaderArgs) {
  await requireAnonymous(request)
  return null
}

export async function action({ request }: Route.ActionArgs) {
  await requireAnonymous(request)
  // The target is made safe before anything else, so a bad one can never fail after a session starts.
  const redirectTo = safeRedirect(new URL(request.url).searchParams.get('redirectTo'))
  const email = (await readFormData(request.clone())).get('email')
  try {
    const { userId } = await authenticator.authenticate('password', request)
    return await startSession(userId, redirectTo)
  } catch (error) {
    if (error instanceof SignInError) {
      // A NUL cannot be shown in the page, so it is left out of the address shown back.
      return data({ error: error.message, email: typeof email === 'string' ? withoutNul(email) : '' }, { status: 400 })
    }
    throw error
  }
}

export default function SignInRoute({ actionData }: Route.ComponentProps) {
  const navigation = useNavigation()
  const [params] = useSearchParams()
  const busy = navigation.state === 'submitting'
  const reset = params.get('reset') === '1'
  return (
    <section className="mx-auto max-w-md" aria-labelledby="sign-in-title">
      <h1 id="sign-in-title" className="text-3xl font-semibold">
        Sign in
      </h1>
      <p className="mt-2 text-muted">Use the e-mail address your course invitation was sent to.</p>
      {reset ? (
        <Notice tone="ok" className="mt-4">
          Your password has been changed. Sign in with the new one.
        </Notice>
      ) : null}
      {actionData?.error ? (
        <Notice tone="error" className="mt-4">
          {actionData.error}
        </Notice>
      ) : null}
      <Form method="post" className="mt-6 flex flex-col gap-4 rounded-lg border border-line bg-white p-6 shadow-sm">
        <Field
          label="E-mail address"
          name="email"
          type="email"
          autoComplete="email"
          required
          defaultValue={actionData?.email}
        />
        <Field label="Password" name="password" type="password" autoComplete="current-password" required />
        <Button type="submit" disabled={busy}>
          {busy ? 'Signing in…' : 'Sign in'}
        </Button>
        <p className="text-sm">
          <Link to={href('/forgot-password')}>Forgot your password?</Link>
        </p>
      </Form>
    </section>
  )
}
