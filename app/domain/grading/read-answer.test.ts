import { describe, expect, test } from 'vitest'
import { readAnswer } from './read-answer.ts'
import type { ReadAnswerOptions, ReadAnswerResult } from './read-answer.ts'

const kJ: ReadAnswerOptions = { expectedUnit: 'kJ' }
const valueOf = (r: ReadAnswerResult): number => (r.ok ? r.value : NaN)
const codeOf = (r: ReadAnswerResult): string => (r.ok ? 'ok' : r.error.code)

describe('the same energy, typed many ways (SI prefixes: SI Brochure 9th ed. Table 7)', () => {
  test.each([
    '12.5 kJ',
    '12.5kJ',
    '12500 J',
    '12 500 J', // SI digit grouping, SI Brochure 9th ed. 5.4.4
    '12\u2009500 J',
    '1.25e4 J',
    '1.25E4 J',
    '1.25×10^4 J',
    '1.25 x 10^4 J',
    '1.25·10⁴ J',
    '1.25*10^4 J',
    '0.0125 MJ',
    '+12.5 kJ',
    '12.5 * kJ',
    '(12.5) kJ',
    '2*6.25 kJ',
    '12 kJ + 500 J',
    '12.5e3 J',
  ])('%j is 12.5 kJ', (answer) => {
    expect(valueOf(readAnswer(answer, kJ))).toBeCloseTo(12.5, 10)
  })

  test('a bare number is read in the expected unit only when allowed', () => {
    expect(valueOf(readAnswer('12.5', { expectedUnit: 'kJ', allowBareNumber: true }))).toBe(12.5)
    const r = readAnswer('12.5', kJ)
    expect(r.ok ? null : [r.verdict, r.error.code]).toEqual(['wrong-dimension', 'missing-unit'])
    expect(r.ok ? '' : r.message).toBe('Please add a unit: this answer needs an energy, for example in kJ.')
  })

  test('a bare expression without units counts as a bare number', () => {
    expect(valueOf(readAnswer('2*6.25', { expectedUnit: 'kJ', allowBareNumber: true }))).toBe(12.5)
    expect(codeOf(readAnswer('2*6.25', kJ))).toBe('missing-unit')
  })

  test('units that cancel are not a bare number', () => {
    const r = readAnswer('12.5 m/m', { expectedUnit: 'kJ', allowBareNumber: true })
    expect(r.ok ? null : r.verdict).toBe('wrong-dimension')
  })
})

describe('what readAnswer reports besides the value', () => {
  test('plain quantity', () => {
    const r = readAnswer('1.20×10^4 J', kJ)
    expect(r).toMatchObject({
      ok: true,
      value: 12,
      unit: 'kJ',
      form: 'quantity',
      literal: '1.20e4',
      studentUnit: 'J',
      readAs: '1.20e4 J',
      raw: '1.20×10^4 J',
    })
  })
  test('expression', () => {
    expect(readAnswer('2*6 kJ', kJ)).toMatchObject({ ok: true, form: 'expression', literal: null, readAs: '12 kJ' })
  })
  test('bare and percent', () => {
    expect(readAnswer('12', { expectedUnit: 'kJ', allowBareNumber: true })).toMatchObject({
      form: 'bare',
      literal: '12',
      studentUnit: null,
      readAs: '12 kJ',
    })
    expect(readAnswer('42 %', { expectedUnit: '' })).toMatchObject({
      form: 'percent',
      literal: '42',
      value: 0.42,
      readAs: '42 %',
    })
  })
  test('the slash rule shows in readAs', () => {
    expect(readAnswer('1.005 kJ/kg·K', { expectedUnit: 'kJ/(kg K)' })).toMatchObject({
      value: 1.005,
      readAs: '1.005 kJ/(kg·K)',
    })
  })
})

