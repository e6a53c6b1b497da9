import { data, Form, href, redirect, useNavigation } from 'react-router'
import { LinkProblemPanel } from '#app/components/link-problem.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { NewPasswordFields } from '#app/components/new-password-fields.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { noFieldErrors, parseForm, readFormData } from '#app/lib/form.ts'
import { PasswordPairSchema } from '#app/lib/validation.ts'
import { findAccessLink, resetPassword } from '#app/server/access-links.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/reset-password'

export const meta: Route.MetaFunction = () => [{ title: 'Choose a new password · Cyclewright' }]

export async function loader({ params }: Route.LoaderArgs) {
  const found = await findAccessLink(db(), params.token, 'password-reset')
  if (!found.ok) return { problem: found.problem, email: null }
  return { problem: null, email: found.link.email }
}

export async function action({ request, params }: Route.ActionArgs) {
  const form = parseForm(await readFormData(request), PasswordPairSchema)
  if (!form.ok) return data({ fieldErrors: form.fieldErrors, formError: form.formError }, { status: 400 })
  const done = await resetPassword(db(), params.token, form.value.password)
  if (!done)
    return data(
      { fieldErrors: noFieldErrors, formError: 'This link can no longer be used. Ask for a new one.' },
      { status: 400 },
    )
  return redirect(`${href('/sign-in')}?reset=1`)
}

export default function ResetPasswordRoute({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === 'submitting'
  if (loaderData.problem) return <LinkProblemPanel problem={loaderData.problem} what="password-reset" />
  return (
    <section className="mx-auto max-w-md" aria-labelledby="reset-title">
      <h1 id="reset-title" className="text-3xl font-semibold">
        Choose a new password
      </h1>
      <p className="mt-2 text-muted">
        For {loaderData.email}. Every device signed in to this account will be signed out.
      </p>
      {actionData?.formError ? (
        <Notice tone="error" className="mt-4">
          {actionData.formError}
        </Notice>
      ) : null}
      <Form method="post" className="mt-6 flex flex-col gap-4 rounded-lg border border-line bg-white p-6 shadow-sm">
        <NewPasswordFields label="New password" errors={actionData?.fieldErrors} />
        <Button type="submit" disabled={busy}>
          {busy ? 'Saving…' : 'Save the new password'}
        </Button>
      </Form>
    </section>
  )
}
