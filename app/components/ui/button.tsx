import type { ButtonHTMLAttributes } from 'react'
import { cn } from '#app/lib/cn.ts'

const variants = {
  primary: 'bg-accent text-white hover:bg-accent-strong',
  secondary: 'border border-line bg-white text-ink hover:bg-paper',
  quiet: 'text-accent hover:underline',
} as const

export function Button({
  variant = 'primary',
  className,
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: keyof typeof variants }) {
  return (
    <button
      className={cn(
        // At least 44 px tall on a phone, a target a thumb can hit; the usual height from `sm` up.
        'inline-flex min-h-11 items-center justify-center gap-2 rounded-md px-4 py-2 text-sm font-semibold disabled:cursor-wait disabled:opacity-60 sm:min-h-0',
        variants[variant],
        className,
      )}
      {...props}
    />
  )
}
