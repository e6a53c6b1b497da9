/**
 * What `npm start` does after the dependencies are in: PostgreSQL (the private cluster
 * unless DATABASE_URL is set), migrations, the demo seed, the production build, then the
 * web server on 127.0.0.1:3000 (PORT overrides) with one job worker in the same process,
 * and the demo accounts printed last. More workers: `npm run worker`, anywhere.
 */
import './mode-production.ts'
import { spawnSync } from 'node:child_process'
import { db } from '#app/server/db/client.server.ts'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { startWorker } from '#jobs/worker.ts'
import { demoAccountsText, seedDemo } from '#seed/demo.ts'
import { prepareLocalEnv } from './local-env.ts'
import { ClusterError, projectRoot } from './postgres.ts'
import { startServer } from './server.ts'

const step = (s: string) => console.log(`\n▸ ${s}`)

try {
  step('PostgreSQL')
  await prepareLocalEnv()
  step('Migrations')
  await migrateDatabase(process.env.DATABASE_URL!)
  step('Demo data')
  const seeded = await seedDemo(db())
  console.log(`  ${seeded.courseIds.length} courses, ${seeded.students} students.`)
  if (!process.argv.includes('--no-build')) {
    step('Building the app')
    const r = spawnSync('npx', ['react-router', 'build'], {
      cwd: projectRoot,
      stdio: 'inherit',
      env: { ...process.env, NODE_ENV: 'production' },
    })
    if (r.status !== 0) throw new Error('The build failed; see the messages above.')
  }
  step('Web server')
  const port = Number(process.env.PORT ?? 3000)
  const server = await startServer({ port, mode: 'production' })
  step('Job worker')
  const worker = await startWorker()
  console.log(demoAccountsText(server.url))
  const stop = async () => {
    await server.close()
    await worker.stop()
    process.exit(0)
  }
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
} catch (e) {
  if (e instanceof ClusterError) console.error(`\n${e.message}`)
  else if ((e as NodeJS.ErrnoException).code === 'EADDRINUSE')
    console.error(`\nPort ${process.env.PORT ?? 3000} is taken. Set PORT to another port.`)
  else console.error('\nCould not start Cyclewright:', e instanceof Error ? e.message : e)
  process.exit(1)
}
