/**
 * The gas of a steady-flow device per kilogram, whatever basis it was given on: velocities
 * enter the energy balance as V²/2 in J/kg, so h, cp and R must be per kilogram. A per-mole
 * gas is converted with its molar mass (a gas without one is refused by the caller).
 *
 * Also the compressible-flow helpers every device uses: the speed of sound a = √(γ(T)·R·T)
 * (with the local γ of a gas whose cp varies), stagnation states and the critical (sonic)
 * state reached isentropically from a stagnation state. Pure numbers, no strings. Never throws:
 * NaN marks a state outside the gas's data range and the callers turn it into a message.
 */
import { brent } from '../numeric.ts'
import type { Gas } from '../substances/gas.ts'

export interface FlowGas {
  readonly label: string
  /** J/(kg·K) */
  readonly R: number
  readonly constantCp: boolean
  readonly Tmin: number
  readonly Tmax: number
  cp(T: number): number
  gamma(T: number): number
  /** J/kg */
  h(T: number): number
  /** J/(kg·K), temperature part: s(T, p) = sT(T) − R ln(p/p_ref) */
  sT(T: number): number
  TfromH(h: number): number
  isentropicTfromP(T1: number, p1: number, p2: number): number
  /** p2/p1 of an isentropic from T1 to T2 */
  isentropicPressureRatio(T1: number, T2: number): number
}

export function perKilogram(gas: Gas): FlowGas | { error: string } {
  let f = 1
  if (gas.basis === 'mole') {
    if (!(gas.molarMass !== undefined && gas.molarMass > 0))
      return {
        error: `the gas "${gas.label}" is per mole without a molar mass; a flow with velocities needs it per kilogram: give gas.molarMass`,
      }
    f = 1 / gas.molarMass
  }
  return {
    label: gas.label,
    R: gas.R * f,
    constantCp: gas.constantCp,
    Tmin: gas.Tmin,
    Tmax: gas.Tmax,
    cp: (T) => gas.cp(T) * f,
    gamma: (T) => gas.gamma(T),
    h: (T) => gas.h(T) * f,
    sT: (T) => gas.sT(T) * f,
    TfromH: (h) => gas.TfromH(h / f),
    isentropicTfromP: (T1, p1, p2) => gas.isentropicTfromP(T1, p1, p2),
    isentropicPressureRatio: (T1, T2) => gas.isentropicPressureRatio(T1, T2),
  }
}

/** Speed of sound of an ideal gas, m/s: a = √(γ(T)·R·T). */
export function soundSpeed(g: FlowGas, T: number): number {
  return Math.sqrt(g.gamma(T) * g.R * T)
}

export interface Stagnation {
  readonly T0: number
  readonly p0: number
  readonly h0: number
}

/** The state reached by bringing the flow (T, p, V) to rest isentropically. */
export function stagnation(g: FlowGas, T: number, p: number, V: number): Stagnation {
  const h0 = g.h(T) + (V * V) / 2
  const T0 = V === 0 ? T : g.TfromH(h0)
  return { T0, p0: p * g.isentropicPressureRatio(T, T0), h0 }
}

/**
 * The sonic state reached by an isentropic expansion from the stagnation state (T0, p0):
 * h0 − h(T*) = a(T*)²/2. For constant cp this is T* = 2·T0/(k+1) and p* = p0·(2/(k+1))^(k/(k−1)).
 */
export function criticalState(g: FlowGas, T0: number, p0: number): { T: number; p: number } {
  const h0 = g.h(T0)
  const f = (T: number) => h0 - g.h(T) - (g.gamma(T) * g.R * T) / 2
  const lo = Math.max(g.Tmin, 0.3 * T0)
  const T = brent(f, lo, T0, 1e-9)
  return { T, p: Number.isFinite(T) ? p0 * g.isentropicPressureRatio(T0, T) : NaN }
}
