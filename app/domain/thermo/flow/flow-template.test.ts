import { describe, expect, test } from 'vitest'
import { templateEntry } from '../catalog.ts'
import { solveBankSpec, solveSpec } from '../solve-spec.ts'
import { parseQuantity } from '../units.ts'
import { STEADY_FLOW_FAMILY, STEADY_FLOW_TEMPLATES } from './flow-template.ts'
import type { FormattedDuct, FormattedTurbojet } from './flow-template.ts'

const NOZZLE = {
  template: 'nozzle',
  inputs: {
    gas: 'air',
    p1: '300 kPa',
    T1: '200 °C',
    V1: '30 m/s',
    p2: '200 kPa',
    efficiency: '90 %',
    massFlow: '0.5 kg/s',
  },
}
const DIFFUSER = {
  template: 'diffuser',
  inputs: { gas: 'air', p1: '80 kPa', T1: '10 °C', V1: '200 m/s', V2: '0 m/s', inletArea: '0.4 m^2' },
}
const TURBOJET = {
  template: 'turbojet',
  inputs: {
    gas: { cp: '1.005 kJ/(kg K)', gamma: 1.4 },
    flightSpeed: '260 m/s',
    ambientPressure: '34.5 kPa',
    ambientTemperature: '-40 °C',
    pressureRatio: 10,
    turbineInletT: '1100 K',
    massFlow: '45 kg/s',
  },
}

function duct(spec: unknown): FormattedDuct {
  const r = solveSpec(spec)
  if (!r.ok) throw new Error(r.error.message)
  return r as FormattedDuct
}
function jet(spec: unknown): FormattedTurbojet {
  const r = solveSpec(spec)
  if (!r.ok) throw new Error(r.error.message)
  return r as FormattedTurbojet
}
function refusal(spec: unknown) {
  const r = solveSpec(spec)
  if (r.ok) throw new Error('expected a refusal')
  return r.error
}

test('the new units read as SI', () => {
  const v = (t: string, d: Parameters<typeof parseQuantity>[1][number]) => {
    const r = parseQuantity(t, [d])
    if (!r.ok) throw new Error(r.error.message)
    return r.value.value
  }
  expect(v('900 km/h', 'velocity')).toBeCloseTo(250, 12)
  expect(v('3600 kg/h', 'massFlow')).toBeCloseTo(1, 12)
  expect(v('25 cm^2', 'area')).toBeCloseTo(25e-4, 15)
  expect(v('8.65 MW', 'power')).toBeCloseTo(8.65e6, 6)
  expect(v('12 kN', 'force')).toBe(12000)
  expect(parseQuantity('12 kN', ['velocity']).ok).toBe(false)
})

