/**
 * Small geometry shared by the diagram builders (diagrams.ts, refrigeration-diagrams.ts):
 * straight segments on linear or log axes, pinning a sampled curve to its end states, and axis
 * ranges with a margin. Pure.
 */
import type { Curve, Plot } from './diagram-plot.ts'

/** Points per ideal-gas curve (and per straight segment). */
export const N = 32
const PAD = 0.06

export type Pair = [number, number]
export type Scale = 'linear' | 'log'

export const finite = (...xs: number[]) => xs.every((x) => typeof x === 'number' && Number.isFinite(x))
export const positive = (...xs: number[]) => xs.every((x) => typeof x === 'number' && Number.isFinite(x) && x > 0)
export const same = (a: number, b: number, rel = 1e-9) => Math.abs(a - b) <= rel * Math.max(Math.abs(a), Math.abs(b))

export const LIN: [Scale, Scale] = ['linear', 'linear']

/** A straight segment on screen: linear interpolation on linear axes, geometric on log axes. */
export function straight(a: Pair, b: Pair, scales: [Scale, Scale], n = N): Pair[] {
  const lerp = (u: number, p: number, q: number, log: boolean) =>
    log && positive(p, q) ? p * Math.pow(q / p, u) : p + (q - p) * u
  const pts: Pair[] = []
  for (let i = 0; i < n; i++) {
    const u = i / (n - 1)
    pts.push([lerp(u, a[0], b[0], scales[0] === 'log'), lerp(u, a[1], b[1], scales[1] === 'log')])
  }
  return pin(pts, a, b)
}

/** The ends exactly at the states, whatever rounding the sampling did. */
export function pin(pts: Pair[], a: Pair, b: Pair): Pair[] {
  if (pts.length === 0) return [a, b]
  pts[0] = [a[0], a[1]]
  pts[pts.length - 1] = [b[0], b[1]]
  return pts
}

export function cleanCurve(c: Curve): Curve {
  return c.points.every(([x, y]) => finite(x, y)) ? c : { ...c, points: c.points.filter(([x, y]) => finite(x, y)) }
}

function range(values: number[], scale: Scale, nonNegative: boolean): [number, number] {
  const vs = values.filter((x) => Number.isFinite(x) && (scale === 'linear' || x > 0))
  if (vs.length === 0) return scale === 'log' ? [0.1, 10] : [0, 1]
  let lo = Math.min(...vs)
  let hi = Math.max(...vs)
  if (scale === 'log') {
    let a = Math.log10(lo)
    let b = Math.log10(hi)
    const span = b - a || 1
    a -= PAD * span
    b += PAD * span
    return [Math.pow(10, a), Math.pow(10, b)]
  }
  const span = hi - lo || Math.abs(hi) * 0.2 || 1
  lo -= PAD * span
  hi += PAD * span
  if (nonNegative && lo < 0 && Math.min(...vs) >= 0) lo = 0
  return [lo, hi]
}

/** Ranges of both axes around the curves, points and dome; one scale for both, or [x, y]. */
export function axes(
  curves: Curve[],
  points: Plot['points'],
  dome: Pair[] | undefined,
  scale: Scale | [Scale, Scale],
  nonNegX: boolean,
  nonNegY: boolean,
) {
  const [sx, sy] = typeof scale === 'string' ? [scale, scale] : scale
  const xs: number[] = []
  const ys: number[] = []
  const add = (x: number, y: number) => {
    xs.push(x)
    ys.push(y)
  }
  for (const c of curves) for (const [x, y] of c.points) add(x, y)
  for (const p of points) add(p.x, p.y)
  for (const [x, y] of dome ?? []) add(x, y)
  return { x: range(xs, sx, nonNegX), y: range(ys, sy, nonNegY) }
}
