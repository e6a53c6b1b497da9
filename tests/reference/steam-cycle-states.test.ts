// The (T, s), (T, v) and (p, v) state routes and the vapour Carnot cycle against Debian's
// python3-iapws (IAPWS97), through tests/support/iapws-reference.ts (one Python process per
// batch). iapws takes no (T, s), (T, v) or (p, v) input, so each of our states is checked by
// asking iapws for the state at our (p, T) (single phase) or (T, x) (two-phase) and comparing
// the property we were given, to 1e-7. If the reference is missing the tests FAIL with the
// install hint; they never skip.
import { beforeAll, describe, expect, test } from 'vitest'
import { mulberry32 as prng } from '#app/domain/random.ts'
import {
  solveSteamCarnot,
  stateFromPT,
  stateFromPV,
  stateFromPx,
  stateFromTS,
  stateFromTV,
} from '#app/domain/thermo/steam/index.ts'
import type { SteamState } from '#app/domain/thermo/steam/index.ts'
import { referenceAvailable, referenceStates, REFERENCE_MISSING_MESSAGE } from '#tests/support/iapws-reference.ts'
import type { RefQuery, RefState } from '#tests/support/iapws-reference.ts'

const rnd = prng(0x57ea)
const uniform = (a: number, b: number) => a + (b - a) * rnd()
const logUniform = (a: number, b: number) => Math.exp(uniform(Math.log(a), Math.log(b)))

interface Case {
  kind: 'Ts' | 'Tv' | 'pv'
  given: number
  mine: SteamState
}
const cases: Case[] = []
function must(r: { ok: true; value: SteamState } | { ok: false; error: unknown }): SteamState {
  if (!r.ok) throw new Error(JSON.stringify(r.error))
  return r.value
}
// Seeded single-phase points (regions 1, 2, 5, away from the saturation line) and mixtures.
for (let i = 0; i < 120; i++) {
  let base: SteamState
  if (i % 4 === 3) base = must(stateFromPx(logUniform(1e3, 15e6), uniform(0.05, 0.95)))
  else {
    const T = i % 4 === 2 ? uniform(1080, 2200) : uniform(290, 1050)
    const p = logUniform(1e3, T > 1073.15 ? 45e6 : 90e6)
    base = must(stateFromPT(p, T))
  }
  cases.push({ kind: 'Ts', given: base.s, mine: must(stateFromTS(base.T, base.s)) })
  cases.push({ kind: 'Tv', given: base.v, mine: must(stateFromTV(base.T, base.v)) })
  cases.push({ kind: 'pv', given: base.v, mine: must(stateFromPV(base.p, base.v)) })
}

let available = false
let refs: RefState[] = []
let carnotRefs: RefState[] = []
const TH = 523.15
const TL = 323.15
beforeAll(() => {
  available = referenceAvailable()
  if (!available) return
  const q: RefQuery[] = cases.map((c) =>
    c.mine.x !== null ? { kind: 'Tx', T: c.mine.T, x: c.mine.x } : { kind: 'PT', p: c.mine.p, T: c.mine.T },
  )
  refs = referenceStates(q)
  carnotRefs = referenceStates([
    { kind: 'Tx', T: TH, x: 0 },
    { kind: 'Tx', T: TH, x: 1 },
    { kind: 'Tx', T: TL, x: 0 },
    { kind: 'Tx', T: TL, x: 1 },
  ])
})

describe('new state routes against python3-iapws', () => {
  test.each(['Ts', 'Tv', 'pv'] as const)(
    '%s: the given property at our state, relative 1e-7 (reference: IAPWS97(P, T) or (T, x))',
    (kind) => {
      if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
      const bad: string[] = []
      let n = 0
      cases.forEach((c, i) => {
        if (c.kind !== kind) return
        n++
        const ref = refs[i]!
        const got = kind === 'Ts' ? ref.s : ref.v
        const err = Math.abs(got - c.given) / Math.max(Math.abs(c.given), kind === 'Ts' ? 1 : 0)
        if (!(err <= 1e-7)) bad.push(`${kind} T=${c.mine.T} p=${c.mine.p}: given ${c.given}, iapws ${got}`)
      })
      expect(n).toBe(120)
      expect(bad.slice(0, 10)).toEqual([])
    },
  )
})

describe('vapour Carnot cycle against python3-iapws', () => {
  test('250 C / 50 C, x 0 -> 1: heat in = T_H (s_g - s_f) and the cold-side qualities from iapws entropies', () => {
    if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
    const r = solveSteamCarnot({ hotTemperature: TH, coldTemperature: TL })
    if (!r.ok) throw new Error(JSON.stringify(r.error))
    const [fH, gH, fL, gL] = carnotRefs as [RefState, RefState, RefState, RefState]
    const qin = TH * (gH.s - fH.s)
    expect(Math.abs(r.value.heatIn - qin) / qin).toBeLessThan(1e-7)
    const x3 = (gH.s - fL.s) / (gL.s - fL.s)
    const x4 = (fH.s - fL.s) / (gL.s - fL.s)
    expect(Math.abs(r.value.states[2]!.x! - x3)).toBeLessThan(1e-7)
    expect(Math.abs(r.value.states[3]!.x! - x4)).toBeLessThan(1e-7)
    expect(Math.abs(r.value.heatOut - TL * (gH.s - fH.s)) / r.value.heatOut).toBeLessThan(1e-7)
  })
})
