// Water and steam in the general cycle format: states joined by reversible processes
// (isobaric, isochoric, isothermal, isentropic), in a closed system (piston-cylinder) or in
// steady flow, with q, w, ΔU, ΔH, ΔS for every step. A vapour Carnot cycle inside the dome is
// the template 'steam-carnot' (solveSteamCarnot).
//
// A state is fixed by two of p, T, x, v, h, s. A state may give fewer: the step arriving at it
// carries its constant property forward (isobaric p, isochoric v, isothermal T, isentropic s),
// and in a cycle the step leaving it carries the next state's constant property back, until
// every state has two. Pairs: (p, T), (p, x), (T, x), (p, h), (p, s), (p, v), (T, s), (T, v).
//
// Work and heat, per kg (engineering sign, W done BY the water; reversible processes):
//   closed: isobaric W = p Δv, isochoric W = 0, isothermal Q = T Δs, isentropic Q = 0, and
//           Q = ΔU + W;
//   flow:   technical work W = -∫v dp: isobaric W = 0, isochoric W = -v Δp, isothermal
//           Q = T Δs, isentropic Q = 0, and Q = ΔH + W.
// Units SI (Pa, K, J/kg, J/(kg K), m^3/kg); totals also for the mass given (kg).
//
// Errors: SteamResult; bad input is a result error with a message, never a throw.
// Teaching tool: not design data; defer to the applicable codes and licensed engineering practice.
import { isOneOf, isRecord } from '../json.ts'
import { CONVENTIONS, isConvention } from '../conventions.ts'
import type { Convention, ConventionStatement } from '../conventions.ts'
import { readValue } from '../spec.ts'
import type { Dimension, Quantity } from '../units.ts'
import { fail, ok } from './errors.ts'
import type { SteamError, SteamResult } from './errors.ts'
import {
  stateFromPH,
  stateFromPS,
  stateFromPT,
  stateFromPV,
  stateFromPx,
  stateFromTS,
  stateFromTV,
  stateFromTx,
} from './properties.ts'
import type { SteamState } from './properties.ts'

export const STEAM_CYCLE_CAUTION =
  'Teaching tool: reversible textbook processes of water with IAPWS-IF97 properties, not design data. Defer to the applicable codes and licensed engineering practice.'

export type SteamProcess = 'isobaric' | 'isochoric' | 'isothermal' | 'isentropic'
export const STEAM_PROCESSES: readonly SteamProcess[] = ['isobaric', 'isochoric', 'isothermal', 'isentropic']

export interface SteamStateGiven {
  name?: string
  p?: number
  T?: number
  x?: number
  v?: number
  h?: number
  s?: number
}

export interface SteamStepGiven {
  process: SteamProcess
  label?: string
}

export interface SteamCycleInput {
  system: 'closed' | 'flow'
  /** kg; default 1 (then totals equal the per-kg values). */
  mass?: number
  states: SteamStateGiven[]
  /** steps[i] joins states[i] and states[i + 1]; in a cycle the last step joins the last state to the first. */
  steps: SteamStepGiven[]
}

export interface SteamStepResult {
  from: string
  to: string
  process: SteamProcess
  label: string
  /** Per kg, J/kg and J/(kg K); engineering sign (q to the water, w by the water). */
  q: number
  w: number
  dU: number
  dH: number
  dS: number
}

export interface SteamCycleResult {
  system: 'closed' | 'flow'
  mass: number
  isCycle: boolean
  states: (SteamState & { name: string })[]
  steps: SteamStepResult[]
  /** Sums over the steps, per kg. */
  netHeat: number
  netWork: number
  /** Heat taken in (sum of the positive q) and given out (magnitude of the negative q), per kg. */
  heatIn: number
  heatOut: number
  /** For a cycle doing net work: netWork / heatIn; otherwise null. */
  efficiency: number | null
  caution: string
}

