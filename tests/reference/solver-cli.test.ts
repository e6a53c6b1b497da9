import { execFileSync, spawnSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { expect, test } from 'vitest'

const root = join(import.meta.dirname, '../..')
const tsx = join(root, 'node_modules/.bin/tsx')

test('npm run solve prints the solution JSON; a bad spec gives one stderr line, exit 1, no stack', () => {
  const out = execFileSync(tsx, ['scripts/solve.ts', 'docs/examples/otto.json'], { cwd: root, encoding: 'utf8' })
  const json = JSON.parse(out) as { ok: boolean; convention: { name: string } }
  expect(json.ok).toBe(true)
  expect(json.convention.name).toBe('engineering')
  const dir = mkdtempSync(join(tmpdir(), 'cw-'))
  const bad = join(dir, 'bad.json')
  writeFileSync(bad, JSON.stringify({ cycle: { gas: 'air', states: [{ p: '1 bar', T: '300 K' }, {}], steps: [{ process: 'isobaric' }, { process: 'isobaric' }] } }))
  const r = spawnSync(tsx, ['scripts/solve.ts', bad], { cwd: root, encoding: 'utf8' })
  expect(r.status).toBe(1)
  expect(r.stderr).toMatch(/^solve: State 2: /)
  expect(r.stderr).not.toMatch(/at .*\.ts:\d+/)
  expect(r.stdout).toBe('')
}, 30_000)
