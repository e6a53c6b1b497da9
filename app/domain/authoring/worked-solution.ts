/**
 * The worked solution of one variant: the givens as drawn, the sign convention, each state and
 * step with its relations and the variant's numbers substituted, the cycle totals, and the key.
 * Every number comes from the variant's solution (or its spec, for a step's n, η or ε), so
 * the derivation and the key cannot disagree. Numbers are shown to 4 significant figures in
 * the units a student writes (kPa or MPa, K, kJ/kg, kJ/(kg·K), m³/kg).
 *
 * Symbols follow the convention: chemistry writes q and w (w done ON the system, ΔU = q + w),
 * engineering writes Q and W (W done BY the system, ΔU = Q − W). Pure.
 */
import type { MathNode } from 'mathjs'
import { mathCore } from '#app/domain/grading/math-instance.ts'
import type { Convention, FormattedSolution, FormattedState, FormattedStep } from '#app/domain/thermo/index.ts'
import { CONVENTIONS, parseCycleSpec, parseTemplateInputs, templates } from '#app/domain/thermo/index.ts'
import type { CycleSpec, StepSpec } from '#app/domain/thermo/cycle.ts'
import type { Gas } from '#app/domain/thermo/substances/gas.ts'
import { saturationAtP } from '#app/domain/thermo/steam/properties.ts'
import { parseRankineInputs } from '#app/domain/thermo/steam/rankine-template.ts'
import type { FormattedRankine, FormattedRankineState } from '#app/domain/thermo/steam/rankine-template.ts'
import { parseVapourCompressionInputs } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { Refrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import { FIND_SENSE_WORDS, type Find, type ProblemDefinition, type Variant } from './definition.ts'
import { formatGivenValue, formatNumber, texEscape, unitToTex, withUnit } from './placeholders.ts'
import { escapeHtml, renderMath } from './prompt.ts'
import { quantityAtPath, splitIdentifiers, symbolTex } from './quantities.ts'
import { refrigerantOf } from './refrigeration-diagrams.ts'
import { isIdealGasSolution, isRankineSolution, isRefrigerationSolution } from './solution-kind.ts'

export interface WorkedLine {
  /** The formula; '' for a line of words only (words wrap, a formula scrolls in its box). */
  readonly tex: string
  readonly note?: string
}

export interface WorkedSection {
  readonly title: string
  readonly lines: WorkedLine[]
}

export interface WorkedSolution {
  /** The convention in words, with its first-law equation. */
  readonly convention: string
  readonly sections: WorkedSection[]
  /** Shown with steam and refrigerant solutions: teaching values, not design data. */
  readonly caution?: string
}

/** Significant figures of every number in a worked solution. */
export const WORKED_SIG_FIGS = 4

// ---- Numbers and units --------------------------------------------------------------

/** Rounding residue of an exact zero (Δs of an isentropic step is ~1e-13 J/(kg·K)). */
function snap(x: number, scale: number): number {
  return Math.abs(x) < 1e-9 * Math.max(1, Math.abs(scale)) ? 0 : x
}

/** A number to 4 significant figures, as TeX. */
export function n4(x: number): string {
  return x === 0 ? '0' : formatNumber(x, { sigFigs: WORKED_SIG_FIGS }, true)
}

/** A number to 4 significant figures with a unit, as TeX. */
export function q4(x: number, unit: string): string {
  return withUnit(n4(x), unit, true)
}

/** Wrapped in parentheses when negative, for substitution into a formula. */
function par(tex: string): string {
  return tex.startsWith('-') ? `(${tex})` : tex
}

interface Units {
  /** per unit amount: kJ/kg or kJ/mol */
  readonly energy: string
  readonly entropy: string
  readonly volume: string
  /** SI value → shown value */
  readonly e: (x: number) => number
  readonly s: (x: number) => number
}

function unitsFor(basis: 'mass' | 'mole'): Units {
  return basis === 'mass'
    ? { energy: 'kJ/kg', entropy: 'kJ/(kg K)', volume: 'm^3/kg', e: (x) => x / 1000, s: (x) => x / 1000 }
    : { energy: 'kJ/mol', entropy: 'J/(mol K)', volume: 'm^3/mol', e: (x) => x / 1000, s: (x) => x }
}

/** Pressure as a student writes it: kPa below 1 MPa, MPa from there. */
export function pressureTex(pa: number): string {
  return Math.abs(pa) >= 1e6 ? q4(pa / 1e6, 'MPa') : q4(pa / 1000, 'kPa')
}

/** A given or find name as a TeX symbol (quantities.ts): T1 → T_1, W_net → W_{\text{net}}, eta → \eta. */
export const texName = symbolTex

/** A state name as a subscript: "1" → 1, "A" → A, anything else in \text. */
function sub(name: string): string {
  return /^[A-Za-z0-9]{1,3}$/.test(name) ? name : `\\text{${texEscape(name)}}`
}

// ---- Convention ---------------------------------------------------------------------

interface Symbols {
  readonly convention: Convention
  /** heat symbol with subscript */
  readonly Q: (s: string) => string
  /** work symbol (of the convention) with subscript */
  readonly W: (s: string) => string
  /** the convention's work from the work done BY the gas */
  readonly fromBy: (wBy: number) => number
}

function symbolsFor(convention: Convention): Symbols {
  return convention === 'chemistry'
    ? { convention, Q: (s) => (s ? `q_{${s}}` : 'q'), W: (s) => (s ? `w_{${s}}` : 'w'), fromBy: (w) => -w }
    : { convention, Q: (s) => (s ? `Q_{${s}}` : 'Q'), W: (s) => (s ? `W_{${s}}` : 'W'), fromBy: (w) => w }
}

function conventionSection(
  convention: Convention,
  flow: boolean,
  fluid = 'gas',
): { text: string; section: WorkedSection } {
  const c = CONVENTIONS[convention]
  const lines: WorkedLine[] =
    convention === 'chemistry'
      ? [
          {
            tex: '\\Delta U = q + w',
            note: `chemistry convention: q is the heat into the system, w the work done ON the system (positive when the ${fluid} is compressed)`,
          },
          ...(flow ? [{ tex: '\\Delta h = q + w', note: 'steady flow: w is the shaft work done on the fluid' }] : []),
        ]
      : [
          {
            tex: '\\Delta U = Q - W',
            note: `engineering convention: Q is the heat into the system, W the work done BY the system (positive when the ${fluid} expands)`,
          },
          ...(flow ? [{ tex: '\\Delta h = Q - W', note: 'steady flow: W is the shaft work done by the fluid' }] : []),
        ]
  lines.push({ tex: '', note: 'Values per unit amount; a negative heat leaves the system.' })
  const text = `${convention}: ${c.equation}; ${c.heat}; ${c.work}${flow ? `; ${c.flowEquation}` : ''}`
  return { text, section: { title: 'Sign convention', lines } }
}

// ---- The spec behind a solution (for n, η, ε and the gas) ----------------------------

function cycleSpecOf(spec: Readonly<Record<string, unknown>>): CycleSpec | null {
  try {
    if (typeof spec.template === 'string') {
      const t = templates[spec.template]
      const inputs = spec.inputs
      if (!t || typeof inputs !== 'object' || inputs === null) return null
      const parsed = parseTemplateInputs(t.inputs, inputs as Record<string, unknown>)
      if (!parsed.ok) return null
      const built = t.build(parsed.value)
      return built.ok ? built.spec : null
    }
    if (spec.cycle !== undefined) {
      const p = parseCycleSpec(spec.cycle)
      return p.ok ? p.value : null
    }
  } catch {
    return null
  }
  return null
}

// ---- Ideal-gas cycles ---------------------------------------------------------------

interface Ctx {
  readonly sol: FormattedSolution
  readonly sym: Symbols
  readonly u: Units
  readonly gas: Gas | null
  readonly spec: CycleSpec | null
  readonly flow: boolean
  /** R in the shown unit, as TeX */
  readonly R: string
}

function stateLines(ctx: Ctx): WorkedSection {
  const { sol, u } = ctx
  const lines: WorkedLine[] = []
  for (const s of sol.states) {
    const n = sub(s.name)
    const tex =
      `p_{${n}} = ${pressureTex(s.p.value)},\\quad T_{${n}} = ${q4(s.T.value, 'K')},\\quad ` +
      `v_{${n}} = \\frac{R\\,T_{${n}}}{p_{${n}}} = \\frac{(${ctx.R})(${q4(s.T.value, 'K')})}{${pressureTex(s.p.value)}} = ${q4(s.v.value, u.volume)}`
    lines.push({ tex, note: `state ${s.name}: the ideal-gas law pv = RT ties p, T and v` })
    if (s.V) lines.push({ tex: `V_{${n}} = ${q4(s.V.value * 1000, 'L')}` })
  }
  return { title: 'States', lines }
}

function deltaLine(ctx: Ctx, kind: 'u' | 'h', a: FormattedState, b: FormattedState, value: number): string {
  const { u, gas } = ctx
  const na = sub(a.name)
  const nb = sub(b.name)
  if (gas?.constantCp) {
    const c = kind === 'u' ? gas.cv(a.T.value) : gas.cp(a.T.value)
    const cSym = kind === 'u' ? 'c_v' : 'c_p'
    return `\\Delta ${kind} = ${cSym}(T_{${nb}} - T_{${na}}) = (${q4(u.s(c), u.entropy)})(${n4(b.T.value)} - ${n4(a.T.value)})\\,\\mathrm{K} = ${q4(u.e(value), u.energy)}`
  }
  const ea = kind === 'u' ? a.u.value : a.h.value
  const eb = kind === 'u' ? b.u.value : b.h.value
  return `\\Delta ${kind} = ${kind}_{${nb}} - ${kind}_{${na}} = ${n4(u.e(eb))} - ${par(n4(u.e(ea)))} = ${q4(u.e(value), u.energy)}`
}

function entropyLine(ctx: Ctx, a: FormattedState, b: FormattedState, ds: number): WorkedLine {
  const { u, gas } = ctx
  const na = sub(a.name)
  const nb = sub(b.name)
  const shown = snap(ds, 1e3)
  if (gas?.constantCp) {
    return {
      tex: `\\Delta s = c_p\\ln\\frac{T_{${nb}}}{T_{${na}}} - R\\ln\\frac{p_{${nb}}}{p_{${na}}} = (${q4(u.s(gas.cp(a.T.value)), u.entropy)})\\ln\\frac{${n4(b.T.value)}}{${n4(a.T.value)}} - (${ctx.R})\\ln\\frac{${n4(b.p.value / 1000)}}{${n4(a.p.value / 1000)}} = ${q4(u.s(shown), u.entropy)}`,
      note: 'entropy change of an ideal gas with constant specific heats',
    }
  }
  return {
    tex: `\\Delta s = s_{${nb}} - s_{${na}} = ${q4(u.s(shown), u.entropy)}`,
    note: 'entropy from the gas tables (NASA polynomials)',
  }
}

function stepSection(ctx: Ctx, st: FormattedStep, k: number): WorkedSection {
  const { sol, sym, u, gas, flow } = ctx
  const a = sol.states[st.from - 1]!
  const b = sol.states[st.to - 1]!
  const na = sub(a.name)
  const nb = sub(b.name)
  const ij = `${na}${nb}`
  const stepSpec: StepSpec | undefined = ctx.spec?.steps[k]
  const wConv = st.w.value
  const wBy = sym.convention === 'engineering' ? wConv : -wConv
  const E = (x: number) => q4(u.e(snap(x, 1e3)), u.energy)
  const wBySym = flow ? 'w_{\\mathrm{shaft,by}}' : 'w_{\\mathrm{by}}'
  const lines: WorkedLine[] = []
  const heat = (relation: string, note?: string) =>
    lines.push({ tex: `${sym.Q(ij)} = ${relation} = ${E(st.q.value)}`, ...(note ? { note } : {}) })
  const balanceName = flow ? 'h' : 'u'
  const balanceDelta = flow ? st.dH.value : st.dU.value

  switch (st.process) {
    case 'isochoric':
      if (!flow) {
        lines.push({ tex: `${wBySym} = 0`, note: 'constant volume: no boundary work' })
        lines.push({ tex: deltaLine(ctx, 'u', a, b, st.dU.value) })
        heat('\\Delta u', 'first law with no work')
      } else {
        lines.push({ tex: `${wBySym} = q - \\Delta h = ${E(wBy)}`, note: 'steady-flow energy balance' })
        heat('\\Delta h + w_{\\mathrm{shaft,by}}')
      }
      break
    case 'isobaric':
      if (!flow) {
        lines.push({
          tex: `${wBySym} = p\\,(v_{${nb}} - v_{${na}}) = (${pressureTex(a.p.value)})(${n4(b.v.value)} - ${n4(a.v.value)})\\,${unitToTex(u.volume)} = ${E(wBy)}`,
          note: 'constant pressure: boundary work p Δv',
        })
      } else {
        lines.push({ tex: `${wBySym} = 0`, note: 'a heat exchanger or combustor has no shaft work' })
      }
      lines.push({ tex: deltaLine(ctx, 'h', a, b, st.dH.value) })
      heat('\\Delta h', flow ? 'steady flow with no shaft work' : 'constant pressure: q = Δu + pΔv = Δh')
      break
    case 'isothermal': {
      const ratio = flow ? a.p.value / b.p.value : b.v.value / a.v.value
      const rel = flow ? `R\\,T\\ln\\frac{p_{${na}}}{p_{${nb}}}` : `R\\,T\\ln\\frac{v_{${nb}}}{v_{${na}}}`
      lines.push({
        tex: `${wBySym} = ${rel} = (${ctx.R})(${q4(a.T.value, 'K')})\\ln(${n4(ratio)}) = ${E(wBy)}`,
        note: 'isothermal ideal gas',
      })
      heat(wBySym, `ideal gas at constant T: Δ${balanceName} = 0`)
      break
    }
    case 'isentropic':
      lines.push({ tex: `${sym.Q(ij)} = 0`, note: 'reversible and adiabatic' })
      if (gas?.constantCp) {
        const g = gas.gamma(a.T.value)
        lines.push({
          tex: flow
            ? `T_{${nb}} = T_{${na}}\\left(\\frac{p_{${nb}}}{p_{${na}}}\\right)^{(\\gamma-1)/\\gamma} = (${n4(a.T.value)})(${n4(b.p.value / a.p.value)})^{${n4((g - 1) / g)}} = ${q4(b.T.value, 'K')}`
            : `T_{${nb}} = T_{${na}}\\left(\\frac{v_{${na}}}{v_{${nb}}}\\right)^{\\gamma-1} = (${n4(a.T.value)})(${n4(a.v.value / b.v.value)})^{${n4(g - 1)}} = ${q4(b.T.value, 'K')}`,
          note: `isentropic ideal gas with constant specific heats, γ = ${formatNumber(g, { sigFigs: WORKED_SIG_FIGS }, false)}`,
        })
      }
      lines.push({ tex: deltaLine(ctx, balanceName, a, b, balanceDelta) })
      lines.push({
        tex: `${wBySym} = -\\Delta ${balanceName} = ${E(wBy)}`,
        note: flow ? 'steady-flow energy balance with q = 0' : 'first law with q = 0',
      })
      break
    case 'polytropic': {
      const nExp = Math.log(b.p.value / a.p.value) / Math.log(a.v.value / b.v.value)
      lines.push({
        tex: `n = \\frac{\\ln(p_{${nb}}/p_{${na}})}{\\ln(v_{${na}}/v_{${nb}})} = \\frac{\\ln(${n4(b.p.value / a.p.value)})}{\\ln(${n4(a.v.value / b.v.value)})} = ${n4(nExp)}`,
        note: stepSpec?.n !== undefined ? `the problem gives n = ${stepSpec.n}` : 'from p vⁿ = constant',
      })
      if (Math.abs(nExp - 1) < 1e-9) {
        lines.push({
          tex: `${wBySym} = R\\,T\\ln\\frac{v_{${nb}}}{v_{${na}}} = ${E(wBy)}`,
          note: 'n = 1 is isothermal',
        })
      } else if (!flow) {
        lines.push({
          tex: `${wBySym} = \\frac{p_{${nb}}v_{${nb}} - p_{${na}}v_{${na}}}{1 - n} = \\frac{(${n4(b.p.value / 1000)})(${n4(b.v.value)}) - (${n4(a.p.value / 1000)})(${n4(a.v.value)})}{1 - ${n4(nExp)}} = ${E(wBy)}`,
          note: 'polytropic boundary work (p in kPa times v gives kJ per unit amount)',
        })
      } else {
        lines.push({
          tex: `${wBySym} = \\frac{n\\,(p_{${nb}}v_{${nb}} - p_{${na}}v_{${na}})}{1 - n} = ${E(wBy)}`,
          note: 'polytropic shaft work in steady flow',
        })
      }
      lines.push({ tex: deltaLine(ctx, balanceName, a, b, balanceDelta) })
      heat(`\\Delta ${balanceName} + ${wBySym}`, 'first law')
      break
    }
    case 'adiabatic': {
      lines.push({ tex: `${sym.Q(ij)} = 0`, note: 'adiabatic, with an isentropic efficiency' })
      lines.push({ tex: deltaLine(ctx, balanceName, a, b, balanceDelta) })
      lines.push({ tex: `${wBySym} = -\\Delta ${balanceName} = ${E(wBy)}`, note: 'energy balance with q = 0' })
      const eta = stepSpec?.efficiency
      const compressor = stepSpec?.device ? stepSpec.device === 'compressor' : wBy < 0
      if (eta !== undefined && eta > 0) {
        if (compressor) {
          const wIn = -wBy
          lines.push({
            tex: `${sym.W('\\mathrm{in}')} = \\frac{${sym.W('s,\\mathrm{in}')}}{\\eta_c} = \\frac{${n4(u.e(wIn * eta))}}{${n4(eta)}} = ${E(wIn)}`,
            note: 'compressor: the actual work is the isentropic work divided by the efficiency',
          })
        } else {
          lines.push({
            tex: `${sym.W('\\mathrm{out}')} = \\eta_t\\,${sym.W('s,\\mathrm{out}')} = (${n4(eta)})(${n4(u.e(wBy / eta))}) = ${E(wBy)}`,
            note: 'turbine: the actual work is the efficiency times the isentropic work',
          })
        }
      }
      break
    }
    case 'regenerator': {
      const path = stepSpec?.path ?? 'isobaric'
      const kind = path === 'isochoric' ? 'u' : 'h'
      lines.push({ tex: `${wBySym} = 0` })
      lines.push({ tex: deltaLine(ctx, kind, a, b, kind === 'u' ? st.dU.value : st.dH.value) })
      const partner = stepSpec?.partner
      heat(
        `\\Delta ${kind}`,
        `internal heat exchange${partner !== undefined ? ` with step ${partner + 1}` : ''}: not counted as heat from or to the surroundings`,
      )
      if (stepSpec?.effectiveness !== undefined && stepSpec.effectiveness < 1)
        lines.push({ tex: `\\varepsilon = ${n4(stepSpec.effectiveness)}`, note: 'regenerator effectiveness' })
      break
    }
  }
  if (st.process !== 'isentropic' && st.process !== 'adiabatic' && !lines.some((l) => l.tex.startsWith(sym.Q(ij))))
    heat(`\\Delta ${balanceName} + ${wBySym}`)
  // In the course's convention.
  lines.push({
    tex:
      sym.convention === 'chemistry'
        ? `${sym.W(ij)} = -${wBySym} = ${E(wConv)}`
        : `${sym.W(ij)} = ${wBySym} = ${E(wConv)}`,
    note: sym.convention === 'chemistry' ? 'work done ON the gas' : 'work done BY the gas',
  })
  const check = sym.convention === 'chemistry' ? `${sym.Q(ij)} + ${sym.W(ij)}` : `${sym.Q(ij)} - ${sym.W(ij)}`
  const checkNums =
    sym.convention === 'chemistry'
      ? `${n4(u.e(snap(st.q.value, 1e3)))} + ${par(n4(u.e(snap(wConv, 1e3))))}`
      : `${n4(u.e(snap(st.q.value, 1e3)))} - ${par(n4(u.e(snap(wConv, 1e3))))}`
  lines.push({ tex: `\\Delta ${balanceName} = ${check} = ${checkNums} = ${E(balanceDelta)}`, note: 'first-law check' })
  lines.push(entropyLine(ctx, a, b, st.dS.value))
  const title = `Step ${a.name} → ${b.name}: ${st.process}${st.label ? ` (${st.label})` : ''}`
  return { title, lines }
}

function closedFormEfficiency(ctx: Ctx, template: string | undefined): WorkedLine | null {
  const { sol, gas } = ctx
  if (!gas?.constantCp || sol.totals.efficiency === null) return null
  const s = sol.states
  const T1 = s[0]?.T.value ?? 300
  const g = gas.gamma(T1)
  if (template === 'otto' && s.length === 4) {
    const r = s[0]!.v.value / s[1]!.v.value
    return {
      tex: `\\eta = 1 - r^{1-\\gamma} = 1 - (${n4(r)})^{1 - ${n4(g)}} = ${n4(1 - Math.pow(r, 1 - g))}`,
      note: 'air-standard Otto cycle with constant specific heats: the same as the net work over the heat added',
    }
  }
  if (template === 'diesel' && s.length === 4) {
    const r = s[0]!.v.value / s[1]!.v.value
    const rc = s[2]!.v.value / s[1]!.v.value
    const eta = 1 - (Math.pow(r, 1 - g) * (Math.pow(rc, g) - 1)) / (g * (rc - 1))
    return {
      tex: `r = ${n4(r)},\\quad r_c = ${n4(rc)},\\quad \\eta = 1 - \\frac{1}{r^{\\gamma-1}}\\,\\frac{r_c^{\\gamma} - 1}{\\gamma\\,(r_c - 1)} = ${n4(eta)}`,
      note: 'air-standard Diesel cycle with constant specific heats: r is the compression ratio, r_c the cutoff ratio',
    }
  }
  if (template === 'brayton' && s.length === 4 && sol.steps.every((st) => st.process !== 'adiabatic')) {
    const rp = s[1]!.p.value / s[0]!.p.value
    return {
      tex: `\\eta = 1 - r_p^{(1-\\gamma)/\\gamma} = 1 - (${n4(rp)})^{${n4((1 - g) / g)}} = ${n4(1 - Math.pow(rp, (1 - g) / g))}`,
      note: 'ideal Brayton cycle with constant specific heats',
    }
  }
  return null
}

function totalsSection(ctx: Ctx, template: string | undefined): WorkedSection {
  const { sol, sym, u } = ctx
  const t = sol.totals
  const lines: WorkedLine[] = []
  const E = (x: number) => q4(u.e(snap(x, 1e3)), u.energy)
  const stepSub = (st: FormattedStep) => `${sub(sol.states[st.from - 1]!.name)}${sub(sol.states[st.to - 1]!.name)}`
  const external = sol.steps.filter((st) => !st.internal)
  const sumOf = (
    steps: readonly FormattedStep[],
    pick: (st: FormattedStep) => number,
    symbol: (st: FormattedStep) => string,
  ): string =>
    steps.length === 0
      ? '0'
      : `${steps.map(symbol).join(' + ')}${steps.length > 1 ? ` = ${steps.map((st) => par(n4(u.e(snap(pick(st), 1e3))))).join(' + ')}` : ''}`
  const ins = external.filter((st) => st.q.value > 0)
  const outs = external.filter((st) => st.q.value < 0)
  lines.push({
    tex: `${sym.Q('\\mathrm{in}')} = ${sumOf(
      ins,
      (st) => st.q.value,
      (st) => sym.Q(stepSub(st)),
    )} = ${E(t.heatIn.value)}`,
    note: 'heat taken from the surroundings (regenerator steps excluded)',
  })
  lines.push({
    tex: `${sym.Q('\\mathrm{out}')} = ${sumOf(
      outs,
      (st) => -st.q.value,
      (st) => `|${sym.Q(stepSub(st))}|`,
    )} = ${E(t.heatOut.value)}`,
    note: 'heat given to the surroundings',
  })
  lines.push({
    tex: `${sym.W('\\mathrm{net}')} = ${sol.steps.map((st) => sym.W(stepSub(st))).join(' + ')} = ${E(t.netWork.value)}`,
    note: sym.convention === 'chemistry' ? 'net work done ON the gas per cycle' : 'net work done BY the gas per cycle',
  })
  const wOut = sym.convention === 'engineering' ? t.netWork.value : -t.netWork.value
  lines.push({
    tex: `${sym.Q('\\mathrm{in}')} - ${sym.Q('\\mathrm{out}')} = ${n4(u.e(t.heatIn.value))} - ${n4(u.e(t.heatOut.value))} = ${E(wOut)}`,
    note:
      sym.convention === 'chemistry'
        ? 'over a cycle ΔU = 0, so the work delivered (minus the net work done on the gas) equals the net heat'
        : 'over a cycle ΔU = 0, so the net work equals the net heat',
  })
  const Tl = t.Tmin.value
  const Th = t.Tmax.value
  if (t.efficiency !== null) {
    lines.push({
      tex: `\\eta = \\frac{${sym.convention === 'chemistry' ? '-w_{\\mathrm{net}}' : 'W_{\\mathrm{net}}'}}{${sym.Q('\\mathrm{in}')}} = \\frac{${n4(u.e(wOut))}}{${n4(u.e(t.heatIn.value))}} = ${n4(t.efficiency.value)}`,
      note: 'thermal efficiency',
    })
    const closed = closedFormEfficiency(ctx, template)
    if (closed) lines.push(closed)
    lines.push({
      tex: `\\eta_{\\mathrm{Carnot}} = 1 - \\frac{T_L}{T_H} = 1 - \\frac{${n4(Tl)}}{${n4(Th)}} = ${n4(t.carnotBound.value)}`,
      note: 'for comparison: the Carnot bound between the lowest and highest temperatures of the cycle',
    })
  } else if (t.copRefrigerator !== null && t.purpose === 'refrigerator') {
    lines.push({
      tex: `\\mathrm{COP}_R = \\frac{${sym.Q('L')}}{${sym.W('\\mathrm{in}')}} = \\frac{${n4(u.e(t.heatIn.value))}}{${n4(u.e(-wOut))}} = ${n4(t.copRefrigerator.value)}`,
      note: 'heat taken from the cold space over the net work put in',
    })
    lines.push({
      tex: `\\mathrm{COP}_{R,\\mathrm{Carnot}} = \\frac{T_L}{T_H - T_L} = \\frac{${n4(Tl)}}{${n4(Th)} - ${n4(Tl)}} = ${n4(t.carnotBound.value)}`,
      note: 'for comparison',
    })
  } else if (t.copHeatPump !== null) {
    lines.push({
      tex: `\\mathrm{COP}_{HP} = \\frac{${sym.Q('H')}}{${sym.W('\\mathrm{in}')}} = \\frac{${n4(u.e(t.heatOut.value))}}{${n4(u.e(-wOut))}} = ${n4(t.copHeatPump.value)}`,
      note: 'heat delivered to the warm space over the net work put in',
    })
    lines.push({
      tex: `\\mathrm{COP}_{HP,\\mathrm{Carnot}} = \\frac{T_H}{T_H - T_L} = \\frac{${n4(Th)}}{${n4(Th)} - ${n4(Tl)}} = ${n4(t.carnotBound.value)}`,
      note: 'for comparison',
    })
  }
  if (t.meanEffectivePressure !== null) {
    const vs = sol.states.map((s) => s.v.value)
    lines.push({
      tex: `\\mathrm{MEP} = \\frac{${sym.W('\\mathrm{net,out}')}}{v_{\\max} - v_{\\min}} = \\frac{${n4(u.e(wOut))}}{${n4(Math.max(...vs))} - ${n4(Math.min(...vs))}} = ${pressureTex(t.meanEffectivePressure.value)}`,
      note: 'mean effective pressure',
    })
  }
  if (t.backWorkRatio !== null)
    lines.push({
      tex: `\\mathrm{bwr} = \\frac{${sym.W('\\mathrm{comp,in}')}}{${sym.W('\\mathrm{turb,out}')}} = ${n4(t.backWorkRatio.value)}`,
      note: 'back work ratio',
    })
  const boundaries = sol.steps.filter((st) => st.boundaryTemperature !== null)
  if (t.entropyGenerated !== null && boundaries.length > 0) {
    // Some step states the temperature of the boundary its heat crosses: the solver's sum is
    // over the steps (Δs of the gas closes to zero over the cycle), so the explanation is too.
    for (const st of sol.steps) {
      if (st.entropyGenerated === null || st.boundaryTemperature === null) continue
      const name = `${st.from}\\to ${st.to}`
      lines.push({
        tex: `s_{\\mathrm{gen},${name}} = \\Delta s_{${name}} - \\frac{q_{${name}}}{T_b} = ${n4(u.s(st.dS.value))} - \\frac{${n4(u.s(st.q.value))}}{${n4(st.boundaryTemperature.value)}} = ${q4(u.s(snap(st.entropyGenerated.value, 1e3)), u.entropy)}`,
        note: `entropy generated in step ${st.from}→${st.to}, its heat crossing a boundary at ${n4(st.boundaryTemperature.value)} K`,
      })
    }
    lines.push({
      tex: `s_{\\mathrm{gen}} = -\\sum_k \\frac{q_k}{T_{b,k}} = ${q4(u.s(snap(t.entropyGenerated.value, 1e3)), u.entropy)}`,
      note: 'entropy generated per cycle: each step’s heat over the temperature of the boundary it crosses',
    })
  } else if (t.entropyGenerated !== null)
    lines.push({
      tex: `s_{\\mathrm{gen}} = \\frac{${sym.Q('\\mathrm{out}')}}{T_{\\mathrm{sink}}} - \\frac{${sym.Q('\\mathrm{in}')}}{T_{\\mathrm{source}}} = ${q4(u.s(snap(t.entropyGenerated.value, 1e3)), u.entropy)}`,
      note: 'entropy generated per cycle with the given reservoirs',
    })
  if (t.exergyDestroyed !== null && t.entropyGenerated !== null && sol.deadState !== null)
    // u.s shows an entropy in the units its product with a temperature should be read in
    // (kJ/kg per mass, J/mol per mole), so the product is shown in those units.
    lines.push({
      tex: `x_{\\mathrm{dest}} = T_0\\, s_{\\mathrm{gen}} = ${n4(sol.deadState.T.value)} \\times ${n4(u.s(t.entropyGenerated.value))} = ${q4(u.s(snap(t.exergyDestroyed.value, 1e3)), sol.gas.basis === 'mass' ? 'kJ/kg' : 'J/mol')}`,
      note: 'exergy destroyed per cycle, with the dead-state temperature T₀',
    })
  if (t.secondLawEfficiency !== null)
    lines.push({
      tex: `\\eta_{\\mathrm{II}} = ${n4(t.secondLawEfficiency.value)}`,
      note:
        t.purpose === 'engine'
          ? 'second-law efficiency: the thermal efficiency over the Carnot efficiency between the reservoirs'
          : 'second-law efficiency: the COP over the reversible COP between the reservoirs',
    })
  if (sol.amount && t.total) {
    const amountUnit = sol.amount.unit
    lines.push({
      tex: `\\text{For } ${q4(sol.amount.value, amountUnit)}:\\ ${sym.Q('\\mathrm{in}')} = ${q4(t.total.heatIn.value / 1000, 'kJ')},\\ ${sym.Q('\\mathrm{out}')} = ${q4(t.total.heatOut.value / 1000, 'kJ')},\\ ${sym.W('\\mathrm{net}')} = ${q4(snap(t.total.netWork.value, 1e3) / 1000, 'kJ')}`,
      note: 'totals for the amount of gas in the problem',
    })
  }
  return { title: 'Cycle totals', lines }
}

function idealGasSections(sol: FormattedSolution, variant: Variant, sym: Symbols): WorkedSection[] {
  const spec = cycleSpecOf(variant.spec)
  const u = unitsFor(sol.gas.basis)
  const gas = spec?.gas ?? null
  const R = sol.gas.basis === 'mass' ? q4(sol.gas.R.value / 1000, 'kJ/(kg K)') : q4(sol.gas.R.value, 'J/(mol K)')
  const ctx: Ctx = { sol, sym, u, gas, spec, flow: sol.system === 'flow', R }
  const template = typeof variant.spec.template === 'string' ? variant.spec.template : undefined
  // The gas's source is credited in docs/credits.md, not in what students read.
  const gasLines: WorkedLine[] = [{ tex: `R = ${R}`, note: sol.gas.label }]
  if (gas?.constantCp) {
    const T = sol.states[0]?.T.value ?? 300
    gasLines.push({
      tex: `c_p = ${q4(u.s(gas.cp(T)), u.entropy)},\\quad c_v = ${q4(u.s(gas.cv(T)), u.entropy)},\\quad \\gamma = c_p/c_v = ${n4(gas.gamma(T))}`,
      note: 'constant specific heats',
    })
  }
  gasLines.push({
    tex: '',
    note:
      sol.system === 'flow'
        ? 'Steady flow: shaft work, energy balance on h.'
        : 'Closed system: boundary work, energy balance on u.',
  })
  return [
    { title: 'Working gas', lines: gasLines },
    stateLines(ctx),
    ...sol.steps.map((st, k) => stepSection(ctx, st, k)),
    totalsSection(ctx, template),
  ]
}

// ---- Rankine cycles -----------------------------------------------------------------

function rankineStateLine(s: FormattedRankineState): WorkedLine[] {
  const n = sub(s.name)
  const lines: WorkedLine[] = [
    {
      tex: `p_{${n}} = ${pressureTex(s.p.value)},\\ T_{${n}} = ${q4(s.T.value, 'K')}\\ (${q4(s.T.value - 273.15, '°C')}),\\ h_{${n}} = ${q4(s.h.value / 1000, 'kJ/kg')},\\ s_{${n}} = ${q4(s.s.value / 1000, 'kJ/(kg K)')},\\ v_{${n}} = ${q4(s.v.value, 'm^3/kg')}`,
      note: `state ${s.name}: ${s.description} (${s.phase}${s.massFraction !== 1 && Number.isFinite(s.massFraction) ? `, mass fraction ${formatNumber(s.massFraction, { sigFigs: WORKED_SIG_FIGS }, false)}` : ''})`,
    },
  ]
  if (s.x !== null) {
    const sat = saturationAtP(s.p.value)
    if (s.x > 0 && s.x < 1 && sat.ok) {
      const hf = sat.value.liquid.h
      const hfg = sat.value.vapour.h - hf
      lines.push({
        tex: `x_{${n}} = \\frac{h_{${n}} - h_f}{h_{fg}} = \\frac{${n4(s.h.value / 1000)} - ${n4(hf / 1000)}}{${n4(hfg / 1000)}} = ${n4(s.x)}`,
        note: `two-phase: quality from the saturation properties at ${formatNumber(s.p.value / 1000, { sigFigs: WORKED_SIG_FIGS }, false)} kPa`,
      })
    } else {
      lines.push({
        tex: `x_{${n}} = ${n4(s.x)}`,
        note: s.x === 0 ? 'saturated liquid' : s.x === 1 ? 'saturated vapour' : 'quality',
      })
    }
  }
  return lines
}

/** "(1 − y)" with its number, or nothing for the whole boiler flow. */
interface Flow {
  readonly m: number
  /** the fraction as a symbol, '' for 1 */
  readonly sym: string
}

const WHOLE: Flow = { m: 1, sym: '' }

/**
 * Device lines of a Rankine cycle, each an enthalpy difference with the variant's numbers,
 * per kg through the boiler. The path is read from the solver's states in order (liquid side,
 * boiler exit, then turbine sections, reheater exits and the extraction), so reheat, an open
 * feedwater heater and both together in either pressure order come out of one walk. Null when
 * the states do not have the solver's shape, so the caller can fall back to magnitudes.
 */
function rankineDeviceLines(sol: FormattedRankine, variant: Variant, sym: Symbols): WorkedLine[] | null {
  const states = sol.states
  const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
  const hs = (s: FormattedRankineState) => n4(s.h.value / 1000)
  const find = (prefix: string) => states.find((s) => s.description.startsWith(prefix))
  const condExit = find('condenser exit')
  const pumpIExit = find('pump I exit')
  const heaterExit = find('open feedwater heater exit')
  const pumpIIExit = find('pump II exit')
  const pumpExit = find('pump exit')
  const boilerIndex = states.findIndex((s) => s.description.startsWith('boiler exit'))
  const boilerExit = states[boilerIndex]
  const extraction = find('turbine extraction')
  const y = sol.totals.bleedFraction?.value ?? null
  const heater =
    pumpIExit !== undefined ||
    heaterExit !== undefined ||
    pumpIIExit !== undefined ||
    extraction !== undefined ||
    y !== null
  if (!condExit || !boilerExit) return null
  if (heater && !(pumpIExit && heaterExit && pumpIIExit && extraction && y !== null)) return null
  if (!heater && !pumpExit) return null
  const path = states.slice(boilerIndex + 1)
  const turbineExit = path.at(-1)
  if (!turbineExit || !turbineExit.description.startsWith('turbine exit')) return null

  const inputs = parseRankineInputs(sol.template, (variant.spec as { inputs?: unknown }).inputs ?? {})
  const etaP = inputs.ok ? (inputs.value.pumpEfficiency ?? 1) : null
  const etaT = inputs.ok ? (inputs.value.turbineEfficiency ?? 1) : null
  const n = (s: FormattedRankineState) => sub(s.name)
  const rest: Flow = y === null ? WHOLE : { m: 1 - y, sym: '(1 - y)' }
  /** m (h_a − h_b) with numbers, and its value in J/kg. */
  const diff = (flow: Flow, a: FormattedRankineState, b: FormattedRankineState) => {
    const value = flow.m * (a.h.value - b.h.value)
    const numbers = `${hs(a)} - ${hs(b)}`
    return {
      value,
      tex: flow.sym
        ? `${flow.sym}(h_{${n(a)}} - h_{${n(b)}}) = (${n4(flow.m)})(${numbers}) = ${E(value)}`
        : `h_{${n(a)}} - h_{${n(b)}} = ${numbers} = ${E(value)}`,
    }
  }
  const perKg = (flow: Flow) => (flow.sym ? '; only the fraction 1 − y of the boiler flow passes here' : '')
  const lines: WorkedLine[] = []

  if (heater && pumpIExit && heaterExit && pumpIIExit && extraction && y !== null) {
    const [b, p1, h3] = [n(extraction), n(pumpIExit), n(heaterExit)]
    lines.push({
      tex: `y\\,h_{${b}} + (1 - y)\\,h_{${p1}} = h_{${h3}}`,
      note: 'open feedwater heater: adiabatic mixing of y kg of bled steam with 1 − y kg of condensate, leaving as 1 kg of saturated liquid',
    })
    lines.push({
      tex: `y = \\frac{h_{${h3}} - h_{${p1}}}{h_{${b}} - h_{${p1}}} = \\frac{${hs(heaterExit)} - ${hs(pumpIExit)}}{${hs(extraction)} - ${hs(pumpIExit)}} = ${n4(y)}`,
      note: 'the balance solved for the bleed fraction',
    })
    const mixed = y * extraction.h.value + (1 - y) * pumpIExit.h.value
    lines.push({
      tex: `(${n4(y)})(${hs(extraction)}) + (${n4(1 - y)})(${hs(pumpIExit)}) = ${E(mixed)} = h_{${h3}}`,
      note: 'check',
    })
  }

  // Pumps: h differences, and the v Δp form a student may use instead.
  const pumpLine = (
    symbol: string,
    flow: Flow,
    inlet: FormattedRankineState,
    exit: FormattedRankineState,
    name: string,
  ) => {
    const d = diff(flow, exit, inlet)
    lines.push({ tex: `${symbol} = ${d.tex}`, note: `${name}${perKg(flow)}` })
    if (etaP !== null) {
      const ws = inlet.v.value * (exit.p.value - inlet.p.value)
      lines.push({
        tex: `\\frac{v_{${n(inlet)}}(p_{${n(exit)}} - p_{${n(inlet)}})}{\\eta_p} = \\frac{(${q4(inlet.v.value, 'm^3/kg')})(${pressureTex(exit.p.value)} - ${pressureTex(inlet.p.value)})}{${n4(etaP)}} = ${E(ws / etaP)}`,
        note: `per kg through ${name === 'pump' ? 'the pump' : name}: the v Δp form for a nearly incompressible liquid agrees closely`,
      })
    }
    return d.value
  }
  const pumps: { symbol: string; value: number }[] = []
  if (heater && pumpIExit && heaterExit && pumpIIExit) {
    pumps.push({
      symbol: sym.W('\\mathrm{pI,in}'),
      value: pumpLine(sym.W('\\mathrm{pI,in}'), rest, condExit, pumpIExit, 'pump I (condensate)'),
    })
    pumps.push({
      symbol: sym.W('\\mathrm{pII,in}'),
      value: pumpLine(sym.W('\\mathrm{pII,in}'), WHOLE, heaterExit, pumpIIExit, 'pump II (feedwater)'),
    })
  } else if (pumpExit) {
    pumps.push({
      symbol: sym.W('\\mathrm{pump,in}'),
      value: pumpLine(sym.W('\\mathrm{pump,in}'), WHOLE, condExit, pumpExit, 'pump'),
    })
  }
  const feed = heater ? pumpIIExit! : pumpExit!
  const boiler = diff(WHOLE, boilerExit, feed)
  lines.push({ tex: `${sym.Q('\\mathrm{boiler}')} = ${boiler.tex}`, note: 'boiler: q = Δh' })

  // Turbine path: each section from the state before it, with the flow that passes it.
  const sectionCount = path.filter((s) => !s.description.startsWith('reheater exit')).length
  const sectionName = (k: number) =>
    sectionCount === 1 ? 'turb' : sectionCount === 2 ? (k === 1 ? 'HP' : 'LP') : `T${k}`
  const efficiencyNote =
    etaT !== null && etaT < 1
      ? `turbine isentropic efficiency ${formatNumber(etaT, { sigFigs: WORKED_SIG_FIGS }, false)}`
      : 'isentropic: s is conserved'
  const sections: { symbol: string; value: number }[] = []
  const reheats: { symbol: string; value: number }[] = []
  let cur = boilerExit
  let flow = WHOLE
  for (const s of path) {
    if (s.description.startsWith('reheater exit')) {
      const d = diff(flow, s, cur)
      const symbol = sym.Q('\\mathrm{reheat}')
      lines.push({ tex: `${symbol} = ${d.tex}`, note: `reheater at ${pressureText(s.p.value)}: q = Δh${perKg(flow)}` })
      reheats.push({ symbol, value: d.value })
    } else {
      const k = sections.length + 1
      const d = diff(flow, cur, s)
      const symbol = sym.W(`\\mathrm{${sectionName(k)},out}`)
      const name =
        sectionCount === 1
          ? 'turbine'
          : `turbine section ${k}, ${pressureText(cur.p.value)} → ${pressureText(s.p.value)}`
      lines.push({ tex: `${symbol} = ${d.tex}`, note: `${name}: ${efficiencyNote}${perKg(flow)}` })
      sections.push({ symbol, value: d.value })
      if (s === extraction) flow = rest
    }
    cur = s
  }
  const cond = diff(flow, turbineExit, condExit)
  lines.push({ tex: `${sym.Q('\\mathrm{cond,out}')} = ${cond.tex}`, note: `condenser: |q| = |Δh|${perKg(flow)}` })

  const sum = (total: string, parts: { symbol: string; value: number }[], value: number, note: string) => {
    if (parts.length < 2) return
    lines.push({
      tex: `${total} = ${parts.map((p) => p.symbol).join(' + ')} = ${parts.map((p) => n4(p.value / 1000)).join(' + ')} = ${E(value)}`,
      note,
    })
  }
  sum(sym.W('\\mathrm{turb,out}'), sections, sol.totals.turbineWork.value, 'all turbine sections')
  sum(sym.W('\\mathrm{pump,in}'), pumps, sol.totals.pumpWork.value, 'both pumps')
  if (reheats.length > 0)
    sum(
      sym.Q('\\mathrm{in}'),
      [{ symbol: sym.Q('\\mathrm{boiler}'), value: boiler.value }, ...reheats],
      sol.totals.heatIn.value,
      'heat taken in: boiler and reheater',
    )
  return lines
}

/** Pressure in words for a note: kPa below 1 MPa, MPa from there. */
function pressureText(pa: number): string {
  return Math.abs(pa) >= 1e6
    ? `${formatNumber(pa / 1e6, { sigFigs: WORKED_SIG_FIGS }, false)} MPa`
    : `${formatNumber(pa / 1000, { sigFigs: WORKED_SIG_FIGS }, false)} kPa`
}

function rankineSections(sol: FormattedRankine, variant: Variant, sym: Symbols): WorkedSection[] {
  const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
  const stateSection: WorkedSection = {
    title: 'States (water/steam, IAPWS-IF97)',
    lines: sol.states.flatMap(rankineStateLine),
  }
  const lines =
    rankineDeviceLines(sol, variant, sym) ??
    sol.devices.map((d) => ({
      tex: `\\text{${texEscape(d.device)}}:\\ ${Math.abs(d.w.value) > 0 ? `|w| = ${E(Math.abs(d.w.value))}` : `|q| = ${E(Math.abs(d.q.value))}`}`,
      note: 'steady-flow energy balance with the enthalpies and mass fractions above',
    }))
  const deviceSection: WorkedSection = { title: 'Devices (per kg through the boiler)', lines }
  const conv: WorkedLine[] = sol.devices.map((d) => ({
    tex: `\\text{${texEscape(d.device)}}:\\ ${sym.Q('')} = ${E(d.q.value)},\\ ${sym.W('')} = ${E(d.w.value)}`,
    note:
      sym.convention === 'chemistry'
        ? 'w is work done ON the water (pump positive, turbine negative)'
        : 'W is work done BY the water (turbine positive, pump negative)',
  }))
  const t = sol.totals
  const totals: WorkedLine[] = [
    {
      tex: `${sym.W('\\mathrm{net,out}')} = ${sym.W('\\mathrm{turb,out}')} - ${sym.W('\\mathrm{pump,in}')} = ${n4(t.turbineWork.value / 1000)} - ${n4(t.pumpWork.value / 1000)} = ${E(t.netWork.value)}`,
      note: 'net work delivered per kg through the boiler',
    },
    { tex: `${sym.W('\\mathrm{net}')} = ${E(t.netWorkSigned.value)}`, note: 'the same in the course convention' },
    { tex: `${sym.Q('\\mathrm{in}')} = ${E(t.heatIn.value)},\\quad ${sym.Q('\\mathrm{out}')} = ${E(t.heatOut.value)}` },
    {
      tex: `\\eta = \\frac{${sym.W('\\mathrm{net,out}')}}{${sym.Q('\\mathrm{in}')}} = \\frac{${n4(t.netWork.value / 1000)}}{${n4(t.heatIn.value / 1000)}} = ${n4(t.efficiency.value)}`,
      note: 'thermal efficiency',
    },
    {
      tex: `\\eta = 1 - \\frac{${sym.Q('\\mathrm{out}')}}{${sym.Q('\\mathrm{in}')}} = 1 - \\frac{${n4(t.heatOut.value / 1000)}}{${n4(t.heatIn.value / 1000)}} = ${n4(1 - t.heatOut.value / t.heatIn.value)}`,
      note: 'the same from the heats: over a cycle the net work is the net heat',
    },
    {
      tex: `\\mathrm{bwr} = \\frac{${sym.W('\\mathrm{pump,in}')}}{${sym.W('\\mathrm{turb,out}')}} = \\frac{${n4(t.pumpWork.value / 1000)}}{${n4(t.turbineWork.value / 1000)}} = ${n4(t.backWorkRatio.value)}`,
      note: 'back work ratio',
    },
  ]
  if (t.turbineExitQuality !== null)
    totals.push({
      tex: `x_{\\mathrm{turbine\\ exit}} = ${n4(t.turbineExitQuality.value)}`,
      note: 'turbine exit quality',
    })
  if (t.bleedFraction !== null)
    totals.push({ tex: `y = ${n4(t.bleedFraction.value)}`, note: 'fraction of the steam bled to the feedwater heater' })
  return [
    stateSection,
    deviceSection,
    { title: 'In the course convention', lines: conv },
    { title: 'Cycle totals', lines: totals },
  ]
}

// ---- Vapour-compression cycles ------------------------------------------------------

/**
 * "Tillner-Roth and Baehr (1994)" from "R. Tillner-Roth and H. D. Baehr, J. Phys. Chem. Ref.
 * Data 23 (1994) 657": the authors' surnames and the year, the rest is for docs/refrigerants.md.
 */
export function shortSource(source: string): string {
  const authors = /^(.+? and (?:[A-Z]\.\s*)+[A-Z][\p{L}-]+)/u.exec(source)?.[1]
  const year = /\((\d{4})\)/.exec(source)?.[1]
  if (!authors || !year) return 'its published equation of state'
  return `${authors.replace(/(?:[A-Z]\.\s*)+/g, '').trim()} (${year})`
}

function refrigerantStateLine(s: FormattedRefrigeration['states'][number]): WorkedLine {
  const n = sub(s.name)
  const x = s.x !== null ? `,\\ x_{${n}} = ${n4(s.x)}` : ''
  return {
    tex: `p_{${n}} = ${pressureTex(s.p.value)},\\ T_{${n}} = ${q4(s.T.value, 'K')}\\ (${q4(s.T.value - 273.15, '°C')}),\\ h_{${n}} = ${q4(s.h.value / 1000, 'kJ/kg')},\\ s_{${n}} = ${q4(s.s.value / 1000, 'kJ/(kg K)')}${x}`,
    note: `state ${s.name}: ${s.description} (${s.phase})`,
  }
}

function refrigerationSections(sol: FormattedRefrigeration, variant: Variant, sym: Symbols): WorkedSection[] {
  const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
  const kJ = (x: number) => n4(x / 1000)
  const parsed = parseVapourCompressionInputs((variant.spec as { inputs?: unknown }).inputs ?? {})
  const f: Refrigerant | null = parsed.ok ? parsed.value.refrigerant : refrigerantOf(sol.substance)
  const eta = parsed.ok ? (parsed.value.compressorEfficiency ?? 1) : null
  const heatPump = parsed.ok && parsed.value.purpose === 'heat-pump'
  const fluidName = sol.substance.replace(/\s*\(.*\)\s*$/, '')
  const [s1, s2, s3, s4] = sol.states
  const t = sol.totals
  const QL = sym.Q('L')
  const QH = sym.Q('H')
  const Win = sym.W('\\text{c,in}')

  const fluidLines: WorkedLine[] = [
    {
      tex: '',
      note: `${sol.substance}: properties from the equation of state of ${f ? shortSource(f.source) : 'its published equation of state'}.`,
    },
    {
      tex: '',
      note: 'Enthalpy and entropy are measured from the IIR reference state (h = 200 kJ/kg and s = 1 kJ/(kg K) for saturated liquid at 0 °C); tables with another zero differ by a constant, and differences agree.',
    },
  ]
  if (!s1 || !s2 || !s3 || !s4)
    return [
      { title: 'Refrigerant', lines: fluidLines },
      { title: `States (${fluidName})`, lines: sol.states.map(refrigerantStateLine) },
    ]

  const n = (s: { name: string }) => sub(s.name)
  const stateLines: WorkedLine[] = []
  stateLines.push(refrigerantStateLine(s1))
  // The compressor: isentropic, or from the isentropic exit state and the efficiency.
  if (eta !== null && eta < 1) {
    const s2s = f ? f.statePS(s2.p.value, s1.s.value) : null
    if (s2s && s2s.ok) {
      const h2s = s2s.value.h
      stateLines.push({
        tex: `s_{${n(s2)}s} = s_{${n(s1)}} = ${q4(s1.s.value / 1000, 'kJ/(kg K)')},\\quad h_{${n(s2)}s} = ${q4(h2s / 1000, 'kJ/kg')}`,
        note: `the isentropic compressor exit at ${pressureText(s2.p.value)}`,
      })
      stateLines.push({
        tex: `h_{${n(s2)}} = h_{${n(s1)}} + \\frac{h_{${n(s2)}s} - h_{${n(s1)}}}{\\eta_c} = ${kJ(s1.h.value)} + \\frac{${kJ(h2s)} - ${kJ(s1.h.value)}}{${n4(eta)}} = ${E(s2.h.value)}`,
        note: `compressor isentropic efficiency ${formatNumber(eta, { sigFigs: WORKED_SIG_FIGS }, false)}`,
      })
    }
  } else {
    stateLines.push({
      tex: `s_{${n(s2)}} = s_{${n(s1)}} = ${q4(s1.s.value / 1000, 'kJ/(kg K)')}`,
      note: `isentropic compression: state ${s2.name} from its pressure and this entropy`,
    })
  }
  stateLines.push(refrigerantStateLine(s2))
  stateLines.push(refrigerantStateLine(s3))
  stateLines.push({
    tex: `h_{${n(s4)}} = h_{${n(s3)}} = ${E(s3.h.value)}`,
    note: 'throttling valve: no work and no heat, so the enthalpy does not change',
  })
  const sat4 = f ? f.saturationP(s4.p.value) : null
  if (sat4 && sat4.ok && s4.x !== null) {
    const hf = sat4.value.liquid.h
    const hfg = sat4.value.vapour.h - hf
    stateLines.push({
      tex: `x_{${n(s4)}} = \\frac{h_{${n(s4)}} - h_f}{h_{fg}} = \\frac{${kJ(s4.h.value)} - ${kJ(hf)}}{${kJ(hfg)}} = ${n4(s4.x)}`,
      note: `a liquid–vapour mixture: quality from the saturation properties at ${pressureText(s4.p.value)}`,
    })
  }
  stateLines.push(refrigerantStateLine(s4))

  const qL = t.refrigerationEffect.value
  const w = t.compressorWork.value
  const qH = t.heatRejected.value
  const gasCooler = f !== null && s2.p.value >= f.pc
  const deviceLines: WorkedLine[] = [
    {
      tex: `${QL} = h_{${n(s1)}} - h_{${n(s4)}} = ${kJ(s1.h.value)} - ${kJ(s4.h.value)} = ${E(qL)}`,
      note: 'evaporator: the refrigeration effect, heat taken in from the cold space',
    },
    {
      tex: `${Win} = h_{${n(s2)}} - h_{${n(s1)}} = ${kJ(s2.h.value)} - ${kJ(s1.h.value)} = ${E(w)}`,
      note: 'adiabatic compressor: the work input is the rise in enthalpy',
    },
    {
      tex: `${QH} = h_{${n(s2)}} - h_{${n(s3)}} = ${kJ(s2.h.value)} - ${kJ(s3.h.value)} = ${E(qH)}`,
      note: gasCooler ? 'gas cooler: the heat rejected' : 'condenser: the heat rejected',
    },
    {
      tex: `${QH} = ${QL} + ${Win} = ${kJ(qL)} + ${kJ(w)} = ${E(qL + w)}`,
      note: 'check: over the cycle the heat rejected is the heat taken in plus the work put in',
    },
  ]
  const conv: WorkedLine[] = sol.devices.map((d) => ({
    tex: `\\text{${texEscape(d.device)}}:\\ ${sym.Q('')} = ${E(d.q.value)},\\ ${sym.W('')} = ${E(d.w.value)}`,
    note:
      sym.convention === 'chemistry'
        ? 'w is work done ON the refrigerant (the compressor’s is positive); q is heat into it'
        : 'W is work done BY the refrigerant (the compressor’s is negative); Q is heat into it',
  }))

  const TL = s4.T.value
  const carnot = t.carnotCop.value
  const carnotR = heatPump ? carnot - 1 : carnot
  const TH = carnotR > 0 ? TL * (1 + 1 / carnotR) : Number.NaN
  const perf: WorkedLine[] = [
    {
      tex: `\\mathrm{COP}_R = \\frac{${QL}}{${Win}} = \\frac{${kJ(qL)}}{${kJ(w)}} = ${n4(t.copRefrigerator.value)}`,
      note: 'coefficient of performance as a refrigerator',
    },
    {
      tex: `\\mathrm{COP}_{HP} = \\frac{${QH}}{${Win}} = \\frac{${kJ(qH)}}{${kJ(w)}} = ${n4(t.copHeatPump.value)}`,
      note: 'as a heat pump (one more than the refrigerator’s)',
    },
  ]
  if (Number.isFinite(TH))
    perf.push({
      tex: heatPump
        ? `\\mathrm{COP}_{HP,\\text{Carnot}} = \\frac{T_H}{T_H - T_L} = \\frac{${n4(TH)}}{${n4(TH)} - ${n4(TL)}} = ${n4(carnot)}`
        : `\\mathrm{COP}_{R,\\text{Carnot}} = \\frac{T_L}{T_H - T_L} = \\frac{${n4(TL)}}{${n4(TH)} - ${n4(TL)}} = ${n4(carnot)}`,
      note: gasCooler
        ? 'the Carnot bound between the evaporating temperature and the gas-cooler exit temperature, in K'
        : 'the Carnot bound between the evaporating and condensing temperatures, in K',
    })
  if (t.massFlow !== null) {
    const m = t.massFlow.value
    const given = parsed.ok && parsed.value.capacity !== undefined
    perf.push(
      given && t.capacity
        ? {
            tex: `\\dot m = \\frac{\\dot Q_L}{${QL}} = \\frac{${q4(t.capacity.value / 1000, 'kW')}}{${E(qL)}} = ${q4(m, 'kg/s')}`,
            note: 'the mass flow rate that gives the refrigeration capacity',
          }
        : { tex: `\\dot m = ${q4(m, 'kg/s')}`, note: 'the refrigerant mass flow rate' },
    )
    if (t.capacity && !given)
      perf.push({
        tex: `\\dot Q_L = \\dot m\\,${QL} = (${n4(m)})(${kJ(qL)}) = ${q4(t.capacity.value / 1000, 'kW')}`,
        note: 'refrigeration capacity',
      })
    if (t.compressorPower)
      perf.push({
        tex: `\\dot W_{\\text{c,in}} = \\dot m\\,${Win} = (${n4(m)})(${kJ(w)}) = ${q4(t.compressorPower.value / 1000, 'kW')}`,
        note: 'compressor power input',
      })
    if (t.heatRejectionRate)
      perf.push({
        tex: `\\dot Q_H = \\dot m\\,${QH} = (${n4(m)})(${kJ(qH)}) = ${q4(t.heatRejectionRate.value / 1000, 'kW')}`,
        note: 'rate of heat rejection',
      })
  }
  return [
    { title: 'Refrigerant', lines: fluidLines },
    { title: `States (${fluidName})`, lines: stateLines },
    { title: 'Devices (per kg of refrigerant)', lines: deviceLines },
    { title: 'In the course convention', lines: conv },
    { title: 'Performance', lines: perf },
  ]
}

// ---- Givens and key -----------------------------------------------------------------

function givensSection(variant: Variant, def: ProblemDefinition): WorkedSection {
  const lines: WorkedLine[] = variant.givens.map((g) => {
    const display = def.givens.find((d) => d.name === g.name)?.display
    const shown = formatGivenValue(g, display, { tex: true })
    // A given drawn as words (a kind of gas) reads as words: its label and its text.
    if (!shown.ok || Number.isNaN(g.value)) return { tex: '', note: `${g.label}: ${g.text}` }
    return { tex: `${texName(g.name)} = ${shown.text}`, note: g.label }
  })
  return { title: 'Given', lines }
}

/**
 * An expression as TeX with every name typeset (eta * 100 → \eta \cdot 100), or, with
 * `values`, every given and earlier find replaced by its number and unit. Null when the
 * expression does not parse (the caller then shows only the result).
 */
function expressionTex(
  expression: string,
  values?: ReadonlyMap<string, { value: number; unit: string }>,
): string | null {
  try {
    const node = mathCore.parse(expression)
    return node.toTex({
      handler: (n: MathNode) => {
        if (!isSymbolNode(n)) return undefined
        const v = values?.get(n.name)
        if (v) return `\\left(${q4(v.value, v.unit)}\\right)`
        return symbolTex(n.name)
      },
    })
  } catch {
    return null
  }
}

function isSymbolNode(n: MathNode): n is MathNode & { name: string } {
  return (n as { type?: string }).type === 'SymbolNode'
}

function keySection(variant: Variant, def: ProblemDefinition): WorkedSection {
  const values = new Map<string, { value: number; unit: string }>()
  for (const g of variant.givens) if (!Number.isNaN(g.value)) values.set(g.name, { value: g.value, unit: g.unit })
  const stateNames = 'states' in variant.solution ? variant.solution.states.map((s) => s.name) : undefined
  const deviceNames = 'devices' in variant.solution ? variant.solution.devices.map((d) => d.device) : undefined
  const ctx = {
    convention: variant.solution.convention.name,
    steam: isRankineSolution(variant.solution),
    ...(stateNames ? { stateNames } : {}),
    ...(deviceNames ? { deviceNames } : {}),
  }
  const plain = (tex: string) => tex.replace(/\\text\{([^}]*)\}/g, '$1').replace(/[{}]/g, '')
  const lines: WorkedLine[] = []
  for (const k of variant.key) {
    const find: Find | undefined = def.finds.find((f) => f.name === k.name)
    const value = q4(k.value, k.unit)
    const symbol = symbolTex(k.name)
    if (find?.source.kind === 'expression') {
      const general = expressionTex(find.source.expression)
      const numbers = expressionTex(find.source.expression, values)
      const middle = general && numbers ? ` = ${general} = ${numbers}` : ''
      lines.push({ tex: `${symbol}${middle} = ${value}`, note: `${k.label} (${k.points} pt)` })
    } else {
      // The solver's quantity by its own symbol when it differs from the find's (q_H = Q_{12}).
      const q = k.path ? quantityAtPath(k.path, ctx) : null
      // A find named wNet in an engineering course reads W_net: the convention's case wins.
      const sameName = q !== null && plain(q.tex).toLowerCase() === plain(symbol).toLowerCase()
      // A find whose stated sense is the opposite of the solver's quantity in this course is
      // that quantity negated (−w_net when the question asks for the work done by the gas in a
      // course where w is work done on it).
      const solverTex = q ? (k.flipped ? `-${q.tex}` : q.tex) : null
      const lead = q && sameName ? solverTex : symbol
      const senseNote = find?.sense ? `, ${FIND_SENSE_WORDS[find.sense]}` : ''
      const quantityNote = q && (!sameName || k.flipped) ? `: ${k.flipped ? 'minus ' : ''}the ${q.name}` : ''
      lines.push({
        tex: `${lead}${q && !sameName ? ` = ${solverTex}` : ''} = ${value}`,
        note: `${k.label} (${k.points} pt)${senseNote}${quantityNote}`,
      })
    }
    values.set(k.name, { value: k.value, unit: k.unit })
  }
  return { title: 'Answers', lines }
}

