/**
 * Fixed-length lists read as tuples: a solver's states come as an array, and a diagram or a
 * worked solution that names them s1…s9 checks the count once instead of asserting it. Pure.
 */

/** A readonly tuple of `N` elements of `T` (N a small literal: 4, 8, 9). */
export type Tuple<T, N extends number, Acc extends readonly T[] = readonly []> = Acc['length'] extends N
  ? Acc
  : Tuple<T, N, readonly [T, ...Acc]>

/** True when `list` has exactly `n` elements; it is then typed as that tuple. */
export function hasLength<T, N extends number>(list: readonly T[], n: N): list is Tuple<T, N> {
  return list.length === n
}
