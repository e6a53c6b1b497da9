// Public API of app/domain/grading: reading and checking students' answers.
// Pure TypeScript (mathjs only); no web, database, queue, node:* or env imports.

export { checkAnswer, validateCheckRule } from './check-answer.ts'
export type {
  CheckAnswerInput,
  CheckAnswerResult,
  CheckCode,
  CheckDetail,
  CheckNote,
  CheckRule,
  ExpectedQuantity,
  RuleValidation,
  Tolerance,
  Verdict,
} from './check-answer.ts'

export { readAnswer } from './read-answer.ts'
export type {
  AnswerForm,
  ReadAnswerFailure,
  ReadAnswerOptions,
  ReadAnswerResult,
  ReadAnswerSuccess,
} from './read-answer.ts'

export {
  ALLOWED_CONSTANTS,
  ALLOWED_FUNCTIONS,
  MAX_EXPRESSION_LENGTH,
  MAX_EXPRESSION_LENGTH_CAP,
  compileRestrictedExpression,
  evaluateRestrictedExpression,
} from './restricted-math.ts'
export type {
  AllowedFunction,
  CompileRestrictedResult,
  CompiledRestrictedExpression,
  RestrictedErrorCode,
  RestrictedExpressionOptions,
  RestrictedExpressionResult,
  RestrictedValue,
  ScopeValue,
} from './restricted-math.ts'

export { checkSignificantFigures, countSignificantFigures } from './sig-figs.ts'
export type { SigFigCount, SigFigRule, SigFigVerdict } from './sig-figs.ts'

export { DIMENSIONS, formatUnitForDisplay, isDimensionName } from './units.ts'
export type { DimensionInfo, DimensionName } from './units.ts'

export type { AnswerErrorCode } from './messages.ts'

export { normalizeTypography } from './typography.ts'
export type { TypographyOptions } from './typography.ts'

// Pitfalls: re-evaluating a variant with a catalogued slip (see pitfalls.ts).
export {
  PITFALLS,
  diagnosePitfall,
  evaluateWithPitfall,
  type Diagnosis,
  type DiagnoseInput,
  type Pitfall,
  type PitfallId,
} from './pitfalls.ts'
