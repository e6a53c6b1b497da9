/**
 * Disputes against real PostgreSQL: raising one (with an upload read from its bytes), who
 * sees what, the window, the three resolutions with their audit rows and scores, the e-mail
 * through a real worker, and the append-only audit log. Answers are submitted and graded by
 * the real code (submitAnswers + gradeSubmission).
 */
import { listAuditLog } from '#app/server/audit-log.server.ts'
import { and, count, eq, inArray, sql } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import {
  assignmentFormFromData,
  createAssignment as saveAssignment,
  newAssignmentForm,
  updateAssignment,
} from '#app/server/assignments.server.ts'
import { db } from '#app/server/db/client.server.ts'
import { assignments, attachments, auditEvents, disputes, partResults } from '#app/server/db/schema.server.ts'
import {
  disputeAllowance,
  getAttachmentForViewer,
  getDisputeDetail,
  listDisputes,
  listMyDisputes,
  MAX_ATTACHMENT_BYTES,
  raiseDispute,
  resolveDispute,
  type DisputeActor,
  type RaiseDisputeInput,
} from '#app/server/disputes.server.ts'
import { gradeSubmission, listAssignmentTotals, listFindScores, studentVariant } from '#app/server/grading.server.ts'
import { findLastMailTo } from '#app/server/outbox.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { submitAnswers } from '#app/server/submissions.server.ts'
import { loadSignedInUser } from '#app/server/users.server.ts'
import { startWorker } from '#jobs/worker.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import {
  addMember,
  createCourse,
  createCourseWithAssignment,
  createUser,
  type AssignmentOverrides,
} from '#tests/support/factories.ts'

afterAll(async () => {
  await stopBoss()
})

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition

/** The Otto problem with every given fixed to one value: every student gets the same variant. */
const oneVariantOtto: ProblemDefinition = {
  ...ottoV1,
  title: 'Otto cycle, one variant',
  givens: ottoV1.givens.map((g) => ({
    ...g,
    rule: { kind: 'choice' as const, values: [g.rule.kind === 'range' ? g.rule.min : 1] },
  })),
}

// Minimal files from their magic bytes. file-type wants a PNG's IHDR chunk after the
// signature (the 8 signature bytes alone are not recognised); a PDF is known by "%PDF".
const PNG = new Uint8Array([
  0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 6, 0,
  0, 0, 0x1f, 0x15, 0xc4, 0x89,
])
const PDF = new TextEncoder().encode(
  '%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n',
)

const actor = (user: { id: number; isAdmin: boolean }, role: DisputeActor['role']): DisputeActor => ({
  id: user.id,
  isAdmin: user.isAdmin,
  role,
})

async function setUp(
  definition: ProblemDefinition = ottoV1,
  options: { students?: number; assignment?: AssignmentOverrides } = {},
) {
  // One attempt per find: a wrong answer with attempts left is answered again, not disputed.
  const made = await createCourseWithAssignment(db(), [definition], {
    students: options.students ?? 3,
    assignment: { attemptsPerFind: 1, ...options.assignment },
  })
  const ta = await createUser(db(), { name: 'Tara Assistant', password: null })
  await addMember(db(), ta.id, made.course.id, 'ta')
  const item = made.items[0]!
  const keyOf = (userId: number) => {
    const drawn = studentVariant({
      versionId: item.problemVersionId,
      definition,
      assignmentId: made.assignment.id,
      problemId: item.problemId,
      userId,
      courseConvention: made.course.signConvention,
    })
    if (!drawn.ok) throw new Error(drawn.error.message)
    return Object.fromEntries(drawn.variant.key.map((k) => [k.name, k.value]))
  }
  const ref = (userId: number) => ({ courseId: made.course.id, assignmentId: made.assignment.id, position: 1, userId })
  /** Submits through the real path and grades at once; returns the submission id. */
  const answer = async (userId: number, answers: Record<string, string>, now?: Date) => {
    const r = await submitAnswers(db(), { ...ref(userId), answers, now })
    if (!r.ok) throw new Error(r.formError)
    expect(await gradeSubmission(db(), r.receipt.submissionId)).toBe('graded')
    return r.receipt.submissionId
  }
  const raise = (userId: number, overrides: Partial<RaiseDisputeInput> = {}) =>
    raiseDispute(db(), {
      ...ref(userId),
      findName: 'wNet',
      reason: 'I used the engineering convention as the course says.',
      ...overrides,
    })
  return { ...made, ta, item, keyOf, ref, answer, raise }
}

