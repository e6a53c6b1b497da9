/**
 * Public API of the ideal-gas thermo package (app/domain/thermo). Pure: no web, database,
 * queue, Node or env imports. Water/steam lives in ./steam/ with its own index.
 */
export { R_MOLAR, T_REF, P_REF } from './constants.ts'
export { math, parseQuantity, normaliseUnitText, SI_UNIT } from './units.ts'
export type { Dimension, ParsedQuantity, ParseResult, Quantity } from './units.ts'
export { brent, solveIncreasing } from './numeric.ts'
export * from './substances/index.ts'
export { REFRIGERANTS, REFRIGERANT_IDS, getRefrigerant } from './refrigerants/index.ts'
export { solveCycle, PROCESS_KINDS } from './cycle.ts'
export type {
  CycleSpec,
  StateSpec,
  StepSpec,
  ProcessKind,
  CycleResult,
  CycleSolution,
  CycleTotals,
  StateResult,
  StepResult,
  SolveError,
  SolveErrorCode,
  SolveWarning,
  SolveWarningCode,
} from './cycle.ts'
export { CONVENTIONS, CONVENTION_IDS, workIn, isConvention } from './conventions.ts'
export type { Convention, ConventionStatement } from './conventions.ts'
export { formatSolution, readQuantity, TEACHING_NOTICE } from './format.ts'
export type {
  FormattedSolution,
  FormattedState,
  FormattedStep,
  FormattedTotals,
  FormattedEnergies,
  FormattedSecondLaw,
} from './format.ts'
export type { Slips } from './slips.ts'
export { parseCycleSpec, parseGas, applyGasSlips, readValue, specMentions } from './spec.ts'
export type { SpecError, Parsed } from './spec.ts'
export { NOT_IN_BANK, solveBankSpec, solveSpec, solveSpecNumeric, specConvention } from './solve-spec.ts'
export type { SpecFailure, SolveSpecOptions } from './solve-spec.ts'
export { templates, defineTemplate, parseTemplateInputs } from './templates/index.ts'
export type { TemplateDef, TemplateInput, TemplateValues, BuildResult, InputKind } from './templates/index.ts'
