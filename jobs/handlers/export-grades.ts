/**
 * The 'export-grades' job: builds a department admin's term export into grade_exports
 * (app/server/exports.server.ts). Idempotent: a done export is skipped, and a retried build
 * starts the file again from the first course.
 */
import type { Db } from '#app/server/db/client.server.ts'
import { buildTermExport, type BuildOutcome } from '#app/server/exports.server.ts'
import { PermanentJobError, queuePayloads } from '#app/server/queue.server.ts'

export type ExportGradesDeps = { database: Db; attempt: { number: number; of: number }; build?: typeof buildTermExport }

export async function handleExportGrades(payload: unknown, deps: ExportGradesDeps): Promise<BuildOutcome> {
  const parsed = queuePayloads['export-grades'].safeParse(payload)
  if (!parsed.success)
    throw new PermanentJobError(`export-grades payload is not valid: ${parsed.error.issues[0]?.message ?? 'unknown'}`)
  // The last attempt records the failure for the admin; earlier ones put the export back in the queue.
  return (deps.build ?? buildTermExport)(deps.database, parsed.data.exportId, {
    lastAttempt: deps.attempt.number >= deps.attempt.of,
  })
}
