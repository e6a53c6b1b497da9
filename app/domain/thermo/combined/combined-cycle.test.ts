import { describe, expect, test } from 'vitest'
import { parseGas } from '../spec.ts'
import { solveCombinedCycle, type CombinedInput } from './combined-cycle.ts'
import { solveCombinedTemplate } from './combined-template.ts'

const air = (() => {
  const g = parseGas('nasa:dry-air')
  if (!g.ok) throw new Error(g.error.message)
  return g.value
})()

// Çengel & Boles, Thermodynamics: An Engineering Approach, the combined gas–steam power cycle
// example of chapter 10 (Example 10-9 in the 7th and 8th editions; from memory): pressure ratio
// 8, air at 300 K into the compressor and 1300 K into the turbine, efficiencies 80 % and 85 %;
// a simple ideal Rankine cycle between 7 MPa and 5 kPa with steam at 500 °C; the exhaust leaves
// the HRSG at 450 K. The book (air tables, steam tables) gives w_net,gas = 210.41 kJ/kg,
// q_in = 790.58 kJ/kg, w_net,steam = 1331.4 kJ/kg of steam, m_steam/m_gas = 0.131 and η = 48.7 %.
const BOOK: CombinedInput = {
  gas: air,
  p1: 100e3,
  T1: 300,
  pressureRatio: 8,
  turbineInletT: 1300,
  compressorEfficiency: 0.8,
  gasTurbineEfficiency: 0.85,
  steam: { boilerPressure: 7e6, condenserPressure: 5e3, turbineInletTemperature: 773.15 },
  stackTemperature: 450,
}

function solved(input: CombinedInput) {
  const r = solveCombinedCycle(input)
  if (!r.ok) throw new Error(r.error.message)
  return r.value
}

describe('the textbook combined cycle (Çengel & Boles, chapter 10; from memory)', () => {
  const r = solved(BOOK)
  test('gas-turbine net work and heat added, within 0.5 % of the air-table values', () => {
    expect(r.gasNetWork / 1e3).toBeGreaterThan(210.41 * 0.995)
    expect(r.gasNetWork / 1e3).toBeLessThan(210.41 * 1.005)
    expect(r.heatIn / 1e3).toBeGreaterThan(790.58 * 0.995)
    expect(r.heatIn / 1e3).toBeLessThan(790.58 * 1.005)
  })
  test('steam-cycle net work per kg of steam within 0.2 % (IAPWS-IF97 against the steam tables)', () => {
    expect(Math.abs(r.steam.netWork / 1e3 - 1331.4) / 1331.4).toBeLessThan(0.002)
  })
  test('steam per kg of gas 0.131 and the combined efficiency 48.7 %', () => {
    expect(r.steamPerGas).toBeCloseTo(0.131, 3)
    expect(r.efficiency).toBeCloseTo(0.487, 3)
  })
})

describe('balances and the second law', () => {
  const r = solved(BOOK)
  test('heat in = net work + stack loss + condenser heat (to rounding)', () => {
    expect(Math.abs(r.heatIn - r.netWork - r.stackLoss - r.condenserHeat)).toBeLessThan(1e-9 * r.heatIn)
  })
  test('the HRSG balance: the gas gives what the steam takes', () => {
    const g4 = r.gasStates[3]!
    const g5 = r.gasStates[4]!
    expect(g4.h - g5.h).toBeCloseTo(r.steamPerGas * r.steam.heatIn, 6)
  })
  test('below the Carnot efficiency between the compressor inlet and the turbine inlet', () => {
    expect(r.efficiency).toBeLessThan(1 - 300 / 1300)
    expect(r.efficiency).toBeGreaterThan(r.gasEfficiency)
  })
  test('the gas is hotter than the water at both ends and at the pinch', () => {
    expect(r.hotEndDifference).toBeGreaterThan(0)
    expect(r.coldEndDifference).toBeGreaterThan(0)
    expect(r.pinchDifference!).toBeGreaterThan(0)
  })
  test('a pinch difference gives back the stack temperature it came from', () => {
    const { stackTemperature: _s, ...rest } = BOOK
    const again = solved({ ...rest, pinchDifference: r.pinchDifference! })
    expect(again.stackTemperature).toBeCloseTo(450, 6)
    expect(again.steamPerGas).toBeCloseTo(r.steamPerGas, 9)
  })
  test('a gas flow rate gives the power', () => {
    expect(solved({ ...BOOK, gasMassFlow: 20 }).power).toBeCloseTo(20 * r.netWork, 6)
  })
})

