/**
 * A combined gas–steam power cycle: a gas-turbine (Brayton) topping cycle whose exhaust heats
 * the steam of a Rankine bottoming cycle in a heat-recovery steam generator (HRSG).
 *
 * The topping cycle is the 'brayton' template's own cycle (templates/ideal-gas.ts), solved by
 * the general solver; the bottoming cycle is solveRankine (steam/rankine.ts, IAPWS-IF97). The
 * HRSG couples them by an energy balance, with no heat lost to the surroundings (common
 * textbook practice):
 *
 *   m_gas (h4 − h_stack) = m_steam · q_in,steam          y = m_steam / m_gas
 *
 * given either the stack temperature (the gas leaving the HRSG) or the pinch-point temperature
 * difference (gas temperature minus the saturation temperature where the water starts to boil,
 * with any reheat taken at the hot end). Every result is per kilogram of gas through the gas
 * turbine; with a gas mass flow rate, also as power. The second law is checked at both ends and
 * at the pinch: the gas must be hotter than the water everywhere in the HRSG.
 *
 * Pure. Teaching tool: not design data; defer to the applicable codes and licensed engineering
 * practice for any real plant.
 */
import { solveCycle } from '../cycle.ts'
import type { CycleSolution } from '../cycle.ts'
import { saturationAtP } from '../steam/properties.ts'
import { solveRankine } from '../steam/rankine.ts'
import type { RankineInput, RankineResult } from '../steam/rankine.ts'
import type { Gas } from '../substances/gas.ts'
import { templates } from '../templates/index.ts'
import { P_REF } from '../constants.ts'

export const COMBINED_CAUTION =
  'Teaching tool: an idealised textbook combined-cycle analysis (air-standard gas turbine, IAPWS-IF97 steam, no HRSG losses), not design data. Defer to the applicable codes and licensed engineering practice.'

export interface CombinedInput {
  readonly gas: Gas
  /** compressor inlet, Pa and K */
  readonly p1: number
  readonly T1: number
  readonly pressureRatio: number
  /** gas-turbine inlet temperature, K */
  readonly turbineInletT: number
  readonly compressorEfficiency?: number
  readonly gasTurbineEfficiency?: number
  /** the steam cycle (its turbine inlet temperature is the HRSG's steam exit) */
  readonly steam: RankineInput
  /** exactly one of: the gas temperature leaving the HRSG (K), or the pinch-point difference (K) */
  readonly stackTemperature?: number
  readonly pinchDifference?: number
  /** kg/s of gas, for power */
  readonly gasMassFlow?: number
}

export interface CombinedGasState {
  readonly name: string
  readonly description: string
  readonly p: number
  readonly T: number
  /** J/kg */
  readonly h: number
  /** J/(kg K) */
  readonly s: number
  /** m³/kg, from the ideal-gas law v = R T / p */
  readonly v: number
}

export interface CombinedResult {
  readonly gasStates: readonly CombinedGasState[]
  readonly steam: RankineResult
  /** kg of steam per kg of gas */
  readonly steamPerGas: number
  /** J per kg of gas, all sizes (≥ 0) */
  readonly compressorWork: number
  readonly gasTurbineWork: number
  readonly heatIn: number
  readonly gasNetWork: number
  readonly steamNetWork: number
  readonly netWork: number
  /** heat the exhaust gives the steam in the HRSG, J per kg of gas */
  readonly hrsgHeat: number
  /** heat leaving with the stack gas (down to T1) and in the condenser, J per kg of gas */
  readonly stackLoss: number
  readonly condenserHeat: number
  readonly efficiency: number
  readonly gasEfficiency: number
  readonly steamEfficiency: number
  readonly stackTemperature: number
  /** gas temperature minus the water's saturation temperature at the pinch, K (null above the critical pressure) */
  readonly pinchDifference: number | null
  /** gas at the hot end minus the steam leaving the HRSG, K */
  readonly hotEndDifference: number
  /** stack gas minus the feedwater entering the HRSG, K */
  readonly coldEndDifference: number
  /** W, when a gas mass flow was given */
  readonly power: number | null
  readonly caution: string
}

export type CombinedOutcome =
  | { readonly ok: true; readonly value: CombinedResult }
  | {
      readonly ok: false
      readonly error: {
        readonly code: 'invalid-input' | 'unphysical' | 'out-of-range'
        readonly message: string
        readonly property?: string
      }
    }

const bad = (
  message: string,
  property?: string,
  code: 'invalid-input' | 'unphysical' | 'out-of-range' = 'invalid-input',
): CombinedOutcome => ({ ok: false, error: { code, message, ...(property ? { property } : {}) } })

