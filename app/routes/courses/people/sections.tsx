/**
 * A course's sections: add, rename (students in it follow), delete (students in it are left
 * without a section), and which teaching assistants look after each. Instructors change
 * them; TAs see them.
 */
import { data, Form, href, Link, useNavigation } from 'react-router'
import { z } from 'zod'
import { GeneralErrorBoundary } from '#app/components/error-boundary.tsx'
import { Button } from '#app/components/ui/button.tsx'
import { Field } from '#app/components/ui/field.tsx'
import { Notice } from '#app/components/ui/notice.tsx'
import { readFormData } from '#app/lib/form.ts'
import { requireIdParam } from '#app/lib/params.ts'
import { rosterLimits } from '#app/lib/roster-limits.ts'
import { forbidden, requireCourseRole } from '#app/server/auth.server.ts'
import { db } from '#app/server/db/client.server.ts'
import {
  adoptLooseSections,
  createSection,
  deleteSection,
  listLooseSectionNames,
  listRoster,
  listSections,
  renameSection,
  setSectionStaff,
  type RosterChange,
} from '#app/server/roster.server.ts'
import type { Route } from './+types/sections'

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Sections · ${data.course.code} · Cyclewright` : 'Sections · Cyclewright' },
]

const Id = z.coerce.number().int().positive()
const IntentSchema = z.discriminatedUnion('intent', [
  z.object({ intent: z.literal('create'), name: z.string().max(1000) }),
  z.object({ intent: z.literal('rename'), sectionId: Id, name: z.string().max(1000) }),
  z.object({ intent: z.literal('delete'), sectionId: Id }),
  z.object({ intent: z.literal('assign'), sectionId: Id, userId: Id }),
  z.object({ intent: z.literal('unassign'), sectionId: Id, userId: Id }),
  z.object({ intent: z.literal('adopt') }),
])

export async function loader({ request, params }: Route.LoaderArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  const [sections, loose, roster] = await Promise.all([
    listSections(db(), courseId),
    listLooseSectionNames(db(), courseId),
    listRoster(db(), courseId),
  ])
  const tas = roster.active.filter((m) => m.role === 'ta').map((m) => ({ userId: m.userId, name: m.name }))
  return { course, sections, loose, tas, mayManage: course.role === 'instructor' }
}

type ActionData = { ok: boolean; message: string; intent: string; sectionId: number | null; name: string }

export async function action({ request, params }: Route.ActionArgs) {
  const courseId = requireIdParam(params.courseId, 'course')
  const { course, user } = await requireCourseRole(request, courseId, ['instructor', 'ta'])
  if (course.role !== 'instructor') forbidden('Only the course’s instructors can change its sections.')
  const form = await readFormData(request)
  const raw = Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === 'string'))
  const parsed = IntentSchema.safeParse(raw)
  if (!parsed.success)
    return data<ActionData>(
      {
        ok: false,
        message: 'That change could not be read. Reload the page and try again.',
        intent: '',
        sectionId: null,
        name: '',
      },
      { status: 400 },
    )
  const input = parsed.data
  const base = { courseId, actorId: user.id }
  let result: RosterChange
  switch (input.intent) {
    case 'create':
      result = await createSection(db(), { ...base, name: input.name })
      break
    case 'rename':
      result = await renameSection(db(), { ...base, sectionId: input.sectionId, name: input.name })
      break
    case 'delete':
      result = await deleteSection(db(), { ...base, sectionId: input.sectionId })
      break
    case 'assign':
    case 'unassign':
      result = await setSectionStaff(db(), {
        ...base,
        sectionId: input.sectionId,
        userId: input.userId,
        assigned: input.intent === 'assign',
      })
      break
    case 'adopt':
      result = await adoptLooseSections(db(), base)
      break
  }
  const body: ActionData = {
    ok: result.ok,
    message: result.message,
    intent: input.intent,
    sectionId: 'sectionId' in input ? input.sectionId : null,
    name: 'name' in input ? input.name : '',
  }
  return data(body, { status: result.ok ? 200 : 400 })
}

export default function SectionsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { course, sections, loose, tas, mayManage } = loaderData
  const busy = useNavigation().state === 'submitting'
  const errorFor = (intent: string, sectionId: number | null) =>
    actionData && !actionData.ok && actionData.intent === intent && actionData.sectionId === sectionId
      ? actionData.message
      : undefined
  return (
    <div className="max-w-4xl">
      <p className="text-sm text-muted">
        <Link to={href('/courses/:courseId/people', { courseId: String(course.id) })}>People</Link>
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Sections</h1>
      <p className="mt-2 text-muted">
        Lab or tutorial groups. Put students in them from the people page or with a section column in an imported class
        list.
      </p>
      {actionData?.ok ? (
        <Notice tone="ok" className="mt-4">
          {actionData.message}
        </Notice>
      ) : actionData &&
        !actionData.ok &&
        (actionData.intent === '' ||
          actionData.intent === 'adopt' ||
          actionData.intent === 'assign' ||
          actionData.intent === 'unassign') ? (
        <Notice tone="error" className="mt-4">
          {actionData.message}
        </Notice>
      ) : null}

      {mayManage && loose.length > 0 ? (
        <Notice tone="warn" className="mt-4">
          <Form method="post" className="flex flex-wrap items-center gap-3">
            <span>Students are in sections that are not set up here yet: {loose.join(', ')}.</span>
            <input type="hidden" name="intent" value="adopt" />
            <Button type="submit" variant="secondary" disabled={busy}>
              Set them up as sections
            </Button>
          </Form>
        </Notice>
      ) : null}

      {mayManage ? (
        <Form
          method="post"
          className="mt-6 flex flex-col gap-3 rounded-lg border border-line bg-white p-4 shadow-sm sm:flex-row sm:items-end"
        >
          <input type="hidden" name="intent" value="create" />
          <Field
            label="New section"
            name="name"
            required
            maxLength={rosterLimits.section}
            className="sm:flex-1"
            defaultValue={errorFor('create', null) ? actionData?.name : undefined}
            error={errorFor('create', null)}
          />
          <Button type="submit" disabled={busy}>
            Add section
          </Button>
        </Form>
      ) : null}

      {sections.length === 0 ? (
        <p className="mt-6 text-muted">This course has no sections yet.{mayManage ? ' Add one above.' : ''}</p>
      ) : (
        <ul className="mt-6 space-y-4">
          {sections.map((s) => {
            const others = tas.filter((t) => !s.staff.some((x) => x.userId === t.userId))
            return (
              <li key={s.id} className="rounded-lg border border-line bg-white p-4 shadow-sm">
                <h2 className="text-lg font-semibold">
                  {s.name}{' '}
                  <span className="text-sm font-normal text-muted">
                    · {s.students === 1 ? '1 student' : `${s.students} students`}
                  </span>
                </h2>
                <p className="mt-1 text-sm">
                  Teaching assistants:{' '}
                  {s.staff.length === 0 ? (
                    <span className="text-muted">none yet</span>
                  ) : (
                    s.staff.map((t) => t.name).join(', ')
                  )}
                </p>
                {mayManage ? (
                  <div className="mt-3 flex flex-col gap-3">
                    {s.staff.length > 0 ? (
                      <ul className="flex flex-wrap gap-2">
                        {s.staff.map((t) => (
                          <li key={t.userId}>
                            <Form method="post">
                              <input type="hidden" name="intent" value="unassign" />
                              <input type="hidden" name="sectionId" value={s.id} />
                              <input type="hidden" name="userId" value={t.userId} />
                              <Button type="submit" variant="secondary" disabled={busy}>
                                Take {t.name} off {s.name}
                              </Button>
                            </Form>
                          </li>
                        ))}
                      </ul>
                    ) : null}
                    {others.length > 0 ? (
                      <Form method="post" className="flex flex-wrap items-end gap-2">
                        <input type="hidden" name="intent" value="assign" />
                        <input type="hidden" name="sectionId" value={s.id} />
                        <div className="flex flex-col gap-1">
                          <label htmlFor={`assign-${s.id}`} className="text-sm font-medium">
                            Teaching assistant for {s.name}
                          </label>
                          <select
                            id={`assign-${s.id}`}
                            name="userId"
                            className="rounded-md border border-line bg-white px-3 py-2"
                          >
                            {others.map((t) => (
                              <option key={t.userId} value={t.userId}>
                                {t.name}
                              </option>
                            ))}
                          </select>
                        </div>
                        <Button type="submit" variant="secondary" disabled={busy}>
                          Assign
                        </Button>
                      </Form>
                    ) : tas.length === 0 ? (
                      <p className="text-sm text-muted">
                        The course has no teaching assistants to assign; invite them from the people page.
                      </p>
                    ) : null}
                    <Form method="post" className="flex flex-wrap items-end gap-2">
                      <input type="hidden" name="intent" value="rename" />
                      <input type="hidden" name="sectionId" value={s.id} />
                      <Field
                        label={`New name for ${s.name}`}
                        name="name"
                        required
                        maxLength={rosterLimits.section}
                        defaultValue={errorFor('rename', s.id) ? actionData?.name : s.name}
                        error={errorFor('rename', s.id)}
                      />
                      <Button type="submit" variant="secondary" disabled={busy}>
                        Rename
                      </Button>
                    </Form>
                    <Form method="post">
                      <input type="hidden" name="intent" value="delete" />
                      <input type="hidden" name="sectionId" value={s.id} />
                      <Button type="submit" variant="quiet" disabled={busy} className="px-0">
                        Delete section {s.name}
                        {s.students > 0
                          ? ` (its ${s.students} student${s.students === 1 ? '' : 's'} will have no section)`
                          : ''}
                      </Button>
                      {errorFor('delete', s.id) ? (
                        <p className="text-sm text-danger">{errorFor('delete', s.id)}</p>
                      ) : null}
                    </Form>
                  </div>
                ) : null}
              </li>
            )
          })}
        </ul>
      )}
    </div>
  )
}

export function ErrorBoundary() {
  return <GeneralErrorBoundary />
}
