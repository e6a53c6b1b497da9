import { describe, expect, test } from 'vitest'
import { R_MOLAR } from './constants.ts'
import { solveCycle } from './cycle.ts'
import type { CycleSolution, CycleSpec } from './cycle.ts'
import { constantCpGas } from './substances/constant-cp.ts'
import { gasPreset } from './substances/presets.ts'
import type { Gas } from './substances/gas.ts'
import { templates } from './templates/index.ts'
import type { TemplateValues } from './templates/index.ts'
import { mulberry32, uniform } from './test-helpers.ts'

function gasK(gamma: number, basis: 'mass' | 'mole' = 'mass', R = 287): Gas {
  const r = constantCpGas({ basis, R, gamma })
  if (!r.ok) throw new Error(r.error.message)
  return r.gas
}
function preset(id: string, basis?: 'mass' | 'mole'): Gas {
  const r = gasPreset(id, basis)
  if (!r.ok) throw new Error(r.error.message)
  return r.gas
}
function solved(spec: CycleSpec): CycleSolution {
  const r = solveCycle(spec)
  if (!r.ok) throw new Error(r.error.message)
  return r
}
function build(
  id: string,
  gas: Gas,
  num: Record<string, number | undefined>,
  heat: TemplateValues['heat'] = {},
  amount?: number,
): CycleSolution {
  const b = templates[id]!.build({ gas, num, heat, labels: {}, amount })
  if (!b.ok) throw new Error(b.error.message)
  return solved(b.spec)
}

describe('closed-form efficiencies (cold-air-standard)', () => {
  test.each([
    [8, 1.4],
    [10, 1.4],
    [12, 5 / 3],
    [6.5, 1.3],
  ])('Otto r = %d, γ = %d: η = 1 − r^(1−γ) (closed form)', (r, g) => {
    const s = build('otto', gasK(g), { p1: 1e5, T1: 300, compressionRatio: r, T3: 1800 })
    expect(s.totals.efficiency!).toBeCloseTo(1 - Math.pow(r, 1 - g), 12)
  })
  test.each([
    [18, 2, 1.4],
    [16, 1.5, 1.35],
  ])('Diesel r = %d, rc = %d: η = 1 − r^(1−γ)(rc^γ − 1)/(γ(rc − 1)) (closed form)', (r, rc, g) => {
    const s = build('diesel', gasK(g), { p1: 1e5, T1: 300, compressionRatio: r, cutoffRatio: rc })
    const eta = 1 - (Math.pow(r, 1 - g) * (Math.pow(rc, g) - 1)) / (g * (rc - 1))
    expect(s.totals.efficiency!).toBeCloseTo(eta, 12)
  })
  test.each([
    [14, 1.5, 1.6, 1.4],
    [16, 1.2, 1.3, 1.4],
  ])(
    'dual r = %d, rp = %d, rc = %d: η = 1 − (rp·rc^γ − 1)/(r^(γ−1)[(rp − 1) + γ·rp(rc − 1)]) (closed form)',
    (r, rp, rc, g) => {
      const s = build('dual', gasK(g), { p1: 1e5, T1: 300, compressionRatio: r, pressureRatio: rp, cutoffRatio: rc })
      const eta = 1 - (rp * Math.pow(rc, g) - 1) / (Math.pow(r, g - 1) * (rp - 1 + g * rp * (rc - 1)))
      expect(s.totals.efficiency!).toBeCloseTo(eta, 12)
    },
  )
  test.each([
    [8, 1.4],
    [15, 1.4],
  ])('Brayton rp = %d: η = 1 − rp^((1−γ)/γ) (closed form)', (rp, g) => {
    const s = build('brayton', gasK(g), { p1: 1e5, T1: 300, pressureRatio: rp, turbineInletT: 1400 })
    expect(s.totals.efficiency!).toBeCloseTo(1 - Math.pow(rp, (1 - g) / g), 12)
  })
  test('Brayton, ideal regenerator: η = 1 − (T1/T3)·rp^((γ−1)/γ) (closed form, cold-air standard)', () => {
    const s = build('brayton-regenerative', gasK(1.4), { p1: 1e5, T1: 300, pressureRatio: 5, turbineInletT: 1200 })
    expect(s.totals.efficiency!).toBeCloseTo(1 - (300 / 1200) * Math.pow(5, 0.4 / 1.4), 12)
  })
  test('Carnot engine η = 1 − Tc/Th; refrigerator COP = Tc/(Th − Tc); heat pump COP = Th/(Th − Tc) (closed forms)', () => {
    const g = preset('monatomic')
    const e = build('carnot-engine', g, { Th: 800, Tc: 300, p1: 1e6, expansionRatio: 3 })
    expect(e.totals.efficiency!).toBeCloseTo(1 - 300 / 800, 12)
    const r = build('carnot-refrigerator', g, { Th: 300, Tc: 250, p1: 1e5, expansionRatio: 2 })
    expect(r.totals.copRefrigerator!).toBeCloseTo(250 / 50, 10)
    const h = build('carnot-heat-pump', g, { Th: 300, Tc: 250, p1: 1e5, expansionRatio: 2 })
    expect(h.totals.copHeatPump!).toBeCloseTo(300 / 50, 10)
  })
  test('Stirling and Ericsson with ideal regenerators reach the Carnot efficiency 1 − Tc/Th (closed form)', () => {
    expect(
      build('stirling', preset('monatomic'), { Th: 900, Tc: 300, p1: 1e5, compressionRatio: 4 }).totals.efficiency!,
    ).toBeCloseTo(2 / 3, 12)
    expect(
      build('ericsson', preset('air'), { Th: 1000, Tc: 300, p1: 1e5, pressureRatio: 5 }).totals.efficiency!,
    ).toBeCloseTo(0.7, 12)
  })
  test('Otto mean effective pressure = w_net/(v1 − v2) (definition)', () => {
    const s = build('otto', gasK(1.4), { p1: 1e5, T1: 300, compressionRatio: 8, T3: 1800 })
    expect(s.totals.mep!).toBeCloseTo(-s.totals.wNet / (s.states[0]!.v - s.states[1]!.v), 6)
  })
})

