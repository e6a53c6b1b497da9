// Public (SI) steam API: verification values through the SI interface, region selection,
// range errors, two-phase states, and the release's consistency requirements at the region
// boundaries.
// Sources named beside each check: IAPWS R7-97(2012) tables (typed from the editor's memory
// of the release), "closed form" for identities, and the release's permitted inconsistencies
// at region boundaries (|dv/v| <= 0.05 %, |dh| <= 0.2 kJ/kg, |ds| <= 0.2 J/(kg K),
// |dcp/cp| <= 1 %, |dw/w| <= 1 %, and |dg| <= 0.2 kJ/kg for the saturation condition; from
// the editor's memory of the release's Section on consistency at region boundaries).
import { describe, expect, test } from 'vitest'
import { pB23 } from './if97/b23.ts'
import { region1 } from './if97/region1.ts'
import { region2 } from './if97/region2.ts'
import { region3, region3Density } from './if97/region3.ts'
import { region5 } from './if97/region5.ts'
import { pSat } from './if97/region4.ts'
import type { If97Props } from './if97/types.ts'
import {
  enthalpyFromPT,
  hsFromPT,
  qualityFromPH,
  qualityFromPS,
  regionFromPT,
  saturationAtP,
  saturationPressure,
  saturationTemperature,
  stateFromPH,
  stateFromPS,
  stateFromPT,
  stateFromPV,
  stateFromPx,
  stateFromRhoT,
  stateFromTS,
  stateFromTV,
  stateFromTx,
  temperatureFromPH,
  temperatureFromPS,
} from './properties.ts'
import { SteamRangeError } from './errors.ts'

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)
function value<T>(r: { ok: true; value: T } | { ok: false; error: unknown }): T {
  if (!r.ok) throw new Error(JSON.stringify(r.error))
  return r.value
}

describe('SI interface reproduces the release verification values', () => {
  test('region 1, T = 300 K, p = 3 MPa (IAPWS R7-97(2012) Table 5) in Pa, J/kg, J/(kg K)', () => {
    const s = value(stateFromPT(3e6, 300))
    expect(s.region).toBe(1)
    expect(s.phase).toBe('liquid')
    expect(rel(s.v, 0.100215168e-2)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.h, 0.115331273e6)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.s, 0.392294792e3)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.w!, 0.150773921e4)).toBeLessThanOrEqual(1e-8)
  })
  test('region 5, T = 1500 K, p = 30 MPa (IAPWS R7-97(2012) Table 42)', () => {
    const s = value(stateFromPT(30e6, 1500))
    expect(s.region).toBe(5)
    expect(s.phase).toBe('supercritical')
    expect(rel(s.v, 0.230761299e-1)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.h, 0.516723514e7)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.s, 0.772970133e4)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.w!, 0.928548002e3)).toBeLessThanOrEqual(1e-8)
    expect(value(stateFromPT(0.5e6, 1500)).phase).toBe('vapour')
    const out = hsFromPT(0.5e6, 1500, new Float64Array(2))
    expect(rel(out[0]!, 0.521976855e7)).toBeLessThanOrEqual(1e-8)
  })
  test('region 2, T = 700 K, p = 30 MPa (IAPWS R7-97(2012) Table 15)', () => {
    const s = value(stateFromPT(30e6, 700))
    expect(s.region).toBe(2)
    expect(rel(s.v, 0.542946619e-2)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.cp!, 0.103505092e5)).toBeLessThanOrEqual(1e-8)
  })
  test('region 3 from (p, T): T = 650 K, p = 25.5837018 MPa gives rho = 500 kg/m3 (IAPWS R7-97(2012) Table 33)', () => {
    const s = value(stateFromPT(0.255837018e8, 650))
    expect(s.region).toBe(3)
    // p is tabulated to 9 digits; d(ln rho)/d(ln p) is about 1 here, so rho agrees to ~1e-8.
    expect(rel(s.rho, 500)).toBeLessThan(2e-8)
    expect(rel(s.h, 0.186343019e7)).toBeLessThan(2e-8)
  })
  test('region 3 from (rho, T): T = 750 K, rho = 500 kg/m3 (IAPWS R7-97(2012) Table 33)', () => {
    const s = value(stateFromRhoT(500, 750))
    expect(rel(s.p, 0.783095639e8)).toBeLessThanOrEqual(1e-8)
    expect(rel(s.w!, 0.760696041e3)).toBeLessThanOrEqual(1e-8)
  })
  test('saturation p_s(500 K) and T_s(1 MPa) (IAPWS R7-97(2012) Tables 35, 36)', () => {
    expect(rel(value(saturationPressure(500)), 0.263889776e7)).toBeLessThanOrEqual(1e-8)
    expect(rel(value(saturationTemperature(1e6)), 0.453035632e3)).toBeLessThanOrEqual(1e-8)
  })
  test('fast path hsFromPT equals the full state (closed form: same equation)', () => {
    for (const [p, T] of [
      [3e6, 300],
      [0.0035e6, 700],
      [25e6, 650],
      [50e6, 1000],
    ] as const) {
      const out = hsFromPT(p, T, new Float64Array(2))
      const s = value(stateFromPT(p, T))
      expect(rel(out[0]!, s.h)).toBeLessThan(1e-13)
      expect(rel(out[1]!, s.s)).toBeLessThan(1e-13)
    }
  })
})

