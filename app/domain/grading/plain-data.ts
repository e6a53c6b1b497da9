// Reading values of unknown shape (a rule or answer from JSON, a solver's result) without
// casts: the checks `typeof x === 'object'` and `x[key]` did by hand, as type guards.

/**
 * Any object, arrays included: what `typeof x === 'object' && x !== null` accepts. Unlike
 * thermo/json.ts isRecord it lets arrays through, for code that always did. Pure.
 */
export function isObjectLike(x: unknown): x is Readonly<Record<string, unknown>> {
  return typeof x === 'object' && x !== null
}

/** `x[key]` when x is an object (arrays included), otherwise undefined (as `x?.[key]` on a primitive). Pure. */
export function propertyOf(x: unknown, key: string): unknown {
  return isObjectLike(x) ? x[key] : undefined
}
