/**
 * Second law of the general cycle solver: entropy generated per step against a boundary
 * temperature, exergy destroyed, state exergies, second-law efficiencies, flow rates and the
 * warnings. Every expected number is computed here from a closed form for a constant-cp ideal
 * gas, independently of the solver.
 *
 * Sources: the entropy balance s_gen = Δs − q/T_b, exergy destruction x_dest = T0·s_gen
 * (Gouy–Stodola), closed-system exergy φ = (u − u0) + p0(v − v0) − T0(s − s0), flow exergy
 * ψ = (h − h0) − T0(s − s0), and η_II = η_th/η_rev: Çengel & Boles, Thermodynamics: An
 * Engineering Approach, ch. 7 "Entropy" and ch. 8 "Exergy" (from memory). The air-standard
 * temperatures and efficiencies (Otto, Brayton) are the closed forms of every text (common
 * practice).
 */
import { describe, expect, test } from 'vitest'
import { solveCycle } from './cycle.ts'
import type { CycleSolution, CycleSpec, StepSpec } from './cycle.ts'
import { readQuantity } from './format.ts'
import { solveSpec } from './solve-spec.ts'
import { constantCpGas } from './substances/constant-cp.ts'
import type { Gas } from './substances/gas.ts'

const R = 287
const g = 1.4
const cp = (g * R) / (g - 1)
const cv = R / (g - 1)

function gas(): Gas {
  const r = constantCpGas({ basis: 'mass', R, gamma: g })
  if (!r.ok) throw new Error(r.error.message)
  return r.gas
}
function solved(spec: CycleSpec): CycleSolution {
  const r = solveCycle(spec)
  if (!r.ok) throw new Error(r.error.message)
  return r
}

/** Carnot engine (closed): 1→2 isothermal expansion at TH by volume ratio rv, 2→3 isentropic to TL, 3→4 isothermal, 4→1 isentropic. */
function carnot(TH: number, TL: number, rv: number, extra: Partial<CycleSpec> = {}, b1?: number, b3?: number) {
  const steps: StepSpec[] = [
    { process: 'isothermal', volumeRatio: rv, boundaryTemperature: b1 },
    { process: 'isentropic', temperatureRatio: TL / TH },
    { process: 'isothermal', volumeRatio: 1 / rv, boundaryTemperature: b3 },
    { process: 'isentropic' },
  ]
  return solved({
    gas: gas(),
    system: 'closed',
    purpose: 'engine',
    states: [{ p: 1e6, T: TH }, {}, {}, {}],
    steps,
    ...extra,
  })
}

describe('entropy generated per step: s_gen = Δs − q/T_b', () => {
  test('heat Q from a reservoir at T_H into a gas held at T: s_gen = Q/T − Q/T_H (textbook closed form)', () => {
    const TH = 600
    const rv = 3
    const s = carnot(TH, 300, rv, {}, 800, 300)
    const q = R * TH * Math.log(rv) // isothermal heat, q = R T ln(v2/v1)
    expect(s.steps[0]!.boundaryTemperature).toBe(800)
    expect(s.steps[0]!.entropyGenerated!).toBeCloseTo(q / TH - q / 800, 9)
    // the rejection at the gas temperature and the isentropic steps generate nothing
    expect(Math.abs(s.steps[2]!.entropyGenerated!)).toBeLessThan(1e-9)
    expect(Math.abs(s.steps[1]!.entropyGenerated!)).toBeLessThan(1e-9)
    // per cycle: −Σ q/T_b, and the sum over the steps agrees
    expect(s.totals.entropyGenerated!).toBeCloseTo(q / TH - q / 800, 9)
    const sum = s.steps.reduce((a, st) => a + st.entropyGenerated!, 0)
    expect(sum).toBeCloseTo(s.totals.entropyGenerated!, 9)
    expect(s.warnings).toEqual([])
  })

  test('Carnot cycle between its reservoirs: s_gen = 0 per step and per cycle, η_II = 1', () => {
    const s = carnot(600, 300, 2.5, { reservoirs: { hot: 600, cold: 300 } })
    for (const st of s.steps) expect(Math.abs(st.entropyGenerated!)).toBeLessThan(1e-9)
    expect(s.steps[0]!.boundaryTemperature).toBe(600)
    expect(s.steps[2]!.boundaryTemperature).toBe(300)
    expect(Math.abs(s.totals.entropyGenerated!)).toBeLessThan(1e-9)
    expect(s.totals.secondLawEfficiency!).toBeCloseTo(1, 12)
    expect(s.warnings).toEqual([])
  })

  test('a heat step without a boundary temperature or reservoir has no s_gen, and neither has the cycle', () => {
    const s = carnot(600, 300, 2.5, { reservoirs: { hot: 600 } })
    expect(s.steps[0]!.entropyGenerated).not.toBeNull()
    expect(s.steps[2]!.entropyGenerated).toBeNull()
    expect(s.steps[2]!.boundaryTemperature).toBeNull()
    expect(s.totals.entropyGenerated).toBeNull()
  })

  test('an adiabatic compressor with η < 1 generates s_gen = Δs = cp ln(T2/T1) − R ln(p2/p1) with no T_b', () => {
    const T1 = 300
    const rp = 8
    const eta = 0.8
    const T2 = T1 + (T1 * rp ** ((g - 1) / g) - T1) / eta // closed form of the isentropic efficiency
    const s = solved({
      gas: gas(),
      system: 'flow',
      states: [{ p: 1e5, T: T1 }, {}, { T: 1300 }, {}],
      steps: [
        { process: 'adiabatic', device: 'compressor', efficiency: eta, pressureRatio: rp },
        { process: 'isobaric' },
        { process: 'isentropic' },
        { process: 'isobaric' },
      ],
    })
    expect(s.steps[0]!.boundaryTemperature).toBeNull()
    expect(s.steps[0]!.entropyGenerated!).toBeCloseTo(cp * Math.log(T2 / T1) - R * Math.log(rp), 9)
  })
})

