/**
 * Which of the bank's result shapes a solved variant has. The three share field names
 * (a Rankine and a refrigeration result both have states, devices and a substance), so every
 * module that branches on the shape asks here, in one order, rather than testing a field of
 * its own. Pure.
 */
import type { FormattedSolution } from '#app/domain/thermo/format.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { BankSolution } from '#app/domain/thermo/solve-spec.ts'
import type { FormattedRankine } from '#app/domain/thermo/steam/rankine-template.ts'

export type { BankSolution } from '#app/domain/thermo/solve-spec.ts'

export type SolutionKind = 'ideal-gas' | 'rankine' | 'refrigeration'

/** The single-stage vapour-compression cycle's result (the one refrigeration template in the bank). */
export function isRefrigerationSolution(sol: BankSolution): sol is FormattedRefrigeration {
  return (
    'template' in sol && sol.template === 'vapour-compression' && 'totals' in sol && 'refrigerationEffect' in sol.totals
  )
}

export function isRankineSolution(sol: BankSolution): sol is FormattedRankine {
  return !isRefrigerationSolution(sol) && 'devices' in sol
}

export function isIdealGasSolution(sol: BankSolution): sol is FormattedSolution {
  return 'steps' in sol
}

export function solutionKind(sol: BankSolution): SolutionKind {
  if (isRefrigerationSolution(sol)) return 'refrigeration'
  if (isRankineSolution(sol)) return 'rankine'
  return 'ideal-gas'
}
