import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, test } from 'vitest'
import { solveBankSpec } from '#app/domain/thermo/index.ts'
import type { Convention } from '#app/domain/thermo/index.ts'
import type { DrawnGiven, Find, KeyEntry, ProblemDefinition, Variant } from './definition.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { isIdealGasSolution, isRankineSolution } from './solution-kind.ts'
import { drawVariant } from './variant.ts'
import { renderWorkedSolution, workedSolution } from './worked-solution.ts'
import type { WorkedSolution } from './worked-solution.ts'

const find = (name: string, label: string, unit: string, source: Find['source']): Find => ({
  name,
  label,
  source,
  unit,
  points: 1,
  tolerance: { kind: 'relative', value: 0.01 },
  pitfalls: [],
})

function definition(finds: Find[], physics: ProblemDefinition['physics']): ProblemDefinition {
  return {
    format: 2,
    title: 'test problem',
    tags: { topics: [], difficulty: 'standard', level: 'second-year' },
    convention: 'course',
    prompt: '',
    givens: [
      {
        name: 'T1',
        label: 'temperature at the start of compression',
        unit: 'K',
        rule: { kind: 'range', min: 280, max: 320, step: 5 },
        display: { decimals: 0 },
      },
      { name: 'r', label: 'compression ratio', unit: '', rule: { kind: 'choice', values: [7, 8, 9] } },
    ],
    constraints: [],
    physics,
    finds,
  }
}

const T1: DrawnGiven = {
  name: 'T1',
  label: 'temperature at the start of compression',
  value: 300,
  unit: 'K',
  text: '300 K',
}
const r: DrawnGiven = { name: 'r', label: 'compression ratio', value: 8, unit: '', text: '8' }

function variantOf(
  spec: Record<string, unknown>,
  givens: DrawnGiven[],
  key: (sol: Variant['solution']) => KeyEntry[],
): Variant {
  const sol = solveBankSpec(spec)
  if (!sol.ok) throw new Error(sol.error.message)
  return { seed: 1, convention: sol.convention.name, givens, spec, solution: sol, key: key(sol) }
}

/** {R, γ = 1.4} air, as in the air-standard Otto analysis of Çengel & Boles (from memory). */
function ottoVariant(convention: Convention) {
  const spec = {
    template: 'otto',
    convention,
    inputs: {
      gas: { R: '287 J/(kg K)', gamma: 1.4 },
      p1: '100 kPa',
      T1: '300 K',
      compressionRatio: 8,
      heatIn: '800 kJ/kg',
    },
  }
  const finds = [
    find('eta', 'Thermal efficiency', '', { kind: 'output', path: 'totals.efficiency' }),
    find('wnet', 'Net work', 'kJ/kg', { kind: 'output', path: 'totals.netWork' }),
    find('etaPct', 'Efficiency in per cent', '%', { kind: 'expression', expression: 'eta * 100' }),
  ]
  const def = definition(finds, { kind: 'template', template: 'otto', inputs: { T1: 'T1', compressionRatio: 'r' } })
  const variant = variantOf(spec, [T1, r], (sol) => {
    if (!isIdealGasSolution(sol)) throw new Error('not an ideal-gas solution')
    const eta = sol.totals.efficiency!.value
    return [
      { name: 'eta', label: 'Thermal efficiency', value: eta, unit: '', points: 1, path: 'totals.efficiency' },
      {
        name: 'wnet',
        label: 'Net work',
        value: sol.totals.netWork.value / 1000,
        unit: 'kJ/kg',
        points: 1,
        path: 'totals.netWork',
      },
      { name: 'etaPct', label: 'Efficiency in per cent', value: eta * 100, unit: '%', points: 1, path: null },
    ]
  })
  return { variant, def, ws: workedSolution(variant, def) }
}

const p4 = (x: number) => x.toPrecision(4)
const section = (ws: WorkedSolution, title: string) => {
  const s = ws.sections.find((x) => x.title.startsWith(title))
  if (!s) throw new Error(`no section "${title}" in ${ws.sections.map((x) => x.title).join(' | ')}`)
  return s
}
const line = (ws: WorkedSolution, title: string, start: string) => {
  const l = section(ws, title).lines.find((x) => x.tex.startsWith(start))
  if (!l) throw new Error(`no line starting ${start} in ${title}`)
  return l.tex
}
/** The number after the last "=" of a line (what a student reads as the result). */
const lastNumber = (tex: string) =>
  Number((tex.split('=').pop() ?? '').trim().split('\\,')[0]!.replace('\\times10^{', 'e').replace('}', ''))