describe('engines between reservoirs at T_max and T_min (Gouy–Stodola)', () => {
  const T0 = 300
  const p0 = 1e5

  test('Otto, r = 8, T1 = 300 K, T3 = 1800 K: η_II = η/(1 − T_L/T_H), X_dest = T0·S_gen = W_rev − W with T0 = T_L', () => {
    const r = 8
    const T1 = 300
    const T3 = 1800
    const s = solved({
      gas: gas(),
      system: 'closed',
      purpose: 'engine',
      reservoirs: { hot: T3, cold: T1 },
      deadState: { T: T0, p: p0 },
      states: [{ p: 1e5, T: T1 }, {}, { T: T3 }, {}],
      steps: [
        { process: 'isentropic', volumeRatio: 1 / r },
        { process: 'isochoric' },
        { process: 'isentropic', volumeRatio: r },
        { process: 'isochoric' },
      ],
    })
    const T2 = T1 * r ** (g - 1)
    const T4 = T3 * r ** (1 - g)
    const qin = cv * (T3 - T2)
    const qout = cv * (T4 - T1)
    const W = qin - qout
    const eta = 1 - r ** (1 - g)
    const Wrev = qin * (1 - T1 / T3)
    const sgen = qout / T1 - qin / T3
    expect(s.totals.secondLawEfficiency!).toBeCloseTo(eta / (1 - T1 / T3), 12)
    expect(s.totals.entropyGenerated!).toBeCloseTo(sgen, 9)
    expect(s.totals.exergyDestroyed!).toBeCloseTo(T0 * sgen, 6)
    expect(s.totals.exergyDestroyed!).toBeCloseTo(Wrev - W, 6)
    // per step: the heat addition at T_b = T3 and the rejection at T_b = T1, in closed form
    expect(s.steps[1]!.entropyGenerated!).toBeCloseTo(cv * Math.log(T3 / T2) - qin / T3, 9)
    expect(s.steps[3]!.entropyGenerated!).toBeCloseTo(cv * Math.log(T1 / T4) + qout / T1, 9)
    expect(s.steps[1]!.exergyDestroyed!).toBeCloseTo(T0 * (cv * Math.log(T3 / T2) - qin / T3), 6)
    // exergy efficiency: W over the exergy of the heat in, q_in(1 − T0/T_H); the rejected heat is at T0
    expect(s.totals.exergyEfficiency!).toBeCloseTo(W / (qin * (1 - T0 / T3)), 12)
  })

  test('Brayton, rp = 10, 300 K → 1400 K, 2.5 kg/s: η_II, X_dest = W_rev − W, and the powers', () => {
    const rp = 10
    const T1 = 300
    const T3 = 1400
    const mdot = 2.5
    const s = solved({
      gas: gas(),
      system: 'flow',
      purpose: 'engine',
      flowRate: mdot,
      reservoirs: { hot: T3, cold: T1 },
      deadState: { T: T0, p: p0 },
      states: [{ p: 1e5, T: T1 }, {}, { T: T3 }, {}],
      steps: [
        { process: 'isentropic', pressureRatio: rp },
        { process: 'isobaric' },
        { process: 'isentropic' },
        { process: 'isobaric' },
      ],
    })
    const x = rp ** ((g - 1) / g)
    const T2 = T1 * x
    const T4 = T3 / x
    const qin = cp * (T3 - T2)
    const qout = cp * (T4 - T1)
    const W = qin - qout
    const eta = 1 - 1 / x
    expect(s.totals.secondLawEfficiency!).toBeCloseTo(eta / (1 - T1 / T3), 12)
    expect(s.totals.exergyDestroyed!).toBeCloseTo(qin * (1 - T1 / T3) - W, 6)
    expect(s.flowRate).toBe(mdot)
    // flow exergy of the turbine inlet: ψ = cp(T − T0) − T0(cp ln(T/T0) − R ln(p/p0))
    const p3 = 1e5 * rp
    const psi3 = cp * (T3 - T0) - T0 * (cp * Math.log(T3 / T0) - R * Math.log(p3 / p0))
    expect(s.states[2]!.exergy!).toBeCloseTo(psi3, 6)
  })
})

