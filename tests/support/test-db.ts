/**
 * Test databases: each run makes a template database from the committed migrations,
 * and each integration test file gets its own copy of it. Never a mock database.
 * TEST_DATABASE_URL (or DATABASE_URL) may name a server where we may create databases;
 * otherwise the project's private cluster is started, as `npm start` does.
 */
import pg from 'pg'
import { startCluster } from '#scripts/postgres.ts'

export async function serverUrl(): Promise<string> {
  const configured = process.env.TEST_DATABASE_URL ?? process.env.DATABASE_URL
  if (configured) return configured
  const c = await startCluster(() => {})
  return c.adminUrl
}

export function withDatabase(url: string, name: string): string {
  const u = new URL(url)
  u.pathname = `/${name}`
  return u.toString()
}

export async function adminQuery(url: string, text: string) {
  const client = new pg.Client({ connectionString: withDatabase(url, 'postgres') })
  await client.connect()
  try {
    await client.query("set client_min_messages = 'warning'")
    return await client.query(text)
  } finally {
    await client.end()
  }
}

export function uniqueName(prefix: string) {
  return `${prefix}_${process.pid}_${Date.now().toString(36)}_${Math.random().toString(36).slice(2, 8)}`
}

export async function createDatabase(url: string, name: string, template?: string) {
  await adminQuery(url, `create database "${name}"${template ? ` template "${template}"` : ''}`)
  return withDatabase(url, name)
}

export async function dropDatabase(url: string, name: string) {
  if (process.env.KEEP_TEST_DB === '1') {
    console.log(`KEEP_TEST_DB=1: kept database ${name}`)
    return
  }
  await adminQuery(url, `drop database if exists "${name}" with (force)`)
}
