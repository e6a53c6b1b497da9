/**
 * Propagation: every unknown p, v, T is filled through the process relations, the ideal-gas
 * law and the amount until nothing changes; then each state must be fully known.
 */
import { FROM_AMOUNT, P, PROP, PROP_WORD, T, V, equalityProp, fail, isForced, predict, ratioOf } from './relations.ts'
import type { Failure } from './relations.ts'
import type { Work } from './work.ts'

/** Fill the unknowns of c in place; fails only when a relation gives a value out of range. */
export function propagate(c: Work): Failure | null {
  const { gas, system, steps, N, val, Vtot } = c
  for (let iter = 0; iter < 4 * N + 8; iter++) {
    c.changed = false
    // amount ↔ total volumes
    for (let i = 0; i < N; i++) {
      const Vt = Vtot[i]!
      if (Number.isNaN(Vt)) continue
      if (!Number.isNaN(c.amount)) c.set(i, V, Vt / c.amount, FROM_AMOUNT)
      else if (c.known(i, V)) {
        c.amount = Vt / val[3 * i + V]!
        c.changed = true
      }
    }
    for (let k = 0; k < N; k++) {
      const s = steps[k]!
      const i = k
      const j = k + 1 === N ? 0 : k + 1
      const fi = c.full(i)
      const fj = c.full(j)
      if (fi && fj) continue
      // single-property transfers (equalities and ratios), both directions
      const eq = equalityProp(s)
      if (eq >= 0) {
        if (c.known(i, eq)) c.set(j, eq, val[3 * i + eq]!, k)
        else if (c.known(j, eq)) c.set(i, eq, val[3 * j + eq]!, k)
      }
      for (let prop = 0; prop < 3; prop++) {
        const r = ratioOf(s, prop)
        if (r === undefined) continue
        if (c.known(i, prop)) c.set(j, prop, val[3 * i + prop]! * r, k)
        else if (c.known(j, prop)) c.set(i, prop, val[3 * j + prop]! / r, k)
      }
      const q = c.heatOf(s)
      if (c.full(i) && !c.full(j)) {
        let Y = -1
        for (let prop = 0; prop < 3 && Y < 0; prop++) if (c.known(j, prop) && !isForced(s, prop)) Y = prop
        if (predict(gas, system, s, q, val, 3 * i, Y, Y >= 0 ? val[3 * j + Y]! : NaN, 1, c.tmp)) {
          for (let n2 = 0; n2 < 3; n2++) c.set(j, (n2 + 2) % 3, c.tmp[(n2 + 2) % 3]!, k) // T first, for the message
        } else if (
          !Number.isNaN(q) ||
          (Y >= 0 && !(Y === T && (s.process === 'adiabatic' || s.process === 'polytropic')))
        ) {
          // The relation had everything it needs, so a NaN came from an inverse function or
          // a root outside the data range: report it as out of range (c.set records it).
          for (let n2 = 0; n2 < 3; n2++) c.set(j, (n2 + 2) % 3, c.tmp[(n2 + 2) % 3]!, k) // T first, for the message
        }
      } else if (c.full(j) && !c.full(i) && s.process !== 'adiabatic') {
        let Y = -1
        for (let prop = 0; prop < 3 && Y < 0; prop++) if (c.known(i, prop) && !isForced(s, prop)) Y = prop
        if (predict(gas, system, s, q, val, 3 * j, Y, Y >= 0 ? val[3 * i + Y]! : NaN, -1, c.tmp)) {
          for (let prop = 0; prop < 3; prop++) c.set(i, prop, c.tmp[prop]!, k)
        }
      }
      if (s.process === 'regenerator' && k < s.partner!) {
        const m = s.partner!
        const res = c.regenOutlets(k, m)
        if (res) {
          const [cs, hs, Tco, Tho] = res
          c.set(cs + 1 === N ? 0 : cs + 1, T, Tco, cs)
          c.set(hs + 1 === N ? 0 : hs + 1, T, Tho, hs)
        }
      }
    }
    if (c.rangeError) return { ok: false, error: c.rangeError }
    if (!c.changed) break
  }
  return null
}

/** An error naming the first state not fully known (and what to give), or a missing amount. */
export function checkDetermined(c: Work): Failure | null {
  const { steps, N, Vtot } = c
  for (let i = 0; i < N; i++) {
    if (c.full(i)) continue
    const have = [P, V, T].filter((p) => c.known(i, p))
    const nm = c.stateName(i)
    if (have.length === 0) {
      return fail(
        'underdetermined',
        `State ${nm}: neither p, v nor T is fixed: give two of p${nm}, T${nm}, v${nm} (or a ratio or heat on an adjacent step)`,
        { state: i + 1, property: 'T' },
      )
    }
    const missing = [P, V, T].filter((p) => !c.known(i, p))
    const first = missing.includes(T) ? T : missing[0]!
    const names = missing.map((p) => `${PROP[p]}${nm}`)
    return fail(
      'underdetermined',
      `State ${nm}: ${PROP_WORD[first]} is not fixed (only ${have.map((p) => PROP[p]).join(' and ')}${nm} ${have.length === 1 ? 'is' : 'are'} known): give ${names.join(' or ')}`,
      { state: i + 1, property: PROP[first] },
    )
  }
  let needsAmount = false
  for (let k = 0; k < N; k++) if (steps[k]!.heatTotal !== undefined || !Number.isNaN(Vtot[k]!)) needsAmount = true
  if (needsAmount && Number.isNaN(c.amount)) {
    return fail(
      'underdetermined',
      'the amount of gas is not fixed: give the amount (n or m), or p, V and T of one state',
      { property: 'amount' },
    )
  }
  return null
}