describe('exergy of a state (constant cp, closed form)', () => {
  test('closed system: φ = cv(T − T0) + p0(v − v0) − T0(cp ln(T/T0) − R ln(p/p0)); 0 at the dead state', () => {
    const T0 = 298.15
    const p0 = 1e5
    // 1 (dead state) →isobaric→ 2 (900 K) →isochoric→ 3 (back to T0) →isothermal→ 1
    const s = solved({
      gas: gas(),
      system: 'closed',
      deadState: { T: T0, p: p0 },
      states: [{ p: p0, T: T0 }, { T: 900 }, {}],
      steps: [{ process: 'isobaric' }, { process: 'isochoric' }, { process: 'isothermal' }],
    })
    expect(Math.abs(s.states[0]!.exergy!)).toBeLessThan(1e-8)
    const v0 = (R * T0) / p0
    const phi = (T: number, p: number) =>
      cv * (T - T0) + p0 * ((R * T) / p - v0) - T0 * (cp * Math.log(T / T0) - R * Math.log(p / p0))
    expect(s.states[1]!.exergy!).toBeCloseTo(phi(900, p0), 6)
    expect(s.states[2]!.exergy!).toBeCloseTo(phi(T0, (p0 * T0) / 900), 6)
    expect(s.deadState).toEqual({ T: T0, p: p0 })
  })

  test('without a dead state there are no exergy outputs (T0 is never assumed)', () => {
    const s = carnot(600, 300, 2, { reservoirs: { hot: 600, cold: 300 } })
    expect(s.deadState).toBeNull()
    for (const st of s.states) expect(st.exergy).toBeNull()
    for (const st of s.steps) expect(st.exergyDestroyed).toBeNull()
    expect(s.totals.exergyDestroyed).toBeNull()
    expect(s.totals.exergyEfficiency).toBeNull()
    // η_II needs only the reservoirs
    expect(s.totals.secondLawEfficiency!).toBeCloseTo(1, 12)
  })
})

