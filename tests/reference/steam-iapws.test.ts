// Water/steam properties against an independent implementation of IAPWS-IF97: Debian's
// python3-iapws (module iapws, class IAPWS97), called once per batch through
// tests/support/iapws-reference.ts. If the reference is missing these tests FAIL with
// "python3-iapws is not installed: apt-get install -y python3-iapws"; they never skip.
//
// Random points (seeded PRNG, inline) are kept a little away from region boundaries and the
// saturation line so that both implementations pick the same region unambiguously.
import { beforeAll, describe, expect, test } from 'vitest'
import { pB23 } from '#app/domain/thermo/steam/if97/b23.ts'
import { pSat } from '#app/domain/thermo/steam/if97/region4.ts'
import {
  saturationPressure,
  saturationTemperature,
  stateFromPH,
  stateFromPS,
  stateFromPT,
  stateFromPx,
  stateFromTx,
} from '#app/domain/thermo/steam/index.ts'
import type { SteamState } from '#app/domain/thermo/steam/index.ts'
import { referenceAvailable, referenceBatch, REFERENCE_MISSING_MESSAGE } from '#tests/support/iapws-reference.ts'
import type { RefQuery, RefResult, RefState } from '#tests/support/iapws-reference.ts'
import { mulberry32 as prng } from '#app/domain/random.ts'

const rnd = prng(0x1f97)
const uniform = (a: number, b: number) => a + (b - a) * rnd()
const logUniform = (a: number, b: number) => Math.exp(uniform(Math.log(a), Math.log(b)))

type Category = 'region 1' | 'region 2' | 'region 3' | 'region 5' | 'saturation (p, x)' | 'saturation region 3 (T, x)'
interface Point {
  category: Category
  query: RefQuery
}

const points: Point[] = []
// Region 1: 273.15 K < T < 623.15 K, p above p_s(T) by at least 2 %, up to 100 MPa.
for (let i = 0; i < 350; i++) {
  const T = uniform(273.4, 622.9)
  const p = logUniform(Math.max(pSat(T) * 1.02, 0.002), 99.9) * 1e6
  points.push({ category: 'region 1', query: { kind: 'PT', p, T } })
}
// Region 2: below p_s(T) (T <= 623.15 K) or below p_B23(T) (T <= 863.15 K), by at least 2 %.
// iapws refuses P below p_s(273.15 K) = 611.2 Pa (its own range check, stricter than IF97's
// region 2, which extends to p > 0), so the reference points start at 612 Pa.
for (let i = 0; i < 350; i++) {
  const T = uniform(276, 1072.9)
  const pTop = T <= 623.15 ? pSat(T) * 0.98 : T <= 863.15 ? pB23(T) * 0.98 : 99.9
  const p = logUniform(0.000612, pTop) * 1e6
  points.push({ category: 'region 2', query: { kind: 'PT', p, T } })
}
// Region 3: 623.15 K < T, p_B23(T) < p <= 100 MPa, away from the saturation line and from the
// immediate neighbourhood of the critical point.
for (let n = 0; n < 250;) {
  const T = uniform(623.4, 862.9)
  const pLow = pB23(T) * 1.02
  if (pLow >= 99.9) continue
  const pM = uniform(pLow, 99.9)
  if (T < 647.096 && Math.abs(pM - pSat(T)) < 0.02 * pSat(T)) continue
  if (Math.abs(T - 647.096) < 1.5 && Math.abs(pM - 22.064) < 1.0) continue
  points.push({ category: 'region 3', query: { kind: 'PT', p: pM * 1e6, T } })
  n++
}
// Region 5: 1073.15 K < T <= 2273.15 K, 612 Pa .. 50 MPa (IAPWS R7-97(2012) Section 7).
for (let i = 0; i < 200; i++) {
  const T = uniform(1073.4, 2273.1)
  const p = logUniform(0.000612, 49.9) * 1e6
  points.push({ category: 'region 5', query: { kind: 'PT', p, T } })
}
// Saturation line with T_s <= 623.15 K, by (p, x): liquid and vapour ends and a mixture.
for (let i = 0; i < 150; i++) {
  const pM = logUniform(0.00062, 16.4)
  const x = i % 3 === 0 ? 0 : i % 3 === 1 ? 1 : rnd()
  points.push({ category: 'saturation (p, x)', query: { kind: 'Px', p: pM * 1e6, x } })
}
// Saturation line in region 3 (623.15 K < T < 647 K), saturated liquid and vapour by (T, x).
for (let i = 0; i < 100; i++) {
  const T = uniform(623.3, 646.5)
  points.push({ category: 'saturation region 3 (T, x)', query: { kind: 'sat3', T, x: i % 2 === 0 ? 0 : 1 } })
}

