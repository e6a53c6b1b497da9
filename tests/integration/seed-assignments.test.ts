/**
 * The demo's assignments: placed around the seed's now, pinned to frozen versions (week 6 to
 * the Otto problem's version 1), with graded answers that are right and wrong, an extension,
 * and nothing added by a second run.
 */
import { and, eq, sql } from 'drizzle-orm'
import { afterAll, expect, test } from 'vitest'
import { db } from '#app/server/db/client.server.ts'
import {
  assignmentItems,
  assignments,
  attachments,
  auditEvents,
  disputes,
  extensions,
  partResults,
  problems,
  problemVersions,
  submissions,
} from '#app/server/db/schema.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { seedDemo } from '#seed/demo.ts'

const now = new Date('2026-12-02T10:00:00Z')

afterAll(async () => {
  await stopBoss()
})

const counts = async () => {
  const r = await db().execute(
    sql`select (select count(*) from assignments)::int as a, (select count(*) from assignment_items)::int as i, (select count(*) from submissions)::int as s, (select count(*) from part_results)::int as p, (select count(*) from extensions)::int as e`,
  )
  return r.rows[0] as { a: number; i: number; s: number; p: number; e: number }
}

test(
  'the demo seed makes assignments with graded answers, and a second run adds nothing',
  { timeout: 120_000 },
  async () => {
    await seedDemo(db(), { now })
    const first = await counts()
    expect(first.a).toBe(5)

    const list = await db().select().from(assignments)
    const byTitle = new Map(list.map((a) => [a.title, a]))
    const week6 = byTitle.get('Week 6: Otto and Diesel cycles')!
    const week9 = byTitle.get('Week 9: Gas turbines')!
    const week11 = byTitle.get('Week 11: Rankine cycles')!
    expect(week6.dueAt.getTime()).toBeLessThan(now.getTime())
    expect(week6.latePolicy).toBe('closed')
    expect(week6.keyRelease).toBe('after-due')
    expect(week9.opensAt.getTime()).toBeLessThan(now.getTime())
    expect(week9.dueAt.getTime()).toBeGreaterThan(now.getTime())
    expect(week9).toMatchObject({
      latePolicy: 'penalty',
      latePenaltyPercentPerDay: 10,
      lateDaysAllowed: 3,
      keyRelease: 'manual',
      keyReleasedAt: null,
    })
    expect(week11.opensAt.getTime()).toBeGreaterThan(now.getTime())

    // Week 6 pins the Otto problem's version 1 (the bank's latest is 2); every used version is frozen.
    const items = await db()
      .select({
        assignmentId: assignmentItems.assignmentId,
        title: problems.title,
        number: problemVersions.number,
        frozenAt: problemVersions.frozenAt,
      })
      .from(assignmentItems)
      .innerJoin(problemVersions, eq(problemVersions.id, assignmentItems.problemVersionId))
      .innerJoin(problems, eq(problems.id, assignmentItems.problemId))
    expect(items.find((i) => i.assignmentId === week6.id && i.title === 'Air-standard Otto cycle')?.number).toBe(1)
    expect(items.every((i) => i.frozenAt !== null)).toBe(true)

    // Answers on the past and current assignments only, all graded, with right and wrong ones.
    const subs = await db()
      .select({
        assignmentId: submissions.assignmentId,
        status: submissions.status,
        gradedAt: submissions.gradedAt,
        submittedAt: submissions.submittedAt,
      })
      .from(submissions)
    expect(subs.length).toBeGreaterThan(40)
    expect(
      subs.every((s) => s.status === 'graded' && s.gradedAt !== null && s.submittedAt.getTime() < now.getTime()),
    ).toBe(true)
    expect(new Set(subs.map((s) => s.assignmentId))).toEqual(
      new Set([
        week6.id,
        week9.id,
        byTitle.get('Problem set 3: The Carnot engine')!.id,
        byTitle.get('Problem set 4: Carnot heat pumps and refrigerators')!.id,
      ]),
    )
    const verdicts = await db()
      .select({
        verdict: partResults.verdict,
        pitfallId: partResults.pitfallId,
        attempt: partResults.attempt,
        n: sql<number>`count(*)::int`,
      })
      .from(partResults)
      .groupBy(partResults.verdict, partResults.pitfallId, partResults.attempt)
    const total = (pred: (v: (typeof verdicts)[number]) => boolean) =>
      verdicts.filter(pred).reduce((a, v) => a + v.n, 0)
    expect(total((v) => v.verdict === null)).toBe(0)
    expect(total((v) => v.verdict === 'correct')).toBeGreaterThan(total((v) => v.verdict === 'incorrect'))
    expect(total((v) => v.verdict === 'incorrect')).toBeGreaterThan(5)
    expect(total((v) => v.pitfallId === 'sign-convention-flipped')).toBeGreaterThan(0)
    expect(total((v) => v.pitfallId === 'kilo-factor')).toBeGreaterThan(0)
    expect(total((v) => v.attempt >= 2)).toBeGreaterThan(0)
    // Some students answered the past chemistry set late and lost points for it.
    const late = await db()
      .select({ n: sql<number>`count(*)::int` })
      .from(submissions)
      .where(
        and(
          eq(submissions.assignmentId, byTitle.get('Problem set 3: The Carnot engine')!.id),
          sql`${submissions.daysLate} > 0`,
        ),
      )
    expect(late[0]!.n).toBeGreaterThan(0)

    const [ext] = await db().select().from(extensions).where(eq(extensions.assignmentId, week9.id))
    expect(ext).toMatchObject({ extraAttempts: 1, reason: 'Documented accommodation' })
    expect(ext!.dueAt!.getTime() - week9.dueAt.getTime()).toBe(2 * 24 * 3600_000)

    // Demo disputes: three on week 9 (one with a PNG, one rejected by a TA), one in chemistry.
    const disputeRows = await db().select().from(disputes).orderBy(disputes.id)
    expect(disputeRows.map((d) => d.status)).toEqual(['open', 'open', 'rejected', 'open'])
    expect(disputeRows.filter((d) => d.attachmentId !== null)).toHaveLength(1)
    const [png] = await db().select({ contentType: attachments.contentType }).from(attachments)
    expect(png!.contentType).toBe('image/png')
    const resolvedAudit = await db().select().from(auditEvents).where(eq(auditEvents.kind, 'dispute-resolved'))
    expect(resolvedAudit).toHaveLength(1)

    await seedDemo(db(), { now: new Date(now.getTime() + 3600_000) })
    expect(await counts()).toEqual(first)
    expect(await db().select({ id: disputes.id }).from(disputes)).toHaveLength(4)
  },
)
