/** `npm run db:migrate`: applies drizzle/ migrations to DATABASE_URL or the private cluster. */
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { prepareLocalEnv } from './local-env.ts'

await prepareLocalEnv()
await migrateDatabase(process.env.DATABASE_URL!)
console.log('Migrations applied.')