describe('workedSolution: Otto cycle, engineering convention', () => {
  const { variant, ws } = ottoVariant('engineering')
  const sol = variant.solution
  if (!isIdealGasSolution(sol)) throw new Error('unexpected')

  test('sections in order: givens, convention, gas, states, steps, totals, answers', () => {
    expect(ws.sections.map((s) => s.title)).toEqual([
      'Given',
      'Sign convention',
      'Working gas',
      'States',
      'Step 1 → 2: isentropic (compression)',
      'Step 2 → 3: isochoric (heat addition)',
      'Step 3 → 4: isentropic (expansion)',
      'Step 4 → 1: isochoric (heat rejection)',
      'Cycle totals',
      'Answers',
    ])
    expect(ws.caution).toBeUndefined()
  })

  test('the givens as drawn, at their display precision', () => {
    expect(section(ws, 'Given').lines).toEqual([
      { tex: 'T_{1} = 300\\,\\mathrm{K}', note: 'temperature at the start of compression' },
      { tex: 'r = 8', note: 'compression ratio' },
    ])
  })

  test('the convention is stated with engineering symbols', () => {
    expect(ws.convention).toMatch(/^engineering: ΔU = Q − W/)
    expect(section(ws, 'Sign convention').lines[0]!.tex).toBe('\\Delta U = Q - W')
    const all = ws.sections.flatMap((s) => s.lines.map((l) => l.tex)).join('\n')
    expect(all).toContain('W_{12}')
    expect(all).not.toMatch(/(^|[^a-z{])w_{12}/)
  })

  test('each state line carries the solution p, T, v to 4 significant figures', () => {
    const lines = section(ws, 'States').lines
    sol.states.forEach((s, i) => {
      const tex = lines[i]!.tex
      const p = s.p.value >= 1e6 ? `${p4(s.p.value / 1e6)}\\,\\mathrm{MPa}` : `${p4(s.p.value / 1000)}\\,\\mathrm{kPa}`
      expect(tex).toContain(`p_{${s.name}} = ${p}`)
      expect(tex).toContain(`T_{${s.name}} = ${p4(s.T.value)}\\,\\mathrm{K}`)
      expect(tex).toContain(`\\frac{R\\,T_{${s.name}}}{p_{${s.name}}}`)
      expect(lastNumber(tex)).toBeCloseTo(Number(p4(s.v.value)), 10)
    })
  })

  test('step lines: works, heats and Δs are the solution values', () => {
    sol.steps.forEach((st) => {
      const title = `Step ${st.from} → ${st.to}`
      const ij = `${st.from}${st.to}`
      const wLine = line(ws, title, `W_{${ij}} = w_{\\mathrm{by}}`)
      expect(lastNumber(wLine)).toBeCloseTo(st.w.value === 0 ? 0 : Number(p4(st.w.value / 1000)), 10)
      const ds = line(ws, title, '\\Delta s')
      expect(Math.abs(lastNumber(ds) - st.dS.value / 1000)).toBeLessThan(Math.abs(st.dS.value / 1000) * 1e-3 + 1e-9)
    })
    expect(line(ws, 'Step 2 → 3', 'Q_{23} = \\Delta u')).toContain(
      `= ${p4(sol.steps[1]!.q.value / 1000)}\\,\\mathrm{kJ}/\\mathrm{kg}`,
    )
    // Isochoric: no boundary work; isentropic: no heat (Çengel & Boles, Otto cycle, from memory).
    expect(line(ws, 'Step 2 → 3', 'w_{\\mathrm{by}}')).toBe('w_{\\mathrm{by}} = 0')
    expect(line(ws, 'Step 1 → 2', 'Q_{12}')).toBe('Q_{12} = 0')
    expect(line(ws, 'Step 1 → 2', 'T_{2} = T_{1}')).toContain(`= ${p4(sol.states[1]!.T.value)}\\,\\mathrm{K}`)
  })

  test('efficiency = W_net/Q_in agrees with 1 − r^(1−γ) for γ = 1.4 (Çengel & Boles, air-standard Otto cycle, from memory)', () => {
    const closedForm = 1 - Math.pow(8, 1 - 1.4)
    expect(sol.totals.efficiency!.value).toBeCloseTo(closedForm, 9)
    const ratio = line(ws, 'Cycle totals', '\\eta = \\frac{W_{\\mathrm{net}}}{Q_{\\mathrm{in}}}')
    const formula = line(ws, 'Cycle totals', '\\eta = 1 - r^{1-\\gamma}')
    expect(lastNumber(ratio)).toBe(Number(p4(closedForm)))
    expect(lastNumber(formula)).toBe(Number(p4(closedForm)))
    expect(formula).toContain('(8.000)^{1 - 1.400}')
    // Carnot bound between the extreme temperatures, for comparison.
    expect(lastNumber(line(ws, 'Cycle totals', '\\eta_{\\mathrm{Carnot}}'))).toBe(
      Number(p4(1 - sol.totals.Tmin.value / sol.totals.Tmax.value)),
    )
  })

  test('Q_in, Q_out and W_net are the solution totals', () => {
    expect(lastNumber(line(ws, 'Cycle totals', 'Q_{\\mathrm{in}} = '))).toBe(Number(p4(sol.totals.heatIn.value / 1000)))
    expect(lastNumber(line(ws, 'Cycle totals', 'Q_{\\mathrm{out}} = '))).toBe(
      Number(p4(sol.totals.heatOut.value / 1000)),
    )
    expect(lastNumber(line(ws, 'Cycle totals', 'W_{\\mathrm{net}} = '))).toBe(
      Number(p4(sol.totals.netWork.value / 1000)),
    )
  })

  test('the key: each find with its value and unit; an expression find with its numbers', () => {
    const key = section(ws, 'Answers').lines
    expect(key[0]!.tex).toBe(`\\eta = ${p4(variant.key[0]!.value)}`)
    expect(key[1]!.tex).toBe(`W_{\\text{net}} = ${p4(variant.key[1]!.value)}\\,\\mathrm{kJ}/\\mathrm{kg}`)
    expect(key[1]!.note).toBe('Net work (1 pt)')
    expect(key[2]!.tex).toBe(
      `\\eta_{\\text{pct}} = \\eta\\cdot100 = \\left(${p4(variant.key[0]!.value)}\\right)\\cdot100 = ${p4(variant.key[2]!.value)}\\,\\%`,
    )
    for (const l of key) expect(l.note).not.toMatch(/totals\./)
  })

  test('renders to HTML with MathML for every line and escaped notes', () => {
    const html = renderWorkedSolution(ws)
    const formulas = ws.sections.flatMap((s) => s.lines).filter((l) => l.tex !== '').length
    expect(formulas).toBeGreaterThan(20)
    expect(html.match(/<span class="worked-math"><span class="katex"><span class="katex-mathml"><math/g)).toHaveLength(
      formulas,
    )
    // Lines of words only are text, so they wrap.
    expect(html).toContain(
      '<li><span class="worked-note">Values per unit amount; a negative heat leaves the system.</span></li>',
    )
    expect(html).not.toContain('katex-error')
    expect(html).toContain('<h3>Cycle totals</h3>')
  })
})

describe('workedSolution: chemistry convention', () => {
  const { variant, ws } = ottoVariant('chemistry')
  const sol = variant.solution
  if (!isIdealGasSolution(sol)) throw new Error('unexpected')

  test('w is the work on the gas: positive in compression, negative in expansion', () => {
    expect(ws.convention).toMatch(/^chemistry: ΔU = q \+ w/)
    expect(section(ws, 'Sign convention').lines[0]!.tex).toBe('\\Delta U = q + w')
    const compression = line(ws, 'Step 1 → 2', 'w_{12} = -w_{\\mathrm{by}}')
    const expansion = line(ws, 'Step 3 → 4', 'w_{34} = -w_{\\mathrm{by}}')
    expect(lastNumber(compression)).toBeGreaterThan(0)
    expect(lastNumber(expansion)).toBeLessThan(0)
    expect(lastNumber(compression)).toBe(Number(p4(sol.steps[0]!.w.value / 1000)))
    expect(line(ws, 'Step 1 → 2', '\\Delta u = q_{12} + w_{12}')).toBeTruthy()
    expect(lastNumber(line(ws, 'Cycle totals', 'w_{\\mathrm{net}} = '))).toBeLessThan(0)
  })
})

describe('workedSolution: Rankine cycle', () => {
  // Çengel & Boles, Example 10-1 (simple ideal Rankine cycle, 3 MPa / 350 °C / 75 kPa), from
  // memory: x4 ≈ 0.886, η ≈ 26.0 %.
  const spec = {
    template: 'rankine',
    convention: 'engineering',
    inputs: { boilerPressure: '3 MPa', condenserPressure: '75 kPa', turbineInletTemperature: '350 °C' },
  }
  const def = definition([find('eta', 'Thermal efficiency', '', { kind: 'output', path: 'totals.efficiency' })], {
    kind: 'template',
    template: 'rankine',
    inputs: {},
  })
  const variant = variantOf(spec, [], (sol) => [
    {
      name: 'eta',
      label: 'Thermal efficiency',
      value: ((sol.totals as { efficiency?: { value: number } }).efficiency as { value: number }).value,
      unit: '',
      points: 1,
      path: 'totals.efficiency',
    },
  ])
  const sol = variant.solution
  if (!isRankineSolution(sol)) throw new Error('unexpected')
  const ws = workedSolution(variant, def)

  test('the textbook values', () => {
    expect(sol.states[3]!.x!).toBeCloseTo(0.886, 2)
    expect(sol.totals.efficiency.value).toBeCloseTo(0.26, 2)
  })

  test('quality at the turbine exit from x = (h − h_f)/h_fg', () => {
    const q = line(ws, 'States', 'x_{4} = \\frac{h_{4} - h_f}{h_{fg}}')
    expect(lastNumber(q)).toBe(Number(p4(sol.states[3]!.x!)))
    expect(q).toContain(`\\frac{${p4(sol.states[3]!.h.value / 1000)} - `)
  })

  test('devices with enthalpy differences, efficiency and back work ratio from the solution', () => {
    expect(lastNumber(line(ws, 'Devices', 'W_{\\mathrm{turb,out}} = h_{3} - h_{4}'))).toBe(
      Number(p4(sol.totals.turbineWork.value / 1000)),
    )
    expect(lastNumber(line(ws, 'Devices', 'W_{\\mathrm{pump,in}} = h_{2} - h_{1}'))).toBe(
      Number(p4(sol.totals.pumpWork.value / 1000)),
    )
    expect(lastNumber(line(ws, 'Devices', 'Q_{\\mathrm{boiler}} = h_{3} - h_{2}'))).toBe(
      Number(p4(sol.totals.heatIn.value / 1000)),
    )
    expect(lastNumber(line(ws, 'Cycle totals', '\\eta = '))).toBe(Number(p4(sol.totals.efficiency.value)))
    expect(lastNumber(line(ws, 'Cycle totals', '\\mathrm{bwr}'))).toBe(Number(p4(sol.totals.backWorkRatio.value)))
  })

  test('carries the caution that steam numbers are teaching values', () => {
    expect(ws.caution).toBe(sol.notice)
    expect(ws.caution).toMatch(/not design data/)
    expect(ws.caution).toMatch(/licensed engineering practice/)
    expect(renderWorkedSolution(ws)).toContain('<p class="worked-caution" role="note">')
  })
})

describe('workedSolution: other cycles render without TeX errors', () => {
  test.each([
    [
      'brayton with component efficiencies',
      {
        template: 'brayton',
        inputs: {
          gas: 'air',
          p1: '100 kPa',
          T1: '300 K',
          pressureRatio: 8,
          turbineInletT: '1300 K',
          compressorEfficiency: 0.8,
          turbineEfficiency: 0.85,
        },
      },
    ],
    [
      'stirling, chemistry',
      {
        template: 'stirling',
        convention: 'chemistry',
        inputs: { gas: 'monatomic', amount: '0.1 mol', Th: '700 K', Tc: '300 K', p1: '500 kPa', compressionRatio: 3 },
      },
    ],
    [
      'carnot refrigerator',
      {
        template: 'carnot-refrigerator',
        inputs: { gas: 'air', Th: '35 °C', Tc: '-5 °C', p1: '100 kPa', expansionRatio: 1.5 },
      },
    ],
    [
      'regenerative brayton, NASA gas',
      {
        template: 'brayton-regenerative',
        inputs: {
          gas: 'nasa:dry-air',
          p1: '100 kPa',
          T1: '300 K',
          pressureRatio: 6,
          turbineInletT: '1200 K',
          regeneratorEffectiveness: 0.8,
          amount: '1 kg',
        },
      },
    ],
    [
      'general polytropic cycle',
      {
        convention: 'chemistry',
        cycle: {
          gas: { basis: 'mole', cv: '12.47 J/(mol K)' },
          amount: '2 mol',
          states: [
            { name: 'A', p: '1 bar', V: '40 L' },
            { name: 'B', p: '3 bar' },
            { name: 'C', V: '40 L' },
          ],
          steps: [{ process: 'polytropic', n: 1.3 }, { process: 'isobaric' }, { process: 'isochoric' }],
        },
      },
    ],
    [
      'rankine with reheat',
      {
        template: 'rankine-reheat',
        inputs: {
          boilerPressure: '15 MPa',
          condenserPressure: '10 kPa',
          turbineInletTemperature: '600 °C',
          reheatPressure: '4 MPa',
          reheatTemperature: '600 °C',
        },
      },
    ],
  ])('%s', (_name, spec) => {
    const variant = variantOf(spec, [], () => [])
    const ws = workedSolution(variant, definition([], { kind: 'template', template: 'x', inputs: {} }))
    const html = renderWorkedSolution(ws)
    expect(html).not.toContain('katex-error')
    expect(html).not.toMatch(/NaN|Infinity|undefined/)
    expect(html.match(/<span class="worked-math"><span class="katex"><span class="katex-mathml"><math/g)?.length).toBe(
      ws.sections.reduce((n, s) => n + s.lines.filter((l) => l.tex !== '').length, 0),
    )
  })

  test('polytropic: n from the states agrees with the n given', () => {
    const spec = {
      cycle: {
        gas: { basis: 'mole', cv: '12.47 J/(mol K)' },
        states: [{ p: '1 bar', V: '40 L' }, { p: '3 bar' }, { V: '40 L' }],
        amount: '2 mol',
        steps: [{ process: 'polytropic', n: 1.3 }, { process: 'isobaric' }, { process: 'isochoric' }],
      },
    }
    const ws = workedSolution(
      variantOf(spec, [], () => []),
      definition([], { kind: 'cycle', cycle: {} }),
    )
    expect(lastNumber(line(ws, 'Step 1 → 2', 'n = '))).toBe(1.3)
  })
})

describe('workedSolution: Rankine devices with reheat and an open feedwater heater', () => {
  const examples = join(import.meta.dirname, '../../../docs/examples')
  const readExample = (name: string) =>
    JSON.parse(readFileSync(join(examples, `${name}.json`), 'utf8')) as Record<string, unknown>
  const rankineOf = (spec: Record<string, unknown>) => {
    const variant = variantOf(spec, [], () => [])
    const sol = variant.solution
    if (!isRankineSolution(sol)) throw new Error('not a Rankine solution')
    return {
      sol,
      ws: workedSolution(variant, definition([], { kind: 'template', template: String(spec.template), inputs: {} })),
    }
  }
  const fourSf = (x: number) => Number(x.toPrecision(4))
  const numbersIn = (tex: string) => (tex.match(/-?\d+(?:\.\d+)?/g) ?? []).map(Number)

  /**
   * A device line "SYMBOL = [(1 - y)](h_a - h_b) = [(m)](A - B) = R": A and B are the states'
   * enthalpies, m is 1 − y, and R agrees with m (h_a − h_b) recomputed from the solution states
   * and with the solver's own device magnitude, all to 4 significant figures.
   */
  type DeviceRow = [start: string, a: string, b: string, bled: boolean, device: string]
  function checkDevice(
    sol: ReturnType<typeof rankineOf>['sol'],
    ws: WorkedSolution,
    [start, a, b, bled, device]: DeviceRow,
  ) {
    const tex = line(ws, 'Devices', start)
    const sa = sol.states.find((s) => s.name === a)!
    const sb = sol.states.find((s) => s.name === b)!
    const m = bled ? 1 - sol.totals.bleedFraction!.value : 1
    const numeric = tex.split(' = ')[2]!
    expect(numbersIn(numeric)).toEqual([
      ...(bled ? [fourSf(m)] : []),
      fourSf(sa.h.value / 1000),
      fourSf(sb.h.value / 1000),
    ])
    const recomputed = (m * (sa.h.value - sb.h.value)) / 1000
    expect(lastNumber(tex)).toBe(fourSf(recomputed))
    const d = sol.devices.find((x) => x.device === device)!
    expect(lastNumber(tex)).toBe(fourSf(Math.abs(d.w.value !== 0 ? d.w.value : d.q.value) / 1000))
    return lastNumber(tex)
  }

  /** η from the device lines as printed (4 s.f. each) agrees with the solver's η to rounding. */
  function checkEfficiency(
    sol: ReturnType<typeof rankineOf>['sol'],
    ws: WorkedSolution,
    works: number[],
    pumps: number[],
    heats: number[],
  ) {
    const wNet = works.reduce((x, y) => x + y, 0) - pumps.reduce((x, y) => x + y, 0)
    const qIn = heats.reduce((x, y) => x + y, 0)
    expect(Math.abs(wNet / qIn - sol.totals.efficiency.value)).toBeLessThan(1e-3 * sol.totals.efficiency.value)
    const eta = line(ws, 'Cycle totals', '\\eta = \\frac{W_{\\mathrm{net,out}}}{Q_{\\mathrm{in}}}')
    expect(numbersIn(eta.split(' = ')[2]!)).toEqual([
      fourSf(sol.totals.netWork.value / 1000),
      fourSf(sol.totals.heatIn.value / 1000),
    ])
    expect(lastNumber(eta)).toBe(fourSf(sol.totals.netWork.value / sol.totals.heatIn.value))
    expect(lastNumber(eta)).toBe(fourSf(sol.totals.efficiency.value))
  }

  describe('reheat (docs/examples/rankine-reheat.json)', () => {
    const { sol, ws } = rankineOf(readExample('rankine-reheat'))

    test('the example inputs are those of Çengel & Boles 7th ed. Example 10-4: 15 MPa, 600 °C, reheat at 4 MPa to 600 °C, 10 kPa', () => {
      expect(readExample('rankine-reheat').inputs).toEqual({
        boilerPressure: '15 MPa',
        condenserPressure: '10 kPa',
        turbineInletTemperature: '600 °C',
        reheatPressure: '4 MPa',
        reheatTemperature: '600 °C',
      })
    })

    test('textbook values (Çengel & Boles 7th ed., Example 10-4, from memory: x6 ≈ 0.896, η ≈ 45.0 %)', () => {
      expect(sol.totals.turbineExitQuality!.value).toBeCloseTo(0.896, 2)
      expect(sol.totals.efficiency.value).toBeCloseTo(0.45, 2)
    })

    test('each device is an enthalpy difference with the variant’s numbers', () => {
      const rows: DeviceRow[] = [
        ['W_{\\mathrm{pump,in}} = h_{2} - h_{1}', '2', '1', false, 'pump'],
        ['Q_{\\mathrm{boiler}} = h_{3} - h_{2}', '3', '2', false, 'boiler'],
        ['W_{\\mathrm{HP,out}} = h_{3} - h_{4}', '3', '4', false, 'high-pressure turbine'],
        ['Q_{\\mathrm{reheat}} = h_{5} - h_{4}', '5', '4', false, 'reheater'],
        ['W_{\\mathrm{LP,out}} = h_{5} - h_{6}', '5', '6', false, 'low-pressure turbine'],
        ['Q_{\\mathrm{cond,out}} = h_{6} - h_{1}', '6', '1', false, 'condenser'],
      ]
      const [pump, boiler, hp, reheat, lp] = rows.map((row) => checkDevice(sol, ws, row))
      expect(
        lastNumber(line(ws, 'Devices', 'W_{\\mathrm{turb,out}} = W_{\\mathrm{HP,out}} + W_{\\mathrm{LP,out}}')),
      ).toBe(fourSf(sol.totals.turbineWork.value / 1000))
      expect(lastNumber(line(ws, 'Devices', 'Q_{\\mathrm{in}} = Q_{\\mathrm{boiler}} + Q_{\\mathrm{reheat}}'))).toBe(
        fourSf(sol.totals.heatIn.value / 1000),
      )
      checkEfficiency(sol, ws, [hp!, lp!], [pump!], [boiler!, reheat!])
    })

    test('no bleed-fraction lines without a feedwater heater', () => {
      expect(section(ws, 'Devices').lines.some((l) => l.tex.includes('y'))).toBe(false)
    })
  })

  describe('regenerative (docs/examples/rankine-regenerative.json)', () => {
    const { sol, ws } = rankineOf(readExample('rankine-regenerative'))
    const y = sol.totals.bleedFraction!.value
    const h = (name: string) => sol.states.find((s) => s.name === name)!.h.value

    test('the example inputs are those of Çengel & Boles 7th ed. Example 10-5: 15 MPa, 600 °C, bleed at 1.2 MPa, 10 kPa', () => {
      expect(readExample('rankine-regenerative').inputs).toEqual({
        boilerPressure: '15 MPa',
        condenserPressure: '10 kPa',
        turbineInletTemperature: '600 °C',
        feedwaterHeaterPressure: '1.2 MPa',
      })
    })

    test('textbook values (Çengel & Boles 7th ed., Example 10-5, from memory: y ≈ 0.227, η ≈ 46.3 %)', () => {
      expect(y).toBeCloseTo(0.227, 3)
      expect(sol.totals.efficiency.value).toBeCloseTo(0.463, 3)
    })

    test('the y line solves the heater’s balance y h6 + (1 − y) h2 = h3', () => {
      expect(line(ws, 'Devices', 'y\\,h_{6} + (1 - y)\\,h_{2} = h_{3}')).toBe('y\\,h_{6} + (1 - y)\\,h_{2} = h_{3}')
      const yLine = line(ws, 'Devices', 'y = \\frac{h_{3} - h_{2}}{h_{6} - h_{2}}')
      expect(numbersIn(yLine.split(' = ')[2]!.replace(/\\frac/, ''))).toEqual([
        fourSf(h('3') / 1000),
        fourSf(h('2') / 1000),
        fourSf(h('6') / 1000),
        fourSf(h('2') / 1000),
      ])
      const shownY = lastNumber(yLine)
      expect(shownY).toBe(fourSf(y))
      // The printed y (4 s.f.) closes the energy balance to its own rounding.
      const mixed = shownY * h('6') + (1 - shownY) * h('2')
      expect(Math.abs(mixed - h('3')) / h('3')).toBeLessThan(5e-4)
      // A y read off the wrong states would not: the turbine exit in place of the extraction.
      expect(Math.abs(shownY * h('7') + (1 - shownY) * h('2') - h('3')) / h('3')).toBeGreaterThan(5e-2)
    })

    test('each device is an enthalpy difference, scaled by 1 − y where only the unbled steam passes', () => {
      const rows: DeviceRow[] = [
        ['W_{\\mathrm{pI,in}} = (1 - y)(h_{2} - h_{1})', '2', '1', true, 'pump I (condensate)'],
        ['W_{\\mathrm{pII,in}} = h_{4} - h_{3}', '4', '3', false, 'pump II (feedwater)'],
        ['Q_{\\mathrm{boiler}} = h_{5} - h_{4}', '5', '4', false, 'boiler'],
        ['W_{\\mathrm{HP,out}} = h_{5} - h_{6}', '5', '6', false, 'high-pressure turbine'],
        ['W_{\\mathrm{LP,out}} = (1 - y)(h_{6} - h_{7})', '6', '7', true, 'low-pressure turbine'],
        ['Q_{\\mathrm{cond,out}} = (1 - y)(h_{7} - h_{1})', '7', '1', true, 'condenser'],
      ]
      const [p1, p2, boiler, hp, lp] = rows.map((row) => checkDevice(sol, ws, row))
      expect(
        lastNumber(line(ws, 'Devices', 'W_{\\mathrm{pump,in}} = W_{\\mathrm{pI,in}} + W_{\\mathrm{pII,in}}')),
      ).toBe(fourSf(sol.totals.pumpWork.value / 1000))
      expect(
        lastNumber(line(ws, 'Devices', 'W_{\\mathrm{turb,out}} = W_{\\mathrm{HP,out}} + W_{\\mathrm{LP,out}}')),
      ).toBe(fourSf(sol.totals.turbineWork.value / 1000))
      checkEfficiency(sol, ws, [hp!, lp!], [p1!, p2!], [boiler!])
    })

    test('chemistry convention: lower-case symbols, the same magnitudes', () => {
      const chem = rankineOf({ ...readExample('rankine-regenerative'), convention: 'chemistry' })
      const tex = line(chem.ws, 'Devices', 'w_{\\mathrm{pI,in}} = (1 - y)(h_{2} - h_{1})')
      expect(lastNumber(tex)).toBe(lastNumber(line(ws, 'Devices', 'W_{\\mathrm{pI,in}}')))
      expect(line(chem.ws, 'Cycle totals', '\\eta = \\frac{w_{\\mathrm{net,out}}}{q_{\\mathrm{in}}}')).toContain(
        `= ${p4(sol.totals.efficiency.value)}`,
      )
    })
  })

  test('reheat and a feedwater heater together, bleed above the reheat pressure: the reheater carries 1 − y (solver totals only, no textbook case)', () => {
    const { sol, ws } = rankineOf({
      template: 'rankine',
      inputs: {
        boilerPressure: '15 MPa',
        condenserPressure: '10 kPa',
        turbineInletTemperature: '600 °C',
        feedwaterHeaterPressure: '4 MPa',
        reheatPressure: '1 MPa',
        reheatTemperature: '500 °C',
      },
    })
    const rows: DeviceRow[] = [
      ['W_{\\mathrm{pI,in}} = (1 - y)(h_{2} - h_{1})', '2', '1', true, 'pump I (condensate)'],
      ['W_{\\mathrm{pII,in}} = h_{4} - h_{3}', '4', '3', false, 'pump II (feedwater)'],
      ['Q_{\\mathrm{boiler}} = h_{5} - h_{4}', '5', '4', false, 'boiler'],
      ['W_{\\mathrm{T1,out}} = h_{5} - h_{6}', '5', '6', false, 'high-pressure turbine'],
      ['W_{\\mathrm{T2,out}} = (1 - y)(h_{6} - h_{7})', '6', '7', true, 'low-pressure turbine'],
      ['Q_{\\mathrm{reheat}} = (1 - y)(h_{8} - h_{7})', '8', '7', true, 'reheater'],
      ['W_{\\mathrm{T3,out}} = (1 - y)(h_{8} - h_{9})', '8', '9', true, 'turbine section 3'],
      ['Q_{\\mathrm{cond,out}} = (1 - y)(h_{9} - h_{1})', '9', '1', true, 'condenser'],
    ]
    const [p1, p2, boiler, t1, t2, reheat, t3] = rows.map((row) => checkDevice(sol, ws, row))
    checkEfficiency(sol, ws, [t1!, t2!, t3!], [p1!, p2!], [boiler!, reheat!])
  })
})

// ---- What a student reads: no internal path, no raw identifier, no source credit ----------

/** The text of rendered HTML outside every KaTeX element (math is typeset, so it may hold _). */
function textOutsideMath(html: string): string {
  const out: string[] = []
  const stack: boolean[] = []
  const inMath = () => stack.includes(true)
  const re = /<(\/?)([a-zA-Z][a-zA-Z0-9-]*)([^>]*?)(\/?)>|([^<]+)/g
  for (const m of html.matchAll(re)) {
    if (m[5] !== undefined) {
      if (!inMath()) out.push(m[5])
      continue
    }
    const [, closing, tag, attrs, selfClosing] = m
    if (closing) stack.pop()
    else if (!selfClosing && !['br', 'img', 'hr', 'input', 'meta', 'link'].includes(tag!.toLowerCase()))
      stack.push(/\bclass="[^"]*\bkatex\b(?!-)/.test(attrs!))
  }
  return out
    .join(' ')
    .replace(/&amp;/g, '&')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
}

