/**
 * The general cycle solver: an ordered list of states and the processes that join them
 * (step k joins state k to state k+1, the last joins back to the first). Every unknown p, v, T
 * is filled by propagation through the process relations and the ideal-gas law until nothing
 * changes; then every relation is verified, so over-specified but inconsistent givens produce an
 * error naming the state and property instead of a silently wrong key.
 *
 * Internally: SI numbers only, per unit amount of the gas's basis (mol or kg), and the
 * chemistry sign convention (q into the system, w done ON the system, Δu = q + w). Extensive
 * values are the per-unit ones times the amount, when it is known. See ./conventions.ts for
 * the output conventions.
 *
 * Public functions never throw for bad input: they return { ok: false, error }.
 */
import { P_REF } from './constants.ts'
import type { Gas } from './substances/gas.ts'

export type ProcessKind =
  'isothermal' | 'isentropic' | 'isochoric' | 'isobaric' | 'polytropic' | 'adiabatic' | 'regenerator'
export const PROCESS_KINDS: readonly ProcessKind[] = [
  'isothermal',
  'isentropic',
  'isochoric',
  'isobaric',
  'polytropic',
  'adiabatic',
  'regenerator',
]

export interface StepSpec {
  readonly process: ProcessKind
  /** Polytropic exponent (p·v^n = const); any real n, n = 1 and n = γ handled exactly. */
  readonly n?: number
  /** Isentropic efficiency of an 'adiabatic' step (0 < η ≤ 1). */
  readonly efficiency?: number
  /** 'adiabatic' steps: compressor (η divides the ideal work) or turbine (η multiplies it). Default: from the direction. */
  readonly device?: 'compressor' | 'turbine'
  /** 'regenerator' steps: the path of this side (default isobaric). */
  readonly path?: 'isobaric' | 'isochoric'
  /** 'regenerator' steps: index (0-based) of the step on the other side of the heat exchanger. */
  readonly partner?: number
  /** 'regenerator' effectiveness ε in [0, 1]; default 1 (ideal). */
  readonly effectiveness?: number
  /** p_to / p_from */
  readonly pressureRatio?: number
  /** v_to / v_from (a compression ratio r is volumeRatio = 1/r) */
  readonly volumeRatio?: number
  /** T_to / T_from */
  readonly temperatureRatio?: number
  /** Heat into the system per unit amount (J/kg or J/mol), for isothermal/isochoric/isobaric steps. */
  readonly heat?: number
  /** Heat into the system in J (needs the amount). */
  readonly heatTotal?: number
  /** Sanity check: this step must take heat in / reject heat (templates use it). */
  readonly expectHeat?: 'in' | 'out'
  readonly label?: string
}

export interface StateSpec {
  readonly name?: string
  readonly p?: number
  readonly T?: number
  /** specific volume, m³ per unit amount */
  readonly v?: number
  /** total volume, m³ (needs or fixes the amount) */
  readonly V?: number
}

export interface CycleSpec {
  readonly gas: Gas
  /** 'closed' (piston–cylinder: boundary work) or 'flow' (steady-flow devices: shaft work). Default closed. */
  readonly system?: 'closed' | 'flow'
  /** mol or kg, per gas.basis */
  readonly amount?: number
  readonly states: readonly StateSpec[]
  readonly steps: readonly StepSpec[]
  readonly purpose?: 'engine' | 'refrigerator' | 'heat-pump'
  /** Reservoir temperatures (K) for the entropy generated. */
  readonly reservoirs?: { readonly hot?: number; readonly cold?: number }
  /** Original texts of givens, keyed 'p1', 'T3', 'v2', 'V1', for error messages. */
  readonly labels?: Readonly<Record<string, string>>
}

export type SolveErrorCode = 'invalid-input' | 'underdetermined' | 'conflict' | 'out-of-range' | 'unphysical'

export interface SolveError {
  readonly code: SolveErrorCode
  readonly message: string
  /** 1-based state number */
  readonly state?: number
  /** 'p' | 'T' | 'v' | 'V' | 'amount' | a step field */
  readonly property?: string
  /** 1-based step number */
  readonly step?: number
}

