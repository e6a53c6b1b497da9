/**
 * Which pitfalls can fire for a problem: the grader names a pitfall only when re-solving the
 * variant with its slip changes the find's number (pitfalls.ts), so a tick that can never
 * change it only promises feedback that never comes. Pure and light (no solver): the editor
 * offers only these, and the lint refuses the others.
 *
 * - Every pitfall re-solves an output path: an expression find can have none.
 * - 'celsius-for-kelvin' needs a temperature in °C reaching the solver (a physics input that
 *   says °C, or names a given in °C).
 * - 'sign-convention-flipped' needs a key whose sign the convention decides (work in the
 *   convention's sign: totals.netWork, steps.N.w, …), not a size such as heat in.
 * - 'kilo-factor' needs an energy (a J in the find's unit) or a kJ reaching the solver.
 * - The steam, refrigerant and steady-flow solvers read their own inputs and take no slips, so on their
 *   templates only the sign slip and a factor of 1000 on an energy answer can fire.
 */
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { outputSense } from '#app/domain/authoring/sense.ts'
import type { PitfallId } from './pitfalls.ts'

const ALL: readonly PitfallId[] = [
  'sign-convention-flipped',
  'celsius-for-kelvin',
  'cp-cv-swapped',
  'gamma-monatomic-diatomic-swapped',
  'kilo-factor',
  'log10-for-ln',
  'per-mole-vs-per-kg',
]

/** Pitfalls whose slip the solver itself makes (re-solving with it); the others act on the key. */
const SOLVER_SLIPS: ReadonlySet<PitfallId> = new Set([
  'celsius-for-kelvin',
  'cp-cv-swapped',
  'gamma-monatomic-diatomic-swapped',
  'log10-for-ln',
  'per-mole-vs-per-kg',
])

/**
 * Bank templates whose solver takes no slips (steam, refrigerants): kept here, not read from the
 * catalog, so the editor's bundle carries no solver; applicable-pitfalls.test.ts checks it
 * against the catalog's families.
 */
export const TEMPLATES_WITHOUT_SLIPS: ReadonlySet<string> = new Set([
  'rankine',
  'rankine-reheat',
  'rankine-regenerative',
  'rankine-feedwater',
  'rankine-cogeneration',
  'vapour-compression',
  'vapour-compression-two-stage',
  'vapour-compression-cascade',
  'steam-throttling-calorimeter',
  'steam-carnot',
  // The steady-flow solver (thermo/flow) reads its own inputs and takes no slips either.
  'nozzle',
  'diffuser',
  'turbojet',
  // The combined cycle's gas turbine and steam cycle are solved by their own readers (./combined).
  'combined-cycle',
])

/** As app/domain/thermo/spec.ts's specMentions reads a spec. */
const CELSIUS = /(°\s*C|degC|℃)/
const KILOJOULE = /\bkJ\b/

/** Every string of the physics, each given it names replaced by "<value> <unit>" as substitute.ts does. */
function physicsTexts(def: ProblemDefinition): string[] {
  const units = new Map((def.givens ?? []).map((g) => [g.name, g.unit ?? '']))
  const out: string[] = []
  const walk = (x: unknown): void => {
    if (typeof x === 'string') {
      const exact = units.get(x.trim())
      let t = exact !== undefined ? `1 ${exact}` : x
      t = t.replace(/@\{\s*([A-Za-z][A-Za-z0-9_]*)[^}]*\}/g, (m, name: string) =>
        units.has(name) ? `1 ${units.get(name)}` : m,
      )
      out.push(t)
    } else if (Array.isArray(x)) x.forEach(walk)
    else if (x !== null && typeof x === 'object') Object.values(x).forEach(walk)
  }
  const physics = def.physics
  if (physics?.kind === 'template') walk(physics.inputs)
  else if (physics?.kind === 'cycle') walk(physics.cycle)
  return out
}

function forFind(def: ProblemDefinition, index: number, texts: readonly string[]): PitfallId[] {
  const f = def.finds?.[index]
  if (!f || f.source?.kind !== 'output' || typeof f.source.path !== 'string') return []
  const templateId = def.physics?.kind === 'template' ? def.physics.template : null
  const slipFree = templateId !== null && TEMPLATES_WITHOUT_SLIPS.has(templateId)
  const celsius = texts.some((t) => CELSIUS.test(t))
  const kJ = !slipFree && texts.some((t) => KILOJOULE.test(t))
  return ALL.filter((id) => {
    if (slipFree && SOLVER_SLIPS.has(id)) return false
    switch (id) {
      case 'celsius-for-kelvin':
        return celsius
      case 'sign-convention-flipped':
        return outputSense(f.source.kind === 'output' ? f.source.path : '', templateId)?.kind === 'convention-work'
      case 'kilo-factor':
        return kJ || /J/.test(f.unit ?? '')
      default:
        return true
    }
  })
}

/**
 * The pitfalls that can fire for find `findIndex` of the problem, or, without an index, for
 * some find of it; in the grader's order. Never throws on a half-typed draft.
 */
export function applicablePitfalls(def: ProblemDefinition, findIndex?: number): PitfallId[] {
  try {
    const texts = physicsTexts(def)
    if (findIndex !== undefined) return forFind(def, findIndex, texts)
    const any = new Set<PitfallId>()
    for (let i = 0; i < (def.finds?.length ?? 0); i++) for (const id of forFind(def, i, texts)) any.add(id)
    return ALL.filter((id) => any.has(id))
  } catch {
    return [...ALL]
  }
}

/** Why a pitfall cannot fire for a find, in words for the author; null when it can. */
export function whyPitfallCannotFire(def: ProblemDefinition, findIndex: number, id: PitfallId): string | null {
  if (applicablePitfalls(def, findIndex).includes(id)) return null
  const f = def.finds?.[findIndex]
  if (f?.source?.kind !== 'output')
    return 'pitfalls are recognised only on a find that comes from a solver output, not an expression'
  const templateId = def.physics?.kind === 'template' ? def.physics.template : null
  if (templateId !== null && TEMPLATES_WITHOUT_SLIPS.has(templateId) && SOLVER_SLIPS.has(id))
    return 'the steam, refrigerant and steady-flow solvers cannot make this slip, so it can never be recognised'
  switch (id) {
    case 'celsius-for-kelvin':
      return 'no temperature in °C reaches the solver in this problem'
    case 'sign-convention-flipped':
      return `the sign of "${f.source.path}" does not depend on the convention`
    case 'kilo-factor':
      return templateId !== null && TEMPLATES_WITHOUT_SLIPS.has(templateId)
        ? 'the answer is not an energy in kJ or J'
        : 'neither the answer nor any input of the solver is in kJ or J'
    default:
      return 'it cannot change this find'
  }
}
