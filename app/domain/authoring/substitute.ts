/**
 * Putting drawn givens into a problem's physics: the spec-file object the solver reads
 * (docs/spec-format.md). A text that is exactly a given's name becomes the given's text
 * ("T1" → "350 K"); `@{name}` inside a longer text is replaced the same way ("@{p1} abs" →
 * "100 kPa abs"). Unknown names are left as they are: lintDefinition reports them. Pure.
 */
import type { Convention } from '#app/domain/thermo/index.ts'
import { isRecord } from '#app/domain/thermo/json.ts'
import type { DrawnGiven, ProblemDefinition } from './definition.ts'

/** `@{name}`, with optional spaces inside the braces. */
export const PLACEHOLDER = /@\{\s*([A-Za-z][A-Za-z0-9_]*)\s*\}/g

function substituteText(text: string, byName: ReadonlyMap<string, DrawnGiven>): string {
  const exact = byName.get(text)
  if (exact) return exact.text
  if (!text.includes('@{')) return text
  return text.replace(PLACEHOLDER, (whole, name: string) => byName.get(name)?.text ?? whole)
}

function substituteDeep(x: unknown, byName: ReadonlyMap<string, DrawnGiven>): unknown {
  if (typeof x === 'string') return substituteText(x, byName)
  if (Array.isArray(x)) return x.map((v) => substituteDeep(v, byName))
  if (x !== null && typeof x === 'object') {
    const out: Record<string, unknown> = {}
    for (const [k, v] of Object.entries(x)) out[k] = substituteDeep(v, byName)
    return out
  }
  return x
}

/**
 * A general cycle of water: the cycle object says `"substance": "water"` and is otherwise the
 * `steamCycle` object of a spec file (system, mass, states, steps; docs/steam.md).
 */
function waterCycle(cycle: unknown): Record<string, unknown> | null {
  if (!isRecord(cycle)) return null
  const { substance, ...rest } = cycle
  return substance === 'water' ? rest : null
}

/**
 * The spec file object for one variant: { template, inputs, convention }, { cycle, convention },
 * or for a general cycle of water { steamCycle, convention }.
 */
export function buildSpec(
  def: ProblemDefinition,
  givens: readonly DrawnGiven[],
  convention: Convention,
): Record<string, unknown> {
  const byName = new Map(givens.map((g) => [g.name, g]))
  const physics = def.physics
  if (physics.kind === 'template') {
    const inputs: Record<string, unknown> = {}
    for (const [k, v] of Object.entries(physics.inputs)) inputs[k] = substituteDeep(v, byName)
    return { template: physics.template, inputs, convention }
  }
  const cycle = substituteDeep(physics.cycle, byName)
  const water = waterCycle(cycle)
  return water ? { steamCycle: water, convention } : { cycle, convention }
}
