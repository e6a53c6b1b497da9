// Bank problems on the steady-flow templates (nozzle, diffuser, turbojet): variant keys, units
// in the givens and answers, senses, pitfalls, the worked solution, the T–s and P–v diagrams,
// the sweep and the lint. The flow solver's own physics is checked in
// app/domain/thermo/flow/*.test.ts; here the keys and the worked solution's numbers are
// recomputed from the gas-dynamics closed forms of a calorically perfect gas (common practice,
// every compressible-flow text):
//   V2 = √(V1² + 2 η cp T1 (1 − (p2/p1)^((k−1)/k)))       nozzle with isentropic efficiency η
//   T0 = T + V²/(2 cp),  p0 = p (T0/T)^(k/(k−1)),  a = √(k R T),  M = V/a
//   p*/p0 = (2/(k+1))^(k/(k−1)) = 0.5283 and T*/T0 = 2/(k+1) = 0.8333 for k = 1.4
//   A/A* = (1/M) [(2/(k+1))(1 + (k−1)/2 M²)]^((k+1)/(2(k−1))) = 1.6875 at M = 2 for k = 1.4
//          (isentropic-flow tables, as the flow tests use)
// and for the turbojet the textbook's component-by-component hand calculation (Çengel & Boles,
// "Thermodynamics: An Engineering Approach", ch. 9, the ideal jet-propulsion cycle; inputs from
// memory), thrust F = ṁ(V6 − V1), Ẇ_P = F V1, η_P = 2V1/(V1 + V6), η_th = (V6² − V1²)/(2 q_in).
import { createElement } from 'react'
import { renderToStaticMarkup } from 'react-dom/server'
import { describe, expect, test } from 'vitest'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { gradeAnswer, precheckAnswer } from '#app/domain/assignments/grade-answer.ts'
import {
  applicablePitfalls,
  TEMPLATES_WITHOUT_SLIPS,
  whyPitfallCannotFire,
} from '#app/domain/grading/applicable-pitfalls.ts'
import { evaluateWithPitfall } from '#app/domain/grading/pitfalls.ts'
import { templateEntry } from '#app/domain/thermo/catalog.ts'
import type { Convention } from '#app/domain/thermo/conventions.ts'
import type { FormattedDuct, FormattedTurbojet } from '#app/domain/thermo/flow/flow-template.ts'
import { readQuantity } from '#app/domain/thermo/index.ts'
import { solveBankSpec } from '#app/domain/thermo/solve-spec.ts'
import { TEMPLATE_IDS } from '#app/lib/problem-schema.ts'
import type { DrawResult, Find, Given, ProblemDefinition, Variant } from './definition.ts'
import { describePlot } from './diagram-plot.ts'
import { cycleDiagrams } from './diagrams.ts'
import { lintDefinition } from './lint.ts'
import { quantityAtPath } from './quantities.ts'
import { outputSense, senseErrors } from './sense.ts'
import { isRankineSolution, isSteadyFlowSolution, solutionKind } from './solution-kind.ts'
import { checkVariantSanity, sweepVariants } from './sweep.ts'
import { drawVariant } from './variant.ts'
import { renderWorkedSolution, workedSolution } from './worked-solution.ts'

// The 'air' preset: constant cp = 1.005 kJ/(kg·K), R = 0.287 kJ/(kg·K), so k = cp/(cp − R).
const cp = 1005
const R = 287
const k = cp / (cp - R)
const x = (k - 1) / k

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
const given = (name: string, unit: string, value: number): Given => ({
  name,
  label: name,
  unit,
  rule: { kind: 'choice', values: [value] },
})

function problem(
  template: 'nozzle' | 'diffuser' | 'turbojet',
  givens: Given[],
  inputs: Record<string, string>,
  finds: Find[],
): ProblemDefinition {
  return {
    format: 2,
    title: `${template} test problem`,
    tags: { topics: ['steady flow'], difficulty: 'standard', level: 'second-year' },
    convention: 'course',
    prompt: 'A steady-flow device.',
    givens,
    constraints: [],
    physics: { kind: 'template', template, inputs },
    finds,
  }
}

function drawn(def: ProblemDefinition, convention: Convention = 'engineering', seed = 1): Variant {
  const r = drawVariant(def, seed, { convention })
  if (!r.ok) throw new Error(r.error.message)
  return r.variant
}
const keyOf = (v: Variant, name: string) => {
  const key = v.key.find((e) => e.name === name)
  if (!key) throw new Error(`no key ${name}`)
  return key
}
const near = (a: number, b: number, rel = 1e-6) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b))

/** The number after the last "=" of a worked line (4 significant figures). */
function lastNumber(tex: string): number {
  const m = /^\s*(-?\d+(?:\.\d+)?)/.exec(tex.split('=').at(-1) ?? '')
  if (!m) throw new Error(`no number at the end of ${tex}`)
  return Number(m[1])
}
function line(v: Variant, def: ProblemDefinition, start: string): string {
  const all = workedSolution(v, def).sections.flatMap((s) => s.lines)
  const l = all.find((w) => w.tex.startsWith(start))
  if (!l) throw new Error(`no worked line starting ${start}`)
  return l.tex
}
/** Agreement to the 4 significant figures a worked line shows. */
const shows = (tex: string, value: number) => near(lastNumber(tex), value, 6e-4)

