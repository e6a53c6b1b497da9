/** A JSON object read from a spec or an author's document: not null and not a list. Pure. */
export function isRecord(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x)
}