test('T·V^(γ−1) is constant on a reversible adiabat (closed form), for the isentropic and the n = γ polytropic step', () => {
  const g = gasK(1.4)
  for (const step of [{ process: 'isentropic' as const }, { process: 'polytropic' as const, n: 1.4 }]) {
    const s = solved({
      gas: g,
      states: [{ p: 1e5, T: 300 }, { v: 0.1 }, { T: 300 }],
      steps: [step, { process: 'isobaric' }, { process: 'isothermal' }],
    })
    const [a, b] = s.states
    expect(b!.T * Math.pow(b!.v, 0.4)).toBeCloseTo(a!.T * Math.pow(a!.v, 0.4), 9)
    expect(s.steps[0]!.q).toBe(0) // n = γ handled exactly, not as Δu + w ≈ 0
  }
})

test('polytropic n = 1 is exactly isothermal: w = −R T ln(v2/v1) (closed form)', () => {
  const g = gasK(1.4)
  const s = solved({
    gas: g,
    states: [{ p: 1e5, T: 300 }, { v: 0.2 }, {}],
    steps: [{ process: 'polytropic', n: 1 }, { process: 'isochoric' }, { process: 'isobaric' }],
  })
  expect(s.states[1]!.T).toBe(300)
  expect(s.steps[0]!.w).toBeCloseTo(-287 * 300 * Math.log(0.2 / 0.861), 9)
  // n very close to 1 tends to the same value (no division by ~0)
  const near = solved({
    gas: g,
    states: [{ p: 1e5, T: 300 }, { v: 0.2 }, {}],
    steps: [{ process: 'polytropic', n: 1 + 1e-12 }, { process: 'isochoric' }, { process: 'isobaric' }],
  })
  expect(near.steps[0]!.w).toBeCloseTo(s.steps[0]!.w, 3)
})