describe('spec files', () => {
  test('the nozzle: every quantity is { value, unit } in SI, rates with the flow rate', () => {
    const r = duct(NOZZLE)
    expect(r.family).toBe(STEADY_FLOW_FAMILY)
    expect(r.states).toHaveLength(2)
    expect(r.totals.exitVelocity.unit).toBe('m/s')
    expect(r.totals.kineticEnergyRate!.value).toBeCloseTo(0.5 * r.totals.kineticEnergyChange.value, 9)
    expect(r.totals.kineticEnergyRate!.unit).toBe('W')
    expect(r.totals.exitArea!.unit).toBe('m^2')
    expect(r.convention.statement).toMatch(/V²\/2/)
    // the exit velocity by the closed form with the preset's cp and γ = cp/(cp − R)
    const cp = 1005
    const g = 1005 / 718
    const V2 = Math.sqrt(2 * 0.9 * cp * 473.15 * (1 - (2 / 3) ** ((g - 1) / g)) + 900)
    expect(r.totals.exitVelocity.value).toBeCloseTo(V2, 6)
  })

  test('the diffuser: mass flow from the inlet area, the exit at the stagnation temperature', () => {
    const r = duct(DIFFUSER)
    expect(r.totals.massFlow!.value).toBeCloseTo((80e3 / (287 * 283.15)) * 200 * 0.4, 9)
    expect(r.totals.exitTemperature.value).toBeCloseTo(283.15 + 200 ** 2 / (2 * 1005), 9)
    expect(r.totals.exitArea).toBeNull() // the exit velocity is zero
  })

  test('the turbojet: thrust in N, powers in W, six states', () => {
    const r = jet(TURBOJET)
    expect(r.states.map((s) => s.name)).toEqual(['1', '2', '3', '4', '5', '6'])
    expect(r.totals.thrust!.unit).toBe('N')
    expect(r.totals.thrust!.value).toBeCloseTo(45 * (r.totals.exitVelocity.value - 260), 6)
    expect(r.totals.propulsivePower!.value).toBeCloseTo(r.totals.thrust!.value * 260, 3)
    expect(r.totals.propulsivePower!.unit).toBe('W')
    expect(r.totals.netShaftWork.value).toBeCloseTo(0, 6)
  })

  test('km/h and kg/h give the same engine as m/s and kg/s', () => {
    const a = jet(TURBOJET)
    const b = jet({ ...TURBOJET, inputs: { ...TURBOJET.inputs, flightSpeed: '936 km/h', massFlow: '162000 kg/h' } })
    expect(b.totals.thrust!.value).toBeCloseTo(a.totals.thrust!.value, 6)
  })

  test('the sign convention: compressor work is done ON the air (negative W in engineering, positive w in chemistry)', () => {
    const eng = jet({ ...TURBOJET, convention: 'engineering' })
    const chem = jet({ ...TURBOJET, convention: 'chemistry' })
    const comp = (r: FormattedTurbojet) => r.devices.find((d) => d.device.startsWith('compressor'))!
    const turb = (r: FormattedTurbojet) => r.devices.find((d) => d.device.startsWith('turbine'))!
    expect(comp(eng).w.value).toBeLessThan(0)
    expect(comp(chem).w.value).toBeCloseTo(-comp(eng).w.value, 9)
    expect(turb(eng).w.value).toBeGreaterThan(0)
    expect(turb(chem).wRate!.value).toBeCloseTo(-turb(eng).wRate!.value, 3)
    expect(eng.convention.statement).toMatch(/Q − W/)
    expect(chem.convention.statement).toMatch(/q \+ w/)
    // heat is heat into the gas in both
    expect(comp(eng).q.value).toBe(0)
    expect(eng.devices.find((d) => d.device.startsWith('burner'))!.q.value).toBeGreaterThan(0)
  })

  test('a heat loss as a rate (kW) is per kilogram divided by the flow rate', () => {
    const a = duct({ ...NOZZLE, inputs: { ...NOZZLE.inputs, heatLoss: '2 kW' } })
    const b = duct({ ...NOZZLE, inputs: { ...NOZZLE.inputs, heatLoss: '4 kJ/kg' } })
    expect(a.totals.heatIn.value).toBeCloseTo(-4000, 9)
    expect(a.totals.exitVelocity.value).toBeCloseTo(b.totals.exitVelocity.value, 9)
    expect(a.devices[0]!.qRate!.value).toBeCloseTo(-2000, 9)
  })
})

