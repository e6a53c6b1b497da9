/**
 * The 'grade-submission' job: grades one stored submission (app/server/grading.server.ts).
 * Idempotent: a submission already graded is skipped, so a retried or duplicated job never
 * counts twice. A missing submission (deleted with its course) is nothing to do; one that
 * another transaction holds ('busy') is retried. The worker
 * grades whole fetched batches with gradeSubmissions and uses this handler for a job on its own.
 */
import type { Db } from '#app/server/db/client.server.ts'
import { gradeSubmission, type GradeOutcome } from '#app/server/grading.server.ts'
import { PermanentJobError, queuePayloads } from '#app/server/queue.server.ts'

export type GradeSubmissionDeps = { database: Db; grade?: typeof gradeSubmission }

export async function handleGradeSubmission(payload: unknown, deps: GradeSubmissionDeps): Promise<GradeOutcome> {
  const parsed = queuePayloads['grade-submission'].safeParse(payload)
  if (!parsed.success)
    throw new PermanentJobError(
      `grade-submission payload is not valid: ${parsed.error.issues[0]?.message ?? 'unknown'}`,
    )
  const outcome = await (deps.grade ?? gradeSubmission)(deps.database, parsed.data.submissionId)
  // Thrown so pg-boss retries it: the transaction holding it may yet roll back.
  if (outcome === 'busy')
    throw new Error(`submission ${parsed.data.submissionId} is being graded by another transaction; trying again later`)
  return outcome
}

/**
 * The jobs of a fetched batch whose payload names a submission, with its id, and the others
 * (which the worker runs one by one, so they fail for good on their own).
 */
export function splitGradeJobs<J extends { data: unknown }>(
  jobs: readonly J[],
): { valid: { job: J; submissionId: number }[]; invalid: J[] } {
  const valid: { job: J; submissionId: number }[] = []
  const invalid: J[] = []
  for (const job of jobs) {
    const parsed = queuePayloads['grade-submission'].safeParse(job.data)
    if (parsed.success) valid.push({ job, submissionId: parsed.data.submissionId })
    else invalid.push(job)
  }
  return { valid, invalid }
}
