import { describe, expect, test } from 'vitest'
import { P_REF } from '../constants.ts'
import { parseGas } from '../spec.ts'
import { perKilogram } from './flow-gas.ts'
import type { FlowGas } from './flow-gas.ts'
import { solveDuct } from './nozzle-diffuser.ts'
import type { DuctInput, DuctResult } from './nozzle-diffuser.ts'

function gas(spec: unknown): FlowGas {
  const g = parseGas(spec)
  if (!g.ok) throw new Error(g.error.message)
  const f = perKilogram(g.value)
  if ('error' in f) throw new Error(f.error)
  return f
}

// A constant-cp gas with k = 1.4 exactly and R = 287 J/(kg K): cp = kR/(k − 1) = 1004.5 J/(kg K).
const k = 1.4
const R = 287
const cp = (k * R) / (k - 1)
const k14 = gas({ R: '287 J/(kg K)', gamma: 1.4 })
const nasaAir = gas('nasa:dry-air')

function solved(input: Omit<DuctInput, 'gas'> & { gas?: FlowGas }): DuctResult {
  const r = solveDuct({ gas: k14, ...input })
  if (!r.ok) throw new Error(r.error.message)
  return r.value
}
function refused(input: Omit<DuctInput, 'gas'>) {
  const r = solveDuct({ gas: k14, ...input })
  if (r.ok) throw new Error('expected a refusal')
  return r.error
}

// The closed forms of every gas-dynamics text for a calorically perfect gas (common practice):
//   V2 = √(2 η cp T1 (1 − (p2/p1)^((k−1)/k)) + V1²)   (η = 1: the isentropic nozzle)
//   T0 = T + V²/(2 cp),  p0 = p (T0/T)^(k/(k−1))
//   p*/p0 = (2/(k+1))^(k/(k−1)) = 0.5283 for k = 1.4 (isentropic-flow tables)
//   A/A* = (1/M) [(2/(k+1))(1 + (k−1)/2 M²)]^((k+1)/(2(k−1)))  (1.6875 at M = 2, 2.9635 at M = 0.2 in the tables)
const e = (k - 1) / k
const Vexit = (T1: number, V1: number, pr: number, eta = 1) => Math.sqrt(2 * eta * cp * T1 * (1 - pr ** e) + V1 * V1)
const areaOverCritical = (M: number) =>
  (1 / M) * ((2 / (k + 1)) * (1 + ((k - 1) / 2) * M * M)) ** ((k + 1) / (2 * (k - 1)))

