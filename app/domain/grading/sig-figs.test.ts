import { describe, expect, test } from 'vitest'
import { checkSignificantFigures, countSignificantFigures, sigFigRuleProblem } from './sig-figs.ts'

// Counting rules: common practice in introductory science courses (the rules are written
// out in the header of sig-figs.ts); the trailing-zero ambiguity is decided in our favour
// of the student and documented there.
describe('countSignificantFigures', () => {
  test.each([
    ['12.5', 3, 3],
    ['12500', 3, 5], // ambiguous trailing zeros
    ['1200', 2, 4],
    ['1200.', 4, 4], // a trailing point makes the zeros count
    ['1.200e3', 4, 4],
    ['1.200E3', 4, 4],
    ['1.25e4', 3, 3],
    ['0.0042', 2, 2],
    ['0.00420', 3, 3],
    ['1002', 4, 4],
    ['-3.00', 3, 3],
    ['+7', 1, 1],
    ['.5', 1, 1],
    ['5.', 1, 1],
    ['100', 1, 3],
    ['101', 3, 3],
    ['12.50', 4, 4],
    ['6.02214076e23', 9, 9],
  ])('%s has %i to %i', (literal, min, max) => {
    expect(countSignificantFigures(literal)).toEqual({ kind: 'count', min, max })
  })
  test.each(['0', '0.0', '0.000', '-0', '0e5'])('%s is zero', (literal) => {
    expect(countSignificantFigures(literal)).toEqual({ kind: 'zero' })
  })
  test.each(['', 'abc', '1.2.3', '2*3', '1e', 'e5', '1,5', '--1'])('%j is not a literal', (literal) => {
    expect(countSignificantFigures(literal)).toBeNull()
  })
})

describe('checkSignificantFigures', () => {
  test.each([
    ['12.5', { min: 3 }, true],
    ['12.5', { min: 4 }, false],
    ['12.5', { max: 2 }, false],
    ['12.5', { min: 3, max: 3 }, true],
    ['12.50', { min: 3, max: 3 }, false],
    ['1200', { min: 3, max: 3 }, true], // ambiguous 2–4: benefit of the doubt
    ['1200', { min: 5 }, false],
    ['1200', { max: 1 }, false],
    ['1200.', { max: 3 }, false],
    ['1.20e3', { min: 3, max: 3 }, true],
    ['0', { min: 3 }, true], // zero: not counted
  ])('%s with %j → %s', (literal, rule, ok) => {
    const c = countSignificantFigures(literal)
    if (!c) throw new Error('literal')
    expect(checkSignificantFigures(c, rule).ok).toBe(ok)
  })
  test('says which way it fails', () => {
    const few = checkSignificantFigures({ kind: 'count', min: 2, max: 2 }, { min: 3 })
    const many = checkSignificantFigures({ kind: 'count', min: 5, max: 5 }, { max: 3 })
    expect(few.ok ? null : few.problem).toBe('too-few')
    expect(many.ok ? null : many.problem).toBe('too-many')
  })
})

describe('sigFigRuleProblem', () => {
  test.each([
    [undefined, null],
    [{ min: 3 }, null],
    [{ min: 2, max: 4 }, null],
    [{}, 'sigFigs needs min, max or both'],
    [{ min: 0 }, 'sigFigs.min must be a whole number from 1 to 17'],
    [{ min: 2.5 }, 'sigFigs.min must be a whole number from 1 to 17'],
    [{ max: 'x' }, 'sigFigs.max must be a whole number from 1 to 17'],
    [{ min: 4, max: 3 }, 'sigFigs.min is larger than sigFigs.max'],
    [null, 'sigFigs must be an object { min?, max? }'],
  ])('%j → %j', (rule, problem) => {
    expect(sigFigRuleProblem(rule)).toBe(problem)
  })
})
