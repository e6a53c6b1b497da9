// Bank problems on steam plants (templates 'rankine-feedwater' and 'rankine-cogeneration'): the
// demo problems' keys and worked solutions recomputed from Debian's python3-iapws (IAPWS97)
// through tests/support/iapws-reference.ts, with the heater and plant balances written out by
// hand below for each configuration (not by the general solver). Relations: the textbook ones
// (Cengel & Boles, "Thermodynamics: An Engineering Approach", 7th ed., Sections 10-6 and 10-8,
// from memory): a closed heater with TTD leaves the feedwater at T_sat(p_bleed) − TTD and its
// drain as saturated liquid; an open heater mixes to saturated liquid; ideal pumps and turbine
// sections are isentropic; the utilisation factor is (W_net + Q_process) / Q_in. If the reference
// is missing the tests FAIL with the install hint; they never skip.
import { beforeAll, describe, expect, test } from 'vitest'
import type { ProblemDefinition, Variant } from '#app/domain/authoring/definition.ts'
import { cycleDiagrams } from '#app/domain/authoring/diagrams.ts'
import { sweepVariants } from '#app/domain/authoring/sweep.ts'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { n4, workedSolution } from '#app/domain/authoring/worked-solution.ts'
import { referenceAvailable, referenceStates, REFERENCE_MISSING_MESSAGE } from '#tests/support/iapws-reference.ts'
import type { RefQuery, RefState } from '#tests/support/iapws-reference.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'

const C = 273.15
const SEEDS = [1, 2, 3, 4]

function demo(template: string): ProblemDefinition {
  const d = DEMO_PROBLEMS.find(
    (p) => p.definition.physics.kind === 'template' && p.definition.physics.template === template,
  )
  if (!d) throw new Error(`no demo problem on ${template}`)
  return d.definition
}

function draw(def: ProblemDefinition, seed: number): Variant {
  const r = drawVariant(def, seed, { convention: 'engineering' })
  if (!r.ok) throw new Error(`seed ${seed}: ${r.error.message}`)
  return r.variant
}

const given = (v: Variant, name: string) => v.givens.find((g) => g.name === name)!.value
const key = (v: Variant, name: string) => v.key.find((k) => k.name === name)!.value
/** A number at a dotted path of the solution (1-based list indices, as the keys read them). */
function at(v: Variant, path: string): number {
  let cur: unknown = v.solution
  for (const part of path.split('.')) {
    const i = Number(part)
    cur = Array.isArray(cur) ? cur[i - 1] : (cur as Record<string, unknown>)[part]
  }
  return (cur as { value: number }).value
}
const texts = (v: Variant, def: ProblemDefinition) =>
  workedSolution(v, def)
    .sections.flatMap((s) => s.lines.map((l) => `${l.tex} ${l.note ?? ''}`))
    .join('\n')
const close = (a: number, b: number, rel = 1e-6) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b))

let available = false
interface FeedwaterRef {
  seed: number
  y1: number
  y2: number
  wNet: number
  eta: number
  qClosed: number
  qOpen: number
}
interface CogenRef {
  seed: number
  qP: number
  wNet: number
  epsU: number
  qIn: number
}
const feedwaterRefs: FeedwaterRef[] = []
const cogenRefs: CogenRef[] = []

