/**
 * T–s and P–v diagrams of a steady-flow device or a turbojet (thermo/flow): the path the gas
 * takes through it, state by state. It is an open path, not a cycle: the gas enters at state 1
 * and leaves at the last state (a nozzle's or diffuser's exit, the turbojet's jet), so no curve
 * returns to state 1.
 *
 * Ideal gas, as diagrams.ts draws ideal-gas cycles: a reversible adiabatic step is isentropic
 * (vertical in T–s, p v^k = const through both ends in P–v); the burner is isobaric (T = T3
 * exp((s − s3)/c) fitted through both ends in T–s, exact for constant cp; horizontal in P–v);
 * a step with losses (an efficiency below one, heat lost to the surroundings) has no defined
 * intermediate states and is a dashed straight segment. Computed from the solved states only.
 * Never throws: a state with a non-finite value is left out.
 */
import type { FormattedFlow } from '#app/domain/thermo/flow/flow-template.ts'
import type { Curve, CycleDiagrams } from './diagram-plot.ts'
import { LIN, N, axes, cleanCurve, finite, pin, positive, same, straight, type Pair } from './diagram-math.ts'

interface FlowPoint {
  label: string
  /** kPa, m³/kg, K, kJ/(kg·K) */
  p: number
  v: number
  T: number
  s: number
}

/** p v^k = const through both ends, v spaced geometrically. */
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

/** T = T1 exp((s − s1)/c) through both ends. */
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

interface Leg {
  readonly from: number
  readonly to: number
  readonly device: string
  /** what the device does to the gas, for the words */
  readonly does: string
  readonly isobaric?: boolean
  /** heat crosses the boundary (not adiabatic) */
  readonly heat?: boolean
}

function legsOf(sol: FormattedFlow): Leg[] {
  if (sol.template === 'turbojet')
    return [
      { from: 0, to: 1, device: 'diffuser', does: 'compression as the air is slowed' },
      { from: 1, to: 2, device: 'compressor', does: 'compression' },
      { from: 2, to: 3, device: 'burner', does: 'heat addition', isobaric: true },
      { from: 3, to: 4, device: 'turbine', does: 'expansion' },
      { from: 4, to: 5, device: 'nozzle', does: 'expansion to the ambient pressure' },
    ]
  const heat = sol.totals.heatIn.value !== 0
  return [
    {
      from: 0,
      to: 1,
      device: sol.template,
      does: sol.template === 'nozzle' ? 'expansion, the gas speeding up' : 'compression, the gas slowing down',
      heat,
    },
  ]
}

export function flowDiagrams(sol: FormattedFlow): CycleDiagrams {
  const states: (FlowPoint | null)[] = sol.states.map((st, i) => {
    const g = {
      label: st.name || String(i + 1),
      p: st.p.value / 1000,
      v: 1 / st.density.value,
      T: st.T.value,
      s: st.s.value / 1000,
    }
    return finite(g.p, g.v, g.T, g.s) && g.v > 0 ? g : null
  })
  const pvCurves: Curve[] = []
  const tsCurves: Curve[] = []
  for (const leg of legsOf(sol)) {
    const a = states[leg.from]
    const b = states[leg.to]
    if (!a || !b) continue
    const isentropic = !leg.isobaric && !leg.heat && Math.abs(b.s - a.s) <= 1e-9 * Math.max(1, Math.abs(a.s))
    const dashed = !leg.isobaric && !isentropic
    const process = leg.isobaric
      ? `${leg.device} (isobaric ${leg.does})`
      : isentropic
        ? `${leg.device} (isentropic ${leg.does})`
        : `${leg.device} (irreversible ${leg.does}${leg.heat ? ', with heat lost to the surroundings' : ''})`
    const pa: Pair = [a.v, a.p]
    const pb: Pair = [b.v, b.p]
    const ta: Pair = [a.s, a.T]
    const tb: Pair = [b.s, b.T]
    const pv = leg.isobaric ? straight(pa, pb, LIN) : isentropic ? powerLaw(pa, pb) : straight(pa, pb, LIN)
    const ts = leg.isobaric ? expFit(ta, tb) : straight(ta, tb, LIN)
    const base = { from: a.label, to: b.label, process, style: dashed ? ('dashed' as const) : ('solid' as const) }
    pvCurves.push(cleanCurve({ ...base, points: pv }))
    tsCurves.push(cleanCurve({ ...base, points: ts }))
  }
  const ok = states.filter((s): s is FlowPoint => s !== null)
  const pvPoints = ok.map((s) => ({ label: s.label, x: s.v, y: s.p }))
  const tsPoints = ok.map((s) => ({ label: s.label, x: s.s, y: s.T }))
  const pvR = axes(pvCurves, pvPoints, undefined, 'linear', true, true)
  const tsR = axes(tsCurves, tsPoints, undefined, 'linear', false, true)
  const last = ok.at(-1)?.label ?? String(sol.states.length)
  const what = sol.template === 'turbojet' ? 'turbojet' : sol.template
  const open = `open path from inlet state 1 to exit state ${last}, not a closed cycle`
  return {
    pv: {
      title: `P–v diagram — ${what}, ${sol.substance} (${open})`,
      x: { label: 'specific volume v', unit: 'm³/kg', scale: 'linear', min: pvR.x[0], max: pvR.x[1] },
      y: { label: 'pressure p', unit: 'kPa', scale: 'linear', min: pvR.y[0], max: pvR.y[1] },
      curves: pvCurves,
      points: pvPoints,
    },
    ts: {
      title: `T–s diagram — ${what}, ${sol.substance} (${open})`,
      x: { label: 'specific entropy s', unit: 'kJ/(kg·K)', scale: 'linear', min: tsR.x[0], max: tsR.x[1] },
      y: { label: 'temperature T', unit: 'K', scale: 'linear', min: tsR.y[0], max: tsR.y[1] },
      curves: tsCurves,
      points: tsPoints,
    },
  }
}
