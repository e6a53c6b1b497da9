/**
 * The production build for tests that boot the real HTTP server: built when missing or
 * older than any source file it is made from, so a test never runs yesterday's pages.
 */
import { spawnSync } from 'node:child_process'
import fs from 'node:fs'
import path from 'node:path'
import { projectRoot } from '#scripts/postgres.ts'

function newest(target: string): number {
  const stat = fs.statSync(target)
  if (!stat.isDirectory()) return stat.mtimeMs
  let max = stat.mtimeMs
  for (const entry of fs.readdirSync(target)) {
    if (entry === 'node_modules' || entry.startsWith('.')) continue
    max = Math.max(max, newest(path.join(target, entry)))
  }
  return max
}

export function ensureFreshBuild() {
  const output = path.join(projectRoot, 'build', 'server', 'index.js')
  const builtAt = fs.existsSync(output) ? fs.statSync(output).mtimeMs : 0
  const sources = ['app', 'public', 'react-router.config.ts', 'vite.config.ts', 'package-lock.json']
    .map((p) => path.join(projectRoot, p))
    .filter((p) => fs.existsSync(p))
  if (Math.max(...sources.map(newest)) <= builtAt) return
  // Under vitest the Vite config leaves React Router's plugin out (VITEST is set): unset it.
  const childEnv: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: 'production' }
  for (const key of Object.keys(childEnv)) if (key.startsWith('VITEST')) delete childEnv[key]
  const r = spawnSync(path.join(projectRoot, 'node_modules', '.bin', 'react-router'), ['build'], {
    cwd: projectRoot,
    env: childEnv,
    encoding: 'utf8',
  })
  if (r.status !== 0) throw new Error(`react-router build failed:\n${r.stdout}${r.stderr}`)
}
