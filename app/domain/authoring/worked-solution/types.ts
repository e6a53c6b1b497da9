/** The shapes of a worked solution (see ./index.ts). Pure types. */
export interface WorkedLine {
  /** The formula; '' for a line of words only (words wrap, a formula scrolls in its box). */
  readonly tex: string
  readonly note?: string
}

export interface WorkedSection {
  readonly title: string
  readonly lines: WorkedLine[]
}

export interface WorkedSolution {
  /** The convention in words, with its first-law equation. */
  readonly convention: string
  readonly sections: WorkedSection[]
  /** Shown with steam and refrigerant solutions: teaching values, not design data. */
  readonly caution?: string
}

/** Significant figures of every number in a worked solution. */
export const WORKED_SIG_FIGS = 4
