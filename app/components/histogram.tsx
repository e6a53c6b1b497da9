import type { HistogramBin } from '#app/domain/assignments/statistics.ts'

const WIDTH = 320
const HEIGHT = 120
const PAD_BOTTOM = 18

const percent = (x: number) => `${Math.round(x * 100)} %`

/** "0–10 %: 2 students; …" — what the picture shows, for screen readers and the table. */
export function describeBins(bins: readonly HistogramBin[]): string {
  return bins.map((b) => `${percent(b.from)}–${percent(b.to)}: ${b.count}`).join('; ')
}

/**
 * Score distribution as bars (share of the points on the x axis, students on the y axis),
 * with the same numbers as a table behind a disclosure for anyone who cannot see the bars.
 */
export function Histogram({ bins, title }: { bins: readonly HistogramBin[]; title: string }) {
  const most = Math.max(1, ...bins.map((b) => b.count))
  const barWidth = WIDTH / Math.max(1, bins.length)
  const total = bins.reduce((a, b) => a + b.count, 0)
  return (
    <figure className="mt-2">
      <svg
        role="img"
        aria-label={`${title}: ${total} student${total === 1 ? '' : 's'} by share of the points. ${describeBins(bins)}.`}
        viewBox={`0 0 ${WIDTH} ${HEIGHT + PAD_BOTTOM}`}
        className="h-auto w-full max-w-sm text-accent"
      >
        <line x1={0} y1={HEIGHT} x2={WIDTH} y2={HEIGHT} stroke="currentColor" strokeOpacity={0.4} />
        {bins.map((b, i) => {
          const h = (b.count / most) * (HEIGHT - 12)
          return (
            <g key={i}>
              <rect
                x={i * barWidth + 2}
                y={HEIGHT - h}
                width={barWidth - 4}
                height={h}
                fill="currentColor"
                fillOpacity={0.75}
              />
              {b.count > 0 ? (
                <text
                  x={i * barWidth + barWidth / 2}
                  y={HEIGHT - h - 2}
                  textAnchor="middle"
                  fontSize={9}
                  fill="currentColor"
                >
                  {b.count}
                </text>
              ) : null}
            </g>
          )
        })}
        {[0, 0.5, 1].map((x) => (
          <text
            key={x}
            x={x * WIDTH}
            y={HEIGHT + 13}
            textAnchor={x === 0 ? 'start' : x === 1 ? 'end' : 'middle'}
            fontSize={9}
            fill="currentColor"
          >
            {percent(x)}
          </text>
        ))}
      </svg>
      <details className="mt-1 text-sm">
        <summary className="cursor-pointer text-muted">The numbers as a table</summary>
        <table className="mt-2 text-left text-sm">
          <caption className="sr-only">{title}</caption>
          <thead>
            <tr>
              <th scope="col" className="pr-4">
                Share of the points
              </th>
              <th scope="col">Students</th>
            </tr>
          </thead>
          <tbody>
            {bins.map((b, i) => (
              <tr key={i}>
                <td className="pr-4">
                  {percent(b.from)} to {i === bins.length - 1 ? `${percent(b.to)} inclusive` : `under ${percent(b.to)}`}
                </td>
                <td>{b.count}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </figure>
  )
}
