// Water and steam properties by IAPWS-IF97 (regions 1, 2, 3, 4 and 5), public API.
//
// UNITS AT THIS API ARE SI: pressure p in Pa, temperature T in K, specific volume v in m^3/kg,
// density rho in kg/m^3, specific enthalpy h and internal energy u in J/kg, specific entropy s
// and heat capacities cp, cv in J/(kg K), speed of sound w in m/s, quality x dimensionless.
// (The if97/ core works in the release's units MPa, kJ/kg, kJ/(kg K); conversions happen here.)
//
// Errors: every function here returns SteamResult<T> (see errors.ts), except the fast numeric
// entry points hsFromPT / enthalpyFromPT / entropyFromPT, which throw SteamRangeError.
//
// Range (IAPWS R7-97(2012), Section 2, Figure 1):
//   273.15 K <= T <= 1073.15 K, 0 < p <= 100 MPa (regions 1-4), and
//   1073.15 K < T <= 2273.15 K, 0 < p <= 50 MPa (region 5).
// Region selection for (p, T) as the release defines it:
//   region 1: 273.15 K <= T <= 623.15 K and p >= p_s(T);
//   region 2: 273.15 K <= T <= 623.15 K and p < p_s(T); 623.15 K < T <= 863.15 K and
//             p <= p_B23(T); 863.15 K < T <= 1073.15 K;
//   region 3: 623.15 K < T and p > p_B23(T) (i.e. T < T_B23(p));
//   region 5: 1073.15 K < T <= 2273.15 K and p <= 50 MPa;
//   region 4: the saturation line p_s(T), 273.15 K <= T <= 647.096 K (two-phase states are
//             reached by quality x, or by (p, h) / (p, s) inside the dome).
// A (p, T) point exactly on the saturation line is taken as liquid (region 1, or the
// liquid-like branch of region 3).
//
// Teaching tool: these numbers are for teaching, not design data; defer to the applicable
// codes and licensed engineering practice for any real plant or pressure equipment.
import { pB23, tB23 } from './if97/b23.ts'
import { t1ph, t1ps, t2ph, t2ps } from './if97/backward.ts'
import { P_MAX, P_MAX5, PC, T_13, T_MAX, T_MAX5, T_MIN, TC } from './if97/constants.ts'
import { region1, region1HS } from './if97/region1.ts'
import { region2, region2HS } from './if97/region2.ts'
import { region3, region3Density } from './if97/region3.ts'
import { region5, region5HS } from './if97/region5.ts'
import { P_SAT_623, P_SAT_MIN, pSat, tSat } from './if97/region4.ts'
import type { If97Props } from './if97/types.ts'
import { fail, ok, SteamRangeError } from './errors.ts'
import type { SteamError, SteamResult } from './errors.ts'

export type SteamRegion = 1 | 2 | 3 | 4 | 5
export type SteamPhase = 'liquid' | 'vapour' | 'supercritical' | 'two-phase' | 'saturated liquid' | 'saturated vapour'

/** A state of water or steam, in SI units (see the header of this file). */
export interface SteamState {
  /** IAPWS-IF97 region: 1, 2, 3, 5 (above 1073.15 K), or 4 for a two-phase (saturated mixture) state. */
  region: SteamRegion
  phase: SteamPhase
  /** Pressure, Pa. */
  p: number
  /** Temperature, K. */
  T: number
  /** Specific volume, m^3/kg. */
  v: number
  /** Density, kg/m^3. */
  rho: number
  /** Specific enthalpy, J/kg. */
  h: number
  /** Specific internal energy, J/kg. */
  u: number
  /** Specific entropy, J/(kg K). */
  s: number
  /** Specific isobaric heat capacity, J/(kg K); null for a two-phase mixture (0 < x < 1); for
   *  x = 0 or 1 the value of the saturated liquid or vapour. (Same for cv and w.) */
  cp: number | null
  /** Specific isochoric heat capacity, J/(kg K); null for a two-phase state. */
  cv: number | null
  /** Speed of sound, m/s; null for a two-phase state. */
  w: number | null
  /** Vapour quality (mass fraction of vapour), 0..1, for two-phase states; null otherwise. */
  x: number | null
}

/** Saturated liquid and vapour at one pressure/temperature. */
export interface SaturationStates {
  /** Saturation pressure, Pa. */
  p: number
  /** Saturation temperature, K. */
  T: number
  liquid: SteamState
  vapour: SteamState
}

