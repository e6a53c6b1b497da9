/** Test-only helpers (seeded PRNG written inline, no package). Not exported from index.ts. */

export { mulberry32, uniform } from '../random.ts'
