/**
 * The turbojet of the textbooks (the ideal jet-propulsion cycle of Çengel & Boles,
 * "Thermodynamics: An Engineering Approach", ch. 9, with optional component efficiencies).
 * States, per kilogram of air:
 *   1 ambient air entering the diffuser at the flight speed V1
 *   2 diffuser exit (compressor inlet), velocity negligible
 *   3 compressor exit, p3 = rp·p2
 *   4 burner exit (turbine inlet), T4 given, p4 = p3 (or p3 times a burner pressure ratio)
 *   5 turbine exit: the turbine only drives the compressor, h4 − h5 = h3 − h2; velocity negligible
 *   6 nozzle exit, expanded to the ambient pressure (a fully expanded nozzle), velocity V6
 * Efficiencies (default 1): diffuser η_D = (h2s − h1)/(h2 − h1) with 2s at p2 (the ram
 * efficiency, the exit being at rest), compressor, turbine and nozzle isentropic efficiencies.
 * Heat input q_in = h4 − h3 (air standard: the fuel's mass is not added to the flow). With a
 * fuel heating value the fuel flow is q_in/(η_b·HV).
 *
 * Thrust F = ṁ(V6 − V1) (no pressure thrust, the nozzle being fully expanded); propulsive power
 * Ẇ_P = F·V1; propulsive (Froude) efficiency η_P = Ẇ_P / (ṁ(V6² − V1²)/2) = 2V1/(V1 + V6);
 * thermal efficiency η_th = (V6² − V1²)/2 / q_in; overall efficiency η_o = Ẇ_P/Q̇_in = η_P·η_th
 * (the ratio Çengel & Boles call the propulsive efficiency).
 *
 * Pure numbers in SI; never throws. Teaching tool: not design data for engines.
 */
import { ductState } from './nozzle-diffuser.ts'
import type { DuctState, FlowError, FlowOutcome } from './nozzle-diffuser.ts'
import type { FlowGas } from './flow-gas.ts'

export interface TurbojetInput {
  readonly gas: FlowGas
  readonly flightSpeed: number
  readonly ambientPressure: number
  readonly ambientTemperature: number
  readonly pressureRatio: number
  readonly turbineInletT: number
  readonly massFlow?: number
  readonly diffuserEfficiency?: number
  readonly compressorEfficiency?: number
  readonly turbineEfficiency?: number
  readonly nozzleEfficiency?: number
  /** p4/p3, default 1 */
  readonly burnerPressureRatio?: number
  /** J/kg of fuel */
  readonly fuelHeatingValue?: number
  readonly burnerEfficiency?: number
}

export interface TurbojetState extends DuctState {
  readonly name: string
  readonly description: string
}

export interface TurbojetResult {
  readonly states: readonly TurbojetState[]
  /** per kg of air, J/kg */
  readonly compressorWork: number
  readonly turbineWork: number
  readonly heatIn: number
  readonly exitVelocity: number
  /** N·s/kg (= m/s) */
  readonly specificThrust: number
  readonly propulsiveEfficiency: number
  readonly thermalEfficiency: number
  readonly overallEfficiency: number
  /** J/kg: (V6² − V1²)/2 */
  readonly kineticEnergyGain: number
  /** J/kg of air: F·V1/ṁ */
  readonly propulsiveWork: number
  readonly massFlow: number | null
  readonly thrust: number | null
  readonly propulsivePower: number | null
  readonly heatRate: number | null
  readonly compressorPower: number | null
  /** fuel per kg of air and fuel flow, when a heating value is given */
  readonly fuelAirRatio: number | null
  readonly fuelFlow: number | null
  /** kg of fuel per N·s of thrust */
  readonly tsfc: number | null
  readonly efficiencies: {
    readonly diffuser: number
    readonly compressor: number
    readonly turbine: number
    readonly nozzle: number
    readonly burnerPressureRatio: number
  }
  readonly notes: readonly string[]
}