// ---- The bank lets them in ---------------------------------------------------------------

describe('the steady-flow templates are bank templates', () => {
  test.each(['nozzle', 'diffuser', 'turbojet'])('%s: catalog, browser list, bank solver and result shape', (id) => {
    expect(templateEntry(id)?.bank).toBe(true)
    expect(templateEntry(id)?.family).toBe('steady-flow')
    expect(TEMPLATE_IDS).toContain(id)
    expect(TEMPLATES_WITHOUT_SLIPS.has(id)).toBe(true)
    const spec =
      id === 'turbojet'
        ? {
            template: id,
            inputs: {
              flightSpeed: '250 m/s',
              ambientPressure: '30 kPa',
              ambientTemperature: '230 K',
              pressureRatio: '10',
              turbineInletT: '1200 K',
            },
          }
        : {
            template: id,
            inputs: {
              p1: '200 kPa',
              T1: '400 K',
              V1: id === 'nozzle' ? '20 m/s' : '200 m/s',
              V2: id === 'nozzle' ? '300 m/s' : '20 m/s',
            },
          }
    const sol = solveBankSpec(spec)
    expect(sol.ok).toBe(true)
    if (!sol.ok) return
    expect(solutionKind(sol)).toBe('steady-flow')
    expect(isSteadyFlowSolution(sol)).toBe(true)
    expect(isRankineSolution(sol)).toBe(false)
  })
})

// ---- Keys against the closed forms -------------------------------------------------------

describe('nozzle: keys and worked numbers from the closed forms (subsonic, isentropic)', () => {
  // Invented numbers: 300 kPa, 500 K, 60 m/s (given in km/h), to 200 kPa, 1.5 kg/s.
  const def = problem(
    'nozzle',
    [
      given('p1', 'kPa', 300),
      given('T1', 'K', 500),
      given('V1', 'km/h', 216),
      given('p2', 'kPa', 200),
      given('mdot', 'kg/s', 1.5),
    ],
    { gas: 'air', p1: 'p1', T1: 'T1', V1: 'V1', p2: 'p2', massFlow: 'mdot' },
    [
      find('V2', 'totals.exitVelocity', 'm/s'),
      find('V2kmh', 'totals.exitVelocity', 'km/h'),
      find('T2', 'totals.exitTemperature', 'K'),
      find('M2', 'totals.exitMach', ''),
      find('T01', 'totals.stagnationTemperature', 'K'),
      find('A2', 'totals.exitArea', 'cm^2'),
      find('ratio', 'totals.areaRatio', ''),
    ],
  )
  const V1 = 60
  const T2 = 500 * (200 / 300) ** x
  const V2 = Math.sqrt(V1 * V1 + 2 * cp * (500 - T2))
  const rho1 = 300e3 / (R * 500)
  const rho2 = 200e3 / (R * T2)
  test.each(['engineering', 'chemistry'] as const)('keys, %s course', (convention) => {
    const v = drawn(def, convention)
    expect(v.spec).toMatchObject({ inputs: { V1: '216 km/h' } })
    near(keyOf(v, 'V2').value, V2)
    near(keyOf(v, 'V2kmh').value, V2 * 3.6)
    near(keyOf(v, 'T2').value, T2)
    near(keyOf(v, 'M2').value, V2 / Math.sqrt(k * R * T2))
    near(keyOf(v, 'T01').value, 500 + (V1 * V1) / (2 * cp))
    near(keyOf(v, 'A2').value, (1.5 / (rho2 * V2)) * 1e4)
    near(keyOf(v, 'ratio').value, (rho1 * V1) / (rho2 * V2))
  })
  test('worked solution: T0 = T + V²/(2cp), V2 from the energy equation, M with the local k, no choking', () => {
    const v = drawn(def)
    shows(line(v, def, 'T_{01} = T_{1} + '), 500 + (V1 * V1) / (2 * cp))
    shows(line(v, def, 'p_{01} = '), 300 * ((500 + (V1 * V1) / (2 * cp)) / 500) ** (1 / x))
    shows(line(v, def, 'T_{2s} = '), T2)
    shows(line(v, def, 'V_2 = \\sqrt'), V2)
    shows(line(v, def, 'a_{2} = '), V2 / Math.sqrt(k * R * T2))
    shows(line(v, def, '\\frac{A_2}{A_1}'), (rho1 * V1) / (rho2 * V2))
    const ws = workedSolution(v, def)
    expect(ws.sections.map((s) => s.title)).toEqual(
      expect.arrayContaining(['Gas', 'Inlet (state 1)', 'Exit (state 2)', 'Flow rate and areas']),
    )
    // 200 kPa is above p* = 0.5283 p01: the converging nozzle does not choke.
    expect(line(v, def, 'p_2 = ')).toMatch(/\\ge p\^\*/)
    expect(ws.caution).toMatch(/Not design data/)
    const html = renderWorkedSolution(ws)
    expect(html).not.toMatch(/katex-error/)
    expect(html).toContain('<math')
  })
})

