import { expect, test } from 'vitest'
import type { FormattedSolution } from '#app/domain/thermo/index.ts'
import type { FormattedRankine } from '#app/domain/thermo/steam/rankine-template.ts'
import type { DrawResult, Find, Given, Physics, ProblemDefinition, Variant } from './definition.ts'
import { previewSeeds } from './seed.ts'
import { checkVariantSanity, sweepVariants } from './sweep.ts'
import { drawVariant } from './variant.ts'

const rel = { kind: 'relative', value: 0.01 } as const
const find = (name: string, path: string, unit: string): Find => ({
  name,
  label: name,
  source: { kind: 'output', path },
  unit,
  points: 1,
  tolerance: rel,
  pitfalls: [],
})
const range = (name: string, unit: string, min: number, max: number, step: number): Given => ({
  name,
  label: name,
  unit,
  rule: { kind: 'range', min, max, step },
})
const problem = (
  givens: Given[],
  physics: Physics,
  finds: Find[],
  constraints: ProblemDefinition['constraints'] = [],
): ProblemDefinition => ({
  format: 2,
  title: 'Test',
  tags: { topics: [], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: '',
  givens,
  constraints,
  physics,
  finds,
})

const otto = problem(
  [
    range('T1', 'K', 280, 320, 5),
    range('p1', 'kPa', 90, 110, 5),
    range('r', '', 6, 12, 0.5),
    range('qin', 'kJ/kg', 500, 1500, 50),
  ],
  {
    kind: 'template',
    template: 'otto',
    inputs: { gas: 'air', p1: 'p1', T1: 'T1', compressionRatio: 'r', heatIn: 'qin' },
  },
  [find('eta', 'totals.efficiency', '%'), find('wnet', 'totals.netWork', 'kJ/kg'), find('T3', 'states.3.T', 'K')],
)

// Compressor exit of an ideal compressor: T2 = T1·rp^((γ−1)/γ), about 300 K × 30^0.2857 ≈ 790 K
// at the top of this range (Çengel & Boles, Brayton cycle, from memory): turbine inlets of
// 600–900 K are sometimes below it, and the combustor would have to reject heat.
const badBrayton = problem(
  [range('rp', '', 4, 30, 1), range('TIT', 'K', 600, 900, 50)],
  {
    kind: 'template',
    template: 'brayton',
    inputs: {
      gas: 'air',
      p1: '100 kPa',
      T1: '300 K',
      pressureRatio: 'rp',
      turbineInletT: 'TIT',
      compressorEfficiency: '0.8',
    },
  },
  [find('eta', 'totals.efficiency', '')],
)

const rankine = problem(
  [range('pb', 'MPa', 8, 15, 0.5), range('Tin', 'degC', 450, 550, 10), range('pc', 'kPa', 5, 20, 5)],
  {
    kind: 'template',
    template: 'rankine',
    inputs: {
      boilerPressure: 'pb',
      condenserPressure: 'pc',
      turbineInletTemperature: 'Tin',
      turbineEfficiency: '0.85',
      pumpEfficiency: '0.9',
    },
  },
  [find('x4', 'totals.turbineExitQuality', ''), find('eta', 'totals.efficiency', '%')],
)

test('a sound Otto problem passes 500 seeds with no failures, quickly', () => {
  sweepVariants(otto, { seeds: previewSeeds(20), convention: 'engineering' }) // warm-up (JIT)
  const t0 = performance.now()
  const s = sweepVariants(otto, { seeds: previewSeeds(500), convention: 'engineering' })
  const ms = performance.now() - t0
  expect(s).toEqual({ checked: 500, failed: 0, failures: [] })
  // About 0.15 s on an idle machine; the bound leaves room for a loaded test run.
  expect(ms).toBeLessThan(3000)
})

test('a sound Rankine problem passes 500 seeds with no failures in a few seconds at most', () => {
  const t0 = performance.now()
  const s = sweepVariants(rankine, { seeds: previewSeeds(500), convention: 'chemistry' })
  expect(s).toEqual({ checked: 500, failed: 0, failures: [] })
  expect(performance.now() - t0).toBeLessThan(5000)
})

test.each(['carnot-refrigerator', 'carnot-heat-pump', 'carnot-engine'])(
  'a sound %s problem passes 200 seeds (COP or efficiency within the Carnot bound)',
  (template) => {
    const def = problem(
      [range('Tc', 'K', 250, 280, 5), range('dT', 'K', 30, 80, 10)],
      {
        kind: 'template',
        template,
        inputs: { gas: 'air', Th: '@{Tc} + @{dT}', Tc: 'Tc', p1: '100 kPa', expansionRatio: '1.5' },
      },
      [find('net', 'totals.netWork', 'kJ/kg')],
    )
    const def2 = {
      ...def,
      givens: [
        ...def.givens,
        { name: 'Th', label: 'Th', unit: 'K', rule: { kind: 'expression' as const, expression: 'Tc + dT' } },
      ],
      physics: {
        kind: 'template' as const,
        template,
        inputs: { gas: 'air', Th: 'Th', Tc: 'Tc', p1: '100 kPa', expansionRatio: '1.5' },
      },
    }
    expect(sweepVariants(def2, { seeds: previewSeeds(200), convention: 'engineering' })).toEqual({
      checked: 200,
      failed: 0,
      failures: [],
    })
  },
)

test('a Brayton whose turbine inlet is sometimes too cold: exactly the seeds the closed form condemns are flagged, with their givens', () => {
  const seeds = previewSeeds(300)
  const s = sweepVariants(badBrayton, { seeds, convention: 'engineering' })
  expect(s.checked).toBe(300)
  expect(s.failed).toBeGreaterThan(10)
  expect(s.failed).toBeLessThan(290)
  const bySeed = new Map(s.failures.map((f) => [f.seed, f]))
  expect(bySeed.size).toBe(s.failed)
  let compared = 0
  for (const seed of seeds) {
    const r = drawVariant(badBrayton, seed, { convention: 'engineering' })
    const rp = r.ok ? r.variant.givens[0]!.value : Number(bySeed.get(seed)!.givens![0]!.split(' = ')[1])
    const tit = r.ok
      ? r.variant.givens[1]!.value
      : Number(bySeed.get(seed)!.givens![1]!.split(' = ')[1]!.replace(' K', ''))
    // Air-standard Brayton with γ = 1.4 (Çengel & Boles, Brayton cycle relations, from memory):
    // T2 = T1·(1 + (rp^((γ−1)/γ) − 1)/ηc), T4 = T3·rp^(−(γ−1)/γ), w_net ∝ (T3 − T4) − (T2 − T1).
    const k = 0.4 / 1.4
    const t2 = 300 * (1 + (rp ** k - 1) / 0.8)
    const wnet = tit - tit * rp ** -k - (t2 - 300)
    const f = bySeed.get(seed)
    // the template's air has γ = 1.3997, not 1.4: leave the borderline cases out
    if (Math.abs(tit - t2) < 0.01 * t2 || Math.abs(wnet) < 0.01 * (t2 - 300)) continue
    compared++
    if (tit < t2) expect(f?.code).toBe('solve-error')
    else if (wnet < 0) expect(f?.code).toBe('efficiency-out-of-range')
    else expect(f).toBeUndefined()
    if (f) {
      expect(f.givens).toEqual([`rp = ${rp}`, `TIT = ${tit} K`])
      expect(f.message.length).toBeGreaterThan(10)
    }
  }
  expect(compared).toBeGreaterThan(250)
})

test('a Rankine problem whose turbine exit is sometimes superheated: the quality find is undefined on those seeds', () => {
  const def = problem(
    [range('pb', 'MPa', 1, 4, 0.5), range('Tin', 'degC', 400, 600, 50)],
    {
      kind: 'template',
      template: 'rankine',
      inputs: {
        boilerPressure: 'pb',
        condenserPressure: '50 kPa',
        turbineInletTemperature: 'Tin',
        turbineEfficiency: '0.8',
      },
    },
    [find('x4', 'totals.turbineExitQuality', '')],
  )
  const s = sweepVariants(def, { seeds: previewSeeds(60), convention: 'engineering' })
  expect(s.failed).toBeGreaterThan(0)
  expect(s.failed).toBeLessThan(60)
  for (const f of s.failures) {
    expect(f.code).toBe('find-undefined')
    expect(f.message).toMatch(/"x4".*totals\.turbineExitQuality/)
  }
})

test('a range that reaches T <= 0 through an expression is flagged on exactly those seeds', () => {
  const def = problem(
    [
      range('Th', 'K', 300, 600, 10),
      { name: 'Tc', label: 'cold', unit: 'K', rule: { kind: 'expression', expression: 'Th - 400 K' } },
    ],
    {
      kind: 'template',
      template: 'carnot-engine',
      inputs: { gas: 'air', Th: 'Th', Tc: 'Tc', p1: '100 kPa', expansionRatio: '2' },
    },
    [find('eta', 'totals.efficiency', '')],
  )
  const s = sweepVariants(def, { seeds: previewSeeds(200), convention: 'engineering' })
  expect(s.failed).toBeGreaterThan(0)
  for (const f of s.failures) {
    const th = Number(f.givens![0]!.match(/Th = (\d+) K/)![1])
    expect(th - 400).toBeLessThanOrEqual(0)
    expect(['solve-error', 'temperature-not-positive']).toContain(f.code)
  }
  const good = previewSeeds(200).filter((seed) => !s.failures.some((f) => f.seed === seed))
  for (const seed of good.slice(0, 20)) {
    const r = drawVariant(def, seed, { convention: 'engineering' })
    expect(r.ok && r.variant.givens[1]!.value > 0).toBe(true)
  }
})

test('keep limits the failures listed; failed still counts every failing variant', () => {
  const all = sweepVariants(badBrayton, { seeds: previewSeeds(100), convention: 'engineering' })
  expect(all.failed).toBeGreaterThan(3)
  const some = sweepVariants(badBrayton, { seeds: previewSeeds(100), convention: 'engineering', keep: 3 })
  expect(some.failed).toBe(all.failed)
  expect(some.failures).toEqual(all.failures.slice(0, 3))
  expect(sweepVariants(badBrayton, { seeds: previewSeeds(100), convention: 'engineering', keep: 0 }).failures).toEqual(
    [],
  )
})

test('a draw that fails before solving (constraint never met) is a failure per seed, with its code', () => {
  const def = { ...otto, constraints: [{ left: 'T1', op: '>' as const, right: '400 K' }] }
  const s = sweepVariants(def, { seeds: [1, 2], convention: 'engineering' })
  expect(s.failed).toBe(2)
  expect(s.failures.map((f) => [f.seed, f.code])).toEqual([
    [1, 'constraint-never-met'],
    [2, 'constraint-never-met'],
  ])
})

// ---- checkVariantSanity on real variants with one value pushed out of bounds --------------

function drawn(def: ProblemDefinition, seed = 1): Variant {
  const r = drawVariant(def, seed, { convention: 'engineering' })
  if (!r.ok) throw new Error(r.error.message)
  return r.variant
}

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> }

