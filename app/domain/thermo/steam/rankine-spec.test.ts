// The Rankine JSON edge: strings with units read into SI, then the same cycle as the
// function API. Reference: Cengel & Boles, 7th ed., Example 10-1 (from memory): eta = 26.0 %.
import { describe, expect, test } from 'vitest'
import { formatRankine, parseRankineSpec, solveRankineSpec } from './rankine-spec.ts'

describe('Rankine spec edge', () => {
  test('reads units and solves Example 10-1 (Cengel & Boles 7th ed., from memory: eta = 0.260)', () => {
    const r = solveRankineSpec({ boilerPressure: '3 MPa', condenserPressure: '75 kPa', turbineInletTemperature: '350 °C' })
    expect(r.ok).toBe(true)
    if (r.ok) {
      expect(r.value.thermalEfficiency).toBeCloseTo(0.26, 3)
      const text = formatRankine(r.value, 'chemistry')
      expect(text).toContain('ΔU = q + w')
      expect(text).toContain('not design data')
    }
  })
  test('efficiencies as numbers or percentages, reheat and heater objects (closed form unit conversion)', () => {
    const r = parseRankineSpec({
      boilerPressure: '150 bar',
      condenserPressure: '10 kPa',
      turbineInletTemperature: '873.15 K',
      pumpEfficiency: 0.85,
      turbineEfficiency: '87 %',
      reheat: { pressure: '4 MPa', temperature: '600 °C' },
      openFeedwaterHeater: { pressure: '1.2 MPa' },
    })
    expect(r).toEqual({
      ok: true,
      value: {
        boilerPressure: 15e6,
        condenserPressure: 10e3,
        turbineInletTemperature: 873.15,
        pumpEfficiency: 0.85,
        turbineEfficiency: 0.87,
        reheat: { pressure: 4e6, temperature: 873.15 },
        openFeedwaterHeater: { pressure: 1.2e6 },
      },
    })
  })
  test.each([
    [{ condenserPressure: '10 kPa' }, 'boilerPressure'],
    [{ boilerPressure: '15', condenserPressure: '10 kPa' }, 'boilerPressure'],
    [{ boilerPressure: '15 MPa', condenserPressure: '10 K' }, 'condenserPressure'],
    [{ boilerPressure: '15 MPa', condenserPressure: '10 kPa', superheat: 'yes' }, 'superheat'],
    [{ boilerPressure: '15 MPa', condenserPressure: '10 kPa', reheat: '4 MPa' }, 'reheat'],
  ])('bad spec %o -> error on %s', (spec, property) => {
    const r = solveRankineSpec(spec)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.property).toBe(property)
  })
})
