/**
 * The assignment picker and its check guard (issue #15), through the real new and edit
 * actions against PostgreSQL: each version offered with its latest check, a version whose
 * check failed, never ran or is still running refused unless overridden for that version,
 * the override audited, and an item left on its version never asked again.
 */
import { and, eq } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import { action as editAction, loader as editLoader } from '#app/routes/courses/assignments/edit.tsx'
import { action as newAction, loader as newLoader } from '#app/routes/courses/assignments/new.tsx'
import { db } from '#app/server/db/client.server.ts'
import { assignmentItems, assignments, auditEvents, problemVersions } from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import {
  addMember,
  createAssignment,
  createCourse,
  createProblemWithVersion,
  createUser,
  recordCheck,
} from '#tests/support/factories.ts'
import { args, formRequest, getRequest } from '#tests/support/requests.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { sessionCookie } from '#tests/support/login.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition
const diesel = DEMO_PROBLEMS.find((p) => p.definition.title.startsWith('Air-standard Diesel'))!.definition

async function setUp() {
  const course = await createCourse(db(), { timeZone: 'UTC' })
  const instructor = await createUser(db(), { name: 'Ingrid Instructor', departmentId: course.departmentId })
  await addMember(db(), instructor.id, course.id, 'instructor')
  return { course, instructor, cookie: await sessionCookie(instructor) }
}

function fields(extra: Record<string, string>): Record<string, string> {
  return {
    intent: 'save',
    title: 'Week 4: checked problems',
    instructions: '',
    opensAt: '2027-01-10T09:00',
    dueAt: '2027-01-15T23:59',
    attemptsPerFind: '3',
    latePolicy: 'closed',
    latePenaltyPercentPerDay: '10',
    lateDaysAllowed: '3',
    keyRelease: 'after-due',
    ...extra,
  }
}

type Refused = {
  data: {
    fieldErrors: Record<string, string>
    formError: string
    state: { values: Record<string, string>; items: { versionId: string; override?: string }[] }
  }
  init: { status: number }
}

async function postNew(courseId: number, cookie: string, extra: Record<string, string>) {
  return newAction(
    args(formRequest(`/courses/${courseId}/assignments/new`, fields(extra), { Cookie: cookie }), {
      courseId: String(courseId),
    }),
  )
}

async function overrideRows(assignmentId: number) {
  return db()
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.assignmentId, assignmentId), eq(auditEvents.kind, 'assignment-check-overridden')))
}

describe('the picker’s data', () => {
  test('each version comes with its latest check in words: passed, failed, running, never', async () => {
    const { course, instructor, cookie } = await setUp()
    const a = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    const b = await createProblemWithVersion(db(), instructor.id, diesel, { frozen: false })
    // An older passed check does not hide the newer failed one.
    await recordCheck(db(), a.versionId, instructor.id, { createdAt: new Date('2026-11-01T00:00:00Z') })
    await recordCheck(db(), a.versionId, instructor.id, { failed: 83, createdAt: new Date('2026-11-02T00:00:00Z') })
    const [b2] = await db()
      .insert(problemVersions)
      .values({ problemId: b.problemId, number: 2, definition: diesel, createdBy: instructor.id })
      .returning()
    await recordCheck(db(), b2!.id, instructor.id, { status: 'running', total: 200, checked: 40 })
    const other = await createProblemWithVersion(
      db(),
      instructor.id,
      { ...otto, title: 'A checked Otto cycle' },
      { frozen: false },
    )
    await recordCheck(db(), other.versionId, instructor.id)

    const loaded = (await newLoader(
      args(getRequest(`/courses/${course.id}/assignments/new`, { Cookie: cookie }), { courseId: String(course.id) }),
    )) as {
      choices: {
        problemId: number
        title: string
        versions: { id: number; number: number; author: string; savedAt: Date; check: { state: string } }[]
      }[]
    }
    const byVersion = new Map(
      loaded.choices.flatMap((c) => c.versions.map((v) => [v.id, { ...v, title: c.title }] as const)),
    )
    expect(byVersion.get(a.versionId)!.check).toEqual({ state: 'failed', total: 500, checked: 500, failed: 83 })
    expect(byVersion.get(other.versionId)!.check).toEqual({ state: 'passed', total: 500, checked: 500, failed: 0 })
    expect(byVersion.get(b2!.id)!.check).toEqual({ state: 'running', total: 200, checked: 40, failed: 0 })
    expect(byVersion.get(b.versionId)!.check).toEqual({ state: 'never' })
    expect(byVersion.get(a.versionId)!.author).toBe('Ingrid Instructor')
    expect(byVersion.get(a.versionId)!.savedAt).toBeInstanceOf(Date)
    expect(loaded.choices.find((c) => c.problemId === b.problemId)!.versions.map((v) => v.number)).toEqual([2, 1])
  })
})

