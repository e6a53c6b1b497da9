/**
 * The 'regrade' job: applies one regrade recorded by applyRegrade (app/server/regrades.server.ts).
 * runRegrade is idempotent (answers already carrying the regrade's id are skipped, a done
 * regrade is not run again), so a retry continues where the last try stopped. While a retry
 * waits the regrade is 'queued' again with the reason; after the last try it is 'failed'.
 */
import type { Db } from '#app/server/db/client.server.ts'
import { PermanentJobError, queuePayloads } from '#app/server/queue.server.ts'
import { recordRegradeFailure, runRegrade, type RunRegradeOutcome } from '#app/server/regrades.server.ts'

function reason(e: unknown): string {
  const line = (e instanceof Error ? e.message : String(e)).split('\n')[0]!.trim() || 'unknown error'
  return line.length > 300 ? `${line.slice(0, 297)}…` : line
}

export async function handleRegrade(
  payload: unknown,
  deps: { database: Db; attempt: { number: number; of: number } },
): Promise<RunRegradeOutcome> {
  const parsed = queuePayloads.regrade.safeParse(payload)
  if (!parsed.success)
    throw new PermanentJobError(`regrade payload is not valid: ${parsed.error.issues[0]?.message ?? 'unknown'}`)
  const { regradeId } = parsed.data
  try {
    return await runRegrade(deps.database, regradeId)
  } catch (e) {
    const willRetry = !(e instanceof PermanentJobError) && deps.attempt.number < deps.attempt.of
    const message = willRetry
      ? `Attempt ${deps.attempt.number} of ${deps.attempt.of} stopped (${reason(e)}); trying again shortly.`
      : `The regrade stopped: ${reason(e)}. Answers not yet regraded keep their old grades; apply the regrade again to finish it.`
    try {
      await recordRegradeFailure(deps.database, regradeId, { message, willRetry })
    } catch (writeError) {
      console.error(
        `regrade ${regradeId}: could not record the failure:`,
        writeError instanceof Error ? writeError.message : writeError,
      )
    }
    throw e
  }
}
