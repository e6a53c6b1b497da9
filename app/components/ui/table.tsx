import type { ReactNode, TableHTMLAttributes, ThHTMLAttributes } from 'react'
import { cn } from '#app/lib/cn.ts'

type TableProps = TableHTMLAttributes<HTMLTableElement> & {
  /** What the table lists, read by screen readers; shown only when captionVisible. */
  caption: ReactNode
  captionVisible?: boolean
  /** Classes of the scroll box (margins, a height limit); the table itself is always full width. */
  boxClassName?: string
  /** A framed white box (default) or a plain one inside an already framed section. */
  framed?: boolean
  children: ReactNode
}

/**
 * A data table in its own horizontal scroll box, so a wide table never widens the page on a
 * phone. The caption is always there for screen readers.
 */
export function Table({
  caption,
  captionVisible = false,
  boxClassName,
  framed = true,
  className,
  children,
  ...table
}: TableProps) {
  return (
    <div className={cn('relative overflow-x-auto', framed && 'rounded-lg border border-line bg-white', boxClassName)}>
      <table className={cn('w-full text-left text-sm', className)} {...table}>
        <caption className={captionVisible ? 'px-4 py-2 text-left font-medium' : 'sr-only'}>{caption}</caption>
        {children}
      </table>
    </div>
  )
}

/** The header row's look: small capitals on the paper colour; sticky when the box scrolls. */
export function TableHead({ sticky = false, children }: { sticky?: boolean; children: ReactNode }) {
  return (
    <thead className={cn('bg-paper text-xs tracking-wide text-muted uppercase', sticky && 'sticky top-0')}>
      {children}
    </thead>
  )
}

/** A column heading (scope="col"), right-aligned for numbers. */
export function ColumnHeader({
  numeric = false,
  className,
  children,
  ...th
}: ThHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <th scope="col" className={cn('px-4 py-2', numeric && 'text-right', className)} {...th}>
      {children}
    </th>
  )
}

/** What a page shows where a list or table has nothing in it yet. */
export function EmptyState({ className, children }: { className?: string; children: ReactNode }) {
  return (
    <div className={cn('rounded-lg border border-dashed border-line bg-white p-8 text-center text-muted', className)}>
      {children}
    </div>
  )
}
