/**
 * P–v and T–s diagrams of a solved variant, and the p–h diagram (log pressure axis) of a
 * refrigeration cycle, as inline SVG (no chart library): plot data from
 * app/domain/authoring/diagrams.ts, drawn with the theme's colours. Dashes, not colour alone,
 * tell reversible paths from irreversible ones, so the figure survives black-and-white print.
 * Each chart is an image with a title and a description of its states and processes in words.
 */
import { useId } from 'react'
import { describePlot, diagramPlots } from '#app/domain/authoring/diagram-plot.ts'
import type { Axis, CycleDiagrams as Diagrams, Plot } from '#app/domain/authoring/diagram-plot.ts'

const W = 480
const H = 360
const M = { left: 66, right: 14, top: 14, bottom: 50 }
const PW = W - M.left - M.right
const PH = H - M.top - M.bottom

type Scale = (x: number) => number

function scaleFor(axis: Axis, from: number, to: number): Scale {
  if (axis.scale === 'log' && axis.min > 0 && axis.max > axis.min) {
    const lo = Math.log10(axis.min)
    const hi = Math.log10(axis.max)
    return (x) => from + ((Math.log10(x) - lo) / (hi - lo)) * (to - from)
  }
  const span = axis.max - axis.min || 1
  return (x) => from + ((x - axis.min) / span) * (to - from)
}

const SUPERSCRIPT: Record<string, string> = {
  '-': '⁻',
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
}
const sup = (n: number) => [...String(n)].map((c) => SUPERSCRIPT[c] ?? c).join('')

function tickText(x: number, decimals: number): string {
  if (x === 0) return '0'
  const a = Math.abs(x)
  if (a >= 1e5 || a < 1e-3) {
    const k = Math.floor(Math.log10(a) + 1e-9)
    const m = x / Math.pow(10, k)
    const mant = Number(m.toPrecision(3))
    return mant === 1 ? `10${sup(k)}` : `${mant}×10${sup(k)}`
  }
  return String(Number(x.toFixed(Math.min(decimals, 10))))
}

/** Round-number ticks: 1, 2, 2.5 or 5 × 10^k on linear axes; decades (and 2, 5 over three decades or fewer) on log axes. */
export function axisTicks(axis: Axis): { value: number; text: string }[] {
  const { min, max } = axis
  if (!(Number.isFinite(min) && Number.isFinite(max) && max > min)) return []
  if (axis.scale === 'log' && min > 0) {
    const k0 = Math.floor(Math.log10(min))
    const k1 = Math.ceil(Math.log10(max))
    const mult = k1 - k0 <= 3 ? [1, 2, 5] : [1]
    const out: { value: number; text: string }[] = []
    for (let k = k0; k <= k1; k++) {
      for (const m of mult) {
        const v = m * Math.pow(10, k)
        if (v >= min && v <= max) out.push({ value: v, text: tickText(v, Math.max(0, -k)) })
      }
    }
    return out
  }
  const raw = (max - min) / 5
  const mag = Math.pow(10, Math.floor(Math.log10(raw)))
  const f = raw / mag
  const nice = f < 1.5 ? 1 : f < 2.25 ? 2 : f < 3.5 ? 2.5 : f < 7.5 ? 5 : 10
  const step = nice * mag
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9) + (nice === 2.5 ? 1 : 0))
  const out: { value: number; text: string }[] = []
  for (let v = Math.ceil(min / step - 1e-9) * step; v <= max + step * 1e-9; v += step) {
    const value = Math.abs(v) < step * 1e-9 ? 0 : v
    out.push({ value, text: tickText(value, decimals) })
  }
  return out
}

function pathData(points: [number, number][], sx: Scale, sy: Scale): string {
  return points
    .map(([x, y], i) => {
      const X = sx(x)
      const Y = sy(y)
      return Number.isFinite(X) && Number.isFinite(Y) ? `${i === 0 ? 'M' : 'L'}${X.toFixed(2)} ${Y.toFixed(2)}` : ''
    })
    .filter(Boolean)
    .join(' ')
    .replace(/^L/, 'M')
}

