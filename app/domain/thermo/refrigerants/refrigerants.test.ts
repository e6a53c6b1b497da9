// Thermodynamic consistency, round trips and bad input for the refrigerant properties.
import { describe, expect, it } from 'vitest'
import { REFRIGERANT_IDS, REFRIGERANTS, getRefrigerant } from './index.ts'
import { stateTRho } from './flash.ts'
import { R134A } from './fluids/r134a.ts'
import { R744 } from './fluids/r744.ts'
import { R1234YF } from './fluids/r1234yf.ts'
import { R717 } from './fluids/r717.ts'
import type { FluidResult } from './types.ts'

function val<T>(r: FluidResult<T>): T {
  if (!r.ok) throw new Error(r.error.message)
  return r.value
}

describe.each(REFRIGERANT_IDS)('%s', (id) => {
  const f = getRefrigerant(id)
  const T0 = f.Ttriple + 1,
    T1 = 0.5 * (f.Ttriple + f.Tc),
    T2 = f.Tc - 2
  const Ts = [T0, T1, T2]

  it('saturation: equal pressure and equal Gibbs energy of the two phases', () => {
    for (const T of Ts) {
      const s = val(f.saturationT(T))
      const gL = s.liquid.h - T * s.liquid.s,
        gV = s.vapour.h - T * s.vapour.s
      expect(Math.abs(gL - gV) / Math.abs(s.vapour.h - s.liquid.h)).toBeLessThan(1e-9)
      expect(Math.abs(s.liquid.p - s.vapour.p) / s.p).toBeLessThan(1e-12)
    }
  })

  it('Clausius–Clapeyron: dp/dT of the saturation pressure = Δh/(TΔv)', () => {
    for (const T of Ts) {
      const dT = 1e-3
      const dpdT = (val(f.saturationT(T + dT)).p - val(f.saturationT(T - dT)).p) / (2 * dT)
      const s = val(f.saturationT(T))
      const cc = (s.vapour.h - s.liquid.h) / (T * (s.vapour.v - s.liquid.v))
      expect(Math.abs(dpdT - cc) / cc).toBeLessThan(1e-5)
    }
  })

  it('Maxwell relation (∂s/∂v)_T = (∂p/∂T)_v and cp > cv > 0 in liquid, vapour and supercritical states', () => {
    const states = [
      val(f.stateTP(T1, val(f.saturationT(T1)).p * 2)),
      val(f.stateTP(T1, val(f.saturationT(T1)).p * 0.5)),
      val(f.stateTP(f.Tc + 20, f.pc * 1.5)),
    ]
    for (const st of states) {
      const T = st.T,
        v = st.v
      const dv = v * 1e-6,
        dT = T * 1e-6
      const at = (TT: number, vv: number) => rawState(id)(TT, 1 / vv)
      const dsdv = (at(T, v + dv).s - at(T, v - dv).s) / (2 * dv)
      const dpdT = (at(T + dT, v).p - at(T - dT, v).p) / (2 * dT)
      expect(Math.abs(dsdv - dpdT) / Math.abs(dpdT)).toBeLessThan(1e-6)
      expect(st.cv).toBeGreaterThan(0)
      expect(st.cp!).toBeGreaterThan(st.cv!)
      expect(st.w).toBeGreaterThan(0)
    }
  })

  it('round trips stateTP → statePH / statePS return the same T (1e-9 relative), also two-phase (p, h)', () => {
    const pts: [number, number][] = [
      [T1, val(f.saturationT(T1)).p * 1.5],
      [T1, val(f.saturationT(T1)).p * 0.7],
      [f.Tc + 30, f.pc * 1.3],
      [f.Tc + 30, f.pc * 0.5],
    ]
    for (const [T, p] of pts) {
      const st = val(f.stateTP(T, p))
      expect(Math.abs(val(f.statePH(p, st.h)).T - T) / T).toBeLessThan(1e-9)
      expect(Math.abs(val(f.statePS(p, st.s)).T - T) / T).toBeLessThan(1e-9)
    }
    const wet = val(f.stateTx(T1, 0.37))
    const back = val(f.statePH(wet.p, wet.h))
    expect(back.phase).toBe('two-phase')
    expect(Math.abs(back.T - T1) / T1).toBeLessThan(1e-9)
    expect(back.x).toBeCloseTo(0.37, 8)
    const back2 = val(f.statePS(wet.p, wet.s))
    expect(back2.x).toBeCloseTo(0.37, 8)
    const px = val(f.statePx(wet.p, 0.37))
    expect(px.h).toBeCloseTo(wet.h, 3)
  })

  it('bad input gets ok: false with a clear message', () => {
    const cases: [FluidResult<unknown>, RegExp][] = [
      [f.stateTP(NaN, 1e5), /number/],
      [f.stateTP(300, -1), /positive/],
      [f.stateTP(f.Ttriple - 5, 1e5), /below the lowest temperature/],
      [f.stateTP(f.Tmax + 5, 1e5), /above the highest temperature/],
      [f.stateTP(300, f.pmax * 2), /above the highest pressure/],
      [f.statePH(NaN, 1e5), /number/],
      [f.statePS(-5, 1e3), /positive/],
      [f.saturationT(f.Tc + 1), /supercritical/],
      [f.saturationT(f.Ttriple - 1), /below the triple point/],
      [f.saturationP(f.pc * 1.01), /supercritical/],
      [f.stateTx(T1, 1.5), /quality/],
    ]
    for (const [r, msg] of cases) {
      expect(r.ok).toBe(false)
      if (!r.ok) expect(r.error.message).toMatch(msg)
    }
    const s = val(f.saturationT(T1))
    const inDome = f.stateTP(T1, s.p)
    expect(inDome.ok).toBe(false)
    if (!inDome.ok) expect(inDome.error.message).toMatch(/dome/)
  })
})