describe('converging–diverging nozzle at M2 = 2: A/A* against the isentropic-flow table', () => {
  // From rest at 1000 kPa and 500 K to the pressure where M = 2 for k = 1.4: p2/p0 = 1.8^−3.5.
  const def = problem(
    'nozzle',
    [given('p2', 'kPa', 1000 * 1.8 ** -3.5)],
    {
      gas: 'air',
      p1: '1000 kPa',
      T1: '500 K',
      V1: '0 m/s',
      p2: 'p2',
      shape: 'converging-diverging',
      massFlow: '2 kg/s',
    },
    [find('M2', 'totals.exitMach', ''), find('V2', 'totals.exitVelocity', 'ft/s')],
  )
  const areaOverCritical = (M: number) =>
    (1 / M) * ((2 / (k + 1)) * (1 + ((k - 1) / 2) * M * M)) ** ((k + 1) / (2 * (k - 1)))
  test('the worked A2/A* is the closed form at the key’s Mach number, and the table’s 1.6875 at M = 2', () => {
    const v = drawn(def)
    const M2 = keyOf(v, 'M2').value
    near(M2, 2, 2e-3) // the preset's k is 1.3997, not 1.4
    const tex = line(v, def, '\\frac{A_2}{A^*}')
    shows(tex, areaOverCritical(M2))
    near(lastNumber(tex), 1.6875, 3e-3)
    // V2 = M2 √(kRT2), T2 = T0/(1 + (k−1)/2 M²), in ft/s (0.3048 m exactly)
    const T2 = 500 / (1 + ((k - 1) / 2) * M2 * M2)
    near(keyOf(v, 'V2').value, (M2 * Math.sqrt(k * R * T2)) / 0.3048)
  })
})

describe('converging nozzle below the critical pressure: choked', () => {
  const def = problem(
    'nozzle',
    [given('pb', 'kPa', 100)],
    { gas: 'air', p1: '300 kPa', T1: '500 K', V1: '0 m/s', p2: 'pb', massFlow: '1 kg/s' },
    [
      find('M2', 'totals.exitMach', ''),
      find('p2', 'totals.exitPressure', 'kPa'),
      find('T2', 'totals.exitTemperature', 'K'),
      find('V2', 'totals.exitVelocity', 'm/s'),
    ],
  )
  test('M2 = 1 at p* = (2/(k+1))^(k/(k−1)) p0 ≈ 0.5283 p0 and T* = 2T0/(k+1); the worked solution says so', () => {
    const v = drawn(def)
    const pr = (2 / (k + 1)) ** (k / (k - 1))
    near(pr, 0.5283, 1e-3) // the table's value for k = 1.4
    near(keyOf(v, 'M2').value, 1, 1e-6)
    near(keyOf(v, 'p2').value, 300 * pr, 1e-6)
    near(keyOf(v, 'T2').value, (2 * 500) / (k + 1), 1e-6)
    near(keyOf(v, 'V2').value, Math.sqrt(k * R * ((2 * 500) / (k + 1))), 1e-6)
    const tex = line(v, def, '\\frac{p^*}{p_{01}}')
    expect(tex).toContain('> p_b = 100.0')
    near(Number(/= (0\.\d+),/.exec(tex)![1]), pr, 6e-4)
    const notes = workedSolution(v, def)
      .sections.flatMap((s) => s.lines.map((l) => l.note ?? ''))
      .join(' ')
    expect(notes).toMatch(/choked, M2 = 1/)
  })
})

describe('diffuser: stagnation and exit state from the closed forms', () => {
  // Invented: 80 kPa, 10 °C, 720 km/h (200 m/s) through 0.4 m², leaving at 20 m/s, η_D = 0.9.
  const def = problem(
    'diffuser',
    [given('p1', 'kPa', 80), given('T1', '°C', 10), given('V1', 'km/h', 720), given('A1', 'cm^2', 4000)],
    { gas: 'air', p1: 'p1', T1: 'T1', V1: 'V1', V2: '20 m/s', efficiency: '0.9', inletArea: 'A1' },
    [
      find('T2', 'totals.exitTemperature', '°C'),
      find('p2', 'totals.exitPressure', 'kPa'),
      find('mdot', 'totals.massFlow', 'kg/s'),
      find('T0', 'totals.stagnationTemperature', 'K'),
    ],
  )
  const T1 = 283.15
  const T2 = T1 + (200 ** 2 - 20 ** 2) / (2 * cp)
  const T2s = T1 + 0.9 * (T2 - T1)
  test('keys: T2 = T1 + (V1² − V2²)/(2cp), p2 = p1 (T2s/T1)^(k/(k−1)), ṁ = ρ1 A1 V1', () => {
    const v = drawn(def)
    near(keyOf(v, 'T2').value, T2 - 273.15)
    near(keyOf(v, 'p2').value, 80 * (T2s / T1) ** (1 / x))
    near(keyOf(v, 'mdot').value, (80e3 / (R * T1)) * 0.4 * 200)
    near(keyOf(v, 'T0').value, T1 + 200 ** 2 / (2 * cp))
  })
  test('worked solution: η_D = (h2s − h1)/(h2 − h1) and the exit velocity from the energy equation', () => {
    const v = drawn(def)
    shows(line(v, def, '\\eta_D'), (cp * (T2 - T1)) / 1000)
    shows(line(v, def, 'V_2 = \\sqrt'), 20)
    shows(line(v, def, 'T_2 = T_1 +'), T2)
  })
})

// ---- Turbojet ------------------------------------------------------------------------------

