import { describe, expect, test } from 'vitest'
import { R_MOLAR } from '../constants.ts'
import { solveCycle } from '../cycle.ts'
import { parseGas } from '../spec.ts'
import { templates } from '../templates/index.ts'
import type { Gas } from './gas.ts'
import { nasa7Gas } from './nasa7.ts'
import type { Nasa7Set } from './nasa7.ts'
import { cpPoly, hPoly, minCpOnRange, polynomialCpGas, sPoly } from './polynomial-cp.ts'
import { gasPreset } from './presets.ts'

// Air, Çengel & Boles (Thermodynamics, 8th ed.), Table A-2c (from memory): cp in kJ/(kmol·K),
// a = 28.11, b = 0.1967e-2, c = 0.4802e-5, d = −1.966e-9, valid 273–1800 K, M = 28.97 kg/kmol.
const AIR_A2C = [28.11, 0.1967e-2, 0.4802e-5, -1.966e-9] as const
const airSpec = {
  cpPolynomial: {
    a: 28.11,
    b: 0.1967e-2,
    c: 0.4802e-5,
    d: -1.966e-9,
    unit: 'kJ/(kmol K)',
    Tmin: '273 K',
    Tmax: '1800 K',
  },
  molarMass: '28.97 g/mol',
}

function gasOf(raw: unknown): Gas {
  const r = parseGas(raw)
  if (!r.ok) throw new Error(r.error.message)
  return r.value
}

function simpson(f: (x: number) => number, a: number, b: number, n = 2000): number {
  const h = (b - a) / n
  let s = f(a) + f(b)
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(a + i * h)
  return (s * h) / 3
}

describe('exact integrals of cp(T)', () => {
  const k = AIR_A2C
  test.each([
    [300, 1000],
    [273, 1800],
    [500, 520],
  ])('h and s° from %d K to %d K agree with Simpson quadrature to 1e-10', (T1, T2) => {
    const dh = hPoly(k, T2) - hPoly(k, T1)
    const ds = sPoly(k, T2) - sPoly(k, T1)
    expect(Math.abs(dh / simpson((T) => cpPoly(k, T), T1, T2) - 1)).toBeLessThan(1e-10)
    expect(Math.abs(ds / simpson((T) => cpPoly(k, T) / T, T1, T2) - 1)).toBeLessThan(1e-10)
  })

  test('the parsed gas has cp, h and s° of the polynomial on the per-mole basis (kJ/kmol = J/mol)', () => {
    const g = gasOf(airSpec)
    expect(g.basis).toBe('mole')
    expect(g.R).toBe(R_MOLAR)
    expect(g.cp(500)).toBeCloseTo(cpPoly(AIR_A2C, 500), 12)
    expect(g.h(900) - g.h(400)).toBeCloseTo(
      simpson((T) => cpPoly(AIR_A2C, T), 400, 900),
      6,
    )
    expect(g.u(900) - g.u(400)).toBeCloseTo(
      simpson((T) => cpPoly(AIR_A2C, T) - R_MOLAR, 400, 900),
      6,
    )
    expect(g.TfromH(g.h(1234.5))).toBeCloseTo(1234.5, 7)
    expect(g.TfromU(g.u(456.7))).toBeCloseTo(456.7, 7)
  })

  test('per-kg basis: coefficients divided by M, R = R_molar/M', () => {
    const g = gasOf({ ...airSpec, basis: 'mass' })
    expect(g.basis).toBe('mass')
    expect(g.R).toBeCloseTo(R_MOLAR / 0.02897, 9)
    expect(g.cp(300)).toBeCloseTo(cpPoly(AIR_A2C, 300) / 0.02897, 9)
    // a per-kg polynomial (cp = 1.005 kJ/(kg K) flat) with R given
    const flat = gasOf({
      cpPolynomial: { a: 1.005, unit: 'kJ/(kg K)', Tmin: '200 K', Tmax: '2000 K' },
      R: '0.287 kJ/(kg K)',
    })
    expect(flat.cp(700)).toBeCloseTo(1005, 9)
    expect(flat.isentropicTfromP(300, 100e3, 800e3)).toBeCloseTo(300 * Math.pow(8, 0.287 / 1.005), 7)
  })
})

