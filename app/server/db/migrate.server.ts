import path from 'node:path'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'

export const migrationsFolder = path.resolve(import.meta.dirname, '../../../drizzle')

/**
 * The key of the session advisory lock held while migrating: any 64-bit number of our own,
 * the same in every process (here: "cyclewri" read as one big-endian number).
 */
export const MIGRATION_LOCK_KEY = 0x6379636c65777269n

/**
 * Applies the committed migrations in drizzle/ over one connection. Safe to repeat, and
 * safe when several processes start at once on a fresh database: each waits for a
 * PostgreSQL advisory lock, so one applies the migrations and the others then find them
 * recorded and apply nothing.
 */
export async function migrateDatabase(url: string) {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    // Quiet the NOTICEs PostgreSQL prints for "already exists, skipping".
    await client.query("set client_min_messages = 'warning'")
    await client.query('select pg_advisory_lock($1)', [MIGRATION_LOCK_KEY.toString()])
    try {
      await migrate(drizzle(client, { casing: 'snake_case' }), { migrationsFolder })
    } finally {
      await client.query('select pg_advisory_unlock($1)', [MIGRATION_LOCK_KEY.toString()])
    }
  } finally {
    // Ending the session also releases the lock if unlocking failed.
    await client.end()
  }
}
