/**
 * Plot data for a vapour-compression cycle: the p–h diagram (log p against h, the standard chart
 * of refrigeration), the T–s diagram and the P–v diagram (log–log), each with the refrigerant's
 * saturation dome. Every curve runs through states of the refrigerant's own equation of state
 * (app/domain/thermo/refrigerants), sampled cheaply:
 *
 * - isobars (evaporator, condenser, gas cooler): inside the dome by quality (T constant, h, s, v
 *   linear in x between the saturated states), outside it by temperature (stateTP), with the
 *   saturated states as the corners;
 * - the isentropic compression: at pressures spaced geometrically, T found by Newton on
 *   s(T, p) = s1 with ∂s/∂T = cp/T;
 * - the throttling valve (isenthalpic, irreversible) and a compression with an efficiency below
 *   one: dashed straight segments, common practice for paths the states do not define (on the
 *   p–h chart the valve is the vertical line h4 = h3).
 *
 * The two-stage cycle (flash chamber) adds the adiabatic mixing and the flash chamber's
 * separation as dashed paths along the intermediate isobar; the cascade is two sets of plots,
 * each cycle on its own refrigerant's dome (CycleDiagrams.second for the upper cycle).
 *
 * The dome runs from a little below the cycle's lowest temperature (or the triple point) up to
 * the critical point, so the cycle fills the chart. This is the one place a refrigerant's dome
 * is computed. Never throws: a curve that cannot be computed becomes a straight segment.
 * Teaching values, not design data.
 */
