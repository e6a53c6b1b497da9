import { expect, test } from 'vitest'
import { answerScore, bestScore, findShares, findState, roundScore } from './scoring.ts'

test.each([
  [10, [1, 1], [5, 5]],
  [10, [2, 1, 1], [5, 2.5, 2.5]],
  [6, [0, 0, 0], [2, 2, 2]],
  [4, [], []],
])('item of %d points over finds %j', (item, finds, shares) => {
  expect(findShares(item, finds)).toEqual(shares)
})

test.each([
  ['correct, on time', 'correct', 0, 5, 5],
  ['correct, 20 % late', 'correct', 0.2, 5, 4],
  ['correct, penalty over 100 %', 'correct', 1.5, 5, 0],
  ['incorrect', 'incorrect', 0, 5, 0],
  ['unreadable', 'unreadable', 0, 5, 0],
  ['wrong dimension', 'wrong-dimension', 0, 5, 0],
] as const)('%s', (_n, verdict, penalty, share, score) => {
  expect(answerScore(verdict, penalty, share)).toBe(score)
})

test('scores drop binary round-off', () => {
  expect(roundScore(0.1 + 0.2)).toBe(0.3)
  expect(roundScore(answerScore('correct', 0, 10 / 3) * 3)).toBe(10)
})

test('the best answer counts: a later wrong attempt keeps an earlier right one', () => {
  expect(bestScore([5, 0, null])).toBe(5)
  expect(bestScore([])).toBe(0)
  expect(bestScore([null, undefined])).toBe(0)
})

test.each([
  [{ attemptsUsed: 0, attemptsAllowed: 3, anyCorrect: false, anyPending: false }, 'not-started'],
  [{ attemptsUsed: 1, attemptsAllowed: 3, anyCorrect: false, anyPending: true }, 'grading'],
  [{ attemptsUsed: 1, attemptsAllowed: 3, anyCorrect: false, anyPending: false }, 'try-again'],
  [{ attemptsUsed: 3, attemptsAllowed: 3, anyCorrect: false, anyPending: false }, 'out-of-attempts'],
  [{ attemptsUsed: 3, attemptsAllowed: 3, anyCorrect: true, anyPending: false }, 'correct'],
] as const)('find state %j', (input, state) => {
  expect(findState(input)).toBe(state)
})
