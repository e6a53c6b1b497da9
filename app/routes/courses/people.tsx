/**
 * A course's people: the roster (staff, students, and dropped students apart), invitations
 * still waiting, and the instructor's changes — invite one person, set a student's section,
 * drop a student or undo it, resend or revoke an invitation. TAs see all of it but change
 * nothing. A class list is imported at people/import, sections are set up at people/sections.
 */
import { data, Form, Link, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { canInvite, roleLabels } from '#app/domain/permissions.ts'
import { formatInZone } from '#app/lib/dates.ts'
import { type FieldErrors, noFieldErrors, noValues, parseForm, readFormData } from '#app/lib/form.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { EmailSchema } from '#app/lib/validation.ts'
import { inviteToCourse } from '#app/server/access-links.server.ts'
import { forbidden, requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { appUrl } from '#app/server/env.server.ts'
import {
  listPendingInvitations,
  listRoster,
  listSections,
  resendInvitation,
  revokeInvitation,
  setDropped,
  setStudentSection,
  type RosterMember,
} from '#app/server/roster.server.ts'
import { toActor } from '#app/server/users.server.ts'
import type { Route } from './+types/people'
import { Table, TableHead } from '#app/components/ui/table.tsx'

export const meta: Route.MetaFunction = () => [{ title: 'People · Cyclewright' }]

const InviteFormSchema = z.object({
  email: EmailSchema,
  role: z.enum(['student', 'ta', 'instructor'], { message: 'Choose a role.' }),
})

const Id = z.coerce.number().int().positive()
const ChangeSchema = z.discriminatedUnion('intent', [
  z.object({ intent: z.literal('drop'), userId: Id }),
  z.object({ intent: z.literal('undrop'), userId: Id }),
  z.object({
    intent: z.literal('set-section'),
    userId: Id,
    sectionId: z.union([z.literal('').transform(() => null), Id]),
  }),
  z.object({ intent: z.literal('resend'), invitationId: Id }),
  z.object({ intent: z.literal('revoke'), invitationId: Id }),
])

const Count = z.coerce.number().int().min(0).max(1_000_000).catch(0)

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const [roster, pending, sections] = await Promise.all([
    listRoster(db(), courseId),
    listPendingInvitations(db(), courseId),
    listSections(db(), courseId),
  ])
  const search = new URL(request.url).searchParams
  const imported = search.has('imported')
    ? {
        added: Count.parse(search.get('imported')),
        updated: Count.parse(search.get('updated')),
        invited: Count.parse(search.get('invited')),
      }
    : null
  return {
    course,
    roster,
    pending,
    sections: sections.map((s) => ({ id: s.id, name: s.name })),
    mayInvite: canInvite(toActor(user), courseId, 'student'),
    mayManage: course.role === 'instructor',
    imported,
  }
}

type ActionData = {
  ok: boolean
  intent: string
  fieldErrors: FieldErrors
  values: Record<string, string>
  sentTo: string | null
  message: string | null
}

const fill = (body: Partial<ActionData>): ActionData => ({
  ok: false,
  intent: 'invite',
  fieldErrors: noFieldErrors,
  values: noValues,
  sentTo: null,
  message: null,
  ...body,
})
/** A success is the plain result; a refusal carries its status. */
const result = (body: Partial<ActionData>, status = 200) => (status === 200 ? fill(body) : data(fill(body), { status }))

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { user, course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const formData = await readFormData(request)
  const intent = formData.get('intent')
  if (typeof intent === 'string' && intent !== 'invite') {
    if (course.role !== 'instructor') forbidden('Only the course’s instructors can change the roster.')
    const parsed = ChangeSchema.safeParse(
      Object.fromEntries([...formData.entries()].filter(([, v]) => typeof v === 'string')),
    )
    if (!parsed.success)
      return result({ intent, message: 'That change could not be read. Reload the page and try again.' }, 400)
    const input = parsed.data
    const base = { courseId, actorId: user.id }
    const change =
      input.intent === 'drop' || input.intent === 'undrop'
        ? await setDropped(db(), { ...base, userId: input.userId, dropped: input.intent === 'drop' })
        : input.intent === 'set-section'
          ? await setStudentSection(db(), { ...base, userId: input.userId, sectionId: input.sectionId })
          : input.intent === 'resend'
            ? await resendInvitation(db(), { ...base, invitationId: input.invitationId })
            : await revokeInvitation(db(), { ...base, invitationId: input.invitationId })
    const message =
      'message' in change
        ? change.message
        : input.intent === 'resend'
          ? `The invitation was sent again to ${change.email}.`
          : `The invitation to ${change.email} was revoked; its link no longer works.`
    return result({ ok: change.ok, intent, message }, change.ok ? 200 : 400)
  }
  const form = parseForm(formData, InviteFormSchema)
  if (!form.ok) return result({ fieldErrors: form.fieldErrors, values: form.values }, 400)
  if (!canInvite(toActor(user), courseId, form.value.role))
    forbidden('Only the course’s instructors can invite people.')
  try {
    await inviteToCourse(db(), {
      email: form.value.email,
      courseId,
      role: form.value.role,
      invitedBy: user.id,
      baseUrl: appUrl(),
    })
  } catch (e) {
    console.error('Invitation mail failed:', e)
    return result(
      { fieldErrors: { email: 'The invitation could not be e-mailed just now. Please try again in a minute.' } },
      503,
    )
  }
  return result({ ok: true, sentTo: form.value.email })
}

function MemberTable({
  members,
  caption,
  sections,
  mayManage,
  dropped,
  busy,
}: {
  members: RosterMember[]
  caption: string
  sections: { id: number; name: string }[]
  mayManage: boolean
  dropped: boolean
  busy: boolean
}) {
  return (
    <div className="relative mt-4 overflow-x-auto rounded-lg border border-line bg-white">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-paper text-xs tracking-wide text-muted uppercase">
          <tr>
            <th scope="col" className="px-3 py-2">
              Name
            </th>
            <th scope="col" className="px-3 py-2">
              Student ID
            </th>
            <th scope="col" className="px-3 py-2">
              E-mail
            </th>
            <th scope="col" className="px-3 py-2">
              Role
            </th>
            <th scope="col" className="px-3 py-2">
              Section
            </th>
            {mayManage ? (
              <th scope="col" className="px-3 py-2">
                <span className="sr-only">Changes</span>
              </th>
            ) : null}
          </tr>
        </thead>
        <tbody>
          {members.map((m) => {
            const known = m.section !== null && sections.some((s) => s.name === m.section)
            return (
              <tr key={m.userId} className="border-t border-line align-top">
                <th scope="row" className="px-3 py-2 font-medium">
                  {m.role === 'student' ? (
                    <Link to={`../students/${m.userId}`} relative="path">
                      {m.name}
                    </Link>
                  ) : (
                    m.name
                  )}
                  {!m.joined ? <span className="block text-xs font-normal text-muted">has not joined yet</span> : null}
                </th>
                <td className="px-3 py-2">{m.studentNumber ?? '—'}</td>
                <td className="px-3 py-2 break-all">{m.email}</td>
                <td className="px-3 py-2">{roleLabels[m.role]}</td>
                <td className="px-3 py-2">
                  {mayManage && m.role === 'student' && !dropped && sections.length > 0 ? (
                    <Form method="post" className="flex items-center gap-2">
                      <input type="hidden" name="intent" value="set-section" />
                      <input type="hidden" name="userId" value={m.userId} />
                      <select
                        name="sectionId"
                        aria-label={`Section of ${m.name}`}
                        defaultValue={known ? String(sections.find((s) => s.name === m.section)!.id) : ''}
                        className="rounded-md border border-line bg-white px-2 py-1"
                      >
                        <option value="">{m.section && !known ? `${m.section} (not set up)` : 'No section'}</option>
                        {sections.map((s) => (
                          <option key={s.id} value={s.id}>
                            {s.name}
                          </option>
                        ))}
                      </select>
                      <Button type="submit" variant="secondary" className="px-2 py-1" disabled={busy}>
                        Save<span className="sr-only"> section of {m.name}</span>
                      </Button>
                    </Form>
                  ) : (
                    (m.section ?? '—')
                  )}
                </td>
                {mayManage ? (
                  <td className="px-3 py-2">
                    {m.role === 'student' ? (
                      <Form method="post">
                        <input type="hidden" name="intent" value={dropped ? 'undrop' : 'drop'} />
                        <input type="hidden" name="userId" value={m.userId} />
                        <Button type="submit" variant="quiet" className="px-0 py-1 whitespace-nowrap" disabled={busy}>
                          {dropped ? 'Undo drop' : 'Drop'}
                          <span className="sr-only"> {m.name}</span>
                        </Button>
                      </Form>
                    ) : null}
                  </td>
                ) : null}
              </tr>
            )
          })}
        </tbody>
      </table>
    </div>
  )
}

export default function PeopleRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, roster, pending, sections, mayInvite, mayManage, imported } = loaderData
  const busy = useNavigation().state === 'submitting'
  const inviteResult = actionData && actionData.intent === 'invite' ? actionData : null
  const changeResult = actionData && actionData.intent !== 'invite' ? actionData : null
  const students = roster.active.filter((m) => m.role === 'student').length
  return (
    <div>
      <h1 className="mt-1 text-3xl font-semibold">People</h1>
      <p className="mt-2 flex flex-wrap gap-x-4 gap-y-1">
        {mayManage ? <Link to="import">Import a class list</Link> : null}
        <Link to="sections">Sections{sections.length > 0 ? ` (${sections.length})` : ''}</Link>
      </p>
      {imported ? (
        <Notice tone="ok" className="mt-4">
          Class list imported: {imported.added} student{imported.added === 1 ? '' : 's'} added, {imported.updated}{' '}
          updated, {imported.invited} invitation
          {imported.invited === 1 ? '' : 's'} sent.
        </Notice>
      ) : null}
      {changeResult?.message ? (
        <Notice tone={changeResult.ok ? 'ok' : 'error'} className="mt-4">
          {changeResult.message}
        </Notice>
      ) : null}

      {mayInvite ? (
        <section
          aria-labelledby="invite-title"
          className="mt-6 max-w-2xl rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6"
        >
          <h2 id="invite-title" className="text-xl font-semibold">
            Invite someone
          </h2>
          <p className="mt-1 text-sm text-muted">
            They receive an e-mail with a link that works once and expires in 7 days.
          </p>
          {inviteResult?.ok ? (
            <Notice tone="ok" className="mt-4">
              Invitation sent to {inviteResult.sentTo}.
            </Notice>
          ) : null}
          <Form method="post" className="mt-4 grid gap-4 sm:grid-cols-[1fr_auto_auto] sm:items-end">
            <input type="hidden" name="intent" value="invite" />
            <Field
              label="E-mail address"
              name="email"
              type="email"
              required
              defaultValue={inviteResult?.values?.email}
              error={inviteResult?.fieldErrors?.email}
            />
            <div className="flex flex-col gap-1">
              <label htmlFor="invite-role" className="text-sm font-medium">
                Role
              </label>
              <select
                id="invite-role"
                name="role"
                defaultValue={inviteResult?.values?.role ?? 'student'}
                className="rounded-md border border-line bg-white px-3 py-2"
                aria-invalid={inviteResult?.fieldErrors?.role ? true : undefined}
              >
                <option value="student">{roleLabels.student}</option>
                <option value="ta">{roleLabels.ta}</option>
                <option value="instructor">{roleLabels.instructor}</option>
              </select>
            </div>
            <Button type="submit" disabled={busy}>
              {busy ? 'Sending…' : 'Send invitation'}
            </Button>
          </Form>
        </section>
      ) : null}

      <section aria-labelledby="roster-title" className="mt-8">
        <h2 id="roster-title" className="text-xl font-semibold">
          Roster ({roster.active.length})
        </h2>
        <p className="mt-1 text-sm text-muted">
          {students === 0
            ? `No students yet.${mayManage ? ' Import a class list, or invite them one at a time.' : ''}`
            : `${students} student${students === 1 ? '' : 's'}${roster.dropped.length > 0 ? `, and ${roster.dropped.length} dropped (listed below)` : ''}.`}
        </p>
        {roster.active.length === 0 ? (
          <p className="mt-4 text-muted">
            Nobody is on this course yet.{mayManage ? ' Import a class list or invite people one at a time.' : ''}
          </p>
        ) : (
          <MemberTable
            members={roster.active}
            caption={`People in ${course.code}`}
            sections={sections}
            mayManage={mayManage}
            dropped={false}
            busy={busy}
          />
        )}
      </section>

      <section aria-labelledby="pending-title" className="mt-8">
        <h2 id="pending-title" className="text-xl font-semibold">
          Invitations not yet accepted ({pending.length})
        </h2>
        {pending.length === 0 ? (
          <p className="mt-2 text-muted">No invitation is waiting.</p>
        ) : (
          <Table boxClassName="mt-4" caption="Invitations not yet accepted">
            <TableHead>
              <tr>
                <th scope="col" className="px-3 py-2">
                  E-mail
                </th>
                <th scope="col" className="px-3 py-2">
                  Role
                </th>
                <th scope="col" className="px-3 py-2">
                  Last sent
                </th>
                <th scope="col" className="px-3 py-2">
                  Link
                </th>
                {mayManage ? (
                  <th scope="col" className="px-3 py-2">
                    <span className="sr-only">Changes</span>
                  </th>
                ) : null}
              </tr>
            </TableHead>
            <tbody>
              {pending.map((p) => (
                <tr key={p.id} className="border-t border-line align-top">
                  <th scope="row" className="px-3 py-2 font-normal break-all">
                    {p.email}
                    {p.name ? <span className="block text-xs text-muted">{p.name}</span> : null}
                  </th>
                  <td className="px-3 py-2">{roleLabels[p.role]}</td>
                  <td className="px-3 py-2 whitespace-nowrap">
                    {formatInZone(p.sentAt, course.timeZone, { withZone: false })}
                  </td>
                  <td className="px-3 py-2">
                    {p.expired ? (
                      <span className="text-warn">expired</span>
                    ) : (
                      `works until ${formatInZone(p.expiresAt, course.timeZone, { withZone: false })}`
                    )}
                  </td>
                  {mayManage ? (
                    <td className="px-3 py-2">
                      <div className="flex flex-wrap gap-2">
                        <Form method="post">
                          <input type="hidden" name="intent" value="resend" />
                          <input type="hidden" name="invitationId" value={p.id} />
                          <Button
                            type="submit"
                            variant="secondary"
                            className="px-2 py-1 whitespace-nowrap"
                            disabled={busy}
                          >
                            Send again<span className="sr-only"> to {p.email}</span>
                          </Button>
                        </Form>
                        <Form method="post">
                          <input type="hidden" name="intent" value="revoke" />
                          <input type="hidden" name="invitationId" value={p.id} />
                          <Button type="submit" variant="secondary" className="px-2 py-1" disabled={busy}>
                            Revoke<span className="sr-only"> the invitation to {p.email}</span>
                          </Button>
                        </Form>
                      </div>
                    </td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </Table>
        )}
        <p className="mt-2 text-sm text-muted">
          Sending again e-mails the same link and gives it another 7 days. Revoking stops the link from working; the
          person stays on the roster (drop them to take them out of the totals).
        </p>
      </section>

      <section aria-labelledby="dropped-title" className="mt-8">
        <h2 id="dropped-title" className="text-xl font-semibold">
          Dropped students ({roster.dropped.length})
        </h2>
        {roster.dropped.length === 0 ? (
          <p className="mt-2 text-muted">No student has been dropped.</p>
        ) : (
          <>
            <p className="mt-1 text-sm text-muted">
              Their answers are kept; they are left out of the course’s totals and exports.
            </p>
            <MemberTable
              members={roster.dropped}
              caption={`Students dropped from ${course.code}`}
              sections={sections}
              mayManage={mayManage}
              dropped
              busy={busy}
            />
          </>
        )}
      </section>
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
