/**
 * Seeded pseudo-random numbers: the same seed gives the same sequence on every machine,
 * so sampled test points, benchmarks and (later) students' variants are reproducible.
 * Pure; no package needed.
 */

/** mulberry32: a small, well-known 32-bit generator (Tommy Ettinger's, public domain). Values in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

export function uniform(rand: () => number, lo: number, hi: number): number {
  return lo + (hi - lo) * rand()
}
