import { data, Form, useNavigation } from 'react-router'
import { z } from 'zod'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { noFieldErrors, noValues, parseForm, readFormData } from '#app/lib/form.ts'
import { echoValues } from '#app/lib/text-field.ts'
import { EmailSchema } from '#app/lib/validation.ts'
import { requestPasswordReset } from '#app/server/access-links.server.ts'
import { clientAddress } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { appUrl } from '#app/server/env.server.ts'
import type { Route } from './+types/forgot-password'

export const meta: Route.MetaFunction = () => [{ title: 'Reset your password · Cyclewright' }]

const ForgotFormSchema = z.object({ email: EmailSchema })

export async function action({ request }: Route.ActionArgs) {
  const form = parseForm(await readFormData(request), ForgotFormSchema)
  if (!form.ok)
    return data({ sent: false, fieldErrors: form.fieldErrors, values: echoValues(form.values) }, { status: 400 })
  // Sent, not sent (no account) or throttled: the same answer, so it reveals nothing.
  await requestPasswordReset(db(), form.value.email, { clientAddress: clientAddress(request), baseUrl: appUrl() })
  return { sent: true, fieldErrors: noFieldErrors, values: noValues }
}

export default function ForgotPasswordRoute({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === 'submitting'
  return (
    <section className="mx-auto max-w-md" aria-labelledby="forgot-title">
      <h1 id="forgot-title" className="text-3xl font-semibold">
        Reset your password
      </h1>
      {actionData?.sent ? (
        <Notice tone="ok" className="mt-4">
          If that address has an account, a link to choose a new password is on its way. It works once, for one hour.
        </Notice>
      ) : (
        <Form method="post" className="mt-6 flex flex-col gap-4 rounded-lg border border-line bg-white p-6 shadow-sm">
          <p className="text-sm text-muted">We will e-mail you a link to choose a new password.</p>
          <Field
            label="E-mail address"
            name="email"
            type="email"
            autoComplete="email"
            required
            defaultValue={actionData?.values?.email}
            error={actionData?.fieldErrors?.email}
          />
          <Button type="submit" disabled={busy}>
            {busy ? 'Sending…' : 'Send the link'}
          </Button>
        </Form>
      )}
    </section>
  )
}
