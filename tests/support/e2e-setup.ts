/**
 * End-to-end set-up: the production build served by our own server script on a random
 * loopback port, against a fresh database that is migrated and seeded with the demo,
 * with its own local mail catcher, and one job worker (`jobs/worker.ts`, as `npm run
 * worker` runs it) on the same database. Torn down (server and worker stopped, database
 * dropped) after.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import fs from 'node:fs'
import path from 'node:path'
import type { TestProject } from 'vitest/node'
import { migrateDatabase } from '#app/server/db/migrate.server.ts'
import { projectRoot } from '#scripts/postgres.ts'
import { freePort } from './free-port.ts'
import { createDatabase, dropDatabase, serverUrl, uniqueName } from './test-db.ts'

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string
    e2eDatabaseUrl: string
  }
}

async function waitFor(url: string, child: ChildProcess, output: () => string, ms = 60_000) {
  const until = Date.now() + ms
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`The app exited during start-up:\n${output()}`)
    try {
      const r = await fetch(url)
      if (r.ok) return
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250))
  }
  throw new Error(`The app did not answer ${url} within ${ms / 1000} s:\n${output()}`)
}

async function waitForLine(line: RegExp, child: ChildProcess, output: () => string, ms = 60_000) {
  const until = Date.now() + ms
  while (!line.test(output())) {
    if (child.exitCode !== null) throw new Error(`The job worker exited during start-up:\n${output()}`)
    if (Date.now() > until) throw new Error(`The job worker did not start within ${ms / 1000} s:\n${output()}`)
    await new Promise((r) => setTimeout(r, 100))
  }
}

/** Waits for a child to exit after SIGTERM (a worker finishes its current job), then kills it. */
async function exited(child: ChildProcess, ms: number) {
  if (child.exitCode === null && child.signalCode === null) {
    await Promise.race([new Promise((r) => child.once('exit', r)), new Promise((r) => setTimeout(r, ms))])
  }
  if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL')
}

export default async function setup(project: TestProject) {
  if (!fs.existsSync(path.join(projectRoot, 'build', 'server', 'index.js'))) {
    const r = spawnSync('npx', ['react-router', 'build'], {
      cwd: projectRoot,
      stdio: 'inherit',
      env: { ...process.env, NODE_ENV: 'production' },
    })
    if (r.status !== 0) throw new Error('react-router build failed')
  }
  const server = await serverUrl()
  const name = uniqueName('cw_e2e')
  const url = await createDatabase(server, name)
  await migrateDatabase(url)
  const seeded = spawnSync(path.join(projectRoot, 'node_modules', '.bin', 'tsx'), ['seed/index.ts'], {
    cwd: projectRoot,
    env: { ...process.env, DATABASE_URL: url, SESSION_SECRET: 'e2e-secret-0123456789abcdef' },
    encoding: 'utf8',
  })
  if (seeded.status !== 0) throw new Error(`Seeding failed:\n${seeded.stdout}${seeded.stderr}`)

  const port = await freePort()
  let output = ''
  const childEnv = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: url,
    SESSION_SECRET: 'e2e-secret-0123456789abcdef',
    PORT: String(port),
    FAKE_SMTP_PORT: String(await freePort()),
    SMTP_URL: '',
    APP_URL: `http://127.0.0.1:${port}`,
  }
  const child = spawn(path.join(projectRoot, 'node_modules', '.bin', 'tsx'), ['scripts/serve.ts'], {
    cwd: projectRoot,
    env: childEnv,
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  child.stdout!.on('data', (d) => (output += d))
  child.stderr!.on('data', (d) => (output += d))
  const baseURL = `http://127.0.0.1:${port}`
  await waitFor(`${baseURL}/healthz`, child, () => output)

  let workerOutput = ''
  const worker = spawn(path.join(projectRoot, 'node_modules', '.bin', 'tsx'), ['jobs/worker.ts'], {
    cwd: projectRoot,
    env: childEnv,
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  worker.stdout!.on('data', (d) => (workerOutput += d))
  worker.stderr!.on('data', (d) => (workerOutput += d))
  await waitForLine(/Job worker started/, worker, () => workerOutput)

  project.provide('baseURL', baseURL)
  project.provide('e2eDatabaseUrl', url)
  return async () => {
    for (const c of [worker, child]) c.kill('SIGTERM')
    // vitest gives a global teardown 10 s; a test worker has nothing worth a longer graceful stop.
    await Promise.all([exited(worker, 4_000), exited(child, 500)])
    if (/Error|error/.test(output + workerOutput) && process.env.E2E_SHOW_SERVER_LOG === '1')
      console.log(output, workerOutput)
    await dropDatabase(server, name)
  }
}