/** Limits of the formulation, SI. */
export const STEAM_LIMITS = {
  T_MIN,
  /** Highest temperature of the formulation (region 5), K. */
  T_MAX: T_MAX5,
  /** Highest temperature of regions 1-3, K; above it only region 5 (p <= P_MAX_5). */
  T_MAX_123: T_MAX,
  /** Pa */
  P_MAX: P_MAX * 1e6,
  /** Highest pressure of region 5 (T > 1073.15 K), Pa. */
  P_MAX_5: P_MAX5 * 1e6,
  /** Critical point: K, Pa, kg/m^3. */
  T_CRIT: TC,
  P_CRIT: PC * 1e6,
  RHO_CRIT: 322,
  /** Lowest saturation pressure p_s(273.15 K), Pa. */
  P_SAT_MIN: P_SAT_MIN * 1e6,
} as const

export const STEAM_CAUTION =
  'Teaching tool: IAPWS-IF97 property values for teaching, not design data. Defer to the applicable codes and licensed engineering practice.'

// --- validation ----------------------------------------------------------------------------

function describe(parts: Record<string, number>): string {
  return Object.entries(parts)
    .map(([k, v]) => `${k} = ${v}`)
    .join(', ')
}

function notFinite(property: string, value: number, state: string): SteamError | null {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    return {
      code: 'invalid-input',
      property,
      message: `${property} must be a finite number (got ${String(value)})`,
      state,
    }
  }
  return null
}

function checkP(pPa: number, state: string): SteamError | null {
  const e = notFinite('p', pPa, state)
  if (e) return e
  if (pPa <= 0)
    return {
      code: 'out-of-range',
      property: 'p',
      bound: { name: 'p > 0', value: 0, unit: 'Pa' },
      message: `pressure ${pPa} Pa is not positive; IAPWS-IF97 needs p > 0`,
      state,
    }
  if (pPa > P_MAX * 1e6)
    return {
      code: 'out-of-range',
      property: 'p',
      bound: { name: 'p <= 100 MPa', value: 100e6, unit: 'Pa' },
      message: `pressure ${pPa} Pa is above the IAPWS-IF97 limit p <= 100 MPa; no extrapolation is done`,
      state,
    }
  return null
}

function checkT(T: number, state: string): SteamError | null {
  const e = notFinite('T', T, state)
  if (e) return e
  if (T < T_MIN)
    return {
      code: 'out-of-range',
      property: 'T',
      bound: { name: 'T >= 273.15 K', value: T_MIN, unit: 'K' },
      message: `temperature ${T} K is below the IAPWS-IF97 limit T >= 273.15 K; no extrapolation is done`,
      state,
    }
  if (T > T_MAX5)
    return {
      code: 'out-of-range',
      property: 'T',
      bound: { name: 'T <= 2273.15 K', value: T_MAX5, unit: 'K' },
      message: `temperature ${T} K is above 2273.15 K, the limit of IAPWS-IF97 (region 5); no extrapolation is done`,
      state,
    }
  return null
}

/** Region 5 holds only up to 50 MPa: a (p, T) pair above 1073.15 K and 50 MPa is outside IF97. */
function checkPT(pPa: number, T: number, state: string): SteamError | null {
  const e = checkP(pPa, state) ?? checkT(T, state)
  if (e) return e
  if (T > T_MAX && pPa > P_MAX5 * 1e6)
    return {
      code: 'out-of-range',
      property: 'p',
      bound: { name: 'p <= 50 MPa above 1073.15 K', value: P_MAX5 * 1e6, unit: 'Pa' },
      message: `pressure ${pPa} Pa at ${T} K is outside IAPWS-IF97: above 1073.15 K (region 5) the limit is p <= 50 MPa (below 1073.15 K it is 100 MPa); no extrapolation is done`,
      state,
    }
  return null
}

function checkX(x: number, state: string): SteamError | null {
  const e = notFinite('x', x, state)
  if (e) return e
  if (x < 0 || x > 1)
    return { code: 'invalid-input', property: 'x', message: `quality x = ${x} must lie in [0, 1]`, state }
  return null
}

// --- core (release units: MPa, K, kJ/kg) ---------------------------------------------------

type Side = 'liquid' | 'vapour' | 'auto'

