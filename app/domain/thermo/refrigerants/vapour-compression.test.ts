import { describe, expect, test } from 'vitest'
import { getRefrigerant } from './index.ts'
import { solveRefrigerationTemplate } from './refrigeration-template.ts'
import { solveVapourCompression, type VapourCompressionInput } from './vapour-compression.ts'

const r134a = getRefrigerant('R134a')

function solved(input: VapourCompressionInput) {
  const r = solveVapourCompression(input)
  if (!r.ok) throw new Error(r.error.message)
  return r.value
}

// Çengel & Boles, Thermodynamics: An Engineering Approach, 7th ed., Example 11-1 (from memory):
// an ideal vapour-compression refrigerator on R-134a between 0.14 and 0.8 MPa, 0.05 kg/s. With
// the book's tables h1 = 239.16, h2 = 275.39, h3 = h4 = 95.47 kJ/kg, so q_L = 143.69 kJ/kg,
// w = 36.23 kJ/kg, Q_L = 7.18 kW, W = 1.81 kW and COP_R = 3.97. The book's tables put h = 0 at
// −40 °C, ours at the IIR state, so differences are compared, within 0.5 %.
describe('the textbook ideal R-134a refrigerator (Çengel & Boles 7th ed. Example 11-1, from memory)', () => {
  const r = solved({
    refrigerant: r134a,
    purpose: 'refrigerator',
    evaporator: { p: 0.14e6 },
    condenser: { p: 0.8e6 },
    massFlow: 0.05,
  })
  const near = (x: number, book: number) => expect(Math.abs(x - book) / book).toBeLessThan(0.005)
  test('refrigeration effect, compressor work and COP', () => {
    near(r.refrigerationEffect / 1e3, 143.69)
    near(r.compressorWork / 1e3, 36.23)
    near(r.copRefrigerator, 3.97)
  })
  test('heat removed and power at 0.05 kg/s', () => {
    near(r.capacity! / 1e3, 7.18)
    near(r.compressorPower! / 1e3, 1.81)
  })
})

describe('the cycle’s own balances', () => {
  const cases: [string, VapourCompressionInput][] = [
    [
      'R-134a with superheat, subcooling and a real compressor',
      {
        refrigerant: r134a,
        purpose: 'refrigerator',
        evaporator: { T: 263.15 },
        condenser: { T: 313.15 },
        superheat: 5,
        subcooling: 4,
        compressorEfficiency: 0.8,
      },
    ],
    [
      'R-1234yf',
      {
        refrigerant: getRefrigerant('R1234yf'),
        purpose: 'refrigerator',
        evaporator: { T: 268.15 },
        condenser: { T: 318.15 },
      },
    ],
    [
      'ammonia',
      {
        refrigerant: getRefrigerant('R717'),
        purpose: 'refrigerator',
        evaporator: { T: 253.15 },
        condenser: { T: 303.15 },
        compressorEfficiency: 0.75,
      },
    ],
    [
      'transcritical CO2 heat pump',
      {
        refrigerant: getRefrigerant('R744'),
        purpose: 'heat-pump',
        evaporator: { T: 268.15 },
        gasCooler: { p: 10e6, exitT: 308.15 },
        compressorEfficiency: 0.8,
      },
    ],
  ]
  test.each(cases)('%s: q_H = q_L + w, h4 = h3, COP below Carnot, a wet mixture after the valve', (_name, input) => {
    const r = solved(input)
    expect(r.heatRejected).toBeCloseTo(r.refrigerationEffect + r.compressorWork, 6)
    expect(r.states[3]!.state.h).toBeCloseTo(r.states[2]!.state.h, 6)
    const cop = input.purpose === 'refrigerator' ? r.copRefrigerator : r.copHeatPump
    expect(cop).toBeGreaterThan(0)
    expect(cop).toBeLessThan(r.carnotCop)
    expect(r.throttleQuality).toBeGreaterThan(0)
    expect(r.throttleQuality).toBeLessThan(1)
    expect(r.copHeatPump - r.copRefrigerator).toBeCloseTo(1, 9)
  })

  test('a less efficient compressor lowers the COP; subcooling raises it (common practice)', () => {
    const base: VapourCompressionInput = {
      refrigerant: r134a,
      purpose: 'refrigerator',
      evaporator: { T: 263.15 },
      condenser: { T: 313.15 },
    }
    expect(solved({ ...base, compressorEfficiency: 0.8 }).copRefrigerator).toBeLessThan(solved(base).copRefrigerator)
    expect(solved({ ...base, subcooling: 5 }).copRefrigerator).toBeGreaterThan(solved(base).copRefrigerator)
  })

  test('a capacity gives the mass flow: Q_L / q_L', () => {
    const r = solved({
      refrigerant: r134a,
      purpose: 'refrigerator',
      evaporator: { T: 263.15 },
      condenser: { T: 313.15 },
      capacity: 10e3,
    })
    expect(r.massFlow!).toBeCloseTo(10e3 / r.refrigerationEffect, 12)
  })
})