/** A course of its own with a TA, for checks across courses. */
async function otherCourseTa() {
  const course = await createCourse(db())
  const ta = await createUser(db(), { name: 'Elsewhere TA', password: null })
  await addMember(db(), ta.id, course.id, 'ta')
  return ta
}

async function partsOf(itemId: number, userId: number, findName: string) {
  return db()
    .select({
      id: partResults.id,
      attempt: partResults.attempt,
      verdict: partResults.verdict,
      score: partResults.score,
      maxScore: partResults.maxScore,
      message: partResults.message,
      pitfallId: partResults.pitfallId,
    })
    .from(partResults)
    .where(and(eq(partResults.itemId, itemId), eq(partResults.userId, userId), eq(partResults.findName, findName)))
    .orderBy(partResults.attempt)
}

async function auditOf(disputeCourseId: number, kinds: string[]) {
  return db()
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.courseId, disputeCourseId), inArray(auditEvents.kind, kinds)))
    .orderBy(auditEvents.id)
}

async function rowsFor(userId: number) {
  const [d] = await db().select({ n: count() }).from(disputes).where(eq(disputes.userId, userId))
  const [a] = await db().select({ n: count() }).from(attachments).where(eq(attachments.userId, userId))
  return { disputes: d!.n, attachments: a!.n }
}