/** Region (1, 2, 3, 5) of an in-range (p MPa, T K) point. */
function regionPT(p: number, T: number): 1 | 2 | 3 | 5 {
  if (T > T_MAX) return 5
  if (T <= T_13) return p >= pSat(T) ? 1 : 2
  if (T > 863.15) return 2
  return p > pB23(T) ? 3 : 2
}

function region3PT(p: number, T: number, side: Side): If97Props | null {
  const liquid = side === 'auto' ? T >= TC || p >= pSat(T) : side === 'liquid'
  const rho = region3Density(p, T, liquid)
  if (!(rho > 0)) return null
  return region3(rho, T)
}

function propsIn(region: 1 | 2 | 3 | 5, p: number, T: number, side: Side): If97Props | null {
  if (region === 1) return region1(p, T)
  if (region === 2) return region2(p, T)
  if (region === 5) return region5(p, T)
  return region3PT(p, T, side)
}

function phaseOf(pr: If97Props): SteamPhase {
  if (pr.region === 1) return 'liquid'
  if (pr.p > PC && pr.T > TC) return 'supercritical'
  if (pr.region === 2 || pr.region === 5) return 'vapour'
  if (pr.T >= TC) return pr.p >= PC ? 'supercritical' : 'vapour'
  return pr.p >= pSat(pr.T) ? 'liquid' : 'vapour'
}

function toSI(pr: If97Props, phase: SteamPhase = phaseOf(pr)): SteamState {
  return {
    region: pr.region,
    phase,
    p: pr.p * 1e6,
    T: pr.T,
    v: pr.v,
    rho: pr.rho,
    h: pr.h * 1000,
    u: pr.u * 1000,
    s: pr.s * 1000,
    cp: pr.cp * 1000,
    cv: pr.cv * 1000,
    w: pr.w,
    x: null,
  }
}

function noConvergence(state: string): SteamError {
  return { code: 'no-convergence', message: `iteration did not converge for ${state}`, state }
}

/** Saturated liquid and vapour (release units) at T K with p = p_s(T) MPa. */
function satProps(p: number, T: number): { liq: If97Props; vap: If97Props } | null {
  if (T <= T_13) return { liq: region1(p, T), vap: region2(p, T) }
  const liq = region3PT(p, T, 'liquid')
  const vap = region3PT(p, T, 'vapour')
  if (!liq || !vap) return null
  return { liq, vap }
}

function mix(p: number, T: number, liq: If97Props, vap: If97Props, x: number): SteamState {
  if (x === 0 || x === 1) {
    // Saturated liquid / vapour: the single-phase properties on the saturation line.
    const st = toSI(x === 0 ? liq : vap, x === 0 ? 'saturated liquid' : 'saturated vapour')
    return { ...st, region: 4, p: p * 1e6, T, x }
  }
  const v = liq.v + x * (vap.v - liq.v)
  const h = liq.h + x * (vap.h - liq.h)
  const s = liq.s + x * (vap.s - liq.s)
  const u = liq.u + x * (vap.u - liq.u)
  return {
    region: 4,
    phase: 'two-phase',
    p: p * 1e6,
    T,
    v,
    rho: 1 / v,
    h: h * 1000,
    u: u * 1000,
    s: s * 1000,
    cp: null,
    cv: null,
    w: null,
    x,
  }
}

// --- public: (p, T) ------------------------------------------------------------------------

/** Single-phase state from pressure p (Pa) and temperature T (K). */
export function stateFromPT(p: number, T: number): SteamResult<SteamState> {
  const state = describe({ p, T })
  const e = checkPT(p, T, state)
  if (e) return fail(e)
  const pM = p / 1e6
  const pr = propsIn(regionPT(pM, T), pM, T, 'auto')
  if (!pr) return fail(noConvergence(state))
  return ok(toSI(pr))
}

/** IAPWS-IF97 region (1, 2, 3 or 5) of a (p Pa, T K) point. */
export function regionFromPT(p: number, T: number): SteamResult<1 | 2 | 3 | 5> {
  const state = describe({ p, T })
  const e = checkPT(p, T, state)
  if (e) return fail(e)
  return ok(regionPT(p / 1e6, T))
}

const hsBuf = new Float64Array(2)

/**
 * Fast path: specific enthalpy (J/kg) into out[0] and specific entropy (J/(kg K)) into out[1]
 * at (p Pa, T K). No allocation in regions 1 and 2. Throws SteamRangeError out of range.
 */
