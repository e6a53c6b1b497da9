/**
 * Sign conventions. The solver keeps one internally (chemistry: q into the system, w done ON
 * the system, ΔU = q + w) and converts at the output; every output object states which one
 * it uses and its equation.
 */
export type Convention = 'chemistry' | 'engineering'
export const CONVENTION_IDS: readonly Convention[] = ['chemistry', 'engineering']

export interface ConventionStatement {
  readonly name: Convention
  readonly equation: string
  readonly work: string
  readonly heat: string
  /** The steady-flow form, for flow cycles (w is shaft work there). */
  readonly flowEquation: string
}

export const CONVENTIONS: Readonly<Record<Convention, ConventionStatement>> = {
  chemistry: {
    name: 'chemistry',
    equation: 'ΔU = q + w',
    work: 'w is the work done ON the system (negative when the gas does work)',
    heat: 'q is the heat into the system',
    flowEquation: 'ΔH = q + w (w is the shaft work done on the fluid)',
  },
  engineering: {
    name: 'engineering',
    equation: 'ΔU = Q − W',
    work: 'W is the work done BY the system (positive when the gas does work)',
    heat: 'Q is the heat into the system',
    flowEquation: 'ΔH = Q − W (W is the shaft work done by the fluid)',
  },
}

/** Convert work done ON the system (internal) into the chosen convention. */
export function workIn(convention: Convention, workOnSystem: number): number {
  return convention === 'chemistry' ? workOnSystem : -workOnSystem
}

export function isConvention(x: unknown): x is Convention {
  return x === 'chemistry' || x === 'engineering'
}