describe('nozzle, constant cp (k = 1.4): the closed forms', () => {
  test('isentropic: exit velocity, temperature and the stagnation state of the inlet', () => {
    const r = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 60, p2: 200e3 })
    expect(r.exit.V).toBeCloseTo(Vexit(500, 60, 2 / 3), 6)
    expect(r.exit.T).toBeCloseTo(500 * (2 / 3) ** e, 6)
    expect(r.inlet.T0).toBeCloseTo(500 + (60 * 60) / (2 * cp), 9)
    expect(r.inlet.p0).toBeCloseTo(300e3 * ((500 + 3600 / (2 * cp)) / 500) ** (1 / e), 3)
    expect(r.exit.T0).toBeCloseTo(r.inlet.T0, 9) // adiabatic: the stagnation temperature is kept
    expect(r.entropyChange).toBeCloseTo(0, 9)
    expect(r.kineticEnergyChange).toBeCloseTo((r.exit.V ** 2 - 60 ** 2) / 2, 6)
    expect(r.exit.mach).toBeCloseTo(r.exit.V / Math.sqrt(k * R * r.exit.T), 12)
    expect(r.choked).toBe(false)
  })

  test('with η_N = 0.92 the kinetic-energy gain is 92 % of the isentropic one', () => {
    const r = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 60, p2: 200e3, efficiency: 0.92 })
    expect(r.exit.V).toBeCloseTo(Vexit(500, 60, 2 / 3, 0.92), 6)
    expect(r.entropyChange).toBeGreaterThan(0)
    expect(r.exit.p0).toBeLessThan(r.inlet.p0)
  })

  test('the critical pressure ratio is 0.5283 (isentropic-flow tables, k = 1.4)', () => {
    const r = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 60, p2: 200e3 })
    expect(r.critical.pressureRatio).toBeCloseTo((2 / (k + 1)) ** (k / (k - 1)), 8)
    expect(r.critical.pressureRatio).toBeCloseTo(0.5283, 4)
  })

  test('converging nozzle below the critical pressure: choked, sonic exit at p* = 0.5283 p0', () => {
    const r = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 0, p2: 100e3 })
    expect(r.choked).toBe(true)
    expect(r.backPressure).toBe(100e3)
    expect(r.exit.mach).toBeCloseTo(1, 6)
    expect(r.exit.p / 300e3).toBeCloseTo((2 / (k + 1)) ** (k / (k - 1)), 6)
    expect(r.exit.T).toBeCloseTo((2 * 500) / (k + 1), 4)
    expect(r.exit.V).toBeCloseTo(Math.sqrt(k * R * ((2 * 500) / (k + 1))), 3)
    expect(r.notes.join(' ')).toMatch(/choke/)
  })

  test('converging-diverging: a supersonic exit, and the area ratio of the isentropic-flow tables', () => {
    // inlet at M1 = 0.2, exit at M2 = 2 (p2/p0 = (1 + 0.2 M²)^(−3.5) = 0.1278 in the tables)
    const T1 = 400
    const V1 = 0.2 * Math.sqrt(k * R * T1)
    const T0 = T1 * (1 + 0.2 * 0.04)
    const p0 = 500e3
    const p1 = p0 * (T1 / T0) ** (1 / e)
    const p2 = p0 * (1 + 0.2 * 4) ** (-1 / e)
    const r = solved({ device: 'nozzle', shape: 'converging-diverging', p1, T1, V1, p2, massFlow: 3 })
    expect(r.exit.mach).toBeCloseTo(2, 6)
    expect(r.areaRatio!).toBeCloseTo(areaOverCritical(2) / areaOverCritical(0.2), 6)
    expect(areaOverCritical(2)).toBeCloseTo(1.6875, 4)
    expect(areaOverCritical(0.2)).toBeCloseTo(2.9635, 3)
    // exit area from the continuity equation ṁ = ρ A V
    expect(r.exitArea!).toBeCloseTo(3 / ((p2 / (R * r.exit.T)) * r.exit.V), 9)
  })

  test('a converging nozzle refuses an exit velocity it could only reach supersonic, naming p*/p0', () => {
    const err = refused({ device: 'nozzle', p1: 300e3, T1: 500, V1: 30, V2: 600 })
    expect(err.code).toBe('choked')
    expect(err.message).toMatch(/0\.5283/)
    expect(err.message).toMatch(/converging-diverging/)
  })

  test('an exit pressure above the inlet stagnation pressure is refused', () => {
    const err = refused({ device: 'nozzle', p1: 300e3, T1: 500, V1: 100, p2: 320e3 })
    expect(err.message).toMatch(/stagnation pressure/)
    expect(refused({ device: 'nozzle', p1: 300e3, T1: 500, V1: 100, p2: 305e3 }).message).toMatch(/diffuser/)
  })

  test('exit given by its velocity: T2 from the energy balance, p2 from the efficiency', () => {
    const r = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 30, V2: 300, efficiency: 0.9 })
    const T2 = 500 - (300 ** 2 - 30 ** 2) / (2 * cp)
    const T2s = 500 - (500 - T2) / 0.9
    expect(r.exit.T).toBeCloseTo(T2, 9)
    expect(r.exit.p).toBeCloseTo(300e3 * (T2s / 500) ** (1 / e), 4)
  })

  test('exit pressure and temperature given: the efficiency follows', () => {
    const T2s = 500 * (2 / 3) ** e
    const T2 = 500 - 0.85 * (500 - T2s)
    const r = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 30, p2: 200e3, T2 })
    expect(r.efficiency).toBeCloseTo(0.85, 9)
  })

  test('a heat loss lowers the exit kinetic energy by the same amount', () => {
    const a = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 30, T2: 450 })
    const b = solved({ device: 'nozzle', p1: 300e3, T1: 500, V1: 30, T2: 450, heatLoss: 5000 })
    expect(a.kineticEnergyChange - b.kineticEnergyChange).toBeCloseTo(5000, 6)
    expect(b.heat).toBe(-5000)
  })
})

