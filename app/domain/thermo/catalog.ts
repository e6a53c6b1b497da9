/**
 * Every template the spec entry point (solve-spec.ts) accepts, across the solver's families,
 * read from each family's own registry: the ideal-gas TemplateDefs (templates/index.ts) and the
 * steam Rankine templates (steam/rankine-template.ts). A family added later lists its templates
 * here once; the bank's cycle names, the editor's template choices, the lint's input lists and
 * the unknown-template message all come from this list, so nothing else is kept by hand.
 *
 * Each entry's short label is its title without the word "cycle" and the parenthetical
 * ("Otto cycle (air-standard spark ignition)" → "Otto"), unless the template states a label.
 * Pure: no web, database, queue or Node imports.
 */
import { RANKINE_TEMPLATES } from './steam/rankine-template.ts'
import { templates } from './templates/index.ts'
import type { TemplateInput } from './templates/types.ts'

export type TemplateFamily = 'ideal-gas' | 'steam'

export interface CatalogEntry {
  readonly id: string
  readonly family: TemplateFamily
  readonly title: string
  /** a short name for tables and filters */
  readonly label: string
  readonly description: string
  readonly inputs: readonly TemplateInput[]
}

interface Described {
  readonly id: string
  readonly title: string
  readonly description: string
  readonly inputs: readonly TemplateInput[]
  readonly label?: string
}

/** "Otto cycle (air-standard spark ignition)" → "Otto"; "Brayton cycle with regenerator" → "Brayton with regenerator". */
export function shortLabel(title: string): string {
  const bare = title.replace(/\s*\([^)]*\)\s*/g, ' ').replace(/\bcycle\b\s*/i, '').replace(/\s+/g, ' ').trim()
  return bare === '' ? title : bare.charAt(0).toUpperCase() + bare.slice(1)
}

function entries(family: TemplateFamily, list: readonly Described[]): CatalogEntry[] {
  return list.map((t) => ({ id: t.id, family, title: t.title, label: t.label ?? shortLabel(t.title), description: t.description, inputs: t.inputs }))
}

export const TEMPLATE_CATALOG: readonly CatalogEntry[] = [...entries('ideal-gas', Object.values(templates)), ...entries('steam', RANKINE_TEMPLATES)]

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
  return [...TEMPLATE_CATALOG.map((e): [string, string] => [e.id, e.label]), [GENERAL_CYCLE.id, GENERAL_CYCLE.label]]
}

/** The label of a bank problem's cycle; an id no longer offered is shown as it is. */
export function cycleName(id: string): string {
  return id === GENERAL_CYCLE.id ? GENERAL_CYCLE.label : (BY_ID.get(id)?.label ?? id)
}
