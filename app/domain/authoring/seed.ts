/**
 * Seeds for variants. A variant is fixed by one uint32 seed; seedFrom turns the things that
 * identify a student's instance (assignment, problem, student) into that seed, the same on
 * every machine and in every release, so a variant can be recomputed on demand instead of
 * stored. Pure.
 */

const FNV_OFFSET = 0x811c9dc5
const FNV_PRIME = 0x01000193

/** murmur3's fmix32: FNV-1a alone lets near-identical inputs give near-identical seeds. */
function finalMix(h: number): number {
  let x = h >>> 0
  x ^= x >>> 16
  x = Math.imul(x, 0x85ebca6b)
  x ^= x >>> 13
  x = Math.imul(x, 0xc2b2ae35)
  x ^= x >>> 16
  return x >>> 0
}

/**
 * Each part is written with its length in front so ('ab', 'c') and ('a', 'bc') differ; a
 * number is written as String(n), so 7 and '7' give the same seed (an id may arrive as
 * either from a database row or a URL).
 */
function canonical(parts: readonly (string | number)[]): string {
  return parts
    .map((p) => {
      const s = typeof p === 'number' ? String(p) : p
      return `${s.length}:${s}`
    })
    .join('|')
}

/** A stable uint32 from the parts, e.g. seedFrom('assignment', a, 'problem', p, 'student', s). */
export function seedFrom(...parts: readonly (string | number)[]): number {
  const bytes = new TextEncoder().encode(canonical(parts))
  let h = FNV_OFFSET
  for (const b of bytes) {
    h ^= b
    h = Math.imul(h, FNV_PRIME)
  }
  return finalMix(h)
}

/**
 * The preview seeds: 1, 2, …, count. Authoring screens and the bank's sweep use these fixed
 * seeds so that "variant 3" means the same numbers every time an author looks at it.
 */
export function previewSeeds(count: number): number[] {
  const n = Number.isFinite(count) ? Math.max(0, Math.floor(count)) : 0
  return Array.from({ length: n }, (_, i) => i + 1)
}