/** A small arrowhead halfway along the curve, pointing in the direction of the process. */
function arrowAt(points: [number, number][], sx: Scale, sy: Scale): string | null {
  const scr = points
    .map(([x, y]) => [sx(x), sy(y)] as const)
    .filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y))
  if (scr.length < 2) return null
  const seg = scr.slice(1).map((p, i) => Math.hypot(p[0] - scr[i]![0], p[1] - scr[i]![1]))
  const total = seg.reduce((a, b) => a + b, 0)
  if (total < 24) return null
  let acc = 0
  for (let i = 0; i < seg.length; i++) {
    if (acc + seg[i]! >= total / 2 && seg[i]! > 0) {
      const [x0, y0] = scr[i]!
      const [x1, y1] = scr[i + 1]!
      const u = (total / 2 - acc) / seg[i]!
      const cx = x0 + (x1 - x0) * u
      const cy = y0 + (y1 - y0) * u
      const dx = (x1 - x0) / seg[i]!
      const dy = (y1 - y0) / seg[i]!
      const L = 7
      const Wd = 3.5
      const tip = [cx + dx * L * 0.5, cy + dy * L * 0.5]
      const back = [cx - dx * L * 0.5, cy - dy * L * 0.5]
      const p1 = [back[0]! - dy * Wd, back[1]! + dx * Wd]
      const p2 = [back[0]! + dy * Wd, back[1]! - dx * Wd]
      return [tip, p1, p2].map(([a, b]) => `${a!.toFixed(2)},${b!.toFixed(2)}`).join(' ')
    }
    acc += seg[i]!
  }
  return null
}

interface Marker {
  x: number
  y: number
  labels: string[]
}

/** States that land on (nearly) the same spot share one marker and one label ("1, 2"). */
function markers(plot: Plot, sx: Scale, sy: Scale): Marker[] {
  const out: Marker[] = []
  for (const p of plot.points) {
    const x = sx(p.x)
    const y = sy(p.y)
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue
    const near = out.find((m) => Math.hypot(m.x - x, m.y - y) < 9)
    if (near) near.labels.push(p.label)
    else out.push({ x, y, labels: [p.label] })
  }
  return out
}

function axisTitle(axis: Axis): string {
  return `${axis.label} [${axis.unit}]`
}

