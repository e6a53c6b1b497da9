/**
 * The check (sweep) behind each version offered to an assignment (issue #15): the latest
 * check's result in words, and whether putting the version on an assignment needs the
 * instructor's explicit override (a check that failed, could not run, is still running, or
 * never ran).
 */
import { desc, inArray } from 'drizzle-orm'
import type { Db, Tx } from '#app/server/db/client.server.ts'
import { checkOfSweep, type VersionCheck } from '#app/lib/check-words.ts'
import { problemSweeps } from '#app/server/db/schema.server.ts'

type Database = Db | Tx

export type { VersionCheck } from '#app/lib/check-words.ts'
export {
  checkOfSweep,
  checkWords,
  needsOverride,
  overrideLabel,
  refusalText,
  NEVER_CHECKED,
} from '#app/lib/check-words.ts'

/** The latest check of each version (by when it was asked for); versions never checked are absent. */
export async function latestChecks(
  database: Database,
  versionIds: readonly number[],
): Promise<Map<number, VersionCheck>> {
  const out = new Map<number, VersionCheck>()
  if (versionIds.length === 0) return out
  const rows = await database
    .selectDistinctOn([problemSweeps.problemVersionId], {
      versionId: problemSweeps.problemVersionId,
      status: problemSweeps.status,
      total: problemSweeps.total,
      checked: problemSweeps.checked,
      failed: problemSweeps.failed,
    })
    .from(problemSweeps)
    .where(inArray(problemSweeps.problemVersionId, [...new Set(versionIds)]))
    .orderBy(problemSweeps.problemVersionId, desc(problemSweeps.createdAt), desc(problemSweeps.id))
  for (const r of rows) out.set(r.versionId, checkOfSweep(r))
  return out
}