const REL = 1e-7
// Relative tolerance 1e-7, with a small absolute floor where a property passes through zero
// (h, u and s are zero at the triple-point liquid by the release's convention).
const FLOOR: Record<string, number> = { v: 0, h: 1e3, u: 1e3, s: 1, cp: 0, cv: 0, w: 0 }
const PROPS = ['v', 'h', 'u', 's', 'cp', 'cv', 'w'] as const

function ours(q: RefQuery): SteamState {
  const r =
    q.kind === 'PT'
      ? stateFromPT(q.p, q.T)
      : q.kind === 'Px'
        ? stateFromPx(q.p, q.x)
        : q.kind === 'sat3'
          ? stateFromTx(q.T, q.x)
          : null
  if (!r || !r.ok) throw new Error(`our solver failed for ${JSON.stringify(q)}: ${JSON.stringify(r)}`)
  return r.value
}

function compare(mine: SteamState, ref: RefState, props: readonly (typeof PROPS)[number][]): string[] {
  const bad: string[] = []
  for (const k of props) {
    const a = mine[k]
    const b = ref[k]
    if (b === null || b === undefined) continue
    if (a === null) {
      bad.push(`${k}: ours null, reference ${b}`)
      continue
    }
    const err = Math.abs(a - b) / Math.max(Math.abs(b), FLOOR[k] ?? 0)
    if (!(err <= REL)) bad.push(`${k}: ours ${a}, reference ${b}, rel ${err.toExponential(2)}`)
  }
  return bad
}

let refs: RefResult[] = []
let available = false
beforeAll(() => {
  available = referenceAvailable()
  if (available) refs = referenceBatch(points.map((p) => p.query)) // one Python process
})

function requireReference(): void {
  if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
}

describe('reference helper', () => {
  test('a missing interpreter fails loudly with the install hint (never a silent skip)', () => {
    expect(referenceAvailable('/nonexistent/python3')).toBe(false)
    expect(() => referenceBatch([{ kind: 'psat', T: 300 }], '/nonexistent/python3')).toThrow(REFERENCE_MISSING_MESSAGE)
  })
  test('the reference answers a release check value (IAPWS R7-97(2012) Table 35: p_s(300 K) = 3536.58941 Pa)', () => {
    requireReference()
    const [r] = referenceBatch([{ kind: 'psat', T: 300 }])
    expect(r && r.ok && 'value' in r && Math.abs(r.value / 0.353658941e4 - 1) < 1e-8).toBe(true)
  })
})

describe('IAPWS-IF97 against python3-iapws (independent implementation), relative 1e-7', () => {
  test('at least 1,000 random points over regions 1, 2, 3, 5 and the saturation line', () => {
    expect(points.length).toBeGreaterThanOrEqual(1000)
  })

  const categories: Category[] = [
    'region 1',
    'region 2',
    'region 3',
    'region 5',
    'saturation (p, x)',
    'saturation region 3 (T, x)',
  ]
  test.each(categories)('%s: v, h, u, s, cp, cv, w (reference: python3-iapws IAPWS97)', (category) => {
    requireReference()
    const failures: string[] = []
    let count = 0
    points.forEach((pt, i) => {
      if (pt.category !== category) return
      const ref = refs[i]!
      if (!ref.ok || !('h' in ref)) {
        failures.push(`reference failed at ${JSON.stringify(pt.query)}: ${JSON.stringify(ref)}`)
        return
      }
      if (category === 'region 1' || category === 'region 2' || category === 'region 3' || category === 'region 5') {
        const want = category === 'region 1' ? 1 : category === 'region 2' ? 2 : category === 'region 3' ? 3 : 5
        if (ref.region !== want) failures.push(`reference chose region ${ref.region} at ${JSON.stringify(pt.query)}`)
      }
      const mine = ours(pt.query)
      const props =
        category.startsWith('saturation (p') && mine.x !== 0 && mine.x !== 1 ? (['v', 'h', 'u', 's'] as const) : PROPS
      const bad = compare(mine, ref, props)
      count++
      if (bad.length) failures.push(`${JSON.stringify(pt.query)}: ${bad.join('; ')}`)
    })
    expect(count).toBeGreaterThan(90)
    expect(failures.slice(0, 10)).toEqual([])
  })
})

