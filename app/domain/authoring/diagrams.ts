/**
 * Plot data for the P–v and T–s diagrams of a solved variant (and the p–h diagram of a
 * refrigeration cycle, in refrigeration-diagrams.ts): the states as points and each
 * process as the curve it is, computed from the solved states only (no re-solving).
 *
 * Ideal gas: p v^k = const through both end states for isothermal, isentropic and polytropic
 * steps (k = 1 and k = γ are the exact cases of constant-cp gases; for NASA data the fit still
 * passes through both ends); T = T1·exp((s − s1)/c) in T–s for isochoric, isobaric and
 * polytropic steps, with c fitted through both ends (c = cv, cp or the polytropic c_n for a
 * constant-cp gas). Steps whose intermediate states the solution does not define (an adiabatic
 * step with Δs ≠ 0, i.e. an isentropic efficiency below one) are dashed straight segments,
 * common practice for irreversible paths.
 *
 * Water/steam (Rankine): every curve runs through IAPWS-IF97 states (isobars and isentropes
 * sampled with stateFromPS), with the saturation dome; P–v on log–log axes, since the liquid
 * and the vapour volumes differ by four decades.
 *
 * Never throws: a curve that cannot be computed becomes a straight segment, a state with a
 * non-finite value is left out.
 */
import type { FormattedSolution } from '#app/domain/thermo/format.ts'
import type { FormattedCombined } from '#app/domain/thermo/combined/combined-template.ts'
import {
  saturationAtP,
  saturationAtT,
  STEAM_LIMITS,
  stateFromPS,
  stateFromPV,
  stateFromTS,
} from '#app/domain/thermo/steam/index.ts'
import type {
  FormattedCalorimeter,
  FormattedRankine,
  FormattedRankineState,
  FormattedSteamCycle,
} from '#app/domain/thermo/steam/index.ts'

import type { Axis, Curve, CycleDiagrams } from './diagram-plot.ts'
import { LIN, N, axes, cleanCurve, finite, pin, positive, same, straight, type Pair } from './diagram-math.ts'
import { cascadeDiagrams, refrigerationDiagrams, twoStageDiagrams } from './refrigeration-diagrams.ts'
import {
  isCalorimeterSolution,
  isCombinedSolution,
  isIdealGasSolution,
  isRankineSolution,
  isRefrigerationSolution,
  isTwoStageSolution,
  isCascadeSolution,
  isSteamCycleSolution,
  isSteadyFlowSolution,
  type BankSolution,
} from './solution-kind.ts'
import { flowDiagrams } from './flow-diagrams.ts'
import { plantEdges } from './steam-plant-layout.ts'

export type { Axis, Curve, CycleDiagrams, Plot } from './diagram-plot.ts'
export { axisSymbol, describePlot } from './diagram-plot.ts'

/** Points per IF97 isobar or isentrope (plus the dome corners on an isobar). */
const N_STEAM = 40
/** Points per dome branch. */
const N_DOME = 30
/** Triple-point temperature of water, K (IAPWS; the dome starts there, at about 0.61 kPa). */
const T_TRIPLE = 273.16

/** p v^k = const through (v1, p1) and (v2, p2), v spaced geometrically. */
function powerLaw(a: Pair, b: Pair): Pair[] {
  const [v1, p1] = a
  const [v2, p2] = b
  if (!positive(v1, p1, v2, p2) || same(v1, v2, 1e-12)) return straight(a, b, LIN)
  const k = Math.log(p2 / p1) / Math.log(v1 / v2)
  if (!Number.isFinite(k)) return straight(a, b, LIN)
  const pts: Pair[] = []
  for (let i = 0; i < N; i++) {
    const v = v1 * Math.pow(v2 / v1, i / (N - 1))
    pts.push([v, p1 * Math.pow(v1 / v, k)])
  }
  return pin(pts, a, b)
}

