/**
 * Every template the spec entry point (solve-spec.ts) accepts, across the solver's families,
 * read from each family's own registry: the ideal-gas TemplateDefs (templates/index.ts) and the
 * steam templates (steam/), the combined cycle (combined/). A family added later lists its
 * templates here once; the bank's cycle names, the editor's template choices, the lint's input lists and
 * the unknown-template message all come from this list, so nothing else is kept by hand.
 *
 * Each entry's short label is its title without the word "cycle" and the parenthetical
 * ("Otto cycle (air-standard spark ignition)" → "Otto"), unless the template states a label.
 * Pure: no web, database, queue or Node imports.
 */
import { COMBINED_TEMPLATES } from './combined/combined-template.ts'
import { STEADY_FLOW_TEMPLATES } from './flow/flow-template.ts'
import { REFRIGERATION_TEMPLATES } from './refrigerants/refrigeration-template.ts'
import { CALORIMETER_TEMPLATE } from './steam/calorimeter.ts'
import { RANKINE_TEMPLATES, STEAM_PLANT_TEMPLATES } from './steam/rankine-template.ts'
import type { PlantTemplateInput } from './steam/rankine-template.ts'
import { STEAM_CARNOT_TEMPLATE } from './steam/steam-cycle.ts'
import { templates } from './templates/index.ts'
import type { TemplateInput } from './templates/types.ts'

export type TemplateFamily = 'ideal-gas' | 'steam' | 'combined' | 'refrigeration' | 'steady-flow'

export interface CatalogEntry {
  readonly id: string
  readonly family: TemplateFamily
  readonly title: string
  /** a short name for tables and filters */
  readonly label: string
  readonly description: string
  readonly inputs: readonly (TemplateInput | PlantTemplateInput)[]
  /**
   * Whether bank problems may use it: its result is one the authoring layer keys, explains and
   * draws, and the editor can show its inputs (app/lib/problem-schema.ts lists these ids for
   * the browser; problem-schema.test.ts checks the two agree). The others solve in spec files
   * and `npm run solve` only, for now.
   */
  readonly bank: boolean
}

interface Described {
  readonly id: string
  readonly title: string
  readonly description: string
  readonly inputs: readonly (TemplateInput | PlantTemplateInput)[]
  readonly label?: string
}

/** "Otto cycle (air-standard spark ignition)" → "Otto"; "Brayton cycle with regenerator" → "Brayton with regenerator". */
export function shortLabel(title: string): string {
  const bare = title
    .replace(/\s*\([^)]*\)\s*/g, ' ')
    .replace(/\bcycle\b\s*/i, '')
    .replace(/\s+/g, ' ')
    .trim()
  return bare === '' ? title : bare.charAt(0).toUpperCase() + bare.slice(1)
}

function entries(family: TemplateFamily, list: readonly Described[], bank: boolean): CatalogEntry[] {
  return list.map((t) => ({
    id: t.id,
    family,
    title: t.title,
    label: t.label ?? shortLabel(t.title),
    description: t.description,
    inputs: t.inputs,
    bank,
  }))
}

// Every template is in the bank now; water in the general cycle format written out in full
// ({ steamCycle }, not a template) is the one solution bank problems cannot have yet.
export const TEMPLATE_CATALOG: readonly CatalogEntry[] = [
  ...entries('ideal-gas', Object.values(templates), true),
  ...entries('steam', RANKINE_TEMPLATES, true),
  // Steam plants with a heater list and cogeneration: the definition takes the heater list
  // (definition.ts HeaterInput) and worked-solution/steam-plant.ts explains every heater.
  ...entries('steam', STEAM_PLANT_TEMPLATES, true),
  ...entries('steam', [CALORIMETER_TEMPLATE, STEAM_CARNOT_TEMPLATE], true),
  ...entries('combined', COMBINED_TEMPLATES, true),
  // The single-stage, two-stage (flash chamber) and cascade cycles: keyed, explained and drawn by
  // the authoring layer (solution-kind.ts, worked-solution/multi-stage-refrigeration.ts,
  // refrigeration-diagrams.ts).
  ...entries('refrigeration', REFRIGERATION_TEMPLATES, true),
  // Nozzle, diffuser and turbojet: keyed, explained and drawn by the authoring layer
  // (solution-kind.ts 'steady-flow', worked-solution/steady-flow.ts, flow-diagrams.ts).
  ...entries('steady-flow', STEADY_FLOW_TEMPLATES, true),
]

/** The templates bank problems may use (see CatalogEntry.bank). */
export function bankTemplateIds(): string[] {
  return TEMPLATE_CATALOG.filter((e) => e.bank).map((e) => e.id)
}

const BY_ID = new Map(TEMPLATE_CATALOG.map((e) => [e.id, e]))

export function templateEntry(id: string): CatalogEntry | undefined {
  return BY_ID.get(id)
}

export function isTemplateId(id: unknown): id is string {
  return typeof id === 'string' && BY_ID.has(id)
}

/** The ids in catalog order, for messages that list what may be chosen. */
export function templateIds(): string[] {
  return TEMPLATE_CATALOG.map((e) => e.id)
}

/** What a bank problem is about: a template's id, or 'general' for a cycle written out in full. */
export const GENERAL_CYCLE = { id: 'general', label: 'General cycle' } as const

/** Every cycle a bank problem can be about, as [id, label] in the order the filters list them. */
export function cycleChoices(): [string, string][] {
  return [
    ...TEMPLATE_CATALOG.filter((e) => e.bank).map((e): [string, string] => [e.id, e.label]),
    [GENERAL_CYCLE.id, GENERAL_CYCLE.label],
  ]
}

/** The label of a bank problem's cycle; an id no longer offered is shown as it is. */
export function cycleName(id: string): string {
  return id === GENERAL_CYCLE.id ? GENERAL_CYCLE.label : (BY_ID.get(id)?.label ?? id)
}
