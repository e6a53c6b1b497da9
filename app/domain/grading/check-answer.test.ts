import { describe, expect, test } from 'vitest'
import { checkAnswer } from './index.ts'

const energy = { value: 12.5, unit: 'kJ' }
const rel1 = { tolerance: { kind: 'relative' as const, value: 0.01 }, dimension: 'energy' as const }

describe('checkAnswer: unit equivalence', () => {
  // 1 kJ = 1000 J by the SI prefix definition (SI Brochure, 9th ed., Table 7).
  test.each(['12.5 kJ', '12500 J', '1.25e4 J', '0.0125 MJ'])('%s is the same answer as 12.5 kJ', (answer) => {
    const r = checkAnswer({ expected: energy, answer, rule: rel1 })
    expect(r.verdict).toBe('correct')
    expect(r.valueInExpectedUnit).toBeCloseTo(12.5, 9)
  })

  test('a bare number is accepted only where the rule allows it', () => {
    expect(checkAnswer({ expected: energy, answer: '12.5', rule: { ...rel1, allowBareNumber: true } }).verdict).toBe(
      'correct',
    )
    expect(checkAnswer({ expected: energy, answer: '12.5', rule: rel1 }).verdict).toBe('wrong-dimension')
  })

  test('a mass where an energy is needed is the wrong dimension, with a message', () => {
    const r = checkAnswer({ expected: energy, answer: '12.5 kg', rule: rel1 })
    expect(r.verdict).toBe('wrong-dimension')
    expect(r.message.length).toBeGreaterThan(10)
  })
})

describe('checkAnswer: temperatures', () => {
  // 0 °C = 273.15 K exactly (SI Brochure, 9th ed., 2.3.1); a difference of 1 °C equals 1 K.
  test('27 °C is 300.15 K as an absolute temperature', () => {
    const r = checkAnswer({
      expected: { value: 300.15, unit: 'K' },
      answer: '27 °C',
      rule: { tolerance: { kind: 'absolute', value: 0.01 }, dimension: 'temperature' },
    })
    expect(r.verdict).toBe('correct')
  })
  test('10 °C is 10 K as a temperature difference', () => {
    const r = checkAnswer({
      expected: { value: 10, unit: 'K' },
      answer: '10 °C',
      rule: { tolerance: { kind: 'absolute', value: 0.01 }, isDifference: true },
    })
    expect(r.verdict).toBe('correct')
    const asAbsolute = checkAnswer({
      expected: { value: 10, unit: 'K' },
      answer: '10 °C',
      rule: { tolerance: { kind: 'absolute', value: 0.01 }, dimension: 'temperature' },
    })
    expect(asAbsolute.verdict).toBe('incorrect')
  })
})

describe('checkAnswer: tolerance edges (inclusive)', () => {
  const e = { value: 100, unit: 'J' }
  test.each([
    ['101 J', 'correct'], // exactly on |a−e| = 1 % of 100
    ['99 J', 'correct'],
    ['101.01 J', 'incorrect'],
    ['98.99 J', 'incorrect'],
  ])('relative 1 %%: %s → %s', (answer, verdict) => {
    expect(checkAnswer({ expected: e, answer, rule: { tolerance: { kind: 'relative', value: 0.01 } } }).verdict).toBe(
      verdict,
    )
  })
  test.each([
    ['0.4 J', 'correct'], // 0.3 ± 0.1: on the edge despite floating-point round-off
    ['0.2 J', 'correct'],
    ['0.41 J', 'incorrect'],
  ])('absolute 0.1 J around 0.3 J: %s → %s', (answer, verdict) => {
    expect(
      checkAnswer({
        expected: { value: 0.3, unit: 'J' },
        answer,
        rule: { tolerance: { kind: 'absolute', value: 0.1 } },
      }).verdict,
    ).toBe(verdict)
  })
  test('expected 0 with a relative tolerance: only zero is correct', () => {
    const rule = { tolerance: { kind: 'relative' as const, value: 0.05 } }
    expect(checkAnswer({ expected: { value: 0, unit: 'J' }, answer: '0 J', rule }).verdict).toBe('correct')
    expect(checkAnswer({ expected: { value: 0, unit: 'J' }, answer: '1e-9 J', rule }).verdict).toBe('incorrect')
  })
})

describe('checkAnswer: significant figures', () => {
  const rule = { tolerance: { kind: 'relative' as const, value: 0.01 }, sigFigs: { min: 3, max: 4 } }
  test('a right value with too few figures is incorrect, flagged as within tolerance', () => {
    const r = checkAnswer({ expected: { value: 1200, unit: 'J' }, answer: '1.2e3 J', rule })
    expect(r.verdict).toBe('incorrect')
    expect(r.detail?.code).toBe('sig-figs')
    expect(r.detail?.withinTolerance).toBe(true)
  })
  test.each(['1.20e3 J', '1.200e3 J', '1200 J'])('%s meets 3–4 figures', (answer) => {
    expect(checkAnswer({ expected: { value: 1200, unit: 'J' }, answer, rule }).verdict).toBe('correct')
  })
  test('too many figures is flagged too', () => {
    expect(checkAnswer({ expected: { value: 1200, unit: 'J' }, answer: '1200.00 J', rule }).detail?.code).toBe(
      'sig-figs',
    )
  })
})