describe('region selection as IAPWS R7-97(2012) Figure 1 defines it', () => {
  test.each([
    [1e6, 300, 1],
    [1e6, 500, 2], // T_s(1 MPa) = 453.04 K
    [20e6, 623.15, 1], // T <= 623.15 K, p >= p_s: region 1
    [20e6, 630, 3], // above 623.15 K, p > p_B23(630 K) = 17.2 MPa
    [16e6, 630, 2], // p < p_B23(630 K)
    [100e6, 863, 3],
    [100e6, 864, 2], // T_B23(100 MPa) = 863.15 K
    [100e6, 1073.15, 2],
    [50e6, 1073.16, 5], // region 5: T > 1073.15 K, p <= 50 MPa
    [1e3, 2273.15, 5],
    [1, 300, 2], // 1 Pa: region 2 (p > 0)
  ] as const)('p = %d Pa, T = %d K -> region %d (release Figure 1, B23 Eq. (5))', (p, T, region) => {
    expect(value(regionFromPT(p, T))).toBe(region)
  })
})

describe('out-of-range states are errors naming the bound, never extrapolation', () => {
  test.each([
    [101e6, 500, 'p', 'p <= 100 MPa'],
    [1e6, 2273.2, 'T', 'T <= 2273.15 K'],
    [51e6, 1073.2, 'p', 'p <= 50 MPa above 1073.15 K'], // region 5 holds only to 50 MPa
    [1e6, 273.1, 'T', 'T >= 273.15 K'],
    [0, 300, 'p', 'p > 0'],
    [-5, 300, 'p', 'p > 0'],
  ] as const)('stateFromPT(%d Pa, %d K) -> out-of-range on %s (release range, Section 2)', (p, T, property, bound) => {
    const r = stateFromPT(p, T)
    expect(r.ok).toBe(false)
    if (!r.ok) {
      expect(r.error.code).toBe('out-of-range')
      expect(r.error.property).toBe(property)
      expect(r.error.bound?.name).toBe(bound)
      expect(r.error.message).toContain(property === 'p' ? 'pressure' : 'temperature')
    }
  })
  test('NaN input is invalid-input, not a throw (common practice)', () => {
    const r = stateFromPT(Number.NaN, 300)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.code).toBe('invalid-input')
  })
  test('no saturation above the critical point (release Section 8: p_s valid up to 647.096 K)', () => {
    const a = saturationPressure(650)
    const b = saturationTemperature(23e6)
    const c = stateFromPx(500, 0.5) // below p_s(273.15 K) = 611.2 Pa
    expect(!a.ok && a.error.bound?.value === 647.096).toBe(true)
    expect(!b.ok && b.error.bound?.value === 22.064e6).toBe(true)
    expect(!c.ok && c.error.code === 'out-of-range').toBe(true)
  })
  test('(p, h) beyond 2273.15 K (p <= 50 MPa), beyond 1073.15 K (p > 50 MPa) or below 273.15 K is an error naming the bound', () => {
    const hi = stateFromPH(1e5, 8e6)
    const hi60 = stateFromPH(60e6, 5e6)
    const lo = stateFromPH(1e6, -10e3)
    expect(!hi.ok && hi.error.bound?.name === 'T <= 2273.15 K').toBe(true)
    expect(!hi60.ok && hi60.error.bound?.name === 'T <= 1073.15 K').toBe(true)
    expect(!hi60.ok && hi60.error.message).toContain('50 MPa')
    expect(!lo.ok && lo.error.bound?.name === 'T >= 273.15 K').toBe(true)
  })
  test('fast path throws the typed SteamRangeError', () => {
    expect(() => enthalpyFromPT(200e6, 500)).toThrow(SteamRangeError)
    let caught: unknown = null
    try {
      enthalpyFromPT(60e6, 1500)
    } catch (e) {
      caught = e
    }
    expect(caught).toBeInstanceOf(SteamRangeError)
    expect((caught as SteamRangeError).detail.bound?.name).toBe('p <= 50 MPa above 1073.15 K')
    expect(() => enthalpyFromPT(1e6, 2300)).toThrow(SteamRangeError)
  })
  test('quality x outside [0, 1] and x from h outside the dome are errors', () => {
    const a = stateFromPx(1e5, 1.2)
    expect(!a.ok && a.error.code === 'invalid-input').toBe(true)
    const b = qualityFromPH(1e5, 100e3) // subcooled at 0.1 MPa (h' = 417.5 kJ/kg)
    expect(!b.ok && b.error.code === 'not-two-phase' && b.error.message.includes('subcooled')).toBe(true)
  })
})

