/**
 * Adiabatic (or slightly heat-losing) steady flow of an ideal gas through a nozzle or a
 * diffuser, with the kinetic energy kept in the energy balance:
 *   h1 + V1²/2 = h2 + V2²/2 + q_loss        (no shaft work, no change in elevation)
 * State 1 is the inlet (p1, T1, V1), state 2 the exit. The exit is fixed by one of p2, T2, V2
 * together with the isentropic efficiency (default 1), or by p2 and one of T2, V2 (the
 * efficiency then follows). Efficiencies, static-to-static with the isentropic state 2s at the
 * actual exit pressure p2 (s2s = s1):
 *   nozzle   η_N = (h1 − h2)/(h1 − h2s)
 *   diffuser η_D = (h2s − h1)/(h2 − h1)
 * With the exit velocity negligible the diffuser's exit is its stagnation state and η_D is the
 * usual ram (intake) efficiency (h02s − h1)/(h01 − h1). Documented in docs/steady-flow.md.
 *
 * A converging nozzle cannot make the flow supersonic: with a back pressure below the
 * critical pressure p* the exit is choked at M2 = 1 and p2 = p* (reported, with the back
 * pressure), and an exit temperature or velocity that would need M2 > 1 is refused.
 * "converging-diverging" lets the exit be supersonic (the design, shock-free expansion).
 *
 * Pure numbers in SI; never throws. Teaching tool: not design data for nozzles or diffusers.
 */
import { P_REF } from '../constants.ts'
import { brent } from '../numeric.ts'
import { criticalState, soundSpeed, stagnation } from './flow-gas.ts'
import type { FlowGas } from './flow-gas.ts'

export type DuctDevice = 'nozzle' | 'diffuser'
export type NozzleShape = 'converging' | 'converging-diverging'

export interface DuctInput {
  readonly device: DuctDevice
  readonly gas: FlowGas
  readonly p1: number
  readonly T1: number
  readonly V1: number
  readonly p2?: number
  readonly T2?: number
  readonly V2?: number
  readonly efficiency?: number
  /** heat lost to the surroundings, J/kg (≥ 0) */
  readonly heatLoss?: number
  /** heat lost to the surroundings, W (needs the flow rate) */
  readonly heatLossRate?: number
  readonly massFlow?: number
  readonly inletArea?: number
  /** nozzles only; default 'converging' */
  readonly shape?: NozzleShape
}

export interface DuctState {
  readonly p: number
  readonly T: number
  readonly V: number
  /** J/kg (the gas's own reference) */
  readonly h: number
  /** J/(kg·K) */
  readonly s: number
  /** kg/m³ */
  readonly rho: number
  /** speed of sound, m/s */
  readonly a: number
  readonly mach: number
  /** stagnation temperature and pressure */
  readonly T0: number
  readonly p0: number
}

export interface DuctResult {
  readonly device: DuctDevice
  readonly shape: NozzleShape | null
  readonly inlet: DuctState
  readonly exit: DuctState
  /** the isentropic exit at the actual exit pressure */
  readonly exitIsentropic: { readonly T: number; readonly h: number }
  readonly efficiency: number
  /** J/kg into the gas (−heat loss) */
  readonly heat: number
  readonly enthalpyChange: number
  readonly kineticEnergyChange: number
  readonly entropyChange: number
  /** p02/p01 */
  readonly stagnationPressureRatio: number
  /** the sonic state reached isentropically from the inlet stagnation state */
  readonly critical: { readonly T: number; readonly p: number; readonly pressureRatio: number }
  readonly choked: boolean
  /** the back pressure asked for when the exit is choked (else null) */
  readonly backPressure: number | null
  readonly massFlow: number | null
  readonly inletArea: number | null
  readonly exitArea: number | null
  /** A2/A1 = ρ1V1/(ρ2V2), when both velocities are nonzero */
  readonly areaRatio: number | null
  /** W */
  readonly kineticEnergyRate: number | null
  readonly heatRate: number | null
  readonly notes: readonly string[]
}

export interface FlowError {
  readonly code: string
  readonly message: string
  readonly property?: string
}
export type FlowOutcome<T> = { ok: true; value: T } | { ok: false; error: FlowError }

const fail = (code: string, message: string, property?: string): { ok: false; error: FlowError } => ({
  ok: false,
  error: { code, message, ...(property ? { property } : {}) },
})