describe('refusals', () => {
  const refused = (input: VapourCompressionInput) => {
    const r = solveVapourCompression(input)
    expect(r.ok).toBe(false)
    return r.ok ? '' : r.error.message
  }
  test('an evaporator hotter than the condenser', () => {
    expect(
      refused({ refrigerant: r134a, purpose: 'refrigerator', evaporator: { T: 313.15 }, condenser: { T: 263.15 } }),
    ).toMatch(/colder than the condenser/)
  })
  test('a gas cooler below the critical pressure', () => {
    expect(
      refused({
        refrigerant: getRefrigerant('R744'),
        purpose: 'heat-pump',
        evaporator: { T: 268.15 },
        gasCooler: { p: 6e6, exitT: 300 },
      }),
    ).toMatch(/above the critical pressure/)
  })
  test('neither or both of condenser and gas cooler, a bad efficiency', () => {
    expect(refused({ refrigerant: r134a, purpose: 'refrigerator', evaporator: { T: 263.15 } })).toMatch(/exactly one/)
    expect(
      refused({
        refrigerant: r134a,
        purpose: 'refrigerator',
        evaporator: { T: 263.15 },
        condenser: { T: 313.15 },
        compressorEfficiency: 1.2,
      }),
    ).toMatch(/compressorEfficiency/)
  })
  test('an evaporator below the triple point', () => {
    expect(
      refused({ refrigerant: r134a, purpose: 'refrigerator', evaporator: { T: 150 }, condenser: { T: 313.15 } }),
    ).toMatch(/evaporator/)
  })
})

describe('the spec template', () => {
  test('strings with units, a capacity in tons, and the convention’s sign of the compressor work', () => {
    const inputs = {
      refrigerant: 'R-134a',
      evaporatorTemperature: '-10 °C',
      condenserTemperature: '40 °C',
      superheat: '5 K',
      compressorEfficiency: '80 %',
      capacity: '2 tons',
    }
    const eng = solveRefrigerationTemplate('vapour-compression', inputs, 'engineering')
    const chem = solveRefrigerationTemplate('vapour-compression', inputs, 'chemistry')
    if (!eng.ok || !chem.ok) throw new Error('did not solve')
    expect(eng.totals.capacity!.value).toBeCloseTo(2 * 3516.853, 6)
    expect(eng.devices[0]!.w.value).toBeLessThan(0)
    expect(chem.devices[0]!.w.value).toBeGreaterThan(0)
    expect(eng.notice).toMatch(/not design data/)
  })
  test('bad input is a message, never a throw', () => {
    const bad = (inputs: unknown) => {
      const r = solveRefrigerationTemplate('vapour-compression', inputs)
      expect(r.ok).toBe(false)
      return r.ok ? '' : r.error.message
    }
    expect(bad({ refrigerant: 'R22', evaporatorTemperature: '-10 °C', condenserTemperature: '40 °C' })).toMatch(
      /refrigerant must be one of/,
    )
    expect(bad({ refrigerant: 'R134a', condenserTemperature: '40 °C' })).toMatch(
      /evaporatorTemperature or evaporatorPressure/,
    )
    expect(
      bad({ refrigerant: 'R134a', evaporatorTemperature: '-10 °C', condenserTemperature: '40 °C', capacity: 'lots' }),
    ).toMatch(/capacity/)
    expect(bad(null)).toMatch(/inputs must be an object/)
  })
})