/** The step-by-step solution of one variant. */
export function workedSolution(variant: Variant, def: ProblemDefinition): WorkedSolution {
  const sol = variant.solution
  const convention = sol.convention.name
  const sym = symbolsFor(convention)
  let conv: { text: string; section: WorkedSection }
  let physics: WorkedSection[]
  let caution: string | undefined
  if (isRefrigerationSolution(sol)) {
    conv = conventionSection(convention, true, 'refrigerant')
    physics = refrigerationSections(sol, variant, sym)
    caution = sol.notice
  } else if (isRankineSolution(sol)) {
    conv = conventionSection(convention, true)
    physics = rankineSections(sol, variant, sym)
    caution = sol.notice
  } else if (isIdealGasSolution(sol)) {
    conv = conventionSection(convention, sol.system === 'flow')
    physics = idealGasSections(sol, variant, sym)
  } else {
    conv = conventionSection(convention, false)
    physics = []
  }
  return {
    convention: conv.text,
    sections: [givensSection(variant, def), conv.section, ...physics, keySection(variant, def)],
    ...(caution !== undefined ? { caution } : {}),
  }
}

/** A note as HTML: plain text, with any identifier a student should see typeset (T_H) as math. */
function noteHtml(note: string): string {
  return splitIdentifiers(note)
    .map((p) => (p.tex !== undefined ? renderMath(p.tex, false).html : escapeHtml(p.text ?? '')))
    .join('')
}

/** A worked solution as HTML: KaTeX with MathML for every line, notes as text. */
export function renderWorkedSolution(ws: WorkedSolution): string {
  const parts: string[] = ['<div class="worked-solution">']
  parts.push(`<p class="worked-convention">${escapeHtml(ws.convention)}</p>`)
  for (const section of ws.sections) {
    parts.push(`<section><h3>${escapeHtml(section.title)}</h3><ul>`)
    for (const line of section.lines) {
      const math = line.tex ? `<span class="worked-math">${renderMath(line.tex, false).html}</span> ` : ''
      parts.push(`<li>${math}${line.note ? `<span class="worked-note">${noteHtml(line.note)}</span>` : ''}</li>`)
    }
    parts.push('</ul></section>')
  }
  if (ws.caution) parts.push(`<p class="worked-caution" role="note">${escapeHtml(ws.caution)}</p>`)
  parts.push('</div>')
  return parts.join('')
}
