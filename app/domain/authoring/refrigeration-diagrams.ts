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
 * The dome runs from a little below the cycle's lowest temperature (or the triple point) up to
 * the critical point, so the cycle fills the chart. Never throws: a curve that cannot be
 * computed becomes a straight segment. Teaching values, not design data.
 */
import { REFRIGERANT_IDS, getRefrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import type { FluidState, Refrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { Curve, CycleDiagrams, Plot } from './diagram-plot.ts'
import { LIN, axes, cleanCurve, finite, pin, positive, straight, type Pair, type Scale } from './diagram-math.ts'

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

/** The three diagrams of a vapour-compression cycle; null when its states are not the solver's four. */
export function refrigerationDiagrams(sol: FormattedRefrigeration): CycleDiagrams | null {
  const raw = sol.states.map((st) => ({
    label: st.name,
    pt: { p: st.p.value, T: st.T.value, h: st.h.value, s: st.s.value, v: st.v.value },
  }))
  if (raw.length !== 4 || !raw.every((r) => positive(r.pt.p, r.pt.T, r.pt.v) && finite(r.pt.h, r.pt.s))) return null
  const [s1, s2, s3, s4] = raw as [(typeof raw)[0], (typeof raw)[0], (typeof raw)[0], (typeof raw)[0]]
  const f = refrigerantOf(sol.substance)
  const fluidName = sol.substance.replace(/\s*\(.*\)\s*$/, '')
  const gasCooler = f !== null && s2.pt.p >= f.pc
  const isentropic = Math.abs(s2.pt.s - s1.pt.s) <= 1e-7 * Math.max(Math.abs(s1.pt.s), 1)

  const curves: Built[] = [
    curveOf(
      s1.label,
      s2.label,
      isentropic ? 'compressor (isentropic compression)' : 'compressor (irreversible compression)',
      !isentropic,
      s1.pt,
      s2.pt,
      f && isentropic ? safely(() => refrigerantIsentrope(f, s1.pt, s2.pt)) : null,
    ),
    curveOf(
      s2.label,
      s3.label,
      gasCooler
        ? 'gas cooler (isobaric heat rejection above the critical pressure)'
        : 'condenser (isobaric heat rejection)',
      false,
      s2.pt,
      s3.pt,
      f ? safely(() => refrigerantIsobar(f, s2.pt.p, s2.pt, s3.pt)) : null,
    ),
    curveOf(s3.label, s4.label, 'throttling valve (isenthalpic, irreversible)', true, s3.pt, s4.pt, null),
    curveOf(
      s4.label,
      s1.label,
      'evaporator (isobaric heat absorption)',
      false,
      s4.pt,
      s1.pt,
      f ? safely(() => refrigerantIsobar(f, s4.pt.p, s4.pt, s1.pt)) : null,
    ),
  ]

  const Tmin = Math.min(...raw.map((r) => r.pt.T))
  const dome = f ? (safely(() => refrigerantDome(f, Tmin - DOME_BELOW)) ?? []) : []
  const domeFrom =
    f && dome.length > 0 && dome[0]!.T > f.Ttriple + 1e-6
      ? `${Number(dome[0]!.T.toPrecision(4))} K`
      : 'the triple point'
  const domeOf = (map: (a: RefrigerantPoint) => Pair): Pick<Plot, 'dome'> =>
    dome.length > 2 ? { dome: { points: dome.map(map), fluid: fluidName, from: domeFrom } } : {}

  const points = (map: (a: RefrigerantPoint) => Pair) =>
    raw.map((r) => {
      const [x, y] = map(r.pt)
      return { label: r.label, x, y }
    })
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
      `p–h diagram — ${fluidName}, logarithmic pressure axis`,
      { label: 'specific enthalpy h', unit: 'kJ/kg' },
      { label: 'pressure p (log scale)', unit: 'kPa' },
    ),
    ts: plot(
      'ts',
      ts,
      LIN,
      `T–s diagram — ${fluidName}`,
      { label: 'specific entropy s', unit: 'kJ/(kg·K)' },
      { label: 'temperature T', unit: 'K' },
    ),
    pv: plot(
      'pv',
      pv,
      LOG,
      `P–v diagram — ${fluidName}, log–log axes`,
      { label: 'specific volume v (log scale)', unit: 'm³/kg' },
      { label: 'pressure p (log scale)', unit: 'kPa' },
    ),
  }
}
