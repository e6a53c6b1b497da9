import type { Db } from '#app/server/db/client.server.ts'
import { PermanentJobError } from '#app/server/queue.server.ts'

// Placeholder until the handler is built (issue #6).
export async function handleSendMail(_payload: unknown, _deps: { database: Db; attempt: { number: number; of: number } }): Promise<void> {
  throw new PermanentJobError('not built yet')
}
