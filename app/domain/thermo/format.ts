/**
 * The solution as JSON: every quantity as { value, unit } in SI, the convention stated.
 * Per-unit-amount values always; totals (× amount) when the amount is known; rates (× flow
 * rate: W, W/K) when a flow cycle gives its flow rate; exergies with a dead state; warnings.
 */
import { P_REF, T_REF } from './constants.ts'
import { CONVENTIONS, workIn } from './conventions.ts'
import type { Convention, ConventionStatement } from './conventions.ts'
import type { CycleSolution, SolveError, SolveWarning } from './cycle.ts'
import { isRecord } from './json.ts'
import type { Quantity } from './units.ts'

const q = (value: number, unit: string): Quantity => ({ value, unit })

export interface FormattedState {
  readonly name: string
  readonly p: Quantity
  readonly T: Quantity
  readonly v: Quantity
  readonly u: Quantity
  readonly h: Quantity
  readonly s: Quantity
  readonly V?: Quantity
  readonly U?: Quantity
  readonly H?: Quantity
  readonly S?: Quantity
  /** specific exergy (closed φ or flow ψ), with a dead state */
  readonly exergy?: Quantity
  /** exergy of the whole amount */
  readonly X?: Quantity
}

export interface FormattedEnergies {
  readonly q: Quantity
  readonly w: Quantity
  readonly dU: Quantity
  readonly dH: Quantity
  readonly dS: Quantity
}

export interface FormattedSecondLaw {
  /** s_gen = Δs − q/T_b (a regenerator: the whole exchanger's, on both of its steps) */
  readonly entropyGenerated: Quantity | null
  /** T0·s_gen, with a dead state */
  readonly exergyDestroyed: Quantity | null
}

export interface FormattedStep extends FormattedEnergies, FormattedSecondLaw {
  readonly from: number
  readonly to: number
  readonly process: string
  readonly label?: string
  readonly internal: boolean
  /** temperature where the step's heat crosses the boundary (its own, or the reservoir's) */
  readonly boundaryTemperature: Quantity | null
  /** regenerator steps: the step on the other side of the exchanger */
  readonly partnerStep?: number
  readonly total?: FormattedEnergies & FormattedSecondLaw
  /** with a flow rate: heat and work as powers (W), entropy generated (W/K), exergy destroyed (W) */
  readonly rate?: {
    readonly heat: Quantity
    readonly work: Quantity
    readonly entropyGenerated: Quantity | null
    readonly exergyDestroyed: Quantity | null
  }
}

export interface FormattedTotals {
  readonly purpose: string
  readonly heatIn: Quantity
  readonly heatOut: Quantity
  readonly netWork: Quantity
  readonly efficiency: Quantity | null
  readonly copRefrigerator: Quantity | null
  readonly copHeatPump: Quantity | null
  readonly meanEffectivePressure: Quantity | null
  readonly backWorkRatio: Quantity | null
  readonly carnotBound: Quantity
  readonly Tmin: Quantity
  readonly Tmax: Quantity
  readonly entropyGenerated: Quantity | null
  readonly exergyDestroyed: Quantity | null
  /** η/η_rev (engines) or COP/COP_rev between the reservoirs */
  readonly secondLawEfficiency: Quantity | null
  /** exergy recovered / exergy supplied, with a dead state */
  readonly exergyEfficiency: Quantity | null
  readonly closure: { readonly dU: Quantity; readonly dS: Quantity }
  readonly total?: {
    readonly heatIn: Quantity
    readonly heatOut: Quantity
    readonly netWork: Quantity
    readonly entropyGenerated: Quantity | null
    readonly exergyDestroyed: Quantity | null
  }
  /** with a flow rate: powers (W) and rates (W/K) */
  readonly rate?: {
    readonly heatIn: Quantity
    readonly heatOut: Quantity
    readonly netPower: Quantity
    readonly entropyGenerated: Quantity | null
    readonly exergyDestroyed: Quantity | null
  }
}