const KEYS = ['p', 'T', 'x', 'v', 'h', 's'] as const
type Key = (typeof KEYS)[number]
/** The property a process holds constant: always one a solved state has as a number (not x, null off the dome). */
type CarriedKey = 'p' | 'v' | 'T' | 's'
const CONSTANT: Record<SteamProcess, CarriedKey> = { isobaric: 'p', isochoric: 'v', isothermal: 'T', isentropic: 's' }

/**
 * A cycle as read from a spec, before solve checks it: the system and each step's process are
 * whatever the author wrote until solve has checked them (a SteamCycleInput is one too).
 */
interface SteamCycleDraft {
  system: unknown
  mass?: number
  states: SteamStateGiven[]
  steps: { process: unknown; label?: string }[]
}

function bad(message: string, property?: string): SteamResult<never> {
  const e: SteamError = { code: 'invalid-input', message }
  if (property) e.property = property
  return fail(e)
}

function fix(g: Partial<Record<Key, number>>): SteamResult<SteamState> | null {
  const has = (k: Key) => g[k] !== undefined
  if (has('p') && has('T')) return stateFromPT(g.p!, g.T!)
  if (has('p') && has('x')) return stateFromPx(g.p!, g.x!)
  if (has('T') && has('x')) return stateFromTx(g.T!, g.x!)
  if (has('p') && has('h')) return stateFromPH(g.p!, g.h!)
  if (has('p') && has('s')) return stateFromPS(g.p!, g.s!)
  if (has('p') && has('v')) return stateFromPV(g.p!, g.v!)
  if (has('T') && has('s')) return stateFromTS(g.T!, g.s!)
  if (has('T') && has('v')) return stateFromTV(g.T!, g.v!)
  return null
}

const close = (a: number, b: number) => Math.abs(a - b) <= 1e-7 * Math.max(Math.abs(a), Math.abs(b), 1e-9) + 1e-9

/** Solve states and steps. Never throws. */
export function solveSteamCycle(input: SteamCycleInput): SteamResult<SteamCycleResult> {
  return solveDraft(input)
}

function solveDraft(input: SteamCycleDraft): SteamResult<SteamCycleResult> {
  try {
    return solve(input)
  } catch (e) {
    return fail({
      code: 'no-convergence',
      message: `internal error in the steam-cycle solver: ${e instanceof Error ? e.message : String(e)}`,
    })
  }
}