describe('Carnot cycle of n mol of a monatomic ideal gas', () => {
  // Closed forms for the ideal-gas Carnot cycle (any textbook, e.g. Atkins' Physical Chemistry, ch. 3; common practice).
  const n = 2
  const Th = 500
  const Tc = 300
  const r = 3
  const s = build('carnot-engine', preset('monatomic'), { Th, Tc, p1: 5e5, expansionRatio: r }, {}, n)
  const [s1, s2, s3, s4] = s.states
  const [i12, a23, i34, a41] = s.steps
  test('ΔU of each isotherm is 0', () => {
    expect(i12!.du).toBeCloseTo(0, 9)
    expect(i34!.du).toBeCloseTo(0, 9)
  })
  test('the two adiabats have equal and opposite ΔU', () => {
    expect(a23!.du).toBeCloseTo(-a41!.du, 9)
    expect(a23!.du).toBeCloseTo(1.5 * R_MOLAR * (Tc - Th), 9)
  })
  test('ΔU of the cycle is 0', () => expect(s.totals.duCycle).toBeCloseTo(0, 9))
  test('V3/V2 = V4/V1', () => expect(s3!.v / s2!.v).toBeCloseTo(s4!.v / s1!.v, 12))
  test('q_cycle = nR(Th − Tc) ln(V2/V1) > 0 and w_cycle = −q_cycle (chemistry convention)', () => {
    const qCycle = n * s.steps.reduce((acc, x) => acc + x.q, 0)
    expect(qCycle).toBeCloseTo(n * R_MOLAR * (Th - Tc) * Math.log(r), 8)
    expect(qCycle).toBeGreaterThan(0)
    expect(n * s.totals.wNet).toBeCloseTo(-qCycle, 8)
  })
})

describe('worked textbook examples', () => {
  // Çengel & Boles, Thermodynamics: An Engineering Approach (7th ed.), ch. 9, "ideal Otto cycle"
  // example: r = 8, 100 kPa, 17 °C, 800 kJ/kg added; with variable specific heats (air tables)
  // T3 ≈ 1575 K, p3 ≈ 4.345 MPa, w_net ≈ 418 kJ/kg, η ≈ 52.3 %, MEP ≈ 574 kPa; cold-air standard
  // η = 56.5 %. From memory (example number not recalled). Our variable-cp model is NASA dry air,
  // the book's is its air table, so 1–2 % agreement is what to expect.
  test('Otto, variable specific heats (NASA dry air) and cold-air standard', () => {
    const air = preset('nasa:dry-air', 'mass')
    const s = build('otto', air, { p1: 100e3, T1: 290.15, compressionRatio: 8 }, { heatIn: { heat: 800e3 } })
    expect(s.states[2]!.T).toBeGreaterThan(1575 * 0.98)
    expect(s.states[2]!.T).toBeLessThan(1575 * 1.02)
    expect(Math.abs(-s.totals.wNet / 418e3 - 1)).toBeLessThan(0.02)
    expect(Math.abs(s.totals.efficiency! / 0.523 - 1)).toBeLessThan(0.02)
    expect(Math.abs(s.totals.mep! / 574e3 - 1)).toBeLessThan(0.02)
    const cold = build('otto', gasK(1.4), { p1: 100e3, T1: 290.15, compressionRatio: 8 }, { heatIn: { heat: 800e3 } })
    expect(cold.totals.efficiency!).toBeCloseTo(0.565, 3)
  })
  // Çengel & Boles (7th ed.), ch. 9, simple ideal Brayton cycle: rp = 8, 300 K, 1300 K turbine
  // inlet, variable specific heats: T2 ≈ 540 K, T4 ≈ 770 K, back-work ratio ≈ 0.403, η ≈ 42.6 %;
  // with ηc = 0.80 and ηt = 0.85: back-work ratio ≈ 0.592, η ≈ 26.6 %, T4a ≈ 853 K. From memory.
  test('Brayton, ideal and with component efficiencies (NASA dry air)', () => {
    const air = preset('nasa:dry-air', 'mass')
    const s = build('brayton', air, { p1: 100e3, T1: 300, pressureRatio: 8, turbineInletT: 1300 })
    expect(Math.abs(s.states[1]!.T / 540 - 1)).toBeLessThan(0.01)
    expect(Math.abs(s.states[3]!.T / 770 - 1)).toBeLessThan(0.01)
    expect(Math.abs(s.totals.backWorkRatio! / 0.403 - 1)).toBeLessThan(0.02)
    expect(Math.abs(s.totals.efficiency! / 0.426 - 1)).toBeLessThan(0.02)
    const a = build('brayton', air, {
      p1: 100e3,
      T1: 300,
      pressureRatio: 8,
      turbineInletT: 1300,
      compressorEfficiency: 0.8,
      turbineEfficiency: 0.85,
    })
    expect(Math.abs(a.totals.backWorkRatio! / 0.592 - 1)).toBeLessThan(0.02)
    expect(Math.abs(a.totals.efficiency! / 0.266 - 1)).toBeLessThan(0.03)
    expect(Math.abs(a.states[3]!.T / 853 - 1)).toBeLessThan(0.01)
  })
  // Isothermal expansion of 1 mol ideal gas at 298.15 K doubling its volume: w = −RT ln 2 =
  // −1718.5 J (hand-derived closed form).
  test('isothermal doubling: w = −RT ln 2', () => {
    const s = solved({
      gas: preset('monatomic'),
      states: [{ p: 1e5, T: 298.15 }, { p: 0.5e5 }, {}],
      steps: [{ process: 'isothermal' }, { process: 'isochoric' }, { process: 'isobaric' }],
    })
    expect(s.steps[0]!.w).toBeCloseTo(-R_MOLAR * 298.15 * Math.LN2, 9)
    expect(s.steps[0]!.w).toBeCloseTo(-1718.5, 0)
  })
})

