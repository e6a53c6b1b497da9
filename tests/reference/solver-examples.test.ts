import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, test } from 'vitest'
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
    for (const v of Object.values(s))
      if (v && typeof v === 'object' && 'value' in v) expect(Number.isFinite((v as { value: number }).value)).toBe(true)
  }
})

test('every template has an example in docs/examples (and docs/spec-format.md names it)', () => {
  const doc = readFileSync(join(dir, '../spec-format.md'), 'utf8')
  for (const id of Object.keys(templates).filter((t) => !t.startsWith('rankine'))) {
    expect(files).toContain(`${id}.json`)
    expect(doc).toContain(`\`${id}\``)
  }
})

// The documented examples' numbers against closed forms (constant specific heats; the air
// preset is cp = 1.005, cv = 0.718 kJ/(kg K), Çengel & Boles Table A-2, from memory). These
// are the air-standard efficiency formulas of every thermodynamics text (common practice).
describe('the examples in the docs give the closed-form numbers', () => {
  const totals = (name: string) => {
    const r = solveSpec(JSON.parse(readFileSync(join(dir, `${name}.json`), 'utf8')))
    if (!r.ok || !('totals' in r)) throw new Error(`${name} did not solve`)
    return r.totals as unknown as Record<string, { value: number } | null>
  }
  const gAir = 1005 / 718

  test('Carnot engine between 600 K and 300 K: η = 1 − Tc/Th = 0.5', () => {
    expect(totals('carnot-engine').efficiency!.value).toBeCloseTo(0.5, 12)
  })
  test('Carnot refrigerator between 35 °C and −5 °C: COP = Tc/(Th − Tc)', () => {
    expect(totals('carnot-refrigerator').copRefrigerator!.value).toBeCloseTo(268.15 / 40, 10)
  })
  test('Otto, r = 8: η = 1 − r^(1−γ)', () => {
    expect(totals('otto').efficiency!.value).toBeCloseTo(1 - 8 ** (1 - gAir), 12)
  })
  test('Diesel, r = 18, rc = 2: η = 1 − (rc^γ − 1)/(γ (rc − 1) r^(γ−1))', () => {
    const eta = 1 - (2 ** gAir - 1) / (gAir * (2 - 1) * 18 ** (gAir - 1))
    expect(totals('diesel').efficiency!.value).toBeCloseTo(eta, 12)
  })
  test('Brayton, rp = 8, ηc = 0.8, ηt = 0.85, 300 K → 1300 K: the net work and heat from the temperatures', () => {
    const x = 8 ** ((gAir - 1) / gAir)
    const T2 = 300 + (300 * x - 300) / 0.8
    const T4 = 1300 - 0.85 * (1300 - 1300 / x)
    const t = totals('brayton')
    expect(t.heatIn!.value).toBeCloseTo(1005 * (1300 - T2), 6)
    expect(t.netWork!.value).toBeCloseTo(1005 * (1300 - T4 - (T2 - 300)), 6)
  })
})