export interface FormattedSolution {
  readonly ok: true
  readonly convention: ConventionStatement
  readonly system: 'closed' | 'flow'
  readonly gas: {
    readonly id: string
    readonly label: string
    readonly basis: 'mole' | 'mass'
    readonly R: Quantity
    readonly source: string
  }
  readonly reference: string
  readonly amount: Quantity | null
  /** the dead state of the exergies (T0, p0), or null: no exergy outputs without one */
  readonly deadState: { readonly T: Quantity; readonly p: Quantity } | null
  /** mass or molar rate through the cycle (a flow cycle's flow, a piston cycle's gas per second), or null */
  readonly flowRate: Quantity | null
  readonly states: readonly FormattedState[]
  readonly steps: readonly FormattedStep[]
  readonly totals: FormattedTotals
  /** never fatal: e.g. a step that would generate negative entropy, a regenerator working the wrong way */
  readonly warnings: readonly SolveWarning[]
  readonly notice: string
}

export const TEACHING_NOTICE =
  'Cyclewright is a teaching tool: ideal-gas models with textbook data. Do not use these numbers for design; defer to the applicable codes and licensed engineering practice.'

export function formatSolution(sol: CycleSolution, convention: Convention): FormattedSolution {
  const per = sol.gas.basis === 'mass' ? 'kg' : 'mol'
  const n = sol.amount
  const E = `J/${per}`
  const S = `J/(${per} K)`
  const states = sol.states.map((s): FormattedState => {
    const base = {
      name: s.name,
      p: q(s.p, 'Pa'),
      T: q(s.T, 'K'),
      v: q(s.v, `m^3/${per}`),
      u: q(s.u, E),
      h: q(s.h, E),
      s: q(s.s, S),
    }
    const withTotals =
      n === null
        ? base
        : { ...base, V: q(s.v * n, 'm^3'), U: q(s.u * n, 'J'), H: q(s.h * n, 'J'), S: q(s.s * n, 'J/K') }
    return s.exergy === null
      ? withTotals
      : { ...withTotals, exergy: q(s.exergy, E), ...(n === null ? {} : { X: q(s.exergy * n, 'J') }) }
  })
  const f = sol.flowRate
  const orNull = (x: number | null, scale: number, unit: string) => (x === null ? null : q(x * scale, unit))
  const steps = sol.steps.map((st): FormattedStep => {
    const w = workIn(convention, st.w)
    const base = {
      from: st.from,
      to: st.to,
      process: st.process,
      ...(st.label ? { label: st.label } : {}),
      internal: st.internal,
      q: q(st.q, E),
      w: q(w, E),
      dU: q(st.du, E),
      dH: q(st.dh, E),
      dS: q(st.ds, S),
      boundaryTemperature: orNull(st.boundaryTemperature, 1, 'K'),
      entropyGenerated: orNull(st.entropyGenerated, 1, S),
      exergyDestroyed: orNull(st.exergyDestroyed, 1, E),
      ...(st.partnerStep === undefined ? {} : { partnerStep: st.partnerStep }),
    }
    return {
      ...base,
      ...(n === null
        ? {}
        : {
            total: {
              q: q(st.q * n, 'J'),
              w: q(w * n, 'J'),
              dU: q(st.du * n, 'J'),
              dH: q(st.dh * n, 'J'),
              dS: q(st.ds * n, 'J/K'),
              entropyGenerated: orNull(st.entropyGenerated, n, 'J/K'),
              exergyDestroyed: orNull(st.exergyDestroyed, n, 'J'),
            },
          }),
      ...(f === null
        ? {}
        : {
            rate: {
              heat: q(st.q * f, 'W'),
              work: q(w * f, 'W'),
              entropyGenerated: orNull(st.entropyGenerated, f, 'W/K'),
              exergyDestroyed: orNull(st.exergyDestroyed, f, 'W'),
            },
          }),
    }
  })
  const t = sol.totals
  const net = workIn(convention, t.wNet)
  const totals: FormattedTotals = {
    purpose: t.purpose,
    heatIn: q(t.qIn, E),
    heatOut: q(t.qOut, E),
    netWork: q(net, E),
    efficiency: t.efficiency === null ? null : q(t.efficiency, '1'),
    copRefrigerator: t.copRefrigerator === null ? null : q(t.copRefrigerator, '1'),
    copHeatPump: t.copHeatPump === null ? null : q(t.copHeatPump, '1'),
    meanEffectivePressure: t.mep === null ? null : q(t.mep, 'Pa'),
    backWorkRatio: t.backWorkRatio === null ? null : q(t.backWorkRatio, '1'),
    carnotBound: q(t.carnotBound, '1'),
    Tmin: q(t.Tmin, 'K'),
    Tmax: q(t.Tmax, 'K'),
    entropyGenerated: t.entropyGenerated === null ? null : q(t.entropyGenerated, S),
    exergyDestroyed: orNull(t.exergyDestroyed, 1, E),
    secondLawEfficiency: orNull(t.secondLawEfficiency, 1, '1'),
    exergyEfficiency: orNull(t.exergyEfficiency, 1, '1'),
    closure: { dU: q(t.duCycle, E), dS: q(t.dsCycle, S) },
    ...(n === null
      ? {}
      : {
          total: {
            heatIn: q(t.qIn * n, 'J'),
            heatOut: q(t.qOut * n, 'J'),
            netWork: q(net * n, 'J'),
            entropyGenerated: t.entropyGenerated === null ? null : q(t.entropyGenerated * n, 'J/K'),
            exergyDestroyed: orNull(t.exergyDestroyed, n, 'J'),
          },
        }),
    ...(f === null
      ? {}
      : {
          rate: {
            heatIn: q(t.qIn * f, 'W'),
            heatOut: q(t.qOut * f, 'W'),
            netPower: q(net * f, 'W'),
            entropyGenerated: orNull(t.entropyGenerated, f, 'W/K'),
            exergyDestroyed: orNull(t.exergyDestroyed, f, 'W'),
          },
        }),
  }
  return {
    ok: true,
    convention: CONVENTIONS[convention],
    system: sol.system,
    gas: { id: sol.gas.id, label: sol.gas.label, basis: sol.gas.basis, R: q(sol.gas.R, S), source: sol.gas.source },
    reference: sol.gas.constantCp
      ? `h = 0 and s = 0 at ${T_REF} K and ${P_REF / 1e5} bar; u = h − R·T`
      : `NASA/JANAF convention: h includes the enthalpy of formation at ${T_REF} K, s is the third-law entropy at p° = ${P_REF / 1e5} bar; u = h − R·T`,
    amount: n === null ? null : q(n, per),
    deadState: sol.deadState === null ? null : { T: q(sol.deadState.T, 'K'), p: q(sol.deadState.p, 'Pa') },
    flowRate: f === null ? null : q(f, `${per}/s`),
    states,
    steps,
    totals,
    warnings: sol.warnings,
    notice: TEACHING_NOTICE,
  }
}