/** T = T1 exp((s − s1)/c) through (s1, T1) and (s2, T2): T geometric, s linear in the index. */
function expFit(a: Pair, b: Pair): Pair[] {
  const [s1, T1] = a
  const [s2, T2] = b
  if (!positive(T1, T2) || !finite(s1, s2) || same(T1, T2, 1e-12) || s1 === s2) return straight(a, b, LIN)
  const pts: Pair[] = []
  for (let i = 0; i < N; i++) {
    const u = i / (N - 1)
    pts.push([s1 + (s2 - s1) * u, T1 * Math.pow(T2 / T1, u)])
  }
  return pin(pts, a, b)
}

// --- ideal gas -----------------------------------------------------------------------------

interface GasPoint {
  label: string
  p: number
  v: number
  T: number
  s: number
}

function gasDiagrams(sol: FormattedSolution): CycleDiagrams {
  const mass = sol.gas?.basis !== 'mole'
  const per = mass ? 'kg' : 'mol'
  // Plotting units: kPa, m³ per basis, K, and kJ/(kg·K) or J/(mol·K) (the sizes a table shows).
  const sFactor = mass ? 1e-3 : 1
  const R = Math.abs(sol.gas?.R?.value ?? 0)
  const states: (GasPoint | null)[] = (sol.states ?? []).map((st, i) => {
    const g = {
      label: st.name || String(i + 1),
      p: st.p.value / 1000,
      v: st.v.value,
      T: st.T.value,
      s: st.s.value * sFactor,
    }
    return finite(g.p, g.v, g.T, g.s) ? g : null
  })
  const pvCurves: Curve[] = []
  const tsCurves: Curve[] = []
  for (const step of sol.steps ?? []) {
    const a = states[step.from - 1]
    const b = states[step.to - 1]
    if (!a || !b) continue
    const sTol = 1e-9 * Math.max(R, Math.abs(a.s / sFactor), Math.abs(b.s / sFactor), 1)
    const reversibleAdiabatic = step.process === 'adiabatic' && Math.abs((b.s - a.s) / sFactor) <= sTol
    let kind: string = reversibleAdiabatic ? 'isentropic' : step.process
    let dashed = false
    let processText = step.process
    if (step.process === 'adiabatic') {
      processText = reversibleAdiabatic
        ? 'adiabatic, reversible (isentropic)'
        : 'adiabatic, irreversible (isentropic efficiency below 1)'
      if (!reversibleAdiabatic) {
        kind = 'straight'
        dashed = true
      }
    } else if (step.process === 'regenerator') {
      // The regenerator's side follows its path (isobaric by default); the solution does not
      // carry the path, so read it off the end states. Dashed: heat exchanged inside the cycle.
      dashed = true
      kind = same(a.p, b.p) ? 'isobaric' : same(a.v, b.v) ? 'isochoric' : 'straight'
      processText =
        kind === 'straight' ? 'regenerator (internal heat exchange)' : `regenerator, ${kind} (internal heat exchange)`
    }
    const pa: Pair = [a.v, a.p]
    const pb: Pair = [b.v, b.p]
    const ta: Pair = [a.s, a.T]
    const tb: Pair = [b.s, b.T]
    let pv: Pair[]
    let ts: Pair[]
    try {
      switch (kind) {
        case 'isothermal':
        case 'isentropic':
        case 'polytropic':
          pv = powerLaw(pa, pb)
          break
        default:
          pv = straight(pa, pb, LIN)
      }
      switch (kind) {
        case 'isochoric':
        case 'isobaric':
        case 'polytropic':
          ts = expFit(ta, tb)
          break
        default:
          ts = straight(ta, tb, LIN)
      }
    } catch {
      pv = [pa, pb]
      ts = [ta, tb]
    }
    const base = {
      from: a.label,
      to: b.label,
      process: processText,
      ...(step.label ? { label: step.label } : {}),
      style: dashed ? ('dashed' as const) : ('solid' as const),
    }
    pvCurves.push(cleanCurve({ ...base, points: pv }))
    tsCurves.push(cleanCurve({ ...base, points: ts }))
  }
  const ok = states.filter((s): s is GasPoint => s !== null)
  const pvPoints = ok.map((s) => ({ label: s.label, x: s.v, y: s.p }))
  const tsPoints = ok.map((s) => ({ label: s.label, x: s.s, y: s.T }))
  const pvR = axes(pvCurves, pvPoints, undefined, 'linear', true, true)
  const tsR = axes(tsCurves, tsPoints, undefined, 'linear', false, true)
  const vUnit = `m³/${per}`
  const sUnit = mass ? 'kJ/(kg·K)' : 'J/(mol·K)'
  const gasName = sol.gas?.label ? ` — ${sol.gas.label}` : ''
  return {
    pv: {
      title: `P–v diagram${gasName}`,
      x: { label: 'specific volume v', unit: vUnit, scale: 'linear', min: pvR.x[0], max: pvR.x[1] },
      y: { label: 'pressure p', unit: 'kPa', scale: 'linear', min: pvR.y[0], max: pvR.y[1] },
      curves: pvCurves,
      points: pvPoints,
    },
    ts: {
      title: `T–s diagram${gasName}`,
      x: { label: 'specific entropy s', unit: sUnit, scale: 'linear', min: tsR.x[0], max: tsR.x[1] },
      y: { label: 'temperature T', unit: 'K', scale: 'linear', min: tsR.y[0], max: tsR.y[1] },
      curves: tsCurves,
      points: tsPoints,
    },
  }
}

