import path from 'node:path'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'

export const migrationsFolder = path.resolve(import.meta.dirname, '../../../drizzle')

/** Applies the committed migrations in drizzle/ over one connection. Safe to repeat. */
export async function migrateDatabase(url: string) {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    // Quiet the NOTICEs PostgreSQL prints for "already exists, skipping".
    await client.query("set client_min_messages = 'warning'")
    await migrate(drizzle(client, { casing: 'snake_case' }), { migrationsFolder })
  } finally {
    await client.end()
  }
}