export interface FormattedError {
  readonly ok: false
  readonly error: SolveError
}

/**
 * Read one number from a formatted solution by a dotted path with 1-based indices:
 * 'totals.netWork', 'totals.efficiency', 'states.3.T', 'steps.2.q', 'steps.2.total.w',
 * 'totals.total.heatIn', 'steps.2.entropyGenerated', 'totals.rate.netPower'. Returns null when the path names nothing numeric.
 */
/** An object (a list too) with the field, own or inherited, as `x.field` would read it. */
function hasField<K extends string>(x: unknown, field: K): x is Record<K, unknown> {
  return typeof x === 'object' && x !== null && field in x
}

export function readQuantity(sol: object, path: string): number | null {
  const parts = path.split('.')
  let cur: unknown = sol
  for (let i = 0; i < parts.length; i++) {
    const key = parts[i]!
    if (Array.isArray(cur)) {
      const list: unknown[] = cur
      const idx = Number(key)
      cur = Number.isInteger(idx) && idx >= 1 ? list[idx - 1] : list.find((x) => hasField(x, 'name') && x.name === key)
    } else if (isRecord(cur)) {
      cur = cur[key]
    } else {
      return null
    }
  }
  if (typeof cur === 'number') return cur
  if (hasField(cur, 'value') && typeof cur.value === 'number') return cur.value
  return null
}
