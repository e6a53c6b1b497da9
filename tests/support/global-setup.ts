import PgBoss from 'pg-boss'
import type { TestProject } from 'vitest/node'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { bossOptions, ensureQueues } from '#app/server/queue.server.ts'
import { createDatabase, dropDatabase, serverUrl, uniqueName } from './test-db.ts'

declare module 'vitest' {
  export interface ProvidedContext {
    dbServerUrl: string
    dbTemplate: string
  }
}

/**
 * Integration tests: one template database for the run, migrated and with pg-boss's
 * schema and queues installed, dropped at the end.
 */
export default async function setup(project: TestProject) {
  const url = await serverUrl()
  const template = uniqueName('cw_template')
  const templateUrl = await createDatabase(url, template)
  await migrateDatabase(templateUrl)
  const boss = new PgBoss(bossOptions(templateUrl, { supervise: false, schedule: false }))
  await boss.start()
  await ensureQueues(boss)
  // Closes its connections: a database being copied from must have none.
  await boss.stop({ graceful: false })
  project.provide('dbServerUrl', url)
  project.provide('dbTemplate', template)
  return async () => {
    await dropDatabase(url, template)
  }
}
