/**
 * Which of the bank's result shapes a solved variant has. The three share field names
 * (a Rankine and a refrigeration result both have states, devices and a substance), so every
 * module that branches on the shape asks here, in one order, rather than testing a field of
 * its own. Pure.
 */
import type { FormattedSolution } from '#app/domain/thermo/format.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { FormattedCascade, FormattedTwoStage } from '#app/domain/thermo/refrigerants/multi-stage-template.ts'
import type { BankSolution } from '#app/domain/thermo/solve-spec.ts'
import type { FormattedRankine } from '#app/domain/thermo/steam/rankine-template.ts'
import type { FormattedFlow } from '#app/domain/thermo/flow/flow-template.ts'
import type { FormattedCalorimeter } from '#app/domain/thermo/steam/calorimeter.ts'
import type { FormattedSteamCycle } from '#app/domain/thermo/steam/steam-cycle.ts'
import type { FormattedCombined } from '#app/domain/thermo/combined/combined-template.ts'

export type { BankSolution } from '#app/domain/thermo/solve-spec.ts'

export type SolutionKind =
  | 'two-stage-refrigeration'
  | 'cascade-refrigeration'
  | 'ideal-gas'
  | 'rankine'
  | 'refrigeration'
  | 'steam-cycle'
  | 'calorimeter'
  | 'steady-flow'
  | 'combined'

/** A nozzle, diffuser or turbojet (thermo/flow/flow-template.ts): states and devices with velocities. */
export function isSteadyFlowSolution(sol: BankSolution): sol is FormattedFlow {
  return 'family' in sol && sol.family === 'steady-flow'
}

/** The single-stage vapour-compression cycle's result (the one refrigeration template in the bank). */
export function isRefrigerationSolution(sol: BankSolution): sol is FormattedRefrigeration {
  return (
    'template' in sol && sol.template === 'vapour-compression' && 'totals' in sol && 'refrigerationEffect' in sol.totals
  )
}

/** The two-stage vapour-compression cycle with a flash chamber (refrigerants/multi-stage-template.ts): states 1–9. */
export function isTwoStageSolution(sol: BankSolution): sol is FormattedTwoStage {
  return 'template' in sol && sol.template === 'vapour-compression-two-stage' && 'totals' in sol
}

/** The cascade of two vapour-compression cycles, each its own refrigerant: states 1–4 lower, 5–8 upper. */
export function isCascadeSolution(sol: BankSolution): sol is FormattedCascade {
  return 'template' in sol && sol.template === 'vapour-compression-cascade' && 'totals' in sol
}

/** The combined gas–steam cycle (combined/combined-template.ts): gas states 1–5 and a Rankine bottoming cycle. */
export function isCombinedSolution(sol: BankSolution): sol is FormattedCombined {
  return 'gasStates' in sol && 'bottoming' in sol
}

/** The throttling calorimeter (steam/calorimeter.ts): two states either side of a valve. */
export function isCalorimeterSolution(sol: BankSolution): sol is FormattedCalorimeter {
  return 'template' in sol && sol.template === 'steam-throttling-calorimeter'
}

/** Water in the general cycle format (steam/steam-cycle.ts), as the vapour Carnot template gives it. */
export function isSteamCycleSolution(sol: BankSolution): sol is FormattedSteamCycle {
  return 'steps' in sol && 'substance' in sol && sol.substance === 'water (IAPWS-IF97)'
}

export function isRankineSolution(sol: BankSolution): sol is FormattedRankine {
  return (
    !isRefrigerationSolution(sol) &&
    !isTwoStageSolution(sol) &&
    !isCascadeSolution(sol) &&
    !isCalorimeterSolution(sol) &&
    !isSteadyFlowSolution(sol) &&
    !isCombinedSolution(sol) &&
    'devices' in sol
  )
}

export function isIdealGasSolution(sol: BankSolution): sol is FormattedSolution {
  return 'steps' in sol && !isSteamCycleSolution(sol)
}

export function solutionKind(sol: BankSolution): SolutionKind {
  if (isRefrigerationSolution(sol)) return 'refrigeration'
  if (isTwoStageSolution(sol)) return 'two-stage-refrigeration'
  if (isCascadeSolution(sol)) return 'cascade-refrigeration'
  if (isSteadyFlowSolution(sol)) return 'steady-flow'
  if (isCombinedSolution(sol)) return 'combined'
  if (isCalorimeterSolution(sol)) return 'calorimeter'
  if (isSteamCycleSolution(sol)) return 'steam-cycle'
  if (isRankineSolution(sol)) return 'rankine'
  return 'ideal-gas'
}
