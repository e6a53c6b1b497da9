import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { expect, test } from 'vitest'
import { solveSpec, templates } from '#app/domain/thermo/index.ts'

const dir = join(import.meta.dirname, '../../docs/examples')
const files = readdirSync(dir).filter((f) => f.endsWith('.json'))

test.each(files)('docs/examples/%s solves', (f) => {
  const raw: unknown = JSON.parse(readFileSync(join(dir, f), 'utf8'))
  const r = solveSpec(raw)
  if (!r.ok) throw new Error(r.error.message)
  expect(JSON.stringify(r.convention)).toMatch(/ΔU|ΔH/)
  // every state quantity is { value, unit } with a finite SI value
  // (the combined cycle lists its gas states and, in its bottoming cycle, the steam states)
  const states = 'gasStates' in r ? [...r.gasStates, ...r.bottoming.states] : r.states
  for (const s of states as unknown as Record<string, unknown>[]) {
    for (const v of Object.values(s)) if (v && typeof v === 'object' && 'value' in v) expect(Number.isFinite((v as { value: number }).value)).toBe(true)
  }
})

test('every template has an example in docs/examples (and docs/spec-format.md names it)', () => {
  const doc = readFileSync(join(dir, '../spec-format.md'), 'utf8')
  for (const id of Object.keys(templates).filter((t) => !t.startsWith('rankine'))) {
    expect(files).toContain(`${id}.json`)
    expect(doc).toContain(`\`${id}\``)
  }
})