const fail = (code: string, message: string, property?: string): { ok: false; error: FlowError } => ({
  ok: false,
  error: { code, message, ...(property ? { property } : {}) },
})
const K = (T: number) => `${+T.toPrecision(5)} K`
const kPa = (p: number) => `${+(p / 1000).toPrecision(4)} kPa`

export function solveTurbojet(input: TurbojetInput): FlowOutcome<TurbojetResult> {
  const g = input.gas
  const V1 = input.flightSpeed
  const p1 = input.ambientPressure
  const T1 = input.ambientTemperature
  const rp = input.pressureRatio
  const T4 = input.turbineInletT
  if (!(V1 >= 0) || !Number.isFinite(V1)) return fail('invalid-input', 'the flight speed must be ≥ 0', 'flightSpeed')
  if (!(p1 > 0)) return fail('invalid-input', 'the ambient pressure must be positive', 'ambientPressure')
  if (!(T1 > 0)) return fail('invalid-input', 'the ambient temperature must be positive', 'ambientTemperature')
  if (!(rp > 1)) return fail('invalid-input', 'the compressor pressure ratio must exceed 1', 'pressureRatio')
  if (input.massFlow !== undefined && !(input.massFlow > 0))
    return fail('invalid-input', 'the mass flow rate must be positive', 'massFlow')
  const eff = {
    diffuser: input.diffuserEfficiency ?? 1,
    compressor: input.compressorEfficiency ?? 1,
    turbine: input.turbineEfficiency ?? 1,
    nozzle: input.nozzleEfficiency ?? 1,
    burnerPressureRatio: input.burnerPressureRatio ?? 1,
  }
  for (const [k, v] of Object.entries(eff)) {
    if (!(v > 0 && v <= 1)) {
      const prop = k === 'burnerPressureRatio' ? k : `${k}Efficiency`
      return fail('invalid-input', `${prop} must be in (0, 1], not ${v}`, prop)
    }
  }
  const etaB = input.burnerEfficiency ?? 1
  if (!(etaB > 0 && etaB <= 1)) return fail('invalid-input', 'burnerEfficiency must be in (0, 1]', 'burnerEfficiency')
  if (input.fuelHeatingValue !== undefined && !(input.fuelHeatingValue > 0))
    return fail('invalid-input', 'the fuel heating value must be positive', 'fuelHeatingValue')
  for (const [T, prop] of [
    [T1, 'ambientTemperature'],
    [T4, 'turbineInletT'],
  ] as const)
    if (T < g.Tmin || T > g.Tmax)
      return fail('out-of-range', `${prop} = ${K(T)} is outside the gas data's range ${g.Tmin}–${g.Tmax} K`, prop)

  const notes: string[] = []
  const range = `outside the gas data's range (${g.Tmin}–${g.Tmax} K)`
  // 1 → 2 diffuser, brought to rest
  const h1 = g.h(T1)
  const h2 = h1 + (V1 * V1) / 2
  const T2 = g.TfromH(h2)
  const T2s = g.TfromH(h1 + eff.diffuser * (h2 - h1))
  const p2 = p1 * g.isentropicPressureRatio(T1, T2s)
  // 2 → 3 compressor
  const p3 = rp * p2
  const T3s = g.isentropicTfromP(T2, p2, p3)
  const h3 = h2 + (g.h(T3s) - h2) / eff.compressor
  const T3 = g.TfromH(h3)
  if (![T2, T2s, p2, T3s, T3].every(Number.isFinite))
    return fail('out-of-range', `the diffuser or compressor exit is ${range}`, 'pressureRatio')
  const h4 = g.h(T4)
  if (!(T4 > T3))
    return fail(
      'impossible',
      `the turbine inlet temperature ${K(T4)} must exceed the compressor exit temperature ${K(T3)}: the burner adds heat`,
      'turbineInletT',
    )
  const p4 = p3 * eff.burnerPressureRatio
  // 4 → 5 turbine drives the compressor
  const wC = h3 - h2
  const h5 = h4 - wC
  const T5 = g.TfromH(h5)
  const T5s = g.TfromH(h4 - wC / eff.turbine)
  if (!Number.isFinite(T5) || !Number.isFinite(T5s))
    return fail(
      'impossible',
      `the turbine cannot deliver the compressor's work (${+(wC / 1000).toPrecision(4)} kJ/kg) from ${K(T4)}: its exit would be ${range}`,
      'turbineInletT',
    )
  const p5 = p4 * g.isentropicPressureRatio(T4, T5s)
  if (!(p5 > p1))
    return fail(
      'impossible',
      `the turbine exit pressure ${kPa(p5)} is not above the ambient pressure ${kPa(p1)}: nothing is left for the nozzle (raise the turbine inlet temperature or the efficiencies)`,
      'turbineInletT',
    )
  // 5 → 6 nozzle, fully expanded to ambient
  const p6 = p1
  const T6s = g.isentropicTfromP(T5, p5, p6)
  const h6 = h5 - eff.nozzle * (h5 - g.h(T6s))
  const T6 = g.TfromH(h6)
  if (!Number.isFinite(T6s) || !Number.isFinite(T6))
    return fail('out-of-range', `the nozzle exit is ${range}`, 'turbineInletT')
  const V6 = Math.sqrt(2 * (h5 - h6))

  const st = (name: string, description: string, p: number, T: number, V: number): TurbojetState => ({
    name,
    description,
    ...ductState(g, p, T, V),
  })
  const states = [
    st('1', 'ambient air entering the diffuser at the flight speed', p1, T1, V1),
    st('2', 'diffuser exit, compressor inlet (velocity negligible)', p2, T2, 0),
    st('3', 'compressor exit, burner inlet', p3, T3, 0),
    st('4', 'burner exit, turbine inlet', p4, T4, 0),
    st('5', 'turbine exit, nozzle inlet', p5, T5, 0),
    st('6', 'nozzle exit, expanded to the ambient pressure', p6, T6, V6),
  ]
  if (states[5]!.mach > 1)
    notes.push(
      `The jet leaves at M6 = ${states[5]!.mach.toFixed(3)}: full expansion to the ambient pressure needs a converging-diverging nozzle.`,
    )
  if (states[0]!.mach >= 1)
    notes.push(
      `Supersonic flight (M1 = ${states[0]!.mach.toFixed(3)}): the diffuser is modelled without shocks, with the efficiency given.`,
    )

  const qIn = h4 - h3
  const wT = h4 - h5
  const dKE = (V6 * V6 - V1 * V1) / 2
  const specificThrust = V6 - V1
  const wP = specificThrust * V1
  const m = input.massFlow ?? null
  const fuelAirRatio = input.fuelHeatingValue !== undefined ? qIn / (etaB * input.fuelHeatingValue) : null
  if (!(V1 > 0))
    notes.push('At rest (V1 = 0) the propulsive power and the propulsive and overall efficiencies are zero.')
  return {
    ok: true,
    value: {
      states,
      compressorWork: wC,
      turbineWork: wT,
      heatIn: qIn,
      exitVelocity: V6,
      specificThrust,
      propulsiveEfficiency: dKE > 0 ? wP / dKE : 0,
      thermalEfficiency: dKE / qIn,
      overallEfficiency: wP / qIn,
      kineticEnergyGain: dKE,
      propulsiveWork: wP,
      massFlow: m,
      thrust: m !== null ? m * specificThrust : null,
      propulsivePower: m !== null ? m * wP : null,
      heatRate: m !== null ? m * qIn : null,
      compressorPower: m !== null ? m * wC : null,
      fuelAirRatio,
      fuelFlow: m !== null && fuelAirRatio !== null ? m * fuelAirRatio : null,
      tsfc: fuelAirRatio !== null && specificThrust > 0 ? fuelAirRatio / specificThrust : null,
      efficiencies: eff,
      notes,
    },
  }
}
