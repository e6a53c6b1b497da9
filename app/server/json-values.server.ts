/**
 * Reading values out of jsonb columns whose fields vary by row (an audit event's before and
 * after): type guards instead of casts, so a field that is missing or of another type reads
 * as absent rather than as a wrong value.
 */

/** A JSON object (not null, not a list). */
export function isRecord(v: unknown): v is Readonly<Record<string, unknown>> {
  return typeof v === 'object' && v !== null && !Array.isArray(v)
}

/** The field of a JSON object; undefined when the value is not an object or lacks it. */
export function fieldOf(v: unknown, key: string): unknown {
  return isRecord(v) ? v[key] : undefined
}

/** The field when it is a finite number, else undefined. */
export function numberField(v: unknown, key: string): number | undefined {
  const x = fieldOf(v, key)
  return typeof x === 'number' && Number.isFinite(x) ? x : undefined
}

/** The field when it is a string, else undefined. */
export function stringField(v: unknown, key: string): string | undefined {
  const x = fieldOf(v, key)
  return typeof x === 'string' ? x : undefined
}

/** The field when it is a list, else undefined. */
export function listField(v: unknown, key: string): readonly unknown[] | undefined {
  const x = fieldOf(v, key)
  return Array.isArray(x) ? x : undefined
}