describe('adding a version whose check did not pass', () => {
  test('a failed check is refused beside the field with its numbers, everything typed kept and nothing written', async () => {
    const { course, instructor, cookie } = await setUp()
    const good = await createProblemWithVersion(db(), instructor.id, diesel, { frozen: false })
    await recordCheck(db(), good.versionId, instructor.id)
    const bad = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    await recordCheck(db(), bad.versionId, instructor.id, { failed: 83 })
    const r = (await postNew(course.id, cookie, {
      'items.0.versionId': String(good.versionId),
      'items.0.points': '10',
      'items.1.versionId': String(bad.versionId),
      'items.1.points': '7',
    })) as unknown as Refused
    expect(r.init.status).toBe(400)
    expect(r.data.fieldErrors['items.0.versionId']).toBeUndefined()
    expect(r.data.fieldErrors['items.1.versionId']).toMatch(
      /^Check failed: 83 of 500 variants\. .*Assign although the check failed \(83 of 500 variants\)/,
    )
    expect(r.data.state.values.title).toBe('Week 4: checked problems')
    expect(r.data.state.items.map((i) => i.versionId)).toEqual([String(good.versionId), String(bad.versionId)])
    expect(await db().select().from(assignments).where(eq(assignments.courseId, course.id))).toEqual([])
  })

  test('a version never checked, or whose check is still running, is refused too', async () => {
    const { course, instructor, cookie } = await setUp()
    const never = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    const running = await createProblemWithVersion(db(), instructor.id, diesel, { frozen: false })
    await recordCheck(db(), running.versionId, instructor.id, { status: 'queued', checked: 0 })
    const r = (await postNew(course.id, cookie, {
      'items.0.versionId': String(never.versionId),
      'items.0.points': '10',
      'items.1.versionId': String(running.versionId),
      'items.1.points': '10',
    })) as unknown as Refused
    expect(r.init.status).toBe(400)
    expect(r.data.fieldErrors['items.0.versionId']).toMatch(/^Never checked\./)
    expect(r.data.fieldErrors['items.1.versionId']).toMatch(/^Check running: 0 of 500 variants so far\./)
  })

  test('the override for that version saves it and writes one audit row naming the check; an override for another version counts for nothing', async () => {
    const { course, instructor, cookie } = await setUp()
    const bad = await createProblemWithVersion(db(), instructor.id, otto, { frozen: false })
    await recordCheck(db(), bad.versionId, instructor.id, { failed: 83 })
    const other = await createProblemWithVersion(db(), instructor.id, diesel, { frozen: false })

    const wrong = (await postNew(course.id, cookie, {
      'items.0.versionId': String(bad.versionId),
      'items.0.points': '10',
      'items.0.override': String(other.versionId),
    })) as unknown as Refused
    expect(wrong.init.status).toBe(400)
    expect(wrong.data.fieldErrors['items.0.versionId']).toMatch(/^Check failed/)
    expect(wrong.data.state.items[0]!.override).toBe(String(other.versionId))

    const res = (await postNew(course.id, cookie, {
      'items.0.versionId': String(bad.versionId),
      'items.0.points': '10',
      'items.0.override': String(bad.versionId),
    })) as Response
    expect(res.status).toBe(302)
    const id = Number(res.headers.get('Location')!.split('/').pop())
    const items = await db().select().from(assignmentItems).where(eq(assignmentItems.assignmentId, id))
    expect(items.map((i) => i.problemVersionId)).toEqual([bad.versionId])
    const audit = await overrideRows(id)
    expect(audit).toHaveLength(1)
    expect(audit[0]).toMatchObject({
      actorId: instructor.id,
      courseId: course.id,
      after: { items: [{ position: 1, versionId: bad.versionId, check: 'Check failed: 83 of 500 variants' }] },
    })
    expect(audit[0]!.note).toMatch(/Problem 1 assigned although: Check failed: 83 of 500 variants/)
  })
})

