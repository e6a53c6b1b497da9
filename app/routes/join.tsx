import { data, Form, href, redirect, useNavigation } from 'react-router'
import { z } from 'zod'
import { LinkProblemPanel } from '#app/components/link-problem.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { NewPasswordFields } from '#app/components/new-password-fields.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { roleLabels } from '#app/domain/permissions.ts'
import { noFieldErrors, noValues, parseForm, readFormData } from '#app/lib/form.ts'
import { NameSchema, NewPasswordSchema, rules } from '#app/lib/validation.ts'
import { acceptInvitation, findAccessLink } from '#app/server/access-links.server.ts'
import { getUser, startSession } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import type { Route } from './+types/join'

export const meta: Route.MetaFunction = () => [{ title: 'Join a course · Cyclewright' }]

const NewAccountSchema = z
  .object({ name: NameSchema, password: NewPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { message: 'The two passwords are not the same.', path: ['confirm'] })

export async function loader({ params }: Route.LoaderArgs) {
  const found = await findAccessLink(db(), params.token, 'invitation')
  if (!found.ok) return { problem: found.problem, invitation: null }
  const { link, existingUser } = found
  return {
    problem: null,
    invitation: {
      email: link.email,
      course: `${link.courseCode ?? ''} ${link.courseTitle ?? ''}`.trim(),
      role: link.role ? roleLabels[link.role] : null,
      hasAccount: existingUser?.hasPassword ?? false,
      // A person put on a roster has an account without a password yet: their name is filled in.
      name: existingUser && !existingUser.hasPassword ? existingUser.name : null,
    },
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const found = await findAccessLink(db(), params.token, 'invitation')
  if (!found.ok)
    return data(
      { fieldErrors: noFieldErrors, values: noValues, formError: 'This invitation can no longer be used.' },
      { status: 400 },
    )
  const courseTarget = (courseId: number | null) =>
    courseId ? href('/courses/:courseId', { courseId: String(courseId) }) : href('/')
  if (found.existingUser?.hasPassword) {
    // An existing account only gains the course; it must prove who it is by signing in.
    const accepted = await acceptInvitation(db(), params.token, {})
    if (!accepted)
      return data(
        { fieldErrors: noFieldErrors, values: noValues, formError: 'This invitation can no longer be used.' },
        { status: 400 },
      )
    const current = await getUser(request)
    const target = courseTarget(accepted.courseId)
    if (current?.id === accepted.userId) return redirect(target)
    return redirect(`${href('/sign-in')}?${new URLSearchParams({ redirectTo: target })}`)
  }
  const form = parseForm(await readFormData(request), NewAccountSchema)
  if (!form.ok)
    return data({ fieldErrors: form.fieldErrors, values: form.values, formError: form.formError }, { status: 400 })
  const accepted = await acceptInvitation(db(), params.token, { name: form.value.name, password: form.value.password })
  if (!accepted)
    return data(
      { fieldErrors: noFieldErrors, values: noValues, formError: 'This invitation can no longer be used.' },
      { status: 400 },
    )
  return startSession(accepted.userId, courseTarget(accepted.courseId))
}

export default function JoinRoute({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === 'submitting'
  if (loaderData.problem || !loaderData.invitation)
    return <LinkProblemPanel problem={loaderData.problem ?? 'unknown'} what="invitation" />
  const inv = loaderData.invitation
  return (
    <section className="mx-auto max-w-md" aria-labelledby="join-title">
      <h1 id="join-title" className="text-3xl font-semibold">
        Join {inv.course}
      </h1>
      <p className="mt-2 text-muted">
        You are invited as {inv.role?.toLowerCase() ?? 'a member'}, at {inv.email}.
      </p>
      {actionData?.formError ? (
        <Notice tone="error" className="mt-4">
          {actionData.formError}
        </Notice>
      ) : null}
      <Form method="post" className="mt-6 flex flex-col gap-4 rounded-lg border border-line bg-white p-6 shadow-sm">
        {inv.hasAccount ? (
          <p>
            You already have a Cyclewright account. Add this course to it, then sign in if you are not signed in yet.
          </p>
        ) : (
          <>
            <Field
              label="Your name"
              name="name"
              autoComplete="name"
              required
              minLength={rules.name.minLength}
              maxLength={rules.name.maxLength}
              defaultValue={actionData?.values?.name ?? inv.name ?? undefined}
              error={actionData?.fieldErrors?.name}
            />
            <NewPasswordFields label="Choose a password" errors={actionData?.fieldErrors} />
          </>
        )}
        <Button type="submit" disabled={busy}>
          {busy ? 'Joining…' : inv.hasAccount ? 'Add the course' : 'Create my account and join'}
        </Button>
      </Form>
    </section>
  )
}
