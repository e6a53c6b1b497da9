/**
 * Ideal gas with cp(T) from NASA 7-coefficient polynomials. h(T) and s°(T) come from the exact
 * integrals of the cp polynomial (that is what a6 and a7 are the constants of); inverse
 * functions and isentropic end states use the bracketed Brent solver in ../numeric.ts.
 */
import { R_MOLAR } from '../constants.ts'
import { brent } from '../numeric.ts'
import type { Basis, Gas } from './gas.ts'
import { DRY_AIR_COMPOSITION, NASA7_SPECIES } from './nasa7-data.ts'
import type { Nasa7Species, Nasa7SpeciesId } from './nasa7-data.ts'

type Coeffs = readonly [number, number, number, number, number, number, number]
/** The same seven, filled in place while a mixture is summed. */
type MutableCoeffs = [number, number, number, number, number, number, number]

/** The species table looked up by any id: an id not in it gives undefined. */
const SPECIES_BY_ID: Readonly<Record<string, Nasa7Species | undefined>> = NASA7_SPECIES

export interface Nasa7Set {
  readonly id: string
  readonly label: string
  readonly molarMass: number
  readonly Tmin: number
  readonly Tmid: number
  readonly Tmax: number
  readonly low: Coeffs
  readonly high: Coeffs
  readonly source: string
}

/** cp/R */
export function cpOverR(c: Nasa7Set, T: number): number {
  const a = T < c.Tmid ? c.low : c.high
  return a[0] + T * (a[1] + T * (a[2] + T * (a[3] + T * a[4])))
}

/** h/(R) in kelvin, i.e. h/(R T) · T: the exact integral of cp/R plus a6. */
export function hOverR(c: Nasa7Set, T: number): number {
  const a = T < c.Tmid ? c.low : c.high
  return T * (a[0] + T * (a[1] / 2 + T * (a[2] / 3 + T * (a[3] / 4 + T * (a[4] / 5))))) + a[5]
}

/** s°/R: the exact integral of cp/(R T) plus a7. */
export function sOverR(c: Nasa7Set, T: number): number {
  const a = T < c.Tmid ? c.low : c.high
  return a[0] * Math.log(T) + T * (a[1] + T * (a[2] / 2 + T * (a[3] / 3 + T * (a[4] / 4)))) + a[6]
}

/**
 * An ideal mixture of NASA species at fixed composition. Because cp, h and s° are linear in
 * the coefficients, the mixture is again a NASA-7 set: a_mix = Σ x_i a_i, with the ideal
 * entropy of mixing −Σ x_i ln x_i added to a7. Requires a common Tmid (true for the species
 * shipped here: all split at 1000 K).
 */
export function mixNasa7(id: string, label: string, parts: Readonly<Record<string, number>>, source: string): Nasa7Set {
  const low: MutableCoeffs = [0, 0, 0, 0, 0, 0, 0]
  const high: MutableCoeffs = [0, 0, 0, 0, 0, 0, 0]
  let M = 0
  let Tmin = 0
  let Tmax = Infinity
  let Tmid = NaN
  let sum = 0
  for (const [sid, x] of Object.entries(parts)) {
    const sp = SPECIES_BY_ID[sid]
    if (!sp) throw new Error(`unknown NASA species ${sid}`) // programmer error: data tables only
    if (Number.isNaN(Tmid)) Tmid = sp.Tmid
    if (sp.Tmid !== Tmid) throw new Error('NASA mixture needs a common mid temperature')
    for (let i = 0; i < 7; i++) {
      low[i]! += x * sp.low[i]!
      high[i]! += x * sp.high[i]!
    }
    const mixS = x > 0 ? -x * Math.log(x) : 0
    low[6]! += mixS
    high[6]! += mixS
    M += x * sp.molarMass
    Tmin = Math.max(Tmin, sp.Tmin)
    Tmax = Math.min(Tmax, sp.Tmax)
    sum += x
  }
  if (Math.abs(sum - 1) > 1e-9) throw new Error(`mole fractions of ${id} sum to ${sum}`)
  return {
    id,
    label,
    molarMass: M,
    Tmin,
    Tmid,
    Tmax,
    low,
    high,
    source,
  }
}

export function speciesSet(id: Nasa7SpeciesId): Nasa7Set {
  const s = NASA7_SPECIES[id]
  return {
    id: s.id,
    label: `${s.formula} (${s.name}), NASA polynomials`,
    molarMass: s.molarMass,
    Tmin: s.Tmin,
    Tmid: s.Tmid,
    Tmax: s.Tmax,
    low: s.low,
    high: s.high,
    source: s.source,
  }
}

export const DRY_AIR_NASA: Nasa7Set = mixNasa7(
  'dry-air',
  'dry air (N2 0.7808, O2 0.2095, Ar 0.0093, CO2 0.0004), NASA polynomials',
  DRY_AIR_COMPOSITION,
  'mixture of the NASA TM-4513 species; composition after the U.S. Standard Atmosphere 1976 (see nasa7-data.ts)',
)

/** Build the solver's Gas from a NASA set, per mole or per kilogram. */
export function nasa7Gas(c: Nasa7Set, basis: Basis, ln: (x: number) => number = Math.log): Gas {
  const scale = basis === 'mole' ? R_MOLAR : R_MOLAR / c.molarMass // J/(unit·K) per unit of (·/R)
  const R = scale
  const lo = c.Tmin
  const hi = c.Tmax
  const cp = (T: number) => scale * cpOverR(c, T)
  const h = (T: number) => scale * hOverR(c, T)
  const sR = (T: number) => sOverR(c, T)
  const inRange = (T: number) => (T >= lo && T <= hi ? T : NaN)
  return {
    id: `nasa:${c.id}`,
    label: c.label,
    basis,
    R,
    molarMass: c.molarMass,
    constantCp: false,
    Tmin: lo,
    Tmax: hi,
    source: c.source,
    ln,
    cp,
    cv: (T) => cp(T) - R,
    gamma: (T) => cp(T) / (cp(T) - R),
    h,
    u: (T) => h(T) - R * T,
    sT: (T) => scale * sR(T),
    TfromH: (hv) => brent((T) => h(T) - hv, lo, hi, 1e-10),
    TfromU: (uv) => brent((T) => h(T) - R * T - uv, lo, hi, 1e-10),
    // s°(T2) − s°(T1) = R ln(p2/p1)
    isentropicTfromP: (T1, p1, p2) => {
      const target = sR(inRange(T1)) + Math.log(p2 / p1)
      return brent((T) => sR(T) - target, lo, hi, 1e-10)
    },
    // s°(T) − R ln T + R ln v is constant along an isentrope (p = RT/v)
    isentropicTfromV: (T1, v1, v2) => {
      const target = sR(inRange(T1)) - Math.log(T1) + Math.log(v1 / v2)
      return brent((T) => sR(T) - Math.log(T) - target, lo, hi, 1e-10)
    },
    isentropicPressureRatio: (T1, T2) => Math.exp(sR(inRange(T2)) - sR(inRange(T1))),
  }
}
