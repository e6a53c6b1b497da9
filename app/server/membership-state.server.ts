/**
 * Whether a student has been dropped from a course (memberships.droppedAt, set by the roster).
 * A dropped student still reads their past work but submits nothing new and raises no dispute;
 * submitting and raising disputes check this on the server, and the pages say so.
 */
import { and, eq } from 'drizzle-orm'
import type { Db, Tx } from './db/client.server.ts'
import { memberships } from './db/schema.server.ts'

export { DROPPED_DISPUTE_MESSAGE, DROPPED_SUBMIT_MESSAGE } from '#app/lib/dropped.ts'

/** When the person was dropped from the course, or null (on the roster, or not a member). */
export async function droppedFrom(database: Db | Tx, userId: number, courseId: number): Promise<Date | null> {
  const [row] = await database
    .select({ droppedAt: memberships.droppedAt })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), eq(memberships.courseId, courseId)))
    .limit(1)
  return row?.droppedAt ?? null
}