function tamper<S>(v: Variant, edit: (sol: Mutable<S>, v: Mutable<Variant>) => void): DrawResult {
  const copy = structuredClone(v) as Mutable<Variant>
  edit(copy.solution as unknown as Mutable<S>, copy)
  return { ok: true, variant: copy as Variant }
}

test('an untouched variant has no failures', () => {
  expect(checkVariantSanity({ ok: true, variant: drawn(otto) })).toEqual([])
  expect(checkVariantSanity({ ok: true, variant: drawn(rankine) })).toEqual([])
})

test.each<[string, (s: Mutable<FormattedSolution>, v: Mutable<Variant>) => void, string, RegExp]>([
  [
    'a state below absolute zero',
    (s) => void (s.states[1]!.T.value = -5),
    'temperature-not-positive',
    /State 2: T = -5 K/,
  ],
  ['a state at zero pressure', (s) => void (s.states[2]!.p.value = 0), 'pressure-not-positive', /State 3: p = 0 Pa/],
  [
    'an efficiency above the Carnot bound',
    (s) => void (s.totals.efficiency!.value = s.totals.carnotBound.value + 0.01),
    'efficiency-out-of-range',
    /Carnot bound/,
  ],
  ['a negative efficiency', (s) => void (s.totals.efficiency!.value = -0.05), 'efficiency-out-of-range', /-0\.05/],
  ['a key that is not finite', (_s, v) => void (v.key[1]!.value = Number.NaN), 'find-undefined', /"wnet"/],
])('ideal gas: %s is flagged', (_what, edit, code, message) => {
  const v = drawn(otto, 4)
  const failures = checkVariantSanity(tamper<FormattedSolution>(v, edit))
  expect(failures).toHaveLength(1)
  expect(failures[0]).toMatchObject({ seed: 4, code })
  expect(failures[0]!.message).toMatch(message)
  expect(failures[0]!.givens).toEqual(v.givens.map((g) => `${g.name} = ${g.text}`))
})

