/**
 * The working state of one solve: the p, v, T of every state (NaN while unknown), where each
 * came from, the total volumes and the amount, and the rules that set and check them.
 */
import type { Gas } from '../substances/gas.ts'
import {
  GAS_LAW,
  GIVEN,
  P,
  PROP,
  PROP_WORD,
  T,
  V,
  X_ORDER,
  Y_ORDER,
  describeStep,
  fail,
  fmtValue,
  isForced,
  predict,
  relClose,
} from './relations.ts'
import type { Failure } from './relations.ts'
import type { CycleSpec, SolveError, StepSpec } from './types.ts'

/**
 * Working state of one solve. A class (not closures inside solveCycle) so that no function
 * objects are created per solve: that, and plain arrays, keep a variant in microseconds.
 */
export class Work {
  changed = false
  rangeError: SolveError | null = null
  readonly tmp = new Float64Array(3)
  constructor(
    readonly spec: CycleSpec,
    readonly gas: Gas,
    readonly system: 'closed' | 'flow',
    readonly steps: readonly StepSpec[],
    readonly N: number,
    readonly val: Float64Array,
    readonly src: Int16Array,
    readonly Vtot: Float64Array,
    public amount: number,
  ) {}
  stateName(i: number): string {
    return this.spec.states[i]!.name ?? String(i + 1)
  }
  label(i: number, prop: number): string | undefined {
    const l = this.spec.labels
    return (
      l?.[`${PROP[prop]}${i + 1}`] ?? l?.[`${prop === V && !Number.isNaN(this.Vtot[i]!) ? 'V' : PROP[prop]}${i + 1}`]
    )
  }
  known(i: number, prop: number): boolean {
    return !Number.isNaN(this.val[3 * i + prop]!)
  }
  full(i: number): boolean {
    const o = 3 * i
    const v = this.val
    return !(Number.isNaN(v[o]!) || Number.isNaN(v[o + 1]!) || Number.isNaN(v[o + 2]!))
  }
  set(i: number, prop: number, x: number, source: number): void {
    const o = 3 * i + prop
    const val = this.val
    if (!Number.isNaN(val[o]!)) return
    if (!(x > 0 && Number.isFinite(x))) {
      if (!this.rangeError) {
        const gas = this.gas
        this.rangeError = {
          code: 'out-of-range',
          message:
            source >= 0
              ? `State ${this.stateName(i)}: ${describeStep(this.steps[source]!, source, source, (source + 1) % this.N)} gives no valid ${PROP_WORD[prop]}${gas.constantCp ? '' : ` (the ${gas.label} data cover ${gas.Tmin}–${gas.Tmax} K)`}`
              : `State ${this.stateName(i)}: no valid ${PROP_WORD[prop]} follows from the data`,
          state: i + 1,
          property: PROP[prop],
        }
      }
      return
    }
    val[o] = x
    this.src[o] = source
    this.changed = true
    this.complete(i)
  }
  complete(i: number): void {
    const o = 3 * i
    const val = this.val
    const R = this.gas.R
    const pk = !Number.isNaN(val[o]!)
    const vk = !Number.isNaN(val[o + 1]!)
    const tk = !Number.isNaN(val[o + 2]!)
    if (pk && vk && !tk) this.set(i, T, (val[o]! * val[o + 1]!) / R, GAS_LAW)
    else if (pk && tk && !vk) this.set(i, V, (R * val[o + 2]!) / val[o]!, GAS_LAW)
    else if (vk && tk && !pk) this.set(i, P, (R * val[o + 2]!) / val[o + 1]!, GAS_LAW)
  }
  heatOf(s: StepSpec): number {
    return s.heat !== undefined
      ? s.heat
      : s.heatTotal !== undefined && !Number.isNaN(this.amount)
        ? s.heatTotal / this.amount
        : NaN
  }
  /** Regenerator pair rule: [cold step, hot step, T cold out, T hot out] from the inlet temperatures. */
  regenOutlets(k: number, m: number): [number, number, number, number] | null {
    const val = this.val
    const gas = this.gas
    const Ta = val[3 * k + T]!
    const Td = val[3 * m + T]!
    if (Number.isNaN(Ta) || Number.isNaN(Td)) return null
    const c = Ta <= Td ? k : m
    const hs = Ta <= Td ? m : k
    const sc = this.steps[c]!
    const sh = this.steps[hs]!
    const Tci = val[3 * c + T]!
    const Thi = val[3 * hs + T]!
    const eps = sc.effectiveness ?? sh.effectiveness ?? 1
    if (eps === 1 && sc.path === sh.path) return [c, hs, Thi, Tci]
    const eC = sc.path === 'isochoric' ? gas.u : gas.h
    const eH = sh.path === 'isochoric' ? gas.u : gas.h
    const qc = eps * (eC(Thi) - eC(Tci))
    const Tco = (sc.path === 'isochoric' ? gas.TfromU : gas.TfromH)(eC(Tci) + qc)
    const Tho = (sh.path === 'isochoric' ? gas.TfromU : gas.TfromH)(eH(Thi) - qc)
    return [c, hs, Tco, Tho]
  }
  checkStep(s: StepSpec, k: number, i: number, j: number, q: number): Failure | null {
    const { gas, system, val, src, tmp, steps, N } = this
    const basis = gas.basis
    // Forward prediction of j from i with each non-forced property of j in turn.
    let anyPrediction = false
    for (const Y of Y_ORDER) {
      if (Y >= 0 && isForced(s, Y)) continue
      if (!predict(gas, system, s, q, val, 3 * i, Y, Y >= 0 ? val[3 * j + Y]! : NaN, 1, tmp)) continue
      anyPrediction = true
      for (const X of X_ORDER) {
        if (X === Y) continue
        const actual = val[3 * j + X]!
        if (!relClose(tmp[X]!, actual)) {
          // blame a given property of state j when there is one, else the mismatching one
          const blame = src[3 * j + X] === GIVEN ? X : ([P, T, V].find((x) => x !== Y && src[3 * j + x] === GIVEN) ?? X)
          const expected = tmp[blame]!
          const nm = this.stateName(j)
          const givenTxt =
            src[3 * j + blame] === GIVEN
              ? `given as ${this.label(j, blame) ?? fmtValue(blame, val[3 * j + blame]!, basis)}`
              : `is ${fmtValue(blame, val[3 * j + blame]!, basis)}`
          return fail(
            'conflict',
            `State ${nm}: ${PROP[blame]} ${givenTxt} but ${describeStep(s, k, i, j)} requires ${fmtValue(blame, expected, basis)}`,
            {
              state: j + 1,
              property: PROP[blame],
              step: k + 1,
            },
          )
        }
      }
      break
    }
    if (!anyPrediction && s.process === 'adiabatic') return null
    if (s.process === 'regenerator' && k < s.partner!) {
      const res = this.regenOutlets(k, s.partner!)
      if (res) {
        const [c, hs, Tco, Tho] = res
        for (const [stepIdx, Tx] of [
          [c, Tco],
          [hs, Tho],
        ] as const) {
          const o = stepIdx + 1 === N ? 0 : stepIdx + 1
          if (!relClose(val[3 * o + T]!, Tx)) {
            return fail(
              'conflict',
              `State ${this.stateName(o)}: T ${src[3 * o + T] === GIVEN ? `given as ${this.label(o, T) ?? fmtValue(T, val[3 * o + T]!, basis)}` : `is ${fmtValue(T, val[3 * o + T]!, basis)}`} but the regenerator (steps ${k + 1} and ${s.partner! + 1}, ε = ${s.effectiveness ?? steps[s.partner!]!.effectiveness ?? 1}) requires ${fmtValue(T, Tx, basis)}`,
              {
                state: o + 1,
                property: 'T',
                step: stepIdx + 1,
              },
            )
          }
        }
      }
    }
    return null
  }
}