describe('saturation line p_s(T), T_s(p) and backward routes against python3-iapws', () => {
  const satT = Array.from({ length: 40 }, (_, i) => 273.15 + ((647.096 - 273.15) * (i + 0.5)) / 40)
  const satP = Array.from({ length: 40 }, (_, i) =>
    Math.exp(Math.log(611.3) + ((Math.log(22.06e6) - Math.log(611.3)) * (i + 0.5)) / 40),
  )
  // (p, h) and (p, s) inputs built from random single-phase reference states.
  const route = points.filter((p) => p.query.kind === 'PT').filter((_, i) => i % 7 === 0)
  let satRefs: RefResult[] = []
  let routeRefs: RefResult[] = []
  beforeAll(() => {
    if (!available) return
    satRefs = referenceBatch([
      ...satT.map((T) => ({ kind: 'psat', T }) as RefQuery),
      ...satP.map((p) => ({ kind: 'tsat', p }) as RefQuery),
    ])
    const base = route.map((pt) => refs[points.indexOf(pt)]!)
    const q: RefQuery[] = []
    base.forEach((b) => {
      if (!b.ok || !('h' in b)) return
      q.push({ kind: 'Ph', p: b.p, h: b.h }, { kind: 'Ps', p: b.p, s: b.s })
    })
    routeRefs = referenceBatch(q)
  })

  test('p_s(T) and T_s(p), 40 points each (reference: iapws _PSat_T, _TSat_P)', () => {
    requireReference()
    satT.forEach((T, i) => {
      const r = saturationPressure(T)
      const ref = satRefs[i]!
      expect(r.ok && ref.ok && 'value' in ref).toBe(true)
      if (r.ok && ref.ok && 'value' in ref) expect(Math.abs(r.value - ref.value) / ref.value).toBeLessThan(1e-10)
    })
    satP.forEach((p, i) => {
      const r = saturationTemperature(p)
      const ref = satRefs[satT.length + i]!
      if (r.ok && ref.ok && 'value' in ref) expect(Math.abs(r.value - ref.value) / ref.value).toBeLessThan(1e-10)
      else expect.unreachable(`saturationTemperature(${p})`)
    })
  })

  test('T from (p, h) and (p, s) across regions 1, 2, 3 and 5 (reference: IAPWS97(P, h), IAPWS97(P, s))', () => {
    requireReference()
    expect(routeRefs.length).toBeGreaterThan(200)
    expect(routeRefs.filter((r) => r.ok && 'h' in r && r.T > 1073.15).length).toBeGreaterThan(20) // region 5 routes are in
    const failures: string[] = []
    for (let i = 0; i < routeRefs.length; i += 2) {
      for (const j of [i, i + 1]) {
        const ref = routeRefs[j]!
        if (!ref.ok || !('h' in ref)) {
          failures.push(`reference failed: ${JSON.stringify(ref)}`)
          continue
        }
        const mine = j === i ? stateFromPH(ref.p, ref.h) : stateFromPS(ref.p, ref.s)
        if (ref.T > 1073.15 && mine.ok && mine.value.region !== 5)
          failures.push(`region ${mine.value.region} for a region-5 state at p=${ref.p}, T=${ref.T}`)
        if (!mine.ok) {
          failures.push(`ours failed: ${JSON.stringify(mine.error)}`)
          continue
        }
        const err = Math.abs(mine.value.T - ref.T) / ref.T
        if (!(err <= 1e-7)) failures.push(`${j === i ? 'Ph' : 'Ps'} p=${ref.p}: T ours ${mine.value.T}, ref ${ref.T}`)
      }
    }
    expect(failures.slice(0, 10)).toEqual([])
  })
})