function solve(input: SteamCycleDraft): SteamResult<SteamCycleResult> {
  if (typeof input !== 'object' || input === null)
    return bad('the steam cycle must be an object with system, states and steps')
  const system = input.system
  if (system !== 'closed' && system !== 'flow')
    return bad('system must be "closed" (piston-cylinder) or "flow" (steady-flow devices)', 'system')
  const mass = input.mass ?? 1
  if (typeof mass !== 'number' || !Number.isFinite(mass) || !(mass > 0))
    return bad('mass must be a positive number of kilograms', 'mass')
  const n = Array.isArray(input.states) ? input.states.length : 0
  if (n < 2 || n > 20) return bad('give between 2 and 20 states', 'states')
  if (!Array.isArray(input.steps)) return bad('steps must be a list', 'steps')
  const isCycle = input.steps.length === n
  if (!isCycle && input.steps.length !== n - 1)
    return bad(
      `with ${n} states give ${n - 1} steps (an open path) or ${n} (a cycle back to the first state); got ${input.steps.length}`,
      'steps',
    )
  const processes: SteamProcess[] = []
  for (let i = 0; i < input.steps.length; i++) {
    const st = input.steps[i]
    if (!st || !isOneOf(STEAM_PROCESSES, st.process))
      return bad(`step ${i + 1}: process must be one of ${STEAM_PROCESSES.join(', ')}`, `steps.${i}.process`)
    processes.push(st.process)
  }
  const names = input.states.map((s, i) =>
    s && typeof s.name === 'string' && s.name.trim() ? s.name.trim() : String(i + 1),
  )
  if (new Set(names).size !== names.length) return bad('state names must differ', 'states')

  // Given properties, then inheritance along the steps until nothing changes.
  const given: Partial<Record<Key, number>>[] = []
  for (let i = 0; i < n; i++) {
    const s = input.states[i]
    if (typeof s !== 'object' || s === null) return bad(`state ${names[i]} must be an object`, `states.${i}`)
    const g: Partial<Record<Key, number>> = {}
    for (const k of KEYS) {
      const v = s[k]
      if (v === undefined) continue
      if (typeof v !== 'number' || !Number.isFinite(v))
        return bad(`state ${names[i]}: ${k} must be a finite number`, `states.${i}.${k}`)
      g[k] = v
    }
    if (Object.keys(g).length > 2)
      return bad(`state ${names[i]}: give at most two of p, T, x, v, h, s (two fix a state of water)`, `states.${i}`)
    given.push(g)
  }
  const solved: (SteamState | null)[] = new Array<SteamState | null>(n).fill(null)
  const stepEnds = (k: number) => [k, (k + 1) % n] as const
  let progress = true
  while (progress) {
    progress = false
    for (let i = 0; i < n; i++) {
      if (solved[i]) continue
      if (Object.keys(given[i]!).length === 2) {
        const r = fix(given[i]!)
        if (r === null)
          return bad(
            `state ${names[i]}: the pair ${Object.keys(given[i]!).join(', ')} is not one this solver takes; use p or T with one of x, v, h, s (or p with T)`,
            `states.${i}`,
          )
        if (!r.ok)
          return {
            ok: false,
            error: {
              ...r.error,
              property: `states.${i}.${r.error.property ?? ''}`.replace(/\.$/, ''),
              message: `state ${names[i]}: ${r.error.message}`,
            },
          }
        solved[i] = r.value
        progress = true
      }
    }
    for (let k = 0; k < input.steps.length; k++) {
      const [a, b] = stepEnds(k)
      const key = CONSTANT[processes[k]!]
      for (const [src, dst] of [
        [a, b],
        [b, a],
      ] as const) {
        const s = solved[src]
        const g = given[dst]!
        if (s && !solved[dst] && g[key] === undefined && Object.keys(g).length < 2) {
          g[key] = s[key]
          progress = true
        }
      }
    }
  }
  for (let i = 0; i < n; i++)
    if (!solved[i])
      return bad(
        `state ${names[i]} is not fixed: give two of p, T, x, v, h, s, or one with a step that carries the other (isobaric p, isochoric v, isothermal T, isentropic s)`,
        `states.${i}`,
      )

  const states = solved.map((s, i) => ({ ...s!, name: names[i]! }))
  const steps: SteamStepResult[] = []
  for (let k = 0; k < input.steps.length; k++) {
    const [a, b] = stepEnds(k)
    const A = states[a]!
    const B = states[b]!
    const proc = processes[k]!
    const key = CONSTANT[proc]
    if (!close(A[key], B[key]))
      return bad(
        `step ${k + 1} (${names[a]} → ${names[b]}) is ${proc}, but ${key} changes from ${A[key]} to ${B[key]}: the given states do not lie on one ${proc} process`,
        `steps.${k}.process`,
      )
    const dU = B.u - A.u
    const dH = B.h - A.h
    const dS = B.s - A.s
    let q: number
    let w: number
    if (system === 'closed') {
      if (proc === 'isobaric') w = A.p * (B.v - A.v)
      else if (proc === 'isochoric') w = 0
      else if (proc === 'isothermal') w = A.T * dS - dU
      else w = -dU
      q = proc === 'isothermal' ? A.T * dS : proc === 'isentropic' ? 0 : dU + w
    } else {
      if (proc === 'isobaric') w = 0
      else if (proc === 'isochoric') w = -A.v * (B.p - A.p)
      else if (proc === 'isothermal') w = A.T * dS - dH
      else w = -dH
      q = proc === 'isothermal' ? A.T * dS : proc === 'isentropic' ? 0 : dH + w
    }
    steps.push({
      from: names[a]!,
      to: names[b]!,
      process: proc,
      label: input.steps[k]!.label ?? `${names[a]} → ${names[b]}`,
      q,
      w,
      dU,
      dH,
      dS,
    })
  }
  const netHeat = steps.reduce((x, s) => x + s.q, 0)
  const netWork = steps.reduce((x, s) => x + s.w, 0)
  const heatIn = steps.reduce((x, s) => x + Math.max(s.q, 0), 0)
  const heatOut = -steps.reduce((x, s) => x + Math.min(s.q, 0), 0)
  return ok({
    system,
    mass,
    isCycle,
    states,
    steps,
    netHeat,
    netWork,
    heatIn,
    heatOut,
    efficiency: isCycle && netWork > 0 && heatIn > 0 ? netWork / heatIn : null,
    caution: STEAM_CYCLE_CAUTION,
  })
}

