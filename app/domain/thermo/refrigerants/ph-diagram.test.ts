import { describe, expect, test } from 'vitest'
import { REFRIGERANT_IDS, getRefrigerant } from './index.ts'
import { solveCascade, solveTwoStage } from './multi-stage.ts'
import {
  CASCADE_UPPER_PATH,
  SINGLE_STAGE_PATH,
  TWO_STAGE_PATH,
  phDiagram,
  saturationDomePH,
  type PhDome,
  type PhPoint,
} from './ph-diagram.ts'
import { solveVapourCompression } from './vapour-compression.ts'

/** a branch's h at pressure p, linear in log p between neighbouring points */
function branchH(branch: readonly PhPoint[], p: number): number {
  const lp = Math.log10(p)
  for (let i = 1; i < branch.length; i++) {
    const a = branch[i - 1]!
    const b = branch[i]!
    if (lp >= a.log10p && lp <= b.log10p) return a.h + ((b.h - a.h) * (lp - a.log10p)) / (b.log10p - a.log10p)
  }
  return Number.NaN
}

// Critical constants are the equations of state's own (each fluid's paper, see
// docs/refrigerants.md); the dome must close there: both branches end at one point, (pc, hc).
describe('the saturation dome closes at the critical point', () => {
  test.each(REFRIGERANT_IDS)('%s', (id) => {
    const f = getRefrigerant(id)
    const r = saturationDomePH(f, { Tmin: Math.max(f.Ttriple, f.Tc - 120) })
    if (!r.ok) throw new Error(r.error.message)
    const d: PhDome = r.value
    const lastL = d.liquid.at(-1)!
    const lastV = d.vapour.at(-1)!
    expect(lastL).toEqual(lastV)
    expect(lastL.T).toBe(f.Tc)
    // the EOS's pressure at (Tc, ρc) is its critical pressure, to 1e-3 (the fits are not exact there)
    expect(Math.abs(d.critical.p - f.pc) / f.pc).toBeLessThan(1e-3)
    // approaching the top, the branches close in from either side of h_c; 0.01 K below Tc the
    // gap h_g − h_f is still a few % of its value 120 K lower: it vanishes as (1 − T/Tc)^β with
    // β ≈ 1/3 (the critical exponent of fluids, textbook physics), (0.01/120)^(1/3) ≈ 0.04
    const [l2, v2] = [d.liquid.at(-2)!, d.vapour.at(-2)!]
    expect(l2.h).toBeLessThan(d.critical.h)
    expect(v2.h).toBeGreaterThan(d.critical.h)
    expect((v2.h - l2.h) / (d.vapour[0]!.h - d.liquid[0]!.h)).toBeLessThan(0.1)
    // pressure rises along both branches; the liquid is always left of the vapour
    for (let i = 1; i < d.liquid.length; i++) {
      expect(d.liquid[i]!.p).toBeGreaterThan(d.liquid[i - 1]!.p)
      expect(d.liquid[i - 1]!.h).toBeLessThan(d.vapour[i - 1]!.h)
    }
  })
})

