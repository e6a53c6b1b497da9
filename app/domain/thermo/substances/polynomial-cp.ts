/**
 * Ideal gas with a user-supplied heat-capacity polynomial cp(T) = a + bT + cT² + dT³ (the usual
 * textbook form, e.g. Çengel & Boles Table A-2c, per kmol; any basis here), valid on a stated
 * range [Tmin, Tmax] in K. h(T) and s°(T) are the exact integrals of the polynomial:
 *   h(T)  = a(T − T0) + b/2 (T² − T0²) + c/3 (T³ − T0³) + d/4 (T⁴ − T0⁴)
 *   s°(T) = a ln(T/T0) + b (T − T0) + c/2 (T² − T0²) + d/3 (T³ − T0³)
 * with T0 = 298.15 K (h = 0, s = 0 at T0 and 1 bar, as for the constant-cp gases; differences
 * do not depend on the choice). Inverse functions and isentropic end states use the bracketed
 * Brent solver on [Tmin, Tmax]; outside that range they give NaN, which the cycle solver
 * reports as out of range of the data.
 */
import { R_MOLAR, T_REF } from '../constants.ts'
import { brent } from '../numeric.ts'
import type { GasResult } from './constant-cp.ts'
import type { Basis } from './gas.ts'

export interface PolynomialCpParams {
  readonly id?: string
  readonly label?: string
  readonly basis: Basis
  /** [a, b, c, d] in SI on the basis: J/(unit·K), J/(unit·K²), J/(unit·K³), J/(unit·K⁴). */
  readonly coeffs: readonly [number, number, number, number]
  /** Validity range of the polynomial, K. */
  readonly Tmin: number
  readonly Tmax: number
  /** Gas constant on the basis; default R_molar per mole, or R_molar/M per kg. */
  readonly R?: number
  /** kg/mol */
  readonly molarMass?: number
  readonly source?: string
}

type C4 = readonly [number, number, number, number]

export function cpPoly(k: C4, T: number): number {
  return k[0] + T * (k[1] + T * (k[2] + T * k[3]))
}
/** ∫ cp dT from T0 to T (exact). */
export function hPoly(k: C4, T: number, T0 = T_REF): number {
  const F = (x: number) => x * (k[0] + x * (k[1] / 2 + x * (k[2] / 3 + x * (k[3] / 4))))
  return F(T) - F(T0)
}
/** ∫ cp/T dT from T0 to T (exact). */
export function sPoly(k: C4, T: number, T0 = T_REF): number {
  const F = (x: number) => x * (k[1] + x * (k[2] / 2 + x * (k[3] / 3)))
  return k[0] * Math.log(T / T0) + F(T) - F(T0)
}

/** Smallest value of the cubic on [lo, hi]: at an end or where cp'(T) = b + 2cT + 3dT² = 0. */
export function minCpOnRange(k: C4, lo: number, hi: number): { T: number; cp: number } {
  const cands = [lo, hi]
  const [, b, c, d] = k
  if (d !== 0) {
    const disc = 4 * c * c - 12 * d * b
    if (disc >= 0) {
      const sq = Math.sqrt(disc)
      cands.push((-2 * c + sq) / (6 * d), (-2 * c - sq) / (6 * d))
    }
  } else if (c !== 0) cands.push(-b / (2 * c))
  let best = { T: lo, cp: cpPoly(k, lo) }
  for (const T of cands) {
    if (!(T >= lo && T <= hi)) continue
    const cp = cpPoly(k, T)
    if (cp < best.cp) best = { T, cp }
  }
  return best
}

const fmt = (x: number) => String(+x.toPrecision(6))

/** Build the gas, or a clear message (never throws). */
export function polynomialCpGas(p: PolynomialCpParams): GasResult {
  const bad = (message: string, property?: string): GasResult => ({
    ok: false,
    error: { code: 'invalid-gas', message, property },
  })
  const k = p.coeffs
  for (let i = 0; i < 4; i++)
    if (!Number.isFinite(k[i])) return bad(`cp polynomial coefficient ${'abcd'[i]} must be a finite number`, 'abcd'[i])
  const { Tmin: lo, Tmax: hi } = p
  if (!(Number.isFinite(lo) && lo > 0)) return bad('cp polynomial: Tmin must be a positive temperature in K', 'Tmin')
  if (!(Number.isFinite(hi) && hi > lo))
    return bad(`cp polynomial: Tmax (${hi} K) must be above Tmin (${lo} K)`, 'Tmax')
  if (p.molarMass !== undefined && !(Number.isFinite(p.molarMass) && p.molarMass > 0))
    return bad('molarMass must be a positive number', 'molarMass')
  let R = p.R
  if (R === undefined) {
    if (p.basis === 'mole') R = R_MOLAR
    else if (p.molarMass !== undefined) R = R_MOLAR / p.molarMass
    else return bad('a cp polynomial per kilogram needs the gas constant R or the molar mass', 'R')
  }
  if (!(Number.isFinite(R) && R > 0)) return bad('R must be a positive number', 'R')
  const m = minCpOnRange(k, lo, hi)
  if (!(m.cp > R))
    return bad(
      `cp polynomial: cp = ${fmt(m.cp)} at ${fmt(m.T)} K is not above R = ${fmt(R)} (cv = cp − R must stay positive on ${fmt(lo)}–${fmt(hi)} K)`,
      'a',
    )
  const ln = Math.log
  const cp = (T: number) => cpPoly(k, T)
  const h = (T: number) => hPoly(k, T)
  const s = (T: number) => sPoly(k, T)
  const inRange = (T: number) => (T >= lo && T <= hi ? T : NaN)
  const label = p.label ?? `gas with the given cp(T) polynomial`
  return {
    ok: true,
    gas: {
      id: p.id ?? 'cp-polynomial',
      label,
      basis: p.basis,
      R,
      molarMass: p.molarMass,
      constantCp: false,
      Tmin: lo,
      Tmax: hi,
      source:
        p.source ?? `cp = a + bT + cT² + dT³ given in the problem (valid ${fmt(lo)}–${fmt(hi)} K), integrated exactly`,
      ln,
      cp,
      cv: (T) => cp(T) - R,
      gamma: (T) => cp(T) / (cp(T) - R),
      h,
      u: (T) => h(T) - R * T,
      sT: s,
      TfromH: (hv) => brent((T) => h(T) - hv, lo, hi, 1e-10),
      TfromU: (uv) => brent((T) => h(T) - R * T - uv, lo, hi, 1e-10),
      // s°(T2) − s°(T1) = R ln(p2/p1)
      isentropicTfromP: (T1, p1, p2) => {
        const target = s(inRange(T1)) + R * Math.log(p2 / p1)
        return brent((T) => s(T) - target, lo, hi, 1e-10)
      },
      // s°(T) − R ln T + R ln v is constant along an isentrope
      isentropicTfromV: (T1, v1, v2) => {
        const target = s(inRange(T1)) - R * Math.log(T1) + R * Math.log(v1 / v2)
        return brent((T) => s(T) - R * Math.log(T) - target, lo, hi, 1e-10)
      },
      isentropicPressureRatio: (T1, T2) => Math.exp((s(inRange(T2)) - s(inRange(T1))) / R),
    },
  }
}