export function hsFromPT(p: number, T: number, out: Float64Array = hsBuf): Float64Array {
  // Inline fast range test; the detailed message only on failure.
  if (!(p > 0 && p <= 100e6 && T >= T_MIN && (T <= T_MAX || (T <= T_MAX5 && p <= P_MAX5 * 1e6)))) {
    const state = describe({ p, T })
    throw new SteamRangeError(
      checkPT(p, T, state) ?? { code: 'invalid-input', message: `invalid state ${state}`, state },
    )
  }
  const pM = p * 1e-6
  const region = regionPT(pM, T)
  if (region === 1) region1HS(pM, T, out)
  else if (region === 2) region2HS(pM, T, out)
  else if (region === 5) region5HS(pM, T, out)
  else {
    const pr = region3PT(pM, T, 'auto')
    if (!pr) throw new SteamRangeError(noConvergence(describe({ p, T })))
    out[0] = pr.h
    out[1] = pr.s
  }
  out[0] = out[0]! * 1000
  out[1] = out[1]! * 1000
  return out
}

/** Fast path: specific enthalpy, J/kg, at (p Pa, T K). Throws SteamRangeError out of range. */
export function enthalpyFromPT(p: number, T: number): number {
  return hsFromPT(p, T, hsBuf)[0]!
}

/** Fast path: specific entropy, J/(kg K), at (p Pa, T K). Throws SteamRangeError out of range. */
export function entropyFromPT(p: number, T: number): number {
  return hsFromPT(p, T, hsBuf)[1]!
}

/** Region 3 state directly from the release's native variables: density (kg/m^3), T (K). */
export function stateFromRhoT(rho: number, T: number): SteamResult<SteamState> {
  const state = describe({ rho, T })
  const e = notFinite('rho', rho, state) ?? checkT(T, state)
  if (e) return fail(e)
  if (!(rho > 0)) return fail({ code: 'invalid-input', property: 'rho', message: 'density must be positive', state })
  const pr = region3(rho, T)
  if (!(T > T_13 && pr.p >= pB23(T) && pr.p <= P_MAX)) {
    return fail({
      code: 'out-of-range',
      property: 'rho',
      bound: { name: 'region 3: T > 623.15 K, p_B23(T) <= p <= 100 MPa', value: pr.p * 1e6, unit: 'Pa' },
      message: `(rho, T) gives p = ${pr.p * 1e6} Pa, outside region 3 (T > 623.15 K, p_B23(T) <= p <= 100 MPa)`,
      state,
    })
  }
  return ok(toSI(pr))
}

// --- public: saturation (region 4) ---------------------------------------------------------

function checkSatT(T: number, state: string): SteamError | null {
  const e = checkT(T, state)
  if (e) return e
  if (T > TC)
    return {
      code: 'out-of-range',
      property: 'T',
      bound: { name: 'T <= 647.096 K (critical temperature)', value: TC, unit: 'K' },
      message: `temperature ${T} K is above the critical temperature 647.096 K: there is no saturation state`,
      state,
    }
  return null
}

function checkSatP(p: number, state: string): SteamError | null {
  const e = checkP(p, state)
  if (e) return e
  if (p < P_SAT_MIN * 1e6)
    return {
      code: 'out-of-range',
      property: 'p',
      bound: { name: 'p >= p_s(273.15 K) = 611.213 Pa', value: P_SAT_MIN * 1e6, unit: 'Pa' },
      message: `pressure ${p} Pa is below the saturation pressure at 273.15 K (611.213 Pa): no saturation state in IAPWS-IF97`,
      state,
    }
  if (p > PC * 1e6)
    return {
      code: 'out-of-range',
      property: 'p',
      bound: { name: 'p <= 22.064 MPa (critical pressure)', value: PC * 1e6, unit: 'Pa' },
      message: `pressure ${p} Pa is above the critical pressure 22.064 MPa: there is no saturation state`,
      state,
    }
  return null
}

/** Saturation pressure p_s(T), Pa, for 273.15 K <= T <= 647.096 K (IF97 Eq. (30)). */
export function saturationPressure(T: number): SteamResult<number> {
  const e = checkSatT(T, describe({ T }))
  if (e) return fail(e)
  return ok(pSat(T) * 1e6)
}

/** Saturation temperature T_s(p), K, for 611.213 Pa <= p <= 22.064 MPa (IF97 Eq. (31)). */
export function saturationTemperature(p: number): SteamResult<number> {
  const e = checkSatP(p, describe({ p }))
  if (e) return fail(e)
  return ok(tSat(p / 1e6))
}

