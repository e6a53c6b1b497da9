/**
 * The audit page in people's words, against PostgreSQL: a regrade names the question by its
 * label (not its internal name) and the grade's change with the find's maximum; an extension
 * names the student and shows dates in the course's zone; a kind the wording does not know
 * still gets a readable line. Only instructors read it.
 */
import { createElement } from 'react'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { afterAll, describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { formatPoints } from '#app/lib/points.ts'
import AuditRoute, { loader } from '#app/routes/courses/audit.tsx'
import { setExtension } from '#app/server/assignments.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { auditEvents } from '#app/server/db/schema.server.ts'
import { gradeSubmission } from '#app/server/grading.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { applyRegrade, runRegrade } from '#app/server/regrades.server.ts'
import { submitAnswers } from '#app/server/submissions.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { addMember, createCourseWithAssignment, createUser, drawnVariant } from '#tests/support/factories.ts'
import { args, getRequest, settle } from '#tests/support/requests.ts'
import { loginAs } from '#tests/support/login.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition
const T2_LABEL = ottoV1.finds.find((f) => f.name === 'T2')!.label
const ZONE = 'Europe/Oslo'

afterAll(async () => {
  await stopBoss()
})

async function setUp() {
  const made = await createCourseWithAssignment(db(), [ottoV1], {
    students: 1,
    timeZone: ZONE,
    assignment: { dueAt: new Date('2099-10-12T15:00:00Z') },
  })
  const student = made.students[0]!
  const item = made.items[0]!
  const variant = drawnVariant(made, ottoV1, { student, item })
  const key = Object.fromEntries(variant.key.map((k) => [k.name, k.value]))
  // 3 % off: wrong under the problem's tolerance, right under the regrade's 5 %.
  const sent = await submitAnswers(db(), {
    courseId: made.course.id,
    assignmentId: made.assignment.id,
    position: 1,
    userId: student.id,
    answers: { T2: `${key.T2! * 1.03} K` },
  })
  if (!sent.ok) throw new Error('refused')
  expect(await gradeSubmission(db(), sent.receipt.submissionId)).toBe('graded')
  const regradeId = await applyRegrade(db(), {
    courseId: made.course.id,
    assignmentId: made.assignment.id,
    position: 1,
    toVersionId: item.problemVersionId,
    toleranceOverrides: { T2: { kind: 'relative', value: '5 %', unit: '' } },
    requestedBy: made.instructor.id,
  })
  await runRegrade(db(), regradeId)
  const ext = await setExtension(db(), {
    courseId: made.course.id,
    assignmentId: made.assignment.id,
    actorId: made.instructor.id,
    input: { userId: student.id, dueAt: '2099-10-14T17:00', extraAttempts: 0, reason: 'Away at a conference.' },
  })
  expect(ext.ok).toBe(true)
  // A kind of entry the wording has never heard of.
  await db()
    .insert(auditEvents)
    .values({
      courseId: made.course.id,
      actorId: made.instructor.id,
      userId: student.id,
      kind: 'weights-changed',
      before: { weightId: 3, homeworkShare: 0.4 },
      after: { weightId: 3, homeworkShare: 0.5 },
    })
  const ta = await createUser(db(), { name: 'Course TA', password: null })
  await addMember(db(), ta.id, made.course.id, 'ta')
  return {
    ...made,
    student,
    ta,
    params: { courseId: String(made.course.id) },
    path: `/courses/${made.course.id}/audit`,
  }
}

describe('the audit page', () => {
  test('speaks of the question by its label, people by name, dates in the course zone', async () => {
    const s = await setUp()
    const page = await loader(args(getRequest(s.path, await loginAs(s.instructor)), s.params))
    const byKind = (kind: string) => page.rows.filter((r) => r.kind === kind)

    const [regrade] = byKind('regrade')
    const share = ottoV1.finds.find((f) => f.name === 'T2')!.points
    const sharePoints = (10 * share) / ottoV1.finds.reduce((a, f) => a + f.points, 0)
    expect(regrade!.words.what).toBe(
      `Regrade of “${T2_LABEL}” (problem 1), version 1 with a new tolerance for ${s.student.name}`,
    )
    expect(regrade!.words.change).toBe(
      `incorrect → correct; score 0 → ${formatPoints(sharePoints)} of ${formatPoints(sharePoints)}`,
    )
    expect(regrade!.actor).toBe(s.instructor.name)

    const [extension] = byKind('extension')
    expect(extension!.words.what).toBe(`Extension given to ${s.student.name}`)
    // 15:00 UTC is 17:00 in Oslo in October (summer time).
    expect(extension!.words.change).toBe('due Mon 12 Oct 2099, 17:00 (the assignment’s) → due Wed 14 Oct 2099, 17:00')
    expect(extension!.words.note).toBe('Away at a conference.')

    const [other] = byKind('weights-changed')
    expect(other!.words).toMatchObject({
      kind: 'Weights changed',
      what: `Weights changed (${s.student.name})`,
      change: 'homework share 0.4 → 0.5',
    })

    // Nothing internal reaches the page: no find names, output paths, ids or raw JSON.
    const shown = page.rows.flatMap((r) => [r.words.kind, r.words.what, r.words.change ?? '', r.words.note]).join('\n')
    expect(shown).not.toMatch(/\bT2\b|states\.2\.T|weight ?id|verdict|[{}]/i)
  })

  test('the page’s HTML: the sentences, the filter of every kind, times in the zone', async () => {
    const s = await setUp()
    const loaderData = await loader(args(getRequest(s.path, await loginAs(s.instructor)), s.params))
    const Stub = createRoutesStub([
      {
        path: '/courses/:courseId/audit',
        Component: AuditRoute as never,
        loader: () => loaderData,
        HydrateFallback: () => null,
      },
    ])
    const html = renderToString(
      createElement(Stub, { initialEntries: [s.path], hydrationData: { loaderData: { 0: loaderData } } }),
    ).replaceAll('<!-- -->', '')
    expect(html).toContain(`Regrade of “${T2_LABEL}” (problem 1)`)
    expect(html).toContain('due Wed 14 Oct 2099, 17:00')
    expect(html).toContain('<option value="roster-import">Class list imported</option>')
    expect(html).toContain(`times in ${ZONE}`)
    expect(html).not.toContain('T2')
  })

  test('the kind filter narrows the list; a TA gets 403', async () => {
    const s = await setUp()
    const only = await loader(args(getRequest(`${s.path}?kind=extension`, await loginAs(s.instructor)), s.params))
    expect(only.rows.length).toBe(1)
    expect(only.rows[0]!.words.kind).toBe('Extension')
    const ta = await settle(loader(args(getRequest(s.path, await loginAs(s.ta)), s.params)))
    expect('thrown' in ta && (ta.thrown as { init: { status: number } }).init.status).toBe(403)
  })
})
