import { describe, expect, test } from 'vitest'
import { readAnswer } from './read-answer.ts'
import { describeDimension, differenceFactor, formatUnitForDisplay, resolveExpectedUnit, suggestUnit } from './units.ts'
import { parseUnitString } from './restricted-math.ts'

/** Reads `answer` in `unit` and returns the number, failing the test on an unreadable answer. */
function valueIn(answer: string, unit: string, extra: { temperatureDifference?: boolean } = {}): number {
  const r = readAnswer(answer, { expectedUnit: unit, ...extra })
  if (!r.ok) throw new Error(`${answer} → ${r.error.code}: ${r.message}`)
  return r.value
}

describe('unit definitions (each against its legal or standard definition)', () => {
  test.each([
    // SI prefixes: SI Brochure, 9th ed. (2019), Table 7
    ['1 kJ', 'J', 1e3, 'SI Brochure 9th ed. Table 7 (kilo = 1e3)'],
    ['1 MJ', 'J', 1e6, 'SI Brochure 9th ed. Table 7 (mega = 1e6)'],
    ['1 GJ', 'kJ', 1e6, 'SI Brochure 9th ed. Table 7'],
    ['1 mJ', 'J', 1e-3, 'SI Brochure 9th ed. Table 7 (milli)'],
    ['1 uJ', 'J', 1e-6, 'SI Brochure 9th ed. Table 7 (micro, typed u)'],
    ['1 µJ', 'J', 1e-6, 'SI Brochure 9th ed. Table 7 (micro sign)'],
    // 1 W h = 3600 J (closed form: 1 W × 3600 s)
    ['1 Wh', 'J', 3600, 'closed form: 1 W × 3600 s'],
    ['1 kWh', 'MJ', 3.6, 'closed form: 1 kW × 3600 s'],
    ['1 kW h', 'kJ', 3600, 'closed form'],
    // Thermochemical calorie, exact: NIST SP 811 (2008) B.8, cal_th = 4.184 J
    ['1 cal', 'J', 4.184, 'NIST SP 811 B.8: thermochemical calorie'],
    ['1 kcal', 'J', 4184, 'NIST SP 811 B.8'],
    ['1 calorie', 'J', 4.184, 'NIST SP 811 B.8'],
    // International Table Btu: NIST SP 811 B.8, 1 Btu_IT = 1055.05585262 J
    ['1 BTU', 'J', 1055.05585262, 'NIST SP 811 B.8: Btu (International Table)'],
    ['1 Btu', 'J', 1055.05585262, 'NIST SP 811 B.8'],
    // Pressure: bar and atm are exact by definition (SI Brochure 9th ed. Table 8 / CGPM 1954)
    ['1 bar', 'Pa', 1e5, 'SI Brochure 9th ed. Table 8: 1 bar = 1e5 Pa'],
    ['1 atm', 'Pa', 101325, '10th CGPM (1954): standard atmosphere = 101325 Pa'],
    ['1 atm', 'kPa', 101.325, '10th CGPM (1954)'],
    ['1 MPa', 'bar', 10, 'SI Brochure Tables 7 and 8'],
    ['1 mbar', 'Pa', 100, 'SI Brochure Tables 7 and 8'],
    // Volume: litre = 1 dm³ (SI Brochure 9th ed. Table 8)
    ['1 L', 'm^3', 1e-3, 'SI Brochure 9th ed. Table 8: 1 L = 1 dm³'],
    ['1 m³', 'L', 1000, 'SI Brochure 9th ed. Table 8'],
    ['1 cm^3', 'mL', 1, 'SI Brochure 9th ed. Table 8'],
    // Power
    ['1 kW', 'W', 1000, 'SI Brochure Table 7'],
    // Specific quantities
    ['1 kJ/kg', 'J/kg', 1000, 'SI prefixes'],
    ['1 kJ/(kg·K)', 'J/(kg K)', 1000, 'SI prefixes'],
    [
      '1 kJ/(kg·°C)',
      'J/(kg K)',
      1000,
      'closed form: a kelvin and a degree Celsius are the same size (SI Brochure 2.3.1)',
    ],
    ['1 kJ/kmol', 'J/mol', 1, 'SI prefixes'],
    // Mass: international avoirdupois pound = 0.45359237 kg exactly (1959 agreement)
    ['1 lbm', 'kg', 0.45359237, 'international yard and pound agreement (1959)'],
  ])('%s = %f %s (%s)', (answer, unit, expected) => {
    expect(valueIn(answer, unit)).toBeCloseTo(expected, 9)
    expect(valueIn(answer, unit) / expected).toBeCloseTo(1, 12)
  })

  test('psi: mathjs value vs the exact definition 0.45359237 kg × 9.80665 m/s² / (0.0254 m)²', () => {
    // exact: NIST SP 811 B.8 (lbf/in²); closed form from the 1959 pound and inch and standard gravity
    const exact = (0.45359237 * 9.80665) / 0.0254 ** 2
    expect(exact).toBeCloseTo(6894.757293168361, 9)
    const v = valueIn('1 psi', 'Pa')
    expect(Math.abs(v / exact - 1)).toBeLessThan(1e-10) // mathjs: 6894.75729276459 Pa
  })

  test('torr and mmHg are rounded to 133.322 Pa in mathjs (exact torr = 101325/760 Pa)', () => {
    // Torr: 1/760 of a standard atmosphere (definition); mathjs rounds it, 2.8e-6 relative
    expect(Math.abs(valueIn('1 torr', 'Pa') / (101325 / 760) - 1)).toBeLessThan(3e-6)
    expect(valueIn('1 mmHg', 'Pa')).toBeCloseTo(133.322, 6)
  })

  test('the calorie is added to our private instance only (mathjs 15 itself has no cal)', async () => {
    const { create, all } = await import('mathjs')
    const other = create(all as NonNullable<typeof all>)
    expect(() => other.evaluate('1 cal')).toThrow()
  })
})

