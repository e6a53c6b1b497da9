/**
 * The contract between refrigerant properties (Helmholtz-energy equations of state, this
 * folder) and the vapour-compression cycle solver built on them. SI units at this API:
 * T in K, p in Pa, rho in kg/m^3, v in m^3/kg, h and u in J/kg, s, cp, cv in J/(kg K),
 * w (speed of sound) in m/s, x (quality, vapour mass fraction) dimensionless.
 *
 * Every function returns FluidResult (never throws on bad or out-of-range input).
 *
 * Teaching tool: these numbers are for teaching, not design data; defer to the applicable
 * codes, standards and licensed engineering practice for any real refrigeration plant.
 */

export type RefrigerantId = 'R134a' | 'R1234yf' | 'R717' | 'R744'

export type FluidPhase = 'liquid' | 'vapour' | 'supercritical' | 'two-phase'

export interface FluidState {
  readonly T: number
  readonly p: number
  readonly rho: number
  readonly v: number
  readonly h: number
  readonly u: number
  readonly s: number
  /** quality: 0 saturated liquid … 1 saturated vapour; null outside the dome */
  readonly x: number | null
  readonly phase: FluidPhase
  /** null inside the dome (0 < x < 1) */
  readonly cp: number | null
  readonly cv: number | null
  readonly w: number | null
}

export interface SaturationPair {
  readonly T: number
  readonly p: number
  readonly liquid: FluidState
  readonly vapour: FluidState
}

export type FluidErrorCode = 'out-of-range' | 'no-convergence' | 'invalid-input'

export type FluidResult<T> =
  | { readonly ok: true; readonly value: T }
  | { readonly ok: false; readonly error: { readonly code: FluidErrorCode; readonly message: string } }

export interface Refrigerant {
  readonly id: RefrigerantId
  /** plain name for people, e.g. 'R-134a (1,1,1,2-tetrafluoroethane)' */
  readonly name: string
  /** molar mass, kg/mol */
  readonly molarMass: number
  readonly Tc: number
  readonly pc: number
  readonly rhoc: number
  readonly Ttriple: number
  /** validity limits of the equation of state as published */
  readonly Tmin: number
  readonly Tmax: number
  readonly pmax: number
  /** the paper the equation of state comes from (authors, journal, year) */
  readonly source: string
  /** the zero of h and s, in words, e.g. 'IIR: h = 200 kJ/kg, s = 1 kJ/(kg K) for saturated liquid at 0 °C' */
  readonly referenceState: string

  stateTP(T: number, p: number): FluidResult<FluidState>
  statePH(p: number, h: number): FluidResult<FluidState>
  statePS(p: number, s: number): FluidResult<FluidState>
  stateTx(T: number, x: number): FluidResult<FluidState>
  statePx(p: number, x: number): FluidResult<FluidState>
  saturationT(T: number): FluidResult<SaturationPair>
  saturationP(p: number): FluidResult<SaturationPair>
}