describe('a cycle on its chart', () => {
  const r134a = getRefrigerant('R134a')
  test('single stage: saturated states on the dome, the valve exit inside it, the compressor exit right of it', () => {
    const c = solveVapourCompression({
      refrigerant: r134a,
      purpose: 'refrigerator',
      evaporator: { p: 0.14e6 },
      condenser: { p: 0.8e6 },
    })
    if (!c.ok) throw new Error(c.error.message)
    const r = phDiagram(r134a, c.value.states, SINGLE_STAGE_PATH, { points: 120 })
    if (!r.ok) throw new Error(r.error.message)
    const d = r.value
    const span = d.axes.h.max - d.axes.h.min
    for (const s of d.states) {
      if (s.onDome === 'liquid') expect(Math.abs(branchH(d.dome.liquid, s.p) - s.h) / span).toBeLessThan(2e-3)
      if (s.onDome === 'vapour') expect(Math.abs(branchH(d.dome.vapour, s.p) - s.h) / span).toBeLessThan(2e-3)
    }
    const st = (n: string) => d.states.find((s) => s.name === n)!
    expect(st('1').onDome).toBe('vapour')
    expect(st('3').onDome).toBe('liquid')
    expect(st('4').onDome).toBe('mixture')
    expect(st('4').h).toBeGreaterThan(branchH(d.dome.liquid, st('4').p))
    expect(st('4').h).toBeLessThan(branchH(d.dome.vapour, st('4').p))
    expect(st('2').onDome).toBeNull()
    expect(st('2').h).toBeGreaterThan(branchH(d.dome.vapour, st('2').p))
    // the valve is vertical on a p–h chart, the condenser horizontal
    const seg = (a: string, b: string) => d.segments.find((s) => s.from === a && s.to === b)!
    expect(seg('3', '4').points[0].h).toBeCloseTo(seg('3', '4').points[1].h, 6)
    expect(seg('2', '3').points[0].p).toBeCloseTo(seg('2', '3').points[1].p, 3)
    // the log-p ticks cover the evaporator and condenser pressures
    expect(d.axes.pTicks).toEqual(expect.arrayContaining([2e5, 5e5, 1e6]))
    expect(d.axes.pTicks.every((p) => p >= d.axes.p.min && p <= d.axes.p.max)).toBe(true)
  })

  test('two-stage: every saturated state (1, 5, 7, 9) lies on the dome; the path has the flash split and the mixing', () => {
    const t = solveTwoStage({ refrigerant: r134a, evaporator: { T: 243.15 }, condenser: { T: 313.15 } })
    if (!t.ok) throw new Error(t.error.message)
    const r = phDiagram(r134a, t.value.states, TWO_STAGE_PATH, { points: 120 })
    if (!r.ok) throw new Error(r.error.message)
    const d = r.value
    const span = d.axes.h.max - d.axes.h.min
    const saturated = d.states.filter((s) => s.onDome === 'liquid' || s.onDome === 'vapour').map((s) => s.name)
    expect(saturated.sort()).toEqual(['1', '5', '7', '9'])
    for (const s of d.states) {
      if (s.onDome === 'liquid') expect(Math.abs(branchH(d.dome.liquid, s.p) - s.h) / span).toBeLessThan(2e-3)
      if (s.onDome === 'vapour') expect(Math.abs(branchH(d.dome.vapour, s.p) - s.h) / span).toBeLessThan(2e-3)
    }
    expect(d.segments).toHaveLength(TWO_STAGE_PATH.length)
  })

  test('cascade upper cycle (ammonia): its own chart, states 5–8', () => {
    const c = solveCascade({
      lowerRefrigerant: getRefrigerant('R744'),
      upperRefrigerant: getRefrigerant('R717'),
      evaporator: { T: 228.15 },
      lowerCondenser: { T: 268.15 },
      upperEvaporator: { T: 263.15 },
      condenser: { T: 308.15 },
    })
    if (!c.ok) throw new Error(c.error.message)
    const upper = c.value.states.filter((s) => s.cycle === 'upper')
    const r = phDiagram(getRefrigerant('R717'), upper, CASCADE_UPPER_PATH)
    expect(r.ok && r.value.refrigerant).toBe('R717')
  })

  test('bad input is a message, not a throw', () => {
    expect(phDiagram(r134a, []).ok).toBe(false)
    const c = solveVapourCompression({
      refrigerant: r134a,
      purpose: 'refrigerator',
      evaporator: { T: 263.15 },
      condenser: { T: 313.15 },
    })
    if (!c.ok) throw new Error(c.error.message)
    const r = phDiagram(r134a, c.value.states, [['1', '7']])
    expect(r.ok).toBe(false)
    expect(saturationDomePH(r134a, { Tmin: 100 }).ok).toBe(false)
    expect(saturationDomePH(r134a, { points: 1 }).ok).toBe(false)
  })
})