describe('errors name the state and property', () => {
  const g = gasK(1.4)
  test('underdetermined', () => {
    const r = solveCycle({
      gas: g,
      states: [{ p: 1e5, T: 300 }, {}, {}, {}],
      steps: [
        { process: 'isentropic', volumeRatio: 1 / 8 },
        { process: 'isochoric' },
        { process: 'isentropic' },
        { process: 'isochoric' },
      ],
    })
    expect(r.ok).toBe(false)
    if (r.ok) return
    expect(r.error.code).toBe('underdetermined')
    expect(r.error.state).toBe(3)
    expect(r.error.message).toMatch(/^State 3: temperature is not fixed .*give p3 or T3/)
  })
  test('conflicting givens', () => {
    const r = solveCycle({
      gas: g,
      states: [{ p: 1e5, T: 300 }, { p: 4.2e5, T: 900 }, {}],
      steps: [{ process: 'isochoric' }, { process: 'isobaric' }, { process: 'isothermal' }],
      labels: { p2: '4.2 bar' },
    })
    expect(r.ok).toBe(false)
    if (r.ok) return
    expect(r.error.code).toBe('conflict')
    expect(r.error.message).toBe('State 2: p given as 4.2 bar but the isochoric step 1→2 requires 300 kPa')
  })
  test('bad step data and the ideal-gas law', () => {
    expect(
      solveCycle({
        gas: g,
        states: [{ p: 1e5, T: 300, v: 1 }, { T: 400 }],
        steps: [{ process: 'isobaric' }, { process: 'isobaric' }],
      }).ok,
    ).toBe(false)
    const r = solveCycle({
      gas: g,
      states: [{ p: 1e5, T: 300 }, {}],
      steps: [{ process: 'polytropic' }, { process: 'isobaric' }],
    })
    expect(!r.ok && r.error.property).toBe('n')
    const amountless = solveCycle({
      gas: g,
      states: [{ p: 1e5, T: 300 }, { p: 2e5 }, { p: 2e5, T: 300 }],
      steps: [{ process: 'isentropic' }, { process: 'isobaric', heatTotal: 100 }, { process: 'isothermal' }],
    })
    expect(!amountless.ok && amountless.error.property).toBe('amount')
  })
  test('Otto with T3 below T2 is unphysical', () => {
    const b = templates.otto!.build({
      gas: g,
      num: { p1: 1e5, T1: 300, compressionRatio: 10, T3: 500 },
      heat: {},
      labels: {},
    })
    if (!b.ok) throw new Error()
    const r = solveCycle(b.spec)
    expect(!r.ok && r.error.code).toBe('unphysical')
  })
})

