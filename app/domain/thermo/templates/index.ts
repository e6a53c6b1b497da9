/**
 * The template registry. To add templates (e.g. the steam engineer's 'rankine-*'), define
 * TemplateDef objects with defineTemplate (./types.ts) and list them here; ids are stable keys
 * used in problem banks and spec files.
 */
import { IDEAL_GAS_TEMPLATES } from './ideal-gas.ts'
import type { TemplateDef } from './types.ts'

export type { TemplateDef, TemplateInput, TemplateValues, BuildResult, InputKind } from './types.ts'
export { defineTemplate, parseTemplateInputs } from './types.ts'

export const templates: Record<string, TemplateDef> = Object.fromEntries(IDEAL_GAS_TEMPLATES.map((t) => [t.id, t]))