// --- water/steam ---------------------------------------------------------------------------

interface SteamPoint {
  label: string
  /** SI: Pa, K, J/(kg K), m³/kg */
  p: number
  T: number
  s: number
  v: number
  x: number | null
  phase: string
}

/** Saturation dome in both diagrams, from the triple point to the critical point. */
function steamDome(): { pv: Pair[]; ts: Pair[] } {
  const Tc = STEAM_LIMITS.T_CRIT
  const liquid: { pv: Pair; ts: Pair }[] = []
  const vapour: { pv: Pair; ts: Pair }[] = []
  for (let i = 0; i < N_DOME; i++) {
    // Cubic spacing: near the critical point s and v change fastest with T.
    const u = i / (N_DOME - 1)
    const T = i === N_DOME - 1 ? Tc : T_TRIPLE + (Tc - T_TRIPLE) * (1 - Math.pow(1 - u, 3))
    const sat = saturationAtT(T)
    if (!sat.ok) continue
    const { p, liquid: f, vapour: g } = sat.value
    liquid.push({ pv: [f.v, p / 1000], ts: [f.s / 1000, T] })
    vapour.push({ pv: [g.v, p / 1000], ts: [g.s / 1000, T] })
  }
  // At the critical point both branches meet: keep that point once.
  if (vapour.length > 0 && liquid.length > 0 && vapour[vapour.length - 1]!.ts[1] === Tc)
    liquid[liquid.length - 1] = vapour.pop()!
  const outline = [...liquid, ...vapour.reverse()]
  return { pv: outline.map((o) => o.pv), ts: outline.map((o) => o.ts) }
}

/** IF97 states along the isobar p from entropy sa to sb, with the dome corners as samples. */
function isobar(p: number, sa: number, sb: number): { pv: Pair[]; ts: Pair[] } | null {
  const ss: number[] = []
  for (let i = 0; i < N_STEAM; i++) ss.push(sa + ((sb - sa) * i) / (N_STEAM - 1))
  if (p < STEAM_LIMITS.P_CRIT) {
    // Sampling the saturated liquid and vapour keeps the corners of the isobar sharp.
    const sat = saturationAtP(p)
    if (sat.ok) {
      const lo = Math.min(sa, sb)
      const hi = Math.max(sa, sb)
      for (const c of [sat.value.liquid.s, sat.value.vapour.s]) if (c > lo && c < hi) ss.push(c)
      ss.sort((x, y) => (sb >= sa ? x - y : y - x))
    }
  }
  const pv: Pair[] = []
  const ts: Pair[] = []
  for (const s of ss) {
    const st = stateFromPS(p, s)
    if (!st.ok) return null
    pv.push([st.value.v, p / 1000])
    ts.push([s / 1000, st.value.T])
  }
  return { pv, ts }
}