describe('specific and compound units', () => {
  test.each([
    ['1.005 kJ/(kg·K)', 1005],
    ['1.005 kJ/kg·K', 1005],
    ['1.005 kJ/kg*K', 1005],
    ['1.005 kJ/kg K', 1005],
    ['1.005 kJ/kg.K', 1005],
    ['1.005 kJ/kg/K', 1005],
    ['1.005 kJ kg^-1 K^-1', 1005],
    ['1.005 kJ·kg⁻¹·K⁻¹', 1005],
    ['1.005 kJ/(kg·°C)', 1005],
    ['1.005 J/(g K)', 1005],
  ])('%j = %f J/(kg·K)', (answer, value) => {
    expect(valueOf(readAnswer(answer, { expectedUnit: 'J/(kg K)' }))).toBeCloseTo(value, 9)
  })
  test('(kJ/kg)·K keeps the K in the numerator, as written', () => {
    const r = readAnswer('1 (kJ/kg)·K', { expectedUnit: 'J/(kg K)' })
    expect(r.ok ? null : r.verdict).toBe('wrong-dimension')
  })
  test.each([
    ['0.8 m^3', 0.8],
    ['0.8 m³', 0.8],
    ['800 L', 0.8],
    ['800 l', 0.8],
    ['800000 cm^3', 0.8],
  ])('%j = %f m³', (answer, value) => {
    expect(valueOf(readAnswer(answer, { expectedUnit: 'm^3' }))).toBeCloseTo(value, 9)
  })
  test.each([
    ['101.325 kPa', 101.325],
    ['1 atm', 101.325],
    ['1.01325 bar', 101.325],
    ['101325 Pa', 101.325],
    ['0.101325 MPa', 101.325],
  ])('%j = %f kPa (1 atm = 101325 Pa, 1 bar = 1e5 Pa: SI Brochure 9th ed. Table 8)', (answer, value) => {
    expect(valueOf(readAnswer(answer, { expectedUnit: 'kPa' }))).toBeCloseTo(value, 9)
  })
})

describe('temperatures', () => {
  test.each([
    ['27 °C', 300.15],
    ['27°C', 300.15],
    ['27 ℃', 300.15],
    ['27 degC', 300.15],
    ['27 deg C', 300.15],
    ['300.15 K', 300.15],
    ['80.6 °F', 300.15], // (80.6 − 32)/1.8 = 27 °C (NIST SP 811 B.8)
    ['−5 °C', 268.15],
    ['-5 °C', 268.15],
  ])('absolute: %j = %f K', (answer, value) => {
    expect(valueOf(readAnswer(answer, { expectedUnit: 'K' }))).toBeCloseTo(value, 9)
  })
  test.each([
    ['10 °C', 10],
    ['10 K', 10],
    ['18 °F', 10],
    ['-10 °C', -10],
  ])('difference (dimension temperature-difference): %j = %f K', (answer, value) => {
    expect(valueOf(readAnswer(answer, { expectedUnit: 'K', dimension: 'temperature-difference' }))).toBeCloseTo(
      value,
      9,
    )
  })
  test('difference with an expected unit of °C', () => {
    expect(valueOf(readAnswer('10 K', { expectedUnit: '°C', temperatureDifference: true }))).toBeCloseTo(10, 12)
    expect(valueOf(readAnswer('10 K', { expectedUnit: '°C' }))).toBeCloseTo(-263.15, 9)
  })
  test('a bare number for a temperature is in the expected unit, offset and all', () => {
    expect(valueOf(readAnswer('27', { expectedUnit: 'degC', allowBareNumber: true }))).toBe(27)
  })
  test.each([
    ['27 C', /C means coulomb/],
    ['80 F', /F means farad/],
    ['27°', /° on its own is an angle/],
  ])('%j gets a hint', (answer, hint) => {
    const r = readAnswer(answer, { expectedUnit: 'degC' })
    expect(r.ok ? null : r.verdict).toBe('wrong-dimension')
    expect(r.ok ? '' : r.message).toMatch(hint)
  })
})

