import type { ReactNode } from 'react'

/** One titled box of the dispute page (reason, outcome, answer, file, variant, history). */
export function Section({ id, title, children }: { id: string; title: string; children: ReactNode }) {
  return (
    <section aria-labelledby={`${id}-title`} className="rounded-lg border border-line bg-white p-4 shadow-sm sm:p-6">
      <h2 id={`${id}-title`} className="mb-3 text-xl font-semibold">
        {title}
      </h2>
      {children}
    </section>
  )
}
