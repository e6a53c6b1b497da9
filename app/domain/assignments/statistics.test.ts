import { describe, expect, test } from 'vitest'
import {
  groupWrongAnswers,
  groupWrongAnswersByMultiple,
  histogram,
  mean,
  median,
  roundSignificant,
  type WrongAnswer,
} from './statistics.ts'

describe('mean', () => {
  test.each([
    [[], null],
    [[4], 4],
    [[1, 2, 3, 4], 2.5],
    [[0, 0, 1], 1 / 3],
    [[-2, 2], 0],
  ])('mean(%j) = %s', (values, expected) => {
    const m = mean(values)
    if (expected === null) expect(m).toBeNull()
    else expect(m).toBeCloseTo(expected, 12)
  })
})

describe('median', () => {
  test.each([
    [[], null],
    [[7], 7],
    [[3, 1, 2], 2],
    [[4, 1, 3, 2], 2.5],
    [[0, 0, 1, 1, 1], 1],
    [[10, -10], 0],
  ])('median(%j) = %s', (values, expected) => {
    expect(median(values)).toBe(expected)
  })

  test('does not reorder its input', () => {
    const values = [3, 1, 2]
    median(values)
    expect(values).toEqual([3, 1, 2])
  })
})

describe('histogram', () => {
  test.each([
    { values: [], bins: 2, range: [0, 1] as const, counts: [0, 0] },
    { values: [0, 0.49, 0.5, 1], bins: 2, range: [0, 1] as const, counts: [2, 2] },
    { values: [1, 1, 1], bins: 10, range: [0, 1] as const, counts: [0, 0, 0, 0, 0, 0, 0, 0, 0, 3] },
    { values: [-0.5, 1.5], bins: 4, range: [0, 1] as const, counts: [1, 0, 0, 1] },
    { values: [0.25, 0.25, 0.75, Number.NaN], bins: 4, range: [0, 1] as const, counts: [0, 2, 0, 1] },
    { values: [5, 15, 25], bins: 3, range: [0, 30] as const, counts: [1, 1, 1] },
  ])('$values in $bins bins over $range → $counts', ({ values, bins, range, counts }) => {
    expect(histogram(values, bins, range).map((b) => b.count)).toEqual(counts)
  })

  test('bin edges cover the range, the last ending exactly at max', () => {
    const bins = histogram([], 5, [0, 1])
    expect(bins[0]!.from).toBe(0)
    expect(bins[4]!.to).toBe(1)
    expect(bins[1]!.from).toBeCloseTo(0.2, 12)
  })

  test.each([
    [0, [0, 1]],
    [1.5, [0, 1]],
    [2, [1, 1]],
  ] as const)('refuses bins=%s or range %j', (bins, range) => {
    expect(() => histogram([1], bins, range)).toThrow()
  })
})

describe('roundSignificant', () => {
  test.each([
    [0, 0],
    [1234.5, 1230],
    [-0.0012345, -0.00123],
    [299.96, 300],
    [0.99951, 1],
    [-0.0000001, -1e-7],
  ])('%s → %s', (x, expected) => {
    expect(roundSignificant(x, 3)).toBe(expected)
  })
})

const wrong = (value: number | null, pitfallId: string | null = null, answer = String(value)): WrongAnswer => ({
  value,
  answer,
  pitfallId,
  pitfallFeedback: pitfallId ? `feedback for ${pitfallId}` : null,
})

describe('groupWrongAnswers', () => {
  test('answers equal to 3 significant figures share a group; the largest group comes first', () => {
    const groups = groupWrongAnswers([
      wrong(-412.3, 'sign-convention-flipped'),
      wrong(-412.04, 'sign-convention-flipped'),
      wrong(-411.6),
      wrong(4.12),
      wrong(0.412),
    ])
    expect(groups.map((g) => [g.value, g.count])).toEqual([
      [-412, 3],
      [0.412, 1],
      [4.12, 1],
    ])
  })

  test('each group names the pitfall most of its answers were explained by, with its count', () => {
    const [g] = groupWrongAnswers([
      wrong(100, 'kilo-factor'),
      wrong(100.1, 'celsius-for-kelvin'),
      wrong(100.2, 'celsius-for-kelvin'),
      wrong(99.96),
    ])
    expect(g!.count).toBe(4)
    expect(g!.pitfall).toEqual({ id: 'celsius-for-kelvin', feedback: 'feedback for celsius-for-kelvin', count: 2 })
  })

  test('a group no pitfall explains has pitfall null', () => {
    expect(groupWrongAnswers([wrong(7), wrong(7)])[0]!.pitfall).toBeNull()
  })

  test('answers without a value are left out; no answers give no groups', () => {
    expect(groupWrongAnswers([wrong(null), wrong(null)])).toEqual([])
    expect(groupWrongAnswers([])).toEqual([])
  })

  test('keeps a few distinct texts as typed, and at most `limit` groups', () => {
    const groups = groupWrongAnswers(
      [
        wrong(300, null, '300 K'),
        wrong(300, null, ' 300 K '),
        wrong(300.04, null, '300.04'),
        wrong(1),
        wrong(2),
        wrong(3),
      ],
      { limit: 2 },
    )
    expect(groups).toHaveLength(2)
    expect(groups[0]!.examples).toEqual(['300 K', '300.04'])
    expect(groups[1]!.value).toBe(1)
  })
})

describe('groupWrongAnswersByMultiple', () => {
  const wrong = (value: number | null, expected: number | null, pitfallId: string | null = null) => ({
    value,
    expected,
    answer: String(value),
    pitfallId,
    pitfallFeedback: pitfallId ? `feedback for ${pitfallId}` : null,
  })

  test('the same slip on different numbers lands in one group', () => {
    const groups = groupWrongAnswersByMultiple([
      wrong(-412.3, 412.3, 'sign-convention-flipped'),
      wrong(-388, 388, 'sign-convention-flipped'),
      wrong(-501.7, 501.7, null),
      wrong(455000, 455, 'kilo-factor'),
      wrong(610, 480, null),
    ])
    expect(groups.map((g) => [g.value, g.count, g.pitfall?.id ?? null, g.pitfall?.count ?? 0])).toEqual([
      [-1, 3, 'sign-convention-flipped', 2],
      [1.27, 1, null, 0],
      [1000, 1, 'kilo-factor', 1],
    ])
  })

  test('answers without a value or a usable key are left out', () => {
    expect(
      groupWrongAnswersByMultiple([
        wrong(null, 3),
        wrong(5, 0),
        wrong(5, null),
        { ...wrong(5, 2), expected: undefined },
      ]),
    ).toEqual([])
  })
})
