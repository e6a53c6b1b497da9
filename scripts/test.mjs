// `npm test`: the same set-up as `npm start`, then everything in order — format, lint, typecheck, unit
// tests, integration tests against real PostgreSQL, the production build, end-to-end
// tests in Debian's Chromium. Stops at the first failing step. The last line states the
// totals. Plain Node so it can run before the dependencies are installed.
import './bootstrap.mjs'
import { spawnSync } from 'node:child_process'
import fs from 'node:fs'
import path from 'node:path'

const root = path.resolve(import.meta.dirname, '..')
const bin = (name) => path.join(root, 'node_modules', '.bin', name)
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0
const started = Date.now()

function log(line) {
  console.log(line)
}

// --- System packages from Debian: Chromium for end-to-end tests, python3-iapws as the
// independent steam reference. PostgreSQL is fetched by scripts/postgres.ts the same way.
function systemNeeds() {
  const needs = []
  if (!fs.existsSync(process.env.CHROMIUM_PATH ?? '/usr/bin/chromium')) needs.push('chromium')
  const py = spawnSync('/usr/bin/python3', ['-c', 'import iapws'], { stdio: 'ignore' })
  if (py.status !== 0) needs.push('python3-iapws')
  return needs
}
const needs = systemNeeds()
if (needs.length > 0) {
  if (!isRoot) {
    console.error(
      `Missing Debian packages: ${needs.join(' ')}. Install them with:\n  sudo apt-get update && sudo apt-get install -y ${needs.join(' ')}`,
    )
    process.exit(1)
  }
  log(`Installing Debian packages: ${needs.join(' ')} …`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  for (const args of [
    ['update', '-qq'],
    ['install', '-y', '-qq', ...needs],
  ]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env })
    if (r.status !== 0) {
      console.error(`apt-get ${args.join(' ')} failed.`)
      process.exit(1)
    }
  }
}

const resultsDir = path.join(root, '.data', 'test-results')
fs.mkdirSync(resultsDir, { recursive: true })
const totals = { passed: 0, failed: 0, skipped: 0 }
const summary = []

function vitestStep(name, project) {
  const out = path.join(resultsDir, `${project}.json`)
  fs.rmSync(out, { force: true })
  const r = spawnSync(
    bin('vitest'),
    ['run', '--project', project, '--reporter=default', '--reporter=json', `--outputFile.json=${out}`],
    {
      cwd: root,
      stdio: 'inherit',
      env: { ...process.env, FORCE_COLOR: process.env.FORCE_COLOR ?? '0' },
    },
  )
  let counts = { passed: 0, failed: 0, skipped: 0 }
  if (fs.existsSync(out)) {
    const j = JSON.parse(fs.readFileSync(out, 'utf8'))
    counts = {
      passed: j.numPassedTests ?? 0,
      failed: (j.numFailedTests ?? 0) + (j.numRuntimeErrorTestSuites ?? 0),
      skipped: (j.numPendingTests ?? 0) + (j.numTodoTests ?? 0),
    }
    // A file that failed to load counts as a failure even when no test in it ran.
    for (const f of j.testResults ?? [])
      if (f.status === 'failed' && (f.assertionResults ?? []).length === 0) counts.failed += 1
  }
  const ok = r.status === 0 && counts.failed === 0
  if (!ok && counts.failed === 0) counts.failed = 1
  totals.passed += counts.passed
  totals.failed += counts.failed
  totals.skipped += counts.skipped
  summary.push(
    `${name}: ${counts.passed} passed, ${counts.failed} failed${counts.skipped ? `, ${counts.skipped} skipped` : ''}`,
  )
  return ok
}

function commandStep(name, cmd, args) {
  log(`\n▸ ${name}`)
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit', env: process.env })
  summary.push(`${name}: ${r.status === 0 ? 'ok' : 'FAILED'}`)
  if (r.status !== 0) totals.failed += 1
  return r.status === 0
}

const steps = [
  () => commandStep('format (Prettier)', bin('prettier'), ['--check', '--log-level', 'warn', '.']),
  () => commandStep('lint', bin('eslint'), ['.']),
  () => commandStep('typecheck', 'sh', ['-c', `"${bin('react-router')}" typegen && "${bin('tsc')}"`]),
  () => (log('\n▸ unit tests'), vitestStep('unit tests', 'unit')),
  () => (log('\n▸ integration tests (PostgreSQL)'), vitestStep('integration tests', 'integration')),
  () => commandStep('production build', bin('react-router'), ['build']),
  () => (log('\n▸ end-to-end tests (Chromium)'), vitestStep('end-to-end tests', 'e2e')),
]

let allOk = true
for (const step of steps) {
  if (!step()) {
    allOk = false
    break
  }
}

log('\n── Summary ──')
for (const line of summary) log(`  ${line}`)
if (!allOk) log('  (stopped at the first failing step)')
log(`  time: ${Math.round((Date.now() - started) / 1000)} s`)
log(`Totals: ${totals.passed} passed, ${totals.failed} failed, ${totals.skipped} skipped`)
process.exit(allOk ? 0 : 1)