describe('two-phase states (region 4)', () => {
  test('mixture properties are the lever rule between saturated liquid and vapour (closed form)', () => {
    const sat = value(saturationAtP(1e6))
    const m = value(stateFromPx(1e6, 0.3))
    expect(rel(m.h, sat.liquid.h + 0.3 * (sat.vapour.h - sat.liquid.h))).toBeLessThan(1e-14)
    expect(rel(m.v, sat.liquid.v + 0.3 * (sat.vapour.v - sat.liquid.v))).toBeLessThan(1e-14)
    expect(m.cp).toBeNull()
    expect(m.phase).toBe('two-phase')
  })
  test('x from h and from s invert the lever rule, in regions 1/2 and in region 3 (closed form)', () => {
    for (const p of [0.01e6, 1e6, 10e6, 18e6, 21.5e6]) {
      const m = value(stateFromPx(p, 0.42))
      expect(value(qualityFromPH(p, m.h))).toBeCloseTo(0.42, 12)
      expect(value(qualityFromPS(p, m.s))).toBeCloseTo(0.42, 12)
      const back = value(stateFromPH(p, m.h))
      expect(back.region).toBe(4)
      expect(back.x).toBeCloseTo(0.42, 12)
    }
  })
  test('saturated states from T and from p agree (closed form: Eqs. (30), (31) are inverses)', () => {
    const T = 640
    const a = value(stateFromTx(T, 1))
    const b = value(stateFromPx(a.p, 1))
    expect(rel(b.T, T)).toBeLessThan(1e-12)
    expect(rel(b.h, a.h)).toBeLessThan(1e-9)
  })
  test('the saturation condition: Gibbs energies of liquid and vapour agree, |dg| <= 0.2 kJ/kg (release consistency requirement, from memory)', () => {
    let worst = 0
    for (let T = 273.16; T < 647; T += 3.7) {
      const sat = value(stateFromTx(T, 0))
      const vap = value(stateFromTx(T, 1))
      worst = Math.max(worst, Math.abs(sat.h - T * sat.s - (vap.h - T * vap.s)))
    }
    expect(worst / 1000).toBeLessThanOrEqual(0.2)
  })
})

describe('(p, h) and (p, s) routes return the state they came from (closed form round trip)', () => {
  const states: [number, number][] = [
    [3e6, 300],
    [80e6, 600],
    [0.001e6, 500],
    [5e6, 800],
    [60e6, 700],
    [21e6, 640], // region 3 liquid-like (p_s(640 K) = 20.27 MPa)
    [19e6, 640], // region 3 vapour-like (p_B23(640 K) = 18.56 MPa < p < p_s)
    [21e6, 650], // region 3 above T_c (p_B23(650 K) = 20.03 MPa)
    [30e6, 660],
    [100e6, 1073],
    [0.5e6, 1500], // region 5
    [30e6, 2000],
    [50e6, 1080],
    [1e3, 2270],
  ]
  test.each(states)('p = %d Pa, T = %d K', (p, T) => {
    const s = value(stateFromPT(p, T))
    expect(rel(value(temperatureFromPH(p, s.h)), T)).toBeLessThan(1e-10)
    expect(rel(value(temperatureFromPS(p, s.s)), T)).toBeLessThan(1e-10)
    expect(value(stateFromPS(p, s.s)).region).toBe(s.region)
  })
  test('phase labels in region 3 follow the saturation line below T_c (release Section 8)', () => {
    expect(value(stateFromPT(21e6, 640)).phase).toBe('liquid')
    expect(value(stateFromPT(19e6, 640)).phase).toBe('vapour')
    expect(value(stateFromPT(19e6, 640)).region).toBe(3)
  })
})