/** The TeX of every formula in rendered HTML (KaTeX keeps it in the MathML annotation). */
function texOf(html: string): string[] {
  return [...html.matchAll(/<annotation encoding="application\/x-tex">([^<]*)<\/annotation>/g)].map((m) =>
    m[1]!.replace(/&amp;/g, '&'),
  )
}

describe('worked solutions of the demo problems, as students read them', () => {
  for (const demo of DEMO_PROBLEMS) {
    for (const convention of ['engineering', 'chemistry'] as const) {
      test(`${demo.definition.title} (${convention} course)`, () => {
        const drawn = drawVariant(demo.definition, 7, { convention })
        if (!drawn.ok) throw new Error(drawn.error.message)
        const html = renderWorkedSolution(workedSolution(drawn.variant, demo.definition))
        const text = textOutsideMath(html)
        expect(text.length).toBeGreaterThan(200)
        expect(text).not.toMatch(/\b[a-z]+\.[a-zA-Z]+\b/)
        expect(text).not.toMatch(/from memory/i)
        expect(text).not.toMatch(/[\p{L}\p{N}]_[\p{L}\p{N}]/u)
        expect(text).not.toMatch(/Çengel|Table A-/)
        // Every find's path stays out of the math too.
        const tex = texOf(html).join('\n')
        for (const f of demo.definition.finds) if (f.source.kind === 'output') expect(tex).not.toContain(f.source.path)
        expect(tex).not.toMatch(/\\mathrm\{(eta|wNet|qH|rc|rp|etaT|etaC|etaP)\}/)
      })
    }
  }

  test('finds and givens get their typeset symbols, by convention', () => {
    const otto = DEMO_PROBLEMS.find((d) => d.definition.title.startsWith('Air-standard Otto'))!.definition
    const diesel = DEMO_PROBLEMS.find((d) => d.definition.title.includes('Diesel'))!.definition
    const texFor = (def: ProblemDefinition, convention: Convention) => {
      const drawn = drawVariant(def, 3, { convention })
      if (!drawn.ok) throw new Error(drawn.error.message)
      return texOf(renderWorkedSolution(workedSolution(drawn.variant, def)))
    }
    const answers = (lines: string[]) =>
      lines.filter((l) => /^(\\eta|W_\{\\text\{net\}\}|w_\{\\text\{net\}\}) = /.test(l))
    expect(answers(texFor(otto, 'engineering')).some((l) => l.startsWith('W_{\\text{net}} = '))).toBe(true)
    expect(answers(texFor(otto, 'chemistry')).some((l) => l.startsWith('w_{\\text{net}} = '))).toBe(true)
    const d = texFor(diesel, 'engineering')
    expect(d.some((l) => l.startsWith('r_{c} = '))).toBe(true)
    expect(d.some((l) => l.startsWith('\\eta = '))).toBe(true)
  })

  test('an author label with an identifier is typeset in the note', () => {
    const html = renderWorkedSolution({
      convention: 'engineering',
      sections: [{ title: 'Answers', lines: [{ tex: 'x = 1', note: 'Heat taken in at T_H, per mole' }] }],
    })
    expect(textOutsideMath(html)).not.toContain('T_H')
    expect(texOf(html)).toContain('T_{H}')
  })

  test('an expression find is shown with typeset names, not as code', () => {
    const def: ProblemDefinition = {
      ...DEMO_PROBLEMS[3]!.definition,
      finds: [
        ...DEMO_PROBLEMS[3]!.definition.finds,
        find('etaPct', 'Efficiency in per cent', '', { kind: 'expression', expression: 'eta * 100' }),
      ],
    }
    const drawn = drawVariant(def, 3, { convention: 'engineering' })
    if (!drawn.ok) throw new Error(drawn.error.message)
    const html = renderWorkedSolution(workedSolution(drawn.variant, def))
    const line = texOf(html).find((l) => l.startsWith('\\eta_{\\text{pct}}'))
    expect(line).toBeDefined()
    expect(line).not.toContain('texttt')
    expect(line).toMatch(/\\eta\\cdot100/)
  })
})

