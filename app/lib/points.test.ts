import { describe, expect, test } from 'vitest'
import { formatPoints, formatPointsWord, formatScore, roundPoints } from './points.ts'

describe('roundPoints', () => {
  test.each([
    [5.714286, 5.71],
    [2.857143, 2.86],
    [4.285714, 4.29],
    [7, 7],
    [0, 0],
    [0.004, 0],
    [0.30000000000000004, 0.3],
    [1234.567, 1234.57],
  ])('%d → %d', (x, expected) => {
    expect(roundPoints(x)).toBe(expected)
  })

  test.each([
    // Binary floating point stores these just below the half; the decimal half still goes up.
    [1.005, 1.01],
    [2.345, 2.35],
    [0.125, 0.13],
    [0.005, 0.01],
    [10.675, 10.68],
    [2.5, 2.5],
  ])('the half %d rounds up to %d', (x, expected) => {
    expect(roundPoints(x)).toBe(expected)
  })

  test.each([[-0], [-1e-12], [-3], [Number.NaN], [Number.POSITIVE_INFINITY], [Number.NEGATIVE_INFINITY]])(
    '%d is never shown as negative or NaN: 0',
    (x) => {
      expect(roundPoints(x)).toBe(0)
      expect(Object.is(roundPoints(x), -0)).toBe(false)
      expect(formatPoints(x)).toBe('0')
    },
  )
})

describe('formatPoints and formatScore', () => {
  test('at most two decimals, no trailing zeros, no thousands separator', () => {
    expect(formatPoints(5.714286)).toBe('5.71')
    expect(formatPoints(2.5)).toBe('2.5')
    expect(formatPoints(2.5000001)).toBe('2.5')
    expect(formatPoints(10)).toBe('10')
    expect(formatPoints(1500)).toBe('1500')
    expect(formatPoints(0)).toBe('0')
  })

  test('a score of its possible points', () => {
    expect(formatScore(2.857143, 4.285714)).toBe('2.86 of 4.29')
    expect(formatScore(0, 10)).toBe('0 of 10')
    expect(formatScore(-0, 4.285714)).toBe('0 of 4.29')
  })

  test('one point, otherwise points', () => {
    expect(formatPointsWord(1)).toBe('1 point')
    expect(formatPointsWord(1.001)).toBe('1 point')
    expect(formatPointsWord(0)).toBe('0 points')
    expect(formatPointsWord(2.5)).toBe('2.5 points')
  })
})