describe('editing an assignment', () => {
  test('an item left on its never-checked version needs no override; switching it to another unchecked version does, and the override is audited', async () => {
    const { course, instructor, cookie } = await setUp()
    const p = await createProblemWithVersion(db(), instructor.id, otto)
    const { assignment, items } = await createAssignment(db(), course.id, instructor.id, [p], { title: 'Before' })
    const params = { courseId: String(course.id), assignmentId: String(assignment.id) }
    const path = `/courses/${course.id}/assignments/${assignment.id}/edit`

    const loaded = (await editLoader(args(getRequest(path, { Cookie: cookie }), params))) as {
      stored: Record<string, string>
    }
    expect(loaded.stored).toEqual({ [String(items[0]!.id)]: String(p.versionId) })

    const untouched = (await editAction(
      args(
        formRequest(
          path,
          fields({
            title: 'Renamed',
            'items.0.itemId': String(items[0]!.id),
            'items.0.versionId': String(p.versionId),
            'items.0.points': '12',
          }),
          { Cookie: cookie },
        ),
        params,
      ),
    )) as Response
    expect(untouched.status).toBe(302)
    const [renamed] = await db().select().from(assignments).where(eq(assignments.id, assignment.id))
    expect(renamed!.title).toBe('Renamed')
    expect(await overrideRows(assignment.id)).toEqual([])

    const [v2] = await db()
      .insert(problemVersions)
      .values({ problemId: p.problemId, number: 2, definition: otto, createdBy: instructor.id })
      .returning()
    const switched = (await editAction(
      args(
        formRequest(
          path,
          fields({
            title: 'Renamed',
            'items.0.itemId': String(items[0]!.id),
            'items.0.versionId': String(v2!.id),
            'items.0.points': '12',
          }),
          { Cookie: cookie },
        ),
        params,
      ),
    )) as unknown as Refused
    expect(switched.init.status).toBe(400)
    expect(switched.data.fieldErrors['items.0.versionId']).toMatch(/^Never checked\./)
    const [still] = await db().select().from(assignmentItems).where(eq(assignmentItems.id, items[0]!.id))
    expect(still!.problemVersionId).toBe(p.versionId)

    const overridden = (await editAction(
      args(
        formRequest(
          path,
          fields({
            title: 'Renamed',
            'items.0.itemId': String(items[0]!.id),
            'items.0.versionId': String(v2!.id),
            'items.0.points': '12',
            'items.0.override': String(v2!.id),
          }),
          { Cookie: cookie },
        ),
        params,
      ),
    )) as Response
    expect(overridden.status).toBe(302)
    const [moved] = await db().select().from(assignmentItems).where(eq(assignmentItems.id, items[0]!.id))
    expect(moved!.problemVersionId).toBe(v2!.id)
    const audit = await overrideRows(assignment.id)
    expect(audit).toHaveLength(1)
    expect(audit[0]!.after).toEqual({ items: [{ position: 1, versionId: v2!.id, check: 'Never checked' }] })

    // Saved again on that version: no new override asked or written.
    const again = (await editAction(
      args(
        formRequest(
          path,
          fields({
            title: 'Renamed again',
            'items.0.itemId': String(items[0]!.id),
            'items.0.versionId': String(v2!.id),
            'items.0.points': '12',
          }),
          { Cookie: cookie },
        ),
        params,
      ),
    )) as Response
    expect(again.status).toBe(302)
    expect(await overrideRows(assignment.id)).toHaveLength(1)
  })
})