describe('textbook example', () => {
  // Çengel & Boles, Thermodynamics (8th ed.), Example 4-7 "Evaluation of the Δu of an ideal gas"
  // (from memory): air heated from 300 K to 600 K; with the Table A-2c cp(T) polynomial
  // Δū = 6447 kJ/kmol, Δu = 6447/28.97 = 222.5 kJ/kg. Tolerance 0.1 % (the book rounds).
  test('Çengel & Boles 8th ed. Example 4-7(b), from memory', () => {
    const mol = gasOf(airSpec)
    expect(Math.abs((mol.u(600) - mol.u(300)) / 6447 - 1)).toBeLessThan(1e-3)
    const kg = gasOf({ ...airSpec, basis: 'mass' })
    expect(Math.abs((kg.u(600) - kg.u(300)) / 222.5e3 - 1)).toBeLessThan(1e-3)
  })
})

describe('against the NASA-7 route for the same gas', () => {
  // A NASA set whose polynomial is this cubic (a4 = 0, one range) describes the same gas: the two
  // routes must give the same differences of h and s°, and the same isentropic end states.
  const k = AIR_A2C.map((x) => x / R_MOLAR) // cp/R coefficients per K^n
  const set: Nasa7Set = {
    id: 'cubic',
    label: 'cubic',
    molarMass: 0.02897,
    Tmin: 273,
    Tmid: 1e9,
    Tmax: 1800,
    low: [k[0]!, k[1]!, k[2]!, k[3]!, 0, 123, -4.5],
    high: [k[0]!, k[1]!, k[2]!, k[3]!, 0, 123, -4.5],
    source: 'test',
  }
  const nasa = nasa7Gas(set, 'mole')
  const poly = gasOf(airSpec)
  test.each([
    [300, 1100],
    [280, 1750],
  ])('%d K → %d K', (T1, T2) => {
    expect((poly.h(T2) - poly.h(T1)) / (nasa.h(T2) - nasa.h(T1))).toBeCloseTo(1, 12)
    expect((poly.sT(T2) - poly.sT(T1)) / (nasa.sT(T2) - nasa.sT(T1))).toBeCloseTo(1, 12)
    expect(poly.isentropicTfromP(T1, 100e3, 900e3)).toBeCloseTo(nasa.isentropicTfromP(T1, 100e3, 900e3), 7)
    expect(poly.isentropicTfromV(T2, 1, 8)).toBeCloseTo(nasa.isentropicTfromV(T2, 1, 8), 7)
    expect(poly.isentropicPressureRatio(T1, T2)).toBeCloseTo(nasa.isentropicPressureRatio(T1, T2), 6)
  })

  test('the Table A-2c air polynomial is within 1 % of the NASA dry-air cp on 300–1800 K (the table states 0.72 % max error)', () => {
    const dry = gasPreset('nasa:dry-air')
    if (!dry.ok) throw new Error(dry.error.message)
    for (let T = 300; T <= 1800; T += 50) expect(Math.abs(poly.cp(T) / dry.gas.cp(T) - 1)).toBeLessThan(0.01)
  })
})

describe('cycles with a cp(T) polynomial gas', () => {
  test('Brayton cycle: energy balance to 1e-9 and within 1 % of NASA dry air', () => {
    const inputs = { p1: '100 kPa', T1: '300 K', pressureRatio: 8, turbineInletT: '1300 K' }
    const a = templates.brayton!.solve({ gas: airSpec, ...inputs })
    const b = templates.brayton!.solve({ gas: 'nasa:dry-air', ...inputs })
    if (!a.ok) throw new Error(a.error.message)
    if (!b.ok) throw new Error(b.error.message)
    const scale = a.totals.qIn
    for (const st of a.steps) expect(Math.abs(st.dh - st.q - st.w)).toBeLessThan(1e-9 * scale)
    expect(Math.abs(a.steps.reduce((s, x) => s + x.q, 0) + a.totals.wNet)).toBeLessThan(1e-9 * scale)
    expect(Math.abs(a.totals.dsCycle)).toBeLessThan(1e-9 * Math.abs(a.steps[1]!.ds))
    expect(Math.abs(a.totals.efficiency! / b.totals.efficiency! - 1)).toBeLessThan(0.01)
  })

  test('a state outside the stated range is refused with the range in the message', () => {
    const r = templates.otto!.solve({ gas: airSpec, p1: '100 kPa', T1: '300 K', compressionRatio: 8, T3: '2200 K' })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(/273–1800 K/)
    const low = templates.otto!.solve({ gas: airSpec, p1: '100 kPa', T1: '250 K', compressionRatio: 8, T3: '1500 K' })
    expect(low.ok).toBe(false)
    if (!low.ok) expect(low.error.message).toMatch(/outside the range/)
  })
})

