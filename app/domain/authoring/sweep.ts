/**
 * The sweep: drawing many variants of a problem and checking each for physical sense before
 * students see it. A range that looks harmless can reach a turbine inlet below the compressor
 * exit, a negative temperature through an expression, wet steam beyond quality 1, or an
 * evaporator warmer than the condenser of a refrigerator. Each
 * failure names its seed and the givens drawn, so the author can open that variant. Pure;
 * the background job calls sweepVariants in chunks of seeds and reports progress between them.
 */
import type { Convention, FormattedSolution } from '#app/domain/thermo/index.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { FormattedRankine } from '#app/domain/thermo/steam/rankine-template.ts'
import type { FormattedCalorimeter } from '#app/domain/thermo/steam/calorimeter.ts'
import type { FormattedSteamCycle } from '#app/domain/thermo/steam/steam-cycle.ts'
import { isRecord } from '#app/domain/thermo/json.ts'
import type { DrawResult, DrawnGiven, ProblemDefinition, SweepFailure, SweepSummary } from './definition.ts'
import { drawGivens, formatNumber } from './givens.ts'
import {
  isCalorimeterSolution,
  isCascadeSolution,
  isCombinedSolution,
  isIdealGasSolution,
  isRankineSolution,
  isRefrigerationSolution,
  isSteadyFlowSolution,
  isSteamCycleSolution,
  isTwoStageSolution,
  type BankSolution,
} from './solution-kind.ts'
import type { FormattedCombined } from '#app/domain/thermo/combined/combined-template.ts'
import { cascadeProblems, twoStageProblems } from './multi-stage-sweep.ts'
import { steadyFlowProblems } from './flow-sweep.ts'
import { drawVariant } from './variant.ts'

/** Failures kept by default; the rest are counted. */
export const SWEEP_KEEP_DEFAULT = 200

// Round-off in the solver's own arithmetic must not count as a violated bound.
const SLACK = 1e-9

function givenLines(givens: readonly DrawnGiven[]): string[] {
  return givens.map((g) => `${g.name} = ${g.text}`)
}

function stateName(name: string, index: number): string {
  return name === String(index + 1) ? `State ${name}` : `State ${index + 1} (${name})`
}

function fmt(x: number): string {
  return Number.isFinite(x) ? formatNumber(Number(x.toPrecision(4))) : String(x)
}

type Problem = Omit<SweepFailure, 'seed' | 'givens'>

function stateProblems(states: readonly { name: string; T: { value: number }; p: { value: number } }[]): Problem[] {
  const out: Problem[] = []
  states.forEach((s, i) => {
    if (!(s.T.value > 0))
      out.push({
        code: 'temperature-not-positive',
        message: `${stateName(s.name, i)}: T = ${fmt(s.T.value)} K is not above absolute zero.`,
      })
    if (!(s.p.value > 0))
      out.push({
        code: 'pressure-not-positive',
        message: `${stateName(s.name, i)}: p = ${fmt(s.p.value)} Pa is not positive.`,
      })
  })
  return out
}

function idealGasProblems(sol: FormattedSolution): Problem[] {
  const out = stateProblems(sol.states)
  const t = sol.totals
  const bound = t.carnotBound.value
  const check = (what: string, value: number | undefined, lowOk: (v: number) => boolean): void => {
    if (value === undefined || !Number.isFinite(value)) {
      out.push({
        code: 'efficiency-out-of-range',
        message: `The ${what} is undefined (the cycle does not work as a ${t.purpose}).`,
      })
    } else if (!lowOk(value) || value > bound + SLACK * Math.max(1, Math.abs(bound))) {
      out.push({
        code: 'efficiency-out-of-range',
        message: `The ${what} ${fmt(value)} is outside 0 to the Carnot bound ${fmt(bound)} for ${fmt(t.Tmin.value)} K to ${fmt(t.Tmax.value)} K.`,
      })
    }
  }
  if (t.purpose === 'engine') check('efficiency', t.efficiency?.value, (v) => v >= -SLACK)
  else if (t.purpose === 'refrigerator') check('COP', t.copRefrigerator?.value, (v) => v > 0)
  else check('COP', t.copHeatPump?.value, (v) => v > 0)
  return out
}

