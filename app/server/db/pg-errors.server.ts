/**
 * Telling which database error happened: PostgreSQL's SQLSTATE and constraint name, looked
 * for in the error and in the errors it wraps (drizzle puts the driver's error in `cause`).
 */

const UNIQUE_VIOLATION = '23505'
/** Deeper than any real chain of causes; a chain that loops back ends here. */
const MAX_DEPTH = 10

function textProperty(o: object, key: string): string | undefined {
  const v: unknown = Reflect.get(o, key)
  return typeof v === 'string' ? v : undefined
}

/** The error and each error it wraps through `cause`, outermost first. */
function* chain(e: unknown): Generator<object> {
  let err: unknown = e
  for (let depth = 0; depth < MAX_DEPTH && typeof err === 'object' && err !== null; depth++) {
    yield err
    err = Reflect.get(err, 'cause')
  }
}

/** A unique-index violation (23505) in the error or what it wraps; of that constraint when one is named. */
export function isUniqueViolation(e: unknown, constraint?: string): boolean {
  for (const err of chain(e))
    if (
      textProperty(err, 'code') === UNIQUE_VIOLATION &&
      (constraint === undefined || textProperty(err, 'constraint') === constraint)
    )
      return true
  return false
}