describe('raising a dispute', () => {
  test('a student disputes a graded find with a PNG: the dispute, the file (with its hash) and an audit row are stored', async () => {
    const s = await setUp()
    const [me] = s.students
    const key = s.keyOf(me!.id)
    await s.answer(me!.id, { wNet: `${-key.wNet!} kJ/kg` })
    // Some browsers send a made-up path with the name: only the last part is kept.
    const result = await s.raise(me!.id, { upload: { fileName: 'C:\\fakepath\\my working.png', bytes: PNG } })
    expect(result.ok).toBe(true)
    if (!result.ok) return
    const [d] = await db().select().from(disputes).where(eq(disputes.id, result.disputeId))
    const [part] = await partsOf(s.item.id, me!.id, 'wNet')
    expect(d).toMatchObject({
      status: 'open',
      findName: 'wNet',
      userId: me!.id,
      partResultId: part!.id,
      reason: 'I used the engineering convention as the course says.',
    })
    const [file] = await db().select().from(attachments).where(eq(attachments.id, d!.attachmentId!))
    expect(file).toMatchObject({
      fileName: 'my working.png',
      contentType: 'image/png',
      size: PNG.byteLength,
      userId: me!.id,
      courseId: s.course.id,
    })
    expect(file!.sha256).toMatch(/^[0-9a-f]{64}$/)
    expect(Buffer.compare(file!.data, Buffer.from(PNG))).toBe(0)
    const audit = await auditOf(s.course.id, ['dispute-raised'])
    expect(audit).toHaveLength(1)
    expect(audit[0]).toMatchObject({
      actorId: me!.id,
      userId: me!.id,
      before: null,
      after: { disputeId: result.disputeId, findName: 'wNet' },
      note: 'I used the engineering convention as the course says.',
    })
    expect(await listMyDisputes(db(), { itemId: s.item.id, userId: me!.id })).toEqual([
      expect.objectContaining({ id: result.disputeId, findName: 'wNet', status: 'open' }),
    ])
  })

  test('a PDF is accepted; the dispute page shows the answer, the givens, the key, the worked solution, the pitfall and the file', async () => {
    const s = await setUp()
    const me = s.students[0]!
    const key = s.keyOf(me.id)
    await s.answer(me.id, { wNet: `${-key.wNet!} kJ/kg` })
    const result = await s.raise(me.id, { upload: { fileName: 'solution.PDF', bytes: PDF } })
    if (!result.ok) throw new Error(JSON.stringify(result))
    const detail = await getDisputeDetail(db(), {
      courseId: s.course.id,
      disputeId: result.disputeId,
      viewer: actor(s.ta, 'ta'),
    })
    expect(detail).not.toBeNull()
    expect(detail!.attachment).toMatchObject({
      fileName: 'solution.PDF',
      contentType: 'application/pdf',
      size: PDF.byteLength,
    })
    expect(detail!.answer).toMatchObject({
      text: `${-key.wNet!} kJ/kg`,
      attempt: 1,
      verdict: 'incorrect',
      pitfallId: 'sign-convention-flipped',
      pitfallTitle: 'Sign convention flipped',
      score: 0,
    })
    expect(detail!.find.label).toBe('Net work per kg of air')
    expect(detail!.find.share).toBeCloseTo(10 * (3 / 7), 9)
    expect(detail!.givens.map((g) => g.name).sort()).toEqual(['T1', 'p1', 'qin', 'r'])
    expect(detail!.key.find((k) => k.name === 'wNet')!.value).toBeCloseTo(key.wNet!, 9)
    expect(detail!.promptHtml).toContain('compression ratio')
    expect(detail!.workedHtml).toBeTruthy()
    expect(detail!.diagrams).not.toBeNull()
    expect(detail!.dispute).toMatchObject({
      problemTitle: 'Air-standard Otto cycle',
      findLabel: 'Net work per kg of air',
      hasAttachment: true,
      student: { id: me.id },
    })
    expect(detail!.history).toEqual([
      expect.objectContaining({ kind: 'raised', who: me.name, text: expect.stringContaining('with an uploaded file') }),
    ])
    const file = await getAttachmentForViewer(db(), {
      courseId: s.course.id,
      disputeId: result.disputeId,
      viewer: actor(me, 'student'),
    })
    expect(file!.contentType).toBe('application/pdf')
    expect(Buffer.compare(file!.data, Buffer.from(PDF))).toBe(0)
  })

  test('too large, the wrong type whatever the name, or too short a reason: clear errors and nothing written', async () => {
    const s = await setUp()
    const me = s.students[0]!
    await s.answer(me.id, { wNet: '1 kJ/kg' })
    const big = new Uint8Array(MAX_ATTACHMENT_BYTES + 1)
    big.set(PNG)
    const tooBig = await s.raise(me.id, { upload: { fileName: 'scan.png', bytes: big } })
    expect(tooBig).toMatchObject({
      ok: false,
      fieldErrors: { file: expect.stringMatching(/^The file is larger than 10 MB/) },
    })
    const text = await s.raise(me.id, {
      upload: { fileName: 'scan.png', bytes: new TextEncoder().encode('this is just text, not a picture') },
    })
    expect(text).toMatchObject({
      ok: false,
      fieldErrors: { file: expect.stringMatching(/Only PDF, PNG or JPEG .* looks like something else/) },
    })
    const exe = new Uint8Array(256)
    exe.set([0x4d, 0x5a, 0x90, 0x00, 0x03])
    const program = await s.raise(me.id, { upload: { fileName: 'solution.pdf', bytes: exe } })
    expect(program).toMatchObject({
      ok: false,
      fieldErrors: { file: expect.stringMatching(/looks like a \.exe file/) },
    })
    const short = await s.raise(me.id, { reason: '  wrong   ', upload: { fileName: 'a.png', bytes: PNG } })
    expect(short).toMatchObject({ ok: false, fieldErrors: { reason: expect.stringMatching(/at least 10 characters/) } })
    expect(short.ok === false && short.fieldErrors.file).toBeFalsy()
    expect(await rowsFor(me.id)).toEqual({ disputes: 0, attachments: 0 })
    expect(await auditOf(s.course.id, ['dispute-raised'])).toHaveLength(0)
    // An empty file is no file.
    const empty = await s.raise(me.id, { upload: { fileName: '', bytes: new Uint8Array(0) } })
    expect(empty.ok).toBe(true)
    expect(await rowsFor(me.id)).toEqual({ disputes: 1, attachments: 0 })
  })

  test('one open dispute per find: a second is refused, also when both are sent at once', async () => {
    const s = await setUp()
    const [a, b] = s.students
    await s.answer(a!.id, { wNet: '1 kJ/kg', T2: '1 K' })
    await s.answer(b!.id, { wNet: '1 kJ/kg' })
    expect((await s.raise(a!.id)).ok).toBe(true)
    const again = await s.raise(a!.id, { upload: { fileName: 'x.png', bytes: PNG } })
    expect(again).toMatchObject({
      ok: false,
      fieldErrors: { findName: expect.stringMatching(/already have an open dispute/) },
    })
    // Another find of the same problem is its own dispute.
    expect((await s.raise(a!.id, { findName: 'T2' })).ok).toBe(true)
    // Both presses pass the check before either commits; the unique index lets one through.
    const both = await Promise.all([
      s.raise(b!.id, { upload: { fileName: 'x.png', bytes: PNG } }),
      s.raise(b!.id, { upload: { fileName: 'y.png', bytes: PNG } }),
    ])
    expect(both.filter((r) => r.ok)).toHaveLength(1)
    expect(both.find((r) => !r.ok)).toMatchObject({
      fieldErrors: { findName: expect.stringMatching(/already have an open dispute/) },
    })
    expect(await rowsFor(b!.id)).toEqual({ disputes: 1, attachments: 1 })
  })

  test('only a graded find of a student of the course, and only until disputeDays after the release', async () => {
    const released = new Date('2026-11-20T12:00:00Z')
    const s = await setUp(ottoV1, {
      assignment: {
        gradesReleasedAt: released,
        disputeDays: 7,
        opensAt: new Date('2026-11-01T00:00:00Z'),
        dueAt: new Date('2026-11-15T00:00:00Z'),
      },
    })
    const me = s.students[0]!
    const notGraded = await s.raise(me.id, { now: new Date('2026-11-21T00:00:00Z') })
    expect(notGraded).toMatchObject({ ok: false, formError: expect.stringMatching(/no graded answer/) })
    // Answered before the due date (the submission's own clock), graded now.
    await s.answer(me.id, { wNet: '1 kJ/kg' }, new Date('2026-11-10T00:00:00Z'))
    const allowance = await disputeAllowance(db(), {
      ...s.ref(me.id),
      findName: 'wNet',
      now: new Date('2026-11-27T11:59:00Z'),
    })
    expect(allowance).toEqual({ allowed: true, until: '2026-11-27T12:00:00.000Z' })
    const late = await s.raise(me.id, { now: new Date('2026-11-27T12:00:00Z') })
    expect(late).toMatchObject({
      ok: false,
      formError: expect.stringMatching(/closed on .*2026.*\(UTC\), 7 days after the grades were released/),
    })
    const ta = await s.raise(s.ta.id, { now: new Date('2026-11-21T00:00:00Z') })
    expect(ta).toMatchObject({ ok: false, formError: 'Only students of this course can dispute a grade.' })
    const noFind = await s.raise(me.id, { findName: 'mep', now: new Date('2026-11-21T00:00:00Z') })
    expect(noFind).toMatchObject({ ok: false, fieldErrors: { findName: expect.any(String) } })
    expect(await rowsFor(me.id)).toEqual({ disputes: 0, attachments: 0 })
    expect((await s.raise(me.id, { now: new Date('2026-11-27T11:59:00Z') })).ok).toBe(true)
  })
})