beforeAll(() => {
  available = referenceAvailable()
  if (!available) return
  // Closed heater + deaerator: 10 MPa / TIT / 10 kPa, closed at pC (TTD, drains trapped into the deaerator at 0.4 MPa).
  const fw = demo('rankine-feedwater')
  const fwVariants = SEEDS.map((seed) => draw(fw, seed))
  const q1: RefQuery[] = []
  for (const v of fwVariants) {
    const TIT = given(v, 'TIT') + C
    const pC = given(v, 'pC') * 1e6
    q1.push({ kind: 'PT', p: 10e6, T: TIT }, { kind: 'Px', p: 10e3, x: 0 }, { kind: 'Px', p: 0.4e6, x: 0 })
    q1.push({ kind: 'Px', p: pC, x: 0 })
  }
  const r1 = referenceStates(q1)
  const q2: RefQuery[] = []
  fwVariants.forEach((v, i) => {
    const [s7, s1, s3, s6] = r1.slice(4 * i, 4 * i + 4) as [RefState, RefState, RefState, RefState]
    const pC = given(v, 'pC') * 1e6
    q2.push(
      { kind: 'Ps', p: pC, s: s7.s }, // 8: bleed to the closed heater
      { kind: 'Ps', p: 0.4e6, s: s7.s }, // 9: bleed to the deaerator
      { kind: 'Ps', p: 10e3, s: s7.s }, // 10: turbine exit
      { kind: 'Ps', p: 0.4e6, s: s1.s }, // 2: condensate pump exit
      { kind: 'Ps', p: 10e6, s: s3.s }, // 4: feed pump exit
      { kind: 'PT', p: 10e6, T: s6.T - given(v, 'TTD') }, // 5: feedwater leaving the closed heater
    )
  })
  const r2 = referenceStates(q2)
  fwVariants.forEach((v, i) => {
    const [s7, s1, s3, s6] = r1.slice(4 * i, 4 * i + 4) as [RefState, RefState, RefState, RefState]
    const [s8, s9, s10, s2, s4, s5] = r2.slice(6 * i, 6 * i + 6) as RefState[] as [
      RefState,
      RefState,
      RefState,
      RefState,
      RefState,
      RefState,
    ]
    // Closed heater, the whole feedwater through its tubes: y1 (h8 − h6) = h5 − h4.
    const y1 = (s5.h - s4.h) / (s8.h - s6.h)
    // Deaerator: y2 h9 + y1 h6 + (1 − y1 − y2) h2 = h3.
    const y2 = (s3.h - s2.h - y1 * (s6.h - s2.h)) / (s9.h - s2.h)
    const wT = s7.h - s8.h + (1 - y1) * (s8.h - s9.h) + (1 - y1 - y2) * (s9.h - s10.h)
    const wP = (1 - y1 - y2) * (s2.h - s1.h) + (s4.h - s3.h)
    const qIn = s7.h - s5.h
    feedwaterRefs.push({
      seed: v.seed,
      y1,
      y2,
      wNet: wT - wP,
      eta: (wT - wP) / qIn,
      qClosed: s5.h - s4.h,
      qOpen: (1 - y1 - y2) * (s3.h - s2.h),
    })
  })

  // Cogeneration: 7 MPa / 500 °C / 10 kPa, a fraction f extracted at pP to the process.
  const cg = demo('rankine-cogeneration')
  const cgVariants = SEEDS.map((seed) => draw(cg, seed))
  const c1 = referenceStates(
    cgVariants.flatMap((v): RefQuery[] => [
      { kind: 'PT', p: 7e6, T: 500 + C },
      { kind: 'Px', p: 10e3, x: 0 },
      { kind: 'Px', p: given(v, 'pP') * 1e3, x: 0 },
    ]),
  )
  const c2 = referenceStates(
    cgVariants.flatMap((v, i): RefQuery[] => {
      const [s6, s1, s3] = c1.slice(3 * i, 3 * i + 3) as [RefState, RefState, RefState]
      return [
        { kind: 'Ps', p: given(v, 'pP') * 1e3, s: s6.s }, // 7: extraction
        { kind: 'Ps', p: 10e3, s: s6.s }, // 8: turbine exit
        { kind: 'Ps', p: 7e6, s: s1.s }, // 2: condensate pump exit
        { kind: 'Ps', p: 7e6, s: s3.s }, // 4: process-condensate pump exit
      ]
    }),
  )
  cgVariants.forEach((v, i) => {
    const [s6, s1, s3] = c1.slice(3 * i, 3 * i + 3) as [RefState, RefState, RefState]
    const [s7, s8, s2, s4] = c2.slice(4 * i, 4 * i + 4) as [RefState, RefState, RefState, RefState]
    const f = given(v, 'f')
    const qP = f * (s7.h - s3.h)
    const wT = s6.h - s7.h + (1 - f) * (s7.h - s8.h)
    const wP = (1 - f) * (s2.h - s1.h) + f * (s4.h - s3.h)
    const qIn = s6.h - ((1 - f) * s2.h + f * s4.h)
    cogenRefs.push({ seed: v.seed, qP, wNet: wT - wP, epsU: (wT - wP + qP) / qIn, qIn })
  })
})

function requireReference() {
  if (!available) throw new Error(REFERENCE_MISSING_MESSAGE)
}

