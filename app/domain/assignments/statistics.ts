/**
 * Summary numbers for an assignment's statistics page: mean, median, a histogram, and the
 * most common wrong answers. Pure.
 *
 * Wrong answers are grouped by their value rounded to 3 significant figures. Answers are
 * read in the find's unit before grading, so "300 K" and "26.85 °C" land in one group; three
 * figures is what a first course asks students to report, so answers that differ only in
 * rounding or extra digits fall together, while different slips (a sign, a factor of 1000,
 * °C for K) stay apart. Students have different variants, so a group usually gathers
 * students who share a variant or a slip that gives the same number whatever the givens
 * (0, a sign flip of a shared value); each group names the pitfall most of its answers were
 * explained by.
 */

export function mean(values: readonly number[]): number | null {
  if (values.length === 0) return null
  let sum = 0
  for (const v of values) sum += v
  return sum / values.length
}

/** The middle value, or the mean of the two middle values for an even count. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null
  const sorted = [...values].sort((a, b) => a - b)
  const mid = Math.floor(sorted.length / 2)
  return sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

export interface HistogramBin {
  /** lower edge (included) */
  readonly from: number
  /** upper edge (excluded, except for the last bin, which includes it) */
  readonly to: number
  readonly count: number
}

/**
 * `bins` equal bins over [min, max]. A value equal to max counts in the last bin (a full
 * score is a score, not an overflow); values outside the range count in the nearest end
 * bin, so every value is shown.
 */
export function histogram(values: readonly number[], bins: number, range: readonly [number, number]): HistogramBin[] {
  const [min, max] = range
  if (!Number.isInteger(bins) || bins < 1) throw new Error('histogram: bins must be a positive integer')
  if (!(max > min)) throw new Error('histogram: range must have max > min')
  const width = (max - min) / bins
  const counts = new Array<number>(bins).fill(0)
  for (const v of values) {
    if (!Number.isFinite(v)) continue
    const i = Math.min(bins - 1, Math.max(0, Math.floor((v - min) / width)))
    counts[i]! += 1
  }
  return counts.map((count, i) => ({ from: min + i * width, to: i === bins - 1 ? max : min + (i + 1) * width, count }))
}

/** x rounded to `figures` significant figures (0 stays 0). */
export function roundSignificant(x: number, figures = 3): number {
  if (x === 0 || !Number.isFinite(x)) return x
  const rounded = Number(x.toPrecision(figures))
  return Object.is(rounded, -0) ? 0 : rounded
}

export interface WrongAnswer {
  /** the answer in the find's unit, as read; null when it could not be read */
  readonly value: number | null
  /** the text as typed */
  readonly answer: string
  readonly pitfallId: string | null
  readonly pitfallFeedback: string | null
  /** the key of the student's own variant, in the find's unit, when known */
  readonly expected?: number | null
}

export interface WrongAnswerGroup {
  /** the group's value, rounded to 3 significant figures */
  readonly value: number
  readonly count: number
  /** a few of the texts typed, distinct, in the order first seen */
  readonly examples: readonly string[]
  /** the pitfall named for most answers of the group, and for how many; null when none was */
  readonly pitfall: { readonly id: string; readonly feedback: string; readonly count: number } | null
}

/**
 * Groups wrong answers by value (3 significant figures), largest group first (ties: smaller
 * value first), at most `limit` groups. Answers without a value are left out: they have no
 * number to share.
 */
export function groupWrongAnswers(
  answers: readonly WrongAnswer[],
  options: { limit?: number; examples?: number } = {},
): WrongAnswerGroup[] {
  return groupBy(
    answers,
    (a) => (a.value === null || !Number.isFinite(a.value) ? null : roundSignificant(a.value, 3)),
    options,
  )
}

/**
 * Groups wrong answers by their multiple of the student's own key (answer ÷ key, 3 significant
 * figures). Every student has other numbers, so equal values are rare; the same slip, though,
 * gives the same multiple whatever the numbers (−1 for the other sign convention, 1000 for kJ
 * taken as J), so this is the grouping that finds the class's common mistakes. Answers
 * without a value or a non-zero key are left out.
 */
export function groupWrongAnswersByMultiple(
  answers: readonly WrongAnswer[],
  options: { limit?: number; examples?: number } = {},
): WrongAnswerGroup[] {
  return groupBy(
    answers,
    (a) => {
      if (
        a.value === null ||
        !Number.isFinite(a.value) ||
        typeof a.expected !== 'number' ||
        !Number.isFinite(a.expected) ||
        a.expected === 0
      )
        return null
      const multiple = roundSignificant(a.value / a.expected, 3)
      return Number.isFinite(multiple) ? multiple : null
    },
    options,
  )
}

function groupBy(
  answers: readonly WrongAnswer[],
  keyOf: (a: WrongAnswer) => number | null,
  options: { limit?: number; examples?: number },
): WrongAnswerGroup[] {
  const limit = options.limit ?? 5
  const maxExamples = options.examples ?? 3
  const groups = new Map<
    number,
    { count: number; examples: string[]; pitfalls: Map<string, { feedback: string; count: number }> }
  >()
  for (const a of answers) {
    const key = keyOf(a)
    if (key === null) continue
    let g = groups.get(key)
    if (!g) {
      g = { count: 0, examples: [], pitfalls: new Map() }
      groups.set(key, g)
    }
    g.count += 1
    const text = a.answer.trim()
    if (g.examples.length < maxExamples && !g.examples.includes(text)) g.examples.push(text)
    if (a.pitfallId) {
      const p = g.pitfalls.get(a.pitfallId) ?? { feedback: a.pitfallFeedback ?? '', count: 0 }
      p.count += 1
      g.pitfalls.set(a.pitfallId, p)
    }
  }
  return [...groups.entries()]
    .map(([value, g]) => {
      let pitfall: WrongAnswerGroup['pitfall'] = null
      for (const [id, p] of g.pitfalls)
        if (!pitfall || p.count > pitfall.count) pitfall = { id, feedback: p.feedback, count: p.count }
      return { value, count: g.count, examples: g.examples, pitfall }
    })
    .sort((a, b) => b.count - a.count || a.value - b.value)
    .slice(0, limit)
}
