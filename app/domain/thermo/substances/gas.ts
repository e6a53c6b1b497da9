/**
 * What the solver needs to know about a working substance, as plain numbers.
 *
 * Amounts are counted on one basis: per mole or per kilogram (`basis`). Every specific value
 * (u, h, s, v, R, cp, cv) is per unit of that basis.
 *
 * Reference state (documented in docs/spec-format.md):
 * - constant-heat-capacity gases: h = 0 and s = 0 at T_REF = 298.15 K and P_REF = 1 bar;
 *   u = h − R·T, so that H = U + pV holds exactly.
 * - NASA polynomial gases: h includes the enthalpy of formation (JANAF convention, elements in
 *   their reference states at 298.15 K have h = 0) and s is the third-law entropy at 1 bar.
 * Differences, which is what a cycle uses, do not depend on that choice.
 */
import type { ConstantCpInternals } from './constant-cp.ts'

export type Basis = 'mole' | 'mass'

export interface Gas {
  readonly id: string
  readonly label: string
  readonly basis: Basis
  /** Gas constant on the basis: J/(mol·K) or J/(kg·K). */
  readonly R: number
  /** kg/mol when known (needed to switch basis). */
  readonly molarMass: number | undefined
  /** True when cp and cv do not depend on T. */
  readonly constantCp: boolean
  cp(T: number): number
  cv(T: number): number
  /** cp/cv at T (for constant-cp gases the isentropic exponent). */
  gamma(T: number): number
  h(T: number): number
  u(T: number): number
  /** Temperature part of the entropy: s(T, p) = sT(T) − R·ln(p/P_REF). */
  sT(T: number): number
  /** Inverse functions; NaN if out of the valid range. */
  TfromH(h: number): number
  TfromU(u: number): number
  /** End temperature of a reversible adiabatic from (T1, p1) to pressure p2. */
  isentropicTfromP(T1: number, p1: number, p2: number): number
  /** End temperature of a reversible adiabatic from (T1, v1) to specific volume v2. */
  isentropicTfromV(T1: number, v1: number, v2: number): number
  /** Pressure ratio p2/p1 of a reversible adiabatic from T1 to T2. */
  isentropicPressureRatio(T1: number, T2: number): number
  /** Natural log, or log10 under the log10-for-ln slip (see app/domain/grading/pitfalls.ts). */
  readonly ln: (x: number) => number
  /** Valid temperature range of the data. */
  readonly Tmin: number
  readonly Tmax: number
  /** Where the numbers come from, for the output. */
  readonly source: string
  /**
   * Constant-cp gases (makeConstantCp): the constants they were made from, so a slip can rebuild
   * one with a changed constant. A gas spread from one ({ ...gas, … }) carries them along too.
   */
  readonly internals?: ConstantCpInternals
}