describe('clear refusals', () => {
  test('unknown and missing inputs', () => {
    expect(refusal({ template: 'nozzle', inputs: { ...NOZZLE.inputs, Vexit: '3 m/s' } }).message).toMatch(
      /unknown input "Vexit"/,
    )
    expect(refusal({ template: 'turbojet', inputs: {} }).message).toMatch(/flightSpeed" is required/)
    expect(refusal({ template: 'nozzle', inputs: { ...NOZZLE.inputs, V1: '30' } }).message).toMatch(/expected m\/s/)
    expect(refusal({ template: 'nozzle', inputs: { ...NOZZLE.inputs, shape: 'bell' } }).property).toBe('shape')
  })
  test('a nozzle above the inlet stagnation pressure; a diffuser asked to speed up', () => {
    expect(refusal({ template: 'nozzle', inputs: { ...NOZZLE.inputs, p2: '400 kPa' } }).message).toMatch(
      /stagnation pressure/,
    )
    expect(refusal({ template: 'diffuser', inputs: { ...DIFFUSER.inputs, V2: '250 m/s' } }).message).toMatch(
      /slows the flow/,
    )
  })
  test('a per-mole gas without a molar mass', () => {
    expect(refusal({ template: 'nozzle', inputs: { ...NOZZLE.inputs, gas: 'monatomic' } }).message).toMatch(
      /molar mass/,
    )
  })
  test('too many exit conditions', () => {
    expect(refusal({ template: 'nozzle', inputs: { ...NOZZLE.inputs, T2: '150 °C' } }).code).toBe('overdetermined')
  })
})

test('in the catalog as the steady-flow family, and let into bank problems', () => {
  for (const t of STEADY_FLOW_TEMPLATES) {
    expect(templateEntry(t.id)?.family).toBe('steady-flow')
    expect(templateEntry(t.id)?.bank).toBe(true)
  }
  // The bank solver gives the same result as the spec-file solver (authoring/steady-flow.test.ts
  // checks what bank problems make of it).
  for (const spec of [NOZZLE, DIFFUSER, TURBOJET]) {
    const r = solveBankSpec(spec)
    expect(r.ok).toBe(true)
    expect(r).toEqual(solveSpec(spec))
  }
})

test('random inputs: never a throw, and every solved quantity is finite', async () => {
  const { mulberry32 } = await import('../test-helpers.ts')
  const rand = mulberry32(2026)
  const u = (lo: number, hi: number) => lo + (hi - lo) * rand()
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
  const gases = ['air', 'nasa:dry-air', { cp: '1.005 kJ/(kg K)', gamma: 1.4 }, { preset: 'nasa:CO2', basis: 'mass' }]
  let solvedCount = 0
  for (let i = 0; i < 300; i++) {
    const id = pick(['nozzle', 'diffuser', 'turbojet'])
    const exit = pick(['p2', 'T2', 'V2', 'p2+V2'])
    const inputs: Record<string, unknown> =
      id === 'turbojet'
        ? {
            gas: pick(gases),
            flightSpeed: `${u(0, 600)} m/s`,
            ambientPressure: `${u(10, 101)} kPa`,
            ambientTemperature: `${u(210, 300)} K`,
            pressureRatio: u(1.5, 40),
            turbineInletT: `${u(600, 1800)} K`,
            compressorEfficiency: u(0.6, 1),
            turbineEfficiency: u(0.6, 1),
            massFlow: `${u(1, 100)} kg/s`,
          }
        : {
            gas: pick(gases),
            p1: `${u(50, 500)} kPa`,
            T1: `${u(250, 1200)} K`,
            V1: `${u(0, 400)} m/s`,
            ...(exit.includes('p2') ? { p2: `${u(20, 600)} kPa` } : {}),
            ...(exit === 'T2' ? { T2: `${u(200, 1300)} K` } : {}),
            ...(exit.includes('V2') ? { V2: `${u(0, 900)} m/s` } : {}),
            ...(exit === 'p2+V2' ? {} : { efficiency: u(0.7, 1) }),
            ...(rand() < 0.5 ? { massFlow: `${u(0.1, 10)} kg/s` } : {}),
            ...(id === 'nozzle' && rand() < 0.5 ? { shape: 'converging-diverging' } : {}),
          }
    const r = solveSpec({ template: id, inputs })
    if (!r.ok) {
      expect(r.error.message.length, JSON.stringify(inputs)).toBeGreaterThan(10)
      expect(r.error.code).not.toBe('internal')
      continue
    }
    solvedCount++
    const walk = (x: unknown): void => {
      if (x && typeof x === 'object') {
        if ('value' in x && typeof (x as { value: unknown }).value === 'number')
          expect(Number.isFinite((x as { value: number }).value), JSON.stringify(inputs)).toBe(true)
        else Object.values(x).forEach(walk)
      }
    }
    walk(r)
  }
  expect(solvedCount).toBeGreaterThan(50)
})