describe('who sees what', () => {
  test('a student sees only their own disputes; staff see the course’s, oldest first; a TA of another course nothing', async () => {
    const s = await setUp()
    const [a, b] = s.students
    await s.answer(a!.id, { wNet: '1 kJ/kg' })
    await s.answer(b!.id, { wNet: '2 kJ/kg' })
    const ra = await s.raise(a!.id, { upload: { fileName: 'a.png', bytes: PNG } })
    const rb = await s.raise(b!.id)
    if (!ra.ok || !rb.ok) throw new Error('not raised')
    const mine = await listDisputes(db(), { courseId: s.course.id, viewer: actor(a!, 'student') })
    expect(mine.map((r) => r.id)).toEqual([ra.disputeId])
    // A student asking as staff is still a student: the role comes from the database.
    expect(
      (await listDisputes(db(), { courseId: s.course.id, viewer: actor(a!, 'instructor') })).map((r) => r.id),
    ).toEqual([ra.disputeId])
    const queue = await listDisputes(db(), { courseId: s.course.id, viewer: actor(s.ta, 'ta') })
    expect(queue.map((r) => r.id)).toEqual([ra.disputeId, rb.disputeId])
    expect(queue[0]).toMatchObject({
      problemTitle: 'Air-standard Otto cycle',
      findLabel: 'Net work per kg of air',
      hasAttachment: true,
      student: { id: a!.id, name: a!.name },
    })
    expect(
      await listDisputes(db(), {
        courseId: s.course.id,
        viewer: actor(s.instructor, 'instructor'),
        filters: { status: 'rejected' },
      }),
    ).toEqual([])
    expect(
      (
        await listDisputes(db(), {
          courseId: s.course.id,
          viewer: actor(s.instructor, 'instructor'),
          filters: { status: 'open', assignmentId: s.assignment.id },
        })
      ).length,
    ).toBe(2)
    expect(
      await listDisputes(db(), { courseId: s.course.id, viewer: actor(s.ta, 'ta'), filters: { olderThanDays: 1 } }),
    ).toEqual([])
    const inTwoDays = new Date(Date.now() + 2 * 86_400_000)
    expect(
      (
        await listDisputes(db(), {
          courseId: s.course.id,
          viewer: actor(s.ta, 'ta'),
          filters: { olderThanDays: 1 },
          now: inTwoDays,
        })
      ).length,
    ).toBe(2)

    const elsewhere = await otherCourseTa()
    expect(await listDisputes(db(), { courseId: s.course.id, viewer: actor(elsewhere, 'ta') })).toEqual([])
    expect(
      await getDisputeDetail(db(), { courseId: s.course.id, disputeId: ra.disputeId, viewer: actor(elsewhere, 'ta') }),
    ).toBeNull()
    expect(
      await getAttachmentForViewer(db(), {
        courseId: s.course.id,
        disputeId: ra.disputeId,
        viewer: actor(elsewhere, 'ta'),
      }),
    ).toBeNull()
    expect(
      await getDisputeDetail(db(), { courseId: s.course.id, disputeId: ra.disputeId, viewer: actor(b!, 'student') }),
    ).toBeNull()
    expect(
      await getAttachmentForViewer(db(), {
        courseId: s.course.id,
        disputeId: ra.disputeId,
        viewer: actor(b!, 'student'),
      }),
    ).toBeNull()
    expect(
      await getAttachmentForViewer(db(), { courseId: s.course.id, disputeId: ra.disputeId, viewer: actor(s.ta, 'ta') }),
    ).toMatchObject({ contentType: 'image/png' })
    const own = await getDisputeDetail(db(), {
      courseId: s.course.id,
      disputeId: ra.disputeId,
      viewer: actor(a!, 'student'),
    })
    expect(own).toMatchObject({ answer: { text: '1 kJ/kg' }, key: [], workedHtml: null, diagrams: null })
    expect(
      (await getDisputeDetail(db(), { courseId: s.course.id, disputeId: ra.disputeId, viewer: actor(s.ta, 'ta') }))!.key
        .length,
    ).toBeGreaterThan(0)
  })
})

