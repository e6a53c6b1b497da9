/**
 * The template registry. To add templates (e.g. the steam engineer's 'rankine-*'), define
 * TemplateDef objects with defineTemplate (./types.ts) and list them here; ids are stable keys
 * used in problem banks and spec files.
 */
import { GAS_TURBINE_TEMPLATES } from './gas-turbine.ts'
import { IDEAL_GAS_TEMPLATES } from './ideal-gas.ts'
import { PISTON_TEMPLATES } from './piston.ts'
import type { TemplateDef } from './types.ts'

export type { TemplateDef, TemplateInput, TemplateValues, BuildResult, InputKind } from './types.ts'
export { defineTemplate, parseTemplateInputs } from './types.ts'

export const templates: Record<string, TemplateDef> = Object.fromEntries(
  [...IDEAL_GAS_TEMPLATES, ...GAS_TURBINE_TEMPLATES, ...PISTON_TEMPLATES].map((t) => [t.id, t]),
)

// Steam (IAPWS-IF97) Rankine templates 'rankine', 'rankine-reheat', 'rankine-regenerative'
// (docs/steam.md). Their result has no Gas, so they are not TemplateDefs: a spec entry point
// dispatches these ids with isRankineTemplate(id) to solveRankineTemplate(id, inputs, convention).
export {
  RANKINE_TEMPLATES,
  isRankineTemplate,
  solveRankineTemplate,
  solveRankineSpec,
} from '../steam/rankine-template.ts'
