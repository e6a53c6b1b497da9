/**
 * Flash calculations on a fluid model: density from (T, p) choosing the stable phase, and
 * (p, h), (p, s), (T, x), (p, x). Every entry returns FluidResult and never throws.
 */
import { brent } from '../numeric.ts'
import { ancillary, makeModel, pressureAndSlope, stateAt, type FluidData, type Model } from './model.ts'
import { satAtP, satAtT, satDensities, SAT_T_MARGIN } from './saturation.ts'
import { fail, ok } from './result.ts'
import type { FluidResult, FluidState, Refrigerant, SaturationPair } from './types.ts'

const buf = new Float64Array(2)

/** Solve p(T, ρ) = p for ρ in [lo, hi] where p is increasing; Newton with bisection safeguard. */
function densityIn(m: Model, T: number, p: number, lo: number, hi: number, guess: number): number {
  let rho = Math.min(Math.max(guess, lo), hi)
  for (let it = 0; it < 200; it++) {
    pressureAndSlope(m, T, rho, buf)
    const f = buf[0]! - p
    if (f > 0) hi = rho
    else lo = rho
    let next = buf[1]! > 0 ? rho - f / buf[1]! : NaN
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi)
    if (Math.abs(next - rho) <= 1e-14 * rho) return next
    rho = next
    if (hi - lo <= 1e-15 * hi) return rho
  }
  return rho
}

const outOfRange = <T>(m: Model, what: string): FluidResult<T> => fail('out-of-range', `${m.data.id}: ${what}`)

function checkTP(m: Model, T: number, p: number): FluidResult<never> | null {
  const d = m.data
  if (!Number.isFinite(T) || !Number.isFinite(p))
    return fail('invalid-input', `${d.id}: temperature and pressure must be numbers`)
  if (p <= 0) return fail('invalid-input', `${d.id}: pressure must be positive`)
  if (T < d.Tmin)
    return outOfRange(
      m,
      `${T.toFixed(2)} K is below the lowest temperature of the equation of state (${d.Tmin} K, triple point)`,
    )
  if (T > d.Tmax)
    return outOfRange(m, `${T.toFixed(2)} K is above the highest temperature of the equation of state (${d.Tmax} K)`)
  if (p > d.pmax)
    return outOfRange(
      m,
      `${(p / 1e6).toPrecision(4)} MPa is above the highest pressure of the equation of state (${d.pmax / 1e6} MPa)`,
    )
  return null
}

/** Largest density we search: well beyond the triple-point liquid. */
const rhoMax = (m: Model) => 1.6 * ancillary(m.data.rhoL, m.data.Ttriple) * m.data.eos.M

function stateTP(m: Model, T: number, p: number): FluidResult<FluidState> {
  const bad = checkTP(m, T, p)
  if (bad) return bad
  const d = m.data
  const top = rhoMax(m)
  pressureAndSlope(m, T, top, buf)
  if (buf[0]! < p)
    return outOfRange(
      m,
      `${(p / 1e6).toPrecision(4)} MPa at ${T.toFixed(2)} K lies beyond the liquid densities this equation covers`,
    )
  if (T <= d.Tc - SAT_T_MARGIN) {
    const sd = satDensities(m, T)
    if (!sd) return fail('no-convergence', `${d.id}: saturation did not converge at ${T.toFixed(3)} K`)
    const rel = (p - sd.p) / sd.p
    if (Math.abs(rel) < 1e-9) {
      return outOfRange(
        m,
        `${(p / 1000).toPrecision(6)} kPa is the saturation pressure at ${T.toFixed(3)} K — inside the dome temperature and pressure do not fix the state; give a quality or h or s`,
      )
    }
    if (p > sd.p) {
      const rho = densityIn(m, T, p, sd.rhoL, top, sd.rhoL * 1.001)
      return ok(stateAt(m, T, rho, 'liquid', null))
    }
    const rho = densityIn(m, T, p, 0, sd.rhoV, Math.min(p / (m.R * T), sd.rhoV))
    return ok(stateAt(m, T, rho, 'vapour', null))
  }
  if (T < d.Tc && Math.abs(p - d.pc) < 0.01 * d.pc) {
    // within SAT_T_MARGIN below Tc and near pc: the dome's tip, not computed
    return outOfRange(
      m,
      `${T.toFixed(3)} K and ${(p / 1e6).toPrecision(5)} MPa are within ${SAT_T_MARGIN} K and 1 % of the critical point (${d.Tc} K, ${(d.pc / 1e6).toPrecision(5)} MPa), where these properties are not computed`,
    )
  }
  // above Tc, or just below it but away from pc, p(ρ) crosses p once: bracketed Newton over all ρ
  const rho = densityIn(m, T, p, 0, top, p / (m.R * T))
  pressureAndSlope(m, T, rho, buf)
  if (Math.abs(buf[0]! - p) > 1e-8 * p)
    return fail(
      'no-convergence',
      `${d.id}: density did not converge at ${T.toFixed(2)} K, ${(p / 1e6).toPrecision(5)} MPa`,
    )
  const phase = T >= d.Tc ? (p >= d.pc ? 'supercritical' : 'vapour') : p > d.pc ? 'liquid' : 'vapour'
  return ok(stateAt(m, T, rho, phase, null))
}

function mix(sat: SaturationPair, x: number): FluidState {
  const L = sat.liquid,
    V = sat.vapour
  const v = L.v + x * (V.v - L.v)
  const h = L.h + x * (V.h - L.h)
  const s = L.s + x * (V.s - L.s)
  if (x === 0) return { ...L, x: 0 }
  if (x === 1) return { ...V, x: 1 }
  return {
    T: sat.T,
    p: sat.p,
    rho: 1 / v,
    v,
    h,
    u: h - sat.p * v,
    s,
    x,
    phase: 'two-phase',
    cp: null,
    cv: null,
    w: null,
  }
}

