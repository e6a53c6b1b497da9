/**
 * Template definitions: a named cycle with documented inputs, built on the general solver.
 * A template turns its inputs into a CycleSpec (states with givens, steps with ratios/heat)
 * and lets solveCycle do the rest, so every template gets the same checks and messages.
 */
import type { CycleResult, CycleSpec } from '../cycle.ts'
import { solveCycle } from '../cycle.ts'
import type { Slips } from '../slips.ts'
import { parseGas, readAmount, readFlowRate, readHeat, readValue } from '../spec.ts'
import type { SpecError } from '../spec.ts'
import type { Gas } from '../substances/gas.ts'
import type { Dimension } from '../units.ts'

export type InputKind = 'gas' | 'amount' | 'heat' | 'flowRate' | Dimension

export interface TemplateInput {
  readonly name: string
  /**
   * 'gas' (preset id or constants), 'amount' (mol or kg), 'heat' (J, J/kg or J/mol), 'flowRate'
   * (kg/s or mol/s, read on the gas's basis), or a dimension.
   */
  readonly dimension: InputKind
  /** unit shown to authors, e.g. 'K', 'kPa', '' for ratios */
  readonly unit: string
  readonly description: string
  readonly required: boolean
}

/** An input read as a quantity of one dimension, so its readers need no other kind. */
export interface DimensionInput extends TemplateInput {
  readonly dimension: Dimension
}

/** The gas of a template (a preset id or constants), read by parseGas rather than as a quantity. */
export interface GasInput extends TemplateInput {
  readonly name: 'gas'
  readonly dimension: 'gas'
}

/** Parsed, numeric template inputs (SI, per unit amount of the gas's basis). */
export interface TemplateValues {
  readonly gas: Gas
  readonly amount?: number
  readonly num: Readonly<Record<string, number | undefined>>
  /** heat inputs: per unit amount (heat) or total (heatTotal) */
  readonly heat: Readonly<Record<string, { heat?: number; heatTotal?: number } | undefined>>
  readonly labels: Readonly<Record<string, string>>
}

export type BuildResult =
  | {
      ok: true
      spec: CycleSpec
      /**
       * Closed cycles only: the gas taken through the cycle per second (kg/s or mol/s on the
       * gas's basis; mass per cycle × cycles per second), for powers. The solver's `flowRate`
       * is for steady flow, so `solve` puts this on the solution after solving (the per-unit
       * values times it are the powers, as for a flow cycle).
       */
      cycleRate?: number
    }
  | { ok: false; error: { code: 'invalid-input'; message: string; property?: string } }

export interface TemplateDef {
  readonly id: string
  readonly title: string
  readonly description: string
  readonly inputs: readonly TemplateInput[]
  /** Numbers in, CycleSpec out (the hot path: no strings, no mathjs). */
  build(values: TemplateValues): BuildResult
  /** Strings with units in (as in a spec file), solution or error out. Never throws. */
  solve(
    inputs: Readonly<Record<string, unknown>>,
    options?: { readonly slips?: Slips },
  ): CycleResult | { ok: false; error: SpecError }
}

export function parseTemplateInputs(
  inputs: readonly TemplateInput[],
  raw: Readonly<Record<string, unknown>>,
  slips: Slips = {},
): { ok: true; value: TemplateValues } | { ok: false; error: SpecError } {
  if (typeof raw !== 'object' || raw === null)
    return { ok: false, error: { code: 'invalid-spec', message: 'inputs must be an object' } }
  const known = new Set(inputs.map((i) => i.name))
  for (const key of Object.keys(raw)) {
    if (!known.has(key))
      return {
        ok: false,
        error: {
          code: 'invalid-spec',
          message: `unknown input "${key}"; this template takes ${[...known].join(', ')}`,
          property: key,
        },
      }
  }
  const g = parseGas(raw.gas, slips)
  if (!g.ok) return g
  const gas = g.value
  const num: Record<string, number | undefined> = {}
  const heat: Record<string, { heat?: number; heatTotal?: number } | undefined> = {}
  const labels: Record<string, string> = {}
  let amount: number | undefined
  for (const inp of inputs) {
    const x = raw[inp.name]
    if (inp.dimension === 'gas') continue
    if (x === undefined) {
      if (inp.required)
        return {
          ok: false,
          error: {
            code: 'invalid-spec',
            message: `input "${inp.name}" is required: ${inp.description}`,
            property: inp.name,
          },
        }
      continue
    }
    labels[inp.name] = String(x)
    if (inp.dimension === 'amount') {
      const r = readAmount(x, gas, inp.name, slips)
      if (!r.ok) return r
      amount = r.value
    } else if (inp.dimension === 'flowRate') {
      const r = readFlowRate(x, gas, inp.name, slips)
      if (!r.ok) return r
      num[inp.name] = r.value
    } else if (inp.dimension === 'heat') {
      const r = readHeat(x, gas, inp.name, slips)
      if (!r.ok) return r
      heat[inp.name] = r.value
    } else {
      const r = readValue(x, [inp.dimension], inp.name, slips)
      if (!r.ok) return r
      num[inp.name] = r.value.value
    }
  }
  return { ok: true, value: { gas, amount, num, heat, labels } }
}

/** Helper: make a TemplateDef from id, texts, inputs and a numeric builder. */
export function defineTemplate(t: Omit<TemplateDef, 'solve'>): TemplateDef {
  return {
    ...t,
    solve(inputs, options) {
      const parsed = parseTemplateInputs(t.inputs, inputs, options?.slips)
      if (!parsed.ok) return parsed
      const built = t.build(parsed.value)
      if (!built.ok) return built
      const solved = solveCycle(built.spec)
      return solved.ok && built.cycleRate !== undefined ? { ...solved, flowRate: built.cycleRate } : solved
    },
  }
}
