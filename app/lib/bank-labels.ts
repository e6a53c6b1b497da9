/**
 * Words the bank pages show for its ids: difficulty, level, sharing. Isomorphic. (Cycle names
 * come from the templates themselves: app/domain/thermo/catalog.ts, sent by the loaders.)
 */
import type { Difficulty, Level } from '#app/domain/authoring/definition.ts'

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