/** Per kilogram, whatever the gas's basis. */
function perKg(gas: Gas): number | null {
  if (gas.basis === 'mass') return 1
  return gas.molarMass ? 1 / gas.molarMass : null
}

const k = (x: number) => Number(x.toPrecision(4))

export function solveCombinedCycle(input: CombinedInput): CombinedOutcome {
  const scale = perKg(input.gas)
  if (scale === null) return bad('the gas needs a molar mass so that results can be given per kilogram', 'gas')
  const given = [input.stackTemperature, input.pinchDifference].filter((x) => x !== undefined).length
  if (given !== 1)
    return bad(
      'give exactly one of stackTemperature or pinchDifference for the heat-recovery steam generator',
      'stackTemperature',
    )
  if (input.pinchDifference !== undefined && !(input.pinchDifference > 0))
    return bad(`pinchDifference must be above 0 K (got ${input.pinchDifference})`, 'pinchDifference')
  if (input.gasMassFlow !== undefined && !(input.gasMassFlow > 0 && Number.isFinite(input.gasMassFlow)))
    return bad('gasMassFlow must be a positive flow rate', 'gasMassFlow')

  // ---- topping cycle: the Brayton template's own cycle
  const brayton = templates.brayton!
  const num: Record<string, number | undefined> = {
    p1: input.p1,
    T1: input.T1,
    pressureRatio: input.pressureRatio,
    turbineInletT: input.turbineInletT,
    compressorEfficiency: input.compressorEfficiency,
    turbineEfficiency: input.gasTurbineEfficiency,
  }
  const built = brayton.build({ gas: input.gas, num, heat: {}, labels: {} })
  if (!built.ok)
    return bad(
      built.error.message,
      built.error.property === 'turbineEfficiency' ? 'gasTurbineEfficiency' : built.error.property,
    )
  const gasCycle = solveCycle(built.spec)
  if (!gasCycle.ok)
    return bad(
      `gas turbine: ${gasCycle.error.message}`,
      undefined,
      gasCycle.error.code === 'out-of-range' ? 'out-of-range' : 'unphysical',
    )
  const g: CycleSolution = gasCycle
  const [s1, s2, s3, s4] = g.states
  if (!s1 || !s2 || !s3 || !s4)
    return bad('gas turbine: the cycle has fewer states than expected', undefined, 'unphysical')
  const h = (x: number) => x * scale
  const wC = h(s2.h - s1.h)
  const wT = h(s3.h - s4.h)
  const qIn = h(s3.h - s2.h)
  if (!(wT > wC))
    return bad(
      'the gas turbine gives less work than its compressor takes: raise the turbine inlet temperature or the efficiencies',
      'turbineInletT',
      'unphysical',
    )

  // ---- bottoming cycle
  const rk = solveRankine(input.steam)
  if (!rk.ok)
    return bad(
      `steam cycle: ${rk.error.message}`,
      rk.error.property ? `steam.${rk.error.property}` : undefined,
      rk.error.code === 'out-of-range' ? 'out-of-range' : 'invalid-input',
    )
  const steam = rk.value
  const feed = steam.states.find((st) => st.label === '2')
  const inlet = steam.states.find((st) => st.label === '3')
  if (!feed || !inlet)
    return bad('steam cycle: the pump exit and turbine inlet were not found', undefined, 'unphysical')
  const reheatHeat = steam.heatIn - (inlet.h - feed.h)
  const T4 = s4.T
  if (!(T4 > inlet.T))
    return bad(
      `the gas-turbine exhaust (${k(T4)} K) is not hotter than the steam it should make (${k(inlet.T)} K): lower the steam temperature or raise the gas-turbine exhaust temperature`,
      'steam.turbineInletTemperature',
      'unphysical',
    )

  const h4 = h(s4.h)
  const hGas = (T: number) => h(input.gas.h(T))
  const sat = input.steam.boilerPressure < 22.064e6 ? saturationAtP(input.steam.boilerPressure) : null
  if (sat && !sat.ok) return bad(`steam cycle: ${sat.error.message}`, 'steam.boilerPressure', 'out-of-range')
  const satT = sat && sat.ok ? sat.value.T : null
  const hfB = sat && sat.ok ? sat.value.liquid.h : null

  let y: number
  let stackT: number
  if (input.stackTemperature !== undefined) {
    stackT = input.stackTemperature
    if (!(stackT < T4))
      return bad(
        `the stack temperature (${k(stackT)} K) must be below the gas-turbine exhaust (${k(T4)} K)`,
        'stackTemperature',
      )
    if (stackT < input.gas.Tmin || stackT > input.gas.Tmax)
      return bad(
        `the stack temperature ${k(stackT)} K is outside the gas data's range ${input.gas.Tmin}–${input.gas.Tmax} K`,
        'stackTemperature',
        'out-of-range',
      )
    y = (h4 - hGas(stackT)) / steam.heatIn
  } else {
    if (satT === null || hfB === null)
      return bad(
        'a pinch point needs a boiler pressure below the critical pressure (22.064 MPa), where the water boils at one temperature',
        'pinchDifference',
      )
    const Tp = satT + input.pinchDifference!
    if (!(Tp < T4))
      return bad(
        `with this pinch the gas would have to be ${k(Tp)} K where the water boils, hotter than the exhaust itself (${k(T4)} K)`,
        'pinchDifference',
        'unphysical',
      )
    y = (h4 - hGas(Tp)) / (inlet.h - hfB + reheatHeat)
    stackT = input.gas.TfromH((h4 - y * steam.heatIn) / scale)
    if (!Number.isFinite(stackT))
      return bad('the stack temperature falls outside the gas data’s range', 'pinchDifference', 'out-of-range')
  }
  if (!(y > 0))
    return bad('the exhaust has no heat to give the steam at this stack temperature', 'stackTemperature', 'unphysical')

  // ---- second law in the HRSG: the gas hotter than the water at both ends and at the pinch
  const coldEnd = stackT - feed.T
  if (!(coldEnd > 0))
    return bad(
      `the stack gas (${k(stackT)} K) would be colder than the feedwater entering the steam generator (${k(feed.T)} K): heat cannot flow that way; raise the stack temperature`,
      input.stackTemperature !== undefined ? 'stackTemperature' : 'pinchDifference',
      'unphysical',
    )
  let pinch: number | null = null
  if (satT !== null && hfB !== null) {
    const Tgp = input.gas.TfromH((h4 - y * (inlet.h - hfB + reheatHeat)) / scale)
    pinch = Tgp - satT
    if (!(pinch > 0))
      return bad(
        `at the pinch the gas (${k(Tgp)} K) would be colder than the boiling water (${k(satT)} K): no heat exchanger can do that; raise the stack temperature or lower the boiler pressure`,
        input.stackTemperature !== undefined ? 'stackTemperature' : 'pinchDifference',
        'unphysical',
      )
  }

  const gasNet = wT - wC
  const steamNet = y * steam.netWork
  const net = gasNet + steamNet
  const hrsgHeat = y * steam.heatIn
  const stackLoss = hGas(stackT) - h(s1.h)
  const condenserHeat = y * steam.heatOut
  const states: Omit<CombinedGasState, 'v'>[] = [
    { name: '1', description: 'compressor inlet', p: s1.p, T: s1.T, h: h(s1.h), s: h(s1.s) },
    { name: '2', description: 'compressor exit, combustor inlet', p: s2.p, T: s2.T, h: h(s2.h), s: h(s2.s) },
    { name: '3', description: 'gas-turbine inlet', p: s3.p, T: s3.T, h: h(s3.h), s: h(s3.s) },
    { name: '4', description: 'gas-turbine exhaust, HRSG gas inlet', p: s4.p, T: s4.T, h: h4, s: h(s4.s) },
    {
      name: '5',
      description: 'stack (HRSG gas exit)',
      p: s4.p,
      T: stackT,
      h: hGas(stackT),
      s: h(input.gas.sT(stackT) - input.gas.R * Math.log(s4.p / P_REF)),
    },
  ]
  const gasStates: CombinedGasState[] = states.map((g) => ({ ...g, v: (input.gas.R * g.T) / g.p }))
  return {
    ok: true,
    value: {
      gasStates,
      steam,
      steamPerGas: y,
      compressorWork: wC,
      gasTurbineWork: wT,
      heatIn: qIn,
      gasNetWork: gasNet,
      steamNetWork: steamNet,
      netWork: net,
      hrsgHeat,
      stackLoss,
      condenserHeat,
      efficiency: net / qIn,
      gasEfficiency: gasNet / qIn,
      steamEfficiency: steam.thermalEfficiency,
      stackTemperature: stackT,
      pinchDifference: pinch,
      hotEndDifference: T4 - inlet.T,
      coldEndDifference: coldEnd,
      power: input.gasMassFlow !== undefined ? input.gasMassFlow * net : null,
      caution: COMBINED_CAUTION,
    },
  }
}
