/**
 * Regrades against PostgreSQL with a real worker: the preview's numbers for a tolerance
 * override and for a new version (points changed, a find removed), applying a regrade
 * (answers rewritten, audit events, progress to done, a second run changing nothing), and
 * who may apply or read one.
 */
import { and, asc, count, eq } from 'drizzle-orm'
import { QueryClient, QueryClientProvider } from '@tanstack/react-query'
import { createElement } from 'react'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { afterAll, beforeAll, describe, expect, test } from 'vitest'
import { roundScore } from '#app/domain/assignments/scoring.ts'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { db } from '#app/server/db/client.server.ts'
import {
  assignmentItems,
  auditEvents,
  partResults,
  problemVersions,
  regrades,
  submissions,
} from '#app/server/db/schema.server.ts'
import {
  canonicalJson,
  definitionHash,
  frozenDefinitions,
  gradeSubmission,
  studentVariant,
} from '#app/server/grading.server.ts'
import { saveProblem } from '#app/server/problems.server.ts'
import { PermanentJobError, stopBoss } from '#app/server/queue.server.ts'
import {
  applyRegrade,
  getRegradeProgress,
  previewRegrade,
  RegradeError,
  runRegrade,
  type RegradeProgress,
} from '#app/server/regrades.server.ts'
import { loader as apiRegradeLoader } from '#app/routes/resources/api-regrade.ts'
import RegradeRoute, {
  action as regradeAction,
  loader as regradeLoader,
} from '#app/routes/courses/assignments/regrade.tsx'
import { handleRegrade } from '#jobs/handlers/regrade.ts'
import { startWorker, type RunningWorker } from '#jobs/worker.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { addMember, createCourseWithAssignment, createUser } from '#tests/support/factories.ts'
import { args, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { sessionCookie } from '#tests/support/login.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
// Version 1 of the demo problem: T2 (K, 2 points), wNet (kJ/kg, 3 points), eta (pure number,
// 2 points), each within 1 %. The item is worth 10 points, so the shares are 20/7, 30/7, 20/7.
const ottoV1: ProblemDefinition = otto.earlierVersions![0]!
const share = { T2: 20 / 7, wNet: 30 / 7, eta: 20 / 7 }

let worker: RunningWorker
const workerErrors: string[] = []

beforeAll(async () => {
  worker = await startWorker({
    databaseUrl: process.env.DATABASE_URL,
    log: () => {},
    logError: (line) => workerErrors.push(line),
  })
})

afterAll(async () => {
  await worker.stop()
  await stopBoss()
})

/**
 * A course with six students who each answered every find once: students 1–3 typed the key,
 * students 4–6 typed the key of T2 3 % too high (outside 1 %, inside 5 %) and the rest right.
 */
async function gradedCourse() {
  const made = await createCourseWithAssignment(db(), [ottoV1], { students: 6 })
  const item = made.items[0]!
  const keys = new Map<number, Record<string, number>>()
  for (const [i, s] of made.students.entries()) {
    const drawn = studentVariant({
      versionId: item.problemVersionId,
      definition: ottoV1,
      assignmentId: made.assignment.id,
      problemId: item.problemId,
      userId: s.id,
      courseConvention: 'engineering',
    })
    if (!drawn.ok) throw new Error(drawn.error.message)
    const key = Object.fromEntries(drawn.variant.key.map((k) => [k.name, k.value]))
    keys.set(s.id, key)
    const answers = { T2: `${i < 3 ? key.T2! : key.T2! * 1.03} K`, wNet: `${key.wNet!} kJ/kg`, eta: `${key.eta!}` }
    const submissionId = await insertSubmission(made.assignment.id, item.id, s.id, answers, 1)
    expect(await gradeSubmission(db(), submissionId)).toBe('graded')
  }
  return { ...made, item, keys, exact: made.students.slice(0, 3), off: made.students.slice(3) }
}

async function insertSubmission(
  assignmentId: number,
  itemId: number,
  userId: number,
  answers: Record<string, string>,
  attempt: number,
) {
  const [sub] = await db()
    .insert(submissions)
    .values({ assignmentId, itemId, userId, answers })
    .returning({ id: submissions.id })
  await db()
    .insert(partResults)
    .values(
      Object.entries(answers).map(([findName, answer]) => ({
        submissionId: sub!.id,
        assignmentId,
        itemId,
        userId,
        findName,
        answer,
        attempt,
        maxScore: share[findName as keyof typeof share],
      })),
    )
  return sub!.id
}

async function addVersion(problemId: number, createdBy: number, number: number, definition: ProblemDefinition) {
  const [row] = await db()
    .insert(problemVersions)
    .values({ problemId, number, definition, createdBy })
    .returning({ id: problemVersions.id })
  return row!.id
}

/** Server HTML without the markers React puts between adjacent text pieces. */
const renderToStringPlain = (element: Parameters<typeof renderToString>[0]) =>
  renderToString(element).replaceAll('<!-- -->', '')

const relative = (value: string) => ({ kind: 'relative', value, unit: '' })

async function partsOf(itemId: number) {
  return db().select().from(partResults).where(eq(partResults.itemId, itemId)).orderBy(asc(partResults.id))
}

async function waitUntilFinished(regradeId: number, ms = 30_000): Promise<RegradeProgress> {
  const until = Date.now() + ms
  for (;;) {
    const p = await getRegradeProgress(db(), regradeId)
    if (p && (p.status === 'done' || p.status === 'failed')) return p
    if (Date.now() > until)
      throw new Error(`regrade ${regradeId} did not finish: ${JSON.stringify(p)} ${workerErrors.join('\n')}`)
    await new Promise((r) => setTimeout(r, 100))
  }
}

describe('preview', () => {
  test('a 5 % tolerance on T2 gives exactly the students who were 3 % off its points; nothing is written', async () => {
    const c = await gradedCourse()
    const before = await partsOf(c.item.id)
    expect(before.filter((p) => p.verdict === 'correct')).toHaveLength(15)

    const preview = await previewRegrade(db(), {
      courseId: c.course.id,
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: c.item.problemVersionId,
      toleranceOverrides: { T2: relative('5 %') },
    })
    expect(preview.overrides).toEqual({ T2: { kind: 'relative', value: 0.05 } })
    expect(preview.changed.map((s) => s.userId).sort()).toEqual(c.off.map((s) => s.id).sort())
    for (const s of preview.changed) {
      expect(s.oldScore).toBe(roundScore(share.wNet + share.eta))
      expect(s.newScore).toBe(roundScore(share.T2 + share.wNet + share.eta))
      expect(s.change).toBe(roundScore(10 - roundScore(share.wNet + share.eta)))
      expect(s.finds).toEqual([
        {
          name: 'T2',
          label: 'Temperature at the end of compression',
          oldVerdict: 'incorrect',
          newVerdict: 'correct',
          oldScore: 0,
          newScore: roundScore(share.T2),
        },
      ])
    }
    expect(preview.unchanged).toBe(3)
    expect(preview.totals).toEqual({
      students: 6,
      affected: 3,
      meanChange: roundScore(10 - roundScore(share.wNet + share.eta)),
      parts: 18,
      partsChanged: 3,
    })
    expect(preview.removedFinds).toEqual([])
    expect(await partsOf(c.item.id)).toEqual(before)
  })

  test('a new version with other points and a 2 % tolerance: the 3 %-off students lose, the others keep 10', async () => {
    const c = await gradedCourse()
    const v2: ProblemDefinition = {
      ...ottoV1,
      finds: ottoV1.finds.map((f) =>
        f.name === 'T2' ? { ...f, points: 4, tolerance: { kind: 'relative', value: 0.02 } } : { ...f, points: 3 },
      ),
    }
    const v2Id = await addVersion(c.item.problemId, c.instructor.id, 2, v2)
    const preview = await previewRegrade(db(), {
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: v2Id,
      toleranceOverrides: {},
    })
    // Shares become 4, 3, 3: the off students keep wNet and eta only, 6 points instead of 50/7.
    expect(preview.changed.map((s) => [s.userId, s.oldScore, s.newScore, s.change])).toEqual(
      c.off.map((s) => [
        s.id,
        roundScore(share.wNet + share.eta),
        6,
        roundScore(6 - roundScore(share.wNet + share.eta)),
      ]),
    )
    for (const s of preview.changed) expect(s.finds).toEqual([])
    expect(preview.unchanged).toBe(3)
    expect(preview.totals).toMatchObject({
      students: 6,
      affected: 3,
      meanChange: roundScore(6 - roundScore(share.wNet + share.eta)),
    })
    // Every correct answer's score moves with its share; the 3 wrong T2 answers stay at 0.
    expect(preview.totals.partsChanged).toBe(15)
    // With T2 at 5 % for this assignment, everyone has all 10 points.
    const wider = await previewRegrade(db(), {
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: v2Id,
      toleranceOverrides: { T2: relative('0.05') },
    })
    expect(wider.changed.map((s) => [s.newScore, s.change])).toEqual(
      c.off.map(() => [10, roundScore(10 - roundScore(share.wNet + share.eta))]),
    )
  })

  test('a version without a find: its answers score 0, and the preview says which find and how many answers', async () => {
    const c = await gradedCourse()
    const v2: ProblemDefinition = { ...ottoV1, finds: ottoV1.finds.filter((f) => f.name !== 'eta') }
    const v2Id = await addVersion(c.item.problemId, c.instructor.id, 2, v2)
    const preview = await previewRegrade(db(), {
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: v2Id,
      toleranceOverrides: {},
    })
    expect(preview.removedFinds).toEqual([{ name: 'eta', label: 'Thermal efficiency', parts: 6, students: 6 }])
    // T2 and wNet now share 10 points as 4 and 6: the exact students keep 10 (eta's 0 included).
    const exact = preview.changed.filter((s) => c.exact.some((e) => e.id === s.userId))
    expect(exact).toHaveLength(3)
    for (const s of exact) {
      expect([s.oldScore, s.newScore, s.change]).toEqual([10, 10, 0])
      expect(s.finds.map((f) => [f.label, f.oldVerdict, f.newVerdict])).toEqual([
        ['Thermal efficiency', 'correct', 'removed'],
      ])
    }
    const off = preview.changed.filter((s) => c.off.some((e) => e.id === s.userId))
    for (const s of off) expect([s.newScore, s.change]).toEqual([6, roundScore(6 - s.oldScore)])
    // Only the off students' totals move, so they come first.
    expect(
      preview.changed
        .slice(0, 3)
        .map((s) => s.userId)
        .sort(),
    ).toEqual(c.off.map((s) => s.id).sort())
  })

  test('refuses a version of another problem and tolerances that cannot be used, field by field', async () => {
    const c = await gradedCourse()
    const other = await gradedCourse()
    const base = { assignmentId: c.assignment.id, position: 1 }
    await expect(
      previewRegrade(db(), { ...base, toVersionId: other.item.problemVersionId, toleranceOverrides: {} }),
    ).rejects.toThrow(RegradeError)
    const bad = await previewRegrade(db(), {
      ...base,
      toVersionId: c.item.problemVersionId,
      toleranceOverrides: {
        T2: relative('1.5'),
        wNet: { kind: 'absolute', value: '2', unit: 'K' },
        eta: { kind: 'absolute', value: '-1', unit: '' },
      },
    }).catch((e: unknown) => e)
    expect(bad).toBeInstanceOf(RegradeError)
    expect(Object.keys((bad as RegradeError).fieldErrors).sort()).toEqual(['unit.wNet', 'value.T2', 'value.eta'])
    const ok = await previewRegrade(db(), {
      ...base,
      toVersionId: c.item.problemVersionId,
      toleranceOverrides: { T2: { kind: 'absolute', value: '2', unit: '°C' }, gone: relative('1 %') },
    })
    expect(ok.overrides).toEqual({ T2: { kind: 'absolute', value: 2, unit: '°C' } })
    expect(ok.ignoredOverrides).toEqual(['gone'])
  })
})

describe('a version edited in place', () => {
  test('the cache key is the content: key order does not matter, any changed value does', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { f: 1, e: null }], c: 'x' } })).toBe(
      canonicalJson({ a: { c: 'x', d: [2, { e: null, f: 1 }] }, b: 1 }),
    )
    const reordered = Object.fromEntries(Object.entries(ottoV1).reverse()) as ProblemDefinition
    expect(definitionHash(reordered)).toBe(definitionHash(ottoV1))
    expect(definitionHash({ ...ottoV1, finds: ottoV1.finds.map((f) => ({ ...f, points: f.points + 1 })) })).not.toBe(
      definitionHash(ottoV1),
    )
  })

  // An unfrozen version is edited in place by saveProblem; a variant drawn from it before the
  // edit must not come back after it (the per-process variant cache once keyed on the version id).
  test('the next draw, preview and applied regrade use the edited definition, not the numbers from before the edit', async () => {
    const c = await gradedCourse()
    const viewer = { id: c.instructor.id, isAdmin: false, departmentId: c.course.departmentId }
    const readDefinition = async (versionId: number) =>
      (
        await db()
          .select({ definition: problemVersions.definition })
          .from(problemVersions)
          .where(eq(problemVersions.id, versionId))
      )[0]!.definition as ProblemDefinition
    const wNetOf = (versionId: number, definition: ProblemDefinition, userId: number) => {
      const drawn = studentVariant({
        versionId,
        definition,
        assignmentId: c.assignment.id,
        problemId: c.item.problemId,
        userId,
        courseConvention: 'engineering',
      })
      if (!drawn.ok) throw new Error(drawn.error.message)
      return drawn.variant.key.find((k) => k.name === 'wNet')!.value
    }

    // Version 1 is frozen (the assignment uses it), so this save makes version 2, unfrozen, equal to version 1.
    const first = await saveProblem(db(), viewer, c.item.problemId, {
      definition: structuredClone(ottoV1),
      visibility: 'private',
    })
    expect(first.newVersion).toBe(true)
    const v2Id = first.versionId
    const request = {
      courseId: c.course.id,
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: v2Id,
      toleranceOverrides: {},
    }
    expect((await frozenDefinitions(db(), [v2Id])).get(v2Id)).toEqual(ottoV1)
    const same = await previewRegrade(db(), request)
    expect(same.changed).toEqual([])
    const student = c.students[0]!
    expect(wNetOf(v2Id, await readDefinition(v2Id), student.id)).toBe(c.keys.get(student.id)!.wNet)

    // The author widens the heat added (600–1000 → 1100–1500 kJ/kg): every student's net work changes.
    const edited: ProblemDefinition = {
      ...structuredClone(ottoV1),
      givens: ottoV1.givens.map((g) =>
        g.name === 'qin' ? { ...g, rule: { kind: 'range', min: 1100, max: 1500, step: 50 } } : g,
      ),
    }
    const second = await saveProblem(db(), viewer, c.item.problemId, { definition: edited, visibility: 'private' })
    expect(second).toMatchObject({ versionId: v2Id, newVersion: false })

    // The definitions the grader reads are not kept for an unfrozen version either.
    expect((await frozenDefinitions(db(), [v2Id])).get(v2Id)).toEqual(await readDefinition(v2Id))
    expect(definitionHash((await frozenDefinitions(db(), [v2Id])).get(v2Id)!)).toBe(definitionHash(edited))

    const after = wNetOf(v2Id, await readDefinition(v2Id), student.id)
    expect(after).not.toBe(c.keys.get(student.id)!.wNet)
    expect(after).toBe(wNetOf(0, edited, student.id))

    const preview = await previewRegrade(db(), request)
    expect(preview.changed.map((s) => s.userId).sort()).toEqual(c.students.map((s) => s.id).sort())
    for (const s of preview.changed) expect(s.newScore).toBeCloseTo(s.oldScore - share.wNet, 6)

    const regradeId = await applyRegrade(db(), { ...request, requestedBy: c.instructor.id })
    expect(await waitUntilFinished(regradeId)).toMatchObject({ status: 'done', changed: 6 })
    const wNet = (await partsOf(c.item.id)).filter((p) => p.findName === 'wNet')
    expect(wNet.map((p) => [p.verdict, p.gradedVersionId])).toEqual(c.students.map(() => ['incorrect', v2Id]))
    expect(workerErrors).toEqual([])
  })
})

