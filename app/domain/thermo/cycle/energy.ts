/**
 * Energy per state and per step of a solved cycle: u, h, s of every state, and q, w, Δu, Δh,
 * Δs of every step (boundary work for closed systems, shaft work for steady flow).
 */
import { P_REF } from '../constants.ts'
import { fail } from './relations.ts'
import type { Failure } from './relations.ts'
import { stateExergy } from './second-law.ts'
import type { DeadState } from './second-law.ts'
import type { StateResult, StepResult } from './types.ts'
import type { Work } from './work.ts'

/** A step's first-law results; the second-law fields are added by ./second-law.ts. */
export type StepEnergy = Omit<
  StepResult,
  'boundaryTemperature' | 'entropyGenerated' | 'exergyDestroyed' | 'partnerStep'
>

/** u, h, s (and the exergy, with a dead state) of every state from its p, v, T. */
export function stateResults(c: Work, dead: DeadState | null): StateResult[] {
  const { gas, system, N, val } = c
  const R = gas.R
  const lnG = gas.ln
  const states: StateResult[] = new Array(N)
  for (let i = 0; i < N; i++) {
    const p = val[3 * i]!
    const v = val[3 * i + 1]!
    const Ti = val[3 * i + 2]!
    const u = gas.u(Ti)
    const h = gas.h(Ti)
    const s = gas.sT(Ti) - R * lnG(p / P_REF)
    states[i] = {
      name: c.stateName(i),
      p,
      v,
      T: Ti,
      u,
      h,
      s,
      exergy: dead ? stateExergy(system, u, h, v, s, dead) : null,
    }
  }
  return states
}

/** q, w, Δu, Δh, Δs of every step; fails when a step marked expectHeat has the wrong sign of q. */
export function stepEnergies(c: Work, states: readonly StateResult[]): StepEnergy[] | Failure {
  const { gas, system, steps, N } = c
  const R = gas.R
  const lnG = gas.ln
  const basis = gas.basis
  const results: StepEnergy[] = new Array(N)
  for (let k = 0; k < N; k++) {
    const s = steps[k]!
    const j = k + 1 === N ? 0 : k + 1
    const a = states[k]!
    const b = states[j]!
    const du = b.u - a.u
    const dh = b.h - a.h
    const ds = b.s - a.s
    let q: number
    let wBy: number // boundary work done BY the gas
    const path = s.process === 'regenerator' ? (s.path ?? 'isobaric') : s.process
    switch (path) {
      case 'isothermal':
        wBy = R * a.T * lnG(b.v / a.v)
        q = wBy
        break
      case 'isochoric':
        wBy = 0
        q = du
        break
      case 'isobaric':
        wBy = a.p * (b.v - a.v)
        q = dh
        break
      case 'isentropic':
      case 'adiabatic':
        q = 0
        wBy = -du
        break
      case 'polytropic': {
        const n = s.n!
        const L = Math.log(b.v / a.v)
        if (gas.constantCp && Math.abs(n - gas.gamma(a.T)) <= 1e-12 * n) {
          // n = γ: the reversible adiabatic, exactly
          q = 0
          wBy = -du
        } else {
          // w = p1 v1 (1 − (v1/v2)^(n−1)) / (n − 1), written with expm1 so that n → 1 tends
          // smoothly (and at n = 1 exactly) to p1 v1 ln(v2/v1) without dividing by ~0.
          const x = (n - 1) * L
          wBy = n === 1 ? R * a.T * lnG(b.v / a.v) : x === 0 ? a.p * a.v * L : (a.p * a.v * -Math.expm1(-x)) / (n - 1)
          q = du + wBy
        }
        break
      }
      default:
        q = NaN
        wBy = NaN
    }
    const w = system === 'flow' ? dh - q : -wBy // flow: shaft work on the fluid, ΔH = q + w_s
    const internal = s.process === 'regenerator'
    results[k] = { from: k + 1, to: j + 1, process: s.process, label: s.label, q, w, du, dh, ds, internal }
    if (s.expectHeat) {
      const scale = Math.max(Math.abs(a.h), Math.abs(b.h), R * a.T, 1)
      const okSign = s.expectHeat === 'in' ? q > 1e-12 * scale : q < -1e-12 * scale
      if (!okSign) {
        return fail(
          'unphysical',
          `Step ${k + 1} (${c.stateName(k)}→${c.stateName(j)}): this step should ${s.expectHeat === 'in' ? 'take heat in' : 'reject heat'}, but with these data q = ${Number(q.toPrecision(4))} J/${basis === 'mass' ? 'kg' : 'mol'} (T${c.stateName(k)} = ${Number(a.T.toPrecision(4))} K, T${c.stateName(j)} = ${Number(b.T.toPrecision(4))} K)`,
          {
            step: k + 1,
            state: j + 1,
            property: 'T',
          },
        )
      }
    }
  }
  return results
}
