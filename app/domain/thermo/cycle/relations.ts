/**
 * The process relations of the cycle solver: which property a step keeps equal or scales by a
 * ratio, and the end state of a step from its start state (or back). Properties are indexed
 * P = 0, V = 1 (specific volume), T = 2; the `src` codes say where a value came from.
 */
import type { Gas } from '../substances/gas.ts'
import type { SolveError, SolveErrorCode, StepSpec } from './types.ts'

export const P = 0
export const V = 1
export const T = 2
export const PROP = ['p', 'v', 'T'] as const
export const PROP_WORD = ['pressure', 'specific volume', 'temperature'] as const
export const UNKNOWN = -9
export const GIVEN = -1
export const GAS_LAW = -2
export const FROM_AMOUNT = -3
export const TOL = 1e-6
export const Y_ORDER = [-1, T, P, V] as const
export const X_ORDER = [P, T, V] as const

export const fail = (
  code: SolveErrorCode,
  message: string,
  extra: Partial<SolveError> = {},
): { ok: false; error: SolveError } => ({
  ok: false,
  error: { code, message, ...extra },
})

export function equalityProp(s: StepSpec): number {
  switch (s.process) {
    case 'isothermal':
      return T
    case 'isochoric':
      return V
    case 'isobaric':
      return P
    case 'regenerator':
      return s.path === 'isochoric' ? V : P
    case 'polytropic':
      return s.n === 1 ? T : s.n === 0 ? P : -1
    default:
      return -1
  }
}

export function ratioOf(s: StepSpec, prop: number): number | undefined {
  return prop === P ? s.pressureRatio : prop === V ? s.volumeRatio : s.temperatureRatio
}

export function isForced(s: StepSpec, prop: number): boolean {
  return equalityProp(s) === prop || ratioOf(s, prop) !== undefined
}

export function relClose(a: number, b: number, tol = TOL): boolean {
  return Math.abs(a - b) <= tol * Math.max(Math.abs(a), Math.abs(b))
}

/**
 * The end state b of step s from a full state a (dir = +1), or the start state from a full end
 * state (dir = −1), given at most one more property of b (Y = P, V, T or −1). Returns false
 * if the relation does not fix b with what is known. Writes into out[0..2].
 */
export function predict(
  gas: Gas,
  system: 'closed' | 'flow',
  s: StepSpec,
  q: number,
  a: Float64Array | number[],
  ao: number,
  Y: number,
  y: number,
  dir: 1 | -1,
  out: Float64Array,
): boolean {
  out[0] = NaN
  out[1] = NaN
  out[2] = NaN
  const eq = equalityProp(s)
  for (let k = 0; k < 3; k++) {
    if (eq === k) out[k] = a[ao + k]!
    const r = ratioOf(s, k)
    if (r !== undefined) out[k] = dir === 1 ? a[ao + k]! * r : a[ao + k]! / r
  }
  const pa = a[ao]!
  const va = a[ao + 1]!
  const Ta = a[ao + 2]!
  const R = gas.R
  // The process relation first uses only what the step itself forces (equalities, ratios,
  // heat); the extra property Y of the other state is added only if that is not enough, so a
  // verification pass really tests the relation rather than re-deriving the given state.
  applyRelation(gas, system, s, q, pa, va, Ta, dir, out)
  gasLawInto(R, out)
  if (!isFullTriple(out) && Y >= 0 && Number.isNaN(out[Y]!)) {
    out[Y] = y
    applyRelation(gas, system, s, q, pa, va, Ta, dir, out)
    gasLawInto(R, out)
  }
  return isFullTriple(out)
}

export function isFullTriple(out: Float64Array): boolean {
  return !(Number.isNaN(out[0]!) || Number.isNaN(out[1]!) || Number.isNaN(out[2]!))
}

export function gasLawInto(R: number, out: Float64Array): void {
  const pn = Number.isNaN(out[P]!)
  const vn = Number.isNaN(out[V]!)
  const tn = Number.isNaN(out[T]!)
  if (pn && !vn && !tn) out[P] = (R * out[T]!) / out[V]!
  else if (vn && !pn && !tn) out[V] = (R * out[T]!) / out[P]!
  else if (tn && !pn && !vn) out[T] = (out[P]! * out[V]!) / R
}