/** The hand calculation, component by component, with component efficiencies (1 = ideal). */
function jet(V1: number, p1: number, T1: number, rp: number, T4: number, m: number, e = { d: 1, c: 1, t: 1, n: 1 }) {
  const T2 = T1 + (V1 * V1) / (2 * cp)
  const T2s = T1 + (e.d * V1 * V1) / (2 * cp)
  const p2 = p1 * (T2s / T1) ** (1 / x)
  const p3 = rp * p2
  const T3 = T2 + (T2 * rp ** x - T2) / e.c
  const T5 = T4 - (T3 - T2)
  const T5s = T4 - (T3 - T2) / e.t
  const p5 = p3 * (T5s / T4) ** (1 / x)
  const T6 = T5 - e.n * (T5 - T5 * (p1 / p5) ** x)
  const V6 = Math.sqrt(2 * cp * (T5 - T6))
  const qin = cp * (T4 - T3)
  const F = m * (V6 - V1)
  return { T2, p2, p3, T3, T5, p5, T6, V6, qin, wc: cp * (T3 - T2), F, WP: F * V1, Qin: m * qin }
}

const jetDef = (extra: Record<string, string> = {}, finds: Find[] = []) =>
  problem(
    'turbojet',
    [
      given('V1', 'km/h', 936),
      given('pa', 'kPa', 34.5),
      given('Ta', '°C', -40),
      given('rp', '', 10),
      given('T4', 'K', 1100),
      given('mdot', 'kg/s', 45),
    ],
    {
      gas: 'air',
      flightSpeed: 'V1',
      ambientPressure: 'pa',
      ambientTemperature: 'Ta',
      pressureRatio: 'rp',
      turbineInletT: 'T4',
      massFlow: 'mdot',
      ...extra,
    },
    finds,
  )

describe('turbojet: the textbook’s ideal cycle (Çengel & Boles ch. 9 inputs, from memory) against the hand calculation', () => {
  // 260 m/s (936 km/h) at 34.5 kPa and −40 °C, rp = 10, 1100 K at the turbine, 45 kg/s.
  const c = jet(260, 34.5e3, 233.15, 10, 1100, 45)
  const def = jetDef({}, [
    find('T3', 'states.3.T', 'K'),
    find('p5', 'states.5.p', 'kPa'),
    find('V6', 'totals.exitVelocity', 'm/s'),
    find('F', 'totals.thrust', 'kN'),
    find('WP', 'totals.propulsivePower', 'kW'),
    find('Qin', 'totals.heatRate', 'MW'),
    find('etaP', 'totals.propulsiveEfficiency', ''),
    find('etaTh', 'totals.thermalEfficiency', ''),
    find('etaO', 'totals.overallEfficiency', '%'),
    find('wc', 'totals.compressorWork', 'kJ/kg'),
  ])
  test.each(['engineering', 'chemistry'] as const)('keys, %s course', (convention) => {
    const v = drawn(def, convention)
    near(keyOf(v, 'T3').value, c.T3)
    near(keyOf(v, 'p5').value, c.p5 / 1000)
    near(keyOf(v, 'V6').value, c.V6)
    near(keyOf(v, 'F').value, c.F / 1000)
    near(keyOf(v, 'WP').value, c.WP / 1000)
    near(keyOf(v, 'Qin').value, c.Qin / 1e6)
    near(keyOf(v, 'etaP').value, (2 * 260) / (260 + c.V6))
    near(keyOf(v, 'etaTh').value, (c.V6 ** 2 - 260 ** 2) / 2 / c.qin)
    near(keyOf(v, 'etaO').value, (100 * c.WP) / c.Qin)
    near(keyOf(v, 'wc').value, c.wc / 1000)
  })
  test('worked solution: each component, W_t = W_c, the thrust and the three efficiencies', () => {
    const v = drawn(def)
    const ws = workedSolution(v, def)
    expect(ws.sections.map((s) => s.title)).toEqual([
      'Given',
      'Sign convention',
      'Gas',
      'Diffuser (1 → 2)',
      'Compressor (2 → 3)',
      'Burner (3 → 4)',
      'Turbine (4 → 5)',
      'Nozzle (5 → 6)',
      'Thrust and efficiencies',
      'In the course convention',
      'Answers',
    ])
    shows(line(v, def, 'T_2 = T_1 + '), c.T2)
    shows(line(v, def, 'p_2 = p_1'), c.p2 / 1000)
    shows(line(v, def, 'p_3 = '), c.p3 / 1000)
    shows(line(v, def, 'W_{\\text{c,in}} = h_3 - h_2'), c.wc / 1000)
    shows(line(v, def, 'Q_{\\text{in}} = h_4 - h_3'), c.qin / 1000)
    expect(line(v, def, 'W_{\\text{t,out}} = W_{\\text{c,in}}')).toContain('T_5')
    shows(line(v, def, 'W_{\\text{t,out}} = W_{\\text{c,in}}'), c.T5)
    shows(line(v, def, 'p_5 = p_4'), c.p5 / 1000)
    shows(line(v, def, 'V_6 = \\sqrt'), c.V6)
    shows(line(v, def, 'F = \\dot m'), c.F / 1000)
    shows(line(v, def, '\\dot W_P = F V_1'), c.WP / 1000)
    shows(line(v, def, '\\eta_P'), (2 * 260) / (260 + c.V6))
    shows(line(v, def, '\\eta_{\\text{th}}'), (c.V6 ** 2 - 260 ** 2) / 2 / c.qin)
    shows(line(v, def, '\\eta_o'), c.WP / c.Qin)
    // the kinetic-energy form of the steady-flow energy equation is stated with the convention
    expect(ws.sections[1]!.lines.map((l) => l.tex)).toContain('\\Delta\\left(h + \\tfrac{V^2}{2}\\right) = Q - W')
    expect(workedSolution(drawn(def, 'chemistry'), def).sections[1]!.lines.map((l) => l.tex)).toContain(
      '\\Delta\\left(h + \\tfrac{V^2}{2}\\right) = q + w',
    )
    expect(renderWorkedSolution(ws)).not.toMatch(/katex-error/)
  })
  test('the worked Answers give each key with its own symbol', () => {
    const v = drawn(def)
    const answers = workedSolution(v, def)
      .sections.at(-1)!
      .lines.map((l) => l.tex)
    expect(answers.find((t) => t.startsWith('F = '))).toBeDefined()
    expect(answers).toHaveLength(v.key.length)
    v.key.forEach((key, i) => shows(answers[i]!, key.value))
  })
})

