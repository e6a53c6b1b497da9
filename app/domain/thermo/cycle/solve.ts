/**
 * The general cycle solver: an ordered list of states and the processes that join them
 * (step k joins state k to state k+1, the last joins back to the first). Every unknown p, v, T
 * is filled by propagation through the process relations and the ideal-gas law until nothing
 * changes; then every relation is verified, so over-specified but inconsistent givens produce an
 * error naming the state and property instead of a silently wrong key. Energies per step, the
 * first-law totals and the second law (entropy generated, exergy) follow.
 *
 * Internally: SI numbers only, per unit amount of the gas's basis (mol or kg), and the
 * chemistry sign convention (q into the system, w done ON the system, Δu = q + w). Extensive
 * values are the per-unit ones times the amount, when it is known; rates are the per-unit
 * ones times the flow rate. See ../conventions.ts for the output conventions.
 *
 * Public functions never throw for bad input: they return { ok: false, error }.
 */
import { stateResults, stepEnergies } from './energy.ts'
import { checkDetermined, propagate } from './propagate.ts'
import { fail } from './relations.ts'
import type { Failure } from './relations.ts'
import { deadStateOf, secondLaw } from './second-law.ts'
import { firstLawTotals } from './totals.ts'
import type { CycleResult, CycleSpec } from './types.ts'
import { readGivens, validateSteps } from './validate.ts'
import { verifyRelations } from './verify.ts'

/** The flow rate of a spec (null without one), or an error (not positive, or on a closed system). */
function flowRateOf(spec: CycleSpec, system: 'closed' | 'flow'): number | null | Failure {
  const f = spec.flowRate
  if (f === undefined) return null
  if (system !== 'flow')
    return fail('invalid-input', 'a flow rate applies to steady-flow cycles (system "flow") only', {
      property: 'flowRate',
    })
  if (!(Number.isFinite(f) && f > 0))
    return fail('invalid-input', 'the flow rate must be a positive number', { property: 'flowRate' })
  return f
}

/**
 * Solve a cycle. Returns the per-unit-amount solution or an error naming the state and the
 * missing or conflicting property.
 */
export function solveCycle(spec: CycleSpec): CycleResult {
  const { gas, states: st, steps } = spec
  const system = spec.system ?? 'closed'
  const N = st.length
  if (N < 2) return fail('invalid-input', 'a cycle needs at least two states')
  if (steps.length !== N)
    return fail(
      'invalid-input',
      `a cycle of ${N} states needs ${N} steps (the last joins state ${N} back to state 1); got ${steps.length}`,
    )
  const badStep = validateSteps(steps, N)
  if (badStep) return badStep
  const dead = deadStateOf(spec, gas)
  if (dead && 'ok' in dead) return dead
  const flowRate = flowRateOf(spec, system)
  if (flowRate !== null && typeof flowRate === 'object') return flowRate

  const c = readGivens(spec, gas, system, steps, N)
  if ('ok' in c) return c
  const unsolved = propagate(c) ?? checkDetermined(c) ?? verifyRelations(c)
  if (unsolved) return unsolved

  const states = stateResults(c, dead)
  const energies = stepEnergies(c, states)
  if ('ok' in energies) return energies
  const first = firstLawTotals(spec, system, states, energies)
  const second = secondLaw(spec, gas, states, energies, first, dead)
  if ('ok' in second) return second
  return {
    ok: true,
    gas,
    system,
    amount: Number.isNaN(c.amount) ? null : c.amount,
    states,
    steps: second.steps,
    totals: {
      qIn: first.qIn,
      qOut: first.qOut,
      wNet: first.wNet,
      purpose: first.purpose,
      efficiency: first.efficiency,
      copRefrigerator: first.copRefrigerator,
      copHeatPump: first.copHeatPump,
      mep: first.mep,
      backWorkRatio: first.backWorkRatio,
      Tmin: first.Tmin,
      Tmax: first.Tmax,
      carnotBound: first.carnotBound,
      entropyGenerated: second.totals.entropyGenerated,
      exergyDestroyed: second.totals.exergyDestroyed,
      secondLawEfficiency: second.totals.secondLawEfficiency,
      exergyEfficiency: second.totals.exergyEfficiency,
      duCycle: first.duCycle,
      dsCycle: first.dsCycle,
    },
    deadState: dead ? { T: dead.T, p: dead.p } : null,
    flowRate,
    warnings: second.warnings,
  }
}