describe('resolving', () => {
  test('reject keeps the score: one dispute-resolved audit row, no score change; a second resolution is refused', async () => {
    const s = await setUp()
    const me = s.students[0]!
    await s.answer(me.id, { wNet: '1 kJ/kg' })
    const r = await s.raise(me.id)
    if (!r.ok) throw new Error('not raised')
    // A student claiming to be staff is refused.
    const bySelf = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(me, 'instructor'),
      decision: 'reject',
      comment: '',
    })
    expect(bySelf).toMatchObject({ ok: false, formError: expect.stringMatching(/instructors and TAs/) })
    const res = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.ta, 'ta'),
      decision: 'reject',
      comment: '',
    })
    expect(res).toEqual({ ok: true, changed: 0 })
    const [d] = await db().select().from(disputes).where(eq(disputes.id, r.disputeId))
    expect(d).toMatchObject({ status: 'rejected', resolvedBy: s.ta.id, scoreBefore: 0, scoreAfter: 0, comment: null })
    expect(await auditOf(s.course.id, ['dispute'])).toHaveLength(0)
    const resolved = await auditOf(s.course.id, ['dispute-resolved'])
    expect(resolved).toHaveLength(1)
    expect(resolved[0]).toMatchObject({
      actorId: s.ta.id,
      userId: me.id,
      before: { status: 'open', score: 0 },
      after: { disputeId: r.disputeId, status: 'rejected', score: 0, changed: 0 },
    })
    const again = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.instructor, 'instructor'),
      decision: 'adjust',
      newScore: 1,
      comment: 'Second look.',
    })
    expect(again).toEqual({ ok: false, formError: 'This dispute was already resolved', fieldErrors: {} })
    const detail = await getDisputeDetail(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      viewer: actor(me, 'student'),
    })
    expect(detail!.history.map((h) => h.kind)).toEqual(['raised', 'resolved'])
    expect(detail!.history[1]!.text).toMatch(/^Resolved: score kept;/)
    // Resolved, the same answer is not disputed twice.
    expect(await s.raise(me.id, { reason: 'Please look once more at step 3.' })).toMatchObject({
      ok: false,
      formError: expect.stringMatching(/resolved, so it cannot be disputed again/),
    })
  })

  test('adjust sets the find’s score exactly (a higher earlier answer is lowered too), with a comment, an audit row per part, and the gradebook follows at once', async () => {
    const s = await setUp(ottoV1, { assignment: { attemptsPerFind: 2 } })
    const me = s.students[0]!
    await s.answer(me.id, { wNet: '1 kJ/kg' })
    await s.answer(me.id, { wNet: '2 kJ/kg' })
    const [first, second] = await partsOf(s.item.id, me.id, 'wNet')
    const share = second!.maxScore
    // As if an earlier review had given the first answer full marks: the find now scores `share`.
    await db().update(partResults).set({ score: share }).where(eq(partResults.id, first!.id))
    const r = await s.raise(me.id)
    if (!r.ok) throw new Error('not raised')
    const disputed = (await db().select().from(disputes).where(eq(disputes.id, r.disputeId)))[0]!
    expect(disputed.partResultId).toBe(second!.id)

    const noComment = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.ta, 'ta'),
      decision: 'adjust',
      newScore: 1,
      comment: '  ',
    })
    expect(noComment).toMatchObject({ ok: false, fieldErrors: { comment: 'Say why the score changes.' } })
    const tooHigh = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.ta, 'ta'),
      decision: 'adjust',
      newScore: share + 0.01,
      comment: 'Partial credit.',
    })
    expect(tooHigh).toMatchObject({ ok: false, fieldErrors: { newScore: expect.stringMatching(/between 0 and/) } })
    const missing = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.ta, 'ta'),
      decision: 'adjust',
      comment: 'Partial credit.',
    })
    expect(missing).toMatchObject({ ok: false, fieldErrors: { newScore: expect.any(String) } })
    expect(await auditOf(s.course.id, ['dispute', 'dispute-resolved'])).toHaveLength(0)

    const res = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.ta, 'ta'),
      decision: 'adjust',
      newScore: 1,
      comment: 'Method right, arithmetic slip: partial credit.',
    })
    expect(res).toEqual({ ok: true, changed: 2 })
    const after = await partsOf(s.item.id, me.id, 'wNet')
    expect(after.map((p) => [p.verdict, p.score])).toEqual([
      ['incorrect', 1],
      ['incorrect', 1],
    ])
    const changes = await auditOf(s.course.id, ['dispute'])
    expect(changes.map((c) => [c.partResultId, c.before, c.after, c.note, c.actorId, c.userId])).toEqual([
      [
        first!.id,
        { verdict: 'incorrect', score: share },
        { verdict: 'incorrect', score: 1 },
        'Method right, arithmetic slip: partial credit.',
        s.ta.id,
        me.id,
      ],
      [
        second!.id,
        { verdict: 'incorrect', score: 0 },
        { verdict: 'incorrect', score: 1 },
        'Method right, arithmetic slip: partial credit.',
        s.ta.id,
        me.id,
      ],
    ])
    expect(await auditOf(s.course.id, ['dispute-resolved'])).toHaveLength(1)
    const [d] = await db().select().from(disputes).where(eq(disputes.id, r.disputeId))
    expect(d).toMatchObject({
      status: 'adjusted',
      scoreAfter: 1,
      comment: 'Method right, arithmetic slip: partial credit.',
    })
    expect(d!.scoreBefore).toBeCloseTo(share, 9)
    const scores = await listFindScores(db(), { assignmentIds: [s.assignment.id], userId: me.id })
    expect(scores.find((f) => f.findName === 'wNet')!.score).toBe(1)
    const totals = await listAssignmentTotals(db(), { courseIds: [s.course.id], assignmentIds: [s.assignment.id] })
    expect(totals.find((t) => t.userId === me.id)!.score).toBe(1)
    const detail = await getDisputeDetail(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      viewer: actor(s.instructor, 'instructor'),
    })
    expect(detail!.findScore).toBe(1)
    expect(detail!.history.map((h) => h.kind)).toEqual(['raised', 'score-changed', 'score-changed', 'resolved'])
  })

  test('accept-for-variant marks the same answer on the same variant correct for everyone who gave it (less each one’s late penalty), and no one else', async () => {
    const s = await setUp(oneVariantOtto, {
      students: 4,
      assignment: { latePolicy: 'penalty', latePenaltyPercentPerDay: 10, lateDaysAllowed: 3 },
    })
    const [me, twin, lateTwin, other] = s.students
    const key = s.keyOf(me!.id)
    expect(s.keyOf(twin!.id)).toEqual(key)
    const flipped = `${-key.wNet!} kJ/kg`
    await s.answer(me!.id, { wNet: flipped })
    await s.answer(twin!.id, { wNet: flipped })
    const oneDayLate = new Date(s.assignment.dueAt.getTime() + 3600_000)
    await s.answer(lateTwin!.id, { wNet: flipped }, oneDayLate)
    await s.answer(other!.id, { wNet: `${key.wNet! * 1000} kJ/kg` })
    const r = await s.raise(me!.id)
    if (!r.ok) throw new Error('not raised')
    const before = await getDisputeDetail(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      viewer: actor(s.ta, 'ta'),
    })
    expect(before!.sameAnswerOnVariant).toBe(2)

    const res = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.instructor, 'instructor'),
      decision: 'accept-for-variant',
      comment: '',
    })
    expect(res).toEqual({ ok: true, changed: 3 })
    const share = (await partsOf(s.item.id, me!.id, 'wNet'))[0]!.maxScore
    for (const [who, expected] of [
      [me!, share],
      [twin!, share],
      [lateTwin!, share * 0.9],
    ] as const) {
      const [p] = await partsOf(s.item.id, who.id, 'wNet')
      expect(p).toMatchObject({ verdict: 'correct', message: 'Accepted on review', pitfallId: null })
      expect(p!.score).toBeCloseTo(expected, 9)
    }
    expect((await partsOf(s.item.id, other!.id, 'wNet'))[0]).toMatchObject({ verdict: 'incorrect', score: 0 })
    const changes = await auditOf(s.course.id, ['dispute'])
    expect(changes.map((c) => c.userId).sort()).toEqual([me!.id, twin!.id, lateTwin!.id].sort())
    for (const c of changes) {
      expect(c.before).toEqual({ verdict: 'incorrect', score: 0 })
      expect(c.after).toMatchObject({ verdict: 'correct' })
      expect(c.actorId).toBe(s.instructor.id)
      expect(c.note).toMatch(/same answer on the same variant/)
    }
    expect(await auditOf(s.course.id, ['dispute-resolved'])).toHaveLength(1)
    const [d] = await db().select().from(disputes).where(eq(disputes.id, r.disputeId))
    expect(d).toMatchObject({ status: 'upheld', scoreBefore: 0 })
    expect(d!.scoreAfter).toBeCloseTo(share, 9)
    const totals = await listAssignmentTotals(db(), { courseIds: [s.course.id], assignmentIds: [s.assignment.id] })
    expect(totals.find((t) => t.userId === twin!.id)!.score).toBeCloseTo(share, 6)
    expect(totals.find((t) => t.userId === other!.id)!.score).toBe(0)
    const detail = await getDisputeDetail(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      viewer: actor(s.ta, 'ta'),
    })
    expect(detail!.history.filter((h) => h.kind === 'score-changed')).toHaveLength(3)
  })

  test('the same number on a different variant is not the same answer', async () => {
    const s = await setUp(ottoV1, { students: 3 })
    const me = s.students[0]!
    const key = s.keyOf(me.id)
    // Two of the others could share the first one's variant by chance (1 in 945 each), not both.
    const other = s.students.slice(1).find((st) => JSON.stringify(s.keyOf(st.id)) !== JSON.stringify(key))
    await s.answer(me!.id, { wNet: `${-key.wNet!} kJ/kg` })
    await s.answer(other!.id, { wNet: `${-key.wNet!} kJ/kg` })
    const r = await s.raise(me!.id)
    if (!r.ok) throw new Error('not raised')
    expect(
      (await getDisputeDetail(db(), { courseId: s.course.id, disputeId: r.disputeId, viewer: actor(s.ta, 'ta') }))!
        .sameAnswerOnVariant,
    ).toBe(0)
    expect(
      await resolveDispute(db(), {
        courseId: s.course.id,
        disputeId: r.disputeId,
        actor: actor(s.ta, 'ta'),
        decision: 'accept-for-variant',
        comment: 'Sign read the other way is fine here.',
      }),
    ).toEqual({ ok: true, changed: 1 })
    expect((await partsOf(s.item.id, other!.id, 'wNet'))[0]).toMatchObject({ verdict: 'incorrect', score: 0 })
  })

  test('the student is e-mailed the outcome with a link to the problem, through a real worker', async () => {
    // Graded by hand before the worker starts, so the worker never holds these submissions.
    const s = await setUp()
    const me = s.students[0]!
    await s.answer(me.id, { wNet: '1 kJ/kg' })
    const r = await s.raise(me.id)
    if (!r.ok) throw new Error('not raised')
    const worker = await startWorker({ log: () => {}, logError: () => {} })
    try {
      const res = await resolveDispute(db(), {
        courseId: s.course.id,
        disputeId: r.disputeId,
        actor: actor(s.ta, 'ta'),
        decision: 'reject',
        comment: 'The sign is wrong for this course.',
        baseUrl: 'http://cyclewright.test',
      })
      expect(res.ok).toBe(true)
      const end = Date.now() + 20_000
      let mail = await findLastMailTo(db(), me.email)
      while (!mail && Date.now() < end) {
        await new Promise((done) => setTimeout(done, 200))
        mail = await findLastMailTo(db(), me.email)
      }
      expect(mail).not.toBeNull()
      expect(mail!.subject).toMatch(/your dispute on .* problem 1: score kept$/)
      expect(mail!.text).toContain(
        `http://cyclewright.test/courses/${s.course.id}/assignments/${s.assignment.id}/problems/1`,
      )
      expect(mail!.text).toContain('The sign is wrong for this course.')
      expect(mail!.text).toMatch(/stays at 0 points/)
    } finally {
      await worker.stop()
    }
  })
})