describe('turbojet with component efficiencies', () => {
  const e = { d: 0.95, c: 0.85, t: 0.9, n: 0.95 }
  const c = jet(260, 34.5e3, 233.15, 10, 1100, 45, e)
  const def = jetDef(
    { diffuserEfficiency: '0.95', compressorEfficiency: '0.85', turbineEfficiency: '0.9', nozzleEfficiency: '95 %' },
    [
      find('V6', 'totals.exitVelocity', 'm/s'),
      find('p2', 'states.2.p', 'kPa'),
      find('T6', 'states.6.T', 'K'),
      find('F', 'totals.thrust', 'N'),
    ],
  )
  test('keys and worked numbers with each efficiency in its place', () => {
    const v = drawn(def)
    near(keyOf(v, 'V6').value, c.V6)
    near(keyOf(v, 'p2').value, c.p2 / 1000)
    near(keyOf(v, 'T6').value, c.T6)
    near(keyOf(v, 'F').value, c.F)
    // h3 = h2 + (h3s − h2)/η_c ⇒ T3 (the number after the last "=")
    expect(line(v, def, 'h_3 = h_2 + ')).toMatch(/T_3 = /)
    shows(line(v, def, 'h_3 = h_2 + '), c.T3)
    shows(line(v, def, 'V_6 = \\sqrt'), c.V6)
    expect(line(v, def, 'h_{2s} = h_1 + \\eta_D')).toContain('0.9500')
    expect(line(v, def, 'h_{5s} = h_4 - ')).toContain('0.9000')
    expect(line(v, def, 'h_6 = h_5 - \\eta_N')).toContain('0.9500')
  })
})

// ---- Units: givens and answers in the templates' units ---------------------------------------

describe('units: km/h, m/s, ft/s, kN, kW, cm² draw, key and grade', () => {
  const V6find = find('V6', 'totals.exitVelocity', 'm/s')
  const Ffind = find('F', 'totals.thrust', 'kN')
  const Vkmh = find('V6kmh', 'totals.exitVelocity', 'km/h')
  const def = jetDef({}, [V6find, Ffind, Vkmh])
  const v = drawn(def)
  const grade = (f: Find, answer: string) =>
    gradeAnswer({ find: f, variant: v, answer, share: 1, latePenalty: 0 }).verdict
  test('a student answer in km/h or ft/s to a find in m/s is graded by its value', () => {
    const V = keyOf(v, 'V6').value
    expect(grade(V6find, `${(V * 3.6).toPrecision(5)} km/h`)).toBe('correct')
    expect(grade(V6find, `${(V / 0.3048).toPrecision(5)} ft/s`)).toBe('correct')
    expect(grade(V6find, `${V.toPrecision(5)} m/s`)).toBe('correct')
    // the number in m/s but written in km/h is 3.6 times too slow
    expect(grade(V6find, `${V.toPrecision(5)} km/h`)).toBe('incorrect')
    // and the other way round: a find in km/h answered in m/s
    expect(grade(Vkmh, `${V.toPrecision(5)} m/s`)).toBe('correct')
    expect(grade(Vkmh, `${V.toPrecision(5)} km/h`)).toBe('incorrect')
  })
  test('thrust in kN answered in N or lbf', () => {
    const F = keyOf(v, 'F').value
    expect(grade(Ffind, `${(F * 1000).toPrecision(5)} N`)).toBe('correct')
    // 1 lbf = 4.4482216152605 N (0.45359237 kg × 9.80665 m/s², exact)
    expect(grade(Ffind, `${((F * 1000) / 4.4482216152605).toPrecision(5)} lbf`)).toBe('correct')
    expect(grade(Ffind, `${F.toPrecision(5)} N`)).toBe('incorrect')
  })
  test('a unit of another dimension is refused before grading', () => {
    expect(precheckAnswer(V6find, '900 kg').ok).toBe(false)
    expect(precheckAnswer(V6find, '900 km/h').ok).toBe(true)
    expect(precheckAnswer(Ffind, '20 kW').ok).toBe(false)
  })
  test('givens in km/h, kg/s and cm² reach the solver as written', () => {
    const nz = problem(
      'nozzle',
      [given('V1', 'km/h', 108), given('A1', 'cm^2', 50)],
      { gas: 'air', p1: '300 kPa', T1: '500 K', V1: 'V1', p2: '250 kPa', inletArea: 'A1' },
      [find('mdot', 'totals.massFlow', 'kg/s'), find('Ekin', 'totals.kineticEnergyRate', 'kW')],
    )
    const w = drawn(nz)
    expect(w.spec).toMatchObject({ inputs: { V1: '108 km/h', inletArea: '50 cm^2' } })
    // ṁ = ρ1 A1 V1 with V1 = 30 m/s, A1 = 0.005 m²
    near(keyOf(w, 'mdot').value, (300e3 / (R * 500)) * 0.005 * 30)
    const T2 = 500 * (250 / 300) ** x
    near(keyOf(w, 'Ekin').value, (keyOf(w, 'mdot').value * cp * (500 - T2)) / 1000)
  })
})

