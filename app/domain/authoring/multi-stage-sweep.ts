/**
 * Sweep checks of the two-stage (flash chamber) and cascade vapour-compression cycles (sweep.ts
 * calls these for their result shapes): every state above absolute zero at a positive pressure,
 * every quality in 0 to 1, the COP between 0 and the Carnot COP of the outer temperatures,
 * q_H = q_L + w, and the balances of the flash chamber, the mixing chamber and the cascade heat
 * exchanger from the reported states. The solver already refuses an evaporator warmer than its
 * condenser, a flash chamber outside the two pressures and an exchanger in which heat would flow
 * from cold to hot (the variant does not draw); these checks catch what a drawn variant could
 * still get wrong. Pure.
 */
import type { FormattedCascade, FormattedTwoStage } from '#app/domain/thermo/refrigerants/multi-stage-template.ts'
import type { SweepFailure } from './definition.ts'
import { formatNumber } from './givens.ts'

type Problem = Omit<SweepFailure, 'seed' | 'givens'>

/** Round-off in the solver's own arithmetic must not count as a violated bound. */
const SLACK = 1e-9
/** Energy balances close to this, relative (the solver's are ~1e-15). */
const BALANCE = 1e-6

const fmt = (x: number) => (Number.isFinite(x) ? formatNumber(Number(x.toPrecision(4))) : String(x))
const kJ = (x: number) => `${fmt(x / 1000)} kJ/kg`
const off = (a: number, b: number) =>
  !Number.isFinite(a) || !Number.isFinite(b) || Math.abs(a - b) > BALANCE * Math.max(1, Math.abs(a), Math.abs(b))

type State = { name: string; T: { value: number }; p: { value: number }; h: { value: number }; x: number | null }

function stateProblems(states: readonly State[]): Problem[] {
  const out: Problem[] = []
  for (const s of states) {
    if (!(s.T.value > 0))
      out.push({
        code: 'temperature-not-positive',
        message: `State ${s.name}: T = ${fmt(s.T.value)} K is not above absolute zero.`,
      })
    if (!(s.p.value > 0))
      out.push({ code: 'pressure-not-positive', message: `State ${s.name}: p = ${fmt(s.p.value)} Pa is not positive.` })
    if (s.x !== null && !(s.x >= -SLACK && s.x <= 1 + SLACK))
      out.push({ code: 'quality-out-of-range', message: `State ${s.name}: quality x = ${fmt(s.x)} is outside 0 to 1.` })
  }
  return out
}

function copProblems(cop: number, carnot: number, qL: number, w: number, qH: number): Problem[] {
  const out: Problem[] = []
  if (!Number.isFinite(cop) || !(cop > 0) || cop > carnot + SLACK * Math.max(1, Math.abs(carnot)))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The COP ${fmt(cop)} is outside 0 to the Carnot COP ${fmt(carnot)}.`,
    })
  if (!(w > 0) || off(qH, qL + w))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The energy balance does not close: heat rejected ${kJ(qH)} against ${kJ(qL)} + ${kJ(w)} taken in.`,
    })
  return out
}

export function twoStageProblems(sol: FormattedTwoStage): Problem[] {
  const out = stateProblems(sol.states)
  const t = sol.totals
  out.push(
    ...copProblems(
      t.copRefrigerator.value,
      t.carnotCopRefrigerator.value,
      t.refrigerationEffect.value,
      t.compressorWork.value,
      t.heatRejected.value,
    ),
  )
  const x6 = t.flashVapourFraction.value
  if (!(x6 >= -SLACK && x6 <= 1 + SLACK))
    out.push({
      code: 'quality-out-of-range',
      message: `The flash chamber's vapour fraction ${fmt(x6)} is outside 0 to 1.`,
    })
  if (!(t.lowStageWork.value >= -SLACK) || !(t.highStageWork.value >= -SLACK))
    out.push({
      code: 'efficiency-out-of-range',
      message: `A compressor takes no work: low stage ${kJ(t.lowStageWork.value)}, high stage ${kJ(t.highStageWork.value)}.`,
    })
  const h = (name: string) => sol.states.find((s) => s.name === name)?.h.value ?? Number.NaN
  const p = (name: string) => sol.states.find((s) => s.name === name)?.p.value ?? Number.NaN
  const pI = t.intermediatePressure.value
  if (!(pI >= p('1') * (1 - SLACK) && pI <= p('5') * (1 + SLACK)))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The flash chamber pressure ${fmt(pI / 1000)} kPa is outside the evaporator's ${fmt(p('1') / 1000)} kPa to the condenser's ${fmt(p('5') / 1000)} kPa.`,
    })
  if (off(h('6'), x6 * h('9') + (1 - x6) * h('7')))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The flash chamber's energy balance does not close: h6 = ${kJ(h('6'))} against x6·h9 + (1 − x6)·h7 = ${kJ(x6 * h('9') + (1 - x6) * h('7'))}.`,
    })
  if (off(h('3'), x6 * h('9') + (1 - x6) * h('2')))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The mixing chamber's energy balance does not close: h3 = ${kJ(h('3'))} against x6·h9 + (1 − x6)·h2 = ${kJ(x6 * h('9') + (1 - x6) * h('2'))}.`,
    })
  return out
}

export function cascadeProblems(sol: FormattedCascade): Problem[] {
  const out = stateProblems(sol.states)
  const t = sol.totals
  out.push(
    ...copProblems(
      t.copRefrigerator.value,
      t.carnotCopRefrigerator.value,
      t.refrigerationEffect.value,
      t.compressorWork.value,
      t.heatRejected.value,
    ),
  )
  const h = (i: number) => sol.states[i - 1]?.h.value ?? Number.NaN
  const T = (i: number) => sol.states[i - 1]?.T.value ?? Number.NaN
  const ratio = t.massFlowRatio.value
  if (!(ratio > 0) || off(ratio * (h(5) - h(8)), h(2) - h(3)))
    out.push({
      code: 'efficiency-out-of-range',
      message: `The cascade heat exchanger's energy balance does not close: ṁ_A/ṁ_B = ${fmt(ratio)} with h5 − h8 = ${kJ(h(5) - h(8))} against h2 − h3 = ${kJ(h(2) - h(3))}.`,
    })
  if (!(T(3) >= T(5) - SLACK * T(5)))
    out.push({
      code: 'efficiency-out-of-range',
      message: `In the cascade heat exchanger the lower cycle condenses at ${fmt(T(3))} K, colder than the upper cycle evaporates (${fmt(T(5))} K).`,
    })
  return out
}
