/**
 * Bank problems on ideal-gas templates that ask for the second law and powers (the template
 * inputs sourceTemperature, sinkTemperature, deadStateTemperature/-Pressure and massFlow):
 * keys in both conventions, senses of the powers, the names of the paths, the lint and the
 * worked solution. Expected keys come from closed forms for air with constant specific heats
 * (cp = 1.005, cv = 0.718 kJ/(kg K), Çengel & Boles Table A-2, from memory): the air-standard
 * Brayton temperatures with isentropic efficiencies, S_gen = Q_out/T_L − Q_in/T_H,
 * X_dest = T0·S_gen (Gouy–Stodola), η_II = η/(1 − T_L/T_H), power = ṁ·w_net (Çengel & Boles
 * ch. 7 and 8, from memory).
 */
import { describe, expect, test } from 'vitest'
import type { Find, ProblemDefinition, Variant } from './definition.ts'
import { lintDefinition } from './lint.ts'
import { quantityAtPath } from './quantities.ts'
import { outputSense, senseErrors } from './sense.ts'
import { drawVariant } from './variant.ts'
import { renderWorkedSolution, workedSolution } from './worked-solution.ts'

const cp = 1005
const cv = 718
const R = cp - cv
const g = cp / cv

const find = (name: string, path: string, unit: string, extra: Partial<Find> = {}): Find => ({
  name,
  label: name,
  source: { kind: 'output', path },
  unit,
  points: 1,
  tolerance: { kind: 'relative', value: 0.01 },
  pitfalls: [],
  ...extra,
})