// A find that states its sense: in a course whose convention signs the solver's quantity the
// other way, the answer line names the solver's quantity negated, so the symbol never
// contradicts the sign (for a cycle, work done by the gas = −work done on it: common practice).
test.each(['engineering', 'chemistry'] as const)(
  'Otto demo, %s course: net work stated "by the system" reads with the sign the symbol has',
  (convention) => {
    const demo = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!.definition
    const def: ProblemDefinition = {
      ...demo,
      finds: demo.finds.map((f) => (f.name === 'wNet' ? { ...f, sense: 'work-by-system' as const } : f)),
    }
    const drawn = drawVariant(def, 7, { convention })
    if (!drawn.ok) throw new Error(drawn.error.message)
    const key = drawn.variant.key.find((k) => k.name === 'wNet')!
    expect(key.value).toBeGreaterThan(0)
    const answers = workedSolution(drawn.variant, def).sections.find((s) => s.title === 'Answers')!
    const line = answers.lines.find((l) => l.note?.startsWith('Net work'))!
    expect(line.note).toContain('work done by the system')
    if (convention === 'chemistry') {
      // w is work done on the gas here: the positive key is −w_net.
      expect(key.flipped).toBe(true)
      expect(line.tex).toMatch(/^-w_/)
      expect(line.note).toContain('minus the')
    } else {
      // W is work done by the gas here: no negation.
      expect(key.flipped).toBeUndefined()
      expect(line.tex).toMatch(/^W_/)
      expect(line.tex).not.toMatch(/^-/)
    }
  },
)