export interface SteamCarnotInput {
  /** Temperature of heat addition (inside the dome), K. */
  hotTemperature: number
  /** Temperature of heat rejection, K. */
  coldTemperature: number
  /** Quality at the start and end of heat addition; defaults 0 and 1. */
  qualityStart?: number
  qualityEnd?: number
}

/**
 * Vapour Carnot cycle inside the dome, steady flow: 1 (T_H, x_start) → isothermal heat addition
 * → 2 (T_H, x_end) → isentropic expansion → 3 (T_L) → isothermal heat rejection → 4 (T_L) →
 * isentropic compression → 1.
 */
export function solveSteamCarnot(input: SteamCarnotInput): SteamResult<SteamCycleResult> {
  const { hotTemperature: TH, coldTemperature: TL } = input
  const x1 = input.qualityStart ?? 0
  const x2 = input.qualityEnd ?? 1
  for (const [name, v] of [
    ['hotTemperature', TH],
    ['coldTemperature', TL],
    ['qualityStart', x1],
    ['qualityEnd', x2],
  ] as const)
    if (typeof v !== 'number' || !Number.isFinite(v)) return bad(`${name} must be a finite number`, name)
  if (!(TL < TH)) return bad('the cold temperature must be below the hot temperature', 'coldTemperature')
  if (!(TH < 647.096))
    return bad(
      'a vapour Carnot cycle inside the dome needs the hot temperature below the critical temperature 647.096 K',
      'hotTemperature',
    )
  if (x1 < 0 || x1 > 1) return bad(`qualityStart x = ${x1} must lie in [0, 1]`, 'qualityStart')
  if (x2 < 0 || x2 > 1) return bad(`qualityEnd x = ${x2} must lie in [0, 1]`, 'qualityEnd')
  if (!(x2 > x1)) return bad('heat addition must raise the quality: qualityEnd must exceed qualityStart', 'qualityEnd')
  const r = solveSteamCycle({
    system: 'flow',
    states: [
      { name: '1', T: TH, x: x1 },
      { name: '2', T: TH, x: x2 },
      { name: '3', T: TL },
      { name: '4', T: TL },
    ],
    steps: [
      { process: 'isothermal', label: 'boiler: heat addition at T_H' },
      { process: 'isentropic', label: 'turbine: isentropic expansion' },
      { process: 'isothermal', label: 'condenser: heat rejection at T_L' },
      { process: 'isentropic', label: 'compressor: isentropic compression of the wet mixture' },
    ],
  })
  if (!r.ok) return r
  const out = r.value.states
  for (const [i, st] of [out[2]!, out[3]!].entries())
    if (st.x === null)
      return bad(
        `state ${i + 3} falls outside the dome at the cold temperature: choose qualities so that both isentropes stay inside the dome`,
        'coldTemperature',
      )
  return r
}