/** IF97 states along the isentrope s from pa to pb, p spaced geometrically. */
function isentrope(s: number, pa: number, pb: number): { pv: Pair[]; ts: Pair[] } | null {
  const pv: Pair[] = []
  const ts: Pair[] = []
  for (let i = 0; i < N_STEAM; i++) {
    const p = pa * Math.pow(pb / pa, i / (N_STEAM - 1))
    const st = stateFromPS(p, s)
    if (!st.ok) return null
    pv.push([st.value.v, p / 1000])
    ts.push([s / 1000, st.value.T])
  }
  return { pv, ts }
}

function rankineDiagrams(sol: FormattedRankine): CycleDiagrams {
  const states: (SteamPoint | null)[] = (sol.states ?? []).map((st: FormattedRankineState, i) => {
    const g = {
      label: st.name || String(i + 1),
      p: st.p.value,
      T: st.T.value,
      s: st.s.value,
      v: st.v.value,
      x: st.x,
      phase: st.phase,
    }
    return positive(g.p, g.T, g.v) && finite(g.s) ? g : null
  })
  const n = states.length
  const valid = states.filter((s): s is SteamPoint => s !== null)
  const pMax = Math.max(...valid.map((s) => s.p))
  const pMin = Math.min(...valid.map((s) => s.p))
  const pvCurves: Curve[] = []
  const tsCurves: Curve[] = []
  const LOG: ['log', 'log'] = ['log', 'log']

  const add = (
    a: SteamPoint,
    b: SteamPoint,
    process: string,
    dashed: boolean,
    path: 'isobar' | 'isentrope' | 'straight',
  ) => {
    const pa: Pair = [a.v, a.p / 1000]
    const pb: Pair = [b.v, b.p / 1000]
    const ta: Pair = [a.s / 1000, a.T]
    const tb: Pair = [b.s / 1000, b.T]
    let got: { pv: Pair[]; ts: Pair[] } | null = null
    try {
      if (path === 'isobar') got = isobar(a.p, a.s, b.s)
      else if (path === 'isentrope') got = isentrope(a.s, a.p, b.p)
    } catch {
      got = null
    }
    const pv = got ? pin(got.pv, pa, pb) : straight(pa, pb, LOG)
    const ts = got ? pin(got.ts, ta, tb) : straight(ta, tb, LIN)
    const style = dashed ? ('dashed' as const) : ('solid' as const)
    pvCurves.push(cleanCurve({ from: a.label, to: b.label, process, style, points: pv }))
    tsCurves.push(cleanCurve({ from: a.label, to: b.label, process, style, points: ts }))
  }

  // A steam plant (feedwater heaters, cogeneration): its processes from the layout of its states
  // (steam-plant-layout.ts), since its states are not one loop in order.
  const edges = sol.heaters ? plantEdges(sol) : null
  for (const e of edges ?? []) {
    const a = states[e.from]
    const b = states[e.to]
    if (a && b) add(a, b, e.process, e.dashed, e.path)
  }
  for (let i = 0; i < (edges ? 0 : n); i++) {
    const a = states[i]
    const b = states[(i + 1) % n]
    if (!a || !b || n < 2) continue
    const isentropic = Math.abs(b.s - a.s) <= 1e-7 * Math.max(Math.abs(a.s), Math.abs(b.s), 1)
    if (same(a.p, b.p)) {
      const heating = b.s > a.s
      const liquidIn = a.phase.includes('liquid') && !same(a.p, pMax)
      const device = heating
        ? same(a.p, pMax)
          ? 'boiler'
          : liquidIn
            ? 'open feedwater heater'
            : 'reheater'
        : same(a.p, pMin)
          ? 'condenser'
          : 'heat rejection'
      add(a, b, `${device} (isobaric ${heating ? 'heating' : 'cooling'})`, false, 'isobar')
    } else if (b.p > a.p) {
      add(
        a,
        b,
        isentropic ? 'pump (isentropic compression)' : 'pump (irreversible compression)',
        !isentropic,
        isentropic ? 'isentrope' : 'straight',
      )
    } else {
      add(
        a,
        b,
        isentropic ? 'turbine (isentropic expansion)' : 'turbine (irreversible expansion)',
        !isentropic,
        isentropic ? 'isentrope' : 'straight',
      )
    }
  }
  // Open feedwater heater: steam bled from the turbine leaves the cycle order and condenses
  // by mixing at the heater pressure, ending as the heater's saturated-liquid exit.
  for (let i = 1; i < (edges ? 0 : n); i++) {
    const heaterExit = states[i]
    if (!heaterExit || heaterExit.x !== 0) continue
    for (let k = i + 1; k < n; k++) {
      const bled = states[k]
      if (bled && same(bled.p, heaterExit.p) && bled.s > heaterExit.s) {
        add(bled, heaterExit, 'bleed steam to the open feedwater heater (isobaric mixing)', true, 'isobar')
        break
      }
    }
  }

  let dome: { pv: Pair[]; ts: Pair[] } = { pv: [], ts: [] }
  try {
    dome = steamDome()
  } catch {
    dome = { pv: [], ts: [] }
  }
  const pvPoints = valid.map((s) => ({ label: s.label, x: s.v, y: s.p / 1000 }))
  const tsPoints = valid.map((s) => ({ label: s.label, x: s.s / 1000, y: s.T }))
  const pvR = axes(pvCurves, pvPoints, dome.pv, 'log', true, true)
  const tsR = axes(tsCurves, tsPoints, dome.ts, 'linear', false, true)
  return {
    pv: {
      title: 'P–v diagram — water/steam (IAPWS-IF97), log–log axes',
      x: { label: 'specific volume v (log scale)', unit: 'm³/kg', scale: 'log', min: pvR.x[0], max: pvR.x[1] },
      y: { label: 'pressure p (log scale)', unit: 'kPa', scale: 'log', min: pvR.y[0], max: pvR.y[1] },
      curves: pvCurves,
      points: pvPoints,
      ...(dome.pv.length > 2 ? { dome: { points: dome.pv, fluid: 'water' } } : {}),
    },
    ts: {
      title: 'T–s diagram — water/steam (IAPWS-IF97)',
      x: { label: 'specific entropy s', unit: 'kJ/(kg·K)', scale: 'linear', min: tsR.x[0], max: tsR.x[1] },
      y: { label: 'temperature T', unit: 'K', scale: 'linear', min: tsR.y[0], max: tsR.y[1] },
      curves: tsCurves,
      points: tsPoints,
      ...(dome.ts.length > 2 ? { dome: { points: dome.ts, fluid: 'water' } } : {}),
    },
  }
}

