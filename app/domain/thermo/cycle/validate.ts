/**
 * The checks on a spec before anything is solved: the step data, and the given p, v, T, V
 * and amount, read into the working arrays of a solve (./work.ts).
 */
import type { Gas } from '../substances/gas.ts'
import { GIVEN, P, PROP, T, UNKNOWN, V, fail, relClose } from './relations.ts'
import type { Failure } from './relations.ts'
import { PROCESS_KINDS } from './types.ts'
import type { CycleSpec, StepSpec } from './types.ts'
import { Work } from './work.ts'

/** Every step's own data (process, exponent, efficiency, partner, ratios, heat, boundary temperature). */
export function validateSteps(steps: readonly StepSpec[], N: number): Failure | null {
  for (let k = 0; k < N; k++) {
    const s = steps[k]!
    const sn = k + 1
    if (!PROCESS_KINDS.includes(s.process))
      return fail('invalid-input', `Step ${sn}: unknown process "${String(s.process)}"`, {
        step: sn,
        property: 'process',
      })
    if (s.process === 'polytropic' && !(typeof s.n === 'number' && Number.isFinite(s.n)))
      return fail('invalid-input', `Step ${sn}: a polytropic step needs its exponent n`, { step: sn, property: 'n' })
    if (s.process === 'adiabatic' && s.efficiency !== undefined && !(s.efficiency > 0 && s.efficiency <= 1)) {
      return fail('invalid-input', `Step ${sn}: isentropic efficiency must be in (0, 1]`, {
        step: sn,
        property: 'efficiency',
      })
    }
    if (s.process === 'regenerator') {
      const m = s.partner
      if (
        m === undefined ||
        !Number.isInteger(m) ||
        m < 0 ||
        m >= N ||
        m === k ||
        steps[m]!.process !== 'regenerator' ||
        (steps[m]!.partner !== undefined && steps[m]!.partner !== k)
      ) {
        return fail(
          'invalid-input',
          `Step ${sn}: a regenerator step needs a partner regenerator step (the other side of the exchanger)`,
          { step: sn, property: 'partner' },
        )
      }
      const e = s.effectiveness
      if (e !== undefined && !(e >= 0 && e <= 1))
        return fail('invalid-input', `Step ${sn}: regenerator effectiveness must be in [0, 1]`, {
          step: sn,
          property: 'effectiveness',
        })
    }
    for (const key of ['pressureRatio', 'volumeRatio', 'temperatureRatio'] as const) {
      const r = s[key]
      if (r !== undefined && !(Number.isFinite(r) && r > 0))
        return fail('invalid-input', `Step ${sn}: ${key} must be a positive number`, { step: sn, property: key })
    }
    if (
      (s.heat !== undefined || s.heatTotal !== undefined) &&
      !['isothermal', 'isochoric', 'isobaric'].includes(s.process)
    ) {
      return fail('invalid-input', `Step ${sn}: heat can be given only for isothermal, isochoric or isobaric steps`, {
        step: sn,
        property: 'heat',
      })
    }
  }
  for (let k = 0; k < N; k++) {
    const s = steps[k]!
    const sn = k + 1
    const Tb = s.boundaryTemperature
    if (Tb !== undefined && !(Number.isFinite(Tb) && Tb > 0))
      return fail('invalid-input', `Step ${sn}: the boundary temperature must be a positive temperature`, {
        step: sn,
        property: 'boundaryTemperature',
      })
    if (Tb !== undefined && s.process === 'regenerator')
      return fail(
        'invalid-input',
        `Step ${sn}: a regenerator exchanges heat inside the cycle and has no boundary temperature`,
        { step: sn, property: 'boundaryTemperature' },
      )
    if (s.side !== undefined && s.side !== 'hot' && s.side !== 'cold')
      return fail('invalid-input', `Step ${sn}: side must be "hot" or "cold"`, { step: sn, property: 'side' })
  }
  return null
}

/** The givens of every state into a new Work (each state completed by the gas law), or the first bad given. */
export function readGivens(
  spec: CycleSpec,
  gas: Gas,
  system: 'closed' | 'flow',
  steps: readonly StepSpec[],
  N: number,
): Work | Failure {
  const st = spec.states
  const R = gas.R
  const val = new Float64Array(3 * N).fill(NaN)
  const src = new Int16Array(3 * N).fill(UNKNOWN)
  const Vtot = new Float64Array(N).fill(NaN)

  if (spec.amount !== undefined && !(spec.amount > 0 && Number.isFinite(spec.amount)))
    return fail('invalid-input', 'the amount of gas must be a positive number', { property: 'amount' })
  for (let i = 0; i < N; i++) {
    const s = st[i]!
    for (let prop = 0; prop < 3; prop++) {
      const x = prop === P ? s.p : prop === V ? s.v : s.T
      if (x === undefined) continue
      if (!(Number.isFinite(x) && x > 0))
        return fail('invalid-input', `State ${i + 1}: ${PROP[prop]} must be a positive number`, {
          state: i + 1,
          property: PROP[prop],
        })
      if (prop === T && (x < gas.Tmin || x > gas.Tmax)) {
        return fail(
          'out-of-range',
          `State ${i + 1}: T = ${x} K is outside the range of the ${gas.label} data (${gas.Tmin}–${gas.Tmax} K)`,
          { state: i + 1, property: 'T' },
        )
      }
      val[3 * i + prop] = x
      src[3 * i + prop] = GIVEN
    }
    if (s.V !== undefined) {
      if (!(Number.isFinite(s.V) && s.V > 0))
        return fail('invalid-input', `State ${i + 1}: V must be a positive number`, { state: i + 1, property: 'V' })
      Vtot[i] = s.V
    }
  }
  // 3 givens: check the gas law now, before propagation uses them
  for (let i = 0; i < N; i++) {
    const o = 3 * i
    if (src[o] === GIVEN && src[o + 1] === GIVEN && src[o + 2] === GIVEN) {
      const ratio = (val[o]! * val[o + 1]!) / (R * val[o + 2]!)
      if (!relClose(ratio, 1)) {
        return fail(
          'conflict',
          `State ${st[i]!.name ?? String(i + 1)}: p, v and T are all given but do not satisfy the ideal-gas law (p·v/(R·T) = ${ratio.toPrecision(4)})`,
          { state: i + 1, property: 'T' },
        )
      }
    }
  }

  const c = new Work(spec, gas, system, steps, N, val, src, Vtot, spec.amount ?? NaN)
  for (let i = 0; i < N; i++) c.complete(i)
  return c
}