describe('a plant with a closed feedwater heater and a deaerator (rankine-feedwater)', () => {
  test('the keys are the hand balances on python3-iapws states', () => {
    requireReference()
    const def = demo('rankine-feedwater')
    for (const ref of feedwaterRefs) {
      const v = draw(def, ref.seed)
      close(key(v, 'y1'), ref.y1)
      close(key(v, 'y2'), ref.y2)
      close(key(v, 'wNet'), ref.wNet / 1000)
      close(key(v, 'eta'), ref.eta)
      close(at(v, 'heaters.1.heatTransferred'), ref.qClosed)
      close(at(v, 'heaters.2.heatTransferred'), ref.qOpen)
      close(at(v, 'totals.bleedFractions.1'), ref.y1)
    }
  })

  test('the worked solution shows each heater balance and every total with the key’s numbers', () => {
    requireReference()
    const def = demo('rankine-feedwater')
    for (const ref of feedwaterRefs) {
      const v = draw(def, ref.seed)
      const t = texts(v, def)
      // each heater's bleed fraction solved from its balance, and its heat
      expect(t).toContain(`y_{1} = \\frac{`)
      expect(t).toContain(`= ${n4(key(v, 'y1'))}   `.trim())
      expect(t).toMatch(new RegExp(`y_\\{2\\} = \\\\frac\\{[^\\n]*= ${n4(key(v, 'y2')).replace('.', '\\.')}`))
      expect(t).toContain(`D_{2}`) // the closed heater's drain trapped into the deaerator
      expect(t).toContain('T_{\\text{sat}}')
      expect(t).toContain(n4(ref.qClosed / 1000))
      expect(t).toContain(n4(ref.qOpen / 1000))
      // three turbine sections with the flows that pass them
      expect(t).toContain(`W_{\\mathrm{T3,out}} = (${n4(1 - key(v, 'y1') - key(v, 'y2'))})`)
      expect(t).toContain(`= ${n4(key(v, 'wNet'))}\\,\\mathrm{kJ}`)
      expect(t).toContain(`= ${n4(key(v, 'eta'))}`)
      // no fallback to bare magnitudes
      expect(t).not.toContain('steady-flow energy balance with the enthalpies and mass fractions above')
    }
  })

  test('the diagrams draw the dome, each bleed and the trapped drain', () => {
    requireReference()
    const def = demo('rankine-feedwater')
    const v = draw(def, 1)
    const d = cycleDiagrams(v.solution)
    expect(d.ts.dome?.points.length).toBeGreaterThan(10)
    const processes = d.ts.curves.map((c) => c.process)
    expect(processes.filter((p) => p.startsWith('bleed steam'))).toHaveLength(2)
    expect(processes).toContain('drains trapped into deaerator')
    expect(processes).toContain('boiler (isobaric heating)')
    expect(processes.filter((p) => p.startsWith('turbine'))).toHaveLength(3)
    // every curve joins two of the plant's states, and no curve joins states at different pressures through a heater
    const names = new Set('states' in v.solution ? v.solution.states.map((s) => s.name) : [])
    for (const c of d.ts.curves) expect(names.has(c.from) && names.has(c.to)).toBe(true)
  })

  test('the sweep finds nothing wrong over many seeds', () => {
    const s = sweepVariants(demo('rankine-feedwater'), {
      seeds: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10],
      convention: 'chemistry',
    })
    expect(s.failures).toEqual([])
  })
})

describe('a cogeneration plant (rankine-cogeneration)', () => {
  test('process heat, net work and utilisation factor are the hand balances on python3-iapws states', () => {
    requireReference()
    const def = demo('rankine-cogeneration')
    for (const ref of cogenRefs) {
      const v = draw(def, ref.seed)
      close(key(v, 'Qp'), ref.qP / 1000)
      close(key(v, 'wNet'), ref.wNet / 1000)
      close(key(v, 'epsU'), ref.epsU)
      close(at(v, 'totals.heatIn'), ref.qIn)
    }
  })

  test('the worked solution shows the process heat, the boiler-inlet mixing and the utilisation factor', () => {
    requireReference()
    const def = demo('rankine-cogeneration')
    for (const ref of cogenRefs) {
      const v = draw(def, ref.seed)
      const t = texts(v, def)
      expect(t).toContain(`Q_{\\mathrm{process}} = (${n4(given(v, 'f'))})`)
      expect(t).toContain(`= ${n4(key(v, 'Qp'))}\\,\\mathrm{kJ}`)
      expect(t).toContain(`\\varepsilon_u = \\frac{`)
      expect(t).toContain(`= ${n4(key(v, 'epsU'))}`)
      expect(t).toContain('boiler inlet: the feedwater from the heaters mixes with the pumped process condensate')
      // η from the heats counts the process heat as leaving
      expect(t).toContain(`Q_{\\mathrm{out}} + Q_{\\mathrm{process}}`)
    }
  })

  test('the sweep finds nothing wrong, in both conventions', () => {
    for (const convention of ['engineering', 'chemistry'] as const) {
      const s = sweepVariants(demo('rankine-cogeneration'), { seeds: [1, 2, 3, 4, 5, 6, 7, 8], convention })
      expect(s.failures).toEqual([])
    }
  })
})