/** IF97 states along a process of water between two states, sampled by the property it keeps. */
function steamPath(process: string, a: SteamPoint, b: SteamPoint): { pv: Pair[]; ts: Pair[] } | null {
  if (process === 'isentropic') return isentrope(a.s, a.p, b.p)
  if (process === 'isobaric' || (process === 'isothermal' && same(a.p, b.p))) return isobar(a.p, a.s, b.s)
  const pv: Pair[] = []
  const ts: Pair[] = []
  for (let i = 0; i < N_STEAM; i++) {
    const f = i / (N_STEAM - 1)
    const st =
      process === 'isothermal'
        ? stateFromTS(a.T, a.s + (b.s - a.s) * f)
        : process === 'isochoric'
          ? stateFromPV(a.p * Math.pow(b.p / a.p, f), a.v)
          : null
    if (!st || !st.ok) return null
    pv.push([st.value.v, st.value.p / 1000])
    ts.push([st.value.s / 1000, st.value.T])
  }
  return { pv, ts }
}

/**
 * States joined by the given paths, with the dome: water in the general cycle format (each
 * step by its process) and the throttling calorimeter (a dashed isenthalpic segment).
 */
function steamStateDiagrams(
  states: readonly SteamPoint[],
  joins: readonly { from: number; to: number; process: string; path: string | null }[],
  name: string,
): CycleDiagrams {
  const pvCurves: Curve[] = []
  const tsCurves: Curve[] = []
  const LOG: ['log', 'log'] = ['log', 'log']
  for (const j of joins) {
    const a = states[j.from]
    const b = states[j.to]
    if (!a || !b) continue
    let got: { pv: Pair[]; ts: Pair[] } | null = null
    try {
      got = j.path ? steamPath(j.path, a, b) : null
    } catch {
      got = null
    }
    const pa: Pair = [a.v, a.p / 1000]
    const pb: Pair = [b.v, b.p / 1000]
    const ta: Pair = [a.s / 1000, a.T]
    const tb: Pair = [b.s / 1000, b.T]
    const style = j.path ? ('solid' as const) : ('dashed' as const)
    pvCurves.push(
      cleanCurve({
        from: a.label,
        to: b.label,
        process: j.process,
        style,
        points: got ? pin(got.pv, pa, pb) : straight(pa, pb, LOG),
      }),
    )
    tsCurves.push(
      cleanCurve({
        from: a.label,
        to: b.label,
        process: j.process,
        style,
        points: got ? pin(got.ts, ta, tb) : straight(ta, tb, LIN),
      }),
    )
  }
  let dome: { pv: Pair[]; ts: Pair[] } = { pv: [], ts: [] }
  try {
    dome = steamDome()
  } catch {
    dome = { pv: [], ts: [] }
  }
  const pvPoints = states.map((s) => ({ label: s.label, x: s.v, y: s.p / 1000 }))
  const tsPoints = states.map((s) => ({ label: s.label, x: s.s / 1000, y: s.T }))
  const pvR = axes(pvCurves, pvPoints, dome.pv, 'log', true, true)
  const tsR = axes(tsCurves, tsPoints, dome.ts, 'linear', false, true)
  return {
    pv: {
      title: `P–v diagram — ${name}, water/steam (IAPWS-IF97), log–log axes`,
      x: { label: 'specific volume v (log scale)', unit: 'm³/kg', scale: 'log', min: pvR.x[0], max: pvR.x[1] },
      y: { label: 'pressure p (log scale)', unit: 'kPa', scale: 'log', min: pvR.y[0], max: pvR.y[1] },
      curves: pvCurves,
      points: pvPoints,
      ...(dome.pv.length > 2 ? { dome: { points: dome.pv, fluid: 'water' } } : {}),
    },
    ts: {
      title: `T–s diagram — ${name}, water/steam (IAPWS-IF97)`,
      x: { label: 'specific entropy s', unit: 'kJ/(kg·K)', scale: 'linear', min: tsR.x[0], max: tsR.x[1] },
      y: { label: 'temperature T', unit: 'K', scale: 'linear', min: tsR.y[0], max: tsR.y[1] },
      curves: tsCurves,
      points: tsPoints,
      ...(dome.ts.length > 2 ? { dome: { points: dome.ts, fluid: 'water' } } : {}),
    },
  }
}

