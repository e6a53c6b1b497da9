// Bank problems on the steady-flow templates, end to end through the server functions: a turbojet
// and a nozzle saved, listed under their cycles, read back, previewed (key, worked solution, T–s
// diagram of the open path) and drawn per student. Demo data: invented flight conditions.
import { describe, expect, test } from 'vitest'
import type { Find, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { db } from '#app/server/db/client.server.ts'
import { previewProblem } from '#app/server/preview.server.ts'
import { BankQuerySchema, createProblem, getProblemDetail, listBankProblems } from '#app/server/problems.server.ts'
import { createBankUser } from '#tests/support/factories.ts'

const tag = `zf${Math.random().toString(36).slice(2, 8)}`

const find = (name: string, label: string, path: string, unit: string, extra: Partial<Find> = {}): Find => ({
  name,
  label,
  source: { kind: 'output', path },
  unit,
  points: 2,
  tolerance: { kind: 'relative', value: 0.01 },
  pitfalls: [],
  ...extra,
})

function turbojet(): ProblemDefinition {
  return {
    format: 2,
    title: `Turbojet ${tag}`,
    tags: { topics: ['jet propulsion', tag], difficulty: 'standard', level: 'second-year' },
    convention: 'course',
    prompt: 'A turbojet flies at [V1] where the air is at 30 kPa and −40 °C; its pressure ratio is [rp].',
    givens: [
      { name: 'V1', label: 'flight speed', unit: 'km/h', rule: { kind: 'choice', values: [850, 950] } },
      { name: 'rp', label: 'pressure ratio', unit: '', rule: { kind: 'choice', values: [8, 10] } },
    ],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'turbojet',
      inputs: {
        gas: 'air',
        flightSpeed: 'V1',
        ambientPressure: '30 kPa',
        ambientTemperature: '-40 °C',
        pressureRatio: 'rp',
        turbineInletT: '1250 K',
        massFlow: '40 kg/s',
      },
    },
    finds: [
      find('V6', 'Jet velocity', 'totals.exitVelocity', 'm/s'),
      find('F', 'Thrust', 'totals.thrust', 'kN'),
      find('wc', 'Compressor work input per kg of air', 'totals.compressorWork', 'kJ/kg', {
        sense: 'work-on-system',
        pitfalls: ['kilo-factor'],
      }),
    ],
  }
}

describe('bank problems on the steady-flow templates', () => {
  test('a turbojet is saved, listed under its cycle, read back and drawn with the same positive keys in both conventions', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId } = await createProblem(db(), viewer, { definition: turbojet(), visibility: 'private' })
    const list = await listBankProblems(db(), viewer, BankQuerySchema.parse({ q: tag, cycle: 'turbojet' }))
    expect(list.rows.map((r) => r.title)).toEqual([`Turbojet ${tag}`])
    const stored = (await getProblemDetail(db(), viewer, problemId))!.latest.definition
    expect(stored).toEqual(turbojet())
    if (!stored) throw new Error('the stored version does not read')
    const keys = (['engineering', 'chemistry'] as const).map((convention) => {
      const drawn = drawVariant(stored, 5, { convention })
      if (!drawn.ok) throw new Error(drawn.error.message)
      expect(drawn.variant.givens[0]!.text).toMatch(/km\/h$/)
      return drawn.variant.key.map((k) => k.value)
    })
    for (const k of keys[0]!) expect(k).toBeGreaterThan(0)
    expect(keys[1]).toEqual(keys[0])
  })

  test('the preview has the key, a worked solution to thrust without internal paths, and the open path on T–s', async () => {
    const preview = previewProblem(turbojet(), { convention: 'engineering' })
    expect(preview.issues).toEqual([])
    expect(preview.variants.length).toBeGreaterThan(0)
    for (const v of preview.variants) {
      if (!v.ok) throw new Error(v.error.message)
      expect(v.warnings).toEqual([])
      expect(v.workedHtml).toContain('Thrust and efficiencies')
      expect(v.workedHtml).not.toMatch(/totals\.|states\.\d/)
      expect(v.diagrams.ts.points).toHaveLength(6)
      // An open path: five curves join six states, none back to the first.
      expect(v.diagrams.ts.curves).toHaveLength(5)
      expect(v.diagrams.ts.curves.some((c) => c.to === '1')).toBe(false)
    }
  })
})
