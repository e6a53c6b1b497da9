// Bank problems on the vapour Carnot cycle, the throttling calorimeter and the combined cycle, end to end through the
// server functions: saved, listed under their cycles, read back, previewed (key, worked solution,
// T–s diagram with the dome) and drawn per student. Demo data: invented temperatures and pressures.
import { describe, expect, test } from 'vitest'
import type { Find, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { db } from '#app/server/db/client.server.ts'
import { previewProblem } from '#app/server/preview.server.ts'
import {
  BankQuerySchema,
  createProblem,
  getProblemDetail,
  InvalidDefinitionError,
  listBankProblems,
} from '#app/server/problems.server.ts'
import { createBankUser } from '#tests/support/factories.ts'

const tag = `zs${Math.random().toString(36).slice(2, 8)}`

function steamCarnot(overrides: Partial<ProblemDefinition> = {}): ProblemDefinition {
  return {
    format: 2,
    title: `Vapour Carnot ${tag}`,
    tags: { topics: ['steam', tag], difficulty: 'standard', level: 'second-year' },
    convention: 'course',
    prompt: 'Water runs on a Carnot cycle inside the dome between [TH] and [TL].',
    givens: [
      { name: 'TH', label: 'boiler temperature', unit: '°C', rule: { kind: 'range', min: 200, max: 280, step: 20 } },
      { name: 'TL', label: 'condenser temperature', unit: '°C', rule: { kind: 'choice', values: [35, 45] } },
    ],
    constraints: [],
    physics: { kind: 'template', template: 'steam-carnot', inputs: { hotTemperature: 'TH', coldTemperature: 'TL' } },
    finds: [
      {
        name: 'wNet',
        label: 'Net work delivered by the water per kg',
        source: { kind: 'output', path: 'totals.netWork' },
        unit: 'kJ/kg',
        points: 2,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: ['sign-convention-flipped'],
        sense: 'work-by-system',
      },
      {
        name: 'eta',
        label: 'Thermal efficiency',
        source: { kind: 'output', path: 'totals.efficiency' },
        unit: '',
        points: 1,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: [],
      },
    ],
    ...overrides,
  }
}

function calorimeter(): ProblemDefinition {
  return steamCarnot({
    title: `Throttling calorimeter ${tag}`,
    prompt: 'Steam from a line at [p1] is throttled to 100 kPa and reads [T2].',
    givens: [
      { name: 'p1', label: 'line pressure', unit: 'MPa', rule: { kind: 'choice', values: [1.5, 2] } },
      {
        name: 'T2',
        label: 'calorimeter temperature',
        unit: '°C',
        rule: { kind: 'range', min: 115, max: 125, step: 5 },
      },
    ],
    physics: {
      kind: 'template',
      template: 'steam-throttling-calorimeter',
      inputs: { linePressure: 'p1', calorimeterPressure: '100 kPa', calorimeterTemperature: 'T2' },
    },
    finds: [
      {
        name: 'x1',
        label: 'Quality of the line steam',
        source: { kind: 'output', path: 'totals.quality' },
        unit: '',
        points: 2,
        tolerance: { kind: 'absolute', value: 0.003 },
        pitfalls: [],
      },
    ],
  })
}

describe('bank problems on water: the vapour Carnot cycle and the throttling calorimeter', () => {
  test('are saved, listed under their cycles and read back as they were', async () => {
    const { viewer } = await createBankUser(db())
    for (const [def, cycle] of [
      [steamCarnot(), 'steam-carnot'],
      [calorimeter(), 'steam-throttling-calorimeter'],
    ] as const) {
      const { problemId } = await createProblem(db(), viewer, { definition: def, visibility: 'private' })
      const detail = await getProblemDetail(db(), viewer, problemId)
      expect(detail?.latest.definition).toEqual(def)
      const list = await listBankProblems(db(), viewer, BankQuerySchema.parse({ q: tag, cycle }))
      expect(list.rows.map((r) => r.title)).toEqual([def.title])
    }
  })

  test('the stored Carnot version draws a variant per student, with the work delivered positive in both conventions', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId } = await createProblem(db(), viewer, { definition: steamCarnot(), visibility: 'private' })
    const stored = (await getProblemDetail(db(), viewer, problemId))!.latest.definition
    if (!stored) throw new Error('the stored version does not read')
    for (const convention of ['engineering', 'chemistry'] as const) {
      const drawn = drawVariant(stored, 7, { convention })
      if (!drawn.ok) throw new Error(drawn.error.message)
      const [w, eta] = drawn.variant.key
      expect(w!.value).toBeGreaterThan(0)
      expect(eta!.value).toBeGreaterThan(0.2)
      expect(eta!.value).toBeLessThan(0.5)
    }
  })

  test('the previews have the key, a worked solution without internal paths, and a T–s diagram with the dome', async () => {
    for (const [def, curves] of [
      [steamCarnot(), 4],
      [calorimeter(), 1],
    ] as const) {
      const preview = previewProblem(def, { convention: 'chemistry' })
      expect(preview.issues).toEqual([])
      expect(preview.variants.length).toBeGreaterThan(0)
      for (const v of preview.variants) {
        if (!v.ok) throw new Error(v.error.message)
        expect(v.warnings).toEqual([])
        expect(v.workedHtml).toContain('IAPWS-IF97')
        expect(v.workedHtml).not.toMatch(/totals\.|states\.\d/)
        expect(v.diagrams.ts.dome?.fluid).toBe('water')
        expect(v.diagrams.ts.curves).toHaveLength(curves)
      }
    }
  })

  test('a combined-cycle problem is saved, listed, previewed with the gas turbine and the steam cycle drawn, and drawn per student', async () => {
    const { viewer } = await createBankUser(db())
    const [work, eta] = steamCarnot().finds as [Find, Find]
    const combined = steamCarnot({
      title: `Combined plant ${tag}`,
      prompt: 'A gas turbine with pressure ratio [rp] raises steam in a heat-recovery steam generator.',
      givens: [{ name: 'rp', label: 'pressure ratio', unit: '', rule: { kind: 'choice', values: [8, 10] } }],
      physics: {
        kind: 'template',
        template: 'combined-cycle',
        inputs: {
          p1: '100 kPa',
          T1: '300 K',
          pressureRatio: 'rp',
          turbineInletT: '1300 K',
          compressorEfficiency: '0.8',
          gasTurbineEfficiency: '0.85',
          boilerPressure: '7 MPa',
          condenserPressure: '5 kPa',
          steamTemperature: '500 °C',
          stackTemperature: '450 K',
        },
      },
      // The plant's net work is a size (work delivered), so a sign slip cannot be recognised on it.
      finds: [{ ...work, pitfalls: [] }, eta],
    })
    const { problemId } = await createProblem(db(), viewer, { definition: combined, visibility: 'private' })
    const list = await listBankProblems(db(), viewer, BankQuerySchema.parse({ q: tag, cycle: 'combined-cycle' }))
    expect(list.rows.map((r) => r.title)).toEqual([combined.title])
    const stored = (await getProblemDetail(db(), viewer, problemId))!.latest.definition
    if (!stored) throw new Error('the stored version does not read')
    for (const convention of ['engineering', 'chemistry'] as const) {
      const drawn = drawVariant(stored, 3, { convention })
      if (!drawn.ok) throw new Error(drawn.error.message)
      expect(drawn.variant.key[0]!.value).toBeGreaterThan(0) // work delivered, in both conventions
    }
    const preview = previewProblem(combined, { convention: 'engineering' })
    expect(preview.issues).toEqual([])
    for (const v of preview.variants) {
      if (!v.ok) throw new Error(v.error.message)
      expect(v.workedHtml).toContain('Heat-recovery steam generator')
      expect(v.diagrams.ts.points).toHaveLength(5)
      expect(v.diagrams.second?.ts.dome?.fluid).toBe('water')
    }
  })

  test('an unknown template is refused when saved, with the reason by field', async () => {
    const { viewer } = await createBankUser(db())
    const other = steamCarnot({ physics: { kind: 'template', template: 'no-such-cycle', inputs: {} } })
    await expect(createProblem(db(), viewer, { definition: other, visibility: 'private' })).rejects.toBeInstanceOf(
      InvalidDefinitionError,
    )
  })
})