describe('diffuser', () => {
  test('T2 from the energy balance; p2 from η_D = (T2s − T1)/(T2 − T1)', () => {
    const r = solved({ device: 'diffuser', p1: 80e3, T1: 283.15, V1: 250, V2: 40, efficiency: 0.9 })
    const T2 = 283.15 + (250 ** 2 - 40 ** 2) / (2 * cp)
    const T2s = 283.15 + 0.9 * (T2 - 283.15)
    expect(r.exit.T).toBeCloseTo(T2, 9)
    expect(r.exit.p).toBeCloseTo(80e3 * (T2s / 283.15) ** (1 / e), 4)
    expect(r.exit.p0).toBeLessThan(r.inlet.p0)
  })

  test('isentropic diffuser to rest: the exit is the inlet stagnation state', () => {
    const r = solved({ device: 'diffuser', p1: 80e3, T1: 283.15, V1: 200, V2: 0 })
    expect(r.exit.T).toBeCloseTo(r.inlet.T0, 9)
    expect(r.exit.p).toBeCloseTo(r.inlet.p0, 4)
  })

  // Çengel & Boles, Thermodynamics: An Engineering Approach, chapter 5, "deceleration of air in a
  // diffuser" (Example 5-4 in the 7th/8th editions; from memory): air at 10 °C and 80 kPa enters
  // at 200 m/s through 0.4 m², leaving at a negligible velocity; the book gives ṁ = 78.8 kg/s
  // and T2 = 303 K (cp = 1.005 kJ/(kg·K), R = 0.287 kJ/(kg·K)).
  test('the textbook diffuser example (from memory): 78.8 kg/s, 303 K', () => {
    const r = solved({ device: 'diffuser', gas: gas('air'), p1: 80e3, T1: 283.15, V1: 200, V2: 0, inletArea: 0.4 })
    expect(r.massFlow!).toBeGreaterThan(78.8 * 0.995)
    expect(r.massFlow!).toBeLessThan(78.8 * 1.005)
    expect(Math.abs(r.exit.T - 303)).toBeLessThan(0.5)
  })

  test('refuses an exit velocity above the inlet velocity, and a pressure the flow cannot reach', () => {
    expect(refused({ device: 'diffuser', p1: 80e3, T1: 283.15, V1: 200, V2: 250 }).message).toMatch(
      /slows the flow.*lower than the inlet velocity/,
    )
    const err = refused({ device: 'diffuser', p1: 80e3, T1: 283.15, V1: 200, p2: 150e3, efficiency: 0.9 })
    expect(err.message).toMatch(/highest exit pressure/)
    expect(refused({ device: 'diffuser', p1: 80e3, T1: 283.15, V1: 200, p2: 70e3 }).message).toMatch(
      /raises the pressure/,
    )
  })

  test('refuses a supersonic inlet (shocks are not modelled)', () => {
    expect(refused({ device: 'diffuser', p1: 80e3, T1: 283.15, V1: 500, V2: 50 }).code).toBe('unsupported')
  })
})

describe('variable cp (NASA dry air): energy, entropy and the local γ', () => {
  test('isentropic nozzle: h + V²/2 and s are kept; the Mach number uses γ(T2)', () => {
    const r = solved({ device: 'nozzle', gas: nasaAir, p1: 500e3, T1: 1200, V1: 50, p2: 300e3 })
    expect(r.inlet.h + 50 ** 2 / 2).toBeCloseTo(r.exit.h + r.exit.V ** 2 / 2, 5)
    expect(r.exit.s).toBeCloseTo(r.inlet.s, 6)
    const a2 = Math.sqrt(nasaAir.gamma(r.exit.T) * nasaAir.R * r.exit.T)
    expect(r.exit.mach).toBeCloseTo(r.exit.V / a2, 10)
    // hot air has γ < 1.4, so constant-cp air would overpredict the temperature drop
    expect(nasaAir.gamma(1200)).toBeLessThan(1.36)
    expect(r.exit.s - (nasaAir.sT(r.exit.T) - nasaAir.R * Math.log(r.exit.p / P_REF))).toBeCloseTo(0, 9)
  })

  test('near room temperature γ ≈ 1.40, so p*/p0 is close to the 0.5283 of the tables', () => {
    const r = solved({ device: 'nozzle', gas: nasaAir, p1: 200e3, T1: 300, V1: 0, p2: 150e3 })
    expect(Math.abs(r.critical.pressureRatio - 0.5283)).toBeLessThan(0.002)
  })

  test('choked with losses: the exit is sonic by the local γ', () => {
    const r = solved({ device: 'nozzle', gas: nasaAir, p1: 800e3, T1: 1000, V1: 20, p2: 200e3, efficiency: 0.95 })
    expect(r.choked).toBe(true)
    expect(r.exit.mach).toBeCloseTo(1, 6)
  })
})

test('a per-mole gas without a molar mass is refused with the reason', () => {
  const g = parseGas('monatomic')
  if (!g.ok) throw new Error(g.error.message)
  const f = perKilogram(g.value)
  expect('error' in f && f.error).toMatch(/molar mass/)
})
