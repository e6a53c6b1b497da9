// Water in the general cycle format (steam-cycle.ts) and the (T, s), (T, v), (p, v) state routes.
// Sources named beside each check: Cengel & Boles, "Thermodynamics: An Engineering Approach",
// 7th ed., Example 7-4 (entropy change of water heated at constant pressure in a
// piston-cylinder: 3 lbm, 20 psia, 70 F, 3450 Btu -> dS = 5.105 Btu/R), FROM MEMORY, 0.5 %;
// "closed form" for the Carnot efficiency 1 - T_L/T_H, the first law per step and round trips.
import { describe, expect, test } from 'vitest'
import { stateFromPT, stateFromPV, stateFromPx, stateFromTS, stateFromTV } from './properties.ts'
import { solveSteamCarnot, solveSteamCycle, solveSteamCycleSpec, STEAM_CYCLE_CAUTION } from './steam-cycle.ts'
import type { SteamCycleResult } from './steam-cycle.ts'

const C = 273.15
function value<T>(r: { ok: true; value: T } | { ok: false; error: unknown }): T {
  if (!r.ok) throw new Error(JSON.stringify(r.error))
  return r.value
}
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b)

describe('(T, s), (T, v), (p, v) states return the state they came from (closed form round trip)', () => {
  test.each([
    [1e6, 300],
    [80e6, 600],
    [1e3, 500],
    [5e6, 800],
    [21e6, 640],
    [19e6, 640],
    [30e6, 660],
    [10e6, 1500],
    [100e6, 1073],
  ])('p = %d Pa, T = %d K', (p, T) => {
    const s = value(stateFromPT(p, T))
    expect(rel(value(stateFromTS(T, s.s)).p, p)).toBeLessThan(1e-8)
    expect(rel(value(stateFromTV(T, s.v)).p, p)).toBeLessThan(1e-8)
    expect(rel(value(stateFromPV(p, s.v)).T, T)).toBeLessThan(1e-9)
  })
  test('inside the dome they give the quality (lever rule, closed form)', () => {
    const m = value(stateFromPx(0.5e6, 0.37))
    expect(value(stateFromTS(m.T, m.s)).x).toBeCloseTo(0.37, 10)
    expect(value(stateFromTV(m.T, m.v)).x).toBeCloseTo(0.37, 10)
    expect(value(stateFromPV(m.p, m.v)).x).toBeCloseTo(0.37, 10)
  })
  test('out of range is an error, not extrapolation', () => {
    const a = stateFromTS(400, 50e3)
    const b = stateFromPV(1e5, -1)
    expect(!a.ok && a.error.code).toBe('out-of-range')
    expect(!b.ok && b.error.code).toBe('invalid-input')
  })
})

describe('piston-cylinder processes of water', () => {
  test('Cengel & Boles 7th ed. Example 7-4 (from memory): 3 lbm at 20 psia, 70 F, heated at constant pressure by 3450 Btu -> dS = 5.105 Btu/R', () => {
    const lbm = 0.45359237
    const psia = 6894.757
    const Btu = 1055.056
    const m = 3 * lbm
    const p = 20 * psia
    const T1 = (70 - 32) / 1.8 + C
    const h1 = value(stateFromPT(p, T1)).h
    const r = value(
      solveSteamCycle({
        system: 'closed',
        mass: m,
        states: [{ p, T: T1 }, { h: h1 + (3450 * Btu) / m }],
        steps: [{ process: 'isobaric' }],
      }),
    )
    const step = r.steps[0]!
    expect(rel((m * step.dS * (5 / 9)) / Btu, 5.105)).toBeLessThan(0.005)
    expect(rel(m * step.q, 3450 * Btu)).toBeLessThan(1e-9) // isobaric, closed: Q = ΔH (closed form)
    expect(r.caution).toBe(STEAM_CYCLE_CAUTION)
  })

  const closed: SteamCycleResult = value(
    solveSteamCycle({
      system: 'closed',
      mass: 2,
      states: [
        { name: 'A', p: 1e6, x: 0.5 },
        { name: 'B', x: 1 },
        { name: 'C', p: 0.2e6 },
        { name: 'D', T: 500 },
        { name: 'E', p: 0.4e6 },
      ],
      steps: [{ process: 'isobaric' }, { process: 'isentropic' }, { process: 'isochoric' }, { process: 'isothermal' }],
    }),
  )
  test('states not given in full take the constant property of the step (p, s, v, T)', () => {
    const [A, B, C2, D, E] = closed.states
    expect(rel(B!.p, A!.p)).toBeLessThan(1e-12)
    expect(rel(C2!.s, B!.s)).toBeLessThan(1e-9)
    expect(rel(D!.v, C2!.v)).toBeLessThan(1e-9)
    expect(rel(E!.T, D!.T)).toBeLessThan(1e-12)
  })
  test('first law per step: q − w = ΔU (closed form), and each process rule', () => {
    for (const s of closed.steps)
      expect(Math.abs(s.q - s.w - s.dU)).toBeLessThan(1e-6 * Math.max(1, Math.abs(s.q), Math.abs(s.dU)))
    const [iso, isen, isoch, isoth] = closed.steps
    const [A, B] = closed.states
    expect(iso!.w).toBeCloseTo(A!.p * (B!.v - A!.v), 6) // W = p Δv
    expect(iso!.q).toBeCloseTo(iso!.dH, 6) // Q = ΔH at constant p
    expect(isen!.q).toBe(0)
    expect(isoch!.w).toBe(0)
    expect(isoth!.q).toBeCloseTo(500 * isoth!.dS, 6) // Q = T ΔS
  })
  test('a state that contradicts the process is refused with a message', () => {
    const r = solveSteamCycle({
      system: 'closed',
      states: [
        { p: 1e6, T: 500 },
        { p: 2e6, T: 600 },
      ],
      steps: [{ process: 'isobaric' }],
    })
    expect(!r.ok && r.error.message).toMatch(/isobaric, but p changes/)
    const u = solveSteamCycle({
      system: 'closed',
      states: [{ p: 1e6, T: 500 }, { x: 0.5 }],
      steps: [{ process: 'isentropic' }],
    })
    expect(!u.ok && u.error.message).toMatch(/pair/)
    const x = solveSteamCycle({
      system: 'closed',
      states: [{ p: 1e6, x: 1.4 }, { p: 2e6 }],
      steps: [{ process: 'isentropic' }],
    })
    expect(!x.ok && x.error.property).toBe('states.0.x')
    const missing = solveSteamCycle({
      system: 'closed',
      states: [{ p: 1e6 }, { T: 600 }],
      steps: [{ process: 'isobaric' }],
    })
    expect(!missing.ok && missing.error.message).toMatch(/not fixed/)
  })
})

