/**
 * Runs before each integration test file: a fresh database copied from the run's
 * migrated template, and a local fake SMTP server of its own, both set in the
 * environment before any app module reads it. Dropped after the file.
 */
import { afterAll, inject } from 'vitest'
import { createDatabase, dropDatabase, uniqueName } from './test-db.ts'
import { freePort } from './free-port.ts'

const server = inject('dbServerUrl')
const name = uniqueName('cw_t')
process.env.DATABASE_URL = await createDatabase(server, name, inject('dbTemplate'))
process.env.SESSION_SECRET = 'integration-tests-secret-0123456789'
process.env.NODE_ENV = 'test'
process.env.APP_URL = 'http://127.0.0.1:9'
delete process.env.SMTP_URL
process.env.FAKE_SMTP_PORT = String(await freePort())

const { db, closeDb } = await import('#app/server/db/client.server.ts')
const { startFakeSmtp } = await import('#app/server/fake-smtp.server.ts')
const smtp = await startFakeSmtp(db(), Number(process.env.FAKE_SMTP_PORT), () => {})

afterAll(async () => {
  await smtp.close()
  await closeDb()
  await dropDatabase(server, name)
})
