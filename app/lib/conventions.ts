export type SignConventionName = 'chemistry' | 'engineering'

/** How each sign convention is stated on screen. */
export const conventionText: Record<SignConventionName, { label: string; equation: string; meaning: string }> = {
  chemistry: { label: 'Chemistry convention', equation: 'ΔU = q + w', meaning: 'w is the work done on the system' },
  engineering: { label: 'Engineering convention', equation: 'ΔU = Q − W', meaning: 'W is the work done by the system' },
}