describe('vapour Carnot cycle inside the dome (steady flow)', () => {
  test.each([
    [250 + C, 50 + C, 0, 1],
    [300 + C, 40 + C, 0.1, 0.9],
    [200 + C, 100 + C, 0.2, 0.95],
  ])('T_H = %d K, T_L = %d K: efficiency 1 − T_L/T_H, net work = net heat (closed form)', (TH, TL, x1, x2) => {
    const r = value(solveSteamCarnot({ hotTemperature: TH, coldTemperature: TL, qualityStart: x1, qualityEnd: x2 }))
    expect(rel(r.efficiency!, 1 - TL / TH)).toBeLessThan(1e-12)
    expect(Math.abs(r.netHeat - r.netWork) / r.heatIn).toBeLessThan(1e-12)
    for (const s of r.steps) expect(Math.abs(s.q - s.w - s.dH)).toBeLessThan(1e-6 * Math.max(1, Math.abs(s.q)))
    // In the dome the isotherms are isobars: the boiler and condenser do (almost) no work; what is
    // left is IF97's saturation consistency (|Δg| <= 0.2 kJ/kg in the release, from memory).
    expect(Math.abs(r.steps[0]!.w)).toBeLessThan(200)
    expect(r.states.every((s) => s.x !== null)).toBe(true)
  })
  test('bad input: above the critical temperature, qualities outside [0, 1] or reversed', () => {
    expect(!solveSteamCarnot({ hotTemperature: 700, coldTemperature: 300 }).ok).toBe(true)
    const a = solveSteamCarnot({ hotTemperature: 500, coldTemperature: 300, qualityEnd: 1.2 })
    expect(!a.ok && a.error.property).toBe('qualityEnd')
    const b = solveSteamCarnot({ hotTemperature: 500, coldTemperature: 300, qualityStart: 0.8, qualityEnd: 0.2 })
    expect(!b.ok && b.error.message).toMatch(/raise the quality/)
  })
})

describe('spec layer', () => {
  test('steam-carnot template with units, chemistry convention', () => {
    const r = solveSteamCycleSpec({
      template: 'steam-carnot',
      inputs: { hotTemperature: '250 °C', coldTemperature: '50 °C' },
      convention: 'chemistry',
    })
    if (!r.ok) throw new Error(JSON.stringify(r.error))
    expect(r.totals.efficiency!.value).toBeCloseTo(1 - 323.15 / 523.15, 12)
    expect(r.totals.netWork.value).toBeLessThan(0) // work done ON the water over the cycle is negative
    expect(r.convention.equation).toBe('ΔU = q + w')
    expect(r.notice).toContain('not design data')
  })
  test('a piston-cylinder path in strings with units; totals for the mass', () => {
    const r = solveSteamCycleSpec({
      steamCycle: {
        system: 'closed',
        mass: '2 kg',
        states: [
          { name: '1', p: '1 MPa', x: '0.5' },
          { name: '2', T: '300 °C' },
        ],
        steps: [{ process: 'isobaric', label: 'heating' }],
      },
    })
    if (!r.ok) throw new Error(JSON.stringify(r.error))
    const s = r.steps[0]!
    expect(s.total.q.value).toBeCloseTo(2 * s.q.value, 6)
    expect(s.label).toBe('heating')
    expect(r.states[1]!.phase).toBe('vapour')
  })
  test.each([
    [
      {
        steamCycle: {
          system: 'closed',
          states: [{ p: '1 MPa', T: 'hot' }, { p: '1 MPa' }],
          steps: [{ process: 'isobaric' }],
        },
      },
      'steamCycle.states.0.T',
    ],
    [
      {
        steamCycle: {
          system: 'closed',
          states: [{ p: '1 MPa', T: '500 K', colour: 'red' }, { p: '1 MPa' }],
          steps: [{ process: 'isobaric' }],
        },
      },
      'steamCycle.states.0.colour',
    ],
    [
      {
        steamCycle: {
          system: 'closed',
          states: [{ p: '1 MPa', T: '500 K' }, { p: '1 MPa' }],
          steps: [{ process: 'adiabatic' }],
        },
      },
      'steamCycle.steps.0.process',
    ],
    [{ template: 'steam-carnot', inputs: { hotTemperature: '250 °C' } }, 'coldTemperature'],
    [{ steamCycle: 'x' }, 'steamCycle'],
  ])('%o -> a message on %s', (spec, property) => {
    const r = solveSteamCycleSpec(spec)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.property).toBe(property)
  })
})
