// Bank problems on the two-stage (flash chamber) and cascade refrigerators, end to end through
// the server functions: saved, listed under their cycles, read back, previewed (key, worked
// solution, p–h diagrams with each refrigerant's dome) and drawn per student. Demo data: an
// invented R-134a cold store and an invented freezer.
import { describe, expect, test } from 'vitest'
import type { Find, ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { db } from '#app/server/db/client.server.ts'
import { editorOptions } from '#app/server/problem-editor.server.ts'
import { previewProblem } from '#app/server/preview.server.ts'
import { BankQuerySchema, createProblem, getProblemDetail, listBankProblems } from '#app/server/problems.server.ts'
import { createBankUser } from '#tests/support/factories.ts'

const tag = `zm${Math.random().toString(36).slice(2, 8)}`

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

function twoStage(overrides: Partial<ProblemDefinition> = {}): ProblemDefinition {
  return {
    format: 2,
    title: `Two-stage R-134a cold store ${tag}`,
    tags: { topics: ['refrigeration', 'two-stage compression', tag], difficulty: 'challenging', level: 'upper-level' },
    convention: 'course',
    prompt:
      'R-134a leaves the evaporator as saturated vapour at [TL] and the condenser as saturated liquid at [TH]; the flash chamber is at [pI].',
    givens: [
      { name: 'TL', label: 'evaporator temperature', unit: '°C', rule: { kind: 'range', min: -30, max: -20, step: 5 } },
      { name: 'TH', label: 'condenser temperature', unit: '°C', rule: { kind: 'range', min: 30, max: 40, step: 5 } },
      { name: 'pI', label: 'flash chamber pressure', unit: 'MPa', rule: { kind: 'choice', values: [0.3, 0.32] } },
    ],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'vapour-compression-two-stage',
      inputs: {
        refrigerant: 'R134a',
        evaporatorTemperature: 'TL',
        condenserTemperature: 'TH',
        intermediatePressure: 'pI',
        compressorEfficiency: '0.85',
        capacity: '10 kW',
      },
    },
    finds: [
      find('x6', 'Fraction that flashes to vapour', 'totals.flashVapourFraction', ''),
      find('Whigh', 'High-stage compressor work input per kg', 'devices.4.w', 'kJ/kg', {
        sense: 'work-on-system',
        pitfalls: ['sign-convention-flipped'],
      }),
      find('cop', 'Coefficient of performance', 'totals.copRefrigerator', ''),
      find('mLow', 'Mass flow rate through the evaporator', 'totals.lowStageMassFlow', 'kg/s'),
    ],
    ...overrides,
  }
}

const cascade: ProblemDefinition = {
  ...twoStage(),
  title: `R-744/R-717 cascade ${tag}`,
  prompt: 'A cascade freezer evaporates R-744 at [TL].',
  givens: [
    { name: 'TL', label: 'evaporator temperature', unit: '°C', rule: { kind: 'range', min: -50, max: -40, step: 5 } },
  ],
  physics: {
    kind: 'template',
    template: 'vapour-compression-cascade',
    inputs: {
      lowerRefrigerant: 'R744',
      upperRefrigerant: 'R717',
      evaporatorTemperature: 'TL',
      lowerCondenserTemperature: '-5 °C',
      upperEvaporatorTemperature: '-10 °C',
      condenserTemperature: '35 °C',
      capacity: '20 kW',
    },
  },
  finds: [
    find('ratio', 'Mass flow of R-717 per unit mass flow of R-744', 'totals.massFlowRatio', ''),
    find('W', 'Total compressor power input', 'totals.compressorPower', 'kW', { sense: 'work-on-system' }),
  ],
}

describe('bank problems on the two-stage and cascade templates', () => {
  test('the editor offers both under Refrigeration', () => {
    const group = editorOptions().templateGroups.find((g) => g.label === 'Refrigeration')
    expect(group?.templates.map((t) => t.id)).toEqual([
      'vapour-compression',
      'vapour-compression-two-stage',
      'vapour-compression-cascade',
    ])
  })

  test('are saved, listed under their cycles and read back as they were', async () => {
    const { viewer } = await createBankUser(db())
    for (const [def, cycle] of [
      [twoStage(), 'vapour-compression-two-stage'],
      [cascade, 'vapour-compression-cascade'],
    ] as const) {
      const { problemId } = await createProblem(db(), viewer, { definition: def, visibility: 'private' })
      const detail = await getProblemDetail(db(), viewer, problemId)
      expect(detail?.latest.definition).toEqual(def)
      const list = await listBankProblems(db(), viewer, BankQuerySchema.parse({ q: tag, cycle }))
      expect(list.rows.map((r) => r.title)).toEqual([def.title])
    }
  })

  test('the stored two-stage version draws a variant per student, the compressor work positive in both conventions', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId } = await createProblem(db(), viewer, { definition: twoStage(), visibility: 'private' })
    const stored = (await getProblemDetail(db(), viewer, problemId))!.latest.definition
    if (!stored) throw new Error('the stored two-stage version does not read')
    const keys: number[][] = []
    for (const convention of ['engineering', 'chemistry'] as const) {
      const drawn = drawVariant(stored, 7, { convention })
      if (!drawn.ok) throw new Error(drawn.error.message)
      const [x6, w, cop, mLow] = drawn.variant.key.map((k) => k.value)
      expect(x6).toBeGreaterThan(0)
      expect(x6).toBeLessThan(1)
      expect(w).toBeGreaterThan(0)
      expect(cop).toBeGreaterThan(1)
      expect(mLow).toBeGreaterThan(0)
      keys.push([x6!, w!, cop!, mLow!])
    }
    expect(keys[1]).toEqual(keys[0])
  })

  test('the previews have the key, worked solutions and p–h diagrams on each refrigerant’s dome', () => {
    const two = previewProblem(twoStage(), { convention: 'engineering' })
    expect(two.issues).toEqual([])
    expect(two.variants.length).toBeGreaterThan(0)
    for (const v of two.variants) {
      if (!v.ok) throw new Error(v.error.message)
      expect(v.warnings).toEqual([])
      expect(v.workedHtml).toContain('flash chamber')
      expect(v.workedHtml).not.toContain('math-error')
      expect(v.workedHtml).not.toContain('devices.4.w')
      expect(v.diagrams.ph?.y.scale).toBe('log')
      expect(v.diagrams.ph?.dome?.fluid).toBe('R-134a')
      expect(v.diagrams.ts.points).toHaveLength(9)
    }
    const cas = previewProblem(cascade, { convention: 'chemistry' })
    expect(cas.issues).toEqual([])
    for (const v of cas.variants) {
      if (!v.ok) throw new Error(v.error.message)
      expect(v.workedHtml).toContain('Cascade heat exchanger')
      expect(v.diagrams.ph?.dome?.fluid).toBe('R-744')
      expect(v.diagrams.second?.ph?.dome?.fluid).toBe('R-717')
    }
  })

  test('a two-stage draft whose flash chamber is outside its pressures is answered in the preview, by field', () => {
    const bad = twoStage({
      givens: twoStage().givens.map((g) => (g.name === 'pI' ? { ...g, rule: { kind: 'choice', values: [2] } } : g)),
    })
    const preview = previewProblem(bad, { convention: 'engineering' })
    expect(preview.issues.some((i) => /flash chamber's pressure/.test(i.message))).toBe(true)
    for (const v of preview.variants) expect(v.ok).toBe(false)
  })
})