describe('impossible plants are refused with a reason', () => {
  const refused = (input: CombinedInput) => {
    const r = solveCombinedCycle(input)
    expect(r.ok).toBe(false)
    return r.ok ? '' : r.error.message
  }
  test('steam hotter than the exhaust', () => {
    expect(refused({ ...BOOK, steam: { ...BOOK.steam, turbineInletTemperature: 900 } })).toMatch(
      /not hotter than the steam/,
    )
  })
  test('a stack colder than the water at the pinch', () => {
    expect(refused({ ...BOOK, stackTemperature: 350 })).toMatch(/pinch|feedwater/)
  })
  test('a stack colder than the feedwater', () => {
    expect(refused({ ...BOOK, stackTemperature: 302 })).toMatch(/colder than the (feedwater|boiling water)/)
  })
  test('both or neither of stack temperature and pinch', () => {
    expect(refused({ ...BOOK, pinchDifference: 10 })).toMatch(/exactly one/)
    const { stackTemperature: _s, ...rest } = BOOK
    expect(refused(rest)).toMatch(/exactly one/)
  })
  test('a pinch above the critical pressure', () => {
    const { stackTemperature: _s, ...rest } = BOOK
    expect(
      refused({
        ...rest,
        pinchDifference: 10,
        steam: { ...BOOK.steam, boilerPressure: 25e6, turbineInletTemperature: 820 },
      }),
    ).toMatch(/critical pressure/)
  })
})

describe('the spec template', () => {
  const inputs = {
    p1: '100 kPa',
    T1: '300 K',
    pressureRatio: '8',
    turbineInletT: '1300 K',
    compressorEfficiency: '80 %',
    gasTurbineEfficiency: '0.85',
    boilerPressure: '7 MPa',
    condenserPressure: '5 kPa',
    steamTemperature: '500 °C',
    stackTemperature: '450 K',
    gasMassFlow: '72 t/h',
  }
  test('strings with units give the same plant, and the power of 20 kg/s', () => {
    const r = solveCombinedTemplate('combined-cycle', inputs, 'engineering')
    if (!r.ok) throw new Error(r.error.message)
    expect(r.totals.steamPerGas.value).toBeCloseTo(solved(BOOK).steamPerGas, 9)
    expect(r.totals.power!.value).toBeCloseTo(20 * r.totals.netWork.value, 3)
    expect(r.totals.netWorkSigned.value).toBeGreaterThan(0)
    expect(r.notice).toMatch(/not design data/)
  })
  test('the chemistry convention gives the work done on the plant: the net work is negative', () => {
    const r = solveCombinedTemplate('combined-cycle', inputs, 'chemistry')
    if (!r.ok) throw new Error(r.error.message)
    expect(r.totals.netWorkSigned.value).toBeLessThan(0)
    expect(r.devices.find((d) => d.device === 'compressor')!.w.value).toBeGreaterThan(0)
  })
  test('bad input is a message, never a throw', () => {
    const bad = (over: Record<string, unknown>) => {
      const r = solveCombinedTemplate('combined-cycle', { ...inputs, ...over })
      expect(r.ok).toBe(false)
      return r.ok ? '' : r.error.message
    }
    expect(bad({ gasMassFlow: 'lots' })).toMatch(/mass flow rate/)
    expect(bad({ boilerPressure: '7 kg' })).toMatch(/boilerPressure/)
    expect(bad({ turbineBlades: 40 })).toMatch(/unknown input/)
    expect(solveCombinedTemplate('combined-cycle', null).ok).toBe(false)
  })
  test('a refusal names the input to change by its name in the spec', () => {
    const r = solveCombinedTemplate('combined-cycle', {
      ...inputs,
      compressorEfficiency: '1',
      gasTurbineEfficiency: '1',
    })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.property).toBe('steamTemperature')
  })
})

describe('bank problems', () => {
  test('the combined cycle solves the same in spec files and where bank problems are drawn', async () => {
    const { solveBankSpec, solveSpec } = await import('../solve-spec.ts')
    const spec = {
      template: 'combined-cycle',
      inputs: {
        p1: '100 kPa',
        T1: '300 K',
        pressureRatio: '8',
        turbineInletT: '1300 K',
        compressorEfficiency: '0.8',
        gasTurbineEfficiency: '0.85',
        boilerPressure: '7 MPa',
        condenserPressure: '5 kPa',
        steamTemperature: '500 °C',
        stackTemperature: '450 K',
      },
    }
    const r = solveSpec(spec)
    expect(r.ok).toBe(true)
    expect(solveBankSpec(spec)).toEqual(r)
  })
})
