import type { TestProject } from 'vitest/node'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { createDatabase, dropDatabase, serverUrl, uniqueName } from './test-db.ts'

declare module 'vitest' {
  export interface ProvidedContext {
    dbServerUrl: string
    dbTemplate: string
  }
}

/** Integration tests: one migrated template database for the run, dropped at the end. */
export default async function setup(project: TestProject) {
  const url = await serverUrl()
  const template = uniqueName('cw_template')
  await migrateDatabase(await createDatabase(url, template))
  project.provide('dbServerUrl', url)
  project.provide('dbTemplate', template)
  return async () => {
    await dropDatabase(url, template)
  }
}
