import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { createElement } from 'react'
import { renderToStaticMarkup } from 'react-dom/server'
import { describe, expect, test } from 'vitest'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { NOT_IN_BANK, solveBankSpec } from '#app/domain/thermo/index.ts'
import type { FormattedSolution } from '#app/domain/thermo/index.ts'
import { saturationTemperature } from '#app/domain/thermo/steam/index.ts'
import { cycleDiagrams, describePlot } from './diagrams.ts'
import type { BankSolution } from './solution-kind.ts'
import type { Curve, Plot } from './diagrams.ts'

const examples = join(import.meta.dirname, '../../../docs/examples')
const readExample = (name: string) =>
  JSON.parse(readFileSync(join(examples, `${name}.json`), 'utf8')) as Record<string, unknown>

function solved(spec: unknown): BankSolution {
  const r = solveBankSpec(spec)
  if (!r.ok) throw new Error(`example did not solve: ${r.error.message}`)
  return r
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300)

function point(plot: Plot, label: string) {
  const p = plot.points.find((q) => q.label === label)
  if (!p) throw new Error(`no state ${label}`)
  return p
}

function expectEndsAtStates(plot: Plot) {
  expect(plot.curves.length).toBeGreaterThan(0)
  for (const c of plot.curves) {
    const a = point(plot, c.from)
    const b = point(plot, c.to)
    const first = c.points[0]!
    const last = c.points[c.points.length - 1]!
    expect(rel(first[0], a.x), `${plot.title} ${c.from}→${c.to} start x`).toBeLessThanOrEqual(1e-9)
    expect(rel(first[1], a.y), `${plot.title} ${c.from}→${c.to} start y`).toBeLessThanOrEqual(1e-9)
    expect(rel(last[0], b.x), `${plot.title} ${c.from}→${c.to} end x`).toBeLessThanOrEqual(1e-9)
    expect(rel(last[1], b.y), `${plot.title} ${c.from}→${c.to} end y`).toBeLessThanOrEqual(1e-9)
  }
}

function allNumbers(plot: Plot): number[] {
  const out = [plot.x.min, plot.x.max, plot.y.min, plot.y.max]
  for (const c of plot.curves) for (const [x, y] of c.points) out.push(x, y)
  for (const p of plot.points) out.push(p.x, p.y)
  for (const [x, y] of plot.dome?.points ?? []) out.push(x, y)
  return out
}

const curve = (plot: Plot, from: string, to: string): Curve => {
  const c = plot.curves.find((k) => k.from === from && k.to === to)
  if (!c) throw new Error(`no curve ${from}→${to}`)
  return c
}

