// A bank problem on the vapour-compression refrigerator, end to end through the server functions:
// saved, listed under its cycle, read back, previewed (key, worked solution, p–h diagram) and drawn
// per student. Demo data: an invented R-134a refrigerator.
import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
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

const tag = `zq${Math.random().toString(36).slice(2, 8)}`

function refrigerator(overrides: Partial<ProblemDefinition> = {}): ProblemDefinition {
  return {
    format: 2,
    title: `R-134a refrigerator ${tag}`,
    tags: { topics: ['refrigeration', tag], difficulty: 'standard', level: 'second-year' },
    convention: 'course',
    prompt: 'R-134a leaves the evaporator as saturated vapour at [TL] and the condenser as saturated liquid at [TH].',
    givens: [
      { name: 'TL', label: 'evaporator temperature', unit: '°C', rule: { kind: 'range', min: -20, max: -5, step: 5 } },
      { name: 'TH', label: 'condenser temperature', unit: '°C', rule: { kind: 'range', min: 30, max: 45, step: 5 } },
    ],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'vapour-compression',
      inputs: { refrigerant: 'R134a', evaporatorTemperature: 'TL', condenserTemperature: 'TH', massFlow: '0.05 kg/s' },
    },
    finds: [
      {
        name: 'Win',
        label: 'Compressor work input per kg',
        source: { kind: 'output', path: 'devices.1.w' },
        unit: 'kJ/kg',
        points: 2,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: ['sign-convention-flipped'],
        sense: 'work-on-system',
      },
      {
        name: 'cop',
        label: 'Coefficient of performance',
        source: { kind: 'output', path: 'totals.copRefrigerator' },
        unit: '',
        points: 2,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: [],
      },
    ],
    ...overrides,
  }
}

describe('a bank problem on the vapour-compression template', () => {
  test('is saved, listed under its cycle and read back as it was', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId } = await createProblem(db(), viewer, { definition: refrigerator(), visibility: 'private' })
    const detail = await getProblemDetail(db(), viewer, problemId)
    expect(detail?.latest.definition).toEqual(refrigerator())
    const list = await listBankProblems(db(), viewer, BankQuerySchema.parse({ q: tag, cycle: 'vapour-compression' }))
    expect(list.rows.map((r) => r.title)).toEqual([`R-134a refrigerator ${tag}`])
  })

  test('the stored version draws a variant per student, with the compressor work positive in both conventions', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId } = await createProblem(db(), viewer, { definition: refrigerator(), visibility: 'private' })
    const stored = (await getProblemDetail(db(), viewer, problemId))!.latest.definition
    if (!stored) throw new Error('the stored refrigerator version does not read')
    for (const convention of ['engineering', 'chemistry'] as const) {
      const drawn = drawVariant(stored, 11, { convention })
      if (!drawn.ok) throw new Error(drawn.error.message)
      const [w, cop] = drawn.variant.key
      expect(w!.value).toBeGreaterThan(0)
      expect(cop!.value).toBeGreaterThan(1)
      expect(drawn.variant.givens.map((g) => g.text)[0]).toMatch(/°C$/)
    }
  })

  test('the preview has the key, a worked solution naming the refrigerant and a p–h diagram', async () => {
    const preview = previewProblem(refrigerator(), { convention: 'engineering' })
    expect(preview.issues).toEqual([])
    expect(preview.variants.length).toBeGreaterThan(0)
    for (const v of preview.variants) {
      if (!v.ok) throw new Error(v.error.message)
      expect(v.warnings).toEqual([])
      expect(v.workedHtml).toContain('R-134a')
      expect(v.workedHtml).not.toContain('devices.1.w')
      expect(v.diagrams.ph?.y.scale).toBe('log')
      expect(v.diagrams.ph?.dome?.fluid).toBe('R-134a')
      expect(v.diagrams.ts.points).toHaveLength(4)
    }
  })

  test('an id that names no template is refused when saved', async () => {
    const { viewer } = await createBankUser(db())
    const other = refrigerator({
      physics: { kind: 'template', template: 'no-such-cycle', inputs: {} },
    })
    await expect(createProblem(db(), viewer, { definition: other, visibility: 'private' })).rejects.toBeInstanceOf(
      InvalidDefinitionError,
    )
  })
})