function satStates(pM: number, T: number, state: string): SteamResult<SaturationStates> {
  const sp = satProps(pM, T)
  if (!sp) return fail(noConvergence(state))
  const liquid = mix(pM, T, sp.liq, sp.vap, 0)
  const vapour = mix(pM, T, sp.liq, sp.vap, 1)
  return ok({ p: pM * 1e6, T, liquid, vapour })
}

/** Saturated liquid and vapour at pressure p (Pa). */
export function saturationAtP(p: number): SteamResult<SaturationStates> {
  const state = describe({ p })
  const e = checkSatP(p, state)
  if (e) return fail(e)
  const pM = p / 1e6
  return satStates(pM, tSat(pM), state)
}

/** Saturated liquid and vapour at temperature T (K). */
export function saturationAtT(T: number): SteamResult<SaturationStates> {
  const state = describe({ T })
  const e = checkSatT(T, state)
  if (e) return fail(e)
  return satStates(pSat(T), T, state)
}

/** Two-phase state from pressure p (Pa) and quality x (0..1). */
export function stateFromPx(p: number, x: number): SteamResult<SteamState> {
  const state = describe({ p, x })
  const e = checkSatP(p, state) ?? checkX(x, state)
  if (e) return fail(e)
  const pM = p / 1e6
  const T = tSat(pM)
  const sp = satProps(pM, T)
  if (!sp) return fail(noConvergence(state))
  return ok(mix(pM, T, sp.liq, sp.vap, x))
}

/** Two-phase state from temperature T (K) and quality x (0..1). */
export function stateFromTx(T: number, x: number): SteamResult<SteamState> {
  const state = describe({ T, x })
  const e = checkSatT(T, state) ?? checkX(x, state)
  if (e) return fail(e)
  const pM = pSat(T)
  const sp = satProps(pM, T)
  if (!sp) return fail(noConvergence(state))
  return ok(mix(pM, T, sp.liq, sp.vap, x))
}

// --- public: (p, h) and (p, s) ------------------------------------------------------------

type Kind = 'h' | 's'

/**
 * Solve prop(p, T) = target for T in [lo, hi] within one region (prop increasing in T since
 * cp > 0): Newton with bisection safeguard. Returns the properties at the root, or null.
 */
function solveT(
  region: 1 | 2 | 3 | 5,
  side: Side,
  p: number,
  target: number,
  kind: Kind,
  lo: number,
  hi: number,
  guess: number,
): If97Props | null {
  let T = guess > lo && guess < hi ? guess : 0.5 * (lo + hi)
  for (let it = 0; it < 200; it++) {
    const pr = propsIn(region, p, T, side)
    if (!pr) return null
    const f = (kind === 'h' ? pr.h : pr.s) - target
    const df = kind === 'h' ? pr.cp : pr.cp / T
    if (f === 0) return pr
    if (f < 0) lo = T
    else hi = T
    let Tn = df > 0 ? T - f / df : NaN
    if (!(Tn > lo && Tn < hi)) Tn = 0.5 * (lo + hi)
    if (Math.abs(Tn - T) <= 1e-12 * T || hi - lo <= 1e-12 * T) return propsIn(region, p, Tn, side)
    T = Tn
  }
  return null
}

function valueOf(pr: If97Props, kind: Kind): number {
  return kind === 'h' ? pr.h : pr.s
}

function backwardGuess(region: 1 | 2 | 3 | 5, p: number, target: number, kind: Kind): number {
  if (region === 1) return kind === 'h' ? t1ph(p, target) : t1ps(p, target)
  if (region === 2) return kind === 'h' ? t2ph(p, target) : t2ps(p, target)
  return NaN
}