import { REFRIGERANT_IDS, getRefrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import type { FluidState, Refrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import type { FormattedCascade, FormattedTwoStage } from '#app/domain/thermo/refrigerants/multi-stage-template.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { RefrigerantId } from '#app/domain/thermo/refrigerants/types.ts'
import type { Curve, CycleDiagrams, Plot } from './diagram-plot.ts'
import { LIN, axes, cleanCurve, finite, pin, positive, straight, type Pair, type Scale } from './diagram-math.ts'
import { hasLength } from './tuple.ts'

/** A state along a curve, SI: Pa, K, J/kg, J/(kg K), m³/kg. */
export interface RefrigerantPoint {
  readonly p: number
  readonly T: number
  readonly h: number
  readonly s: number
  readonly v: number
}

/** Points per single-phase stretch of an isobar, per two-phase stretch, per isentrope. */
const N_SINGLE = 10
const N_WET = 6
const N_ISENTROPE = 10
/** Temperatures on each branch of the dome (plus its top). */
const N_DOME = 32
/** How far below the cycle's lowest temperature the dome starts, K. */
const DOME_BELOW = 25
/** The saturation equations are solved up to this far below Tc (refrigerants/saturation.ts). */
const TOP_MARGIN = 0.01

const LOG: [Scale, Scale] = ['log', 'log']
const PH_SCALES: [Scale, Scale] = ['linear', 'log']

/** The refrigerant a solution names (FormattedRefrigeration.substance is the fluid's name). */
export function refrigerantOf(substance: string): Refrigerant | null {
  for (const id of REFRIGERANT_IDS) {
    const f = getRefrigerant(id)
    if (f.name === substance) return f
  }
  return null
}

const point = (s: FluidState): RefrigerantPoint => ({ p: s.p, T: s.T, h: s.h, s: s.s, v: s.v })

const ph = (a: RefrigerantPoint): Pair => [a.h / 1000, a.p / 1000]
const ts = (a: RefrigerantPoint): Pair => [a.s / 1000, a.T]
const pv = (a: RefrigerantPoint): Pair => [a.v, a.p / 1000]

/**
 * The saturation dome as one closed outline of states: the liquid branch from `Tlow` up to the
 * top of the dome, then the vapour branch back down. The top is the midpoint of the two
 * saturated states 0.01 K below Tc (where the saturation equations stop), within a hair of the
 * critical point.
 */
export function refrigerantDome(f: Refrigerant, Tlow: number): RefrigerantPoint[] {
  const Ttop = f.Tc - TOP_MARGIN
  const T0 = Math.min(Math.max(Tlow, f.Ttriple), Ttop - 1)
  const liquid: RefrigerantPoint[] = []
  const vapour: RefrigerantPoint[] = []
  for (let i = 0; i < N_DOME; i++) {
    // Cubic spacing: near the critical point h, s and v change fastest with T.
    const u = i / N_DOME
    const T = T0 + (Ttop - T0) * (1 - Math.pow(1 - u, 3))
    const sat = f.saturationT(T)
    if (!sat.ok) continue
    liquid.push(point(sat.value.liquid))
    vapour.push(point(sat.value.vapour))
  }
  const top = f.saturationT(Ttop)
  if (top.ok) {
    const L = top.value.liquid
    const V = top.value.vapour
    liquid.push({
      p: top.value.p,
      T: Ttop,
      h: (L.h + V.h) / 2,
      s: (L.s + V.s) / 2,
      v: Math.sqrt(L.v * V.v),
    })
  }
  return [...liquid, ...vapour.reverse()]
}

/** States at pressure p from a to b, through the saturated corners when the path crosses the dome. */
export function refrigerantIsobar(
  f: Refrigerant,
  p: number,
  a: RefrigerantPoint,
  b: RefrigerantPoint,
): RefrigerantPoint[] | null {
  const byT = (x: RefrigerantPoint, y: RefrigerantPoint): RefrigerantPoint[] | null => {
    const out: RefrigerantPoint[] = [x]
    for (let i = 1; i < N_SINGLE; i++) {
      const T = x.T + ((y.T - x.T) * i) / N_SINGLE
      const st = f.stateTP(T, p)
      if (!st.ok) return null
      out.push(point(st.value))
    }
    out.push(y)
    return out
  }
  if (!(p < f.pc)) return byT(a, b)
  const sat = f.saturationP(p)
  if (!sat.ok) return byT(a, b)
  const L = point(sat.value.liquid)
  const V = point(sat.value.vapour)
  const wet = (x: RefrigerantPoint, y: RefrigerantPoint): RefrigerantPoint[] => {
    const out: RefrigerantPoint[] = [x]
    const dh = V.h - L.h
    for (let i = 1; i < N_WET; i++) {
      const h = x.h + ((y.h - x.h) * i) / N_WET
      const q = (h - L.h) / dh
      out.push({ p, T: sat.value.T, h, s: L.s + q * (V.s - L.s), v: L.v + q * (V.v - L.v) })
    }
    out.push(y)
    return out
  }
  // Breakpoints along the path, in its direction: the end states and the dome corners between them.
  const lo = Math.min(a.h, b.h)
  const hi = Math.max(a.h, b.h)
  // A corner at an end state (saturated vapour leaving the evaporator) is that state already.
  const tol = (c: RefrigerantPoint) => 1e-6 * Math.max(Math.abs(c.h), 1e3)
  const corners = [L, V]
    .filter((c) => c.h > lo + tol(c) && c.h < hi - tol(c))
    .sort((x, y) => (b.h >= a.h ? x.h - y.h : y.h - x.h))
  const stops = [a, ...corners, b]
  const out: RefrigerantPoint[] = []
  for (let i = 0; i + 1 < stops.length; i++) {
    const x = stops[i]!
    const y = stops[i + 1]!
    const mid = (x.h + y.h) / 2
    const inside = mid >= L.h && mid <= V.h
    const part = inside ? wet(x, y) : byT(x, y)
    if (!part) return null
    out.push(...(i === 0 ? part : part.slice(1)))
  }
  return out
}

/** States along the isentrope s = a.s from a.p to b.p (pressures spaced geometrically). */
export function refrigerantIsentrope(
  f: Refrigerant,
  a: RefrigerantPoint,
  b: RefrigerantPoint,
): RefrigerantPoint[] | null {
  const out: RefrigerantPoint[] = [a]
  let T = a.T
  for (let i = 1; i < N_ISENTROPE; i++) {
    const u = i / N_ISENTROPE
    const p = a.p * Math.pow(b.p / a.p, u)
    // Start from the straight line in log p between the ends, or the last point's temperature.
    T = Math.max(T, a.T + (b.T - a.T) * u)
    let st: FluidState | null = null
    for (let k = 0; k < 30; k++) {
      const r = f.stateTP(T, p)
      if (!r.ok || r.value.cp === null || !(r.value.cp > 0)) return null
      st = r.value
      const dT = ((a.s - st.s) * T) / st.cp!
      T += dT
      if (Math.abs(dT) < 1e-9 * T) break
    }
    if (!st || !(Math.abs(st.s - a.s) <= 1e-6 * Math.max(1, Math.abs(a.s)))) return null
    const r = f.stateTP(T, p)
    if (!r.ok) return null
    out.push(point(r.value))
  }
  out.push(b)
  return out
}

interface Built {
  readonly ph: Curve
  readonly ts: Curve
  readonly pv: Curve
}

function curveOf(
  from: string,
  to: string,
  process: string,
  dashed: boolean,
  a: RefrigerantPoint,
  b: RefrigerantPoint,
  path: RefrigerantPoint[] | null,
): Built {
  const style = dashed ? ('dashed' as const) : ('solid' as const)
  const base = { from, to, process, style }
  if (path && path.length >= 2) {
    return {
      ph: cleanCurve({ ...base, points: pin(path.map(ph), ph(a), ph(b)) }),
      ts: cleanCurve({ ...base, points: pin(path.map(ts), ts(a), ts(b)) }),
      pv: cleanCurve({ ...base, points: pin(path.map(pv), pv(a), pv(b)) }),
    }
  }
  return {
    ph: cleanCurve({ ...base, points: straight(ph(a), ph(b), PH_SCALES) }),
    ts: cleanCurve({ ...base, points: straight(ts(a), ts(b), LIN) }),
    pv: cleanCurve({ ...base, points: straight(pv(a), pv(b), LOG) }),
  }
}

function safely<T>(f: () => T | null): T | null {
  try {
    return f()
  } catch {
    return null
  }
}

interface Labelled {
  readonly label: string
  readonly pt: RefrigerantPoint
}

/** A solution's states as points; null unless every one has a positive p, T, v and a finite h, s. */
function labelled(
  states: readonly {
    name: string
    p: { value: number }
    T: { value: number }
    h: { value: number }
    s: { value: number }
    v: { value: number }
  }[],
): Labelled[] | null {
  const raw = states.map((st) => ({
    label: st.name,
    pt: { p: st.p.value, T: st.T.value, h: st.h.value, s: st.s.value, v: st.v.value },
  }))
  return raw.every((r) => positive(r.pt.p, r.pt.T, r.pt.v) && finite(r.pt.h, r.pt.s)) ? raw : null
}

/** A compressor from a to b: the isentrope when s is unchanged, else a dashed straight segment. */
function compressorCurve(f: Refrigerant | null, a: Labelled, b: Labelled, name: string): Built {
  const isentropic = Math.abs(b.pt.s - a.pt.s) <= 1e-7 * Math.max(Math.abs(a.pt.s), 1)
  return curveOf(
    a.label,
    b.label,
    isentropic ? `${name} (isentropic compression)` : `${name} (irreversible compression)`,
    !isentropic,
    a.pt,
    b.pt,
    f && isentropic ? safely(() => refrigerantIsentrope(f, a.pt, b.pt)) : null,
  )
}

/** A path at the pressure of a, through the dome's corners: heat exchangers, and (dashed) mixing and separation. */
function isobarCurve(f: Refrigerant | null, a: Labelled, b: Labelled, process: string, dashed = false): Built {
  return curveOf(
    a.label,
    b.label,
    process,
    dashed,
    a.pt,
    b.pt,
    f ? safely(() => refrigerantIsobar(f, a.pt.p, a.pt, b.pt)) : null,
  )
}

/** A throttling valve: isenthalpic and irreversible, a dashed straight segment (vertical on the p–h chart). */
function valveCurve(a: Labelled, b: Labelled, name: string): Built {
  return curveOf(a.label, b.label, `${name} (isenthalpic, irreversible)`, true, a.pt, b.pt, null)
}

/**
 * The p–h, T–s and P–v plots of one cycle on one refrigerant's dome. `which` names the cycle in
 * the titles when a figure shows more than one ("lower cycle").
 */
function plotsFor(
  f: Refrigerant | null,
  fluidName: string,
  states: readonly Labelled[],
  curves: readonly Built[],
  which?: string,
): Omit<CycleDiagrams, 'second'> {
  const Tmin = Math.min(...states.map((r) => r.pt.T))
  const dome = f ? (safely(() => refrigerantDome(f, Tmin - DOME_BELOW)) ?? []) : []
  const domeFrom =
    f && dome.length > 0 && dome[0]!.T > f.Ttriple + 1e-6
      ? `${Number(dome[0]!.T.toPrecision(4))} K`
      : 'the triple point'
  const domeOf = (map: (a: RefrigerantPoint) => Pair): Pick<Plot, 'dome'> =>
    dome.length > 2 ? { dome: { points: dome.map(map), fluid: fluidName, from: domeFrom } } : {}
  const points = (map: (a: RefrigerantPoint) => Pair) =>
    states.map((r) => {
      const [x, y] = map(r.pt)
      return { label: r.label, x, y }
    })
  const name = which ? `${which}, ${fluidName}` : fluidName
  const plot = (
    key: keyof Built,
    map: (a: RefrigerantPoint) => Pair,
    scales: [Scale, Scale],
    title: string,
    x: Omit<Plot['x'], 'min' | 'max' | 'scale'>,
    y: Omit<Plot['y'], 'min' | 'max' | 'scale'>,
  ): Plot => {
    const cs = curves.map((c) => c[key])
    const pts = points(map)
    const d = domeOf(map)
    const r = axes(cs, pts, d.dome?.points, scales, false, true)
    return {
      title,
      x: { ...x, scale: scales[0], min: r.x[0], max: r.x[1] },
      y: { ...y, scale: scales[1], min: r.y[0], max: r.y[1] },
      curves: cs,
      points: pts,
      ...d,
    }
  }
  return {
    ph: plot(
      'ph',
      ph,
      PH_SCALES,
      `p–h diagram — ${name}, logarithmic pressure axis`,
      { label: 'specific enthalpy h', unit: 'kJ/kg' },
      { label: 'pressure p (log scale)', unit: 'kPa' },
    ),
    ts: plot(
      'ts',
      ts,
      LIN,
      `T–s diagram — ${name}`,
      { label: 'specific entropy s', unit: 'kJ/(kg·K)' },
      { label: 'temperature T', unit: 'K' },
    ),
    pv: plot(
      'pv',
      pv,
      LOG,
      `P–v diagram — ${name}, log–log axes`,
      { label: 'specific volume v (log scale)', unit: 'm³/kg' },
      { label: 'pressure p (log scale)', unit: 'kPa' },
    ),
  }
}

const fluidNameOf = (substance: string) => substance.replace(/\s*\(.*\)\s*$/, '')

/** The four curves of a single-stage cycle 1 → 2 → 3 → 4 → 1 (evaporator exit first). */
function singleStageCurves(
  f: Refrigerant | null,
  [s1, s2, s3, s4]: readonly [Labelled, Labelled, Labelled, Labelled],
  where: { condenser?: string; evaporator?: string; compressor?: string; valve?: string } = {},
): Built[] {
  const gasCooler = f !== null && s2.pt.p >= f.pc
  return [
    compressorCurve(f, s1, s2, where.compressor ?? 'compressor'),
    isobarCurve(
      f,
      s2,
      s3,
      gasCooler
        ? 'gas cooler (isobaric heat rejection above the critical pressure)'
        : (where.condenser ?? 'condenser (isobaric heat rejection)'),
    ),
    valveCurve(s3, s4, where.valve ?? 'throttling valve'),
    isobarCurve(f, s4, s1, where.evaporator ?? 'evaporator (isobaric heat absorption)'),
  ]
}

/** A refrigerant the tables know (the cascade names one per state, as text). */
function isRefrigerantId(id: string): id is RefrigerantId {
  return REFRIGERANT_IDS.some((r) => r === id)
}

/** The three diagrams of a vapour-compression cycle; null when its states are not the solver's four. */
export function refrigerationDiagrams(sol: FormattedRefrigeration): CycleDiagrams | null {
  const raw = labelled(sol.states)
  if (!raw || !hasLength(raw, 4)) return null
  const f = refrigerantOf(sol.substance)
  return plotsFor(f, fluidNameOf(sol.substance), raw, singleStageCurves(f, raw))
}

/**
 * The two-stage cycle with a flash chamber (states 1–9 as the solver numbers them): both
 * compressors, the mixing chamber (2 and the flash vapour 9 meet at 3 on the intermediate
 * isobar, dashed: adiabatic mixing is irreversible), the condenser, the high-pressure valve into
 * the flash chamber (6 splits along the isobar into saturated liquid 7 and vapour 9, dashed), the
 * low-pressure valve and the evaporator, on the refrigerant's dome. Null unless the states are the solver's nine.
 */
export function twoStageDiagrams(sol: FormattedTwoStage): CycleDiagrams | null {
  const raw = labelled(sol.states)
  if (!raw || !hasLength(raw, 9) || raw.some((r, i) => r.label !== String(i + 1))) return null
  const [s1, s2, s3, s4, s5, s6, s7, s8, s9] = raw
  const f = refrigerantOf(sol.substance)
  const curves: Built[] = [
    compressorCurve(f, s1, s2, 'low-stage compressor'),
    isobarCurve(f, s2, s3, 'mixing chamber (low-stage discharge cooled by the flash vapour, adiabatic mixing)', true),
    compressorCurve(f, s3, s4, 'high-stage compressor'),
    isobarCurve(f, s4, s5, 'condenser (isobaric heat rejection)'),
    valveCurve(s5, s6, 'high-pressure valve'),
    isobarCurve(f, s6, s7, 'flash chamber (saturated liquid separated)', true),
    valveCurve(s7, s8, 'low-pressure valve'),
    isobarCurve(f, s8, s1, 'evaporator (isobaric heat absorption)'),
    isobarCurve(f, s6, s9, 'flash chamber (saturated vapour separated)', true),
    isobarCurve(f, s9, s3, 'flash vapour into the mixing chamber (adiabatic mixing)', true),
  ]
  return plotsFor(f, fluidNameOf(sol.substance), raw, curves, 'two-stage cycle')
}

/**
 * The cascade: each cycle on its own refrigerant's dome, the lower cycle (states 1–4) first and
 * the upper cycle (5–8) as the second set of plots. The lower cycle's condenser and the upper
 * cycle's evaporator are the two sides of the cascade heat exchanger. Null unless the states are
 * the solver's eight.
 */
export function cascadeDiagrams(sol: FormattedCascade): CycleDiagrams | null {
  const raw = labelled(sol.states)
  if (!raw || !hasLength(raw, 8)) return null
  const [r1, r2, r3, r4, r5, r6, r7, r8] = raw
  const lowerStates = [r1, r2, r3, r4] as const
  const upperStates = [r5, r6, r7, r8] as const
  const fluid = (i: number) => {
    const id = sol.states[i]!.refrigerant
    return isRefrigerantId(id) ? getRefrigerant(id) : null
  }
  const fl = fluid(0)
  const fu = fluid(4)
  const lower = plotsFor(
    fl,
    fl ? fluidNameOf(fl.name) : sol.states[0]!.refrigerant,
    lowerStates,
    singleStageCurves(fl, lowerStates, {
      compressor: 'lower-cycle compressor',
      condenser: 'cascade heat exchanger, lower cycle condensing (isobaric heat rejection to the upper cycle)',
      valve: 'lower-cycle valve',
      evaporator: 'evaporator, the cold space (isobaric heat absorption)',
    }),
    'lower cycle',
  )
  const upper = plotsFor(
    fu,
    fu ? fluidNameOf(fu.name) : sol.states[4]!.refrigerant,
    upperStates,
    singleStageCurves(fu, upperStates, {
      compressor: 'upper-cycle compressor',
      condenser: 'condenser (isobaric heat rejection to the surroundings)',
      valve: 'upper-cycle valve',
      evaporator: 'cascade heat exchanger, upper cycle evaporating (isobaric heat absorption from the lower cycle)',
    }),
    'upper cycle',
  )
  return { ...lower, second: upper }
}