function rankineProblems(sol: FormattedRankine): Problem[] {
  const out = stateProblems(sol.states)
  const temps = sol.states.map((s) => s.T.value)
  const tMin = Math.min(...temps)
  const tMax = Math.max(...temps)
  const bound = 1 - tMin / tMax
  const eta = sol.totals.efficiency.value
  if (!Number.isFinite(eta) || eta < -SLACK || eta > bound + SLACK) {
    out.push({
      code: 'efficiency-out-of-range',
      message: `The efficiency ${fmt(eta)} is outside 0 to the Carnot bound ${fmt(bound)} for ${fmt(tMin)} K to ${fmt(tMax)} K.`,
    })
  }
  sol.states.forEach((s, i) => {
    if (s.x !== null && !(s.x >= -SLACK && s.x <= 1 + SLACK))
      out.push({
        code: 'quality-out-of-range',
        message: `${stateName(s.name, i)}: quality x = ${fmt(s.x)} is outside 0 to 1.`,
      })
  })
  const x = sol.totals.turbineExitQuality?.value
  if (x !== undefined && !(x >= -SLACK && x <= 1 + SLACK))
    out.push({ code: 'quality-out-of-range', message: `Turbine exit quality ${fmt(x)} is outside 0 to 1.` })
  if (sol.heaters) out.push(...steamPlantProblems(sol))
  return out
}

/**
 * A steam plant (feedwater heaters, cogeneration): each bleed fraction strictly between 0 and
 * 1, the first law over the plant (heat in = net work + heat rejected + process heat), and a
 * utilisation factor between the thermal efficiency and 1.
 */
function steamPlantProblems(sol: FormattedRankine): Problem[] {
  const out: Problem[] = []
  const t = sol.totals
  ;(sol.heaters ?? []).forEach((h, i) => {
    const y = h.bleedFraction.value
    if (!(y > 0 && y < 1))
      out.push({
        code: 'efficiency-out-of-range',
        message: `Feedwater heater ${i + 1} (${h.name}): the bleed fraction ${fmt(y)} is outside 0 to 1.`,
      })
  })
  const qP = t.processHeat?.value ?? 0
  const balance = t.heatIn.value - t.netWork.value - t.heatOut.value - qP
  if (!Number.isFinite(balance) || Math.abs(balance) > 1e-6 * Math.max(1, Math.abs(t.heatIn.value)))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The energy balance does not close: heat in ${fmt(t.heatIn.value / 1000)} kJ/kg against ${fmt(t.netWork.value / 1000)} + ${fmt(t.heatOut.value / 1000)} + ${fmt(qP / 1000)} kJ/kg of net work, heat rejected and process heat.`,
    })
  const u = t.utilisationFactor?.value
  if (u !== undefined && !(u >= t.efficiency.value - SLACK && u <= 1 + SLACK))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The utilisation factor ${fmt(u)} is outside the thermal efficiency ${fmt(t.efficiency.value)} to 1.`,
    })
  return out
}

/**
 * A vapour-compression cycle: the COP between 0 and the Carnot COP of its two temperatures, the
 * energy balance q_H = q_L + w, and every quality (the valve exit is a wet mixture). The solver
 * already refuses an evaporator at or above the condenser (the variant does not draw).
 */
