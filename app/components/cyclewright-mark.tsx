/**
 * Cyclewright's own mark: a closed cycle of four curved strokes on pressure–volume axes
 * (compression, heating, expansion, cooling), in the site's accent colours (app/app.css).
 * The same drawing is the favicon (public/favicon.svg).
 */
import { useId } from 'react'

export function CyclewrightMark({ className, title = 'Cyclewright' }: { className?: string; title?: string }) {
  const id = useId()
  return (
    <svg
      viewBox="0 0 32 32"
      width="28"
      height="28"
      role="img"
      aria-labelledby={id}
      className={className}
      focusable="false"
    >
      <title id={id}>{title}</title>
      <path
        d="M5 3.5 V27 H28.5"
        fill="none"
        stroke="var(--color-muted, #5b6470)"
        strokeWidth="1.75"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
      <g fill="none" stroke="var(--color-accent, #1d5c63)" strokeWidth="2.5" strokeLinecap="round">
        <path d="M10 7 C14.5 7.8 19.5 10.5 24.5 15" />
        <path d="M24.5 15 C25.6 17.2 25.6 19.6 25 22" />
        <path d="M25 22 C20 20.6 15 18.6 11 16" />
        <path d="M11 16 C9.8 13 9.6 10 10 7" />
      </g>
      <g fill="var(--color-accent-strong, #134147)">
        <circle cx="10" cy="7" r="1.6" />
        <circle cx="24.5" cy="15" r="1.6" />
        <circle cx="25" cy="22" r="1.6" />
        <circle cx="11" cy="16" r="1.6" />
      </g>
    </svg>
  )
}
