// Rankine cycles recomputed through an independent property library: every state of the
// textbook cycles (Cengel & Boles, "Thermodynamics: An Engineering Approach", 7th ed.,
// Examples 10-1, 10-4, 10-5, from memory) plus a cycle with pump and turbine efficiencies is
// evaluated with Debian's python3-iapws (IAPWS97) through tests/support/iapws-reference.ts
// (one Python process per batch; two batches), and the cycle arithmetic is redone here.
// If the reference is missing the test FAILS with the install hint; it never skips.
import { beforeAll, describe, expect, test } from 'vitest'
import { solveRankine } from '#app/domain/thermo/steam/index.ts'
import type { RankineResult } from '#app/domain/thermo/steam/index.ts'
import { referenceAvailable, referenceStates, REFERENCE_MISSING_MESSAGE } from '#tests/support/iapws-reference.ts'
import type { RefQuery, RefState } from '#tests/support/iapws-reference.ts'

const C = 273.15
const pB = 15e6
const pC = 10e3
const T3 = 600 + C

function mine(r: ReturnType<typeof solveRankine>): RankineResult {
  if (!r.ok) throw new Error(JSON.stringify(r.error))
  return r.value
}

interface Expected {
  eta: number
  net: number
  qin: number
  x: number
  y?: number
}
const ref: Record<string, Expected> = {}
let available = false

beforeAll(() => {
  available = referenceAvailable()
  if (!available) return
  // Batch 1: states fixed by (p, T) or (p, x).
  const b1: RefQuery[] = [
    { kind: 'Px', p: 75e3, x: 0 }, // 0: Ex. 10-1 pump inlet
    { kind: 'PT', p: 3e6, T: 350 + C }, // 1: Ex. 10-1 turbine inlet
    { kind: 'Px', p: pC, x: 0 }, // 2: 10 kPa saturated liquid
    { kind: 'PT', p: pB, T: T3 }, // 3: 15 MPa, 600 C
    { kind: 'PT', p: 4e6, T: T3 }, // 4: reheat exit, 4 MPa 600 C
    { kind: 'Px', p: 1.2e6, x: 0 }, // 5: feedwater-heater exit
  ]
  const [a1, a3, c1, c3, c5, f3] = referenceStates(b1) as [RefState, RefState, RefState, RefState, RefState, RefState]
  // Batch 2: isentropic end states (p, s).
  const b2: RefQuery[] = [
    { kind: 'Ps', p: 3e6, s: a1.s }, // 0: Ex 10-1 pump exit
    { kind: 'Ps', p: 75e3, s: a3.s }, // 1: Ex 10-1 turbine exit
    { kind: 'Ps', p: pB, s: c1.s }, // 2: pump exit to 15 MPa
    { kind: 'Ps', p: 4e6, s: c3.s }, // 3: HP turbine exit at 4 MPa
    { kind: 'Ps', p: pC, s: c5.s }, // 4: LP turbine exit after reheat
    { kind: 'Ps', p: 1.2e6, s: c1.s }, // 5: pump I exit
    { kind: 'Ps', p: pB, s: f3.s }, // 6: pump II exit
    { kind: 'Ps', p: 1.2e6, s: c3.s }, // 7: extraction at 1.2 MPa
    { kind: 'Ps', p: pC, s: c3.s }, // 8: turbine exit from 15 MPa 600 C
  ]
  const r2 = referenceStates(b2)
  const h = (i: number) => r2[i]!.h

  // Example 10-1, ideal.
  {
    const wp = h(0) - a1.h
    const wt = a3.h - h(1)
    const qin = a3.h - h(0)
    ref['10-1'] = { eta: (wt - wp) / qin, net: wt - wp, qin, x: r2[1]!.x! }
  }
  // Example 10-4, ideal reheat.
  {
    const wp = h(2) - c1.h
    const wt = c3.h - h(3) + (c5.h - h(4))
    const qin = c3.h - h(2) + (c5.h - h(3))
    ref['10-4'] = { eta: (wt - wp) / qin, net: wt - wp, qin, x: r2[4]!.x! }
  }
  // Example 10-5, ideal, one open feedwater heater.
  {
    const y = (f3.h - h(5)) / (h(7) - h(5))
    const wp = (1 - y) * (h(5) - c1.h) + (h(6) - f3.h)
    const wt = c3.h - h(7) + (1 - y) * (h(7) - h(8))
    const qin = c3.h - h(6)
    ref['10-5'] = { eta: (wt - wp) / qin, net: wt - wp, qin, x: r2[8]!.x!, y }
  }
  // Simple cycle 15 MPa / 600 C / 10 kPa with eta_pump = 0.85, eta_turbine = 0.87.
  {
    const wp = (h(2) - c1.h) / 0.85
    const wt = 0.87 * (c3.h - h(8))
    const qin = c3.h - (c1.h + wp)
    const h4 = c3.h - wt
    const hf = c1.h
    const hg = hf + (h(8) - hf) / r2[8]!.x! // hg from the isentropic exit state (lever rule)
    ref['eff'] = { eta: (wt - wp) / qin, net: wt - wp, qin, x: (h4 - hf) / (hg - hf) }
  }
})

function check(name: string, r: RankineResult) {
  if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
  const e = ref[name]!
  expect(Math.abs(r.thermalEfficiency - e.eta) / e.eta).toBeLessThan(1e-7)
  expect(Math.abs(r.netWork - e.net) / e.net).toBeLessThan(1e-7)
  expect(Math.abs(r.heatIn - e.qin) / e.qin).toBeLessThan(1e-7)
  expect(Math.abs(r.turbineExitQuality! - e.x)).toBeLessThan(1e-7)
  if (e.y !== undefined) expect(Math.abs(r.bleedFraction! - e.y)).toBeLessThan(1e-7)
}

describe('Rankine cycles recomputed with python3-iapws states (independent reference)', () => {
  test('Cengel & Boles 7th ed. Example 10-1 (from memory): 3 MPa / 350 C / 75 kPa, ideal', () => {
    check(
      '10-1',
      mine(solveRankine({ boilerPressure: 3e6, condenserPressure: 75e3, turbineInletTemperature: 350 + C })),
    )
  })
  test('Example 10-4 (from memory): 15 MPa / 600 C, reheat 4 MPa to 600 C, 10 kPa', () => {
    check(
      '10-4',
      mine(
        solveRankine({
          boilerPressure: pB,
          condenserPressure: pC,
          turbineInletTemperature: T3,
          reheat: { pressure: 4e6, temperature: T3 },
        }),
      ),
    )
  })
  test('Example 10-5 (from memory): open feedwater heater at 1.2 MPa', () => {
    check(
      '10-5',
      mine(
        solveRankine({
          boilerPressure: pB,
          condenserPressure: pC,
          turbineInletTemperature: T3,
          openFeedwaterHeater: { pressure: 1.2e6 },
        }),
      ),
    )
  })
  test('15 MPa / 600 C / 10 kPa with pump efficiency 0.85 and turbine efficiency 0.87', () => {
    check(
      'eff',
      mine(
        solveRankine({
          boilerPressure: pB,
          condenserPressure: pC,
          turbineInletTemperature: T3,
          pumpEfficiency: 0.85,
          turbineEfficiency: 0.87,
        }),
      ),
    )
  })
})