describe('the audit log', () => {
  test('lists the course’s rows newest first with names, filters by kind, and its rows can be neither changed nor removed', async () => {
    const s = await setUp()
    const me = s.students[0]!
    await s.answer(me.id, { wNet: '1 kJ/kg' })
    const r = await s.raise(me.id)
    if (!r.ok) throw new Error('not raised')
    await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: r.disputeId,
      actor: actor(s.ta, 'ta'),
      decision: 'adjust',
      newScore: 0.5,
      comment: 'Half credit for the method.',
    })
    const all = await listAuditLog(db(), { courseId: s.course.id })
    expect(all.total).toBe(3)
    expect(all.rows.map((x) => x.kind)).toEqual(['dispute-resolved', 'dispute', 'dispute-raised'])
    expect(all.rows[1]).toMatchObject({
      actor: 'Tara Assistant',
      subject: me.name,
      assignmentTitle: s.assignment.title,
      before: { verdict: 'incorrect', score: 0 },
      after: { verdict: 'incorrect', score: 0.5 },
      note: 'Half credit for the method.',
    })
    const onlyChanges = await listAuditLog(db(), { courseId: s.course.id, kind: 'dispute' })
    expect(onlyChanges.total).toBe(1)
    const page = await listAuditLog(db(), { courseId: s.course.id, limit: 1, offset: 1 })
    expect(page.rows.map((x) => x.kind)).toEqual(['dispute'])
    expect(page.total).toBe(3)
    const id = all.rows[0]!.id
    await expect(db().execute(sql`update audit_events set note = 'edited' where id = ${id}`)).rejects.toThrow()
    await expect(db().execute(sql`delete from audit_events where id = ${id}`)).rejects.toThrow()
    const still = await db().select().from(auditEvents).where(eq(auditEvents.id, id))
    expect(still[0]!.note).toBe('Half credit for the method.')
  })
})