describe('ideal-gas cycles', () => {
  const otto = cycleDiagrams(solved(readExample('otto')))

  test('every Otto curve starts and ends at its states, in both diagrams', () => {
    expectEndsAtStates(otto.pv)
    expectEndsAtStates(otto.ts)
  })

  test('Otto diagrams use the mass basis units and one curve per step, 24–40 points each', () => {
    expect(otto.pv.x.unit).toBe('m³/kg')
    expect(otto.pv.y.unit).toBe('kPa')
    expect(otto.ts.x.unit).toBe('kJ/(kg·K)')
    expect(otto.pv.curves.map((c) => c.process)).toEqual(['isentropic', 'isochoric', 'isentropic', 'isochoric'])
    for (const c of [...otto.pv.curves, ...otto.ts.curves]) {
      expect(c.points.length).toBeGreaterThanOrEqual(24)
      expect(c.points.length).toBeLessThanOrEqual(40)
    }
  })

  test('axes cover every point with some padding', () => {
    for (const plot of [otto.pv, otto.ts]) {
      for (const c of plot.curves) {
        for (const [x, y] of c.points) {
          expect(x).toBeGreaterThan(plot.x.min)
          expect(x).toBeLessThan(plot.x.max)
          expect(y).toBeGreaterThan(plot.y.min)
          expect(y).toBeLessThan(plot.y.max)
        }
      }
    }
  })

  // Air as {R = 287 J/(kg K), γ = 1.4}: the textbook constant-cp model (common practice).
  const spec = readExample('otto')
  const air14 = {
    ...spec,
    inputs: { ...(spec.inputs as object), gas: { basis: 'mass', R: '287 J/(kg K)', gamma: '1.4' } },
  }
  const d14 = cycleDiagrams(solved(air14))

  test('isentropic P–v curves satisfy p v^γ = const (Poisson relation, common practice)', () => {
    for (const c of d14.pv.curves.filter((k) => k.process === 'isentropic')) {
      const [v0, p0] = c.points[0]!
      const k0 = p0 * Math.pow(v0, 1.4)
      for (const [v, p] of c.points) expect(rel(p * Math.pow(v, 1.4), k0)).toBeLessThan(1e-9)
      // and not merely a straight line: the middle point lies below the chord (convex curve)
      const [vm, pm] = c.points[Math.floor(c.points.length / 2)]!
      const [v1, p1] = c.points[c.points.length - 1]!
      expect(pm).toBeLessThan(p0 + ((p1 - p0) * (vm - v0)) / (v1 - v0))
    }
  })

  test('isochoric T–s curves satisfy T = T1 exp((s − s1)/cv) with cv = R/(γ − 1) (ideal-gas entropy, common practice)', () => {
    const cv = 0.287 / 0.4 // kJ/(kg K), the plotting unit
    const iso = d14.ts.curves.filter((k) => k.process === 'isochoric')
    expect(iso).toHaveLength(2)
    for (const c of iso) {
      const [s1, T1] = c.points[0]!
      for (const [s, T] of c.points) expect(rel(T, T1 * Math.exp((s - s1) / cv))).toBeLessThan(1e-9)
    }
  })

  test('isentropic steps are vertical in T–s', () => {
    for (const c of d14.ts.curves.filter((k) => k.process === 'isentropic')) {
      for (const [s] of c.points) expect(rel(s, c.points[0]![0])).toBeLessThan(1e-9)
    }
  })

  test('a Carnot cycle is a rectangle in T–s, and its isotherms are p v = const in P–v (ideal gas, common practice)', () => {
    const carnot = cycleDiagrams(solved(readExample('carnot-engine')))
    expect(carnot.ts.x.unit).toBe('J/(mol·K)')
    expect(carnot.pv.x.unit).toBe('m³/mol')
    expect(carnot.ts.curves).toHaveLength(4)
    const kinds = carnot.ts.curves.map((c) => {
      const [x0, y0] = c.points[0]!
      const horizontal = c.points.every(([, y]) => rel(y, y0) < 1e-9)
      const vertical = c.points.every(([x]) => Math.abs(x - x0) < 1e-9 * Math.max(1, Math.abs(x0)))
      return horizontal && !vertical ? 'h' : vertical && !horizontal ? 'v' : 'other'
    })
    expect(kinds).toEqual(['h', 'v', 'h', 'v'])
    // opposite sides have equal extents: the entropy change of the two isotherms is equal and opposite
    const width = (c: Curve) => c.points[c.points.length - 1]![0] - c.points[0]![0]
    expect(rel(width(carnot.ts.curves[0]!), -width(carnot.ts.curves[2]!))).toBeLessThan(1e-9)
    for (const c of carnot.pv.curves.filter((k) => k.process === 'isothermal')) {
      const [v0, p0] = c.points[0]!
      for (const [v, p] of c.points) expect(rel(p * v, p0 * v0)).toBeLessThan(1e-9)
    }
  })

  test('an adiabatic step with efficiency below one is a dashed straight segment', () => {
    const b = cycleDiagrams(solved(readExample('brayton')))
    const comp = curve(b.ts, '1', '2')
    expect(comp.style).toBe('dashed')
    expect(comp.process).toMatch(/irreversible/)
    const [[x0, y0], [x1, y1]] = [comp.points[0]!, comp.points[comp.points.length - 1]!]
    for (const [x, y] of comp.points)
      expect(Math.abs((x - x0) * (y1 - y0) - (y - y0) * (x1 - x0))).toBeLessThan(
        1e-9 * Math.abs((x1 - x0) * (y1 - y0)) + 1e-12,
      )
    expect(curve(b.ts, '2', '3').style).toBe('solid')
    expectEndsAtStates(b.pv)
    expectEndsAtStates(b.ts)
  })

  test('regenerator steps are dashed and follow their isobar', () => {
    const b = cycleDiagrams(solved(readExample('brayton-regenerative')))
    const reg = b.pv.curves.filter((c) => c.process.startsWith('regenerator'))
    expect(reg).toHaveLength(2)
    for (const c of reg) {
      expect(c.style).toBe('dashed')
      for (const [, p] of c.points) expect(rel(p, c.points[0]![1])).toBeLessThan(1e-9)
    }
    expectEndsAtStates(b.ts)
  })
})