function steamPoint(
  st: {
    name: string
    p: { value: number }
    T: { value: number }
    s: { value: number }
    v: { value: number }
    x: number | null
    phase: string
  },
  i: number,
): SteamPoint | null {
  const g = {
    label: st.name || String(i + 1),
    p: st.p.value,
    T: st.T.value,
    s: st.s.value,
    v: st.v.value,
    x: st.x,
    phase: st.phase,
  }
  return positive(g.p, g.T, g.v) && finite(g.s) ? g : null
}

function steamCycleDiagrams(sol: FormattedSteamCycle): CycleDiagrams {
  const points = sol.states.map(steamPoint)
  const valid = points.filter((s): s is SteamPoint => s !== null)
  const index = (name: string) => valid.findIndex((s) => s.label === name)
  const joins = sol.steps.map((st) => ({
    from: index(st.from),
    to: index(st.to),
    process: `${st.label} (${st.process})`,
    path: st.process,
  }))
  return steamStateDiagrams(valid, joins, sol.template === 'steam-carnot' ? 'vapour Carnot cycle' : 'water cycle')
}

function calorimeterDiagrams(sol: FormattedCalorimeter): CycleDiagrams {
  const valid = sol.states.map(steamPoint).filter((s): s is SteamPoint => s !== null)
  const joins =
    valid.length === 2 ? [{ from: 0, to: 1, process: 'throttling valve (h constant, irreversible)', path: null }] : []
  return steamStateDiagrams(valid, joins, 'throttling calorimeter')
}