const kPa = (p: number) => `${+(p / 1000).toPrecision(4)} kPa`
const K = (T: number) => `${+T.toPrecision(5)} K`
const ms = (V: number) => `${+V.toPrecision(4)} m/s`
const n4 = (x: number) => String(+x.toPrecision(4))

export function ductState(g: FlowGas, p: number, T: number, V: number): DuctState {
  const a = soundSpeed(g, T)
  const st = stagnation(g, T, p, V)
  return {
    p,
    T,
    V,
    h: g.h(T),
    s: g.sT(T) - g.R * Math.log(p / P_REF),
    rho: p / (g.R * T),
    a,
    mach: V / a,
    T0: st.T0,
    p0: st.p0,
  }
}

const pos = (x: number | undefined) => x === undefined || (Number.isFinite(x) && x > 0)

export function solveDuct(input: DuctInput): FlowOutcome<DuctResult> {
  const { device, gas: g, p1, T1, V1 } = input
  const nozzle = device === 'nozzle'
  const name = nozzle ? 'nozzle' : 'diffuser'
  if (!(p1 > 0)) return fail('invalid-input', 'the inlet pressure p1 must be positive', 'p1')
  if (!(T1 > 0)) return fail('invalid-input', 'the inlet temperature T1 must be positive', 'T1')
  if (!(V1 >= 0) || !Number.isFinite(V1)) return fail('invalid-input', 'the inlet velocity V1 must be ≥ 0', 'V1')
  if (!nozzle && !(V1 > 0))
    return fail('invalid-input', 'a diffuser slows a moving flow down: give an inlet velocity V1 > 0', 'V1')
  for (const k of ['p2', 'T2', 'massFlow', 'inletArea'] as const)
    if (!pos(input[k])) return fail('invalid-input', `${k} must be a positive number`, k)
  if (input.V2 !== undefined && !(input.V2 >= 0 && Number.isFinite(input.V2)))
    return fail('invalid-input', 'the exit velocity V2 must be ≥ 0', 'V2')
  if (T1 < g.Tmin || T1 > g.Tmax)
    return fail('out-of-range', `T1 = ${K(T1)} is outside the gas data's range ${g.Tmin}–${g.Tmax} K`, 'T1')
  const effGiven = input.efficiency !== undefined
  const eta0 = input.efficiency ?? 1
  if (!(eta0 > 0 && eta0 <= 1))
    return fail('invalid-input', `the ${name} efficiency must be in (0, 1], not ${eta0}`, 'efficiency')
  if (input.T2 !== undefined && input.V2 !== undefined)
    return fail(
      'overdetermined',
      'give the exit temperature or the exit velocity, not both: the energy balance fixes the other',
      'T2',
    )
  const exitByState = input.T2 !== undefined || input.V2 !== undefined
  if (input.p2 === undefined && !exitByState)
    return fail(
      'underdetermined',
      `the ${name} exit is not fixed: give the exit pressure p2, temperature T2 or velocity V2`,
      'p2',
    )
  if (effGiven && input.p2 !== undefined && exitByState)
    return fail(
      'overdetermined',
      `the exit pressure and the exit ${input.T2 !== undefined ? 'temperature' : 'velocity'} already fix the ${name}'s efficiency: leave out one of them or the efficiency`,
      'efficiency',
    )
  if (input.massFlow !== undefined && input.inletArea !== undefined)
    return fail('overdetermined', 'give the mass flow rate or the inlet area, not both', 'inletArea')
  const shape: NozzleShape | null = nozzle ? (input.shape ?? 'converging') : null

  const inlet = ductState(g, p1, T1, V1)
  if (!Number.isFinite(inlet.T0) || !Number.isFinite(inlet.p0))
    return fail(
      'out-of-range',
      `the inlet stagnation state is outside the gas data's range (${g.Tmin}–${g.Tmax} K)`,
      'V1',
    )
  if (inlet.mach >= 1)
    return fail(
      'unsupported',
      `the inlet is supersonic (M1 = ${n4(inlet.mach)}): this model is for subsonic inlets (shocks are not modelled)`,
      'V1',
    )

  // the flow rate
  let massFlow: number | null = input.massFlow ?? null
  if (input.inletArea !== undefined) {
    if (!(V1 > 0))
      return fail(
        'underdetermined',
        'with the inlet at rest the inlet area does not fix the flow rate: give massFlow',
        'inletArea',
      )
    massFlow = inlet.rho * input.inletArea * V1
  }
  if (input.heatLoss !== undefined && input.heatLossRate !== undefined)
    return fail('overdetermined', 'give the heat loss per kilogram or as a rate, not both', 'heatLoss')
  let q = input.heatLoss ?? 0
  if (input.heatLossRate !== undefined) {
    if (massFlow === null)
      return fail('underdetermined', 'a heat loss rate needs the mass flow rate (massFlow or inletArea)', 'heatLoss')
    q = input.heatLossRate / massFlow
  }
  if (!(q >= 0) || !Number.isFinite(q))
    return fail('invalid-input', 'the heat loss must be ≥ 0 (heat leaving the gas)', 'heatLoss')
  const h1 = inlet.h
  const h02 = inlet.h + (V1 * V1) / 2 - q // total enthalpy at the exit

  const crit = criticalState(g, inlet.T0, inlet.p0)
  const critical = { T: crit.T, p: crit.p, pressureRatio: crit.p / inlet.p0 }
  const critText = Number.isFinite(critical.pressureRatio)
    ? `p*/p01 = ${critical.pressureRatio.toFixed(4)}, p* = ${kPa(critical.p)}`
    : 'p*/p01 unknown'

  // exit enthalpy from the exit pressure and an efficiency
  const hFromP = (p2: number, eta: number): { h2: number; h2s: number; T2s: number } => {
    const T2s = g.isentropicTfromP(T1, p1, p2)
    const h2s = g.h(T2s)
    return { T2s, h2s, h2: nozzle ? h1 - eta * (h1 - h2s) : h1 + (h2s - h1) / eta }
  }

  let p2: number
  let h2: number
  let h2s: number
  let T2s: number
  let eta = eta0
  let choked = false
  let backPressure: number | null = null
  const notes: string[] = []

  if (input.p2 !== undefined) {
    p2 = input.p2
    if (nozzle) {
      if (p2 >= inlet.p0)
        return fail(
          'impossible',
          `the exit pressure ${kPa(p2)} is at or above the inlet stagnation pressure p01 = ${kPa(inlet.p0)}: no adiabatic nozzle flow reaches it`,
          'p2',
        )
      if (p2 >= p1)
        return fail(
          'impossible',
          `the exit pressure ${kPa(p2)} is not below the inlet pressure ${kPa(p1)}: the flow would slow down, which is a diffuser (use the "diffuser" template)`,
          'p2',
        )
    } else if (p2 <= p1)
      return fail(
        'impossible',
        `a diffuser raises the pressure: the exit pressure ${kPa(p2)} must exceed the inlet pressure ${kPa(p1)} (a falling pressure is a nozzle)`,
        'p2',
      )
    if (!exitByState) {
      ;({ h2, h2s, T2s } = hFromP(p2, eta))
    } else {
      const r = hFromP(p2, 1)
      h2s = r.h2s
      T2s = r.T2s
      h2 = input.T2 !== undefined ? g.h(input.T2) : h02 - (input.V2! * input.V2!) / 2
      eta = nozzle ? (h1 - h2) / (h1 - h2s) : (h2s - h1) / (h2 - h1)
      if (!(eta > 0 && eta <= 1 + 1e-9))
        return fail(
          'impossible',
          `this exit state would need a ${name} efficiency of ${n4(eta)}: an adiabatic ${name} has 0 < η ≤ 1 (the entropy cannot fall)`,
          input.T2 !== undefined ? 'T2' : 'V2',
        )
    }
  } else {
    h2 = input.T2 !== undefined ? g.h(input.T2) : h02 - (input.V2! * input.V2!) / 2
    h2s = nozzle ? h1 - (h1 - h2) / eta : h1 + eta * (h2 - h1)
    T2s = g.TfromH(h2s)
    p2 = p1 * g.isentropicPressureRatio(T1, T2s)
  }

  const ke2 = () => h02 - h2
  if (!Number.isFinite(h2) || !Number.isFinite(T2s) || !Number.isFinite(p2))
    return fail('out-of-range', `the exit state is outside the gas data's range (${g.Tmin}–${g.Tmax} K)`, 'p2')
  if (ke2() < -1e-9 * Math.abs(h02)) {
    if (input.T2 !== undefined)
      return fail(
        'impossible',
        `the exit temperature ${K(input.T2)} is above the exit stagnation temperature ${K(g.TfromH(h02))}: the energy balance leaves no kinetic energy`,
        'T2',
      )
    const Tmax2s = g.TfromH(h1 + eta * (h02 - h1))
    const pmax = p1 * g.isentropicPressureRatio(T1, Tmax2s)
    return fail(
      'impossible',
      `the ${name} cannot reach ${kPa(p2)}: with η = ${n4(eta)} the highest exit pressure (flow brought to rest) is ${kPa(pmax)}`,
      'p2',
    )
  }
  let V2 = Math.sqrt(Math.max(0, 2 * ke2()))
  if (nozzle && !(V2 > V1))
    return fail(
      'impossible',
      `a nozzle accelerates the flow: this exit (V2 = ${ms(V2)}) is not faster than the inlet (V1 = ${ms(V1)})`,
      input.V2 !== undefined ? 'V2' : input.T2 !== undefined ? 'T2' : 'p2',
    )
  if (!nozzle && !(V2 < V1))
    return fail(
      'impossible',
      `a diffuser slows the flow: the exit velocity ${ms(V2)} must be lower than the inlet velocity ${ms(V1)}`,
      input.V2 !== undefined ? 'V2' : 'T2',
    )
  let T2 = input.T2 ?? g.TfromH(h2)
  if (!Number.isFinite(T2))
    return fail('out-of-range', `the exit temperature is outside the gas data's range (${g.Tmin}–${g.Tmax} K)`, 'T2')

  if (shape === 'converging' && V2 / soundSpeed(g, T2) > 1 + 1e-9) {
    const M2 = V2 / soundSpeed(g, T2)
    if (input.p2 === undefined || exitByState)
      return fail(
        'choked',
        `a converging nozzle cannot make the exit supersonic (this exit would be at M2 = ${n4(M2)}): it chokes at M2 = 1, at the critical pressure (${critText}; 0.5283 for k = 1.4 without losses). Give an exit pressure at or above p*, or "shape": "converging-diverging" for a supersonic exit`,
        input.V2 !== undefined ? 'V2' : input.T2 !== undefined ? 'T2' : 'p2',
      )
    // back pressure below the critical pressure: the exit is sonic at the pressure where M2 = 1
    const mach = (p: number) => {
      const h = hFromP(p, eta).h2
      const T = g.TfromH(h)
      return Math.sqrt(Math.max(0, 2 * (h02 - h))) / soundSpeed(g, T) - 1
    }
    const pStar = brent(mach, p2, p1 * (1 - 1e-12), 1e-9 * p1)
    if (!Number.isFinite(pStar))
      return fail('choked', `the converging nozzle is choked but its sonic exit could not be found (${critText})`, 'p2')
    backPressure = p2
    choked = true
    p2 = pStar
    ;({ h2, h2s, T2s } = hFromP(p2, eta))
    V2 = Math.sqrt(2 * ke2())
    T2 = g.TfromH(h2)
    notes.push(
      `The back pressure ${kPa(backPressure)} is below the exit pressure at which the converging nozzle chokes (${kPa(pStar)}; ${critText} for the isentropic flow): the exit is sonic (M2 = 1) at ${kPa(pStar)} and the gas expands further outside the nozzle. A converging-diverging nozzle would be needed for a supersonic exit.`,
    )
  }

  const exit = ductState(g, p2, T2, V2)
  if (shape === 'converging-diverging' && exit.mach < 1)
    notes.push(
      `The exit is subsonic (M2 = ${n4(exit.mach)}); a converging nozzle would do. A converging-diverging nozzle with this back pressure would not run shock-free at its design point.`,
    )
  if (shape === 'converging-diverging' && exit.mach > 1)
    notes.push(
      'Supersonic exit: the design (shock-free) expansion of a converging-diverging nozzle; the throat is sonic at p*.',
    )

  const areaRatio = V1 > 0 && V2 > 0 ? (inlet.rho * V1) / (exit.rho * V2) : null
  const dKE = (V2 * V2 - V1 * V1) / 2
  return {
    ok: true,
    value: {
      device,
      shape,
      inlet,
      exit,
      exitIsentropic: { T: T2s, h: h2s },
      efficiency: eta,
      heat: -q,
      enthalpyChange: exit.h - h1,
      kineticEnergyChange: dKE,
      entropyChange: exit.s - inlet.s,
      stagnationPressureRatio: exit.p0 / inlet.p0,
      critical,
      choked,
      backPressure,
      massFlow,
      inletArea: massFlow !== null && V1 > 0 ? massFlow / (inlet.rho * V1) : null,
      exitArea: massFlow !== null && V2 > 0 ? massFlow / (exit.rho * V2) : null,
      areaRatio,
      kineticEnergyRate: massFlow !== null ? massFlow * dKE : null,
      heatRate: massFlow !== null ? -massFlow * q : null,
      notes,
    },
  }
}