describe('bad polynomials give clear messages, never a throw', () => {
  const P = airSpec.cpPolynomial
  test.each([
    [{ cpPolynomial: { ...P, a: 5 } }, /cp = .* is not above R/],
    // a cubic that dips below R only inside the range (minimum at T = 1000 K, cp = 8 J/(mol K))
    [
      {
        cpPolynomial: {
          a: 8 + 1e-6 * 1e6,
          b: -2 * 1e-6 * 1000,
          c: 1e-6,
          unit: 'J/(mol K)',
          Tmin: '300 K',
          Tmax: '1800 K',
        },
      },
      /at 1000 K is not above R/,
    ],
    [{ cpPolynomial: { ...P, Tmax: '200 K' } }, /Tmax .* must be above Tmin/],
    [{ cpPolynomial: { ...P, Tmin: undefined } }, /Tmin is required/],
    [{ cpPolynomial: { ...P, unit: 'kPa' } }, /unit/],
    [{ cpPolynomial: { ...P, unit: undefined } }, /unit must name the unit/],
    [{ cpPolynomial: { ...P, b: '0.002' } }, /b must be a number/],
    [{ cpPolynomial: { ...P, e: 1 } }, /unknown key "e"/],
    [{ cpPolynomial: 'x' }, /must be an object/],
    [
      { cpPolynomial: { a: 1.0, unit: 'kJ/(kg K)', Tmin: '300 K', Tmax: '1000 K' } },
      /needs the gas constant R or the molar mass/,
    ],
    [{ cpPolynomial: P, basis: 'mass' }, /give gas.molarMass/],
  ])('%o', (raw, msg) => {
    const r = parseGas(raw)
    expect(r.ok).toBe(false)
    if (!r.ok) {
      expect(['invalid-gas', 'wrong-dimension']).toContain(r.error.code)
      expect(r.error.message).toMatch(msg)
    }
  })

  test('minCpOnRange finds an interior minimum', () => {
    const m = minCpOnRange([8 + 1, -2e-3, 1e-6, 0], 300, 1800)
    expect(m.T).toBeCloseTo(1000, 9)
    expect(m.cp).toBeCloseTo(8, 12)
    expect(polynomialCpGas({ basis: 'mole', coeffs: [9, -2e-3, 1e-6, 0], Tmin: 300, Tmax: 1800 }).ok).toBe(false)
    // lifted by 0.5 J/(mol K) the minimum, 8.5, is above R = 8.314
    expect(polynomialCpGas({ basis: 'mole', coeffs: [9.5, -2e-3, 1e-6, 0], Tmin: 300, Tmax: 1800 }).ok).toBe(true)
  })

  test('the solver never throws on a cycle step that leaves the range mid-way', () => {
    const g = gasOf({ cpPolynomial: { ...P, Tmax: '600 K' }, molarMass: '28.97 g/mol' })
    const r = solveCycle({
      gas: g,
      system: 'closed',
      states: [{ p: 100e3, T: 300 }, {}, { T: 590 }, {}],
      steps: [
        { process: 'isentropic', volumeRatio: 1 / 10 },
        { process: 'isochoric' },
        { process: 'isentropic' },
        { process: 'isochoric' },
      ],
    })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(/273–600 K|outside/)
  })
})
