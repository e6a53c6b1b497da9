/** A JSON object read from a spec or an author's document: not null and not a list. Pure. */
export function isRecord(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x)
}

/**
 * One of a fixed list of values (a process name, a refrigerant id, a state property key): the
 * type guard for `list.includes(x)` on a value read from JSON, so no cast is needed after it. Pure.
 */
export function isOneOf<const T extends readonly unknown[]>(list: T, x: unknown): x is T[number] {
  return list.includes(x)
}
