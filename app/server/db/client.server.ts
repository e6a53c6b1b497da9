import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import { env } from '../env.server.ts'
import * as schema from './schema.server.ts'

export type Db = NodePgDatabase<typeof schema>
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0]

type Holder = { pool?: pg.Pool; db?: Db; url?: string }
declare global {
  // Kept on globalThis so that hot reloads in development do not leak pools.
  var __cyclewrightDb: Holder | undefined
}
const holder: Holder = (globalThis.__cyclewrightDb ??= {})

export function pool(): pg.Pool {
  const url = env().DATABASE_URL
  if (!holder.pool || holder.url !== url) {
    holder.pool = new pg.Pool({ connectionString: url, max: 10 })
    holder.pool.on('error', (e) => console.error('PostgreSQL pool error:', e.message))
    holder.db = undefined
    holder.url = url
  }
  return holder.pool
}

export function db(): Db {
  if (!holder.db) holder.db = drizzle(pool(), { schema, casing: 'snake_case' })
  return holder.db
}

export async function closeDb() {
  const p = holder.pool
  holder.pool = undefined
  holder.db = undefined
  await p?.end()
}
