/**
 * The second-law and rate inputs every ideal-gas template takes, declared once: the
 * temperatures of the bodies the cycle's heat comes from and goes to, the dead state for
 * exergy, and a mass flow rate for powers. Each template's `build` lists the role of each of
 * its steps (heat in from the source, heat out to the sink, or neither) and ends with
 * `withSecondLaw`, which checks these inputs and puts them on the spec:
 *
 *   - `sourceTemperature` becomes the `boundaryTemperature` of the heat-addition steps and
 *     `sinkTemperature` that of the heat-rejection steps. The roles come from the step kinds
 *     (the build runs before the solver knows the signs of q), so a step given heat the other
 *     way round is judged against the body it was meant to exchange with: the solver's
 *     warnings then say the heat flows against the temperature difference.
 *     For an engine the source is the hot reservoir and the sink the cold one (the
 *     surroundings); for a refrigerator or heat pump the source is the cold space (heat taken
 *     in) and the sink the warm space (heat delivered). They are also the spec's reservoirs,
 *     so the second-law efficiency against the reversible cycle between them follows.
 *   - `deadStateTemperature` and `deadStatePressure` (both or neither) are the spec's dead
 *     state (T0, p0): exergy destroyed T0·s_gen, the states' exergies, the exergy efficiency.
 *   - `massFlow` (kg/s, or mol/s) is the gas through the cycle per second. Steady-flow cycles
 *     put it on the spec as `flowRate`; closed (piston) cycles read it as the mass of working
 *     fluid taken through the cycle per second (mass per cycle × cycles per second, as texts
 *     do for engine power) and hand it to `solve` as `cycleRate` (see BuildResult). Either
 *     way the rates are the per-unit values times it: net power ṁ·w_net, Ṡ_gen = ṁ·s_gen.
 *
 * The older `reservoirHot` / `reservoirCold` inputs stay (the spec's reservoirs, read by the
 * solver according to the purpose); they cannot be mixed with the source and sink.
 */
import type { CycleSpec, StepSpec } from '../cycle.ts'
import type { BuildResult, TemplateInput, TemplateValues } from './types.ts'

/** What a template step exchanges heat with: the source (heat in), the sink (heat out), or nothing (adiabatic, internal). */
export type HeatRole = 'source' | 'sink' | null

export const SOURCE_TEMPERATURE: TemplateInput = {
  name: 'sourceTemperature',
  dimension: 'temperature',
  unit: 'K',
  description:
    'temperature of the body the heat comes in from (an engine’s hot reservoir; a refrigerator’s or heat pump’s cold space), the boundary of the heat-addition steps, for the entropy generated (optional)',
  required: false,
}
export const SINK_TEMPERATURE: TemplateInput = {
  name: 'sinkTemperature',
  dimension: 'temperature',
  unit: 'K',
  description:
    'temperature of the body the heat goes to (an engine’s cold reservoir or surroundings; a refrigerator’s or heat pump’s warm space), the boundary of the heat-rejection steps (optional)',
  required: false,
}
export const DEAD_STATE_TEMPERATURE: TemplateInput = {
  name: 'deadStateTemperature',
  dimension: 'temperature',
  unit: 'K',
  description: 'temperature T0 of the surroundings (dead state) for exergy; give it with deadStatePressure (optional)',
  required: false,
}
export const DEAD_STATE_PRESSURE: TemplateInput = {
  name: 'deadStatePressure',
  dimension: 'pressure',
  unit: 'kPa',
  description: 'pressure p0 of the surroundings (dead state) for exergy; give it with deadStateTemperature (optional)',
  required: false,
}
export const MASS_FLOW: TemplateInput = {
  name: 'massFlow',
  dimension: 'flowRate',
  unit: 'kg/s',
  description:
    'gas through the cycle per second (kg/s, or mol/s), for powers: the flow rate of a steady-flow plant, or for a piston cycle the mass per cycle × cycles per second (optional)',
  required: false,
}

/** Spread into each ideal-gas template's inputs. */
export const SECOND_LAW_INPUTS: readonly TemplateInput[] = [
  SOURCE_TEMPERATURE,
  SINK_TEMPERATURE,
  DEAD_STATE_TEMPERATURE,
  DEAD_STATE_PRESSURE,
  MASS_FLOW,
]

const bad = (message: string, property?: string): BuildResult => ({
  ok: false,
  error: { code: 'invalid-input', message, property },
})

const sig = (x: number) => Number(x.toPrecision(6)).toString()

