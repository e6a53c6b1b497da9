/**
 * First-law totals of a solved cycle: heat in and out, net work, efficiency or COP, mean
 * effective pressure, back work ratio, the Carnot bound between the extreme temperatures and
 * the closures Δu, Δs per cycle (0 to rounding).
 */
import type { StepEnergy } from './energy.ts'
import type { CycleSpec, CycleTotals, StateResult } from './types.ts'

/** The totals that follow from the first law; ./second-law.ts adds the rest. */
export type FirstLawTotals = Omit<
  CycleTotals,
  'entropyGenerated' | 'exergyDestroyed' | 'secondLawEfficiency' | 'exergyEfficiency'
>

export function firstLawTotals(
  spec: CycleSpec,
  system: 'closed' | 'flow',
  states: readonly StateResult[],
  steps: readonly StepEnergy[],
): FirstLawTotals {
  let qIn = 0
  let qOut = 0
  let wNet = 0
  let wCompIn = 0
  let wTurbOut = 0
  let duCycle = 0
  let dsCycle = 0
  for (const st of steps) {
    const { q, w } = st
    if (!st.internal) {
      if (q > 0) qIn += q
      else qOut -= q
    }
    wNet += w
    if (w > 0) wCompIn += w
    else wTurbOut -= w
    duCycle += st.du
    dsCycle += st.ds
  }
  let Tmin = Infinity
  let Tmax = -Infinity
  let vmin = Infinity
  let vmax = -Infinity
  for (const s of states) {
    if (s.T < Tmin) Tmin = s.T
    if (s.T > Tmax) Tmax = s.T
    if (s.v < vmin) vmin = s.v
    if (s.v > vmax) vmax = s.v
  }
  const wBy = -wNet
  const purpose = spec.purpose ?? (wBy > 0 ? 'engine' : 'refrigerator')
  const isEngine = purpose === 'engine'
  const efficiency = isEngine && qIn > 0 ? wBy / qIn : null
  const copRefrigerator = !isEngine && wNet > 0 ? qIn / wNet : null
  const copHeatPump = !isEngine && wNet > 0 ? qOut / wNet : null
  const carnotBound = isEngine
    ? 1 - Tmin / Tmax
    : purpose === 'refrigerator'
      ? Tmin / (Tmax - Tmin)
      : Tmax / (Tmax - Tmin)
  const mep = system === 'closed' && vmax > vmin ? wBy / (vmax - vmin) : null
  const backWorkRatio = system === 'flow' && wTurbOut > 0 ? wCompIn / wTurbOut : null
  return {
    qIn,
    qOut,
    wNet,
    purpose,
    efficiency,
    copRefrigerator,
    copHeatPump,
    mep,
    backWorkRatio,
    Tmin,
    Tmax,
    carnotBound,
    duCycle,
    dsCycle,
  }
}
