/**
 * `npm run dev`: the app with hot reload (Vite middleware), on the private database, and a
 * job worker in the same process (restart to pick up changes under jobs/).
 */
import './mode-development.ts'
import { db } from '#app/server/db/client.server.ts'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { startWorker } from '#jobs/worker.ts'
import { demoAccountsText, seedDemo } from '#seed/demo.ts'
import { prepareLocalEnv } from './local-env.ts'
import { startServer } from './server.ts'

await prepareLocalEnv()
await migrateDatabase(process.env.DATABASE_URL!)
await seedDemo(db())
const server = await startServer({ port: Number(process.env.PORT ?? 3000), mode: 'development' })
const worker = await startWorker()
console.log(demoAccountsText(server.url))
// The server is not closed first: the browser's open hot-reload connections would hold it.
const stop = async () => {
  await worker.stop()
  process.exit(0)
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
