// Bank problems on the single-stage vapour-compression template: variant keys, senses, the
// worked solution, the diagrams, the sweep and the lint. The cycle's own physics is checked in
// app/domain/thermo/refrigerants/vapour-compression.test.ts; here the authoring layer must give
// back the solver's numbers, in the find's unit and with the sign its sense promises.
import { createElement } from 'react'
import { renderToStaticMarkup } from 'react-dom/server'
import { describe, expect, test } from 'vitest'
import { CycleDiagrams } from '#app/components/cycle-diagrams.tsx'
import { TEMPLATE_CATALOG } from '#app/domain/thermo/catalog.ts'
import { NOT_IN_BANK, solveBankSpec } from '#app/domain/thermo/solve-spec.ts'
import { getRefrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import { solveVapourCompression } from '#app/domain/thermo/refrigerants/vapour-compression.ts'
import type { Convention } from '#app/domain/thermo/conventions.ts'
import type { DrawResult, Find, FindSense, Given, ProblemDefinition, Variant } from './definition.ts'
import { describePlot } from './diagram-plot.ts'
import type { Plot } from './diagram-plot.ts'
import { cycleDiagrams } from './diagrams.ts'
import { lintDefinition } from './lint.ts'
import { quantityAtPath, symbolTex } from './quantities.ts'
import { refrigerantDome } from './refrigeration-diagrams.ts'
import { senseErrors } from './sense.ts'
import { isRefrigerationSolution } from './solution-kind.ts'
import { checkVariantSanity, sweepVariants } from './sweep.ts'
import { drawVariant } from './variant.ts'
import { renderWorkedSolution, shortSource, workedSolution } from './worked-solution.ts'

const r134a = getRefrigerant('R134a')

const find = (name: string, path: string, unit: string, extra: Partial<Find> = {}): Find => ({
  name,
  label: name,
  source: { kind: 'output', path },
  unit,
  points: 1,
  tolerance: { kind: 'relative', value: 0.01 },
  pitfalls: [],
  ...extra,
})
const choice = (name: string, unit: string, values: number[]): Given => ({
  name,
  label: name,
  unit,
  rule: { kind: 'choice', values },
})

function problem(
  givens: Given[],
  inputs: Record<string, string>,
  finds: Find[],
  convention: ProblemDefinition['convention'] = 'course',
): ProblemDefinition {
  return {
    format: 2,
    title: 'vapour-compression test problem',
    tags: { topics: ['refrigeration'], difficulty: 'standard', level: 'second-year' },
    convention,
    prompt: 'A refrigerator.',
    givens,
    constraints: [],
    physics: { kind: 'template', template: 'vapour-compression', inputs },
    finds,
  }
}

function drawn(def: ProblemDefinition, convention: Convention = 'engineering', seed = 1): Variant {
  const r = drawVariant(def, seed, { convention })
  if (!r.ok) throw new Error(r.error.message)
  return r.variant
}

const keyOf = (v: Variant, name: string) => {
  const k = v.key.find((x) => x.name === name)
  if (!k) throw new Error(`no key ${name}`)
  return k
}

// ---- Keys ------------------------------------------------------------------------------

// Çengel & Boles, Thermodynamics: An Engineering Approach, 7th ed., Example 11-1 (from memory,
// as in vapour-compression.test.ts): an ideal R-134a refrigerator between 0.14 and 0.8 MPa at
// 0.05 kg/s has q_L = 143.69 kJ/kg, w = 36.23 kJ/kg, Q_L = 7.18 kW, W = 1.81 kW, COP_R = 3.97.
// Enthalpy differences do not depend on the tables' zero, so they compare within 0.5 %.
describe('keys of the textbook refrigerator (Çengel & Boles 7th ed. Example 11-1, from memory)', () => {
  const def = problem(
    [choice('pL', 'MPa', [0.14]), choice('pH', 'MPa', [0.8]), choice('mdot', 'kg/s', [0.05])],
    { refrigerant: 'R-134a', evaporatorPressure: 'pL', condenserPressure: 'pH', massFlow: 'mdot' },
    [
      find('qL', 'totals.refrigerationEffect', 'kJ/kg'),
      find('w', 'totals.compressorWork', 'kJ/kg'),
      find('cop', 'totals.copRefrigerator', ''),
      find('QL', 'totals.capacity', 'kW'),
      find('Wdot', 'totals.compressorPower', 'kW'),
    ],
  )
  const near = (x: number, book: number) => expect(Math.abs(x - book) / book).toBeLessThan(0.005)
  test.each(['engineering', 'chemistry'] as const)('%s course', (convention) => {
    const v = drawn(def, convention)
    near(keyOf(v, 'qL').value, 143.69)
    near(keyOf(v, 'w').value, 36.23)
    near(keyOf(v, 'cop').value, 3.97)
    near(keyOf(v, 'QL').value, 7.18)
    near(keyOf(v, 'Wdot').value, 1.81)
  })
})

describe('keys are the solver’s numbers in the find’s units', () => {
  // R-134a at −10 °C / 40 °C, 5 K superheat, 3 K subcooling, η_c = 0.8, 3 tons (invented numbers).
  const def = problem(
    [choice('TL', '°C', [-10]), choice('TH', '°C', [40]), choice('etaC', '', [0.8])],
    {
      refrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      condenserTemperature: 'TH',
      superheat: '5 K',
      subcooling: '3 K',
      compressorEfficiency: 'etaC',
      capacity: '3 tons',
    },
    [
      find('T1', 'states.1.T', '°C'),
      find('p1', 'states.1.p', 'kPa'),
      find('h1', 'states.1.h', 'kJ/kg'),
      find('s1', 'states.1.s', 'kJ/(kg K)'),
      find('T2', 'states.2.T', 'K'),
      find('p2', 'states.2.p', 'MPa'),
      find('h3', 'states.3.h', 'kJ/kg'),
      find('x4', 'states.4.x', ''),
      find('qL', 'totals.refrigerationEffect', 'kJ/kg'),
      find('w', 'totals.compressorWork', 'kJ/kg'),
      find('qH', 'totals.heatRejected', 'kJ/kg'),
      find('copR', 'totals.copRefrigerator', ''),
      find('copHP', 'totals.copHeatPump', ''),
      find('mdot', 'totals.massFlow', 'kg/min'),
      find('QL', 'totals.capacity', 'kW'),
      find('Wdot', 'totals.compressorPower', 'kW'),
      find('QH', 'totals.heatRejectionRate', 'kW'),
    ],
  )
  const ref = solveVapourCompression({
    refrigerant: r134a,
    purpose: 'refrigerator',
    evaporator: { T: 263.15 },
    condenser: { T: 313.15 },
    superheat: 5,
    subcooling: 3,
    compressorEfficiency: 0.8,
    capacity: 3 * 3516.853,
  })
  if (!ref.ok) throw new Error(ref.error.message)
  const r = ref.value
  const st = (i: number) => r.states[i - 1]!.state
  const expected: Record<string, number> = {
    T1: st(1).T - 273.15,
    p1: st(1).p / 1e3,
    h1: st(1).h / 1e3,
    s1: st(1).s / 1e3,
    T2: st(2).T,
    p2: st(2).p / 1e6,
    h3: st(3).h / 1e3,
    x4: st(4).x!,
    qL: r.refrigerationEffect / 1e3,
    w: r.compressorWork / 1e3,
    qH: r.heatRejected / 1e3,
    copR: r.copRefrigerator,
    copHP: r.copHeatPump,
    mdot: r.massFlow! * 60,
    QL: r.capacity! / 1e3,
    Wdot: r.compressorPower! / 1e3,
    QH: r.heatRejectionRate! / 1e3,
  }
  test.each(['engineering', 'chemistry'] as const)('%s course', (convention) => {
    const v = drawn(def, convention)
    for (const [name, value] of Object.entries(expected)) expect(keyOf(v, name).value, name).toBeCloseTo(value, 9)
    expect(v.key.some((k) => k.flipped)).toBe(false)
    // The solver's own balance, carried into the keys.
    expect(keyOf(v, 'qH').value).toBeCloseTo(keyOf(v, 'qL').value + keyOf(v, 'w').value, 9)
    expect(keyOf(v, 'QL').value).toBeCloseTo(3 * 3.516853, 9)
  })

  test('a superheated state has no quality: that find cannot be keyed, said plainly', () => {
    const bad = { ...def, finds: [find('x2', 'states.2.x', '')] }
    const res = drawVariant(bad, 1, { convention: 'engineering' })
    expect(res.ok).toBe(false)
    if (!res.ok) expect(res.error.message).toMatch(/no number at "states\.2\.x"/)
  })
})

// ---- Senses -------------------------------------------------------------------------------

describe('senses: compressor work is done ON the refrigerant, condenser heat leaves it', () => {
  const givens = [choice('TL', '°C', [-10]), choice('TH', '°C', [40])]
  const inputs = { refrigerant: 'R134a', evaporatorTemperature: 'TL', condenserTemperature: 'TH' }
  const w = (sense?: FindSense) => find('w', 'devices.1.w', 'kJ/kg', sense ? { sense } : {})
  const cases: [string, Find, 'positive' | 'negative' | 'convention'][] = [
    ['devices.1.w, work done on the system', w('work-on-system'), 'positive'],
    ['devices.1.w, work done by the system', w('work-by-system'), 'negative'],
    ['devices.1.w, no sense: the convention decides', w(), 'convention'],
    [
      'totals.compressorWork, work done on the system',
      find('w', 'totals.compressorWork', 'kJ/kg', { sense: 'work-on-system' }),
      'positive',
    ],
    [
      'totals.compressorWork, work done by the system',
      find('w', 'totals.compressorWork', 'kJ/kg', { sense: 'work-by-system' }),
      'negative',
    ],
    [
      'devices.2.q (condenser), heat out of the system',
      find('w', 'devices.2.q', 'kJ/kg', { sense: 'heat-out-of-system' }),
      'positive',
    ],
    [
      'devices.2.q (condenser), heat into the system',
      find('w', 'devices.2.q', 'kJ/kg', { sense: 'heat-into-system' }),
      'negative',
    ],
    [
      'totals.heatRejected, heat out of the system',
      find('w', 'totals.heatRejected', 'kJ/kg', { sense: 'heat-out-of-system' }),
      'positive',
    ],
    [
      'devices.4.q (evaporator), heat into the system',
      find('w', 'devices.4.q', 'kJ/kg', { sense: 'heat-into-system' }),
      'positive',
    ],
    [
      'totals.refrigerationEffect, heat out of the system',
      find('w', 'totals.refrigerationEffect', 'kJ/kg', { sense: 'heat-out-of-system' }),
      'negative',
    ],
  ]
  test.each(cases)('%s', (_name, f, want) => {
    const def = problem(givens, inputs, [f])
    const eng = keyOf(drawn(def, 'engineering'), 'w').value
    const chem = keyOf(drawn(def, 'chemistry'), 'w').value
    if (want === 'convention') {
      // Engineering: W is done BY the refrigerant, negative for a compressor; chemistry: w ON it.
      expect(eng).toBeLessThan(0)
      expect(chem).toBeGreaterThan(0)
      expect(chem).toBeCloseTo(-eng, 9)
    } else {
      const sign = want === 'positive' ? 1 : -1
      expect(Math.sign(eng)).toBe(sign)
      expect(Math.sign(chem)).toBe(sign)
      expect(chem).toBeCloseTo(eng, 9)
    }
  })

  test('the compressor work input keyed "work done on the system" equals h2 − h1 in both conventions', () => {
    const def = problem(givens, inputs, [
      w('work-on-system'),
      find('h1', 'states.1.h', 'kJ/kg'),
      find('h2', 'states.2.h', 'kJ/kg'),
    ])
    for (const c of ['engineering', 'chemistry'] as const) {
      const v = drawn(def, c)
      expect(keyOf(v, 'w').value).toBeCloseTo(keyOf(v, 'h2').value - keyOf(v, 'h1').value, 9)
    }
  })

  test('a sense on a number that is neither work nor heat is refused', () => {
    const def = problem(givens, inputs, [find('cop', 'totals.copRefrigerator', '', { sense: 'work-on-system' })])
    expect(senseErrors(def).map((e) => e.path)).toEqual(['finds.0.sense'])
  })
})

// ---- Worked solution -------------------------------------------------------------------------

describe('worked solution', () => {
  const def = problem(
    [choice('TL', '°C', [-10]), choice('TH', '°C', [40]), choice('etaC', '', [0.8])],
    {
      refrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      condenserTemperature: 'TH',
      superheat: '5 K',
      compressorEfficiency: 'etaC',
      massFlow: '0.05 kg/s',
    },
    [
      find('qL', 'totals.refrigerationEffect', 'kJ/kg', { label: 'Refrigeration effect per kg' }),
      find('Win', 'devices.1.w', 'kJ/kg', { label: 'Compressor work input per kg', sense: 'work-on-system' }),
      find('cop', 'totals.copRefrigerator', '', { label: 'Coefficient of performance' }),
    ],
  )
  const v = drawn(def, 'engineering')
  const sol = v.solution as FormattedRefrigeration
  const ws = workedSolution(v, def)
  const lines = ws.sections.flatMap((s) => s.lines)
  const lastNumber = (tex: string) => Number((tex.split('=').pop() ?? '').trim().split('\\,')[0])
  const lineStarting = (start: string) => {
    const l = lines.find((x) => x.tex.startsWith(start))
    if (!l) throw new Error(`no line starting ${start}`)
    return l
  }

  test('sections: givens, convention, refrigerant, states, devices, convention signs, performance, answers', () => {
    expect(ws.sections.map((s) => s.title)).toEqual([
      'Given',
      'Sign convention',
      'Refrigerant',
      'States (R-134a)',
      'Devices (per kg of refrigerant)',
      'In the course convention',
      'Performance',
      'Answers',
    ])
    expect(ws.caution).toMatch(/not design data/)
  })

  test('the refrigerant and the source of its properties, short', () => {
    const notes = ws.sections
      .find((s) => s.title === 'Refrigerant')!
      .lines.map((l) => l.note)
      .join(' ')
    expect(notes).toContain('R-134a')
    expect(notes).toContain('Tillner-Roth and Baehr (1994)')
    expect(notes).not.toContain('J. Phys')
  })

  test('throttling keeps h: h4 = h3, and the quality after the valve from h_f and h_fg', () => {
    expect(lastNumber(lineStarting('h_{4} = h_{3}').tex)).toBeCloseTo(
      Number((sol.states[2]!.h.value / 1000).toPrecision(4)),
      9,
    )
    expect(lastNumber(lineStarting('x_{4} = \\frac').tex)).toBeCloseTo(Number(sol.states[3]!.x!.toPrecision(4)), 9)
  })

  test('the compressor exit from its efficiency: h2 = h1 + (h2s − h1)/η_c', () => {
    const l = lineStarting('h_{2} = h_{1} + \\frac{h_{2s} - h_{1}}{\\eta_c}')
    expect(l.tex).toContain('{0.8000}')
    expect(lastNumber(l.tex)).toBeCloseTo(Number((sol.states[1]!.h.value / 1000).toPrecision(4)), 9)
    // h2s is the isentropic state at the condenser pressure: (h2 − h1) η_c = h2s − h1.
    const h2s = r134a.statePS(sol.states[1]!.p.value, sol.states[0]!.s.value)
    if (!h2s.ok) throw new Error(h2s.error.message)
    expect((sol.states[1]!.h.value - sol.states[0]!.h.value) * 0.8).toBeCloseTo(h2s.value.h - sol.states[0]!.h.value, 3)
  })

  test('q_L = h1 − h4, W = h2 − h1, Q_H = h2 − h3 and the COP are the solver’s totals', () => {
    const t = sol.totals
    const p4 = (x: number) => Number(x.toPrecision(4))
    expect(lastNumber(lineStarting('Q_{L} = h_{1} - h_{4}').tex)).toBe(p4(t.refrigerationEffect.value / 1000))
    expect(lastNumber(lineStarting('W_{\\text{c,in}} = h_{2} - h_{1}').tex)).toBe(p4(t.compressorWork.value / 1000))
    expect(lastNumber(lineStarting('Q_{H} = h_{2} - h_{3}').tex)).toBe(p4(t.heatRejected.value / 1000))
    expect(lastNumber(lineStarting('\\mathrm{COP}_R =').tex)).toBe(p4(t.copRefrigerator.value))
    expect(lastNumber(lineStarting('\\mathrm{COP}_{R,\\text{Carnot}}').tex)).toBe(p4(t.carnotCop.value))
    expect(lastNumber(lineStarting('\\dot W_{\\text{c,in}}').tex)).toBe(p4(t.compressorPower!.value / 1000))
  })

  test('chemistry symbols are lower case; the compressor’s w is positive there', () => {
    const chem = workedSolution(drawn(def, 'chemistry'), def)
    const all = chem.sections.flatMap((s) => s.lines).map((l) => l.tex)
    expect(all.some((t) => t.startsWith('q_{L} = h_{1} - h_{4}'))).toBe(true)
    expect(all.some((t) => t.startsWith('w_{\\text{c,in}} = h_{2} - h_{1}'))).toBe(true)
    const compressor = all.find((t) => t.startsWith('\\text{compressor}'))!
    expect(compressor).toMatch(/w = [0-9]/)
  })

  test('rendered, it names no internal path and typesets every symbol', () => {
    const html = renderWorkedSolution(ws)
    expect(html).not.toContain('math-error')
    for (const f of def.finds) if (f.source.kind === 'output') expect(html).not.toContain(f.source.path)
    expect(html).not.toMatch(/totals\.|devices\.|states\./)
  })

  test.each([
    [
      'a heat pump on R-1234yf with subcooling and a capacity',
      {
        refrigerant: 'R1234yf',
        purpose: 'heat pump',
        evaporatorTemperature: '-5 °C',
        condenserTemperature: '45 °C',
        subcooling: '4 K',
        capacity: '5 kW',
      },
      /\\mathrm\{COP\}_\{HP,\\text\{Carnot\}\}/,
    ],
    [
      'a transcritical R-744 heat pump',
      {
        refrigerant: 'R744',
        purpose: 'heat pump',
        evaporatorTemperature: '-5 °C',
        gasCoolerPressure: '10 MPa',
        gasCoolerExitTemperature: '35 °C',
        compressorEfficiency: '0.8',
      },
      /gas cooler/,
    ],
    ['ammonia', { refrigerant: 'R717', evaporatorTemperature: '-20 °C', condenserTemperature: '30 °C' }, /R-717/],
  ])('%s renders without TeX errors', (_name, inputs, pattern) => {
    const d = problem([], inputs, [find('cop', 'totals.copHeatPump', '')])
    const variant = drawn(d)
    const html = renderWorkedSolution(workedSolution(variant, d))
    expect(html).not.toContain('math-error')
    expect(html).toMatch(pattern)
  })

  test('shortSource keeps the authors and year', () => {
    expect(shortSource('R. Span and W. Wagner, J. Phys. Chem. Ref. Data 25 (1996) 1509')).toBe('Span and Wagner (1996)')
    expect(shortSource('M. Richter, M. O. McLinden and E. W. Lemmon, J. Chem. Eng. Data 56 (2011) 3254')).toBe(
      'Richter, McLinden and Lemmon (2011)',
    )
    expect(shortSource('something else')).toBe('its published equation of state')
  })
})

// ---- Diagrams --------------------------------------------------------------------------------

/** h (or x) on a dome branch at pressure p, interpolated in log p; the branches split at the top. */
function domeAt(plot: Plot, p: number): { liquid: number; vapour: number } {
  const pts = plot.dome!.points
  const top = pts.reduce((k, pt, i) => (pt[1] > pts[k]![1] ? i : k), 0)
  const at = (branch: [number, number][]) => {
    const sorted = [...branch].sort((a, b) => a[1] - b[1])
    for (let i = 0; i + 1 < sorted.length; i++) {
      const [x0, y0] = sorted[i]!
      const [x1, y1] = sorted[i + 1]!
      if (p >= y0 && p <= y1) return x0 + ((x1 - x0) * Math.log(p / y0)) / Math.log(y1 / y0)
    }
    return Number.NaN
  }
  return { liquid: at(pts.slice(0, top + 1)), vapour: at(pts.slice(top)) }
}

describe('diagrams', () => {
  const def = problem(
    [choice('TL', '°C', [-10]), choice('TH', '°C', [40])],
    {
      refrigerant: 'R134a',
      evaporatorTemperature: 'TL',
      condenserTemperature: 'TH',
      superheat: '5 K',
      subcooling: '3 K',
    },
    [find('cop', 'totals.copRefrigerator', '')],
  )
  const v = drawn(def)
  const sol = v.solution as FormattedRefrigeration
  const d = cycleDiagrams(sol)

  test('p–h with a logarithmic pressure axis, T–s and P–v, each with the refrigerant’s dome', () => {
    expect(d.ph).toBeDefined()
    expect(d.ph!.x).toMatchObject({ label: 'specific enthalpy h', unit: 'kJ/kg', scale: 'linear' })
    expect(d.ph!.y).toMatchObject({ unit: 'kPa', scale: 'log' })
    for (const plot of [d.ph!, d.ts, d.pv]) {
      expect(plot.dome?.fluid).toBe('R-134a')
      expect(plot.curves.map((c) => `${c.from}→${c.to}`)).toEqual(['1→2', '2→3', '3→4', '4→1'])
    }
    expect(d.ph!.curves[2]!.style).toBe('dashed') // the valve
    expect(d.ph!.curves[0]!.style).toBe('solid') // isentropic compressor
  })

  test('the dome closes at the critical point', () => {
    const dome = refrigerantDome(r134a, 230)
    const top = dome.reduce((a, b) => (b.T > a.T ? b : a))
    expect(Math.abs(top.T - r134a.Tc)).toBeLessThan(0.02)
    expect(Math.abs(top.p - r134a.pc) / r134a.pc).toBeLessThan(1e-3)
    // Tillner-Roth & Baehr (1994): Tc = 374.18 K, pc = 4.056 MPa for R-134a (from memory; the
    // fluid file's own critical point is what the dome must meet).
    expect(top.T).toBeGreaterThan(374.1)
    expect(top.p / 1e6).toBeGreaterThan(4.0)
    expect(top.p / 1e6).toBeLessThan(4.1)
    // Both ends of the outline are at the lowest temperature: the liquid first, the vapour last.
    expect(dome[0]!.T).toBeCloseTo(230, 9)
    expect(dome.at(-1)!.T).toBeCloseTo(230, 9)
    expect(dome[0]!.h).toBeLessThan(dome.at(-1)!.h)
    // T rises to the top along the liquid branch and falls along the vapour branch.
    const k = dome.indexOf(top)
    for (let i = 1; i <= k; i++) expect(dome[i]!.T).toBeGreaterThan(dome[i - 1]!.T)
    for (let i = k + 1; i < dome.length; i++) expect(dome[i]!.T).toBeLessThan(dome[i - 1]!.T)
  })

  test('each state is on its side of the dome in the p–h chart', () => {
    const ph = d.ph!
    const [p1, p2, p3, p4] = ph.points
    const at = (pt: { y: number }) => domeAt(ph, pt.y)
    expect(p1!.x).toBeGreaterThan(at(p1!).vapour) // superheated vapour leaving the evaporator
    expect(p2!.x).toBeGreaterThan(at(p2!).vapour) // superheated after the compressor
    expect(p3!.x).toBeLessThan(at(p3!).liquid) // subcooled liquid leaving the condenser
    expect(p4!.x).toBeGreaterThan(at(p4!).liquid) // a wet mixture after the valve
    expect(p4!.x).toBeLessThan(at(p4!).vapour)
    expect(p4!.x).toBeCloseTo(p3!.x, 9) // h4 = h3: the valve is a vertical line
  })

  test('curves run through the states and follow the processes', () => {
    const [comp, cond, valve, evap] = d.ts.curves
    const s = sol.states
    const pt = (i: number): [number, number] => [s[i]!.s.value / 1000, s[i]!.T.value]
    expect(comp!.points[0]).toEqual(pt(0))
    expect(comp!.points.at(-1)).toEqual(pt(1))
    // The isentrope is vertical in T–s and its h rises with p in p–h.
    for (const [x] of comp!.points) expect(x).toBeCloseTo(s[0]!.s.value / 1000, 6)
    const phComp = d.ph!.curves[0]!.points
    for (let i = 1; i < phComp.length; i++) {
      expect(phComp[i]![0]).toBeGreaterThan(phComp[i - 1]![0])
      expect(phComp[i]![1]).toBeGreaterThan(phComp[i - 1]![1])
    }
    // The condenser is one isobar in p–h, and holds its saturation temperature inside the dome.
    for (const [, p] of d.ph!.curves[1]!.points) expect(p).toBeCloseTo(s[1]!.p.value / 1000, 6)
    const Tsat = r134a.saturationP(s[1]!.p.value)
    if (!Tsat.ok) throw new Error(Tsat.error.message)
    expect(cond!.points.filter(([, T]) => Math.abs(T - Tsat.value.T) < 1e-6).length).toBeGreaterThan(3)
    // The evaporator starts at the evaporating temperature and ends superheated.
    expect(evap!.points[0]![1]).toBeCloseTo(s[3]!.T.value, 9)
    expect(evap!.points.at(-1)![1]).toBeCloseTo(s[0]!.T.value, 9)
    expect(valve!.style).toBe('dashed')
  })

  test('described for screen readers, and drawn with the p–h chart first', () => {
    const text = describePlot(d.ph!)
    expect(text).toMatch(/p–h diagram — R-134a/)
    expect(text).toMatch(/The pressure p axis is logarithmic\./)
    expect(text).toMatch(/saturation dome of R-134a, from [0-9.]+ K up to the critical point/)
    expect(text).toMatch(/3 to 4, throttling valve \(isenthalpic, irreversible\), dashed/)
    const html = renderToStaticMarkup(createElement(CycleDiagrams, { diagrams: d }))
    const titles = [...html.matchAll(/<title id="[^"]*">([^<]*)<\/title>/g)].map((m) => m[1])
    expect(titles.map((t) => t!.split(' — ')[0])).toEqual(['p–h diagram', 'T–s diagram', 'P–v diagram'])
    expect(html.match(/role="img"/g)).toHaveLength(3)
    expect(html.match(/data-dome=""/g)).toHaveLength(3)
    expect(html).toContain('<desc')
  })

  test('a compressor below 100 % efficiency is a dashed straight segment', () => {
    const real = problem(
      [],
      {
        refrigerant: 'R134a',
        evaporatorTemperature: '-10 °C',
        condenserTemperature: '40 °C',
        compressorEfficiency: '0.8',
      },
      [find('cop', 'totals.copRefrigerator', '')],
    )
    const dd = cycleDiagrams(drawn(real).solution)
    expect(dd.ph!.curves[0]).toMatchObject({ style: 'dashed', process: 'compressor (irreversible compression)' })
  })

  test('a transcritical R-744 cycle: the gas cooler above the critical pressure', () => {
    const co2 = problem(
      [],
      {
        refrigerant: 'R744',
        purpose: 'heat pump',
        evaporatorTemperature: '-5 °C',
        gasCoolerPressure: '10 MPa',
        gasCoolerExitTemperature: '35 °C',
      },
      [find('cop', 'totals.copHeatPump', '')],
    )
    const dd = cycleDiagrams(drawn(co2).solution)
    expect(dd.ph!.curves[1]!.process).toMatch(/gas cooler/)
    expect(dd.ph!.curves[1]!.points.length).toBeGreaterThan(5)
    expect(dd.ph!.dome?.fluid).toBe('R-744')
  })

  test('ideal-gas and Rankine diagrams have no p–h chart', () => {
    const otto = solveBankSpec({
      template: 'otto',
      inputs: { p1: '100 kPa', T1: '300 K', compressionRatio: '8', T3: '1800 K' },
    })
    if (!otto.ok) throw new Error(otto.error.message)
    expect(cycleDiagrams(otto).ph).toBeUndefined()
  })
})

// ---- Sweep, lint, bank ---------------------------------------------------------------------

describe('sweep', () => {
  test('drawn temperatures that put the evaporator above the condenser are found, with their givens', () => {
    const def = problem(
      [
        {
          name: 'TL',
          label: 'evaporator temperature',
          unit: '°C',
          rule: { kind: 'range', min: -10, max: 40, step: 10 },
        },
        { name: 'TH', label: 'condenser temperature', unit: '°C', rule: { kind: 'range', min: 20, max: 40, step: 10 } },
      ],
      { refrigerant: 'R134a', evaporatorTemperature: 'TL', condenserTemperature: 'TH' },
      [find('cop', 'totals.copRefrigerator', '')],
    )
    const summary = sweepVariants(def, {
      seeds: Array.from({ length: 40 }, (_, i) => i + 1),
      convention: 'engineering',
    })
    expect(summary.failed).toBeGreaterThan(0)
    expect(summary.failed).toBeLessThan(40)
    const f = summary.failures[0]!
    expect(f.code).toBe('solve-error')
    expect(f.message).toMatch(/colder than the condenser/)
    expect(f.givens?.some((g) => g.startsWith('TL = '))).toBe(true)
  })

  type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> }
  const base = drawVariant(
    problem([], { refrigerant: 'R134a', evaporatorTemperature: '-10 °C', condenserTemperature: '40 °C' }, [
      find('cop', 'totals.copRefrigerator', ''),
    ]),
    1,
    { convention: 'engineering' },
  )
  const tamper = (edit: (s: Mutable<FormattedRefrigeration>) => void): DrawResult => {
    if (!base.ok) throw new Error(base.error.message)
    const copy = structuredClone(base.variant) as Mutable<Variant>
    edit(copy.solution as unknown as Mutable<FormattedRefrigeration>)
    return { ok: true, variant: copy as Variant }
  }

  test('a sound variant has no findings', () => {
    expect(checkVariantSanity(base)).toEqual([])
  })

  test.each<[string, (s: Mutable<FormattedRefrigeration>) => void, string]>([
    [
      'a COP above the Carnot COP',
      (s) => void (s.totals.copRefrigerator.value = s.totals.carnotCop.value * 1.1),
      'efficiency-out-of-range',
    ],
    ['a negative COP', (s) => void (s.totals.copRefrigerator.value = -1), 'efficiency-out-of-range'],
    [
      'an energy balance that does not close',
      (s) => void (s.totals.heatRejected.value *= 1.01),
      'efficiency-out-of-range',
    ],
    ['a quality above 1', (s) => void (s.states[3]!.x = 1.2), 'quality-out-of-range'],
    ['a throttle quality below 0', (s) => void (s.totals.throttleQuality.value = -0.1), 'quality-out-of-range'],
    ['a state below absolute zero', (s) => void (s.states[0]!.T.value = -5), 'temperature-not-positive'],
  ])('%s is reported', (_name, edit, code) => {
    expect(checkVariantSanity(tamper(edit)).map((f) => f.code)).toContain(code)
  })
})

describe('lint and the bank', () => {
  test('a sound problem has no findings; a missing refrigerant and a path of another cycle are named', () => {
    const givens = [choice('TL', '°C', [-10]), choice('TH', '°C', [40])]
    const inputs = { refrigerant: 'R134a', evaporatorTemperature: 'TL', condenserTemperature: 'TH' }
    expect(lintDefinition(problem(givens, inputs, [find('cop', 'totals.copRefrigerator', '')]))).toEqual([])
    const { refrigerant: _drop, ...noFluid } = inputs
    expect(
      lintDefinition(problem(givens, noFluid, [find('cop', 'totals.copRefrigerator', '')])).map((f) => f.path),
    ).toContain('physics.inputs.refrigerant')
    expect(lintDefinition(problem(givens, inputs, [find('w', 'totals.netWork', 'kJ/kg')])).map((f) => f.path)).toEqual([
      'finds.0.source.path',
    ])
  })

  test('the refrigeration templates are in the bank (two-stage and cascade: multi-stage-refrigeration.test.ts)', () => {
    const refrigeration = TEMPLATE_CATALOG.filter((e) => e.family === 'refrigeration')
    expect(refrigeration.filter((e) => e.bank).map((e) => e.id)).toEqual([
      'vapour-compression',
      'vapour-compression-two-stage',
      'vapour-compression-cascade',
    ])
    // A template outside the bank is still refused by its id (the combined cycle).
    const combined = TEMPLATE_CATALOG.find((e) => e.family === 'combined' && !e.bank)
    if (combined) {
      const r = solveBankSpec({ template: combined.id, inputs: {} })
      expect(r.ok).toBe(false)
      if (!r.ok) expect(r.error.code).toBe(NOT_IN_BANK)
    }
    const ok = solveBankSpec({
      template: 'vapour-compression',
      inputs: { refrigerant: 'R134a', evaporatorTemperature: '-10 °C', condenserTemperature: '40 °C' },
    })
    expect(ok.ok && isRefrigerationSolution(ok)).toBe(true)
  })

  test('symbols of the refrigeration outputs', () => {
    expect(quantityAtPath('totals.refrigerationEffect', { convention: 'engineering' })?.tex).toBe('Q_{L}')
    expect(quantityAtPath('totals.compressorWork', { convention: 'chemistry' })?.tex).toBe('w_{\\text{c,in}}')
    expect(quantityAtPath('totals.heatRejected', { convention: 'chemistry' })?.tex).toBe('q_{H}')
    expect(quantityAtPath('totals.capacity', { convention: 'chemistry' })?.tex).toBe('\\dot Q_{L}')
    const names = ['compressor', 'condenser', 'throttling valve', 'evaporator']
    expect(quantityAtPath('devices.1.w', { convention: 'engineering', deviceNames: names })).toEqual({
      tex: 'W_{\\text{compressor}}',
      name: 'work done by the fluid in the compressor, per kg',
    })
    expect(quantityAtPath('devices.2.q', { convention: 'chemistry', deviceNames: names })?.tex).toBe(
      'q_{\\text{condenser}}',
    )
    expect(quantityAtPath('devices.9.q', { convention: 'chemistry', deviceNames: names })).toBeNull()
    expect(symbolTex('mdot')).toBe('\\dot{m}')
    expect(symbolTex('Wdot')).toBe('\\dot{W}')
    expect(symbolTex('QdotL')).toBe('\\dot{Q}_{L}')
  })
})
