/** Reads the end-to-end database directly, to check what a journey wrote. */
import pg from 'pg'
import { inject } from 'vitest'

export async function e2eQuery<T>(text: string, values: unknown[] = []): Promise<T[]> {
  const client = new pg.Client({ connectionString: inject('e2eDatabaseUrl') })
  await client.connect()
  try {
    return (await client.query(text, values)).rows as T[]
  } finally {
    await client.end()
  }
}
