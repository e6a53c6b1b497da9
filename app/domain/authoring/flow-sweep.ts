/**
 * The sweep's checks of a nozzle, diffuser or turbojet variant (sweep.ts calls them): what the
 * solver accepts but a student should not be given. Pure.
 *
 * - every state above absolute zero and at a positive pressure;
 * - the steady-flow energy equation closes: h1 + V1²/2 + q = h2 + V2²/2 for a duct, and for the
 *   turbojet the turbine's work equals the compressor's and h5 − h6 = V6²/2 (V5 ≈ 0);
 * - a device's efficiency in (0, 1]; a converging nozzle's exit at most sonic;
 * - the turbojet's thermal efficiency between 0 and the Carnot bound 1 − T1/T4 of its coldest
 *   and hottest states, propulsive and overall efficiencies in (0, 1], and a positive thrust.
 */
import type { FormattedDuct, FormattedFlow, FormattedTurbojet } from '#app/domain/thermo/flow/flow-template.ts'
import type { SweepFailure } from './definition.ts'
import { formatNumber } from './givens.ts'

type Problem = Omit<SweepFailure, 'seed' | 'givens'>

const SLACK = 1e-9
const fmt = (x: number) => (Number.isFinite(x) ? formatNumber(Number(x.toPrecision(4))) : String(x))
const closes = (a: number, b: number, scale: number) => Math.abs(a - b) <= 1e-6 * Math.max(1, Math.abs(scale))

function stateChecks(sol: FormattedFlow): Problem[] {
  const out: Problem[] = []
  sol.states.forEach((s) => {
    if (!(s.T.value > 0))
      out.push({
        code: 'temperature-not-positive',
        message: `State ${s.name}: T = ${fmt(s.T.value)} K is not above absolute zero.`,
      })
    if (!(s.p.value > 0))
      out.push({ code: 'pressure-not-positive', message: `State ${s.name}: p = ${fmt(s.p.value)} Pa is not positive.` })
  })
  return out
}

function ductChecks(sol: FormattedDuct): Problem[] {
  const out = stateChecks(sol)
  const [s1, s2] = sol.states
  const t = sol.totals
  if (!s1 || !s2) return out
  const e1 = s1.h.value + (s1.V.value * s1.V.value) / 2 + t.heatIn.value
  const e2 = s2.h.value + (s2.V.value * s2.V.value) / 2
  if (!closes(e1, e2, e1))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The energy balance does not close: h + V²/2 is ${fmt(e1 / 1000)} kJ/kg in and ${fmt(e2 / 1000)} kJ/kg out.`,
    })
  const eta = t.efficiency.value
  if (!(eta > 0 && eta <= 1 + SLACK))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The ${sol.template} efficiency ${fmt(eta)} is outside 0 to 1.`,
    })
  if (t.shape === 'converging' && s2.mach.value > 1 + 1e-6)
    out.push({
      code: 'efficiency-out-of-range',
      message: `A converging nozzle's exit is at M = ${fmt(s2.mach.value)}, above 1.`,
    })
  return out
}

function turbojetChecks(sol: FormattedTurbojet): Problem[] {
  const out = stateChecks(sol)
  const t = sol.totals
  const s = sol.states
  if (s.length !== 6) return out
  if (!closes(t.turbineWork.value, t.compressorWork.value, t.compressorWork.value))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The turbine's work ${fmt(t.turbineWork.value / 1000)} kJ/kg is not the compressor's ${fmt(t.compressorWork.value / 1000)} kJ/kg.`,
    })
  const ke = s[4]!.h.value - s[5]!.h.value
  if (!closes(ke, (s[5]!.V.value * s[5]!.V.value) / 2, ke))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The nozzle's energy balance does not close: h5 − h6 = ${fmt(ke / 1000)} kJ/kg against V6²/2.`,
    })
  const temps = s.map((x) => x.T.value)
  const bound = 1 - Math.min(...temps) / Math.max(...temps)
  const eth = t.thermalEfficiency.value
  if (!(eth > 0 && eth <= bound + SLACK))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The thermal efficiency ${fmt(eth)} is outside 0 to the Carnot bound ${fmt(bound)} for ${fmt(Math.min(...temps))} K to ${fmt(Math.max(...temps))} K.`,
    })
  if (!(t.specificThrust.value > 0))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The jet (${fmt(s[5]!.V.value)} m/s) is not faster than the flight speed (${fmt(s[0]!.V.value)} m/s): no thrust.`,
    })
  for (const [what, x] of [
    ['propulsive efficiency', t.propulsiveEfficiency.value],
    ['overall efficiency', t.overallEfficiency.value],
  ] as const)
    if (!(x >= 0 && x <= 1 + SLACK))
      out.push({ code: 'efficiency-out-of-range', message: `The ${what} ${fmt(x)} is outside 0 to 1.` })
  return out
}

export function steadyFlowProblems(sol: FormattedFlow): Problem[] {
  return sol.template === 'turbojet' ? turbojetChecks(sol) : ductChecks(sol)
}