describe('Rankine cycles', () => {
  const ideal = cycleDiagrams(solved(readExample('rankine-ideal')))

  test('P–v is on log–log axes and says so', () => {
    expect(ideal.pv.x.scale).toBe('log')
    expect(ideal.pv.y.scale).toBe('log')
    expect(ideal.pv.x.label).toMatch(/log/)
    expect(ideal.pv.y.label).toMatch(/log/)
    expect(ideal.ts.x.unit).toBe('kJ/(kg·K)')
  })

  test('the dome tops out at the critical point, 647.096 K and 22.064 MPa (IAPWS-IF97 constants)', () => {
    const ts = ideal.ts.dome!.points
    const pv = ideal.pv.dome!.points
    expect(ts.length).toBeGreaterThanOrEqual(50)
    expect(Math.max(...ts.map(([, T]) => T))).toBeCloseTo(647.096, 9)
    expect(Math.max(...pv.map(([, p]) => p))).toBeCloseTo(22064, 3)
    // s at the critical point, about 4.41 kJ/(kg K) (IAPWS steam tables, from memory)
    const top = ts.find(([, T]) => T === Math.max(...ts.map(([, t]) => t)))!
    expect(top[0]).toBeGreaterThan(4.3)
    expect(top[0]).toBeLessThan(4.5)
    // starts near the triple point: 0.611 kPa, 273.16 K (IAPWS, from memory)
    expect(Math.min(...pv.map(([, p]) => p))).toBeCloseTo(0.6117, 3)
    expect(Math.min(...ts.map(([, T]) => T))).toBeCloseTo(273.16, 6)
  })

  test('the condenser curve lies at the saturation temperature for its pressure', () => {
    const cond = ideal.ts.curves.find((c) => c.process.startsWith('condenser'))!
    expect(cond).toBeDefined()
    const Ts = saturationTemperature(75e3)
    if (!Ts.ok) throw new Error(Ts.error.message)
    // T_sat(75 kPa) = 91.76 °C (steam tables, e.g. Çengel & Boles Table A-5, from memory)
    expect(Ts.value - 273.15).toBeCloseTo(91.76, 1)
    for (const [, T] of cond.points) expect(Math.abs(T - Ts.value)).toBeLessThan(1e-6)
  })

  test('the boiler isobar runs through the IF97 states: liquid heating, evaporation at T_sat, superheating', () => {
    const boiler = ideal.ts.curves.find((c) => c.process.startsWith('boiler'))!
    const Ts = saturationTemperature(3e6)
    if (!Ts.ok) throw new Error(Ts.error.message)
    // T_sat(3 MPa) = 233.85 °C (steam tables, Çengel & Boles Table A-5, from memory)
    expect(Ts.value - 273.15).toBeCloseTo(233.85, 1)
    const plateau = boiler.points.filter(([, T]) => Math.abs(T - Ts.value) < 1e-6)
    expect(plateau.length).toBeGreaterThanOrEqual(5)
    // s_f and s_g at 3 MPa: 2.6455 and 6.1856 kJ/(kg K) (Çengel & Boles Table A-5, from memory)
    expect(Math.min(...plateau.map(([s]) => s))).toBeCloseTo(2.6455, 3)
    expect(Math.max(...plateau.map(([s]) => s))).toBeCloseTo(6.1856, 3)
    // monotonic: T never falls as s grows along a heating isobar
    for (let i = 1; i < boiler.points.length; i++) {
      expect(boiler.points[i]![0]).toBeGreaterThanOrEqual(boiler.points[i - 1]![0])
      expect(boiler.points[i]![1]).toBeGreaterThanOrEqual(boiler.points[i - 1]![1] - 1e-9)
    }
  })

  test('pump and ideal turbine are vertical in T–s; every curve ends at its states', () => {
    for (const c of ideal.ts.curves.filter((k) => /pump|turbine/.test(k.process))) {
      expect(c.style).toBe('solid')
      for (const [s] of c.points) expect(Math.abs(s - c.points[0]![0])).toBeLessThan(1e-9)
    }
    expectEndsAtStates(ideal.pv)
    expectEndsAtStates(ideal.ts)
  })

  test('non-ideal pump and turbine are dashed', () => {
    const actual = cycleDiagrams(solved(readExample('rankine-actual')))
    const dashed = actual.ts.curves.filter((c) => c.style === 'dashed').map((c) => c.process)
    expect(dashed.some((p) => p.startsWith('turbine'))).toBe(true)
    expectEndsAtStates(actual.ts)
  })

  test('reheat and open feedwater heater: the right devices, and the bled steam drawn to the heater', () => {
    const reheat = cycleDiagrams(solved(readExample('rankine-reheat')))
    expect(reheat.ts.curves.map((c) => c.process.split(' (')[0])).toEqual([
      'pump',
      'boiler',
      'turbine',
      'reheater',
      'turbine',
      'condenser',
    ])
    const regen = cycleDiagrams(solved(readExample('rankine-regenerative')))
    expect(regen.ts.curves.map((c) => c.process.split(' (')[0])).toEqual([
      'pump',
      'open feedwater heater',
      'pump',
      'boiler',
      'turbine',
      'turbine',
      'condenser',
      'bleed steam to the open feedwater heater',
    ])
    const bleed = curve(regen.ts, '6', '3')
    expect(bleed.style).toBe('dashed')
    expectEndsAtStates(regen.ts)
    expectEndsAtStates(regen.pv)
  })
})

