/**
 * Ideal gas with constant heat capacities ("cold-air-standard" style), from any consistent
 * pair of constants: cv & R, cp & R, γ & R, or cp & cv. Per mole or per kilogram.
 */
import { P_REF, T_REF } from '../constants.ts'
import type { Basis, Gas } from './gas.ts'

export interface ConstantCpParams {
  readonly id?: string
  readonly label?: string
  readonly basis: Basis
  readonly R?: number
  readonly cv?: number
  readonly cp?: number
  readonly gamma?: number
  readonly molarMass?: number
  readonly source?: string
}

export type GasResult =
  { ok: true; gas: Gas } | { ok: false; error: { code: 'invalid-gas'; message: string; property?: string } }

/** Relative tolerance when more than two constants are given (textbook tables round to 3–4 digits). */
const CONSISTENCY_TOL = 2e-3

/**
 * Build a constant-cp ideal gas from any two of R, cv, cp, γ (a third or fourth, if given,
 * must agree within 0.2 %). Never throws.
 */
export function constantCpGas(p: ConstantCpParams): GasResult {
  const bad = (message: string, property?: string): GasResult => ({
    ok: false,
    error: { code: 'invalid-gas', message, property },
  })
  for (const k of ['R', 'cv', 'cp', 'gamma', 'molarMass'] as const) {
    const x = p[k]
    if (x !== undefined && !(Number.isFinite(x) && x > 0)) return bad(`${k} must be a positive number`, k)
  }
  if (p.gamma !== undefined && !(p.gamma > 1)) return bad('γ must exceed 1', 'gamma')
  let { R, cv, cp } = p
  const g = p.gamma
  // Fill from the pairs, in a fixed order so the result does not depend on key order.
  if (R === undefined) {
    if (cp !== undefined && cv !== undefined) R = cp - cv
    else if (cv !== undefined && g !== undefined) R = cv * (g - 1)
    else if (cp !== undefined && g !== undefined) R = (cp * (g - 1)) / g
    else return bad('give two of R, cv, cp, γ (R is missing and cannot be derived)', 'R')
  }
  if (!(R > 0)) return bad('cp must exceed cv (R = cp − cv > 0)', 'cp')
  if (cv === undefined) {
    if (cp !== undefined) cv = cp - R
    else if (g !== undefined) cv = R / (g - 1)
    else return bad('give one of cv, cp or γ together with R', 'cv')
  }
  if (cp === undefined) cp = cv + R
  if (!(cv > 0)) return bad('cv must be positive (cp must exceed R)', 'cv')
  if (Math.abs(cp - cv - R) > CONSISTENCY_TOL * cp) return bad(`cp − cv (${cp - cv}) does not equal R (${R})`, 'cp')
  if (g !== undefined && Math.abs(cp / cv - g) > CONSISTENCY_TOL * g)
    return bad(`cp/cv (${(cp / cv).toFixed(4)}) does not equal γ (${g})`, 'gamma')
  if (g !== undefined && p.cp === undefined && p.cv === undefined) {
    // Only γ and R given: keep γ exact (cv = R/(γ−1)) so closed forms in γ hold to the last digit.
    cv = R / (g - 1)
    cp = cv + R
  }
  return {
    ok: true,
    gas: makeConstantCp({
      id: p.id ?? 'ideal-gas',
      label: p.label ?? 'ideal gas (constant cp)',
      basis: p.basis,
      R,
      cv,
      cp,
      molarMass: p.molarMass,
      source: p.source ?? 'constants given in the problem',
    }),
  }
}

export interface ConstantCpInternals {
  id: string
  label: string
  basis: Basis
  R: number
  cv: number
  cp: number
  molarMass: number | undefined
  source: string
  /** Isentropic exponent; cp/cv unless a slip keeps the true one while cp and cv are swapped. */
  k?: number
  ln?: (x: number) => number
}

/** Low-level constructor (no validation); used by the presets and by the slips. */
export function makeConstantCp(c: ConstantCpInternals): Gas & { readonly internals: ConstantCpInternals } {
  const { R, cv, cp } = c
  const k = c.k ?? cp / cv
  const ln = c.ln ?? Math.log
  // Reference: h(T_REF) = 0, u = h − R·T (see gas.ts).
  const h0 = -cp * T_REF
  const u0 = h0 // u(T) = cp(T − Tref) − RT = cv·T − cp·Tref (when cp − cv = R)
  const expP = (k - 1) / k
  const expV = k - 1
  return {
    internals: c,
    id: c.id,
    label: c.label,
    basis: c.basis,
    R,
    molarMass: c.molarMass,
    constantCp: true,
    Tmin: 1e-6,
    Tmax: Infinity,
    source: c.source,
    ln,
    cp: () => cp,
    cv: () => cv,
    gamma: () => k,
    h: (T) => cp * T + h0,
    // With the true constants cv·T − cp·Tref is exactly h − RT; under the cp/cv-swap slip the
    // roles trade places, which is the point of the slip.
    u: (T) => cv * T + u0,
    sT: (T) => cp * ln(T / T_REF),
    TfromH: (h) => (h - h0) / cp,
    TfromU: (u) => (u - u0) / cv,
    isentropicTfromP: (T1, p1, p2) => T1 * Math.pow(p2 / p1, expP),
    isentropicTfromV: (T1, v1, v2) => T1 * Math.pow(v1 / v2, expV),
    isentropicPressureRatio: (T1, T2) => Math.pow(T2 / T1, 1 / expP),
  }
}

export { P_REF }