function fromPX(pPa: number, targetSI: number, kind: Kind): SteamResult<SteamState> {
  const state = describe(kind === 'h' ? { p: pPa, h: targetSI } : { p: pPa, s: targetSI })
  const e = checkP(pPa, state) ?? notFinite(kind, targetSI, state)
  if (e) return fail(e)
  const p = pPa / 1e6
  const target = targetSI / 1000
  const unit = kind === 'h' ? 'J/kg' : 'J/(kg K)'
  const name = kind === 'h' ? 'enthalpy' : 'entropy'

  // Range ends: T = 273.15 K and T = 2273.15 K (p <= 50 MPa, region 5) or 1073.15 K at this pressure.
  const rLow = regionPT(p, T_MIN)
  const low = propsIn(rLow, p, T_MIN, 'auto')!
  if (target < valueOf(low, kind))
    return fail({
      code: 'out-of-range',
      property: kind,
      bound: { name: 'T >= 273.15 K', value: valueOf(low, kind) * 1000, unit },
      message: `${name} ${targetSI} ${unit} at p = ${pPa} Pa lies below its value at 273.15 K (${valueOf(low, kind) * 1000} ${unit}): the state would be below the IAPWS-IF97 limit T >= 273.15 K`,
      state,
    })
  const high = region2(p, T_MAX)
  const has5 = p <= P_MAX5
  const top = has5 ? region5(p, T_MAX5) : high
  if (target > valueOf(top, kind))
    return fail({
      code: 'out-of-range',
      property: kind,
      bound: has5
        ? { name: 'T <= 2273.15 K', value: valueOf(top, kind) * 1000, unit }
        : { name: 'T <= 1073.15 K', value: valueOf(top, kind) * 1000, unit },
      message: has5
        ? `${name} ${targetSI} ${unit} at p = ${pPa} Pa lies above its value at 2273.15 K (${valueOf(top, kind) * 1000} ${unit}): the state would be above the IAPWS-IF97 limit T <= 2273.15 K`
        : `${name} ${targetSI} ${unit} at p = ${pPa} Pa lies above its value at 1073.15 K (${valueOf(top, kind) * 1000} ${unit}): above 50 MPa the IF97 range ends at 1073.15 K (region 5 holds only up to 50 MPa)`,
      state,
    })

  const finish = (pr: If97Props | null): SteamResult<SteamState> => (pr ? ok(toSI(pr)) : fail(noConvergence(state)))
  const solve = (region: 1 | 2 | 3 | 5, side: Side, lo: number, hi: number) =>
    finish(solveT(region, side, p, target, kind, lo, hi, backwardGuess(region, p, target, kind)))

  // Above the region-2 value at 1073.15 K: region 5. (Regions 2 and 5 agree at 1073.15 K only
  // within the release's consistency tolerance; a target inside that sliver gives the region-5
  // state at 1073.15 K.)
  if (target > valueOf(high, kind)) {
    const y5 = valueOf(region5(p, T_MAX), kind)
    if (target <= y5) return finish(region5(p, T_MAX))
    return solve(5, 'auto', T_MAX, T_MAX5)
  }

  if (p < P_SAT_MIN) {
    // Only vapour exists above 273.15 K.
    return solve(2, 'auto', T_MIN, T_MAX)
  }
  if (p <= PC) {
    const Ts = tSat(p)
    const sp = satProps(p, Ts)
    if (!sp) return fail(noConvergence(state))
    const yl = valueOf(sp.liq, kind)
    const yv = valueOf(sp.vap, kind)
    if (target >= yl && target <= yv) {
      const x = yv > yl ? (target - yl) / (yv - yl) : 0
      return ok(mix(p, Ts, sp.liq, sp.vap, x))
    }
    if (target < yl) {
      if (Ts <= T_13) return solve(1, 'auto', T_MIN, Ts)
      const y13 = valueOf(region1(p, T_13), kind)
      if (target <= y13) return solve(1, 'auto', T_MIN, T_13)
      return solve(3, 'liquid', T_13, Ts)
    }
    if (p <= P_SAT_623) return solve(2, 'auto', Ts, T_MAX)
    const Tb = tB23(p)
    const yb = valueOf(region2(p, Tb), kind)
    if (target >= yb) return solve(2, 'auto', Tb, T_MAX)
    return solve(3, 'vapour', Ts, Tb)
  }
  // Above the critical pressure: region 1 up to 623.15 K, region 3 up to T_B23(p), then region 2.
  const y13 = valueOf(region1(p, T_13), kind)
  if (target <= y13) return solve(1, 'auto', T_MIN, T_13)
  const Tb = Math.min(tB23(p), 863.15)
  const yb = valueOf(region2(p, Tb), kind)
  if (target >= yb) return solve(2, 'auto', Tb, T_MAX)
  return solve(3, 'auto', T_13, Tb)
}

/**
 * State from pressure p (Pa) and specific enthalpy h (J/kg): single-phase (T found by the
 * release's backward equation T(p,h) as a first guess for regions 1 and 2, polished by a
 * bracketed Newton iteration on the basic equation; region 3 by bracketed iteration) or
 * two-phase (x from h).
 */
