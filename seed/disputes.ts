/**
 * The demo's disputes, all invented: on ENTH 210's open week 9, one open dispute with a
 * student's PNG, one open without a file, and one a TA rejected with a comment; on CHEM 342
 * one open dispute. Raised and resolved through the product's own functions, so the audit log
 * and the queued e-mails are what real use makes. Skipped when the course already has disputes.
 */
import { and, eq, sql } from 'drizzle-orm'
import type { Db } from '#app/server/db/client.server.ts'
import { disputes } from '#app/server/db/schema.server.ts'
import { raiseDispute, resolveDispute } from '#app/server/disputes.server.ts'
import { tinyPng } from '#tests/support/png.ts'

type Candidate = { course_id: number; assignment_id: number; position: number; find_name: string; user_id: number }

/** Students with a wrong graded answer (and no right one) on the assignment, one find each, by name. */
async function candidates(db: Db, courseId: number, assignmentTitle: string, count: number): Promise<Candidate[]> {
  const r = await db.execute<Candidate>(sql`
    select distinct on (u.name) a.course_id, a.id as assignment_id, i.position, p.find_name, u.id as user_id
      from part_results p join assignments a on a.id = p.assignment_id join assignment_items i on i.id = p.item_id join users u on u.id = p.user_id
     where a.course_id = ${courseId} and a.title = ${assignmentTitle} and p.verdict = 'incorrect'
       and not exists (select 1 from part_results q where q.item_id = p.item_id and q.user_id = p.user_id and q.find_name = p.find_name and q.verdict = 'correct')
     order by u.name, p.id
     limit ${count}`)
  return r.rows
}

export async function seedDemoDisputes(
  db: Db,
  options: { courseIds: { engineering: number; chemistry: number }; reviewerId: number },
): Promise<number> {
  const [already] = await db
    .select({ id: disputes.id })
    .from(disputes)
    .where(and(eq(disputes.courseId, options.courseIds.engineering)))
    .limit(1)
  if (already) return 0
  let made = 0
  const raise = async (c: Candidate, reason: string, withFile: boolean) => {
    const r = await raiseDispute(db, {
      courseId: c.course_id,
      assignmentId: c.assignment_id,
      position: c.position,
      findName: c.find_name,
      userId: c.user_id,
      reason,
      upload: withFile ? { fileName: 'my-working.png', bytes: tinyPng() } : null,
    })
    if (!r.ok) throw new Error(`A demo dispute could not be raised: ${r.formError ?? JSON.stringify(r.fieldErrors)}`)
    made++
    return r.disputeId
  }
  const [first, second, third] = await candidates(db, options.courseIds.engineering, 'Week 9: Gas turbines', 3)
  if (first)
    await raise(
      first,
      'I think my answer is right within rounding: I kept four figures all the way through. My working is attached.',
      true,
    )
  if (second)
    await raise(
      second,
      'The question did not say which convention to use for the sign of the work, so my sign should count.',
      false,
    )
  if (third) {
    const id = await raise(
      third,
      'I believe I used the right pressure ratio; could you check the compressor step?',
      false,
    )
    const resolved = await resolveDispute(db, {
      courseId: options.courseIds.engineering,
      disputeId: id,
      actor: { id: options.reviewerId, isAdmin: false, role: 'ta' },
      decision: 'reject',
      comment:
        'The temperature after the compressor needs the isentropic efficiency as well; see step 1 of the worked solution once the key is released.',
    })
    if (!resolved.ok)
      throw new Error(
        `A demo dispute could not be resolved: ${resolved.formError ?? JSON.stringify(resolved.fieldErrors)}`,
      )
  }
  const [chem] = await candidates(
    db,
    options.courseIds.chemistry,
    'Problem set 4: Carnot heat pumps and refrigerators',
    1,
  )
  if (chem) await raise(chem, 'I used w on the gas as the course convention says; please look at my sign again.', false)
  return made
}
