import { desc, eq, sql } from 'drizzle-orm'
import type { Db } from './db/client.server.ts'
import { mailMessages } from './db/schema.server.ts'

export async function listOutbox(database: Db, { limit = 50, offset = 0 } = {}) {
  return database
    .select({
      id: mailMessages.id,
      envelopeTo: mailMessages.envelopeTo,
      subject: mailMessages.subject,
      receivedAt: mailMessages.receivedAt,
    })
    .from(mailMessages)
    .orderBy(desc(mailMessages.receivedAt), desc(mailMessages.id))
    .limit(limit)
    .offset(offset)
}

export async function countOutbox(database: Db) {
  const [row] = await database.select({ n: sql<number>`count(*)::int` }).from(mailMessages)
  return row?.n ?? 0
}

export async function findOutboxMessage(database: Db, id: number) {
  const rows = await database.select().from(mailMessages).where(eq(mailMessages.id, id)).limit(1)
  return rows[0] ?? null
}

/** The newest message to an address (tests and the demo follow invitation links with it). */
export async function findLastMailTo(database: Db, address: string) {
  const rows = await database
    .select()
    .from(mailMessages)
    .where(sql`${address.toLowerCase()} = any(${mailMessages.envelopeTo})`)
    .orderBy(desc(mailMessages.id))
    .limit(1)
  return rows[0] ?? null
}

/** Links found in a message's text, in order. */
export function linksIn(text: string): string[] {
  return [...text.matchAll(/https?:\/\/[^\s<>"]+/g)].map((m) => m[0])
}
