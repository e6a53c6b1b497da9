/**
 * Deliberately wrong variants of a gas, used to re-evaluate a variant under a student's slip
 * (app/domain/grading/pitfalls.ts). Each returns a Gas that the unchanged solver runs with.
 */
import { T_REF } from '../constants.ts'
import { makeConstantCp } from './constant-cp.ts'
import type { Gas } from './gas.ts'

/**
 * cp and cv trade places wherever heat and energy are computed (Δu from "cp", Δh from "cv",
 * entropy from "cv"), while the isentropic exponent keeps its true value: the student read
 * γ from the table but used the wrong heat capacity for q.
 */
export function swapCpCv(gas: Gas): Gas {
  const R = gas.R
  return {
    ...withoutInternals(gas),
    id: `${gas.id}~cp-cv-swapped`,
    cp: gas.cv,
    cv: gas.cp,
    h: gas.u,
    u: gas.h,
    TfromH: gas.TfromU,
    TfromU: gas.TfromH,
    sT: (T) => gas.sT(T) - R * gas.ln(T / T_REF),
  }
}

/**
 * The gas without the constants it was built from: a slipped gas is no longer what those
 * constants describe, so a second slip that rebuilds from them (withLog10, the γ swap) must
 * not quietly undo the first.
 */
function withoutInternals(gas: Gas): Gas {
  const { internals: _built, ...rest } = gas
  return rest
}

/** γ of the other kind of gas: a monatomic gas treated as diatomic (cv = 5/2 R) or the reverse. null if neither. */
export function swapMonatomicDiatomic(gas: Gas): Gas | null {
  const internals = gas.internals
  if (!gas.constantCp || !internals) return null
  const k = gas.gamma(300)
  let cv: number
  if (Math.abs(k - 5 / 3) < 2e-3) cv = 2.5 * gas.R
  else if (Math.abs(k - 7 / 5) < 2e-3) cv = 1.5 * gas.R
  else return null
  return makeConstantCp({ ...internals, id: `${gas.id}~gamma-swapped`, cv, cp: cv + gas.R, k: undefined, ln: gas.ln })
}

/** log10 wherever the solver takes a logarithm by hand (isothermal work, entropy terms). */
export function withLog10(gas: Gas): Gas {
  const internals = gas.internals
  if (internals) return makeConstantCp({ ...internals, ln: Math.log10 })
  return { ...gas, ln: Math.log10 }
}

/**
 * Molar numbers used per kilogram, or the reverse: every specific constant scaled by the
 * molar mass while amounts stay as given (e.g. cv = 20.8 J/(mol·K) multiplied by a mass in kg).
 * null when the molar mass is unknown.
 */
export function switchBasisNumbers(gas: Gas): Gas | null {
  const M = gas.molarMass
  if (M === undefined) return null
  const f = gas.basis === 'mass' ? M : 1 / M
  return scaleGas(gas, f)
}

function scaleGas(gas: Gas, f: number): Gas {
  return {
    ...withoutInternals(gas),
    id: `${gas.id}~basis-switched`,
    R: gas.R * f,
    cp: (T) => f * gas.cp(T),
    cv: (T) => f * gas.cv(T),
    h: (T) => f * gas.h(T),
    u: (T) => f * gas.u(T),
    sT: (T) => f * gas.sT(T),
    TfromH: (h) => gas.TfromH(h / f),
    TfromU: (u) => gas.TfromU(u / f),
  }
}