// --- spec layer -----------------------------------------------------------------------------------
// { "steamCycle": { "system": "closed" | "flow", "mass"?: "2 kg", "states": [{ "name"?, "p"?: "1 MPa",
//   "T"?: "200 °C", "x"?: 0.5, "v"?: "0.2 m^3/kg", "h"?: "2800 kJ/kg", "s"?: "6.5 kJ/(kg K)" }],
//   "steps": [{ "process": "isobaric", "label"? }] }, "convention"?: ... }
// or { "template": "steam-carnot", "inputs": { "hotTemperature": "250 °C", "coldTemperature":
//   "50 °C", "qualityStart"?: 0, "qualityEnd"?: 1 } }.
// Not dispatched by solveSpec (its output is not a Rankine or ideal-gas result): use
// solveSteamCycleSpec.

export const STEAM_CARNOT_TEMPLATE = {
  id: 'steam-carnot',
  title: 'Vapour Carnot cycle inside the dome (water/steam, IAPWS-IF97)',
  description:
    'Steady flow: isothermal heat addition at hotTemperature from qualityStart to qualityEnd, isentropic expansion, isothermal heat rejection at coldTemperature, isentropic compression of the wet mixture.',
  inputs: [
    {
      name: 'hotTemperature',
      dimension: 'temperature',
      unit: '°C or K',
      description: 'temperature of heat addition, below 373.946 °C',
      required: true,
    },
    {
      name: 'coldTemperature',
      dimension: 'temperature',
      unit: '°C or K',
      description: 'temperature of heat rejection',
      required: true,
    },
    {
      name: 'qualityStart',
      dimension: 'dimensionless',
      unit: '',
      description: 'quality entering the boiler (default 0)',
      required: false,
    },
    {
      name: 'qualityEnd',
      dimension: 'dimensionless',
      unit: '',
      description: 'quality leaving the boiler (default 1)',
      required: false,
    },
  ],
} as const

export interface FormattedSteamCycle {
  readonly ok: true
  readonly template: string | null
  readonly substance: 'water (IAPWS-IF97)'
  readonly system: 'closed' | 'flow'
  readonly basis: string
  readonly convention: ConventionStatement & { readonly statement: string }
  readonly states: readonly {
    readonly name: string
    readonly p: Quantity
    readonly T: Quantity
    readonly v: Quantity
    readonly u: Quantity
    readonly h: Quantity
    readonly s: Quantity
    readonly x: number | null
    readonly phase: string
  }[]
  readonly steps: readonly {
    readonly from: string
    readonly to: string
    readonly process: string
    readonly label: string
    readonly q: Quantity
    readonly w: Quantity
    readonly dU: Quantity
    readonly dH: Quantity
    readonly dS: Quantity
    readonly total: {
      readonly q: Quantity
      readonly w: Quantity
      readonly dU: Quantity
      readonly dH: Quantity
      readonly dS: Quantity
    }
  }[]
  readonly totals: {
    readonly netHeat: Quantity
    readonly netWork: Quantity
    readonly heatIn: Quantity
    readonly heatOut: Quantity
    readonly efficiency: Quantity | null
  }
  readonly notice: string
}

