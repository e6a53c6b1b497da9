/** Words the bank pages show for its ids: cycles, difficulty, level, sharing. Isomorphic. */
import type { Difficulty, Level } from '#app/domain/authoring/definition.ts'

const CYCLES: Readonly<Record<string, string>> = {
  'carnot-engine': 'Carnot engine',
  'carnot-refrigerator': 'Carnot refrigerator',
  'carnot-heat-pump': 'Carnot heat pump',
  otto: 'Otto',
  diesel: 'Diesel',
  dual: 'Dual',
  brayton: 'Brayton',
  'brayton-regenerative': 'Brayton, regenerative',
  stirling: 'Stirling',
  ericsson: 'Ericsson',
  rankine: 'Rankine',
  'rankine-reheat': 'Rankine with reheat',
  'rankine-regenerative': 'Rankine, regenerative',
  general: 'General cycle',
}

/** Every cycle a problem can be about, in the order the filters list them. */
export const CYCLE_IDS: readonly string[] = Object.keys(CYCLES)

export function cycleLabel(id: string): string {
  return CYCLES[id] ?? id
}

export const difficultyLabel: Readonly<Record<Difficulty, string>> = {
  introductory: 'Introductory',
  standard: 'Standard',
  challenging: 'Challenging',
}

export const levelLabel: Readonly<Record<Level, string>> = {
  'first-year': 'First year',
  'second-year': 'Second year',
  'upper-level': 'Upper level',
  graduate: 'Graduate',
}

export const visibilityLabel: Readonly<Record<'private' | 'department' | 'installation', string>> = {
  private: 'Private',
  department: 'Shared with the department',
  installation: 'Shared with everyone here',
}