export function applyRelation(
  gas: Gas,
  system: 'closed' | 'flow',
  s: StepSpec,
  q: number,
  pa: number,
  va: number,
  Ta: number,
  dir: 1 | -1,
  out: Float64Array,
): void {
  const R = gas.R
  const hasQ = !Number.isNaN(q)
  switch (s.process) {
    case 'isothermal':
      if (hasQ && Number.isNaN(out[V]!)) {
        // q = R T ln(vb/va)  (ln → log10 under the slip, so the inverse is 10^x)
        const x = (dir * q) / (R * Ta)
        out[V] = va * (gas.ln === Math.log ? Math.exp(x) : Math.pow(10, x))
      }
      break
    case 'isochoric':
      if (hasQ && Number.isNaN(out[T]!)) out[T] = gas.TfromU(gas.u(Ta) + dir * q)
      break
    case 'isobaric':
      if (hasQ && Number.isNaN(out[T]!)) out[T] = gas.TfromH(gas.h(Ta) + dir * q)
      break
    case 'isentropic':
      if (Number.isNaN(out[T]!)) {
        if (!Number.isNaN(out[P]!)) out[T] = gas.isentropicTfromP(Ta, pa, out[P]!)
        else if (!Number.isNaN(out[V]!)) out[T] = gas.isentropicTfromV(Ta, va, out[V]!)
      } else if (Number.isNaN(out[P]!) && Number.isNaN(out[V]!)) {
        out[P] = pa * gas.isentropicPressureRatio(Ta, out[T]!)
      }
      break
    case 'polytropic': {
      const n = s.n!
      if (n === 0 || n === 1) break // equalities already applied
      if (!Number.isNaN(out[V]!) && Number.isNaN(out[P]!)) out[P] = pa * Math.pow(va / out[V]!, n)
      else if (!Number.isNaN(out[P]!) && Number.isNaN(out[V]!)) out[V] = va * Math.pow(pa / out[P]!, 1 / n)
      // T fixes v only when n is not ~1 (the exponent 1/(n−1) would amplify rounding)
      else if (!Number.isNaN(out[T]!) && Number.isNaN(out[V]!) && Number.isNaN(out[P]!) && Math.abs(n - 1) > 1e-6)
        out[V] = va * Math.pow(Ta / out[T]!, 1 / (n - 1))
      break
    }
    case 'adiabatic': {
      if (dir !== 1 || !Number.isNaN(out[T]!)) break
      let Ts: number
      if (!Number.isNaN(out[P]!)) Ts = gas.isentropicTfromP(Ta, pa, out[P]!)
      else if (!Number.isNaN(out[V]!)) Ts = gas.isentropicTfromV(Ta, va, out[V]!)
      else break
      const eta = s.efficiency ?? 1
      const flow = system === 'flow'
      const ea = flow ? gas.h(Ta) : gas.u(Ta)
      const es = flow ? gas.h(Ts) : gas.u(Ts)
      const compressor = s.device ? s.device === 'compressor' : es > ea
      const eb = compressor ? ea + (es - ea) / eta : ea + eta * (es - ea)
      out[T] = flow ? gas.TfromH(eb) : gas.TfromU(eb)
      break
    }
    default:
      break
  }
}

export function fmtValue(prop: number, x: number, basis: 'mole' | 'mass'): string {
  const sig = (y: number) => Number(y.toPrecision(4)).toString()
  if (prop === P) return Math.abs(x) >= 1e7 ? `${sig(x / 1e6)} MPa` : `${sig(x / 1e3)} kPa`
  if (prop === T) return `${sig(x)} K`
  return `${sig(x)} m³/${basis === 'mass' ? 'kg' : 'mol'}`
}

export function describeStep(s: StepSpec, k: number, from: number, to: number): string {
  const what =
    s.process === 'adiabatic'
      ? `adiabatic (η = ${s.efficiency ?? 1})`
      : s.process === 'polytropic'
        ? `polytropic (n = ${s.n})`
        : s.process
  return `the ${what} step ${from + 1}→${to + 1}`
}

/** A failed solve. */
export type Failure = { ok: false; error: SolveError }