// ---- Senses and pitfalls ---------------------------------------------------------------------

describe('senses: works have a convention sign, thrust and kinetic energy none', () => {
  const def = jetDef({}, [
    find('wcDev', 'devices.2.w', 'kJ/kg'),
    find('wcOn', 'devices.2.w', 'kJ/kg', { sense: 'work-on-system' }),
    find('wtBy', 'devices.4.w', 'kJ/kg', { sense: 'work-by-system' }),
    find('wcTotal', 'totals.compressorWork', 'kJ/kg', { sense: 'work-on-system' }),
    find('qb', 'devices.3.q', 'kJ/kg', { sense: 'heat-into-system' }),
  ])
  test.each([
    ['engineering', -1],
    ['chemistry', 1],
  ] as const)('%s course', (convention, sign) => {
    const v = drawn(def, convention)
    const wc = keyOf(v, 'wcTotal').value
    expect(wc).toBeGreaterThan(0)
    expect(Math.sign(keyOf(v, 'wcDev').value)).toBe(sign)
    near(keyOf(v, 'wcOn').value, wc)
    expect(keyOf(v, 'wcOn').flipped === true).toBe(convention === 'engineering')
    near(keyOf(v, 'wtBy').value, wc) // the turbine gives the compressor its work
    expect(keyOf(v, 'wtBy').flipped === true).toBe(convention === 'chemistry')
    expect(keyOf(v, 'wcTotal').flipped).toBeUndefined()
    expect(keyOf(v, 'qb').value).toBeGreaterThan(0)
  })
  test('which paths carry a sense', () => {
    expect(outputSense('devices.2.w', 'turbojet')).toEqual({ kind: 'convention-work' })
    expect(outputSense('devices.4.wRate', 'turbojet')).toEqual({ kind: 'convention-work' })
    expect(outputSense('devices.1.w', 'turbojet')).toBeNull() // the diffuser does no work
    expect(outputSense('totals.turbineWork', 'turbojet')).toEqual({ kind: 'fixed', sense: 'work-by-system' })
    for (const p of ['totals.thrust', 'totals.kineticEnergyGain', 'totals.propulsivePower', 'totals.netShaftWork'])
      expect(outputSense(p, 'turbojet')).toBeNull()
    expect(outputSense('totals.kineticEnergyChange', 'nozzle')).toBeNull()
    expect(outputSense('devices.1.w', 'nozzle')).toBeNull()
    expect(outputSense('totals.heatIn', 'nozzle')).toEqual({ kind: 'fixed', sense: 'heat-into-system' })
  })
  test('a sense on thrust or on kinetic energy is refused by the lint', () => {
    const bad = jetDef({}, [
      find('F', 'totals.thrust', 'kN', { sense: 'work-by-system' }),
      find('ke', 'totals.kineticEnergyGain', 'kJ/kg', { sense: 'work-by-system' }),
    ])
    const errs = senseErrors(bad)
    expect(errs.map((e) => e.path)).toEqual(['finds.0.sense', 'finds.1.sense'])
    expect(errs[0]!.message).toMatch(/A sense is for work and heat only/)
  })
  test('a nozzle’s heat loss with the sense "out of the system" is positive in both conventions', () => {
    const nz = problem(
      'nozzle',
      [],
      { gas: 'air', p1: '300 kPa', T1: '500 K', V1: '30 m/s', p2: '200 kPa', heatLoss: '3 kJ/kg' },
      [find('qloss', 'totals.heatIn', 'kJ/kg', { sense: 'heat-out-of-system' })],
    )
    for (const c of ['engineering', 'chemistry'] as const) near(keyOf(drawn(nz, c), 'qloss').value, 3)
  })
})