type Key = 'h' | 's'

function statePY(m: Model, p: number, y: number, key: Key): FluidResult<FluidState> {
  const d = m.data
  const label = key === 'h' ? 'enthalpy' : 'entropy'
  if (!Number.isFinite(p) || !Number.isFinite(y))
    return fail('invalid-input', `${d.id}: pressure and ${label} must be numbers`)
  if (p <= 0) return fail('invalid-input', `${d.id}: pressure must be positive`)
  if (p > d.pmax)
    return outOfRange(
      m,
      `${(p / 1e6).toPrecision(4)} MPa is above the highest pressure of the equation of state (${d.pmax / 1e6} MPa)`,
    )
  let Tlo = d.Tmin,
    Thi = d.Tmax
  const sat = p < d.pc ? satAtP(m, p) : null
  if (sat && !sat.ok && sat.error.code !== 'out-of-range') return sat
  if (sat && sat.ok) {
    const yL = sat.value.liquid[key],
      yV = sat.value.vapour[key]
    if (y >= yL && y <= yV) return ok(mix(sat.value, (y - yL) / (yV - yL)))
    if (y < yL) Thi = sat.value.T
    else Tlo = sat.value.T
  } else if (sat && !sat.ok && p < d.pc) {
    // below the triple-point pressure or just under pc: single phase over the whole range
    const lo = satAtT(m, d.Ttriple)
    if (lo.ok && p < lo.value.p)
      return outOfRange(
        m,
        `${(p / 1000).toPrecision(5)} kPa is below the triple-point pressure (${(lo.value.p / 1000).toPrecision(5)} kPa)`,
      )
  }
  const g = (T: number): number => {
    const s = stateTP(m, T, p)
    return s.ok ? s.value[key] - y : NaN
  }
  // nudge the ends off the saturation line where stateTP refuses
  const eps = 1e-9
  const a = Tlo === d.Tmin ? Tlo : Tlo * (1 + eps)
  const b = Thi === d.Tmax ? Thi : Thi * (1 - eps)
  const ga = g(a),
    gb = g(b)
  if (!Number.isFinite(ga) || !Number.isFinite(gb)) {
    return fail('no-convergence', `${d.id}: could not bracket the ${label} at ${(p / 1e6).toPrecision(5)} MPa`)
  }
  if (ga > 0)
    return outOfRange(
      m,
      `${label} ${key === 'h' ? (y / 1000).toFixed(2) + ' kJ/kg' : (y / 1000).toFixed(4) + ' kJ/(kg K)'} at ${(p / 1e6).toPrecision(5)} MPa needs a temperature below ${a.toFixed(2)} K, outside the range of the equation of state`,
    )
  if (gb < 0)
    return outOfRange(
      m,
      `${label} ${key === 'h' ? (y / 1000).toFixed(2) + ' kJ/kg' : (y / 1000).toFixed(4) + ' kJ/(kg K)'} at ${(p / 1e6).toPrecision(5)} MPa needs a temperature above ${b.toFixed(2)} K, outside the range of the equation of state`,
    )
  const T = brent(g, a, b, 1e-13 * b)
  if (!Number.isFinite(T))
    return fail('no-convergence', `${d.id}: the temperature solve for the ${label} did not converge`)
  return stateTP(m, T, p)
}

function stateTx(m: Model, T: number, x: number): FluidResult<FluidState> {
  if (!Number.isFinite(x) || x < 0 || x > 1)
    return fail('invalid-input', `${m.data.id}: quality must be between 0 and 1`)
  const s = satAtT(m, T)
  return s.ok ? ok(mix(s.value, x)) : s
}

function statePx(m: Model, p: number, x: number): FluidResult<FluidState> {
  if (!Number.isFinite(x) || x < 0 || x > 1)
    return fail('invalid-input', `${m.data.id}: quality must be between 0 and 1`)
  const s = satAtP(m, p)
  return s.ok ? ok(mix(s.value, x)) : s
}

/** Build a Refrigerant, fixing h and s offsets so the stated reference state holds exactly. */
export function buildRefrigerant(data: FluidData): Refrigerant {
  const m = buildRefrigerantModel(data)
  return {
    id: data.id,
    name: data.name,
    molarMass: data.eos.M,
    Tc: data.Tc,
    pc: data.pc,
    rhoc: data.rhoc,
    Ttriple: data.Ttriple,
    Tmin: data.Tmin,
    Tmax: data.Tmax,
    pmax: data.pmax,
    source: data.source,
    referenceState: data.referenceState,
    stateTP: (T, p) => stateTP(m, T, p),
    statePH: (p, h) => statePY(m, p, h, 'h'),
    statePS: (p, s) => statePY(m, p, s, 's'),
    stateTx: (T, x) => stateTx(m, T, x),
    statePx: (p, x) => statePx(m, p, x),
    saturationT: (T) => satAtT(m, T),
    saturationP: (p) => satAtP(m, p),
  }
}

/** for tests: raw state at (T, ρ) including the reference offsets */
export function stateTRho(data: FluidData): (T: number, rho: number) => FluidState {
  const r = buildRefrigerantModel(data)
  return (T, rho) => stateAt(r, T, rho, 'vapour', null)
}

function buildRefrigerantModel(data: FluidData): Model {
  const m = makeModel(data)
  const sd = satDensities(m, data.ref.T)
  if (sd) {
    const raw = stateAt(m, data.ref.T, sd.rhoL, 'liquid', 0)
    m.dh = data.ref.h - raw.h
    m.ds = data.ref.s - raw.s
  }
  return m
}
