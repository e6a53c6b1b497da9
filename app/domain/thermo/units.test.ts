import { describe, expect, test } from 'vitest'
import { parseQuantity } from './units.ts'

describe('parseQuantity', () => {
  // Unit factors: SI Brochure, 9th ed. (2019), tables 8/9 (bar, L, °C offsets); common practice.
  test.each([
    ['300 K', 'temperature', 300],
    ['27 degC', 'temperature', 300.15],
    ['27 °C', 'temperature', 300.15],
    ['1 bar', 'pressure', 1e5],
    ['100 kPa', 'pressure', 1e5],
    ['2.5 L', 'volume', 0.0025],
    ['1.005 kJ/(kg K)', 'specificHeat', 1005],
    ['1800 kJ/kg', 'specificEnergy', 1.8e6],
    ['2 mol', 'amount', 2],
    ['85 %', 'dimensionless', 0.85],
    ['8', 'dimensionless', 8],
  ] as const)('%s → %s %d', (text, dim, value) => {
    const r = parseQuantity(text, [dim])
    expect(r.ok).toBe(true)
    if (r.ok) expect(r.value.value).toBeCloseTo(value, 9)
  })
  test.each(['300', '1 m', 'abc', 'sqrt(4) K', '1 K; evaluate("2")', '', 'x'.repeat(200)])(
    'rejects %s for a temperature without throwing',
    (t) => {
      expect(parseQuantity(t, ['temperature']).ok).toBe(false)
    },
  )
})