export function stateFromPH(p: number, h: number): SteamResult<SteamState> {
  return fromPX(p, h, 'h')
}

/** State from pressure p (Pa) and specific entropy s (J/(kg K)); see stateFromPH. */
export function stateFromPS(p: number, s: number): SteamResult<SteamState> {
  return fromPX(p, s, 's')
}

/** Temperature (K) from p (Pa) and h (J/kg). */
export function temperatureFromPH(p: number, h: number): SteamResult<number> {
  const r = stateFromPH(p, h)
  return r.ok ? ok(r.value.T) : r
}

/** Temperature (K) from p (Pa) and s (J/(kg K)). */
export function temperatureFromPS(p: number, s: number): SteamResult<number> {
  const r = stateFromPS(p, s)
  return r.ok ? ok(r.value.T) : r
}

function qualityFrom(p: number, y: number, kind: Kind): SteamResult<number> {
  const state = describe(kind === 'h' ? { p, h: y } : { p, s: y })
  const e = checkSatP(p, state) ?? notFinite(kind, y, state)
  if (e) return fail(e)
  const sat = saturationAtP(p)
  if (!sat.ok) return sat
  const yl = kind === 'h' ? sat.value.liquid.h : sat.value.liquid.s
  const yv = kind === 'h' ? sat.value.vapour.h : sat.value.vapour.s
  const x = (y - yl) / (yv - yl)
  if (!(x >= 0 && x <= 1)) {
    return fail({
      code: 'not-two-phase',
      property: kind,
      message: `at p = ${p} Pa the state is ${x < 0 ? 'compressed (subcooled) liquid' : 'superheated vapour'}, not a two-phase mixture (the quality formula would give ${x})`,
      state,
    })
  }
  return ok(x)
}

/** Quality x (0..1) from pressure p (Pa) and h (J/kg); error 'not-two-phase' outside the dome. */
export function qualityFromPH(p: number, h: number): SteamResult<number> {
  return qualityFrom(p, h, 'h')
}

/** Quality x (0..1) from pressure p (Pa) and s (J/(kg K)); error 'not-two-phase' outside the dome. */
export function qualityFromPS(p: number, s: number): SteamResult<number> {
  return qualityFrom(p, s, 's')
}

// --- public: (T, s), (T, v), (p, v) ---------------------------------------------------------
// Not in the release: found here by bisection on the basic equations (through stateFromPT),
// in log p at fixed T (s and v fall as p rises at fixed T) or in T at fixed p (v rises with T
// in the vapour; in the liquid too except below about 277 K, where the density maximum makes
// v(T) non-monotonic and the liquid root found may be either one).

type PairKind = 's' | 'v'

function pick(st: SteamState, kind: PairKind): number {
  return kind === 's' ? st.s : st.v
}

/** Bisection on a monotonic f in [a, b] (f(a), f(b) of opposite signs); returns the root. */
function bisect(f: (x: number) => number | null, a: number, b: number): number | null {
  let fa = f(a)
  const fb = f(b)
  if (fa === null || fb === null || fa * fb > 0) return null
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (a + b)
    const fm = f(m)
    if (fm === null) return null
    if (fm === 0 || Math.abs(b - a) <= 1e-14 * Math.abs(m)) return m
    if (fa < 0 === fm < 0) {
      a = m
      fa = fm
    } else b = m
  }
  return 0.5 * (a + b)
}