describe('workedSolution: second law with boundary temperatures and a dead state', () => {
  // docs/examples/second-law-brayton.json: the combustor's heat crosses a boundary at 1800 K and
  // the rejected heat one at 298.15 K. Expected numbers recomputed here from the solution's own
  // states (s_gen,k = Δs_k − q_k/T_b), not from the solver's second-law outputs.
  const spec = JSON.parse(
    readFileSync(join(import.meta.dirname, '../../../docs/examples/second-law-brayton.json'), 'utf8'),
  ) as Record<string, unknown>
  const variant = variantOf(spec, [], () => [])
  const sol = variant.solution
  if (!isIdealGasSolution(sol)) throw new Error('not an ideal-gas solution')
  const ws = workedSolution(variant, definition([], { kind: 'cycle', cycle: {} }))
  const fourSf = (x: number) => Number(x.toPrecision(4))

  test('each step with a boundary temperature gets its own line, Δs − q/T_b in kJ/(kg K)', () => {
    const combustor = sol.steps[1]!
    const expected = (combustor.dS.value - combustor.q.value / 1800) / 1000
    expect(lastNumber(line(ws, 'Cycle totals', 's_{\\mathrm{gen},2\\to 3}'))).toBe(fourSf(expected))
  })

  test('the cycle’s total is minus the sum of q over T_b, and exergy destroyed is T0 times it', () => {
    const sgen = -(sol.steps[1]!.q.value / 1800 + sol.steps[3]!.q.value / 298.15) / 1000
    expect(lastNumber(line(ws, 'Cycle totals', 's_{\\mathrm{gen}} = -\\sum'))).toBe(fourSf(sgen))
    expect(lastNumber(line(ws, 'Cycle totals', 'x_{\\mathrm{dest}}'))).toBe(fourSf(298.15 * sgen))
  })

  test('no line speaks of sink and source temperatures when the steps name their own', () => {
    expect(section(ws, 'Cycle totals').lines.some((l) => l.tex.includes('T_{\\mathrm{sink}}'))).toBe(false)
  })
})