const DATA = { R134a: R134A, R1234yf: R1234YF, R717, R744 }
const rawCache = new Map<string, ReturnType<typeof stateTRho>>()
function rawState(id: keyof typeof DATA) {
  let f = rawCache.get(id)
  if (!f) {
    f = stateTRho(DATA[id])
    rawCache.set(id, f)
  }
  return f
}

describe('transcritical CO2 (gas-cooler states above pc)', () => {
  const co2 = REFRIGERANTS.R744
  it('states at 10 MPa from 35 °C to 120 °C are supercritical and round-trip through (p, h) and (p, s)', () => {
    for (const T of [308.15, 313.15, 333.15, 393.15]) {
      const st = val(co2.stateTP(T, 10e6))
      expect(st.phase).toBe('supercritical')
      expect(Math.abs(val(co2.statePH(10e6, st.h)).T - T) / T).toBeLessThan(1e-9)
      expect(Math.abs(val(co2.statePS(10e6, st.s)).T - T) / T).toBeLessThan(1e-9)
    }
  })
  it('near-critical states just above pc (7.5 MPa, 305 K … 310 K) solve', () => {
    for (const T of [305, 306, 308, 310]) {
      const st = val(co2.stateTP(T, 7.5e6))
      expect(Math.abs(val(co2.statePH(7.5e6, st.h)).T - T) / T).toBeLessThan(1e-9)
    }
  })
})

describe('states within 0.01 K below Tc but away from pc', () => {
  it('CO2 vapour at 304.123 K, 5.12 MPa solves (a (p, s) solve passes through this band)', () => {
    const st = val(REFRIGERANTS.R744.stateTP(304.123, 5.12e6))
    expect(st.phase).toBe('vapour')
    expect(Math.abs(st.p - 5.12e6) / 5.12e6).toBeLessThan(1e-9)
    const hot = val(REFRIGERANTS.R744.stateTP(304.122, 1.7618e6))
    expect(Math.abs(val(REFRIGERANTS.R744.statePS(1.7618e6, hot.s)).T - 304.122) / 304.122).toBeLessThan(1e-9)
  })
  it('but the tip of the dome (within 1 % of pc) is refused plainly', () => {
    const r = REFRIGERANTS.R744.stateTP(304.123, 7.37e6)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(/critical point/)
  })
})
