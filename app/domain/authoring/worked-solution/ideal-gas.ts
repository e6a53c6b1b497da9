/** The worked solution of an ideal-gas cycle: states, each step with its relations, and the totals. Pure. */
import type { FormattedSolution, FormattedState, FormattedStep } from '#app/domain/thermo/index.ts'
import type { CycleSpec, StepSpec } from '#app/domain/thermo/cycle.ts'
import type { Gas } from '#app/domain/thermo/substances/gas.ts'
import { type Variant } from '../definition.ts'
import { formatNumber, unitToTex } from '../placeholders.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'
import { snap, par, unitsFor, sub, cycleSpecOf, pressureTex, n4, q4 } from './common.ts'
import type { Units, Symbols } from './common.ts'

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
  if (t.rate && sol.flowRate) {
    // Powers and rates: the per-unit values times the gas through the cycle per second.
    const f = sol.flowRate
    const mdot = `${sol.gas.basis === 'mass' ? '\\dot m' : '\\dot n'} = ${q4(f.value, f.unit)}`
    const kW = (x: number) => q4(snap(x, 1e3) / 1000, 'kW')
    const times = (x: number) => `(${q4(f.value, f.unit)})(${E(x)})`
    lines.push({
      tex: mdot,
      note:
        sol.system === 'flow'
          ? 'flow rate of the gas'
          : 'gas taken through the cycle per second (the mass per cycle times the cycles per second)',
    })
    lines.push({
      tex: `\\dot W_{\\mathrm{net}} = ${times(t.netWork.value)} = ${kW(t.rate.netPower.value)}`,
      note: sym.convention === 'chemistry' ? 'net power done ON the gas' : 'net power delivered by the gas',
    })
    lines.push({
      tex: `\\dot Q_{\\mathrm{in}} = ${times(t.heatIn.value)} = ${kW(t.rate.heatIn.value)},\\quad \\dot Q_{\\mathrm{out}} = ${times(t.heatOut.value)} = ${kW(t.rate.heatOut.value)}`,
      note: 'rates of heat added and rejected',
    })
    if (t.rate.entropyGenerated !== null && t.entropyGenerated !== null)
      lines.push({
        tex: `\\dot S_{\\mathrm{gen}} = (${q4(f.value, f.unit)})(${q4(u.s(snap(t.entropyGenerated.value, 1e3)), u.entropy)}) = ${q4(snap(t.rate.entropyGenerated.value, 1e3) / 1000, 'kW/K')}`,
        note: 'rate of entropy generation',
      })
    if (t.rate.exergyDestroyed !== null && sol.deadState !== null && t.rate.entropyGenerated !== null)
      lines.push({
        tex: `\\dot X_{\\mathrm{dest}} = T_0\\,\\dot S_{\\mathrm{gen}} = ${n4(sol.deadState.T.value)} \\times ${q4(snap(t.rate.entropyGenerated.value, 1e3) / 1000, 'kW/K')} = ${kW(t.rate.exergyDestroyed.value)}`,
        note: 'rate of exergy destruction',
      })
  }
  if (sol.amount && t.total) {
    const amountUnit = sol.amount.unit
    lines.push({
      tex: `\\text{For } ${q4(sol.amount.value, amountUnit)}:\\ ${sym.Q('\\mathrm{in}')} = ${q4(t.total.heatIn.value / 1000, 'kJ')},\\ ${sym.Q('\\mathrm{out}')} = ${q4(t.total.heatOut.value / 1000, 'kJ')},\\ ${sym.W('\\mathrm{net}')} = ${q4(snap(t.total.netWork.value, 1e3) / 1000, 'kJ')}`,
      note: 'totals for the amount of gas in the problem',
    })
  }
  return { title: 'Cycle totals', lines }
}

export function idealGasSections(sol: FormattedSolution, variant: Variant, sym: Symbols): WorkedSection[] {
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