function fromTY(T: number, y: number, kind: PairKind): SteamResult<SteamState> {
  const state = describe(kind === 's' ? { T, s: y } : { T, v: y })
  const e = checkT(T, state) ?? notFinite(kind, y, state)
  if (e) return fail(e)
  if (kind === 'v' && !(y > 0))
    return fail({ code: 'invalid-input', property: 'v', message: 'specific volume must be positive', state })
  const pMax = T > T_MAX ? P_MAX5 * 1e6 : P_MAX * 1e6
  const pMin = 611.2127 * 1e-3 // 0.6 Pa: far below any state a course uses; IF97 region 2 holds for p > 0
  const at = (p: number): SteamState | null => {
    const r = stateFromPT(p, T)
    return r.ok ? r.value : null
  }
  const solveIn = (lo: number, hi: number): SteamResult<SteamState> => {
    // exp(log(p)) can land an ulp outside [lo, hi] (e.g. just above 100 MPa): clamp.
    const pOf = (lp: number) => Math.min(hi, Math.max(lo, Math.exp(lp)))
    const lp = bisect(
      (lp) => {
        const st = at(pOf(lp))
        return st ? pick(st, kind) - y : null
      },
      Math.log(lo),
      Math.log(hi),
    )
    if (lp === null) return fail(noConvergence(state))
    const st = at(pOf(lp))
    return st ? ok(st) : fail(noConvergence(state))
  }
  const name = kind === 's' ? 'entropy' : 'specific volume'
  const range = (lo: number, hi: number): SteamError | null => {
    const a = at(hi)
    const b = at(lo)
    if (!a || !b) return noConvergence(state)
    const yHi = pick(b, kind) // low pressure: largest s, v
    const yLo = pick(a, kind)
    if (y > yHi || y < yLo)
      return {
        code: 'out-of-range',
        property: kind,
        bound: {
          name: `${name} at T = ${T} K between p = ${hi} Pa and ${lo} Pa`,
          value: y > yHi ? yHi : yLo,
          unit: kind === 's' ? 'J/(kg K)' : 'm^3/kg',
        },
        message: `${name} ${y} at T = ${T} K is outside what IAPWS-IF97 gives at that temperature (${yLo} .. ${yHi}, from ${hi} Pa down to ${lo} Pa); no extrapolation is done`,
        state,
      }
    return null
  }
  if (T < TC) {
    const ps = pSat(T) * 1e6
    const sat = satStates(ps / 1e6, T, state)
    if (!sat.ok) return sat
    const yl = pick(sat.value.liquid, kind)
    const yv = pick(sat.value.vapour, kind)
    if (y >= yl && y <= yv) {
      const x = (y - yl) / (yv - yl)
      return stateFromTx(T, x)
    }
    if (y > yv) {
      const e2 = range(pMin, ps * (1 - 1e-12))
      if (e2) return fail(e2)
      return solveIn(pMin, ps * (1 - 1e-12))
    }
    const e3 = range(ps, pMax)
    if (e3) return fail(e3)
    return solveIn(ps, pMax)
  }
  const e4 = range(pMin, pMax)
  if (e4) return fail(e4)
  return solveIn(pMin, pMax)
}

/** State from temperature T (K) and specific entropy s (J/(kg K)), any phase. */
export function stateFromTS(T: number, s: number): SteamResult<SteamState> {
  return fromTY(T, s, 's')
}

/** State from temperature T (K) and specific volume v (m^3/kg), any phase. */
export function stateFromTV(T: number, v: number): SteamResult<SteamState> {
  return fromTY(T, v, 'v')
}

/** State from pressure p (Pa) and specific volume v (m^3/kg), any phase. */
export function stateFromPV(p: number, v: number): SteamResult<SteamState> {
  const state = describe({ p, v })
  const e = checkP(p, state) ?? notFinite('v', v, state)
  if (e) return fail(e)
  if (!(v > 0))
    return fail({ code: 'invalid-input', property: 'v', message: 'specific volume must be positive', state })
  const at = (T: number): SteamState | null => {
    const r = stateFromPT(p, T)
    return r.ok ? r.value : null
  }
  const Ttop = p <= P_MAX5 * 1e6 ? T_MAX5 : T_MAX
  const solveIn = (lo: number, hi: number): SteamResult<SteamState> => {
    const T = bisect(
      (T) => {
        const st = at(T)
        return st ? st.v - v : null
      },
      lo,
      hi,
    )
    if (T === null)
      return fail({
        code: 'out-of-range',
        property: 'v',
        message: `specific volume ${v} m^3/kg at p = ${p} Pa is outside what IAPWS-IF97 gives at that pressure between 273.15 K and ${Ttop} K; no extrapolation is done`,
        state,
      })
    const st = at(T)
    return st ? ok(st) : fail(noConvergence(state))
  }
  if (p >= P_SAT_MIN * 1e6 && p < PC * 1e6) {
    const pM = p / 1e6
    const Ts = tSat(pM)
    const sat = satStates(pM, Ts, state)
    if (!sat.ok) return sat
    const vl = sat.value.liquid.v
    const vv = sat.value.vapour.v
    if (v >= vl && v <= vv) return stateFromPx(p, (v - vl) / (vv - vl))
    if (v > vv) return solveIn(Ts * (1 + 1e-12), Ttop)
    return solveIn(T_MIN, Ts)
  }
  return solveIn(T_MIN, Ttop)
}