describe('consistency at region boundaries (release permitted inconsistencies, from memory)', () => {
  function worst(pairs: [If97Props, If97Props][]) {
    const w = { v: 0, h: 0, s: 0, cp: 0, w: 0 }
    for (const [a, b] of pairs) {
      w.v = Math.max(w.v, Math.abs(a.v - b.v) / b.v)
      w.h = Math.max(w.h, Math.abs(a.h - b.h))
      w.s = Math.max(w.s, Math.abs(a.s - b.s) * 1000)
      w.cp = Math.max(w.cp, Math.abs(a.cp - b.cp) / b.cp)
      w.w = Math.max(w.w, Math.abs(a.w - b.w) / b.w)
    }
    return w
  }
  const limits = (w: ReturnType<typeof worst>) => {
    expect(w.v).toBeLessThanOrEqual(0.0005) // 0.05 %
    expect(w.h).toBeLessThanOrEqual(0.2) // kJ/kg
    expect(w.s).toBeLessThanOrEqual(0.2) // J/(kg K)
    expect(w.cp).toBeLessThanOrEqual(0.01) // 1 %
    expect(w.w).toBeLessThanOrEqual(0.01) // 1 %
  }
  test('regions 1 and 3 along T = 623.15 K, p_s(623.15 K) .. 100 MPa', () => {
    const pairs: [If97Props, If97Props][] = []
    for (let p = pSat(623.15); p <= 100; p += 2.5)
      pairs.push([region1(p, 623.15), region3(region3Density(p, 623.15, true), 623.15)])
    limits(worst(pairs))
  })
  test('regions 2 and 5 along T = 1073.15 K, 0.001 .. 50 MPa', () => {
    const pairs: [If97Props, If97Props][] = []
    for (let p = 0.001; p <= 50; p += p < 1 ? 0.1 : 2.5) pairs.push([region5(p, 1073.15), region2(p, 1073.15)])
    limits(worst(pairs))
  })
  test('regions 2 and 3 along the B23 line, 623.15 K .. 863.15 K', () => {
    const pairs: [If97Props, If97Props][] = []
    // Start just above 623.15 K: at 623.15 K itself the B23 line meets the saturation line.
    for (let T = 623.2; T <= 863.15; T += 6) {
      const p = pB23(T)
      pairs.push([region2(p, T), region3(region3Density(p, T, T >= 647.096 || p >= pSat(T)), T)])
    }
    limits(worst(pairs))
  })
})

describe('robustness: no input throws, in-range input always converges (common practice)', () => {
  test('5,000 seeded random and boundary inputs to every state function, including the critical point', () => {
    let seed = 12345
    const rnd = () => (seed = (seed * 16807) % 2147483647) / 2147483647
    const specialP = [22.064e6, 22.064e6 * (1 - 1e-12), 16.5291643e6, 611.212677, 100e6, 1e-3]
    const specialT = [647.096, 623.15, 273.15, 1073.15, 863.15, 2273.15, 1073.16]
    const problems: string[] = []
    const look = (name: string, r: { ok: boolean; value?: unknown; error?: { code: string } }, args: number[]) => {
      if (r.ok) {
        const v = r.value as { p: number; T: number; h: number; s: number; v: number }
        if (![v.p, v.T, v.h, v.s, v.v].every(Number.isFinite)) problems.push(`${name}(${args}) non-finite`)
      } else if (r.error!.code === 'no-convergence') problems.push(`${name}(${args}) no convergence`)
    }
    for (let i = 0; i < 1000; i++) {
      const p =
        i % 20 === 0
          ? specialP[i % specialP.length]!
          : Math.exp(Math.log(100) + (Math.log(1.2e8) - Math.log(100)) * rnd())
      const T = i % 30 === 0 ? specialT[i % specialT.length]! : 260 + 2030 * rnd()
      const h = -100e3 + 7.5e6 * rnd()
      const s = -100 + 13e3 * rnd()
      const x = rnd()
      expect(() => {
        look('stateFromPT', stateFromPT(p, T), [p, T])
        look('stateFromPH', stateFromPH(p, h), [p, h])
        look('stateFromPS', stateFromPS(p, s), [p, s])
        look('stateFromPx', stateFromPx(p, x), [p, x])
        look('stateFromTx', stateFromTx(T, x), [T, x])
        if (i % 4 === 0) {
          const v = Math.exp(Math.log(9e-4) + (Math.log(1e4) - Math.log(9e-4)) * rnd())
          look('stateFromTS', stateFromTS(T, s), [T, s])
          look('stateFromTV', stateFromTV(T, v), [T, v])
          look('stateFromPV', stateFromPV(p, v), [p, v])
        }
      }).not.toThrow()
    }
    expect(problems.slice(0, 10)).toEqual([])
  })
})
