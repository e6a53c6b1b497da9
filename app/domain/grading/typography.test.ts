import { describe, expect, test } from 'vitest'
import { isKnownUnitName } from './restricted-math.ts'
import { applySlashRule, normalizeTypography } from './typography.ts'

const norm = (s: string, letterXIsTimes = true): string =>
  normalizeTypography(s, { isUnitName: isKnownUnitName, letterXIsTimes })

describe('normalizeTypography', () => {
  test.each([
    ['12.5 kJ', '12.5 kJ'],
    ['  12.5\u00A0kJ ', '12.5 kJ'], // no-break space
    ['12\u2009500 J', '12 500 J'], // thin space (digit grouping is joined later, in readAnswer)
    ['12.5\u202FkJ', '12.5 kJ'], // narrow no-break space
    ['1\u200B2', '12'], // zero-width space removed
    ['\u22125 °C', '-5 degC'], // unicode minus
    ['\u20135 K', '-5 K'], // en dash as minus
    ['27 °C', '27 degC'],
    ['27°C', '27 degC'],
    ['27 ° C', '27 degC'],
    ['27 ºC', '27 degC'], // masculine ordinal, often typed for °
    ['27 \u2103', '27 degC'],
    ['27 deg C', '27 degC'],
    ['27 degrees Celsius', '27 degC'],
    ['27 Celsius', '27 degC'],
    ['80 °F', '80 degF'],
    ['80 \u2109', '80 degF'],
    ['500 °R', '500 degR'],
    ['300 °K', '300 K'],
    ['300 Kelvin', '300 K'],
    ['27°', '27 deg'],
    ['2 m³', '2 m^3'],
    ['2 m^3', '2 m^3'],
    ['1 kg·m⁻³', '1 kg*m^-3'],
    ['1.2×10^4 J', '1.2e4 J'],
    ['1.2 × 10^4 J', '1.2e4 J'],
    ['1.2x10^4 J', '1.2e4 J'],
    ['1.2 X 10^4 J', '1.2e4 J'],
    ['1.2*10^4 J', '1.2e4 J'],
    ['1.2·10^4 J', '1.2e4 J'],
    ['1.20 × 10⁴ J', '1.20e4 J'],
    ['1.2×10^(−4) m', '1.2e-4 m'],
    ['1.2×10^-4 m', '1.2e-4 m'],
    ['1.2E4 J', '1.2E4 J'],
    ['a2*10^3', 'a2*10^3'], // not a mantissa: the tail of a name
    ['2*10^3.5', '2*10^3.5'], // not an integer exponent: left to the parser
    ['1 kJ/(kg·K)', '1 kJ/(kg*K)'],
    ['1 kJ/kg·K', '1 kJ/(kg*K)'],
    ['1 kJ/kg*K', '1 kJ/(kg*K)'],
    ['1 kJ/kg K', '1 kJ/(kg K)'],
    ['1 kJ/kg.K', '1 kJ/(kg*K)'],
    ['1 kJ/kg⋅K', '1 kJ/(kg*K)'],
    ['1 J/mol·K', '1 J/(mol*K)'],
    ['1 kJ/kg', '1 kJ/kg'],
    ['1 W/m^2·K', '1 W/(m^2*K)'],
    ['5 µJ', '5 uJ'],
    ['2π', '2pi'],
    ['6 ÷ 2', '6 / 2'],
  ])('%j → %j', (input, output) => {
    expect(norm(input)).toBe(output)
  })

  test('letter x is not a times sign when x is a variable', () => {
    expect(norm('2x10^3', false)).toBe('2x10^3')
    expect(norm('2×10^3', false)).toBe('2e3')
  })
})

describe('applySlashRule', () => {
  const units = (n: string): boolean => ['kJ', 'kg', 'K', 'J', 'mol', 's'].includes(n)
  test.each([
    ['kJ/kg·K', 'kJ/(kg·K)'],
    ['kJ/kg·K·s', 'kJ/(kg·K·s)'],
    ['q/m·T', 'q/m·T'], // names that are not units are left alone
    ['1/kg·sqrt(2)', '1/kg·sqrt(2)'], // a function call ends the chain: no grouping
    ['10/2*3', '10/2*3'], // numbers: ordinary precedence
    ['kJ/kg', 'kJ/kg'],
    ['kJ/(kg·K)', 'kJ/(kg·K)'],
    ['J/mol K', 'J/(mol K)'],
  ])('%j → %j', (input, output) => {
    expect(applySlashRule(input, units)).toBe(output)
  })
})
