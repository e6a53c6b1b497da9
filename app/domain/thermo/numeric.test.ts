import { expect, test } from 'vitest'
import { brent } from './numeric.ts'

test.each([
  // closed forms: √2, the Dottie number (cos x = x, 0.739085133215161), e (ln x = 1)
  [(x: number) => x * x - 2, 0, 2, Math.SQRT2],
  [(x: number) => Math.cos(x) - x, 0, 1, 0.739085133215161],
  [(x: number) => Math.log(x) - 1, 1, 5, Math.E],
])('brent finds the root (%#)', (f, a, b, root) => {
  expect(brent(f, a, b, 1e-14)).toBeCloseTo(root, 12)
})

test('brent returns NaN without a sign change', () => {
  expect(brent((x) => x * x + 1, -1, 1)).toBeNaN()
})