/**
 * The combined cycle: the gas turbine's states 1–5 (compressor, combustor, turbine, the HRSG's
 * gas side, and the stack gas cooling in the surroundings back to state 1, dashed: the open cycle
 * drawn closed at p₁), with the steam bottoming cycle beside it on the water dome. Isobars are
 * T = T₁ exp((s − s₁)/c) through both ends in T–s; a compressor or turbine with s conserved is a
 * power law in P–v, one whose s changes a dashed straight line.
 */
function combinedDiagrams(sol: FormattedCombined): CycleDiagrams {
  const pts = sol.gasStates
    .map((g) => ({ label: g.name, p: g.p.value, T: g.T.value, s: g.s.value, v: g.v.value }))
    .filter((g) => positive(g.p, g.T, g.v) && finite(g.s))
  const byName = new Map(pts.map((g) => [g.label, g]))
  const joins: [string, string, string][] = [
    ['1', '2', 'compressor'],
    ['2', '3', 'combustor (isobaric heating)'],
    ['3', '4', 'gas turbine'],
    ['4', '5', 'heat-recovery steam generator, gas side (isobaric cooling)'],
    ['5', '1', 'stack gas cooling in the surroundings (the open cycle drawn closed)'],
  ]
  const pvCurves: Curve[] = []
  const tsCurves: Curve[] = []
  for (const [from, to, device] of joins) {
    const a = byName.get(from)
    const b = byName.get(to)
    if (!a || !b) continue
    const pa: Pair = [a.v, a.p / 1000]
    const pb: Pair = [b.v, b.p / 1000]
    const ta: Pair = [a.s / 1000, a.T]
    const tb: Pair = [b.s / 1000, b.T]
    const isobaric = same(a.p, b.p)
    const isentropic = !isobaric && Math.abs(b.s - a.s) <= 1e-7 * Math.max(Math.abs(a.s), 1)
    const dashed = from === '5' || (!isobaric && !isentropic)
    const rotating = device === 'compressor' || device === 'gas turbine'
    const what = device === 'compressor' ? 'compression' : 'expansion'
    const process = rotating ? `${device} (${isentropic ? 'isentropic' : 'irreversible'} ${what})` : device
    const style = dashed ? ('dashed' as const) : ('solid' as const)
    pvCurves.push(
      cleanCurve({
        from,
        to,
        process,
        style,
        points: isobaric ? straight(pa, pb, LIN) : isentropic ? powerLaw(pa, pb) : straight(pa, pb, LIN),
      }),
    )
    tsCurves.push(cleanCurve({ from, to, process, style, points: isobaric ? expFit(ta, tb) : straight(ta, tb, LIN) }))
  }
  const pvPoints = pts.map((g) => ({ label: g.label, x: g.v, y: g.p / 1000 }))
  const tsPoints = pts.map((g) => ({ label: g.label, x: g.s / 1000, y: g.T }))
  const pvR = axes(pvCurves, pvPoints, [], 'linear', true, true)
  const tsR = axes(tsCurves, tsPoints, [], 'linear', false, true)
  const steam = rankineDiagrams(sol.bottoming)
  return {
    pv: {
      title: 'P–v diagram — gas-turbine topping cycle (per kg of gas)',
      x: { label: 'specific volume v', unit: 'm³/kg', scale: 'linear', min: pvR.x[0], max: pvR.x[1] },
      y: { label: 'pressure p', unit: 'kPa', scale: 'linear', min: pvR.y[0], max: pvR.y[1] },
      curves: pvCurves,
      points: pvPoints,
    },
    ts: {
      title: 'T–s diagram — gas-turbine topping cycle (per kg of gas)',
      x: { label: 'specific entropy s', unit: 'kJ/(kg·K)', scale: 'linear', min: tsR.x[0], max: tsR.x[1] },
      y: { label: 'temperature T', unit: 'K', scale: 'linear', min: tsR.y[0], max: tsR.y[1] },
      curves: tsCurves,
      points: tsPoints,
    },
    second: {
      pv: { ...steam.pv, title: steam.pv.title.replace('P–v diagram —', 'P–v diagram — steam bottoming cycle,') },
      ts: { ...steam.ts, title: steam.ts.title.replace('T–s diagram —', 'T–s diagram — steam bottoming cycle,') },
    },
  }
}

