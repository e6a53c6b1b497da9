/**
 * The 'grade-submission' job: grades one stored submission (app/server/grading.server.ts).
 * Idempotent: a submission already graded is skipped, so a retried or duplicated job never
 * counts twice. A missing submission (deleted with its course) is nothing to do.
 */
import type { Db } from '#app/server/db/client.server.ts'
import { gradeSubmission, type GradeOutcome } from '#app/server/grading.server.ts'
import { PermanentJobError, queuePayloads } from '#app/server/queue.server.ts'

export type GradeSubmissionDeps = { database: Db; grade?: typeof gradeSubmission }

export async function handleGradeSubmission(payload: unknown, deps: GradeSubmissionDeps): Promise<GradeOutcome> {
  const parsed = queuePayloads['grade-submission'].safeParse(payload)
  if (!parsed.success) throw new PermanentJobError(`grade-submission payload is not valid: ${parsed.error.issues[0]?.message ?? 'unknown'}`)
  return (deps.grade ?? gradeSubmission)(deps.database, parsed.data.submissionId)
}