describe('apply', () => {
  test('the worker rewrites the answers, writes audit events, reports progress to done; a second run changes nothing', async () => {
    const c = await gradedCourse()
    // One more answer of a 3 %-off student (4 % off this time), still waiting for the grader when the regrade runs.
    const waiting = await insertSubmission(
      c.assignment.id,
      c.item.id,
      c.off[0]!.id,
      { T2: `${c.keys.get(c.off[0]!.id)!.T2! * 1.04} K` },
      2,
    )

    const regradeId = await applyRegrade(db(), {
      courseId: c.course.id,
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: c.item.problemVersionId,
      toleranceOverrides: { T2: relative('5 %') },
      requestedBy: c.instructor.id,
    })
    const done = await waitUntilFinished(regradeId)
    expect(done).toMatchObject({
      status: 'done',
      total: 18,
      done: 18,
      changed: 3,
      error: null,
      fromVersionNumber: 1,
      toVersionNumber: 1,
    })

    const parts = await partsOf(c.item.id)
    const t2Off = parts.filter((p) => p.findName === 'T2' && p.attempt === 1 && c.off.some((s) => s.id === p.userId))
    expect(t2Off.map((p) => [p.verdict, p.score, p.regradeId])).toEqual(
      c.off.map(() => ['correct', share.T2, regradeId]),
    )
    expect(
      parts
        .filter((p) => p.verdict !== null)
        .every((p) => p.regradeId === regradeId && p.gradedVersionId === c.item.problemVersionId),
    ).toBe(true)
    const [item] = await db().select().from(assignmentItems).where(eq(assignmentItems.id, c.item.id))
    expect(item!.toleranceOverrides).toEqual({ T2: { kind: 'relative', value: 0.05 } })

    const audits = await db()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.assignmentId, c.assignment.id), eq(auditEvents.kind, 'regrade')))
    expect(audits.map((a) => [a.userId, a.actorId, a.before, a.after]).sort()).toEqual(
      c.off
        .map((s) => [
          s.id,
          c.instructor.id,
          { verdict: 'incorrect', score: 0 },
          { verdict: 'correct', score: share.T2 },
        ])
        .sort(),
    )

    // The waiting answer is graded after the regrade, with the item's new tolerance (4 % < 5 %).
    expect(await gradeSubmission(db(), waiting)).toBe('graded')
    const [late] = await db().select().from(partResults).where(eq(partResults.submissionId, waiting))
    expect([late!.verdict, late!.score]).toEqual(['correct', share.T2])

    const snapshot = await partsOf(c.item.id)
    expect(await runRegrade(db(), regradeId)).toBe('already-done')
    expect(await partsOf(c.item.id)).toEqual(snapshot)
    expect(
      (await db().select({ n: count() }).from(auditEvents).where(eq(auditEvents.assignmentId, c.assignment.id)))[0]!.n,
    ).toBe(3)
    expect(workerErrors).toEqual([])
  })

  test('a retried run continues: answers already carrying the regrade are skipped, chunk by chunk', async () => {
    const c = await gradedCourse()
    const v2: ProblemDefinition = {
      ...ottoV1,
      finds: ottoV1.finds.map((f) => (f.name === 'T2' ? { ...f, tolerance: { kind: 'relative', value: 0.05 } } : f)),
    }
    const v2Id = await addVersion(c.item.problemId, c.instructor.id, 2, v2)
    // Recorded without a job, so only the calls below run it.
    const [row] = await db()
      .insert(regrades)
      .values({
        assignmentId: c.assignment.id,
        itemId: c.item.id,
        fromVersionId: c.item.problemVersionId,
        toVersionId: v2Id,
        total: 18,
        requestedBy: c.instructor.id,
        status: 'running',
        done: 5,
      })
      .returning()
    const first = (await partsOf(c.item.id)).slice(0, 5)
    for (const p of first) await db().update(partResults).set({ regradeId: row!.id }).where(eq(partResults.id, p.id))

    expect(await runRegrade(db(), row!.id, { chunk: 4 })).toBe('done')
    const after = await partsOf(c.item.id)
    // The five marked before the run kept their old version: the run did not touch them.
    expect(after.slice(0, 5).map((p) => p.gradedVersionId)).toEqual(first.map(() => c.item.problemVersionId))
    expect(after.slice(5).every((p) => p.gradedVersionId === v2Id && p.regradeId === row!.id)).toBe(true)
    const progress = await getRegradeProgress(db(), row!.id)
    expect(progress).toMatchObject({ status: 'done', done: 18, total: 18, toVersionNumber: 2 })
    const [item] = await db().select().from(assignmentItems).where(eq(assignmentItems.id, c.item.id))
    expect(item!.problemVersionId).toBe(v2Id)
  })

  test('applying freezes the target version, moves the item to it, and is refused while another regrade of the item waits', async () => {
    const c = await gradedCourse()
    const v2Id = await addVersion(c.item.problemId, c.instructor.id, 2, {
      ...ottoV1,
      finds: ottoV1.finds.map((f) => ({ ...f, points: 1 })),
    })
    const input = {
      courseId: c.course.id,
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: v2Id,
      toleranceOverrides: {},
      requestedBy: c.instructor.id,
    }
    await expect(applyRegrade(db(), { ...input, toVersionId: c.item.problemVersionId })).rejects.toThrow(
      /current version with the same tolerances/,
    )
    // A queued regrade recorded by hand (no job), so it stays queued.
    const [held] = await db()
      .insert(regrades)
      .values({
        assignmentId: c.assignment.id,
        itemId: c.item.id,
        fromVersionId: c.item.problemVersionId,
        toVersionId: v2Id,
        requestedBy: c.instructor.id,
      })
      .returning()
    await expect(applyRegrade(db(), input)).rejects.toThrow(/already under way/)
    await db().update(regrades).set({ status: 'failed' }).where(eq(regrades.id, held!.id))

    const regradeId = await applyRegrade(db(), input)
    const [version] = await db().select().from(problemVersions).where(eq(problemVersions.id, v2Id))
    expect(version!.frozenAt).not.toBeNull()
    expect(await waitUntilFinished(regradeId)).toMatchObject({ status: 'done', done: 18 })
    const [item] = await db().select().from(assignmentItems).where(eq(assignmentItems.id, c.item.id))
    expect(item!.problemVersionId).toBe(v2Id)
    // Equal points: each find is now worth 10/3.
    const parts = await partsOf(c.item.id)
    expect(new Set(parts.map((p) => p.maxScore))).toEqual(new Set([10 / 3]))
  })
})