describe('the dispute window setting', () => {
  test('an assignment saved without the field gets 7 days; a value is kept; out of range is a field error; an edit without the field keeps it', async () => {
    const s = await setUp()
    const user = (await loadSignedInUser(db(), s.instructor.id))!
    const base = newAssignmentForm('UTC', new Date('2027-01-01T00:00:00Z'))
    const form = (extra: Record<string, string>) => {
      const fd = new FormData()
      for (const [k, v] of Object.entries({ ...base.values, title: 'Disputes window', ...extra }))
        if (k !== 'disputeDays') fd.set(k, v)
      if (extra.disputeDays !== undefined) fd.set('disputeDays', extra.disputeDays)
      fd.set('items.0.versionId', String(s.item.problemVersionId))
      fd.set('items.0.points', '10')
      return assignmentFormFromData(fd)
    }
    const plain = await saveAssignment(db(), { courseId: s.course.id, user, state: form({}) })
    if (!plain.ok) throw new Error(JSON.stringify(plain))
    const twelve = await saveAssignment(db(), { courseId: s.course.id, user, state: form({ disputeDays: '12' }) })
    if (!twelve.ok) throw new Error(JSON.stringify(twelve))
    const bad = await saveAssignment(db(), { courseId: s.course.id, user, state: form({ disputeDays: '61' }) })
    expect(bad).toMatchObject({ ok: false, fieldErrors: { disputeDays: expect.stringMatching(/at most 60/) } })
    const rows = await db()
      .select({ id: assignments.id, disputeDays: assignments.disputeDays })
      .from(assignments)
      .where(inArray(assignments.id, [plain.assignmentId, twelve.assignmentId]))
    expect(Object.fromEntries(rows.map((x) => [x.id, x.disputeDays]))).toEqual({
      [plain.assignmentId]: 7,
      [twelve.assignmentId]: 12,
    })
    const edited = await updateAssignment(db(), {
      courseId: s.course.id,
      assignmentId: twelve.assignmentId,
      user,
      state: form({}),
    })
    expect(edited.ok).toBe(true)
    const [kept] = await db()
      .select({ disputeDays: assignments.disputeDays })
      .from(assignments)
      .where(eq(assignments.id, twelve.assignmentId))
    expect(kept!.disputeDays).toBe(12)
  })
})
