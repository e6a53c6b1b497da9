/**
 * Pitfalls: recognised slips, each with a stable id and short feedback of our own. To say
 * which slip explains a wrong answer, the SAME variant is solved again with the slip applied
 * inside the computation (app/domain/thermo/slips.ts: °C used as K, cp/cv swapped, log10 for
 * ln, …) and the asked quantity compared with the student's value.
 */
import { readQuantity, solveBankSpec, specConvention, specMentions } from '#app/domain/thermo/index.ts'
import type { Convention, Slips } from '#app/domain/thermo/index.ts'
import { isObjectLike, propertyOf } from './plain-data.ts'

// Which pitfalls can fire for a problem (light, for the editor and the lint).
export { applicablePitfalls, whyPitfallCannotFire } from './applicable-pitfalls.ts'

export type PitfallId =
  | 'sign-convention-flipped'
  | 'celsius-for-kelvin'
  | 'cp-cv-swapped'
  | 'gamma-monatomic-diatomic-swapped'
  | 'kilo-factor'
  | 'log10-for-ln'
  | 'per-mole-vs-per-kg'

export interface Pitfall {
  readonly id: PitfallId
  readonly title: string
  readonly feedback: string
}

/** In the order diagnosePitfall tries them (first match wins). */
export const PITFALLS: readonly Pitfall[] = [
  {
    id: 'sign-convention-flipped',
    title: 'Sign convention flipped',
    feedback:
      'Your number has the right size but the wrong sign. Check which convention this course uses: is w the work done on the gas, or W the work done by it?',
  },
  {
    id: 'celsius-for-kelvin',
    title: 'Celsius used where kelvin is needed',
    feedback:
      'It looks as if a temperature in °C went into a formula that needs absolute temperature. Add 273.15 before using T in pV = nRT, ratios or logarithms.',
  },
  {
    id: 'cp-cv-swapped',
    title: 'cp and cv swapped',
    feedback:
      'Heat at constant volume uses cv and heat at constant pressure uses cp; your answer matches the two exchanged.',
  },
  {
    id: 'gamma-monatomic-diatomic-swapped',
    title: 'Wrong γ for the kind of gas',
    feedback:
      'A monatomic gas has γ = 5/3 (cv = 3/2 R), a diatomic one γ = 7/5 (cv = 5/2 R). Your answer fits the other kind of gas.',
  },
  {
    id: 'kilo-factor',
    title: 'Factor of 1000 (kJ and J)',
    feedback:
      'Your answer is off by a factor of 1000: a value in kJ was probably used as J, or the other way round. Carry the units through the calculation.',
  },
  {
    id: 'log10-for-ln',
    title: 'log10 used instead of ln',
    feedback:
      'Isothermal work and entropy changes use the natural logarithm (ln). Your answer matches log10, which is smaller by a factor of 2.303.',
  },
  {
    id: 'per-mole-vs-per-kg',
    title: 'Per mole mixed up with per kilogram',
    feedback:
      'Your answer matches molar constants used with a mass (or per-kilogram constants with moles). Check that R, cp and cv are on the same basis as the amount of gas.',
  },
]

const SLIPS: Readonly<Record<Exclude<PitfallId, 'sign-convention-flipped' | 'kilo-factor'>, Slips>> = {
  'celsius-for-kelvin': { celsiusForKelvin: true },
  'cp-cv-swapped': { cpCvSwapped: true },
  'gamma-monatomic-diatomic-swapped': { gammaSwapped: true },
  'log10-for-ln': { log10ForLn: true },
  'per-mole-vs-per-kg': { perMoleVsPerKg: true },
}

export interface DiagnoseInput {
  /** the variant's spec, as a spec file holds it (template or cycle, strings with units) */
  readonly spec: unknown
  /** dotted path into the solution, e.g. 'totals.netWork', 'steps.2.q', 'states.3.T' (see readQuantity) */
  readonly quantity: string
  /** the student's answer converted to SI (the grader does the reading) */
  readonly studentValueSI: number
  /** relative tolerance of a match (default 0.01) */
  readonly relTol?: number
}

export interface Diagnosis {
  readonly pitfall: Pitfall
  /** what the slip gives for the quantity, SI */
  readonly slippedValueSI: number
  readonly correctValueSI: number
}

const close = (a: number, b: number, rel: number) => Math.abs(a - b) <= rel * Math.max(Math.abs(a), Math.abs(b))

function read(sol: { ok: boolean }, path: string): number | null {
  return sol.ok ? readQuantity(sol, path) : null
}

/**
 * The value of `quantity` in the variant re-evaluated with one pitfall's slip, or null when
 * the slip does not apply to this variant (e.g. no temperature given in °C).
 * kilo-factor has three forms; this returns all candidate values.
 */
export function evaluateWithPitfall(spec: unknown, quantity: string, id: PitfallId): number[] {
  const conv = specConvention(spec)
  if (typeof conv !== 'string') return []
  switch (id) {
    case 'sign-convention-flipped': {
      const other: Convention = conv === 'chemistry' ? 'engineering' : 'chemistry'
      const v = read(solveBankSpec(spec, { convention: other }), quantity)
      return v === null ? [] : [v]
    }
    case 'kilo-factor': {
      const out: number[] = []
      if (specMentions(spec, 'kJ')) {
        const v = read(solveBankSpec(spec, { slips: { kiloFactor: 'input-kJ-as-J' } }), quantity)
        if (v !== null) out.push(v)
      }
      const sol = solveBankSpec(spec)
      const v = read(sol, quantity)
      if (v !== null && sol.ok && /J/.test(unitOf(sol, quantity))) out.push(v * 1000, v / 1000)
      return out
    }
    case 'celsius-for-kelvin':
      if (!specMentions(spec, 'celsius')) return []
    // falls through
    default: {
      const v = read(solveBankSpec(spec, { slips: SLIPS[id] }), quantity)
      return v === null ? [] : [v]
    }
  }
}

function unitOf(sol: object, path: string): string {
  let cur: unknown = sol
  for (const key of path.split('.')) {
    if (!isObjectLike(cur)) return ''
    cur = Array.isArray(cur) ? cur[Number(key) - 1] : cur[key]
  }
  const unit = propertyOf(cur, 'unit')
  return typeof unit === 'string' ? unit : ''
}

/**
 * The first pitfall whose re-evaluated quantity matches the student's value within relTol, or
 * null (also null when the answer is correct, the spec does not solve, or nothing matches).
 * A slip that gives the correct answer itself is never reported. Never throws.
 */
export function diagnosePitfall(input: DiagnoseInput): Diagnosis | null {
  const rel = input.relTol ?? 0.01
  const x = input.studentValueSI
  if (!Number.isFinite(x)) return null
  const correctSol = solveBankSpec(input.spec)
  const correct = read(correctSol, input.quantity)
  if (correct === null) return null
  if (close(correct, x, rel)) return null
  for (const p of PITFALLS) {
    for (const v of evaluateWithPitfall(input.spec, input.quantity, p.id)) {
      if (!Number.isFinite(v) || close(v, correct, rel)) continue
      if (close(v, x, rel)) return { pitfall: p, slippedValueSI: v, correctValueSI: correct }
    }
  }
  return null
}