/** The typed text of an input for a message ("-5 °C"), else the SI number with its unit. */
function typed(v: TemplateValues, name: string, x: number, unit: string): string {
  const t = v.labels[name]
  return t !== undefined ? `"${t}"` : `${sig(x)} ${unit}`
}

/**
 * The spec with the second-law and rate inputs put on it, or a message naming the input at
 * fault. `roles` gives, for each step of `spec`, what its heat is exchanged with. Without any
 * of these inputs the spec is returned unchanged.
 */
export function withSecondLaw(v: TemplateValues, spec: CycleSpec, roles: readonly HeatRole[]): BuildResult {
  const src = v.num.sourceTemperature
  const snk = v.num.sinkTemperature
  const T0 = v.num.deadStateTemperature
  const p0 = v.num.deadStatePressure
  const rate = v.num.massFlow
  if (src === undefined && snk === undefined && T0 === undefined && p0 === undefined && rate === undefined)
    return { ok: true, spec }
  const checks: [string, number | undefined, string, string][] = [
    ['sourceTemperature', src, 'K', 'an absolute temperature above 0 K'],
    ['sinkTemperature', snk, 'K', 'an absolute temperature above 0 K'],
    ['deadStateTemperature', T0, 'K', 'an absolute temperature above 0 K'],
    ['deadStatePressure', p0, 'Pa', 'a positive (absolute) pressure'],
    ['massFlow', rate, 'kg/s', 'a positive flow rate'],
  ]
  for (const [name, x, unit, what] of checks) {
    if (x !== undefined && !(Number.isFinite(x) && x > 0))
      return bad(`${name} must be ${what} (got ${typed(v, name, x, unit)})`, name)
  }
  if ((T0 === undefined) !== (p0 === undefined)) {
    const [given, missing] =
      T0 === undefined ? ['deadStatePressure', 'deadStateTemperature'] : ['deadStateTemperature', 'deadStatePressure']
    return bad(
      `${given} is given without ${missing}: the dead state (the surroundings, for exergy) needs both its temperature and its pressure, e.g. deadStateTemperature "298.15 K" and deadStatePressure "100 kPa"`,
      missing,
    )
  }
  const withBodies = src !== undefined || snk !== undefined
  if (withBodies && (v.num.reservoirHot !== undefined || v.num.reservoirCold !== undefined))
    return bad(
      'give the reservoirs either as sourceTemperature and sinkTemperature or as reservoirHot and reservoirCold, not both (the source is an engine’s hot reservoir and a refrigerator’s or heat pump’s cold space)',
      src !== undefined ? 'sourceTemperature' : 'sinkTemperature',
    )
  const purpose = spec.purpose ?? 'engine'
  const engine = purpose === 'engine'
  if (src !== undefined && snk !== undefined) {
    if (engine && !(src > snk))
      return bad(
        `sourceTemperature (${sig(src)} K) must be above sinkTemperature (${sig(snk)} K): an engine takes heat in from a hotter body and rejects heat to a colder one`,
        'sourceTemperature',
      )
    if (!engine && !(src < snk))
      return bad(
        `sourceTemperature (${sig(src)} K) must be below sinkTemperature (${sig(snk)} K): a ${purpose === 'heat-pump' ? 'heat pump' : 'refrigerator'} takes heat in from the cold space (the source) and delivers it to the warm one (the sink)`,
        'sourceTemperature',
      )
  }
  if (roles.length !== spec.steps.length)
    return bad(`internal: ${roles.length} heat roles for ${spec.steps.length} steps`, 'sourceTemperature')
  let steps: readonly StepSpec[] = spec.steps
  let reservoirs = spec.reservoirs
  if (withBodies) {
    steps = spec.steps.map((s, k) => {
      const T = roles[k] === 'source' ? src : roles[k] === 'sink' ? snk : undefined
      return T === undefined ? s : { ...s, boundaryTemperature: T }
    })
    reservoirs = engine ? { hot: src, cold: snk } : { hot: snk, cold: src }
  }
  const flow = spec.system === 'flow'
  const out: CycleSpec = {
    ...spec,
    steps,
    reservoirs,
    ...(T0 !== undefined && p0 !== undefined ? { deadState: { T: T0, p: p0 } } : {}),
    ...(flow && rate !== undefined ? { flowRate: rate } : {}),
  }
  return !flow && rate !== undefined ? { ok: true, spec: out, cycleRate: rate } : { ok: true, spec: out }
}
