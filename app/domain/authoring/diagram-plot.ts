/**
 * The shape of a cycle diagram and its description in words. Kept apart from diagrams.ts,
 * which computes the curves with the steam tables, so the browser can render and describe a
 * plot without loading the solver.
 */

export interface Axis {
  readonly label: string
  readonly unit: string
  readonly scale: 'linear' | 'log'
  readonly min: number
  readonly max: number
}

export interface Curve {
  /** state labels as in the solution ('1', 'A', …) */
  readonly from: string
  readonly to: string
  /** the process or device in words ('isentropic', 'boiler (isobaric heating)', …) */
  readonly process: string
  /** the step's own label when the solution has one ('compression') */
  readonly label?: string
  /** dashed: an irreversible or internal step drawn as a straight line or without a defined path */
  readonly style: 'solid' | 'dashed'
  /** [x, y] in the plot's axis units */
  readonly points: [number, number][]
}

export interface Plot {
  readonly title: string
  readonly x: Axis
  readonly y: Axis
  readonly curves: Curve[]
  readonly points: { label: string; x: number; y: number }[]
  /**
   * closed outline of the two-phase region: liquid branch up to the critical point, vapour
   * branch down; `fluid` names the substance (water when absent), `from` where the outline
   * starts ("the triple point" when absent, or a temperature when it is cut below the cycle)
   */
  readonly dome?: { points: [number, number][]; fluid?: string; from?: string }
}

export interface CycleDiagrams {
  readonly pv: Plot
  readonly ts: Plot
  /** the pressure–enthalpy diagram (log p against h) of a refrigeration cycle, shown first */
  readonly ph?: Plot
  /**
   * a second cycle on its own substance's dome (the upper cycle of a cascade refrigerator, whose
   * refrigerant differs from the lower one's): shown beside the first, plot by plot
   */
  readonly second?: Omit<CycleDiagrams, 'second'>
}

function plotsOf(d: Omit<CycleDiagrams, 'second'>): Plot[] {
  return d.ph ? [d.ph, d.ts, d.pv] : [d.pv, d.ts]
}

/**
 * The plots to show, in order: p–h (refrigeration), then P–v and T–s, or for refrigeration T–s
 * before P–v; with a second cycle, each of its plots follows the first cycle's of the same kind.
 */
export function diagramPlots(d: CycleDiagrams): Plot[] {
  const first = plotsOf(d)
  if (!d.second) return first
  const second = plotsOf(d.second)
  return first.flatMap((p, i) => (second[i] ? [p, second[i]] : [p]))
}

const fmt = (x: number) => (Number.isFinite(x) ? String(Number(x.toPrecision(4))) : '—')

/** The axis quantity's symbol: the last word of its label ('p', 'v', 'T', 's'). */
export function axisSymbol(axis: Axis): string {
  const words = axis.label
    .replace(/\s*\(log scale\)\s*$/, '')
    .trim()
    .split(/\s+/)
  return words[words.length - 1] ?? axis.label
}

/** The plot in words, for screen readers (the SVG's <desc>). */
export function describePlot(plot: Plot): string {
  const xs = axisSymbol(plot.x)
  const ys = axisSymbol(plot.y)
  const states = plot.points.map(
    (p) => `${p.label} (${xs} = ${fmt(p.x)} ${plot.x.unit}, ${ys} = ${fmt(p.y)} ${plot.y.unit})`,
  )
  const steps = plot.curves.map(
    (c) =>
      `${c.from} to ${c.to}, ${c.process}${c.label ? ` (${c.label})` : ''}${c.style === 'dashed' ? ', dashed' : ''}`,
  )
  const parts = [`${plot.title}.`]
  const xLog = plot.x.scale === 'log'
  const yLog = plot.y.scale === 'log'
  if (xLog && yLog) parts.push('Both axes are logarithmic.')
  else if (xLog || yLog)
    parts.push(`The ${(yLog ? plot.y : plot.x).label.replace(/\s*\(log scale\)\s*$/, '')} axis is logarithmic.`)
  if (states.length > 0) parts.push(`States: ${states.join('; ')}.`)
  if (steps.length > 0) parts.push(`Processes: ${steps.join('; ')}.`)
  if (plot.curves.some((c) => c.style === 'dashed'))
    parts.push('Dashed lines mark irreversible or internal steps whose path is not defined by the solution.')
  if (plot.dome)
    parts.push(
      `The shaded outline is the saturation dome of ${plot.dome.fluid ?? 'water'}, from ${plot.dome.from ?? 'the triple point'} up to the critical point; inside it liquid and vapour coexist.`,
    )
  return parts.join(' ')
}