describe('checkAnswer: security and junk', () => {
  test.each([
    'import({})',
    'createUnit("x")',
    'evaluate("1+1")',
    'x = 1',
    'f(x) = x',
    '__proto__',
    'constructor',
    '1e999 J',
    'Infinity J',
    'NaN J',
    '(((((',
    '',
  ])('%j is unreadable, never correct', (answer) => {
    const r = checkAnswer({ expected: energy, answer, rule: rel1 })
    expect(['unreadable', 'wrong-dimension']).toContain(r.verdict)
    expect(r.message).not.toMatch(/mathjs|TypeError|at \w+ \(/)
  })

  test('1,000 random junk strings never throw and never come back correct', () => {
    // Seeded xorshift32, so a failure can be reproduced.
    let s = 0x9e3779b9
    const rnd = () => {
      s ^= s << 13
      s ^= s >>> 17
      s ^= s << 5
      return (s >>> 0) / 2 ** 32
    }
    const pieces = [
      'import',
      'createUnit',
      'evaluate',
      'parse',
      '(',
      ')',
      '[',
      ']',
      '{',
      '}',
      '=',
      ';',
      '"',
      "'",
      '\\',
      '$',
      '#',
      '@',
      '!',
      '?',
      '..',
      '^^',
      '**',
      'e',
      'E',
      '%',
      '__proto__',
      'constructor',
      'prototype',
      'ﾟ',
      '💥',
      '\u0000',
      '\u202e',
      'NaN',
      'Infinity',
      '1e99999',
      ',',
      'kJ',
      'J',
      '°',
      '×',
      '−',
    ]
    let unreadable = 0
    for (let i = 0; i < 1000; i++) {
      const n = 1 + Math.floor(rnd() * 12)
      let text = ''
      for (let k = 0; k < n; k++)
        text +=
          rnd() < 0.7 ? pieces[Math.floor(rnd() * pieces.length)] : String.fromCharCode(Math.floor(rnd() * 0xffff))
      // Junk by construction: each string holds at least one character no answer may contain.
      text = `${text}{`
      if (i % 100 === 0) text = text.repeat(50)
      let r
      expect(() => (r = checkAnswer({ expected: energy, answer: text, rule: rel1 }))).not.toThrow()
      expect(r!.verdict).not.toBe('correct')
      if (r!.verdict === 'unreadable') unreadable++
    }
    expect(unreadable).toBe(1000)
  })
})

describe('checkAnswer: a temperature under the other scale’s label', () => {
  // 0 °C = 273.15 K exactly (SI Brochure, 9th ed., 2.3.1), so 300 °C = 573.15 K.
  const rel = { tolerance: { kind: 'relative' as const, value: 0.01 }, dimension: 'temperature' as const }
  const abs2K = { tolerance: { kind: 'absolute' as const, value: 2, unit: 'K' }, dimension: 'temperature' as const }
  test.each([
    [
      'key 573.15 K, "300 K" (the °C number labelled K)',
      { value: 573.15, unit: 'K' },
      '300 K',
      rel,
      'celsius-labelled-kelvin',
      'This looks like the temperature in °C with a K label: 300 °C is 573.15 K.',
    ],
    [
      'key 573.15 K, "301 K" within an absolute 2 K of the slip',
      { value: 573.15, unit: 'K' },
      '301 K',
      abs2K,
      'celsius-labelled-kelvin',
      'This looks like the temperature in °C with a K label: 301 °C is 574.15 K.',
    ],
    [
      'key 300 °C, "573.15 °C" (the K number labelled °C)',
      { value: 300, unit: 'degC' },
      '573.15 °C',
      abs2K,
      'kelvin-labelled-celsius',
      'This looks like the temperature in K with a °C label: 573.15 K is 300 °C.',
    ],
    [
      'key 573.15 K, "573.15 degC" (the K number labelled °C)',
      { value: 573.15, unit: 'K' },
      '573.15 degC',
      rel,
      'kelvin-labelled-celsius',
      'This looks like the temperature in K with a °C label: 573.15 K is 300 °C.',
    ],
    // 1 K = 1.8 °F as a difference; 573.15 K = 572 °F.
    [
      'key 572 °F, "300 K"',
      { value: 572, unit: 'degF' },
      '300 K',
      abs2K,
      'celsius-labelled-kelvin',
      'This looks like the temperature in °C with a K label: 300 °C is 573.15 K.',
    ],
  ])('%s: still incorrect, with the specific message', (_what, expected, answer, rule, slip, message) => {
    const r = checkAnswer({ expected, answer, rule })
    expect(r.verdict).toBe('incorrect')
    expect(r.detail?.code).toBe('outside-tolerance')
    expect(r.detail?.temperatureLabel).toBe(slip)
    expect(r.message).toBe(message)
  })

  test.each([
    ['a number far from both scales', { value: 573.15, unit: 'K' }, '450 K', rel],
    ['the slip outside the tolerance (310 K for 573.15 K with 2 K)', { value: 573.15, unit: 'K' }, '310 K', abs2K],
    [
      'a temperature difference (no offset between the scales)',
      { value: 573.15, unit: 'K' },
      '300 K',
      { ...abs2K, dimension: undefined, isDifference: true },
    ],
    ['an expression, not a typed number', { value: 573.15, unit: 'K' }, '(600 - 300) K', rel],
    ['the °C number labelled mK', { value: 573.15, unit: 'K' }, '300000 mK', rel],
  ])('no slip named: %s', (_what, expected, answer, rule) => {
    const r = checkAnswer({ expected, answer, rule: rule as never })
    expect(r.verdict).toBe('incorrect')
    expect(r.detail?.temperatureLabel).toBeUndefined()
    expect(r.message).toBe('Check the number: it is outside the accepted range.')
  })

  test('the right answer in either unit is still correct', () => {
    expect(checkAnswer({ expected: { value: 573.15, unit: 'K' }, answer: '300 °C', rule: rel }).verdict).toBe('correct')
    expect(checkAnswer({ expected: { value: 573.15, unit: 'K' }, answer: '573.15 K', rule: rel }).verdict).toBe(
      'correct',
    )
  })
})
