/**
 * The key of one variant as a table: each find with its value (4 significant figures) and
 * unit, optionally its points and the find's internal name (for authors and staff). One
 * table for the problem page, the editor's preview, the dispute page and a student's page.
 */
import type { ReactNode } from 'react'
import { formatPoints } from '#app/lib/points.ts'

const fourFigures = new Intl.NumberFormat('en', { minimumSignificantDigits: 4, maximumSignificantDigits: 4 })

/** A key value to 4 significant figures; powers of ten for very large or small magnitudes. */
export function KeyValue({ value }: { value: number }) {
  if (!Number.isFinite(value)) return <>—</>
  const size = Math.abs(value)
  if (size !== 0 && (size >= 1e6 || size < 1e-3)) {
    const [mantissa, exponent] = value.toExponential(3).split('e')
    return (
      <>
        {mantissa!.replace('-', '−')} × 10<sup>{Number(exponent)}</sup>
      </>
    )
  }
  return <>{fourFigures.format(value).replace('-', '−')}</>
}

export type AnswerKeyEntry = { name: string; label: string; value: number; unit: string; points?: number }

export function AnswerKeyTable({
  entries,
  caption,
  captionClassName = 'text-left text-sm font-semibold text-muted',
  className = 'w-full text-left text-sm',
  unitOf,
  highlight,
  showNames = false,
  showPoints = false,
}: {
  entries: readonly AnswerKeyEntry[]
  caption: ReactNode
  captionClassName?: string
  className?: string
  /** the unit to show for a find, when it differs from the key's own (a student's chosen unit) */
  unitOf?: (name: string) => string | undefined
  /** the find to mark (the disputed one) */
  highlight?: string
  /** the find's internal name beside its label (authors and staff) */
  showNames?: boolean
  showPoints?: boolean
}) {
  return (
    <table className={className}>
      <caption className={captionClassName}>{caption}</caption>
      <thead className="text-xs text-muted">
        <tr>
          <th scope="col" className="py-1 pr-3">
            Find
          </th>
          <th scope="col" className="py-1 pr-3 text-right">
            Value
          </th>
          <th scope="col" className={showPoints ? 'py-1 pr-3' : 'py-1'}>
            Unit
          </th>
          {showPoints ? (
            <th scope="col" className="py-1 text-right">
              Points
            </th>
          ) : null}
        </tr>
      </thead>
      <tbody>
        {entries.map((k) => (
          <tr
            key={k.name}
            className={`border-t border-line ${k.name === highlight ? 'bg-warn-soft font-semibold' : ''}`}
          >
            <th scope="row" className="py-1 pr-3 font-normal">
              {k.label}
              {showNames ? <code className="ml-1 text-xs text-muted">{k.name}</code> : null}
            </th>
            <td className="py-1 pr-3 text-right tabular-nums">
              <KeyValue value={k.value} />
            </td>
            <td className={showPoints ? 'py-1 pr-3' : 'py-1'}>{unitOf?.(k.name) || k.unit || '—'}</td>
            {showPoints ? (
              <td className="py-1 text-right tabular-nums">{k.points === undefined ? '—' : formatPoints(k.points)}</td>
            ) : null}
          </tr>
        ))}
      </tbody>
    </table>
  )
}
