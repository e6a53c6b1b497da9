/** `npm run db:seed`: fills the demo department (idempotent). */
import { closeDb, db } from '#app/server/db/client.server.ts'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { prepareLocalEnv } from '#scripts/local-env.ts'
import { seedDemo } from './demo.ts'

await prepareLocalEnv()
await migrateDatabase(process.env.DATABASE_URL!)
const r = await seedDemo(db())
console.log(`Demo seeded: ${r.courseIds.length} courses, ${r.students} students, ${r.problems} bank problems.`)
await closeDb()
