// Throttling calorimeter (calorimeter.ts).
// Source: Moran & Shapiro, "Fundamentals of Engineering Thermodynamics", Example 4.8
// ("measuring steam quality"; 5th ed. numbering as recalled, FROM MEMORY): line at 20 bar,
// calorimeter at 1 bar and 120 C -> x = 0.956 (book tables: h2 = 2716.6 kJ/kg, hf = 908.79,
// hg = 2799.5 kJ/kg), tolerance 0.5 %. Closed form: throttling keeps h; the lever rule.
import { describe, expect, test } from 'vitest'
import { CALORIMETER_CAUTION, solveCalorimeterSpec, solveThrottlingCalorimeter } from './calorimeter.ts'
import { saturationAtP, stateFromPT } from './properties.ts'

const C = 273.15

describe('throttling calorimeter', () => {
  test('Moran & Shapiro Example 4.8 (from memory): 20 bar line, 1 bar / 120 C calorimeter -> x = 0.956', () => {
    const r = solveThrottlingCalorimeter({
      linePressure: 2e6,
      calorimeterPressure: 1e5,
      calorimeterTemperature: 120 + C,
    })
    if (!r.ok) throw new Error(JSON.stringify(r.error))
    expect(Math.abs(r.value.quality - 0.956) / 0.956).toBeLessThan(0.005)
    expect(Math.abs(r.value.calorimeter.h / 1000 - 2716.6) / 2716.6).toBeLessThan(0.005)
    expect(r.value.caution).toBe(CALORIMETER_CAUTION)
  })
  test('isenthalpic, and the quality is the lever rule at the line pressure (closed form)', () => {
    const r = solveThrottlingCalorimeter({
      linePressure: 1e6,
      calorimeterPressure: 0.1e6,
      calorimeterTemperature: 110 + C,
    })
    if (!r.ok) throw new Error(JSON.stringify(r.error))
    const h2 = stateFromPT(0.1e6, 110 + C)
    const sat = saturationAtP(1e6)
    if (!h2.ok || !sat.ok) throw new Error('property call failed')
    expect(r.value.line.h).toBeCloseTo(h2.value.h, 6)
    expect(r.value.quality).toBeCloseTo(
      (h2.value.h - sat.value.liquid.h) / (sat.value.vapour.h - sat.value.liquid.h),
      12,
    )
    expect(r.value.line.x).toBeCloseTo(r.value.quality, 12)
    expect(r.value.quality).toBeGreaterThan(r.value.lowestMeasurableQuality)
    expect(r.value.calorimeterSaturationTemperature).toBeCloseTo(372.756, 2) // T_sat(0.1 MPa) = 99.61 C
    expect(r.value.superheat).toBeCloseTo(110 + C - r.value.calorimeterSaturationTemperature, 12)
  })
  test.each([
    [
      'calorimeter not superheated (at its saturation temperature)',
      { linePressure: 2e6, calorimeterPressure: 1e5, calorimeterTemperature: 99.6 + C },
      'calorimeterTemperature',
      /not superheated/,
    ],
    [
      'calorimeter below its saturation temperature',
      { linePressure: 2e6, calorimeterPressure: 1e5, calorimeterTemperature: 90 + C },
      'calorimeterTemperature',
      /not superheated/,
    ],
    [
      'line steam superheated (h above hg at the line pressure)',
      { linePressure: 1e6, calorimeterPressure: 1e5, calorimeterTemperature: 250 + C },
      'calorimeterTemperature',
      /superheated, not wet/,
    ],
    [
      'calorimeter pressure above the line pressure',
      { linePressure: 1e5, calorimeterPressure: 2e5, calorimeterTemperature: 150 + C },
      'calorimeterPressure',
      /below the line pressure/,
    ],
    [
      'line above the critical pressure',
      { linePressure: 25e6, calorimeterPressure: 1e5, calorimeterTemperature: 150 + C },
      'linePressure',
      /critical/,
    ],
    [
      'not a number',
      { linePressure: Number.NaN, calorimeterPressure: 1e5, calorimeterTemperature: 400 },
      'linePressure',
      /finite/,
    ],
  ])('%s -> a clear message', (_n, input, property, message) => {
    const r = solveThrottlingCalorimeter(input)
    expect(r.ok).toBe(false)
    if (!r.ok) {
      expect(r.error.property).toBe(property)
      expect(r.error.message).toMatch(message)
    }
  })
  test('spec template: strings with units, both conventions, refusal as a result', () => {
    const r = solveCalorimeterSpec({
      template: 'steam-throttling-calorimeter',
      inputs: { linePressure: '20 bar', calorimeterPressure: '1 bar', calorimeterTemperature: '120 °C' },
      convention: 'chemistry',
    })
    if (!r.ok) throw new Error(JSON.stringify(r.error))
    expect(r.totals.quality.value).toBeCloseTo(0.956, 2)
    expect(r.convention.equation).toBe('ΔU = q + w')
    expect(r.notice).toContain('not design data')
    expect(r.devices[0]!.q.value).toBe(0)
    const bad = solveCalorimeterSpec({
      template: 'steam-throttling-calorimeter',
      inputs: { linePressure: '20 bar', calorimeterPressure: '1 bar', calorimeterTemperature: '95 °C' },
    })
    expect(bad.ok).toBe(false)
    if (!bad.ok) expect(bad.error.message).toMatch(/not superheated/)
    const missing = solveCalorimeterSpec({
      template: 'steam-throttling-calorimeter',
      inputs: { linePressure: '20 bar' },
    })
    expect(!missing.ok && missing.error.property).toBe('calorimeterPressure')
  })
})
