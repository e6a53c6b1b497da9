import { expect, test } from 'vitest'
import { readQuantity } from './format.ts'
import type { FormattedSolution } from './format.ts'
import { solveSpec } from './solve-spec.ts'

const carnot = (convention: string, extra: Record<string, string> = {}) => ({
  template: 'carnot-engine',
  convention,
  inputs: { gas: 'monatomic', amount: '1 mol', Th: '600 K', Tc: '300 K', p1: '1 MPa', expansionRatio: 2, ...extra },
})
const ok = (r: ReturnType<typeof solveSpec>): FormattedSolution => {
  if (!r.ok || !('totals' in r) || !('carnotBound' in r.totals)) throw new Error(JSON.stringify(r))
  return r as FormattedSolution
}

test('both conventions state their equation; work changes sign, heat does not (definitions)', () => {
  const c = ok(solveSpec(carnot('chemistry')))
  const e = ok(solveSpec(carnot('engineering')))
  expect(c.convention.equation).toBe('ΔU = q + w')
  expect(e.convention.equation).toBe('ΔU = Q − W')
  expect(readQuantity(c, 'totals.netWork')).toBeLessThan(0)
  expect(readQuantity(e, 'totals.netWork')).toBeCloseTo(-readQuantity(c, 'totals.netWork')!, 9)
  expect(readQuantity(e, 'steps.1.q')).toBe(readQuantity(c, 'steps.1.q'))
  // per step: chemistry ΔU = q + w, engineering ΔU = Q − W
  for (let k = 1; k <= 4; k++) {
    expect(readQuantity(c, `steps.${k}.dU`)!).toBeCloseTo(
      readQuantity(c, `steps.${k}.q`)! + readQuantity(c, `steps.${k}.w`)!,
      6,
    )
    expect(readQuantity(e, `steps.${k}.dU`)!).toBeCloseTo(
      readQuantity(e, `steps.${k}.q`)! - readQuantity(e, `steps.${k}.w`)!,
      6,
    )
  }
  expect(c.states[0]!.V!.value).toBeCloseTo((8.314462618 * 600) / 1e6, 12) // V = nRT/p (ideal-gas law)
})

test('entropy generated: 0 with reservoirs at the gas temperatures, Q_out/T_C − Q_in/T_H otherwise (second law, closed form)', () => {
  const rev = ok(solveSpec(carnot('engineering', { reservoirHot: '600 K', reservoirCold: '300 K' })))
  expect(Math.abs(readQuantity(rev, 'totals.entropyGenerated')!)).toBeLessThan(1e-12)
  const irr = ok(solveSpec(carnot('engineering', { reservoirHot: '800 K', reservoirCold: '250 K' })))
  const qin = readQuantity(irr, 'totals.heatIn')!
  const qout = readQuantity(irr, 'totals.heatOut')!
  expect(readQuantity(irr, 'totals.entropyGenerated')).toBeCloseTo(qout / 250 - qin / 800, 12)
  expect(readQuantity(irr, 'totals.entropyGenerated')).toBeGreaterThan(0)
})

test('Brayton regenerator with effectiveness ε: T3 = T2 + ε(T5 − T2) for constant cp (definition of ε)', () => {
  const s = ok(
    solveSpec({
      template: 'brayton-regenerative',
      inputs: {
        gas: 'air',
        p1: '100 kPa',
        T1: '300 K',
        pressureRatio: 6,
        turbineInletT: '1200 K',
        regeneratorEffectiveness: 0.7,
      },
    }),
  )
  const T = s.states.map((x) => x.T.value)
  expect(T[2]!).toBeCloseTo(T[1]! + 0.7 * (T[4]! - T[1]!), 9)
  expect(T[5]!).toBeCloseTo(T[4]! - (T[2]! - T[1]!), 9) // energy balance of the exchanger
  expect(s.steps[1]!.internal && s.steps[4]!.internal).toBe(true)
})

test('bad specs come back as errors, never throws', () => {
  for (const raw of [
    null,
    42,
    [],
    {},
    { template: 'nope' },
    { template: 'otto', inputs: { p1: '1 bar' } },
    { template: 'otto', inputs: { p1: 'x', T1: '300 K', compressionRatio: 8, T3: '1500 K' } },
    { cycle: { states: [{}], steps: [] } },
    { template: 'otto', convention: 'physics', inputs: {} },
  ]) {
    const r = solveSpec(raw)
    expect(r.ok).toBe(false)
  }
  const under = solveSpec({
    cycle: {
      gas: 'air',
      states: [{ p: '1 bar', T: '300 K' }, {}, {}, {}],
      steps: [
        { process: 'isentropic', compressionRatio: 8 },
        { process: 'isochoric' },
        { process: 'isentropic' },
        { process: 'isochoric' },
      ],
    },
  })
  expect(!under.ok && under.error.message).toBe('State 3: temperature is not fixed (only v3 is known): give p3 or T3')
})