const brayton: ProblemDefinition = {
  format: 2,
  title: 'Plant',
  tags: { topics: [], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: '',
  givens: [
    { name: 'mdot', label: 'mass flow', unit: 'kg/s', rule: { kind: 'range', min: 15, max: 25, step: 5 } },
    { name: 'rp', label: 'pressure ratio', unit: '', rule: { kind: 'range', min: 8, max: 14, step: 1 } },
    { name: 'TIT', label: 'turbine inlet', unit: 'K', rule: { kind: 'range', min: 1200, max: 1400, step: 50 } },
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'brayton',
    inputs: {
      gas: 'air',
      p1: '100 kPa',
      T1: '300 K',
      pressureRatio: 'rp',
      turbineInletT: 'TIT',
      compressorEfficiency: '0.85',
      turbineEfficiency: '0.9',
      sourceTemperature: '1600 K',
      sinkTemperature: '300 K',
      deadStateTemperature: '300 K',
      deadStatePressure: '100 kPa',
      massFlow: 'mdot',
    },
  },
  finds: [
    find('Wdot', 'totals.rate.netPower', 'MW', { sense: 'work-by-system' }),
    find('WdotConv', 'totals.rate.netPower', 'kW'),
    find('Xdot', 'totals.rate.exergyDestroyed', 'kW'),
    find('xdest', 'totals.exergyDestroyed', 'kJ/kg'),
    find('sgen2', 'steps.2.entropyGenerated', 'kJ/(kg K)'),
    find('Sdot', 'totals.rate.entropyGenerated', 'kW/K'),
    find('etaII', 'totals.secondLawEfficiency', ''),
    find('Qdot', 'totals.rate.heatIn', 'MW', { sense: 'heat-into-system' }),
  ],
}

function variant(def: ProblemDefinition, seed: number, convention: 'engineering' | 'chemistry'): Variant {
  const r = drawVariant(def, seed, { convention })
  if (!r.ok) throw new Error(JSON.stringify(r.error))
  return r.variant
}
const keyOf = (v: Variant, name: string) => v.key.find((k) => k.name === name)!.value
const givenOf = (v: Variant, name: string) => v.givens.find((x) => x.name === name)!.value
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

/** The Brayton plant's numbers from the closed forms (T1 = 300 K, ηc = 0.85, ηt = 0.9, source 1600 K, sink = T0 = 300 K). */
function expected(mdot: number, rp: number, TIT: number) {
  const x = rp ** ((g - 1) / g)
  const T2 = 300 + (300 * x - 300) / 0.85
  const T4 = TIT - 0.9 * (TIT - TIT / x)
  const qIn = cp * (TIT - T2)
  const qOut = cp * (T4 - 300)
  const w = qIn - qOut
  const sgen = qOut / 300 - qIn / 1600
  return {
    w,
    qIn,
    sgen,
    mdot,
    sgen2: cp * Math.log(TIT / T2) - qIn / 1600,
    etaII: w / qIn / (1 - 300 / 1600),
  }
}

describe('a Brayton bank problem asking for power and exergy destroyed', () => {
  test.each([1, 2, 3, 4, 5])('seed %i: the keys, in both conventions', (seed) => {
    for (const convention of ['engineering', 'chemistry'] as const) {
      const v = variant(brayton, seed, convention)
      const e = expected(givenOf(v, 'mdot'), givenOf(v, 'rp'), givenOf(v, 'TIT'))
      // with a sense the net power is the power delivered in both conventions
      expect(rel(keyOf(v, 'Wdot'), (e.mdot * e.w) / 1e6)).toBeLessThan(1e-9)
      // without one it follows the convention: chemistry states the power done on the gas
      const sign = convention === 'engineering' ? 1 : -1
      expect(rel(keyOf(v, 'WdotConv'), (sign * e.mdot * e.w) / 1e3)).toBeLessThan(1e-9)
      // the second-law quantities have no sign convention
      expect(rel(keyOf(v, 'Xdot'), (300 * e.mdot * e.sgen) / 1e3)).toBeLessThan(1e-9)
      expect(rel(keyOf(v, 'xdest'), (300 * e.sgen) / 1e3)).toBeLessThan(1e-9)
      expect(rel(keyOf(v, 'Sdot'), (e.mdot * e.sgen) / 1e3)).toBeLessThan(1e-9)
      expect(rel(keyOf(v, 'sgen2'), e.sgen2 / 1e3)).toBeLessThan(1e-9)
      expect(rel(keyOf(v, 'etaII'), e.etaII)).toBeLessThan(1e-9)
      expect(rel(keyOf(v, 'Qdot'), (e.mdot * e.qIn) / 1e6)).toBeLessThan(1e-9)
      expect(keyOf(v, 'sgen2')).toBeGreaterThan(0)
    }
  })

  test('the lint accepts it: the powers take senses like the per-kg work and heat', () => {
    expect(lintDefinition(brayton)).toEqual([])
    expect(senseErrors(brayton)).toEqual([])
    expect(outputSense('totals.rate.netPower', 'brayton')).toEqual({ kind: 'convention-work' })
    expect(outputSense('totals.rate.heatIn', 'otto')).toEqual({ kind: 'fixed', sense: 'heat-into-system' })
    expect(outputSense('totals.rate.heatOut', null)).toEqual({ kind: 'fixed', sense: 'heat-out-of-system' })
    expect(outputSense('steps.2.rate.work', 'brayton')).toEqual({ kind: 'convention-work' })
    expect(outputSense('steps.2.rate.heat', 'brayton')).toEqual({ kind: 'fixed', sense: 'heat-into-system' })
    expect(outputSense('totals.rate.exergyDestroyed', 'brayton')).toBeNull()
    // a heat sense on a power is refused, as on the per-kg work
    const wrong = { ...brayton, finds: [find('W', 'totals.rate.netPower', 'kW', { sense: 'heat-into-system' })] }
    expect(senseErrors(wrong).map((x) => x.path)).toEqual(['finds.0.sense'])
  })

  test('the paths have names and symbols', () => {
    const ctx = { convention: 'engineering' as const, stateNames: ['1', '2', '3', '4'] }
    expect(quantityAtPath('totals.rate.netPower', ctx)?.name).toBe('net power')
    expect(quantityAtPath('totals.rate.exergyDestroyed', ctx)?.name).toBe('rate of exergy destruction')
    expect(quantityAtPath('totals.exergyDestroyed', ctx)?.name).toMatch(/exergy destroyed/)
    expect(quantityAtPath('totals.secondLawEfficiency', ctx)?.name).toBe('second-law efficiency')
    expect(quantityAtPath('steps.2.entropyGenerated', ctx)?.name).toBe(
      'entropy generated of step 2 → 3, per unit amount',
    )
    expect(quantityAtPath('steps.4.rate.heat', ctx)).toEqual({
      tex: '\\dot Q_{41}',
      name: 'rate of heat into the gas in step 4 → 1',
    })
    expect(quantityAtPath('steps.2.rate.entropyGenerated', ctx)?.tex).toBe('\\dot S_{\\text{gen},23}')
    expect(quantityAtPath('steps.2.rate.work', { ...ctx, convention: 'chemistry' })?.name).toBe(
      'power done on the gas in step 2 → 3',
    )
    expect(quantityAtPath('steps.2.rate.nothing', ctx)).toBeNull()
  })

  test('the worked solution shows s_gen step by step and the powers', () => {
    const def = brayton
    const v = variant(def, 3, 'engineering')
    const e = expected(givenOf(v, 'mdot'), givenOf(v, 'rp'), givenOf(v, 'TIT'))
    const ws = workedSolution(v, def)
    const lines = ws.sections.find((s) => s.title === 'Cycle totals')!.lines
    const tex = lines.map((l) => l.tex)
    expect(tex.some((t) => t.startsWith('s_{\\mathrm{gen},2\\to 3}'))).toBe(true)
    expect(tex.some((t) => t.startsWith('s_{\\mathrm{gen},4\\to 1}'))).toBe(true)
    const power = tex.find((t) => t.startsWith('\\dot W_{\\mathrm{net}}'))!
    // the number after the last "=" is the net power in kW, to 4 significant figures
    const shown = Number(power.split('=').pop()!.trim().split('\\,')[0])
    expect(rel(shown, (e.mdot * e.w) / 1e3)).toBeLessThan(5e-4)
    expect(tex.some((t) => t.startsWith('\\dot X_{\\mathrm{dest}}'))).toBe(true)
    const html = renderWorkedSolution(ws)
    expect(html).not.toContain('katex-error')
  })
})

describe('an Otto bank problem with the air taken through per second', () => {
  const otto: ProblemDefinition = {
    ...brayton,
    givens: [{ name: 'r', label: 'compression ratio', unit: '', rule: { kind: 'range', min: 7, max: 10, step: 1 } }],
    physics: {
      kind: 'template',
      template: 'otto',
      inputs: {
        gas: 'air',
        p1: '100 kPa',
        T1: '300 K',
        compressionRatio: 'r',
        T3: '1800 K',
        sourceTemperature: '2000 K',
        sinkTemperature: '300 K',
        deadStateTemperature: '300 K',
        deadStatePressure: '100 kPa',
        massFlow: '0.08 kg/s',
      },
    },
    finds: [
      find('P', 'totals.rate.netPower', 'kW', { sense: 'work-by-system' }),
      find('x', 'totals.exergyDestroyed', 'kJ/kg'),
      find('s2', 'steps.2.entropyGenerated', 'kJ/(kg K)'),
    ],
  }
  test.each(['engineering', 'chemistry'] as const)('%s: P = ṁ·w_net, x_dest = T0(q_out/T_L − q_in/T_H)', (c) => {
    const v = variant(otto, 2, c)
    const r = givenOf(v, 'r')
    const T2 = 300 * r ** (g - 1)
    const T4 = 1800 / r ** (g - 1)
    const qIn = cv * (1800 - T2)
    const qOut = cv * (T4 - 300)
    expect(rel(keyOf(v, 'P'), (0.08 * (qIn - qOut)) / 1e3)).toBeLessThan(1e-9)
    expect(rel(keyOf(v, 'x'), (300 * (qOut / 300 - qIn / 2000)) / 1e3)).toBeLessThan(1e-9)
    expect(rel(keyOf(v, 's2'), (cv * Math.log(1800 / T2) - qIn / 2000) / 1e3)).toBeLessThan(1e-9)
    expect(R).toBeCloseTo(287, 9)
    const ws = workedSolution(v, otto)
    const note = ws.sections.flatMap((s) => s.lines).find((l) => l.tex.startsWith('\\dot m'))!.note
    expect(note).toMatch(/per second/)
  })
})