describe('percent and pure numbers (efficiencies)', () => {
  test.each(['42 %', '42%', '0.42', '42.0 %', '4.2e1 %', '0.42 m/m'])('%j = 0.42 for an expected unit ""', (answer) => {
    expect(valueOf(readAnswer(answer, { expectedUnit: '' }))).toBeCloseTo(0.42, 12)
  })
  test.each([
    ['42', 42],
    ['42 %', 42],
    ['0.42', 0.42], // a bare number is in the expected unit: 0.42 %
  ])('%j = %f for an expected unit "%"', (answer, value) => {
    expect(valueOf(readAnswer(answer, { expectedUnit: '%' }))).toBeCloseTo(value, 12)
  })
  test('a percentage with a unit is refused', () => {
    expect(codeOf(readAnswer('42 kJ %', { expectedUnit: '' }))).toBe('percent-with-unit')
  })
  test('a quantity for a pure-number find has the wrong dimension', () => {
    const r = readAnswer('0.42 kJ', { expectedUnit: '' })
    expect(r.ok ? '' : r.message).toBe('We read this as an energy, but this answer needs a pure number (no unit).')
  })
})

describe('wrong dimension', () => {
  test.each([
    ['12 kg', 'We read this as a mass, but this answer needs an energy (kJ).'],
    ['12 kPa', 'We read this as a pressure, but this answer needs an energy (kJ).'],
    ['12 kW', 'We read this as a power, but this answer needs an energy (kJ).'],
    ['12 kJ/kg', 'We read this as a specific energy (energy per mass), but this answer needs an energy (kJ).'],
    ['12 kg m', 'We read this as a quantity in kg·m, but this answer needs an energy (kJ).'],
  ])('%j', (answer, message) => {
    const r = readAnswer(answer, { expectedUnit: 'kJ', dimension: 'energy' })
    expect(r.ok ? null : r.verdict).toBe('wrong-dimension')
    expect(r.ok ? '' : r.message).toBe(message)
  })
})

