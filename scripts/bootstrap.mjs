// Plain Node, no dependencies: runs before node_modules exists. Installs the locked
// dependencies (npm ci) when they are missing or older than package-lock.json.
import { spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import fs from 'node:fs'
import path from 'node:path'

const root = path.resolve(import.meta.dirname, '..')
const [major, minor] = process.versions.node.split('.').map(Number)
if (major < 20 || (major === 20 && minor < 19)) {
  console.error(`Cyclewright needs Node.js 20.19 or newer; this is ${process.version}.`)
  process.exit(1)
}

const lock = path.join(root, 'package-lock.json')
const stamp = path.join(root, 'node_modules', '.cyclewright-lock')
const want = createHash('sha256').update(fs.readFileSync(lock)).digest('hex')
const have = fs.existsSync(stamp) ? fs.readFileSync(stamp, 'utf8').trim() : ''
if (want !== have) {
  console.log('Installing dependencies (npm ci)…')
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' })
  if (r.status !== 0) {
    console.error('npm ci failed; see the messages above.')
    process.exit(r.status ?? 1)
  }
  fs.writeFileSync(stamp, want + '\n')
}
