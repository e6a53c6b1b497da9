/**
 * Fills the environment for the private demo set-up: the database URL of the private
 * cluster (unless DATABASE_URL is set), a session secret kept under .data/ (unless
 * SESSION_SECRET is set) and APP_URL, the base of e-mailed links, as the local server's
 * own address (unless APP_URL is set). Used by npm start, npm run dev and the tests.
 */
import { randomBytes } from 'node:crypto'
import fs from 'node:fs'
import path from 'node:path'
import { projectRoot, resolveDatabaseUrl } from './postgres.ts'

export function ensureSessionSecret() {
  if (process.env.SESSION_SECRET) return
  const dir = path.join(projectRoot, '.data')
  fs.mkdirSync(dir, { recursive: true })
  const file = path.join(dir, 'session-secret')
  if (!fs.existsSync(file)) fs.writeFileSync(file, randomBytes(32).toString('base64url') + '\n', { mode: 0o600 })
  process.env.SESSION_SECRET = fs.readFileSync(file, 'utf8').trim()
}

/** The local server listens on 127.0.0.1:PORT, so that is where its e-mailed links point. */
export function ensureAppUrl() {
  if (process.env.APP_URL) return
  process.env.APP_URL = `http://127.0.0.1:${process.env.PORT || 3000}`
}

export async function prepareLocalEnv(log: (line: string) => void = console.log) {
  const privateCluster = !process.env.DATABASE_URL
  process.env.DATABASE_URL = await resolveDatabaseUrl(log)
  ensureSessionSecret()
  // A production process on a real database must be told its public address (env.server.ts
  // refuses to start without it); the demo and development use the local server's.
  if (privateCluster || process.env.NODE_ENV !== 'production') ensureAppUrl()
}