describe('temperatures: absolute readings use the offsets, differences do not', () => {
  test.each([
    // ITS-90 / SI Brochure 9th ed. 2.3.1: t/°C = T/K − 273.15
    ['27 °C', 'K', 300.15],
    ['0 °C', 'K', 273.15],
    ['-273.15 °C', 'K', 0],
    ['300.15 K', 'degC', 27],
    ['100 degC', 'K', 373.15],
    // Fahrenheit: t/°F = 1.8·t/°C + 32 (NIST SP 811 B.8, note on temperature)
    ['212 °F', 'degC', 100],
    ['32 °F', 'K', 273.15],
    ['-40 °F', 'degC', -40],
    ['491.67 degR', 'K', 273.15],
    ['0 °C', 'degF', 32],
  ])('absolute %s = %f %s', (answer, unit, expected) => {
    expect(valueIn(answer, unit)).toBeCloseTo(expected, 9)
  })

  test.each([
    // SI Brochure 9th ed. 2.3.1: a temperature difference of 1 °C equals 1 K
    ['10 °C', 'K', 10],
    ['10 K', 'degC', 10],
    // 1 °F difference = 5/9 K (NIST SP 811 B.8)
    ['18 °F', 'K', 10],
    ['9 degF', 'K', 5],
    ['10 K', 'degF', 18],
    ['-5 °C', 'K', -5],
  ])('difference %s = %f %s', (answer, unit, expected) => {
    expect(valueIn(answer, unit, { temperatureDifference: true })).toBeCloseTo(expected, 9)
  })

  test('the same text differs by 273.15 between absolute and difference readings', () => {
    expect(valueIn('10 °C', 'K') - valueIn('10 °C', 'K', { temperatureDifference: true })).toBeCloseTo(273.15, 9)
  })
})

describe('expected units', () => {
  test.each(['kJ', 'kJ/(kg·K)', 'kJ/kg·K', 'kJ/kg K', '°C', 'm³/kg', 'kPa', 'W', 'J/K', '1/s', 'kg^-1'])(
    '%s is a unit',
    (u) => {
      expect(resolveExpectedUnit(u, false)?.kind).toBe('unit')
    },
  )
  test.each([
    ['', 1],
    ['1', 1],
    ['%', 0.01],
    ['percent', 0.01],
  ])('%j is dimensionless with scale %f', (u, scale) => {
    const r = resolveExpectedUnit(u, false)
    expect(r?.kind).toBe('dimensionless')
    expect(r && r.kind === 'dimensionless' ? r.scale : NaN).toBe(scale)
  })
  test.each(['foo', 'kj', '12 kJ', 'kJ/J', 'sqrt(kJ)', 'import', '__proto__', 'kJ;J', 'a.b'])('%j is refused', (u) => {
    expect(resolveExpectedUnit(u, false)).toBeNull()
  })
  test('kJ/kg·K (slash rule) equals kJ/(kg·K)', () => {
    const a = parseUnitString('kJ/kg·K', false)
    const b = parseUnitString('kJ/(kg*K)', false)
    expect(a !== null && a !== 1 && b !== null && b !== 1 && a.equalBase(b)).toBe(true)
    expect(valueIn('1 J/(kg K)', 'kJ/kg·K')).toBeCloseTo(1e-3, 15)
  })
  test('difference factors ignore offsets', () => {
    const c = parseUnitString('degC', false)
    const k = parseUnitString('K', false)
    const f = parseUnitString('degF', false)
    if (c === null || c === 1 || k === null || k === 1 || f === null || f === 1) throw new Error('units')
    expect(differenceFactor(c, k)).toBe(1)
    expect(differenceFactor(f, k)).toBeCloseTo(5 / 9, 15)
  })
})

describe('words', () => {
  test.each([
    ['12 kPa', 'a pressure'],
    ['12 kg', 'a mass'],
    ['12 kJ', 'an energy'],
    ['3 C', 'an electric charge'],
    ['2 m/s', 'a speed'],
  ])('%s is described as %s', (answer, label) => {
    const q = parseUnitString(answer.split(' ')[1] ?? '', false)
    if (q === null || q === 1) throw new Error('unit')
    expect(describeDimension(q)).toBe(label)
  })
  test.each([
    ['degC', '°C'],
    ['kJ / (kg K)', 'kJ/(kg·K)'],
    ['m^3', 'm³'],
    ['m^3 / kg', 'm³/kg'],
    ['kg^-1', 'kg⁻¹'],
  ])('display of %s is %s', (u, shown) => {
    expect(formatUnitForDisplay(u)).toBe(shown)
  })
  test.each([
    ['KJ', 'kJ'],
    ['kj', 'kJ'],
    ['kpa', 'kPa'],
    ['KPa', 'kPa'],
    ['m3x', null],
    ['kgK', 'kg·K'],
    ['degc', '°C'],
    ['qqq', null],
  ])('suggestion for %s is %s', (name, suggestion) => {
    expect(suggestUnit(name)).toBe(suggestion)
  })
})