describe('property-based: first-law closure and ΔS_cycle = 0 on random valid cycles (seeded)', () => {
  const rand = mulberry32(20260)
  const gases = [
    () => gasK(uniform(rand, 1.15, 1.67)),
    () => preset('nasa:dry-air', 'mass'),
    () => preset('nasa:CO2'),
    () => preset('monatomic'),
  ]
  const cases: [string, () => CycleSolution][] = []
  for (let k = 0; k < 60; k++) {
    const gas = gases[k % gases.length]!()
    const T1 = uniform(rand, 250, 400)
    const p1 = uniform(rand, 5e4, 3e5)
    const pick = k % 6
    cases.push([
      `case ${k}`,
      () => {
        switch (pick) {
          case 0:
            return build('otto', gas, { p1, T1, compressionRatio: uniform(rand, 4, 12), T3: uniform(rand, 1500, 2500) })
          case 1:
            return build('diesel', gas, {
              p1,
              T1,
              compressionRatio: uniform(rand, 12, 22),
              cutoffRatio: uniform(rand, 1.2, 2.5),
            })
          case 2:
            return build('brayton', gas, {
              p1,
              T1,
              pressureRatio: uniform(rand, 4, 20),
              turbineInletT: uniform(rand, 1300, 1700),
              compressorEfficiency: uniform(rand, 0.75, 1),
              turbineEfficiency: uniform(rand, 0.75, 1),
            })
          case 3:
            return build('brayton-regenerative', gas, {
              p1,
              T1,
              pressureRatio: uniform(rand, 3, 6),
              turbineInletT: uniform(rand, 1200, 1500),
              regeneratorEffectiveness: uniform(rand, 0, 1),
            })
          case 4:
            return build('carnot-engine', gas, {
              Th: uniform(rand, 600, 1200),
              Tc: T1,
              p1,
              expansionRatio: uniform(rand, 1.1, 4),
            })
          default:
            return build('stirling', gas, {
              Th: uniform(rand, 600, 1200),
              Tc: T1,
              p1,
              compressionRatio: uniform(rand, 1.5, 5),
            })
        }
      },
    ])
  }
  test.each(cases)('%s', (_name, run) => {
    const s = run()
    const scale = Math.max(...s.states.map((x) => Math.abs(x.h))) + 1e3
    // first law per step: closed Δu = q + w; flow Δh = q + w_s (definition of the conventions)
    for (const st of s.steps)
      expect(Math.abs((s.system === 'flow' ? st.dh : st.du) - st.q - st.w)).toBeLessThan(1e-9 * scale)
    // per cycle: Σq + Σw = 0 and the state functions close
    const sumQ = s.steps.reduce((a, x) => a + x.q, 0)
    expect(Math.abs(sumQ + s.totals.wNet)).toBeLessThan(1e-9 * scale)
    expect(Math.abs(s.totals.duCycle)).toBeLessThan(1e-9 * scale)
    expect(Math.abs(s.totals.dsCycle)).toBeLessThan(1e-9 * scale)
    // second law: no engine beats the Carnot bound between its extreme temperatures
    expect(s.totals.efficiency!).toBeLessThanOrEqual(s.totals.carnotBound + 1e-12)
  })
})

describe('property-based: random general cycles (polytropic → isochoric → isobaric), seeded', () => {
  const rand = mulberry32(777)
  const cases = Array.from({ length: 30 }, (_, k) => {
    const gas = k % 3 === 0 ? preset('nasa:N2') : k % 3 === 1 ? gasK(uniform(rand, 1.2, 1.67)) : preset('diatomic')
    const n = uniform(rand, 0.5, 2.5)
    const rp = uniform(rand, 1.5, 8)
    return [`case ${k} (n = ${n.toFixed(3)})`, gas, n, rp, uniform(rand, 250, 400), uniform(rand, 5e4, 2e5)] as const
  })
  test.each(cases)('%s', (_name, gas, n, rp, T1, p1) => {
    const s = solved({
      gas,
      states: [{ p: p1, T: T1 }, {}, {}],
      steps: [{ process: 'polytropic', n, pressureRatio: rp }, { process: 'isochoric' }, { process: 'isobaric' }],
      amount: 2,
    })
    const [a, b] = s.states
    // polytropic work in closed form: w_by = (p2 v2 − p1 v1)/(1 − n)
    expect(-s.steps[0]!.w).toBeCloseTo((b!.p * b!.v - a!.p * a!.v) / (1 - n), 6)
    const scale = Math.max(...s.states.map((x) => Math.abs(x.h))) + 1e3
    for (const st of s.steps) expect(Math.abs(st.du - st.q - st.w)).toBeLessThan(1e-9 * scale)
    expect(Math.abs(s.steps.reduce((acc, x) => acc + x.q, 0) + s.totals.wNet)).toBeLessThan(1e-9 * scale)
    expect(Math.abs(s.totals.dsCycle)).toBeLessThan(1e-9 * scale)
  })
})
