import type { ReactNode } from 'react'
import { cn } from '#app/lib/cn.ts'

const tones = {
  info: 'border-accent/30 bg-accent-soft text-accent-strong',
  ok: 'border-ok/30 bg-ok-soft text-ok',
  warn: 'border-warn/30 bg-warn-soft text-warn',
  error: 'border-danger/30 bg-danger-soft text-danger',
} as const

export function Notice({
  tone = 'info',
  children,
  className,
}: {
  tone?: keyof typeof tones
  children: ReactNode
  className?: string
}) {
  return (
    <div
      role={tone === 'error' ? 'alert' : 'status'}
      className={cn('rounded-md border px-4 py-3 text-sm', tones[tone], className)}
    >
      {children}
    </div>
  )
}