function emptyDiagrams(): CycleDiagrams {
  const ax = (label: string, unit: string): Axis => ({ label, unit, scale: 'linear', min: 0, max: 1 })
  return {
    pv: {
      title: 'P–v diagram',
      x: ax('specific volume v', 'm³/kg'),
      y: ax('pressure p', 'kPa'),
      curves: [],
      points: [],
    },
    ts: {
      title: 'T–s diagram',
      x: ax('specific entropy s', 'kJ/(kg·K)'),
      y: ax('temperature T', 'K'),
      curves: [],
      points: [],
    },
  }
}

/**
 * The diagrams of a solved variant: P–v and T–s of an ideal-gas cycle or Rankine, and for a
 * vapour-compression cycle also p–h (refrigeration-diagrams.ts). Never throws.
 */
export function cycleDiagrams(solution: BankSolution): CycleDiagrams {
  try {
    if (!solution || typeof solution !== 'object') return emptyDiagrams()
    if (isCombinedSolution(solution)) return combinedDiagrams(solution)
    if (!('states' in solution) || !Array.isArray(solution.states)) return emptyDiagrams()
    if (isIdealGasSolution(solution) && Array.isArray(solution.steps)) return gasDiagrams(solution)
    if (isRefrigerationSolution(solution)) return refrigerationDiagrams(solution) ?? emptyDiagrams()
    if (isTwoStageSolution(solution)) return twoStageDiagrams(solution) ?? emptyDiagrams()
    if (isCascadeSolution(solution)) return cascadeDiagrams(solution) ?? emptyDiagrams()
    if (isCalorimeterSolution(solution)) return calorimeterDiagrams(solution)
    if (isSteamCycleSolution(solution)) return steamCycleDiagrams(solution)
    if (isSteadyFlowSolution(solution)) return flowDiagrams(solution) // open path (flow-diagrams.ts)
    if (isRankineSolution(solution)) return rankineDiagrams(solution)
    return emptyDiagrams()
  } catch {
    return emptyDiagrams()
  }
}
