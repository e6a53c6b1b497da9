/**
 * Data for a pressure–enthalpy (p–h) diagram of a refrigeration cycle, the standard chart of
 * refrigeration: the refrigerant's saturation dome from its equation of state (the saturated
 * liquid and vapour lines, from a low temperature up to the critical point, where they close),
 * the cycle's states and its path as straight segments between states, and axis ranges with
 * log-p tick values. Pure data, no drawing; SI units (Pa, J/kg, K). Never throws.
 *
 * On this chart isobars are horizontal and isenthalps vertical, so the straight segment between
 * two states IS the path for a condenser, an evaporator, a flash or mixing chamber (constant
 * pressure) and a throttling valve (constant enthalpy); only a compressor's path (isentropic or
 * not) is drawn as a chord, common practice on textbook charts.
 *
 * Teaching tool: not design data.
 */
import { stateTRho } from './flash.ts'
import { R1234YF } from './fluids/r1234yf.ts'
import { R134A } from './fluids/r134a.ts'
import { R717 } from './fluids/r717.ts'
import { R744 } from './fluids/r744.ts'
import type { FluidData } from './model.ts'
import { fail, ok } from './result.ts'
import { SAT_T_MARGIN } from './saturation.ts'
import type { FluidResult, FluidState, Refrigerant, RefrigerantId } from './types.ts'

export interface PhPoint {
  readonly p: number
  readonly h: number
  readonly log10p: number
  readonly T: number
}

export interface PhDome {
  /** saturated liquid, T rising, ending at the critical point */
  readonly liquid: readonly PhPoint[]
  /** saturated vapour, T rising, ending at the critical point */
  readonly vapour: readonly PhPoint[]
  readonly critical: PhPoint
}

export interface PhStatePoint extends PhPoint {
  readonly name: string
  readonly x: number | null
  /** on the dome: saturated liquid, saturated vapour, or inside it; null outside */
  readonly onDome: 'liquid' | 'vapour' | 'mixture' | null
}

export interface PhSegment {
  readonly from: string
  readonly to: string
  readonly points: readonly [PhPoint, PhPoint]
}

export interface PhAxes {
  readonly h: { readonly min: number; readonly max: number }
  readonly p: { readonly min: number; readonly max: number }
  readonly log10p: { readonly min: number; readonly max: number }
  /** 1, 2, 5 × 10^k Pa within the range (log-p axis labels) */
  readonly pTicks: readonly number[]
}

export interface PhDiagram {
  readonly refrigerant: RefrigerantId
  readonly dome: PhDome
  readonly states: readonly PhStatePoint[]
  readonly segments: readonly PhSegment[]
  readonly axes: PhAxes
  readonly caution: string
}

export type PhPath = readonly (readonly [string, string])[]

/** the paths of this folder's cycles, by state name */
export const SINGLE_STAGE_PATH: PhPath = [
  ['1', '2'],
  ['2', '3'],
  ['3', '4'],
  ['4', '1'],
]
export const TWO_STAGE_PATH: PhPath = [
  ['1', '2'],
  ['2', '3'],
  ['9', '3'],
  ['3', '4'],
  ['4', '5'],
  ['5', '6'],
  ['6', '7'],
  ['6', '9'],
  ['7', '8'],
  ['8', '1'],
]
/** a cascade's two cycles are two diagrams (two refrigerants): states 1–4 and 5–8 */
export const CASCADE_LOWER_PATH: PhPath = SINGLE_STAGE_PATH
export const CASCADE_UPPER_PATH: PhPath = [
  ['5', '6'],
  ['6', '7'],
  ['7', '8'],
  ['8', '5'],
]

const DATA: Record<RefrigerantId, FluidData> = { R134a: R134A, R1234yf: R1234YF, R717: R717, R744: R744 }
const criticalCache = new Map<RefrigerantId, FluidState>()

/** the EOS state at (Tc, ρc), with this folder's reference offsets */
function criticalState(f: Refrigerant): FluidState {
  let c = criticalCache.get(f.id)
  if (!c) {
    c = stateTRho(DATA[f.id])(f.Tc, f.rhoc)
    criticalCache.set(f.id, c)
  }
  return c
}

const point = (p: number, h: number, T: number): PhPoint => ({ p, h, T, log10p: Math.log10(p) })

/**
 * The saturation dome in p–h from Tmin (default: the triple point) to the critical point:
 * `points` temperatures per branch (default 40), closer together near the top where the dome
 * turns, then the critical point itself, shared by both branches.
 */
