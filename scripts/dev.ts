/** `npm run dev`: the app with hot reload (Vite middleware), on the private database. */
import './mode-development.ts'
import { db } from '#app/server/db/client.server.ts'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { demoAccountsText, seedDemo } from '#seed/demo.ts'
import { prepareLocalEnv } from './local-env.ts'
import { startServer } from './server.ts'

await prepareLocalEnv()
await migrateDatabase(process.env.DATABASE_URL!)
await seedDemo(db())
const server = await startServer({ port: Number(process.env.PORT ?? 3000), mode: 'development' })
console.log(demoAccountsText(server.url))
