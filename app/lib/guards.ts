// Small type guards for values the app did not make itself: JSON from an API route, a stored
// audit row, a form field. Each checks before it narrows, so no `as` is needed where they are used.
export { isRecord } from '#app/domain/thermo/json.ts'

/** Whether `key` names an own property of `obj` (a label table, a lookup), narrowing it to that key. */
export function isKeyOf<T extends object>(obj: T, key: unknown): key is keyof T & string {
  return typeof key === 'string' && Object.hasOwn(obj, key)
}

/** Whether `x` is one of the listed strings, narrowing it to their union. */
export function isOneOf<const T extends readonly string[]>(list: T, x: unknown): x is T[number] {
  return typeof x === 'string' && list.includes(x)
}

/**
 * The JSON body of a response from one of our own API routes, checked by `isT` before it is
 * trusted. A body of another shape (a proxy's page, an older server during a deploy) is an
 * Error with a plain sentence, which the polling components show as their refresh error.
 */
export async function readJson<T>(res: Response, isT: (x: unknown) => x is T, what: string): Promise<T> {
  let body: unknown
  try {
    body = await res.json()
  } catch {
    throw new Error(`${what} came back in a form this page cannot read. Reload the page to try again.`)
  }
  if (!isT(body)) throw new Error(`${what} came back in a form this page cannot read. Reload the page to try again.`)
  return body
}
