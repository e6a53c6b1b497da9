/**
 * Small problem definitions the integration tests share: what they need is a problem that
 * reads, solves and grades, not particular physics (that is checked in tests/reference).
 */
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'

/** A one-given Carnot engine (T_H from 500 to 900 K, T_C 300 K) asking for the efficiency. */
export function carnotDrill(
  title = 'Carnot drill',
  prompt = 'An engine runs between $T_H =$ @{Th} and 300 K.',
): ProblemDefinition {
  return {
    format: 2,
    title,
    tags: { topics: ['carnot'], difficulty: 'introductory', level: 'first-year' },
    convention: 'course',
    prompt,
    givens: [{ name: 'Th', label: 'hot reservoir', unit: 'K', rule: { kind: 'range', min: 500, max: 900, step: 50 } }],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'carnot-engine',
      inputs: { gas: 'monatomic', amount: '1 mol', Th: 'Th', Tc: '300 K', p1: '1000 kPa', expansionRatio: '2' },
    },
    finds: [
      {
        name: 'eta',
        label: 'Efficiency',
        source: { kind: 'output', path: 'totals.efficiency' },
        unit: '',
        points: 1,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: [],
      },
    ],
  }
}