export interface StateResult {
  readonly name: string
  readonly p: number
  readonly T: number
  readonly v: number
  readonly u: number
  readonly h: number
  readonly s: number
}

export interface StepResult {
  readonly from: number
  readonly to: number
  readonly process: ProcessKind
  readonly label: string | undefined
  /** heat into the system per unit amount */
  readonly q: number
  /** work done ON the system per unit amount (chemistry convention): boundary work for closed systems, shaft work for flow */
  readonly w: number
  readonly du: number
  readonly dh: number
  readonly ds: number
  /** regenerator steps: heat exchanged inside the cycle, not with the surroundings */
  readonly internal: boolean
}

export interface CycleTotals {
  /** heat from the surroundings (sum of positive q of external steps), per unit amount */
  readonly qIn: number
  /** heat to the surroundings, as a positive number */
  readonly qOut: number
  /** net work done ON the gas per cycle (chemistry); −wNet is the work delivered */
  readonly wNet: number
  readonly purpose: 'engine' | 'refrigerator' | 'heat-pump'
  readonly efficiency: number | null
  readonly copRefrigerator: number | null
  readonly copHeatPump: number | null
  /** mean effective pressure, Pa (closed cycles) */
  readonly mep: number | null
  /** compressor work / turbine work (flow cycles) */
  readonly backWorkRatio: number | null
  readonly Tmin: number
  readonly Tmax: number
  /** Carnot bound between the extreme temperatures: efficiency for engines, COP otherwise */
  readonly carnotBound: number
  /** per unit amount, J/(K·unit); null without both reservoir temperatures */
  readonly entropyGenerated: number | null
  /** closures: should be 0 to rounding */
  readonly duCycle: number
  readonly dsCycle: number
}

export interface CycleSolution {
  readonly ok: true
  readonly gas: Gas
  readonly system: 'closed' | 'flow'
  /** mol or kg (gas.basis), or null when only intensive data were given */
  readonly amount: number | null
  readonly states: readonly StateResult[]
  readonly steps: readonly StepResult[]
  readonly totals: CycleTotals
}

export type CycleResult = CycleSolution | { readonly ok: false; readonly error: SolveError }

// ---------------------------------------------------------------------------------------
// Internals. Properties are indexed P = 0, V = 1 (specific volume), T = 2.

const P = 0
const V = 1
const T = 2
const PROP = ['p', 'v', 'T'] as const
const PROP_WORD = ['pressure', 'specific volume', 'temperature'] as const
const UNKNOWN = -9
const GIVEN = -1
const GAS_LAW = -2
const FROM_AMOUNT = -3
const TOL = 1e-6
const Y_ORDER = [-1, T, P, V] as const
const X_ORDER = [P, T, V] as const

const fail = (
  code: SolveErrorCode,
  message: string,
  extra: Partial<SolveError> = {},
): { ok: false; error: SolveError } => ({
  ok: false,
  error: { code, message, ...extra },
})

