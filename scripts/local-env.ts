/**
 * Fills the environment for the private demo set-up: the database URL of the private
 * cluster (unless DATABASE_URL is set) and a session secret kept under .data/ (unless
 * SESSION_SECRET is set). Used by npm start, npm run dev and the tests.
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

export async function prepareLocalEnv(log: (line: string) => void = console.log) {
  process.env.DATABASE_URL = await resolveDatabaseUrl(log)
  ensureSessionSecret()
}
