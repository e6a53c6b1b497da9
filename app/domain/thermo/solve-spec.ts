/**
 * One entry point for a spec file (what `npm run solve` reads): either
 *   { "template": "<id>", "inputs": { … }, "convention"?: "chemistry" | "engineering" }
 * or
 *   { "cycle": { gas, system, amount, states, steps, … }, "convention"?: … }.
 * Returns the formatted solution (quantities as { value, unit }) or { ok: false, error }.
 * Never throws.
 */
import type { CycleResult } from './cycle.ts'
import { solveCycle } from './cycle.ts'
import { isConvention } from './conventions.ts'
import { isRecord } from './json.ts'
import type { Convention } from './conventions.ts'
import { formatSolution } from './format.ts'
import type { FormattedSolution } from './format.ts'
import type { Slips } from './slips.ts'
import { parseCycleSpec } from './spec.ts'
import { isRankineTemplate, solveRankineTemplate, templates } from './templates/index.ts'
import { templateEntry, templateIds } from './catalog.ts'
import type { FormattedRankine } from './steam/rankine-template.ts'
import { isCombinedTemplate, solveCombinedTemplate } from './combined/combined-template.ts'
import type { FormattedCombined } from './combined/combined-template.ts'
import { isSteadyFlowTemplate, solveSteadyFlowTemplate } from './flow/flow-template.ts'
import type { FormattedFlow } from './flow/flow-template.ts'
import { isRefrigerationTemplate, solveRefrigerationTemplate } from './refrigerants/refrigeration-template.ts'
import type { FormattedMultiStageRefrigeration, FormattedRefrigeration } from './refrigerants/refrigeration-template.ts'
import { isCalorimeterTemplate, solveCalorimeterSpec } from './steam/calorimeter.ts'
import type { FormattedCalorimeter } from './steam/calorimeter.ts'
import { STEAM_CARNOT_TEMPLATE, solveSteamCycleSpec } from './steam/steam-cycle.ts'
import type { FormattedSteamCycle } from './steam/steam-cycle.ts'

/** Every solution a spec file can give (the bank uses some: BankSolution). */
export type AnySolution =
  | FormattedSolution
  | FormattedRankine
  | FormattedCombined
  | FormattedCalorimeter
  | FormattedSteamCycle
  | FormattedRefrigeration
  | FormattedMultiStageRefrigeration
  | FormattedFlow

export interface SpecFailure {
  readonly ok: false
  readonly error: {
    readonly code: string
    readonly message: string
    readonly state?: number
    readonly property?: string
    readonly step?: number
  }
}

export interface SolveSpecOptions {
  readonly slips?: Slips
  /** overrides the spec's convention */
  readonly convention?: Convention
}

/** One field of a spec that may not be an object at all. */
function field(raw: unknown, name: string): unknown {
  return isRecord(raw) ? raw[name] : undefined
}

export function solveSpecNumeric(raw: unknown, slips: Slips = {}): CycleResult | SpecFailure {
  try {
    if (!isRecord(raw))
      return {
        ok: false,
        error: { code: 'invalid-spec', message: 'a spec must be a JSON object with "template" or "cycle"' },
      }
    const r = raw
    if (r.template !== undefined) {
      const t = typeof r.template === 'string' ? templates[r.template] : undefined
      if (!t)
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `unknown template "${String(r.template)}": use one of ${templateIds().join(', ')}`,
            property: 'template',
          },
        }
      const inputs = r.inputs ?? {}
      if (!isRecord(inputs))
        return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object', property: 'inputs' } }
      return t.solve(inputs, { slips })
    }
    if (r.cycle !== undefined) {
      const p = parseCycleSpec(r.cycle, slips)
      if (!p.ok) return p
      return solveCycle(p.value)
    }
    return { ok: false, error: { code: 'invalid-spec', message: 'a spec needs "template" (with "inputs") or "cycle"' } }
  } catch (e) {
    // Not expected; keeps the no-throw promise if a bug slips through.
    return {
      ok: false,
      error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` },
    }
  }
}

export function specConvention(raw: unknown): Convention | { error: string } {
  const c = field(raw, 'convention')
  if (c === undefined) return 'engineering'
  return isConvention(c) ? c : { error: `convention must be "chemistry" or "engineering", not ${JSON.stringify(c)}` }
}

/**
 * Solve a spec file. Steam templates ('rankine', 'rankine-reheat', 'rankine-regenerative') are
 * dispatched to the steam package (app/domain/thermo/steam), which formats its own result;
 * slips do not apply to them.
 */
export function solveSpec(raw: unknown, options: SolveSpecOptions = {}): AnySolution | SpecFailure {
  const conv = options.convention ?? specConvention(raw)
  if (typeof conv !== 'string')
    return { ok: false, error: { code: 'invalid-spec', message: conv.error, property: 'convention' } }
  const t = field(raw, 'template')
  const id = typeof t === 'string' ? t : null
  const inputs = field(raw, 'inputs') ?? {}
  // The combined gas–steam cycle (./combined) formats its own result too.
  if (id !== null && isCombinedTemplate(id)) return solveCombinedTemplate(id, inputs, conv)
  if (id !== null && isSteadyFlowTemplate(id)) return solveSteadyFlowTemplate(id, inputs, conv)
  if (id !== null && isRefrigerationTemplate(id)) return solveRefrigerationTemplate(id, inputs, conv)
  // Water in the general cycle format ({ "steamCycle": … } or the vapour Carnot template) and the
  // throttling calorimeter (./steam) read their own spec and convention.
  const withConvention = { ...(isRecord(raw) ? raw : {}), convention: conv }
  if (isCalorimeterTemplate(t)) return solveCalorimeterSpec(withConvention)
  if (t === STEAM_CARNOT_TEMPLATE.id || (t === undefined && field(raw, 'steamCycle') !== undefined))
    return solveSteamCycleSpec(withConvention)
  if (id !== null && isRankineTemplate(id)) {
    try {
      return solveRankineTemplate(id, inputs, conv)
    } catch (e) {
      return {
        ok: false,
        error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` },
      }
    }
  }
  const r = solveSpecNumeric(raw, options.slips)
  if (!r.ok) return r
  try {
    return formatSolution(r, conv)
  } catch (e) {
    return {
      ok: false,
      error: { code: 'internal', message: `internal error: ${e instanceof Error ? e.message : String(e)}` },
    }
  }
}

/** The error code of a template that solves in spec files but not (yet) in bank problems. */
export const NOT_IN_BANK = 'not-in-bank'

/** The solutions bank problems can be built on: every family the authoring layer keys, explains and draws. */
export type BankSolution = AnySolution

/**
 * solveSpec for bank problems (drawing variants, lint, pitfalls). A template the catalog does
 * not mark `bank` (catalog.ts) would solve in spec files and `npm run solve` but is refused
 * here, by its id, with a plain message; today every template is marked. Never throws.
 */
export function solveBankSpec(raw: unknown, options: SolveSpecOptions = {}): BankSolution | SpecFailure {
  const t = field(raw, 'template')
  const entry = typeof t === 'string' ? templateEntry(t) : undefined
  if (entry && !entry.bank)
    return {
      ok: false,
      error: {
        code: NOT_IN_BANK,
        message: `the "${entry.id}" template solves in spec files but cannot be used in bank problems yet`,
        property: 'template',
      },
    }
  return solveSpec(raw, options)
}