describe('unreadable answers get a specific message', () => {
  test.each([
    ['', 'empty', 'Please type an answer, for example 12.5 kJ.'],
    ['   ', 'empty', 'Please type an answer, for example 12.5 kJ.'],
    [
      '12,5 kJ',
      'decimal-comma',
      'Please use a point for decimals (12.5, not 12,5) and no commas between thousands (12500, not 12,500).',
    ],
    [
      '12,500 J',
      'decimal-comma',
      'Please use a point for decimals (12.5, not 12,5) and no commas between thousands (12500, not 12,500).',
    ],
    [
      '12 KJ',
      'unknown-unit',
      'We don\u2019t recognise “KJ” as a unit. Did you mean kJ? Units are case-sensitive.'.replace('\u2019', "'"),
    ],
    ['12 kJ/kgK', 'unknown-unit', "We don't recognise “kgK” as a unit. Did you mean kg·K? Units are case-sensitive."],
    ['12 zorks', 'unknown-unit', "We don't recognise “zorks” as a unit."],
    ['kJ', 'no-number', 'We found a unit but no number. Type a number and a unit, like 12.5 kJ.'],
    ['x = 12 kJ', 'equals-sign', 'Type only the value, without “=”: for example 12.5 kJ.'],
    [
      '12 kJ; 5 kJ',
      'multiple-expressions',
      'Please type one value only, on a single line. Type a number and a unit, like 12.5 kJ.',
    ],
    [
      '12 kJ\n5 kJ',
      'multiple-expressions',
      'Please type one value only, on a single line. Type a number and a unit, like 12.5 kJ.',
    ],
    ['max(1, 2) kJ', 'bad-character', 'We could not read the character “,”. Type a number and a unit, like 12.5 kJ.'],
    ['12 kJ @', 'bad-character', 'We could not read the character “@”. Type a number and a unit, like 12.5 kJ.'],
    [
      '12 kJ \u{1F600}',
      'bad-character',
      'This answer contains a character we cannot read. Type a number and a unit, like 12.5 kJ.',
    ],
    [
      '1e999 kJ',
      'out-of-range',
      'This number is too large or too small to work with (or it divides by zero). Please check it.',
    ],
    [
      '1e-999 kJ',
      'out-of-range',
      'This number is too large or too small to work with (or it divides by zero). Please check it.',
    ],
    [
      'sqrt(-4) kJ',
      'not-real',
      'This calculation has no real value (for example the square root or logarithm of a negative number).',
    ],
    [
      '12 kJ + 3 kg',
      'incompatible-units',
      'Parts of this answer have units that do not fit together (for example kJ + kg).',
    ],
    [
      'cbrt(8) kJ',
      'function-not-allowed',
      'Only these functions can be used in an answer: sqrt, exp, ln, log, log10, sin, cos, tan, abs (ln and log are both the natural logarithm).',
    ],
    ['12 kJ in J', 'unsupported-syntax', 'We could not read this answer. Type a number and a unit, like 12.5 kJ.'],
    ['0x1F kJ', 'syntax', 'We could not read this answer. Type a number and a unit, like 12.5 kJ.'],
    ['((12 kJ', 'syntax', 'We could not read this answer. Type a number and a unit, like 12.5 kJ.'],
  ])('%j → %s', (answer, code, message) => {
    const r = readAnswer(answer, kJ)
    expect(codeOf(r)).toBe(code)
    expect(r.ok ? '' : r.message).toBe(message)
    expect(r.ok ? null : r.verdict).toBe('unreadable')
  })

  test('the length limit is 200 characters by default', () => {
    const justRight = '12.5' + ' '.repeat(193) + 'kJ' // 199 + … = 199 characters
    expect(justRight.length).toBeLessThanOrEqual(200)
    expect(codeOf(readAnswer(justRight, kJ))).toBe('ok')
    const r = readAnswer('1'.repeat(201), kJ)
    expect(codeOf(r)).toBe('too-long')
    expect(r.ok ? '' : r.message).toBe(
      'This answer is too long (more than 200 characters). Type just the number and its unit.',
    )
  })

  test('non-string input and broken options do not throw', () => {
    expect(codeOf(readAnswer(12 as unknown as string, kJ))).toBe('not-text')
    expect(codeOf(readAnswer(null as unknown as string, kJ))).toBe('not-text')
    expect(codeOf(readAnswer('12 kJ', { expectedUnit: 'zork' }))).toBe('invalid-expected-unit')
    expect(codeOf(readAnswer('12 kJ', { expectedUnit: 'kJ', dimension: 'pressure' }))).toBe('invalid-expected-unit')
    expect(codeOf(readAnswer('12 kJ', null as unknown as ReadAnswerOptions))).toBe('invalid-expected-unit')
    expect(codeOf(readAnswer('12 kJ', { expectedUnit: 'kJ', dimension: 'nonsense' as never }))).toBe(
      'invalid-expected-unit',
    )
  })
})

describe('security: mathjs internals are not reachable from an answer', () => {
  test.each([
    'import({evaluate: 1})',
    'import',
    'createUnit(foo)',
    'createUnit',
    'evaluate(1)',
    'evaluate',
    'parse(x)',
    'simplify(x)',
    'derivative(x, x)',
    'compile(x)',
    'chain(1)',
    'resolve(x)',
    'reviver(x)',
    'help(sqrt)',
    'unit(5, cm)',
    '__proto__',
    'constructor',
    'x.constructor',
    'prototype',
    'toString',
    'f(x) = x',
    'x = 1',
    '"12 kJ"',
    '[12] kJ',
    '{a: 12}',
    'cos.constructor("return 1")()',
  ])('%j is unreadable, with a message that does not leak internals', (answer) => {
    const r = readAnswer(answer, kJ)
    expect(r.ok).toBe(false)
    expect(r.ok ? null : r.verdict).toBe('unreadable')
    const message = r.ok ? '' : r.message
    expect(message).not.toMatch(
      /mathjs|disabled|Error|stack|undefined|proto|constructor|import|createUnit|evaluate|parse|compile|typed/i,
    )
  })
})