describe('pitfalls: the flow solver takes no slips (checked by re-solving)', () => {
  const def = jetDef({}, [
    find('wc', 'devices.2.w', 'kJ/kg'),
    find('F', 'totals.thrust', 'kN'),
    find('T3', 'states.3.T', 'K'),
  ])
  const SOLVER_SLIPS = [
    'celsius-for-kelvin',
    'cp-cv-swapped',
    'gamma-monatomic-diatomic-swapped',
    'log10-for-ln',
    'per-mole-vs-per-kg',
  ] as const
  test('no solver slip changes a key, though a °C temperature reaches the solver', () => {
    const v = drawn(def)
    expect(JSON.stringify(v.spec)).toMatch(/°C/)
    for (const path of ['devices.2.w', 'totals.thrust', 'states.3.T', 'totals.exitVelocity']) {
      const correct = readQuantity(v.solution, path)
      expect(correct).not.toBeNull()
      for (const id of SOLVER_SLIPS)
        for (const s of evaluateWithPitfall(v.spec, path, id)) expect(s, `${path} ${id}`).toBe(correct)
    }
  })
  test('the sign slip fires on the compressor’s work, and only the sign slip and a factor of 1000 are offered', () => {
    const v = drawn(def)
    expect(evaluateWithPitfall(v.spec, 'devices.2.w', 'sign-convention-flipped')).toEqual([
      -readQuantity(v.solution, 'devices.2.w')!,
    ])
    expect(applicablePitfalls(def, 0)).toEqual(['sign-convention-flipped', 'kilo-factor'])
    expect(applicablePitfalls(def, 1)).toEqual([])
    expect(applicablePitfalls(def, 2)).toEqual([])
    expect(whyPitfallCannotFire(def, 2, 'celsius-for-kelvin')).toMatch(/steady-flow solvers cannot make this slip/)
    // a student who gives the compressor work with the engineering sign in a chemistry course
    const withPitfall = { ...def.finds[0]!, pitfalls: ['sign-convention-flipped' as const] }
    const chem = drawn({ ...def, finds: [withPitfall] }, 'chemistry')
    const g = gradeAnswer({
      find: withPitfall,
      variant: chem,
      answer: `${(-keyOf(chem, 'wc').value).toPrecision(5)} kJ/kg`,
      share: 1,
      latePenalty: 0,
    })
    expect(g.verdict).toBe('incorrect')
    expect(g.pitfall?.id).toBe('sign-convention-flipped')
  })
})

// ---- Quantities ------------------------------------------------------------------------------

test('flow paths read as symbols and words', () => {
  const ctx = {
    convention: 'engineering' as const,
    flow: 'turbojet' as const,
    stateNames: ['1', '2', '3', '4', '5', '6'],
  }
  expect(quantityAtPath('totals.thrust', ctx)).toEqual({ tex: 'F', name: 'thrust' })
  expect(quantityAtPath('states.6.V', ctx)?.name).toBe('velocity at state 6')
  expect(quantityAtPath('states.3.mach', ctx)?.tex).toBe('M_{3}')
  expect(quantityAtPath('devices.2.w', ctx)).toEqual({
    tex: 'W_{c}',
    name: 'work done by the gas in the compressor, per kg',
  })
  expect(quantityAtPath('devices.2.w', { ...ctx, convention: 'chemistry' })?.tex).toBe('w_{c}')
  expect(quantityAtPath('totals.propulsiveEfficiency', ctx)?.tex).toBe('\\eta_{P}')
  expect(quantityAtPath('totals.efficiency', { convention: 'engineering', flow: 'nozzle' })?.tex).toBe('\\eta_{N}')
  expect(quantityAtPath('totals.massFlow', { convention: 'engineering', flow: 'diffuser' })?.name).toBe(
    'mass flow rate',
  )
  expect(quantityAtPath('totals.nothing', ctx)).toBeNull()
})

// ---- Diagrams ------------------------------------------------------------------------------

describe('diagrams: the T–s path of a turbojet and a nozzle, open and described', () => {
  test('ideal turbojet: five legs 1 → 6, isentropes vertical, the burner an isobar, no return to 1', () => {
    const v = drawn(jetDef({}, [find('V6', 'totals.exitVelocity', 'm/s')]))
    const sol = v.solution as FormattedTurbojet
    const d = cycleDiagrams(sol)
    expect(d.ph).toBeUndefined()
    expect(d.ts.points.map((p) => p.label)).toEqual(['1', '2', '3', '4', '5', '6'])
    expect(d.ts.curves.map((c) => `${c.from}-${c.to}`)).toEqual(['1-2', '2-3', '3-4', '4-5', '5-6'])
    expect(d.ts.curves.some((c) => c.from === '6')).toBe(false)
    for (const i of [0, 1, 3, 4]) {
      const c = d.ts.curves[i]!
      expect(c.style).toBe('solid')
      expect(c.process).toMatch(/isentropic/)
      const s0 = c.points[0]![0]
      for (const [s] of c.points) expect(Math.abs(s - s0)).toBeLessThan(1e-9 * Math.max(1, Math.abs(s0)))
    }
    const burner = d.ts.curves[2]!
    expect(burner.process).toBe('burner (isobaric heat addition)')
    for (let i = 1; i < burner.points.length; i++) {
      expect(burner.points[i]![0]).toBeGreaterThan(burner.points[i - 1]![0])
      expect(burner.points[i]![1]).toBeGreaterThan(burner.points[i - 1]![1])
    }
    // The points are the solved states: T in K, s in kJ/(kg·K)
    sol.states.forEach((st, i) => {
      expect(d.ts.points[i]!.y).toBe(st.T.value)
      expect(d.ts.points[i]!.x).toBeCloseTo(st.s.value / 1000, 12)
    })
    // P–v: the burner is horizontal
    const pvBurner = d.pv.curves[2]!
    for (const [, p] of pvBurner.points) expect(p).toBeCloseTo(sol.states[2]!.p.value / 1000, 9)
    const words = describePlot(d.ts)
    expect(d.ts.title).toMatch(/^T–s diagram — turbojet/)
    expect(words).toMatch(/open path from inlet state 1 to exit state 6, not a closed cycle/)
    expect(words).toMatch(/3 to 4, burner \(isobaric heat addition\)/)
    const html = renderToStaticMarkup(createElement(CycleDiagrams, { diagrams: d }))
    expect(html).toContain('<title')
    expect(html).toContain('not a closed cycle')
  })
  test('a compressor with losses is dashed; a nozzle is one leg', () => {
    const v = drawn(jetDef({ compressorEfficiency: '0.85' }, [find('V6', 'totals.exitVelocity', 'm/s')]))
    const d = cycleDiagrams(v.solution)
    expect(d.ts.curves[1]!.style).toBe('dashed')
    expect(d.ts.curves[1]!.process).toMatch(/irreversible/)
    expect(describePlot(d.ts)).toMatch(/Dashed lines/)
    const nz = drawn(
      problem('nozzle', [], { gas: 'air', p1: '300 kPa', T1: '500 K', V1: '30 m/s', p2: '200 kPa' }, [
        find('V2', 'totals.exitVelocity', 'm/s'),
      ]),
    )
    const dn = cycleDiagrams(nz.solution as FormattedDuct)
    expect(dn.ts.points).toHaveLength(2)
    expect(dn.ts.curves).toHaveLength(1)
    expect(dn.ts.curves[0]!.process).toBe('nozzle (isentropic expansion, the gas speeding up)')
    expect(dn.ts.curves[0]!.points[0]![1]).toBeGreaterThan(dn.ts.curves[0]!.points.at(-1)![1])
  })
})

