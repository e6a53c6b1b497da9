/**
 * The one way scores and points are written, on pages, in e-mails and in exports: at most
 * two decimals, no trailing zeros, halves rounded up ("2.86 of 4.29", "7 of 10", never
 * 5.714286). Isomorphic: the gradebook pages, the problem page, the grade-release e-mail and
 * the CSV/XLSX exports all use it, so a score reads the same everywhere.
 *
 * - Rounding is decimal, not binary: 1.005 → 1.01 and 2.345 → 2.35 (Math.round(x * 100)
 *   would give 1 and 2.34, because 1.005 * 100 is 100.49999…).
 * - A score is never negative: anything below zero (round-off such as -1e-12, or -0) is 0.
 * - A value that is not a finite number is written as 0 rather than "NaN".
 */

/** Points to two decimals, as a number, for exports (a grade system wants numbers). */
export function roundPoints(x: number): number {
  if (!Number.isFinite(x) || x <= 0) return 0
  // Trim binary noise to 9 decimals first (scores are stored to 1e-6), then round the
  // decimal text: "2.345000000e2" is exactly 234.5, so the half goes up as written.
  const [mantissa, exponent = '0'] = x.toExponential(9).split('e')
  const hundredths = Math.round(Number(`${mantissa}e${Number(exponent) + 2}`))
  const rounded = hundredths / 100
  return rounded === 0 ? 0 : rounded
}

/** "2.86", "7", "0.5", "0". */
export function formatPoints(x: number): string {
  return String(roundPoints(x))
}

/** "1 point", "2.5 points", "0 points". */
export function formatPointsWord(x: number): string {
  const n = roundPoints(x)
  return `${String(n)} ${n === 1 ? 'point' : 'points'}`
}

/** "2.86 of 4.29". */
export function formatScore(score: number, max: number): string {
  return `${formatPoints(score)} of ${formatPoints(max)}`
}