function refrigerationProblems(sol: FormattedRefrigeration, spec: Readonly<Record<string, unknown>>): Problem[] {
  const out = stateProblems(sol.states)
  const t = sol.totals
  const purpose = isRecord(spec.inputs) ? spec.inputs.purpose : undefined
  const heatPump = purpose === 'heat pump' || purpose === 'heat-pump'
  // The solver states the Carnot COP for the purpose; a heat pump's is the refrigerator's + 1.
  const carnotR = heatPump ? t.carnotCop.value - 1 : t.carnotCop.value
  const cop = t.copRefrigerator.value
  const what = heatPump ? 'heat pump COP' : 'COP'
  const shown = heatPump ? t.copHeatPump.value : cop
  if (!Number.isFinite(cop) || !(cop > 0) || cop > carnotR + SLACK * Math.max(1, Math.abs(carnotR)))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The ${what} ${fmt(shown)} is outside 0 to the Carnot COP ${fmt(t.carnotCop.value)}.`,
    })
  const qL = t.refrigerationEffect.value
  const w = t.compressorWork.value
  const qH = t.heatRejected.value
  if (![qL, w, qH].every(Number.isFinite) || !(w > 0) || Math.abs(qH - qL - w) > 1e-6 * Math.max(1, Math.abs(qH)))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The energy balance does not close: heat rejected ${fmt(qH / 1000)} kJ/kg against ${fmt(qL / 1000)} + ${fmt(w / 1000)} kJ/kg taken in.`,
    })
  sol.states.forEach((s, i) => {
    if (s.x !== null && !(s.x >= -SLACK && s.x <= 1 + SLACK))
      out.push({
        code: 'quality-out-of-range',
        message: `${stateName(s.name, i)}: quality x = ${fmt(s.x)} is outside 0 to 1.`,
      })
  })
  const x = t.throttleQuality.value
  if (!(x > -SLACK && x < 1 + SLACK))
    out.push({ code: 'quality-out-of-range', message: `The quality after the valve ${fmt(x)} is outside 0 to 1.` })
  return out
}

function qualityProblems(states: readonly { name: string; x: number | null }[]): Problem[] {
  const out: Problem[] = []
  states.forEach((s, i) => {
    if (s.x !== null && !(s.x >= -SLACK && s.x <= 1 + SLACK))
      out.push({
        code: 'quality-out-of-range',
        message: `${stateName(s.name, i)}: quality x = ${fmt(s.x)} is outside 0 to 1.`,
      })
  })
  return out
}

/** Water in the general cycle format: positive states, qualities, the first law per cycle, η ≤ Carnot. */
function steamCycleProblems(sol: FormattedSteamCycle): Problem[] {
  const out = [...stateProblems(sol.states), ...qualityProblems(sol.states)]
  const t = sol.totals
  const temps = sol.states.map((s) => s.T.value)
  const bound = 1 - Math.min(...temps) / Math.max(...temps)
  const eta = t.efficiency?.value
  if (eta !== undefined && (!Number.isFinite(eta) || eta < -SLACK || eta > bound + SLACK))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The efficiency ${fmt(eta)} is outside 0 to the Carnot bound ${fmt(bound)}.`,
    })
  return out
}

/** The throttling calorimeter: the line steam's quality between the calorimeter's lowest and 1. */
function calorimeterProblems(sol: FormattedCalorimeter): Problem[] {
  const out = stateProblems(sol.states)
  const t = sol.totals
  const x = t.quality.value
  if (!(x >= t.lowestMeasurableQuality.value - SLACK && x <= 1 + SLACK))
    out.push({
      code: 'quality-out-of-range',
      message: `The line steam's quality ${fmt(x)} is outside ${fmt(t.lowestMeasurableQuality.value)} (the lowest this calorimeter measures) to 1.`,
    })
  if (!(t.superheat.value > 0))
    out.push({
      code: 'quality-out-of-range',
      message: `The calorimeter steam is not superheated (${fmt(t.superheat.value)} K above saturation).`,
    })
  return out
}