test('the job refuses a malformed payload for good, touching no regrade', async () => {
  const deps = { database: db(), attempt: { number: 1, of: 3 } }
  await expect(handleRegrade({ v: 1, regradeId: 'one' }, deps)).rejects.toBeInstanceOf(PermanentJobError)
  await expect(handleRegrade({ regradeId: 1 }, deps)).rejects.toBeInstanceOf(PermanentJobError)
  expect(await handleRegrade({ v: 1, regradeId: 999_999 }, deps)).toBe('missing')
})

describe('the page and the API', () => {
  async function people() {
    const c = await gradedCourse()
    const ta = await createUser(db(), { password: null })
    await addMember(db(), ta.id, c.course.id, 'ta')
    const path = `/courses/${c.course.id}/assignments/${c.assignment.id}/problems/1/regrade`
    const params = { courseId: String(c.course.id), assignmentId: String(c.assignment.id), position: '1' }
    return { c, ta, path, params }
  }

  const applyFields = (versionId: number) => ({
    intent: 'apply',
    version: String(versionId),
    'kind.T2': 'relative',
    'value.T2': '5 %',
    'unit.T2': '',
  })

  test('a TA or a student cannot apply a regrade (403) and nothing is recorded', async () => {
    const { c, ta, path, params } = await people()
    for (const who of [ta.id, c.students[0]!.id]) {
      const res = await settle(
        regradeAction(
          args(
            formRequest(path, applyFields(c.item.problemVersionId), { Cookie: await sessionCookie({ id: who }) }),
            params,
          ),
        ),
      )
      expect('thrown' in res && (res.thrown as { init?: { status?: number } }).init?.status).toBe(403)
    }
    expect((await db().select({ n: count() }).from(regrades).where(eq(regrades.itemId, c.item.id)))[0]!.n).toBe(0)
  })

  test('an instructor previews with a GET form and applies with a POST that redirects to the progress', async () => {
    const { c, path, params } = await people()
    const cookie = await sessionCookie(c.instructor)
    const query = new URLSearchParams({
      version: String(c.item.problemVersionId),
      'kind.T2': 'relative',
      'value.T2': '5 %',
      'unit.T2': '',
      preview: '1',
    })
    const page = (await regradeLoader(args(getRequest(`${path}?${query}`, { Cookie: cookie }), params))) as {
      preview: { changed: unknown[] } | null
    }
    expect(page.preview?.changed).toHaveLength(3)
    // A field named after Object.prototype's key is just an unknown find.
    const odd = new URLSearchParams({
      version: String(c.item.problemVersionId),
      'kind.__proto__': 'relative',
      'value.__proto__': '5 %',
      preview: '1',
    })
    const oddPage = (await regradeLoader(args(getRequest(`${path}?${odd}`, { Cookie: cookie }), params))) as {
      preview: { ignoredOverrides: string[] } | null
    }
    expect(oddPage.preview?.ignoredOverrides).toEqual(['__proto__'])
    expect(({} as Record<string, unknown>).kind).toBeUndefined()

    const res = await settle(
      regradeAction(args(formRequest(path, applyFields(c.item.problemVersionId), { Cookie: cookie }), params)),
    )
    const redirect = ('value' in res ? res.value : res.thrown) as Response
    expect(redirect.status).toBe(302)
    const id = Number(new URL(redirect.headers.get('Location')!, 'http://x').searchParams.get('regrade'))
    expect(await waitUntilFinished(id)).toMatchObject({ status: 'done', changed: 3 })

    // A bad tolerance comes back as field errors with what was typed, status 400.
    const bad = await settle(
      regradeAction(
        args(
          formRequest(path, { ...applyFields(c.item.problemVersionId), 'value.T2': 'lots' }, { Cookie: cookie }),
          params,
        ),
      ),
    )
    const badValue = ('value' in bad ? bad.value : bad.thrown) as {
      init?: { status?: number }
      data?: { fieldErrors?: Record<string, string>; values?: Record<string, string> }
    }
    expect(badValue.init?.status).toBe(400)
    expect(badValue.data?.fieldErrors?.['value.T2']).toMatch(/not a number/)
    expect(badValue.data?.values?.['value.T2']).toBe('lots')
  })

  test('the page renders the versions, the tolerance form, the preview table and the progress on the server', async () => {
    const { c, path, params } = await people()
    const cookie = await sessionCookie(c.instructor)
    const regradeId = await applyRegrade(db(), {
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: c.item.problemVersionId,
      toleranceOverrides: { T2: relative('5 %') },
      requestedBy: c.instructor.id,
    })
    await waitUntilFinished(regradeId)
    const query = `?version=${c.item.problemVersionId}&kind.wNet=relative&value.wNet=0.5+%25&unit.wNet=&preview=1&regrade=${regradeId}`
    const loaderData = await regradeLoader(args(getRequest(`${path}${query}`, { Cookie: cookie }), params))
    const Stub = createRoutesStub([
      { path, Component: RegradeRoute as never, loader: () => loaderData, HydrateFallback: () => null },
    ])
    const html = renderToStringPlain(
      createElement(
        QueryClientProvider,
        { client: new QueryClient() },
        createElement(Stub, { initialEntries: [`${path}${query}`], hydrationData: { loaderData: { 0: loaderData } } }),
      ),
    )
    expect(html).toContain('Version 1 (used now)')
    expect(html).toContain('name="kind.T2"')
    // T2 keeps the 5 % the regrade stored; wNet tightened to 0.5 % changes nobody (every wNet answer was exact).
    expect(html).toMatch(/value="5 %"/)
    expect(html).toContain('No student’s score would change.')
    expect(html).toMatch(/<progress[^>]*max="18"[^>]*value="18"/)
    expect(html).toContain('18 of 18 answers regraded, 3 changed')
    expect(html).toContain('<caption')

    // Back to the version's own 1 % for T2: the table lists the three students who would lose it.
    const back = `?version=${c.item.problemVersionId}&kind.T2=default&value.T2=&unit.T2=&preview=1`
    const backData = await regradeLoader(args(getRequest(`${path}${back}`, { Cookie: cookie }), params))
    const BackStub = createRoutesStub([
      { path, Component: RegradeRoute as never, loader: () => backData, HydrateFallback: () => null },
    ])
    const table = renderToStringPlain(
      createElement(
        QueryClientProvider,
        { client: new QueryClient() },
        createElement(BackStub, { initialEntries: [`${path}${back}`], hydrationData: { loaderData: { 0: backData } } }),
      ),
    )
    expect(table.match(/Temperature at the end of compression: correct → incorrect/g)).toHaveLength(3)
    for (const s of c.off) expect(table).toContain(s.email)
    expect(table).toContain('name="intent" value="apply"')
  })

  test('GET /api/regrades/:id answers staff with the progress and others with JSON 401/403/404', async () => {
    const { c, ta } = await people()
    const regradeId = await applyRegrade(db(), {
      assignmentId: c.assignment.id,
      position: 1,
      toVersionId: c.item.problemVersionId,
      toleranceOverrides: { T2: relative('5 %') },
      requestedBy: c.instructor.id,
    })
    await waitUntilFinished(regradeId)
    const call = async (id: string, cookie?: string) => {
      const settled = await settle(
        apiRegradeLoader(args(getRequest(`/api/regrades/${id}`, cookie ? { Cookie: cookie } : {}), { regradeId: id })),
      )
      const r = ('value' in settled ? settled.value : settled.thrown) as Response
      return { status: r.status, body: (await r.json()) as Record<string, unknown> }
    }
    const ok = await call(String(regradeId), await sessionCookie(ta))
    expect(ok.status).toBe(200)
    expect(ok.body).toMatchObject({ id: regradeId, status: 'done', total: 18, done: 18, changed: 3 })
    expect((await call(String(regradeId))).status).toBe(401)
    expect((await call(String(regradeId), await sessionCookie(c.students[0]!))).status).toBe(403)
    expect((await call('999999', await sessionCookie(c.instructor))).status).toBe(404)
    expect((await call('abc', await sessionCookie(c.instructor))).status).toBe(404)
  })
})