export function saturationDomePH(
  f: Refrigerant,
  opts: { readonly Tmin?: number; readonly points?: number } = {},
): FluidResult<PhDome> {
  const n = Math.round(opts.points ?? 40)
  if (!(n >= 2 && n <= 2000)) return fail('invalid-input', 'points must be between 2 and 2000')
  const top = f.Tc - SAT_T_MARGIN
  const lo = opts.Tmin ?? f.Ttriple
  if (!Number.isFinite(lo) || lo < f.Ttriple || lo >= top)
    return fail(
      'out-of-range',
      `${f.id}: the dome starts between the triple point (${f.Ttriple} K) and the critical temperature (${f.Tc} K)`,
    )
  const liquid: PhPoint[] = []
  const vapour: PhPoint[] = []
  for (let i = 0; i < n; i++) {
    const u = 1 - i / (n - 1)
    const T = top - (top - lo) * u * u
    const sat = f.saturationT(T)
    if (!sat.ok) return sat
    liquid.push(point(sat.value.p, sat.value.liquid.h, T))
    vapour.push(point(sat.value.p, sat.value.vapour.h, T))
  }
  const c = criticalState(f)
  if (!Number.isFinite(c.h) || !Number.isFinite(c.p))
    return fail('no-convergence', `${f.id}: the critical point did not evaluate`)
  const critical = point(c.p, c.h, f.Tc)
  return ok({ liquid: [...liquid, critical], vapour: [...vapour, critical], critical })
}

function ticks(pMin: number, pMax: number): number[] {
  const out: number[] = []
  for (let k = Math.floor(Math.log10(pMin)); k <= Math.ceil(Math.log10(pMax)); k++)
    for (const m of [1, 2, 5]) {
      const p = m * 10 ** k
      if (p >= pMin * (1 - 1e-12) && p <= pMax * (1 + 1e-12)) out.push(p)
    }
  return out
}

/**
 * A cycle's p–h diagram: its states (name and refrigerant state, as the cycle solvers give them),
 * the path between them (pairs of state names; default the states in order, closed), the dome
 * from 10 K below the coldest state (or the triple point) to the critical point.
 */
export function phDiagram(
  f: Refrigerant,
  states: readonly { readonly name: string; readonly state: FluidState }[],
  path?: PhPath,
  opts: { readonly points?: number } = {},
): FluidResult<PhDiagram> {
  if (states.length === 0) return fail('invalid-input', 'a diagram needs at least one state')
  for (const s of states)
    if (!(s.state.p > 0) || !Number.isFinite(s.state.h) || !Number.isFinite(s.state.T))
      return fail('invalid-input', `state ${s.name}: p, h and T must be finite (p > 0)`)
  const byName = new Map(states.map((s) => [s.name, s]))
  const edges: PhPath = path ?? states.map((s, i) => [s.name, states[(i + 1) % states.length]!.name] as const)
  for (const [a, b] of edges)
    if (!byName.has(a) || !byName.has(b)) return fail('invalid-input', `the path names a state not given: ${a}–${b}`)

  const Tcold = Math.min(...states.map((s) => s.state.T))
  const Tmin = Math.min(Math.max(f.Ttriple, Tcold - 10), f.Tc - 20)
  const dome = saturationDomePH(f, { Tmin, ...(opts.points !== undefined ? { points: opts.points } : {}) })
  if (!dome.ok) return dome

  const pts: PhStatePoint[] = states.map((s) => {
    const x = s.state.x
    return {
      ...point(s.state.p, s.state.h, s.state.T),
      name: s.name,
      x,
      onDome: x === null ? null : x <= 0 ? 'liquid' : x >= 1 ? 'vapour' : 'mixture',
    }
  })
  const at = new Map(pts.map((p) => [p.name, p]))
  const segments: PhSegment[] = edges.map(([a, b]) => ({ from: a, to: b, points: [at.get(a)!, at.get(b)!] }))

  const all = [...dome.value.liquid, ...dome.value.vapour, ...pts]
  const hMin = Math.min(...all.map((q) => q.h))
  const hMax = Math.max(...all.map((q) => q.h))
  const pMin = Math.min(...all.map((q) => q.p))
  const pMax = Math.max(...all.map((q) => q.p))
  return ok({
    refrigerant: f.id,
    dome: dome.value,
    states: pts,
    segments,
    axes: {
      h: { min: hMin, max: hMax },
      p: { min: pMin, max: pMax },
      log10p: { min: Math.log10(pMin), max: Math.log10(pMax) },
      pTicks: ticks(pMin, pMax),
    },
    caution: 'Teaching tool: a textbook chart from published equations of state, not design data.',
  })
}