describe('refrigerator between reservoirs: η_II = COP/COP_rev', () => {
  test('reversed Carnot between its reservoirs: η_II = 1; between wider reservoirs: COP/(T_C/(T_H − T_C))', () => {
    const TL = 260
    const TH = 310
    const spec = (res: { hot: number; cold: number }): CycleSpec => ({
      gas: gas(),
      system: 'closed',
      purpose: 'refrigerator',
      reservoirs: res,
      states: [{ p: 1e5, T: TL }, {}, {}, {}],
      steps: [
        { process: 'isothermal', volumeRatio: 2 },
        { process: 'isentropic', temperatureRatio: TH / TL },
        { process: 'isothermal', volumeRatio: 0.5 },
        { process: 'isentropic' },
      ],
    })
    const same = solved(spec({ hot: TH, cold: TL }))
    expect(same.totals.secondLawEfficiency!).toBeCloseTo(1, 12)
    const wide = solved(spec({ hot: 320, cold: 250 }))
    expect(wide.totals.secondLawEfficiency!).toBeCloseTo(TL / (TH - TL) / (250 / (320 - 250)), 12)
    // the reservoirs apply the other way round: heat in from the cold one
    expect(wide.steps[0]!.boundaryTemperature).toBe(250)
    expect(wide.steps[2]!.boundaryTemperature).toBe(320)
  })

  test('exergy efficiency of a refrigerator, T0 = the warm reservoir: q_L(T0/T_L − 1)/W; 1 when reversible', () => {
    const TL = 260
    const TH = 310
    const spec = (res: { hot: number; cold: number }): CycleSpec => ({
      gas: gas(),
      system: 'closed',
      purpose: 'refrigerator',
      reservoirs: res,
      deadState: { T: res.hot, p: 1e5 },
      states: [{ p: 1e5, T: TL }, {}, {}, {}],
      steps: [
        { process: 'isothermal', volumeRatio: 2 },
        { process: 'isentropic', temperatureRatio: TH / TL },
        { process: 'isothermal', volumeRatio: 0.5 },
        { process: 'isentropic' },
      ],
    })
    expect(solved(spec({ hot: TH, cold: TL })).totals.exergyEfficiency!).toBeCloseTo(1, 12)
    const qL = R * TL * Math.log(2) // heat taken in at T_L
    const W = R * (TH - TL) * Math.log(2) // net work in of the reversed Carnot cycle
    const wide = solved(spec({ hot: 320, cold: 250 }))
    expect(wide.totals.exergyEfficiency!).toBeCloseTo((qL * (320 / 250 - 1)) / W, 12)
    // with T0 at the warm reservoir the two definitions agree
    expect(wide.totals.exergyEfficiency!).toBeCloseTo(wide.totals.secondLawEfficiency!, 12)
  })
})

describe('warnings', () => {
  test('heat from a boundary colder than the gas: negative-entropy-generation on the step and the cycle, not fatal', () => {
    const s = carnot(600, 300, 2, {}, 500, 300)
    const q = R * 600 * Math.log(2)
    expect(s.steps[0]!.entropyGenerated!).toBeCloseTo(q / 600 - q / 500, 9)
    const codes = s.warnings.map((w) => [w.code, w.step])
    expect(codes).toContainEqual(['negative-entropy-generation', 1])
    expect(codes).toContainEqual(['negative-entropy-generation', undefined])
    expect(s.warnings[0]!.message).toMatch(/500 K/)
    expect(s.warnings[0]!.message).toMatch(/colder/)
  })

  // Regenerative Brayton (constant cp), cold side 2→3, hot side 5→6, both isobaric.
  function regenerative(rp: number, T4: number, eps: number) {
    return solved({
      gas: gas(),
      system: 'flow',
      purpose: 'engine',
      states: [{ p: 1e5, T: 300 }, {}, {}, { T: T4 }, {}, {}],
      steps: [
        { process: 'isentropic', pressureRatio: rp },
        { process: 'regenerator', partner: 4, effectiveness: eps, label: 'regenerator (cold side)' },
        { process: 'isobaric' },
        { process: 'isentropic' },
        { process: 'regenerator', partner: 1, label: 'regenerator (hot side)' },
        { process: 'isobaric' },
      ],
    })
  }

  test('a regenerator with ε = 0.8: s_gen of the exchanger = cp ln(T3/T2) + cp ln(T6/T5), on both steps', () => {
    const rp = 6
    const T4 = 1200
    const x = rp ** ((g - 1) / g)
    const T2 = 300 * x
    const T5 = T4 / x
    const T3 = T2 + 0.8 * (T5 - T2) // effectiveness, equal capacities (same cp on both sides)
    const T6 = T5 - (T3 - T2)
    const s = regenerative(rp, T4, 0.8)
    const sgen = cp * Math.log(T3 / T2) + cp * Math.log(T6 / T5)
    expect(sgen).toBeGreaterThan(0)
    expect(s.steps[1]!.entropyGenerated!).toBeCloseTo(sgen, 9)
    expect(s.steps[4]!.entropyGenerated!).toBeCloseTo(sgen, 9)
    expect(s.steps[1]!.partnerStep).toBe(5)
    expect(s.warnings).toEqual([])
  })

  test('a regenerator whose compressed air leaves the compressor hotter than the turbine exhaust: regenerator-wrong-way', () => {
    // rp = 30, T4 = 1000 K: T2 = 300·30^(2/7) ≈ 792 K > T5 = 1000/30^(2/7) ≈ 379 K
    const s = regenerative(30, 1000, 1)
    expect(s.steps[1]!.q).toBeLessThan(0)
    const w = s.warnings.find((x) => x.code === 'regenerator-wrong-way')
    expect(w?.step).toBe(2)
    expect(w?.message).toMatch(/cools it/)
  })
})