export interface SteamCycleFailure {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

const Q = (value: number, unit: string): Quantity => ({ value, unit })

/** JSON-ready result in one convention (chemistry: w is the work done ON the water, = -W). */
export function formatSteamCycle(
  r: SteamCycleResult,
  convention: Convention,
  template: string | null = null,
): FormattedSteamCycle {
  const sign = convention === 'engineering' ? 1 : -1
  const statement =
    convention === 'engineering'
      ? `${r.system === 'closed' ? 'ΔU = Q − W' : 'Δh = q − w (steady flow)'}: Q is heat added to the water, W is work done BY the water.`
      : `${r.system === 'closed' ? 'ΔU = q + w' : 'Δh = q + w (steady flow)'}: q is heat added to the water, w is work done ON the water.`
  const J = 'J/kg'
  const m = r.mass
  return {
    ok: true,
    template,
    substance: 'water (IAPWS-IF97)',
    system: r.system,
    basis: `per kg of water; "total" for ${m} kg`,
    convention: { ...CONVENTIONS[convention], statement },
    states: r.states.map((s) => ({
      name: s.name,
      p: Q(s.p, 'Pa'),
      T: Q(s.T, 'K'),
      v: Q(s.v, 'm^3/kg'),
      u: Q(s.u, J),
      h: Q(s.h, J),
      s: Q(s.s, 'J/(kg K)'),
      x: s.x,
      phase: s.phase,
    })),
    steps: r.steps.map((s) => ({
      from: s.from,
      to: s.to,
      process: s.process,
      label: s.label,
      q: Q(s.q, J),
      w: Q(sign * s.w, J),
      dU: Q(s.dU, J),
      dH: Q(s.dH, J),
      dS: Q(s.dS, 'J/(kg K)'),
      total: {
        q: Q(m * s.q, 'J'),
        w: Q(m * sign * s.w, 'J'),
        dU: Q(m * s.dU, 'J'),
        dH: Q(m * s.dH, 'J'),
        dS: Q(m * s.dS, 'J/K'),
      },
    })),
    totals: {
      netHeat: Q(r.netHeat, J),
      netWork: Q(sign * r.netWork, J),
      heatIn: Q(r.heatIn, J),
      heatOut: Q(r.heatOut, J),
      efficiency: r.efficiency === null ? null : Q(r.efficiency, ''),
    },
    notice: r.caution,
  }
}

const DIMS: Record<Key, Dimension> = {
  p: 'pressure',
  T: 'temperature',
  x: 'dimensionless',
  v: 'specificVolume',
  h: 'specificEnergy',
  s: 'specificHeat',
}

function failure(code: string, message: string, property?: string): SteamCycleFailure {
  return { ok: false, error: { code, message, ...(property ? { property } : {}) } }
}

function fromSteam(
  r: SteamResult<SteamCycleResult>,
  convention: Convention,
  template: string | null,
): FormattedSteamCycle | SteamCycleFailure {
  if (!r.ok) return failure(r.error.code, r.error.message, r.error.property)
  return formatSteamCycle(r.value, convention, template)
}

/** A whole spec ({ steamCycle } or { template: "steam-carnot", inputs }). Never throws. */
export function solveSteamCycleSpec(raw: unknown): FormattedSteamCycle | SteamCycleFailure {
  try {
    if (!isRecord(raw)) return failure('invalid-spec', 'a spec must be a JSON object with "steamCycle" or "template"')
    const r = raw
    const conv = r.convention ?? 'engineering'
    if (!isConvention(conv))
      return failure(
        'invalid-spec',
        `convention must be "chemistry" or "engineering", not ${JSON.stringify(conv)}`,
        'convention',
      )
    if (r.template !== undefined) {
      if (r.template !== STEAM_CARNOT_TEMPLATE.id)
        return failure('invalid-spec', `template must be "${STEAM_CARNOT_TEMPLATE.id}" here`, 'template')
      const inputs = r.inputs ?? {}
      if (!isRecord(inputs)) return failure('invalid-spec', 'inputs must be an object', 'inputs')
      const known = new Set<string>(STEAM_CARNOT_TEMPLATE.inputs.map((i) => i.name))
      for (const k of Object.keys(inputs))
        if (!known.has(k))
          return failure('invalid-spec', `unknown input "${k}"; this template takes ${[...known].join(', ')}`, k)
      const num: Record<string, number> = {}
      for (const inp of STEAM_CARNOT_TEMPLATE.inputs) {
        const x = inputs[inp.name]
        if (x === undefined) {
          if (inp.required)
            return failure('invalid-spec', `input "${inp.name}" is required: ${inp.description}`, inp.name)
          continue
        }
        const v = readValue(
          typeof x === 'number' && inp.dimension === 'dimensionless' ? String(x) : x,
          [inp.dimension],
          inp.name,
        )
        if (!v.ok) return failure(v.error.code, v.error.message, inp.name)
        num[inp.name] = v.value.value
      }
      const carnot: SteamCarnotInput = { hotTemperature: num.hotTemperature!, coldTemperature: num.coldTemperature! }
      if (num.qualityStart !== undefined) carnot.qualityStart = num.qualityStart
      if (num.qualityEnd !== undefined) carnot.qualityEnd = num.qualityEnd
      return fromSteam(solveSteamCarnot(carnot), conv, STEAM_CARNOT_TEMPLATE.id)
    }
    const c = r.steamCycle
    if (!isRecord(c))
      return failure('invalid-spec', 'steamCycle must be an object with system, states and steps', 'steamCycle')
    const sc = c
    for (const k of Object.keys(sc))
      if (!['system', 'mass', 'states', 'steps'].includes(k))
        return failure(
          'invalid-spec',
          `unknown field "${k}" in steamCycle; it takes system, mass, states, steps`,
          `steamCycle.${k}`,
        )
    let mass: number | undefined
    if (sc.mass !== undefined) {
      const v = readValue(sc.mass, ['mass'], 'steamCycle.mass')
      if (!v.ok) return failure(v.error.code, v.error.message, 'steamCycle.mass')
      mass = v.value.value
    }
    if (!Array.isArray(sc.states))
      return failure('invalid-spec', 'steamCycle.states must be a list', 'steamCycle.states')
    if (!Array.isArray(sc.steps)) return failure('invalid-spec', 'steamCycle.steps must be a list', 'steamCycle.steps')
    const states: SteamStateGiven[] = []
    for (let i = 0; i < sc.states.length; i++) {
      const s: unknown = sc.states[i]
      if (!isRecord(s)) return failure('invalid-spec', `state ${i + 1} must be an object`, `steamCycle.states.${i}`)
      const o = s
      const g: SteamStateGiven = {}
      for (const k of Object.keys(o)) {
        if (k === 'name') {
          if (typeof o.name !== 'string')
            return failure('invalid-spec', `state ${i + 1}: name must be text`, `steamCycle.states.${i}.name`)
          g.name = o.name
          continue
        }
        if (!isOneOf(KEYS, k))
          return failure(
            'invalid-spec',
            `state ${i + 1}: unknown property "${k}"; a state takes name and two of p, T, x, v, h, s`,
            `steamCycle.states.${i}.${k}`,
          )
        const key = k
        const raw = o[key]
        const v = readValue(
          typeof raw === 'number' && key === 'x' ? String(raw) : raw,
          [DIMS[key]],
          `steamCycle.states.${i}.${key}`,
        )
        if (!v.ok) return failure(v.error.code, v.error.message, `steamCycle.states.${i}.${key}`)
        g[key] = v.value.value
      }
      states.push(g)
    }
    // process and system go to the solver as written: it checks them (same messages as for a
    // SteamCycleInput). A list given as a step is an object here too, one without a process.
    const steps: SteamCycleDraft['steps'] = []
    for (let i = 0; i < sc.steps.length; i++) {
      const s: unknown = sc.steps[i]
      if (typeof s !== 'object' || s === null)
        return failure('invalid-spec', `step ${i + 1} must be an object with a process`, `steamCycle.steps.${i}`)
      const step: SteamCycleDraft['steps'][number] = { process: 'process' in s ? s.process : undefined }
      if ('label' in s && typeof s.label === 'string') step.label = s.label
      steps.push(step)
    }
    const input: SteamCycleDraft = { system: sc.system, states, steps }
    if (mass !== undefined) input.mass = mass
    const res = solveDraft(input)
    if (!res.ok && res.error.property)
      return failure(res.error.code, res.error.message, `steamCycle.${res.error.property}`)
    return fromSteam(res, conv, null)
  } catch (e) {
    return failure('internal', `internal error: ${e instanceof Error ? e.message : String(e)}`)
  }
}