/** One diagram as an accessible SVG figure. */
export function CycleDiagram({ plot }: { plot: Plot }) {
  const id = useId()
  const titleId = `${id}-title`
  const descId = `${id}-desc`
  const clipId = `${id}-clip`
  const sx = scaleFor(plot.x, M.left, M.left + PW)
  const sy = scaleFor(plot.y, M.top + PH, M.top)
  const xt = axisTicks(plot.x)
  const yt = axisTicks(plot.y)
  const marks = markers(plot, sx, sy)
  const cx = marks.reduce((a, m) => a + m.x, 0) / (marks.length || 1)
  const cy = marks.reduce((a, m) => a + m.y, 0) / (marks.length || 1)
  const hasDashed = plot.curves.some((c) => c.style === 'dashed')
  return (
    <div className="min-w-0">
      <svg
        role="img"
        aria-labelledby={`${titleId} ${descId}`}
        viewBox={`0 0 ${W} ${H}`}
        className="h-auto w-full text-ink"
        fontFamily="inherit"
      >
        <title id={titleId}>{plot.title}</title>
        <desc id={descId}>{describePlot(plot)}</desc>
        <defs>
          <clipPath id={clipId}>
            <rect x={M.left} y={M.top} width={PW} height={PH} />
          </clipPath>
        </defs>
        <g aria-hidden="true">
          {xt.map((t) => (
            <line
              key={`gx${t.value}`}
              x1={sx(t.value)}
              x2={sx(t.value)}
              y1={M.top}
              y2={M.top + PH}
              className="stroke-line"
              strokeWidth={1}
            />
          ))}
          {yt.map((t) => (
            <line
              key={`gy${t.value}`}
              x1={M.left}
              x2={M.left + PW}
              y1={sy(t.value)}
              y2={sy(t.value)}
              className="stroke-line"
              strokeWidth={1}
            />
          ))}
        </g>
        <g clipPath={`url(#${clipId})`}>
          {plot.dome && plot.dome.points.length > 2 ? (
            <polygon
              data-dome=""
              points={plot.dome.points.map(([x, y]) => `${sx(x).toFixed(2)},${sy(y).toFixed(2)}`).join(' ')}
              className="fill-accent-soft stroke-muted"
              strokeWidth={1}
              fillOpacity={0.7}
            />
          ) : null}
          {plot.curves.map((c, i) => (
            <path
              key={`c${i}`}
              d={pathData(c.points, sx, sy)}
              fill="none"
              className={c.style === 'dashed' ? 'stroke-warn' : 'stroke-accent'}
              strokeWidth={2}
              strokeLinejoin="round"
              strokeLinecap="round"
              strokeDasharray={c.style === 'dashed' ? '6 4' : undefined}
            >
              <title>{`${c.from} → ${c.to}: ${c.process}${c.label ? ` (${c.label})` : ''}`}</title>
            </path>
          ))}
          {plot.curves.map((c, i) => {
            const a = arrowAt(c.points, sx, sy)
            return a ? (
              <polygon
                key={`a${i}`}
                points={a}
                className={c.style === 'dashed' ? 'fill-warn' : 'fill-accent'}
                aria-hidden="true"
              />
            ) : null
          })}
        </g>
        <g aria-hidden="true" className="fill-ink" fontSize={11}>
          <line x1={M.left} x2={M.left + PW} y1={M.top + PH} y2={M.top + PH} className="stroke-ink" strokeWidth={1} />
          <line x1={M.left} x2={M.left} y1={M.top} y2={M.top + PH} className="stroke-ink" strokeWidth={1} />
          {xt.map((t) => (
            <g key={`tx${t.value}`}>
              <line x1={sx(t.value)} x2={sx(t.value)} y1={M.top + PH} y2={M.top + PH + 4} className="stroke-ink" />
              <text x={sx(t.value)} y={M.top + PH + 16} textAnchor="middle">
                {t.text}
              </text>
            </g>
          ))}
          {yt.map((t) => (
            <g key={`ty${t.value}`}>
              <line x1={M.left - 4} x2={M.left} y1={sy(t.value)} y2={sy(t.value)} className="stroke-ink" />
              <text x={M.left - 7} y={sy(t.value) + 4} textAnchor="end">
                {t.text}
              </text>
            </g>
          ))}
          <text x={M.left + PW / 2} y={H - 10} textAnchor="middle" fontSize={12}>
            {axisTitle(plot.x)}
          </text>
          <text
            x={14}
            y={M.top + PH / 2}
            textAnchor="middle"
            fontSize={12}
            transform={`rotate(-90 14 ${M.top + PH / 2})`}
          >
            {axisTitle(plot.y)}
          </text>
        </g>
        <g aria-hidden="true">
          {marks.map((m) => {
            const dx = m.x - cx
            const dy = m.y - cy
            const d = Math.hypot(dx, dy) || 1
            const lx = m.x + (dx / d) * 13
            const ly = m.y + (dy / d) * 13 + 4
            return (
              <g key={m.labels.join(',')}>
                <circle cx={m.x} cy={m.y} r={3.5} className="fill-paper stroke-ink" strokeWidth={1.5} />
                <text x={lx} y={ly} textAnchor="middle" fontSize={12} fontWeight={600} className="fill-ink">
                  {m.labels.join(', ')}
                </text>
              </g>
            )
          })}
        </g>
      </svg>
      <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-muted" aria-hidden="true">
        <li className="flex items-center gap-1">
          <svg width="28" height="8" viewBox="0 0 28 8">
            <line x1="1" x2="27" y1="4" y2="4" className="stroke-accent" strokeWidth={2} />
          </svg>
          process path
        </li>
        {hasDashed ? (
          <li className="flex items-center gap-1">
            <svg width="28" height="8" viewBox="0 0 28 8">
              <line x1="1" x2="27" y1="4" y2="4" className="stroke-warn" strokeWidth={2} strokeDasharray="6 4" />
            </svg>
            irreversible or internal step (path not defined)
          </li>
        ) : null}
        {plot.dome ? (
          <li className="flex items-center gap-1">
            <svg width="16" height="10" viewBox="0 0 16 10">
              <rect x="1" y="1" width="14" height="8" className="fill-accent-soft stroke-muted" />
            </svg>
            saturation dome
          </li>
        ) : null}
      </ul>
    </div>
  )
}

/**
 * The diagrams side by side (p–h first for a refrigeration cycle), stacked on narrow screens or,
 * with `stacked`, always (in a narrow column).
 */
export function CycleDiagrams({
  diagrams,
  caption,
  stacked = false,
}: {
  diagrams: Diagrams
  caption?: string
  stacked?: boolean
}) {
  return (
    <figure className="my-4 break-inside-avoid">
      <div className={stacked ? 'grid gap-4' : 'grid gap-6 md:grid-cols-2'}>
        {diagramPlots(diagrams).map((plot) => (
          <CycleDiagram key={plot.title} plot={plot} />
        ))}
      </div>
      {caption ? <figcaption className="mt-2 text-sm text-muted">{caption}</figcaption> : null}
    </figure>
  )
}
