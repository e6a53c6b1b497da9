/**
 * Verification: once every state is known, every relation must hold, so over-specified but
 * inconsistent givens produce an error naming the state and property instead of a wrong key.
 */
import { P, V, fail, relClose } from './relations.ts'
import type { Failure } from './relations.ts'
import type { Work } from './work.ts'

export function verifyRelations(c: Work): Failure | null {
  const { spec, system, steps, N, val, Vtot } = c
  for (let i = 0; i < N; i++) {
    const Vt = Vtot[i]!
    if (!Number.isNaN(Vt) && !relClose(Vt, c.amount * val[3 * i + V]!)) {
      return fail(
        'conflict',
        `State ${c.stateName(i)}: V given as ${spec.labels?.[`V${i + 1}`] ?? `${Vt} m³`} but the other data require ${Number((c.amount * val[3 * i + V]!).toPrecision(4))} m³`,
        { state: i + 1, property: 'V' },
      )
    }
  }
  for (let k = 0; k < N; k++) {
    const s = steps[k]!
    const i = k
    const j = k + 1 === N ? 0 : k + 1
    const q = c.heatOf(s)
    const conflict = c.checkStep(s, k, i, j, q)
    if (conflict) return conflict
  }
  // A step called an expansion must expand and one called a compression must compress: a
  // Diesel cutoff beyond V1, say, otherwise gives an "expansion" that compresses at absurd
  // temperatures. (Closed systems by volume; steady flow by pressure.)
  for (let k = 0; k < N; k++) {
    const label = steps[k]!.label
    if (!label) continue
    const i = k
    const j = k + 1 === N ? 0 : k + 1
    const byVolume = system === 'closed'
    const a = val[3 * i + (byVolume ? V : P)]!
    const b = val[3 * j + (byVolume ? V : P)]!
    const grows = byVolume ? b > a * (1 + 1e-9) : b < a * (1 - 1e-9)
    const shrinks = byVolume ? b < a * (1 - 1e-9) : b > a * (1 + 1e-9)
    const what = byVolume ? 'volume' : 'pressure'
    if (/\b(expansion|turbine)\b/i.test(label) && shrinks) {
      return fail(
        'unphysical',
        `Step ${k + 1} (${label}) would compress the gas: its ${what} goes from ${Number(a.toPrecision(4))} to ${Number(b.toPrecision(4))}. Check the data that fix state ${c.stateName(j)} (for a Diesel or dual cycle, the cutoff ratio must be below the compression ratio).`,
        { step: k + 1 },
      )
    }
    if (/\bcompress(ion|or)\b/i.test(label) && grows) {
      return fail(
        'unphysical',
        `Step ${k + 1} (${label}) would expand the gas: its ${what} goes from ${Number(a.toPrecision(4))} to ${Number(b.toPrecision(4))}. Check the data that fix state ${c.stateName(j)}.`,
        { step: k + 1 },
      )
    }
  }
  return null
}
