/**
 * What the end-to-end tests need to know about a demo assignment problem: ids from the
 * seeded database, and a student's key computed here with the same pure code the server uses
 * (the variant depends only on the problem version, the seed and the course's convention).
 */
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { studentVariant } from '#app/server/grading.server.ts'
import { e2eQuery } from './e2e-db.ts'

export type DemoProblemRef = {
  courseId: number
  assignmentId: number
  itemId: number
  problemId: number
  versionId: number
  definition: ProblemDefinition
  convention: 'chemistry' | 'engineering'
}

export async function demoProblem(assignmentTitle: string, position: number): Promise<DemoProblemRef> {
  const [row] = await e2eQuery<{
    course_id: number
    assignment_id: number
    item_id: number
    problem_id: number
    version_id: number
    definition: ProblemDefinition
    convention: 'chemistry' | 'engineering'
  }>(
    `select a.course_id, a.id as assignment_id, i.id as item_id, i.problem_id, i.problem_version_id as version_id, v.definition, c.sign_convention as convention
       from assignments a join assignment_items i on i.assignment_id = a.id and i.position = $2
       join problem_versions v on v.id = i.problem_version_id join courses c on c.id = a.course_id
      where a.title = $1`,
    [assignmentTitle, position],
  )
  if (!row) throw new Error(`The demo has no assignment "${assignmentTitle}" with a problem ${position}`)
  return {
    courseId: row.course_id,
    assignmentId: row.assignment_id,
    itemId: row.item_id,
    problemId: row.problem_id,
    versionId: row.version_id,
    definition: row.definition,
    convention: row.convention,
  }
}

/** A student of the course who has not answered this problem yet (first by name), and not `except`. */
export async function freshStudent(
  ref: DemoProblemRef,
  except: string[] = [],
): Promise<{ id: number; email: string; name: string }> {
  const rows = await e2eQuery<{ id: number; email: string; name: string }>(
    `select u.id, u.email, u.name from memberships m join users u on u.id = m.user_id
      where m.course_id = $1 and m.role = 'student' and not (u.email = any($3::text[]))
        and not exists (select 1 from submissions s where s.item_id = $2 and s.user_id = u.id)
      order by u.name limit 1`,
    [ref.courseId, ref.itemId, except],
  )
  if (!rows[0]) throw new Error('Every demo student has answered this problem already')
  return rows[0]
}

/** The key of a student's variant: find name → "value unit", to 6 significant figures. */
export function keyFor(
  ref: DemoProblemRef,
  userId: number,
): Record<string, { text: string; value: number; unit: string }> {
  const drawn = studentVariant({
    versionId: ref.versionId,
    definition: ref.definition,
    assignmentId: ref.assignmentId,
    problemId: ref.problemId,
    userId,
    courseConvention: ref.convention,
  })
  if (!drawn.ok) throw new Error(drawn.error.message)
  return Object.fromEntries(
    drawn.variant.key.map((k) => [
      k.name,
      { text: `${Number(k.value.toPrecision(6))}${k.unit ? ` ${k.unit}` : ''}`, value: k.value, unit: k.unit },
    ]),
  )
}