describe('spec files: dead state, boundary temperatures, flow rate', () => {
  const base = {
    gas: 'air',
    system: 'flow',
    purpose: 'engine',
    states: [{ p: '100 kPa', T: '300 K' }, {}, { T: '1300 K' }, {}],
    steps: [
      { process: 'isentropic', pressureRatio: 8 },
      { process: 'isobaric', boundaryTemperature: '1500 K' },
      { process: 'isentropic' },
      { process: 'isobaric', boundaryTemperature: '25 °C' },
    ],
  }
  test('powers are the closed-form specific values times the flow rate (W), exergy destroyed in W', () => {
    const r = solveSpec({ cycle: { ...base, flowRate: '2 kg/s', deadState: { T: '300 K', p: '1 bar' } } })
    if (!r.ok) throw new Error(r.error.message)
    // air preset: cp = 1005 J/(kg K), γ = 1005/718 (Çengel & Boles Table A-2, from memory)
    const ga = 1005 / 718
    const x = 8 ** ((ga - 1) / ga)
    const qin = 1005 * (1300 - 300 * x)
    const qout = 1005 * (1300 / x - 300)
    expect(readQuantity(r, 'totals.rate.netPower')).toBeCloseTo(2 * (qin - qout), 3)
    expect(readQuantity(r, 'steps.2.rate.heat')).toBeCloseTo(2 * qin, 3)
    const sgen = qout / 298.15 - qin / 1500
    expect(readQuantity(r, 'totals.entropyGenerated')).toBeCloseTo(sgen, 9)
    expect(readQuantity(r, 'totals.rate.exergyDestroyed')).toBeCloseTo(2 * 300 * sgen, 3)
    expect(readQuantity(r, 'steps.4.boundaryTemperature')).toBeCloseTo(298.15, 12)
    expect('warnings' in r ? r.warnings : null).toEqual([])
    // the formatted output carries the warnings: heat from a boundary at 900 K into gas heated from
    // about 543 K to 1300 K. Over the whole step s_gen = cp ln(1300/T2) − q/900 > 0 (the mean
    // temperature of the heating, q/Δs ≈ 867 K, is below 900 K), yet above 900 K the heat would flow
    // from the colder boundary into the hotter gas: heat-against-temperature.
    const cold = solveSpec({
      cycle: {
        ...base,
        steps: [base.steps[0], { process: 'isobaric', boundaryTemperature: '900 K' }, ...base.steps.slice(2)],
      },
    })
    if (!cold.ok) throw new Error(cold.error.message)
    const warned = 'warnings' in cold ? cold.warnings : []
    const T2 = 300 * x
    expect(1005 * Math.log(1300 / T2) - (1005 * (1300 - T2)) / 900).toBeGreaterThan(0)
    expect(readQuantity(cold, 'steps.2.entropyGenerated')).toBeCloseTo(
      1005 * Math.log(1300 / T2) - (1005 * (1300 - T2)) / 900,
      9,
    )
    expect(warned.map((w) => [w.code, w.step])).toEqual([['heat-against-temperature', 2]])
  })
  test('bad inputs give clear errors, never a throw', () => {
    const closed = solveSpec({ cycle: { ...base, system: 'closed', flowRate: '2 kg/s' } })
    expect(closed.ok).toBe(false)
    if (!closed.ok) expect(closed.error.message).toMatch(/flow/)
    const noP = solveSpec({ cycle: { ...base, deadState: { T: '300 K' } } })
    expect(noP.ok).toBe(false)
    if (!noP.ok) expect(noP.error.property).toBe('deadState')
    const wrongDim = solveSpec({
      cycle: {
        ...base,
        steps: [base.steps[0], { process: 'isobaric', boundaryTemperature: '5 kPa' }, ...base.steps.slice(2)],
      },
    })
    expect(wrongDim.ok).toBe(false)
    if (!wrongDim.ok) expect(wrongDim.error.code).toBe('wrong-dimension')
    const regen = solveCycle({
      gas: gas(),
      states: [{ p: 1e5, T: 300 }, { T: 400 }],
      steps: [
        { process: 'regenerator', partner: 1, boundaryTemperature: 500 },
        { process: 'regenerator', partner: 0 },
      ],
    })
    expect(regen.ok).toBe(false)
    if (!regen.ok) expect(regen.error.property).toBe('boundaryTemperature')
  })
})
