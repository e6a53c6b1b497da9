/**
 * The general cycle solver (see ./cycle/solve.ts for how it works). Its parts live in
 * ./cycle/: types, process relations, validation of the givens, propagation, verification,
 * energies per state and step, first-law totals and the second law. This module keeps the
 * import path of the solver's public API.
 */
export { solveCycle } from './cycle/solve.ts'
export { PROCESS_KINDS } from './cycle/types.ts'
export type {
  CycleResult,
  CycleSolution,
  CycleSpec,
  CycleTotals,
  ProcessKind,
  SolveError,
  SolveErrorCode,
  SolveWarning,
  SolveWarningCode,
  StateResult,
  StateSpec,
  StepResult,
  StepSpec,
} from './cycle/types.ts'
