/**
 * Several web processes starting together on a fresh database (each runs the migrations
 * first, scripts/serve.ts): they take turns under an advisory lock, so every one succeeds
 * and the schema is applied once.
 */
import { spawn } from 'node:child_process'
import fs from 'node:fs'
import path from 'node:path'
import pg from 'pg'
import { afterAll, expect, inject, test } from 'vitest'
import { migrateDatabase, migrationsFolder } from '#app/server/db/migrate.server.ts'
import { projectRoot } from '#scripts/postgres.ts'
import { createDatabase, dropDatabase, uniqueName } from '#tests/support/test-db.ts'

const server = inject('dbServerUrl')
const made: string[] = []

async function freshDatabase() {
  const name = uniqueName('cw_migrate')
  made.push(name)
  return createDatabase(server, name)
}

afterAll(async () => {
  for (const name of made) await dropDatabase(server, name)
})

const journal = JSON.parse(fs.readFileSync(path.join(migrationsFolder, 'meta', '_journal.json'), 'utf8')) as {
  entries: unknown[]
}

async function applied(url: string) {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    const migrations = await client.query('select count(*)::int as n from drizzle.__drizzle_migrations')
    const users = await client.query(
      "select count(*)::int as n from information_schema.tables where table_schema = 'public' and table_name = 'users'",
    )
    return { migrations: migrations.rows[0].n as number, usersTable: users.rows[0].n as number }
  } finally {
    await client.end()
  }
}

test('four concurrent migrations of one fresh database (each on its own connection) all succeed and apply each migration once', async () => {
  const url = await freshDatabase()
  const results = await Promise.allSettled([1, 2, 3, 4].map(() => migrateDatabase(url)))
  expect(results.map((r) => (r.status === 'rejected' ? String(r.reason) : 'ok'))).toEqual(['ok', 'ok', 'ok', 'ok'])
  expect(await applied(url)).toEqual({ migrations: journal.entries.length, usersTable: 1 })
})

test('two `npm run db:migrate` processes started together on a fresh database both succeed', async () => {
  const url = await freshDatabase()
  const run = () =>
    new Promise<{ code: number | null; output: string }>((resolve) => {
      const child = spawn(path.join(projectRoot, 'node_modules', '.bin', 'tsx'), ['scripts/migrate.ts'], {
        cwd: projectRoot,
        env: { ...process.env, DATABASE_URL: url, SESSION_SECRET: 'migrate-test-secret-0123456789' },
        stdio: ['ignore', 'pipe', 'pipe'],
      })
      let output = ''
      child.stdout.on('data', (d) => (output += d))
      child.stderr.on('data', (d) => (output += d))
      child.on('exit', (code) => resolve({ code, output }))
    })
  const [a, b] = await Promise.all([run(), run()])
  expect([a.code, b.code], `${a.output}\n${b.output}`).toEqual([0, 0])
  expect(a.output + b.output).toMatch(/Migrations applied/)
  expect(await applied(url)).toEqual({ migrations: journal.entries.length, usersTable: 1 })
})