function equalityProp(s: StepSpec): number {
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

function ratioOf(s: StepSpec, prop: number): number | undefined {
  return prop === P ? s.pressureRatio : prop === V ? s.volumeRatio : s.temperatureRatio
}

function isForced(s: StepSpec, prop: number): boolean {
  return equalityProp(s) === prop || ratioOf(s, prop) !== undefined
}

function relClose(a: number, b: number, tol = TOL): boolean {
  return Math.abs(a - b) <= tol * Math.max(Math.abs(a), Math.abs(b))
}

/**
 * The end state b of step s from a full state a (dir = +1), or the start state from a full end
 * state (dir = −1), given at most one more property of b (Y = P, V, T or −1). Returns false
 * if the relation does not fix b with what is known. Writes into out[0..2].
 */
function predict(
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

function isFullTriple(out: Float64Array): boolean {
  return !(Number.isNaN(out[0]!) || Number.isNaN(out[1]!) || Number.isNaN(out[2]!))
}

function gasLawInto(R: number, out: Float64Array): void {
  const pn = Number.isNaN(out[P]!)
  const vn = Number.isNaN(out[V]!)
  const tn = Number.isNaN(out[T]!)
  if (pn && !vn && !tn) out[P] = (R * out[T]!) / out[V]!
  else if (vn && !pn && !tn) out[V] = (R * out[T]!) / out[P]!
  else if (tn && !pn && !vn) out[T] = (out[P]! * out[V]!) / R
}

function applyRelation(
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

function fmtValue(prop: number, x: number, basis: 'mole' | 'mass'): string {
  const sig = (y: number) => Number(y.toPrecision(4)).toString()
  if (prop === P) return Math.abs(x) >= 1e7 ? `${sig(x / 1e6)} MPa` : `${sig(x / 1e3)} kPa`
  if (prop === T) return `${sig(x)} K`
  return `${sig(x)} m³/${basis === 'mass' ? 'kg' : 'mol'}`
}

function describeStep(s: StepSpec, k: number, from: number, to: number): string {
  const what =
    s.process === 'adiabatic'
      ? `adiabatic (η = ${s.efficiency ?? 1})`
      : s.process === 'polytropic'
        ? `polytropic (n = ${s.n})`
        : s.process
  return `the ${what} step ${from + 1}→${to + 1}`
}

/**
 * Working state of one solve. A class (not closures inside solveCycle) so that no function
 * objects are created per solve: that, and plain arrays, keep a variant in microseconds.
 */
class Work {
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
  checkStep(s: StepSpec, k: number, i: number, j: number, q: number): { ok: false; error: SolveError } | null {
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

/**
 * Solve a cycle. Returns the per-unit-amount solution or an error naming the state and the
 * missing or conflicting property.
 */
export function solveCycle(spec: CycleSpec): CycleResult {
  const { gas, states: st, steps } = spec
  const system = spec.system ?? 'closed'
  const N = st.length
  if (N < 2) return fail('invalid-input', 'a cycle needs at least two states')
  if (steps.length !== N)
    return fail(
      'invalid-input',
      `a cycle of ${N} states needs ${N} steps (the last joins state ${N} back to state 1); got ${steps.length}`,
    )
  const R = gas.R
  const basis = gas.basis

  // ---- validate the step data
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

  // ---- state arrays
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

  // ---- propagation
  for (let iter = 0; iter < 4 * N + 8; iter++) {
    c.changed = false
    // amount ↔ total volumes
    for (let i = 0; i < N; i++) {
      const Vt = Vtot[i]!
      if (Number.isNaN(Vt)) continue
      if (!Number.isNaN(c.amount)) c.set(i, V, Vt / c.amount, FROM_AMOUNT)
      else if (c.known(i, V)) {
        c.amount = Vt / val[3 * i + V]!
        c.changed = true
      }
    }
    for (let k = 0; k < N; k++) {
      const s = steps[k]!
      const i = k
      const j = k + 1 === N ? 0 : k + 1
      const fi = c.full(i)
      const fj = c.full(j)
      if (fi && fj) continue
      // single-property transfers (equalities and ratios), both directions
      const eq = equalityProp(s)
      if (eq >= 0) {
        if (c.known(i, eq)) c.set(j, eq, val[3 * i + eq]!, k)
        else if (c.known(j, eq)) c.set(i, eq, val[3 * j + eq]!, k)
      }
      for (let prop = 0; prop < 3; prop++) {
        const r = ratioOf(s, prop)
        if (r === undefined) continue
        if (c.known(i, prop)) c.set(j, prop, val[3 * i + prop]! * r, k)
        else if (c.known(j, prop)) c.set(i, prop, val[3 * j + prop]! / r, k)
      }
      const q = c.heatOf(s)
      if (c.full(i) && !c.full(j)) {
        let Y = -1
        for (let prop = 0; prop < 3 && Y < 0; prop++) if (c.known(j, prop) && !isForced(s, prop)) Y = prop
        if (predict(gas, system, s, q, val, 3 * i, Y, Y >= 0 ? val[3 * j + Y]! : NaN, 1, c.tmp)) {
          for (let n2 = 0; n2 < 3; n2++) c.set(j, (n2 + 2) % 3, c.tmp[(n2 + 2) % 3]!, k) // T first, for the message
        } else if (
          !Number.isNaN(q) ||
          (Y >= 0 && !(Y === T && (s.process === 'adiabatic' || s.process === 'polytropic')))
        ) {
          // The relation had everything it needs, so a NaN came from an inverse function or
          // a root outside the data range: report it as out of range (c.set records it).
          for (let n2 = 0; n2 < 3; n2++) c.set(j, (n2 + 2) % 3, c.tmp[(n2 + 2) % 3]!, k) // T first, for the message
        }
      } else if (c.full(j) && !c.full(i) && s.process !== 'adiabatic') {
        let Y = -1
        for (let prop = 0; prop < 3 && Y < 0; prop++) if (c.known(i, prop) && !isForced(s, prop)) Y = prop
        if (predict(gas, system, s, q, val, 3 * j, Y, Y >= 0 ? val[3 * i + Y]! : NaN, -1, c.tmp)) {
          for (let prop = 0; prop < 3; prop++) c.set(i, prop, c.tmp[prop]!, k)
        }
      }
      if (s.process === 'regenerator' && k < s.partner!) {
        const m = s.partner!
        const res = c.regenOutlets(k, m)
        if (res) {
          const [cs, hs, Tco, Tho] = res
          c.set(cs + 1 === N ? 0 : cs + 1, T, Tco, cs)
          c.set(hs + 1 === N ? 0 : hs + 1, T, Tho, hs)
        }
      }
    }
    if (c.rangeError) return { ok: false, error: c.rangeError }
    if (!c.changed) break
  }

  // ---- underdetermined?
  for (let i = 0; i < N; i++) {
    if (c.full(i)) continue
    const have = [P, V, T].filter((p) => c.known(i, p))
    const nm = c.stateName(i)
    if (have.length === 0) {
      return fail(
        'underdetermined',
        `State ${nm}: neither p, v nor T is fixed: give two of p${nm}, T${nm}, v${nm} (or a ratio or heat on an adjacent step)`,
        { state: i + 1, property: 'T' },
      )
    }
    const missing = [P, V, T].filter((p) => !c.known(i, p))
    const first = missing.includes(T) ? T : missing[0]!
    const names = missing.map((p) => `${PROP[p]}${nm}`)
    return fail(
      'underdetermined',
      `State ${nm}: ${PROP_WORD[first]} is not fixed (only ${have.map((p) => PROP[p]).join(' and ')}${nm} ${have.length === 1 ? 'is' : 'are'} known): give ${names.join(' or ')}`,
      { state: i + 1, property: PROP[first] },
    )
  }
  let needsAmount = false
  for (let k = 0; k < N; k++) if (steps[k]!.heatTotal !== undefined || !Number.isNaN(Vtot[k]!)) needsAmount = true
  if (needsAmount && Number.isNaN(c.amount)) {
    return fail(
      'underdetermined',
      'the amount of gas is not fixed: give the amount (n or m), or p, V and T of one state',
      { property: 'amount' },
    )
  }

  // ---- verification: every relation must hold (over-specified data must agree)
  for (let i = 0; i < N; i++) {
    const Vt = Vtot[i]!
    if (!Number.isNaN(Vt) && !relClose(Vt, c.amount * val[3 * i + V]!)) {
      return fail(
        'conflict',
        `State ${c.stateName(i)}: V given as ${spec.labels?.[`V${i + 1}`] ?? `${Vt} m³`} but the other data require ${Number((c.amount * val[3 * i + V]!).toPrecision(4))} m³`,
        { state: i + 1, property: 'V' },
      )
    }
  }
  for (let k = 0; k < N; k++) {
    const s = steps[k]!
    const i = k
    const j = k + 1 === N ? 0 : k + 1
    const q = c.heatOf(s)
    const conflict = c.checkStep(s, k, i, j, q)
    if (conflict) return conflict
  }
  // A step called an expansion must expand and one called a compression must compress: a
  // Diesel cutoff beyond V1, say, otherwise gives an "expansion" that compresses at absurd
  // temperatures. (Closed systems by volume; steady flow by pressure.)
  for (let k = 0; k < N; k++) {
    const label = steps[k]!.label
    if (!label) continue
    const i = k
    const j = k + 1 === N ? 0 : k + 1
    const byVolume = system === 'closed'
    const a = val[3 * i + (byVolume ? V : P)]!
    const b = val[3 * j + (byVolume ? V : P)]!
    const grows = byVolume ? b > a * (1 + 1e-9) : b < a * (1 - 1e-9)
    const shrinks = byVolume ? b < a * (1 - 1e-9) : b > a * (1 + 1e-9)
    const what = byVolume ? 'volume' : 'pressure'
    if (/\b(expansion|turbine)\b/i.test(label) && shrinks) {
      return fail(
        'unphysical',
        `Step ${k + 1} (${label}) would compress the gas: its ${what} goes from ${Number(a.toPrecision(4))} to ${Number(b.toPrecision(4))}. Check the data that fix state ${c.stateName(j)} (for a Diesel or dual cycle, the cutoff ratio must be below the compression ratio).`,
        { step: k + 1 },
      )
    }
    if (/\bcompress(ion|or)\b/i.test(label) && grows) {
      return fail(
        'unphysical',
        `Step ${k + 1} (${label}) would expand the gas: its ${what} goes from ${Number(a.toPrecision(4))} to ${Number(b.toPrecision(4))}. Check the data that fix state ${c.stateName(j)}.`,
        { step: k + 1 },
      )
    }
  }

  // ---- results
  const lnG = gas.ln
  const states: StateResult[] = new Array(N)
  for (let i = 0; i < N; i++) {
    const p = val[3 * i]!
    const v = val[3 * i + 1]!
    const Ti = val[3 * i + 2]!
    states[i] = { name: c.stateName(i), p, v, T: Ti, u: gas.u(Ti), h: gas.h(Ti), s: gas.sT(Ti) - R * lnG(p / P_REF) }
  }
  const results: StepResult[] = new Array(N)
  let qIn = 0
  let qOut = 0
  let wNet = 0
  let wCompIn = 0
  let wTurbOut = 0
  let duCycle = 0
  let dsCycle = 0
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
    if (!internal) {
      if (q > 0) qIn += q
      else qOut -= q
    }
    wNet += w
    if (w > 0) wCompIn += w
    else wTurbOut -= w
    duCycle += du
    dsCycle += ds
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
  let Tmin = Infinity
  let Tmax = -Infinity
  let vmin = Infinity
  let vmax = -Infinity
  for (const s of states) {
    if (s.T < Tmin) Tmin = s.T
    if (s.T > Tmax) Tmax = s.T
    if (s.v < vmin) vmin = s.v
    if (s.v > vmax) vmax = s.v
  }
  const wBy = -wNet
  const purpose = spec.purpose ?? (wBy > 0 ? 'engine' : 'refrigerator')
  const isEngine = purpose === 'engine'
  const efficiency = isEngine && qIn > 0 ? wBy / qIn : null
  const copRefrigerator = !isEngine && wNet > 0 ? qIn / wNet : null
  const copHeatPump = !isEngine && wNet > 0 ? qOut / wNet : null
  const carnotBound = isEngine
    ? 1 - Tmin / Tmax
    : purpose === 'refrigerator'
      ? Tmin / (Tmax - Tmin)
      : Tmax / (Tmax - Tmin)
  const mep = system === 'closed' && vmax > vmin ? wBy / (vmax - vmin) : null
  const backWorkRatio = system === 'flow' && wTurbOut > 0 ? wCompIn / wTurbOut : null
  const TH = spec.reservoirs?.hot
  const TC = spec.reservoirs?.cold
  let entropyGenerated: number | null = null
  if (TH !== undefined && TC !== undefined) {
    if (!(TH > 0 && TC > 0 && TH > TC))
      return fail('invalid-input', 'reservoir temperatures must be positive, hot above cold', {
        property: 'reservoirs',
      })
    // ΔS_gas = 0 per cycle, so S_gen = Σ Q_to_reservoir / T_reservoir
    entropyGenerated = isEngine ? qOut / TC - qIn / TH : qOut / TH - qIn / TC
  }
  return {
    ok: true,
    gas,
    system,
    amount: Number.isNaN(c.amount) ? null : c.amount,
    states,
    steps: results,
    totals: {
      qIn,
      qOut,
      wNet,
      purpose,
      efficiency,
      copRefrigerator,
      copHeatPump,
      mep,
      backWorkRatio,
      Tmin,
      Tmax,
      carnotBound,
      entropyGenerated,
      duCycle,
      dsCycle,
    },
  }
}