describe('robustness', () => {
  // Every example a bank problem can be built on (the combined cycle is not one yet).
  const files = readdirSync(examples)
    .filter((f) => f.endsWith('.json'))
    .filter((f) => {
      const r = solveBankSpec(JSON.parse(readFileSync(join(examples, f), 'utf8')))
      return r.ok || r.error.code !== NOT_IN_BANK
    })
  test('the examples drawn include every ideal-gas and Rankine example', () => {
    expect(files.length).toBeGreaterThanOrEqual(15)
  })

  test.each(files)('%s: no NaN or infinity anywhere in the plot data', (f) => {
    const d = cycleDiagrams(solved(JSON.parse(readFileSync(join(examples, f), 'utf8'))))
    for (const plot of [d.pv, d.ts]) {
      expect(plot.curves.length).toBeGreaterThan(0)
      for (const x of allNumbers(plot)) expect(Number.isFinite(x)).toBe(true)
      expect(plot.x.max).toBeGreaterThan(plot.x.min)
      expect(plot.y.max).toBeGreaterThan(plot.y.min)
    }
  })

  test('degenerate steps give straight segments and a broken state is left out, without throwing', () => {
    const base = solved(readExample('otto')) as FormattedSolution
    const s1 = base.states[0]!
    const broken = { ...base.states[2]!, T: { value: Number.NaN, unit: 'K' } }
    const weird: FormattedSolution = {
      ...base,
      states: [s1, { ...s1, name: '2' }, broken, base.states[3]!],
      steps: base.steps,
    }
    const d = cycleDiagrams(weird)
    for (const plot of [d.pv, d.ts]) {
      for (const x of allNumbers(plot)) expect(Number.isFinite(x)).toBe(true)
      expect(plot.points.map((p) => p.label)).toEqual(['1', '2', '4'])
      // steps touching the broken state 3 are dropped; 1→2 (same state twice) is a point-like segment
      expect(plot.curves.map((c) => `${c.from}${c.to}`)).toEqual(['12', '41'])
    }
    expect(cycleDiagrams({} as FormattedSolution).pv.curves).toEqual([])
    expect(cycleDiagrams(null as unknown as FormattedSolution).ts.points).toEqual([])
  })

  test('the description names every state and process', () => {
    const d = cycleDiagrams(solved(readExample('otto')))
    const text = describePlot(d.ts)
    for (const p of d.ts.points) expect(text).toContain(`${p.label} (s = `)
    expect(text).toContain('2 to 3, isochoric (heat addition)')
  })
})

describe('rendering', () => {
  test('both diagrams render as accessible SVG with one path per curve', () => {
    const d = cycleDiagrams(solved(readExample('rankine-regenerative')))
    const html = renderToStaticMarkup(
      createElement(CycleDiagrams, { diagrams: d, caption: 'Regenerative Rankine cycle' }),
    )
    expect(html.match(/role="img"/g)).toHaveLength(2)
    expect(html.match(/<desc id="[^"]+">/g)).toHaveLength(2)
    expect(html).toContain(`<title id=`)
    expect(html).toContain('T–s diagram')
    expect(html.match(/<path /g)).toHaveLength(d.pv.curves.length + d.ts.curves.length)
    expect(html).toContain('stroke-dasharray="6 4"')
    expect(html.match(/data-dome=""/g)).toHaveLength(2)
    expect(html).toContain('<figcaption')
    expect(html).not.toContain('NaN')
    // aria-labelledby points at the title and desc ids that exist
    for (const m of html.matchAll(/aria-labelledby="([^"]+)"/g))
      for (const id of m[1]!.split(' ')) expect(html).toContain(`id="${id}"`)
  })
})
