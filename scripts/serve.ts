/**
 * `npm run serve`: only the web server over an existing build and a migrated database
 * (what each stateless web process runs in a deployment). Migrations are applied first;
 * they are idempotent, so several processes starting together is safe.
 */
import './mode-production.ts'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { env } from '#app/server/env.server.ts'
import { prepareLocalEnv } from './local-env.ts'
import { startServer } from './server.ts'

if (!process.env.DATABASE_URL) await prepareLocalEnv()
else if (!process.env.SESSION_SECRET) {
  console.error('SESSION_SECRET must be set when DATABASE_URL points at a shared server (see .env.example).')
  process.exit(1)
}
try {
  env()
} catch (e) {
  console.error(e instanceof Error ? e.message : e)
  process.exit(1)
}
await migrateDatabase(process.env.DATABASE_URL!)
const server = await startServer({ port: Number(process.env.PORT ?? 3000), mode: 'production' })
console.log(`Cyclewright web server listening on ${server.url}`)
const stop = async () => {
  await server.close()
  process.exit(0)
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
