import { describe, expect, test } from 'vitest'
import { R_MOLAR } from '../constants.ts'
import { cpOverR, DRY_AIR_NASA, hOverR, nasa7Gas, sOverR, speciesSet } from './nasa7.ts'
import type { Nasa7SpeciesId } from './nasa7-data.ts'

// NIST-JANAF Thermochemical Tables, 4th ed. (Chase 1998), tables for N2 (ref. state), O2 (ref.
// state), Ar (ref. state), CO2 and H2O (ideal gas). Values FROM MEMORY; cp and S° in J/(mol·K),
// H − H(298.15) in kJ/mol. Tolerance 0.1 % (the polynomials fit the tables to about that).
const JANAF: Record<Nasa7SpeciesId, { cp298: number; s298: number; cp1000: number; s1000: number; dh1000: number }> = {
  N2: { cp298: 29.124, s298: 191.609, cp1000: 32.697, s1000: 228.17, dh1000: 21.463 },
  O2: { cp298: 29.376, s298: 205.147, cp1000: 34.87, s1000: 243.578, dh1000: 22.703 },
  Ar: { cp298: 20.786, s298: 154.845, cp1000: 20.786, s1000: 179.999, dh1000: 14.589 },
  CO2: { cp298: 37.129, s298: 213.795, cp1000: 54.308, s1000: 269.299, dh1000: 33.397 },
  H2O: { cp298: 33.59, s298: 188.834, cp1000: 41.268, s1000: 232.738, dh1000: 26.0 },
}

describe.each(Object.keys(JANAF) as Nasa7SpeciesId[])('NASA-7 %s against JANAF', (id) => {
  const c = speciesSet(id)
  const ref = JANAF[id]
  test('cp at 298.15 K and 1000 K', () => {
    expect(Math.abs(cpOverR(c, 298.15) * R_MOLAR - ref.cp298) / ref.cp298).toBeLessThan(1e-3)
    expect(Math.abs(cpOverR(c, 1000) * R_MOLAR - ref.cp1000) / ref.cp1000).toBeLessThan(1e-3)
  })
  test('s° at 298.15 K and 1000 K', () => {
    expect(Math.abs(sOverR(c, 298.15) * R_MOLAR - ref.s298) / ref.s298).toBeLessThan(1e-3)
    expect(Math.abs(sOverR(c, 1000) * R_MOLAR - ref.s1000) / ref.s1000).toBeLessThan(1e-3)
  })
  test('h(1000 K) − h(298.15 K)', () => {
    const dh = ((hOverR(c, 1000) - hOverR(c, 298.15)) * R_MOLAR) / 1000
    expect(Math.abs(dh - ref.dh1000) / ref.dh1000).toBeLessThan(1e-3)
  })
  test('the two ranges join at 1000 K (continuity of cp, h, s°)', () => {
    const lo = { ...c, Tmid: 1e9 } // forces the low range
    const hi = { ...c, Tmid: 0 }
    expect(cpOverR(lo, 1000)).toBeCloseTo(cpOverR(hi, 1000), 3)
    expect(hOverR(lo, 1000)).toBeCloseTo(hOverR(hi, 1000), 0)
    expect(sOverR(lo, 1000)).toBeCloseTo(sOverR(hi, 1000), 3)
  })
})

test('enthalpies of formation at 298.15 K match JANAF (CO2 −393.52, H2O(g) −241.83 kJ/mol, from memory)', () => {
  expect((hOverR(speciesSet('CO2'), 298.15) * R_MOLAR) / 1000).toBeCloseTo(-393.52, 1)
  expect((hOverR(speciesSet('H2O'), 298.15) * R_MOLAR) / 1000).toBeCloseTo(-241.83, 1)
})

test('dry-air mixture: M ≈ 28.965 g/mol and cp(300 K) ≈ 1.005 kJ/(kg·K) (Çengel & Boles Table A-2, from memory)', () => {
  expect(DRY_AIR_NASA.molarMass * 1000).toBeCloseTo(28.965, 2)
  const air = nasa7Gas(DRY_AIR_NASA, 'mass')
  expect(air.cp(300) / 1000).toBeCloseTo(1.005, 2)
  expect(air.R).toBeCloseTo(287.0, 0)
})

test('isentropic end state solves s°(T2) − s°(T1) = R ln(p2/p1) (definition; Brent root)', () => {
  const g = nasa7Gas(speciesSet('N2'), 'mole')
  const T2 = g.isentropicTfromP(300, 1e5, 1e6)
  expect(g.sT(T2) - g.sT(300)).toBeCloseTo(g.R * Math.log(10), 8)
  const T3 = g.isentropicTfromV(300, 1, 0.1)
  // along an isentrope s°(T) − R ln T + R ln v is constant (p = RT/v)
  expect(g.sT(T3) - g.R * Math.log(T3) + g.R * Math.log(0.1)).toBeCloseTo(g.sT(300) - g.R * Math.log(300), 8)
  expect(g.TfromH(g.h(1234.5))).toBeCloseTo(1234.5, 6)
  expect(g.TfromU(g.u(456.7))).toBeCloseTo(456.7, 6)
})
