/**
 * Different students rarely share a variant: each (assignment, problem, student) has its own
 * seed, and the seeds spread evenly over the givens an author allows, so repeats happen only
 * as often as chance allows for that many combinations (the birthday problem, common practice).
 */
import { expect, test } from 'vitest'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { seedFrom } from '#app/domain/authoring/seed.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'

test('seeds of 20,000 (assignment, problem, student) triples are all different', () => {
  const seeds = new Set<number>()
  for (let a = 1; a <= 10; a++)
    for (let p = 1; p <= 10; p++)
      for (let s = 1; s <= 200; s++) seeds.add(seedFrom('assignment', a, 'problem', p, 'student', s))
  expect(seeds.size).toBe(20_000)
})

test('200 students of one assignment share givens about as rarely as chance allows', () => {
  const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition
  // Combinations the author allows: p1 3 values × T1 5 × r 7 (7 to 10 by 0.5) × qin 9.
  const combinations = 3 * 5 * 7 * 9
  const distinct = new Set<string>()
  for (let s = 1; s <= 200; s++) {
    const drawn = drawVariant(otto, seedFrom('assignment', 77, 'problem', 5, 'student', s), {
      convention: 'engineering',
    })
    if (!drawn.ok) throw new Error(drawn.error.message)
    distinct.add(drawn.variant.givens.map((g) => g.text).join('|'))
  }
  // Expected distinct among n uniform draws from N: N(1 − (1 − 1/N)^n) ≈ 180 here; a clumping
  // seed would give far fewer.
  const expected = combinations * (1 - (1 - 1 / combinations) ** 200)
  expect(distinct.size).toBeGreaterThanOrEqual(Math.floor(expected - 10))
})