// ---- Sweep and lint ---------------------------------------------------------------------------

describe('sweep and lint', () => {
  const ranged: ProblemDefinition = {
    ...jetDef({ compressorEfficiency: '0.85', turbineEfficiency: '0.9' }, [
      find('F', 'totals.thrust', 'kN'),
      find('etaP', 'totals.propulsiveEfficiency', ''),
    ]),
    givens: [
      { name: 'V1', label: 'flight speed', unit: 'km/h', rule: { kind: 'range', min: 700, max: 1000, step: 50 } },
      given('pa', 'kPa', 30),
      given('Ta', '°C', -45),
      { name: 'rp', label: 'pressure ratio', unit: '', rule: { kind: 'range', min: 6, max: 16, step: 2 } },
      { name: 'T4', label: 'turbine inlet', unit: 'K', rule: { kind: 'range', min: 1100, max: 1400, step: 50 } },
      given('mdot', 'kg/s', 50),
    ],
  }
  const seeds = Array.from({ length: 40 }, (_, i) => i + 1)
  test.each(['engineering', 'chemistry'] as const)('a sensible range sweeps clean (%s)', (convention) => {
    const s = sweepVariants(ranged, { seeds, convention })
    expect(s.failures).toEqual([])
    expect(s.checked).toBe(seeds.length)
  })
  test('the checks bite: a thermal efficiency above Carnot, an energy balance that does not close', () => {
    const r = drawVariant(ranged, 1, { convention: 'engineering' })
    if (!r.ok) throw new Error(r.error.message)
    const sol = r.variant.solution as FormattedTurbojet
    const tamperedJet: DrawResult = {
      ...r,
      variant: {
        ...r.variant,
        solution: { ...sol, totals: { ...sol.totals, thermalEfficiency: { value: 0.99, unit: '' } } },
      },
    }
    expect(checkVariantSanity(r)).toEqual([])
    expect(
      checkVariantSanity(tamperedJet)
        .map((f) => f.message)
        .join(' '),
    ).toMatch(/outside 0 to the Carnot bound/)
    const nz = drawVariant(
      problem('nozzle', [], { gas: 'air', p1: '300 kPa', T1: '500 K', V1: '30 m/s', p2: '200 kPa' }, [
        find('V2', 'totals.exitVelocity', 'm/s'),
      ]),
      1,
      { convention: 'engineering' },
    )
    if (!nz.ok) throw new Error(nz.error.message)
    const duct = nz.variant.solution as FormattedDuct
    const s2 = duct.states[1]!
    const tamperedDuct: DrawResult = {
      ...nz,
      variant: {
        ...nz.variant,
        solution: { ...duct, states: [duct.states[0]!, { ...s2, V: { value: s2.V.value * 1.1, unit: 'm/s' } }] },
      },
    }
    expect(checkVariantSanity(nz)).toEqual([])
    expect(checkVariantSanity(tamperedDuct)[0]?.message).toMatch(/energy balance does not close/)
  })
  test('the lint: a clean turbojet problem, and thrust asked without a flow rate', () => {
    expect(lintDefinition(ranged)).toEqual([])
    const noFlow = problem(
      'turbojet',
      [],
      {
        flightSpeed: '250 m/s',
        ambientPressure: '30 kPa',
        ambientTemperature: '230 K',
        pressureRatio: '10',
        turbineInletT: '1200 K',
      },
      [find('F', 'totals.thrust', 'kN')],
    )
    const issues = lintDefinition(noFlow)
    expect(issues).toHaveLength(1)
    expect(issues[0]!.path).toBe('finds.0.source.path')
    expect(issues[0]!.message).toMatch(/thrust and powers need the massFlow input/)
  })
})