/** The combined cycle: the gas side's states, the steam cycle's own checks, the plant's first law, η ≤ Carnot. */
function combinedProblems(sol: FormattedCombined): Problem[] {
  const out = [
    ...stateProblems(sol.gasStates),
    ...rankineProblems(sol.bottoming).map((p) => ({ ...p, message: `Steam cycle: ${p.message}` })),
  ]
  const t = sol.totals
  const temps = sol.gasStates.map((s) => s.T.value)
  const bound = 1 - Math.min(...temps) / Math.max(...temps)
  const eta = t.efficiency.value
  if (!Number.isFinite(eta) || eta < -SLACK || eta > bound + SLACK)
    out.push({
      code: 'efficiency-out-of-range',
      message: `The plant efficiency ${fmt(eta)} is outside 0 to the Carnot bound ${fmt(bound)}.`,
    })
  const balance = t.netWork.value + t.stackLoss.value + t.condenserHeat.value
  if (!(Math.abs(balance - t.heatIn.value) <= 1e-6 * Math.max(1, Math.abs(t.heatIn.value))))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The energy balance does not close: ${fmt(t.heatIn.value / 1000)} kJ/kg in against ${fmt(balance / 1000)} kJ/kg out.`,
    })
  if (!(t.steamPerGas.value > 0))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The steam raised per kg of gas ${fmt(t.steamPerGas.value)} is not positive.`,
    })
  return out
}

/** The checks of a solution's own shape, asked through the shape guards in one order. */
function problemsOf(sol: BankSolution, spec: Readonly<Record<string, unknown>>): Problem[] {
  if (isTwoStageSolution(sol)) return twoStageProblems(sol)
  if (isCascadeSolution(sol)) return cascadeProblems(sol)
  if (isSteadyFlowSolution(sol)) return steadyFlowProblems(sol)
  if (isCombinedSolution(sol)) return combinedProblems(sol)
  if (isSteamCycleSolution(sol)) return steamCycleProblems(sol)
  if (isCalorimeterSolution(sol)) return calorimeterProblems(sol)
  if (isRefrigerationSolution(sol)) return refrigerationProblems(sol, spec)
  if (isRankineSolution(sol)) return rankineProblems(sol)
  if (isIdealGasSolution(sol)) return idealGasProblems(sol)
  return []
}

/** What is physically wrong with one drawn variant (an empty list when nothing is). */
export function checkVariantSanity(result: DrawResult): SweepFailure[] {
  if (!result.ok) return [{ seed: result.seed, code: result.error.code, message: result.error.message }]
  const v = result.variant
  const sol = v.solution
  const problems = problemsOf(sol, v.spec)
  for (const k of v.key) {
    if (!Number.isFinite(k.value))
      problems.push({ code: 'find-undefined', message: `Find "${k.name}": the key is not a finite number.` })
  }
  const givens = givenLines(v.givens)
  return problems.map((p) => ({ seed: v.seed, ...p, givens }))
}

/**
 * Draws and checks the variant of every seed. `failed` counts the variants with at least one
 * failure (all of them); `failures` keeps the first `keep` (default 200) failures. Never throws.
 */
export function sweepVariants(
  def: ProblemDefinition,
  options: { readonly seeds: readonly number[]; readonly convention: Convention; readonly keep?: number },
): SweepSummary {
  const keep =
    options.keep === undefined || !Number.isFinite(options.keep)
      ? SWEEP_KEEP_DEFAULT
      : Math.max(0, Math.floor(options.keep))
  let checked = 0
  let failed = 0
  const failures: SweepFailure[] = []
  for (const seed of options.seeds) {
    checked++
    let found: SweepFailure[]
    try {
      const result = drawVariant(def, seed, { convention: options.convention })
      found = checkVariantSanity(result)
      // A variant that failed after its givens were drawn (the solver refused them) is most
      // useful with those givens beside the message.
      if (
        !result.ok &&
        found.length > 0 &&
        result.error.code !== 'given-error' &&
        result.error.code !== 'constraint-never-met'
      ) {
        const g = drawGivens(def, seed)
        if (g.ok) found = found.map((f) => ({ ...f, givens: givenLines(g.givens) }))
      }
    } catch (e) {
      found = [
        {
          seed,
          code: 'invalid-definition',
          message: `The variant could not be checked (${e instanceof Error ? e.message : String(e)}).`,
        },
      ]
    }
    if (found.length === 0) continue
    failed++
    for (const f of found) if (failures.length < keep) failures.push(f)
  }
  return { checked, failed, failures }
}