test.each<[string, (s: Mutable<FormattedSolution>) => void]>([
  [
    'a refrigerator COP above Tmin/(Tmax − Tmin)',
    (s) => void (s.totals.copRefrigerator!.value = s.totals.carnotBound.value * 1.05),
  ],
  ['a refrigerator COP of zero', (s) => void (s.totals.copRefrigerator!.value = 0)],
  ['a refrigerator that takes no work (no COP)', (s) => void (s.totals.copRefrigerator = null)],
])('refrigerator: %s is flagged as efficiency-out-of-range', (_what, edit) => {
  const def = problem(
    [range('Tc', 'K', 250, 270, 5)],
    {
      kind: 'template',
      template: 'carnot-refrigerator',
      inputs: { gas: 'air', Th: '300 K', Tc: 'Tc', p1: '100 kPa', expansionRatio: '1.5' },
    },
    [find('net', 'totals.netWork', 'kJ/kg')],
  )
  const v = drawn(def)
  expect(checkVariantSanity({ ok: true, variant: v })).toEqual([])
  expect(checkVariantSanity(tamper<FormattedSolution>(v, edit)).map((f) => f.code)).toEqual(['efficiency-out-of-range'])
})

test.each<[string, (s: Mutable<FormattedRankine>) => void, string]>([
  ['a state quality above 1', (s) => void (s.states[3]!.x = 1.2), 'quality-out-of-range'],
  ['a turbine exit quality below 0', (s) => void (s.totals.turbineExitQuality!.value = -0.1), 'quality-out-of-range'],
  ['an efficiency above 1 − Tmin/Tmax', (s) => void (s.totals.efficiency.value = 0.95), 'efficiency-out-of-range'],
  ['a state below absolute zero', (s) => void (s.states[0]!.T.value = 0), 'temperature-not-positive'],
])('Rankine: %s is flagged', (_what, edit, code) => {
  const v = drawn(rankine, 2)
  expect(checkVariantSanity(tamper<FormattedRankine>(v, edit)).map((f) => f.code)).toContain(code)
})

test('a failed draw becomes one failure with its code and message', () => {
  expect(checkVariantSanity({ ok: false, seed: 9, error: { code: 'solve-error', message: 'State 3: no.' } })).toEqual([
    { seed: 9, code: 'solve-error', message: 'State 3: no.' },
  ])
})
