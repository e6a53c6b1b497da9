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
  writeFileSync(
    bad,
    JSON.stringify({
      cycle: {
        gas: 'air',
        states: [{ p: '1 bar', T: '300 K' }, {}],
        steps: [{ process: 'isobaric' }, { process: 'isobaric' }],
      },
    }),
  )
  const r = spawnSync(tsx, ['scripts/solve.ts', bad], { cwd: root, encoding: 'utf8' })
  expect(r.status).toBe(1)
  expect(r.stderr).toMatch(/^solve: State 2: /)
  expect(r.stderr).not.toMatch(/at .*\.ts:\d+/)
  expect(r.stdout).toBe('')
}, 30_000)

test.each([
  ['a file that is not JSON', 'not json\n{', 'invalid-json'],
  ['an empty file', '', 'empty-file'],
  ['an unknown template', '{"template":"nope"}', 'invalid-spec'],
])(
  'npm run solve on %s prints one line with a code and no absolute path',
  (_what, text, code) => {
    const dir = mkdtempSync(join(tmpdir(), 'cw-'))
    const file = join(dir, 'spec.json')
    writeFileSync(file, text)
    const r = spawnSync(tsx, ['scripts/solve.ts', file], { cwd: root, encoding: 'utf8' })
    expect(r.status).toBe(1)
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1)
    expect(r.stderr).toMatch(new RegExp(`\\[${code}\\]\\n$`))
    expect(r.stderr).not.toContain(dir)
    expect(r.stdout).toBe('')
  },
  30_000,
)

test('the unknown-template message lists every template of the catalog, steam and combined ones included', () => {
  const dir = mkdtempSync(join(tmpdir(), 'cw-'))
  const file = join(dir, 'spec.json')
  writeFileSync(file, '{"template":"nope"}')
  const r = spawnSync(tsx, ['scripts/solve.ts', file], { cwd: root, encoding: 'utf8' })
  for (const id of ['otto', 'atkinson', 'rankine-reheat', 'rankine-feedwater', 'steam-carnot', 'combined-cycle'])
    expect(r.stderr).toContain(id)
}, 30_000)
