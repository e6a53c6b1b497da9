/**
 * The worked solution of a steady-flow device (nozzle, diffuser) or a turbojet: the steady-flow
 * energy equation with the kinetic energy, h + V²/2, the stagnation state T0 = T + V²/(2 cp),
 * the isentropic relations with the device's efficiency, the Mach number with the local γ, the
 * choked exit of a converging nozzle, A/A*, and for the turbojet each component in turn, thrust,
 * propulsive power and the efficiencies.
 *
 * Every state, velocity and total comes from the variant's solution; the gas (cp, γ and R at a
 * temperature, the isentropic temperature at a pressure) and the component efficiencies are read
 * from the variant's spec with the solver's own parser, so an intermediate number (an isentropic
 * exit temperature) is the one the solver used. Pure.
 */
import type { FlowGas } from '#app/domain/thermo/flow/flow-gas.ts'
import { parseDuctInputs, parseTurbojetInputs } from '#app/domain/thermo/flow/flow-template.ts'
import type {
  FormattedDuct,
  FormattedFlow,
  FormattedFlowState,
  FormattedTurbojet,
} from '#app/domain/thermo/flow/flow-template.ts'
import { type Variant } from '../definition.ts'
import { formatNumber, texEscape } from '../placeholders.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'
import { n4, par, pressureText, pressureTex, q4, snap, specInputs, sub } from './common.ts'
import type { Symbols } from './common.ts'

const kJ = (x: number) => n4(snap(x, 1e3) / 1000)
/** kJ, parenthesised when negative (after a minus or plus sign). */
const kJp = (x: number) => par(kJ(x))
const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
const K = (x: number) => q4(x, 'K')
const ms = (x: number) => q4(x, 'm/s')
const words = (x: number) => formatNumber(x, { sigFigs: WORKED_SIG_FIGS }, false)

/** An area as a student writes it: cm² below 0.01 m², m² from there. */
function areaTex(m2: number): string {
  return Math.abs(m2) < 0.01 ? q4(m2 * 1e4, 'cm^2') : q4(m2, 'm^2')
}

/** A power in kW (MW from 10 MW up). */
function powerTex(w: number): string {
  return Math.abs(w) >= 1e7 ? q4(w / 1e6, 'MW') : q4(w / 1000, 'kW')
}

/** A force in kN (N below 1 kN). */
function forceTex(n: number): string {
  return Math.abs(n) >= 1000 ? q4(n / 1000, 'kN') : q4(n, 'N')
}

/** The gas of the variant, read from its spec as the solver read it; null if it does not parse. */
function flowGasOf(variant: Variant, template: FormattedFlow['template']): FlowGas | null {
  const inputs = specInputs(variant)
  const p = template === 'turbojet' ? parseTurbojetInputs(inputs) : parseDuctInputs(template, inputs)
  return p.ok ? p.value.gas : null
}

/** R of the gas from a state (ideal gas: R = p/(ρT)), the solver's own R to rounding. */
function gasConstant(s: FormattedFlowState): number {
  return s.p.value / (s.density.value * s.T.value)
}

function gasLines(sol: FormattedFlow, g: FlowGas | null, T: number): WorkedLine[] {
  const s1 = sol.states[0]!
  const R = g ? g.R : gasConstant(s1)
  const lines: WorkedLine[] = [
    {
      tex: `R = ${q4(R / 1000, 'kJ/(kg K)')}`,
      note: `${sol.substance}, an ideal gas, per kilogram (velocities enter the energy balance as V²/2 in J/kg)`,
    },
  ]
  if (g) {
    const cp = g.cp(T)
    const k = g.gamma(T)
    lines.push({
      tex: `c_p = ${q4(cp / 1000, 'kJ/(kg K)')},\\quad k = \\frac{c_p}{c_p - R} = ${n4(k)}`,
      note: g.constantCp
        ? 'constant specific heats (the cold-air standard when the gas is air)'
        : `at ${words(T)} K; this gas's cp varies with temperature, so enthalpies come from its data and each Mach number uses the local k`,
    })
  }
  return lines
}

function stateLine(s: FormattedFlowState, where: string): WorkedLine {
  const n = sub(s.name)
  return {
    tex: `p_{${n}} = ${pressureTex(s.p.value)},\\ T_{${n}} = ${K(s.T.value)},\\ V_{${n}} = ${ms(s.V.value)},\\ h_{${n}} = ${E(s.h.value)},\\ s_{${n}} = ${q4(s.s.value / 1000, 'kJ/(kg K)')}`,
    note: `state ${s.name}: ${where}`,
  }
}

/** a = √(k R T) with the local k, and M = V/a. */
function machLines(s: FormattedFlowState, g: FlowGas | null): WorkedLine[] {
  const n = sub(s.name)
  const R = g ? g.R : gasConstant(s)
  const k = g ? g.gamma(s.T.value) : (s.soundSpeed.value * s.soundSpeed.value) / (R * s.T.value)
  return [
    {
      tex: `a_{${n}} = \\sqrt{k R T_{${n}}} = \\sqrt{(${n4(k)})(${n4(R)})(${n4(s.T.value)})} = ${ms(s.soundSpeed.value)},\\quad M_{${n}} = \\frac{V_{${n}}}{a_{${n}}} = \\frac{${n4(s.V.value)}}{${n4(s.soundSpeed.value)}} = ${n4(s.mach.value)}`,
      note: `speed of sound at state ${s.name}${g && !g.constantCp ? ', with k at its own temperature' : ''}, and the Mach number`,
    },
  ]
}

/** T0 = T + V²/(2 cp) and p0 from the isentropic relation. */
function stagnationLines(s: FormattedFlowState, g: FlowGas | null): WorkedLine[] {
  const n = sub(s.name)
  const V = s.V.value
  if (V === 0)
    return [
      {
        tex: `T_{0${n}} = T_{${n}} = ${K(s.T0.value)},\\quad p_{0${n}} = p_{${n}} = ${pressureTex(s.p0.value)}`,
        note: 'at rest, the static state is the stagnation state',
      },
    ]
  const lines: WorkedLine[] = []
  if (g && g.constantCp) {
    const cp = g.cp(s.T.value)
    const k = g.gamma(s.T.value)
    lines.push({
      tex: `T_{0${n}} = T_{${n}} + \\frac{V_{${n}}^2}{2 c_p} = ${n4(s.T.value)} + \\frac{${n4(V)}^2}{2(${n4(cp)})} = ${K(s.T0.value)}`,
      note: 'stagnation temperature: the flow brought to rest adiabatically, h0 = h + V²/2',
    })
    lines.push({
      tex: `p_{0${n}} = p_{${n}} \\left(\\frac{T_{0${n}}}{T_{${n}}}\\right)^{k/(k-1)} = ${n4(s.p.value / 1000)} \\left(\\frac{${n4(s.T0.value)}}{${n4(s.T.value)}}\\right)^{${n4(k / (k - 1))}} = ${pressureTex(s.p0.value)}`,
      note: 'stagnation pressure: brought to rest isentropically',
    })
  } else {
    lines.push({
      tex: `h_{0${n}} = h_{${n}} + \\frac{V_{${n}}^2}{2} = ${kJ(s.h.value)} + \\frac{${n4(V)}^2}{2000} \\Rightarrow T_{0${n}} = ${K(s.T0.value)},\\ p_{0${n}} = ${pressureTex(s.p0.value)}`,
      note: 'stagnation state: h0 = h + V²/2, and p0 at the same entropy (from the gas data)',
    })
  }
  return lines
}

/** The isentropic temperature reached from (T, p) at p2, as a line. */
function isentropicLine(g: FlowGas | null, T: number, p: number, p2: number, T2s: number, lhs: string, rhs: string) {
  if (g && g.constantCp) {
    const k = g.gamma(T)
    return {
      tex: `${lhs} = ${rhs} \\left(\\frac{p_{\\text{exit}}}{p_{\\text{in}}}\\right)^{(k-1)/k} = ${n4(T)} \\left(\\frac{${n4(p2 / 1000)}}{${n4(p / 1000)}}\\right)^{${n4((k - 1) / k)}} = ${K(T2s)}`,
      note: `isentropic, from ${pressureText(p)} to ${pressureText(p2)}`,
    }
  }
  return {
    tex: `s^\\circ(${lhs}) = s^\\circ(${rhs}) + R \\ln\\frac{${n4(p2 / 1000)}}{${n4(p / 1000)}} \\Rightarrow ${lhs} = ${K(T2s)}`,
    note: `isentropic, from ${pressureText(p)} to ${pressureText(p2)} (the gas data's s°(T))`,
  }
}

// ---- Nozzle and diffuser -------------------------------------------------------------

function ductSections(sol: FormattedDuct, variant: Variant, sym: Symbols): WorkedSection[] {
  const g = flowGasOf(variant, sol.template)
  const [s1, s2] = sol.states
  if (!s1 || !s2) return []
  const t = sol.totals
  const nozzle = sol.template === 'nozzle'
  const eta = t.efficiency.value
  const etaSym = nozzle ? '\\eta_N' : '\\eta_D'
  const q = t.heatIn.value
  const gas: WorkedSection = { title: 'Gas', lines: gasLines(sol, g, s1.T.value) }

  const inlet: WorkedLine[] = [stateLine(s1, `${sol.template} inlet`), ...machLines(s1, g), ...stagnationLines(s1, g)]

  const exit: WorkedLine[] = [
    {
      tex: `h_1 + \\frac{V_1^2}{2} + ${sym.Q('')} = h_2 + \\frac{V_2^2}{2}`,
      note: `steady-flow energy equation per kg: no shaft work, no change in elevation${q === 0 ? ', adiabatic' : ''}`,
    },
  ]
  const T2s = t.isentropicExitTemperature.value
  exit.push(isentropicLine(g, s1.T.value, s1.p.value, s2.p.value, T2s, 'T_{2s}', 'T_1'))
  if (g) {
    const h2s = g.h(T2s)
    exit.push(
      nozzle
        ? {
            tex: `${etaSym} = \\frac{h_1 - h_2}{h_1 - h_{2s}} \\Rightarrow h_1 - h_2 = ${n4(eta)}\\,(${kJ(s1.h.value)} - ${kJp(h2s)}) = ${E(s1.h.value - s2.h.value)}`,
            note: `nozzle isentropic efficiency ${words(eta)}, with 2s at the exit pressure`,
          }
        : {
            tex: `${etaSym} = \\frac{h_{2s} - h_1}{h_2 - h_1} \\Rightarrow h_2 - h_1 = \\frac{${kJ(h2s)} - ${kJp(s1.h.value)}}{${n4(eta)}} = ${E(s2.h.value - s1.h.value)}`,
            note: `diffuser isentropic efficiency ${words(eta)}, with 2s at the exit pressure`,
          },
    )
  }
  if (g && g.constantCp)
    exit.push({
      tex: `T_2 = T_1 + \\frac{h_2 - h_1}{c_p} = ${n4(s1.T.value)} + \\frac{${kJ(s2.h.value - s1.h.value)}}{${n4(g.cp(s1.T.value) / 1000)}} = ${K(s2.T.value)}`,
      note: 'exit temperature',
    })
  const dh = s1.h.value - s2.h.value
  exit.push({
    tex: `V_2 = \\sqrt{V_1^2 + 2(h_1 - h_2)${q !== 0 ? ` + 2${sym.Q('')}` : ''}} = \\sqrt{${n4(s1.V.value)}^2 + 2(${n4(snap(dh, 1e3))})${q !== 0 ? ` + 2${par(n4(q))}` : ''}} = ${ms(s2.V.value)}`,
    note: nozzle
      ? 'the enthalpy the gas gives up becomes kinetic energy (h in J/kg)'
      : 'the kinetic energy the gas gives up raises its enthalpy (h in J/kg)',
  })
  if (t.choked && t.backPressure) {
    const k = g ? g.gamma(s1.T0.value) : 1.4
    exit.unshift({
      tex: `\\frac{p^*}{p_{01}} = ${g && g.constantCp ? `\\left(\\frac{2}{k+1}\\right)^{k/(k-1)} = ` : ''}${n4(t.criticalPressureRatio.value)},\\quad p^* = ${pressureTex(t.criticalPressure.value)} > p_b = ${pressureTex(t.backPressure.value)}`,
      note: `a converging nozzle cannot make the flow supersonic: with the back pressure below the critical pressure${g && g.constantCp ? ` (k = ${words(k)})` : ''} the exit is choked, M2 = 1, at ${pressureText(s2.p.value)}${eta < 1 ? ' (with the losses, the pressure where the exit reaches M = 1)' : ''}; the gas expands further outside the nozzle`,
    })
  } else if (nozzle && t.shape === 'converging') {
    exit.push({
      tex: `p_2 = ${pressureTex(s2.p.value)} \\ge p^* = ${n4(t.criticalPressureRatio.value)}\\,p_{01} = ${pressureTex(t.criticalPressure.value)}`,
      note: 'the exit pressure is not below the critical pressure: a converging nozzle reaches it without choking',
    })
  }
  exit.push(stateLine(s2, `${sol.template} exit`), ...machLines(s2, g))
  if (q === 0)
    exit.push({
      tex: `T_{02} = ${K(s2.T0.value)} = T_{01},\\quad \\frac{p_{02}}{p_{01}} = ${n4(t.stagnationPressureRatio.value)}`,
      note: `adiabatic: the stagnation temperature is kept; ${eta < 1 ? 'the losses lower the stagnation pressure' : 'isentropic: so is the stagnation pressure'}`,
    })

  const flowLines: WorkedLine[] = []
  const m = t.massFlow?.value
  const R = g ? g.R : gasConstant(s1)
  if (m !== undefined) {
    if (t.inletArea)
      flowLines.push({
        tex: `\\rho_1 = \\frac{p_1}{R T_1} = ${q4(s1.density.value, 'kg/m^3')},\\quad A_1 = \\frac{\\dot m}{\\rho_1 V_1} = \\frac{${n4(m)}}{(${n4(s1.density.value)})(${n4(s1.V.value)})} = ${areaTex(t.inletArea.value)}`,
        note: `inlet area for ṁ = ${words(m)} kg/s`,
      })
    if (t.exitArea)
      flowLines.push({
        tex: `\\rho_2 = \\frac{p_2}{R T_2} = ${q4(s2.density.value, 'kg/m^3')},\\quad A_2 = \\frac{\\dot m}{\\rho_2 V_2} = \\frac{${n4(m)}}{(${n4(s2.density.value)})(${n4(s2.V.value)})} = ${areaTex(t.exitArea.value)}`,
        note: 'exit area: the same mass flow through the exit',
      })
  }
  if (t.areaRatio)
    flowLines.push({
      tex: `\\frac{A_2}{A_1} = \\frac{\\rho_1 V_1}{\\rho_2 V_2} = \\frac{(${n4(s1.density.value)})(${n4(s1.V.value)})}{(${n4(s2.density.value)})(${n4(s2.V.value)})} = ${n4(t.areaRatio.value)}`,
      note: 'continuity: ρ1A1V1 = ρ2A2V2',
    })
  if (eta === 1 && q === 0 && s2.V.value > 0) {
    // A/A*: the critical (sonic) state of this isentropic flow, from the solution's p* and T*.
    const Ts = t.criticalTemperature.value
    const ps = t.criticalPressure.value
    const rhoS = ps / (R * Ts)
    const aS = g ? Math.sqrt(g.gamma(Ts) * R * Ts) : Math.sqrt(1.4 * R * Ts)
    const ratio = (rhoS * aS) / (s2.density.value * s2.V.value)
    flowLines.push({
      tex: `\\frac{A_2}{A^*} = \\frac{\\rho^* V^*}{\\rho_2 V_2} = \\frac{(${n4(rhoS)})(${n4(aS)})}{(${n4(s2.density.value)})(${n4(s2.V.value)})} = ${n4(ratio)}`,
      note: `against the sonic throat this isentropic flow would have (T* = ${words(Ts)} K, p* = ${pressureText(ps)}, V* = a*)${g && g.constantCp ? '; the isentropic-flow table gives the same A/A* at M2' : ''}`,
    })
  }
  if (t.kineticEnergyRate)
    flowLines.push({
      tex: `\\dot m\\,\\frac{V_2^2 - V_1^2}{2} = (${n4(m ?? 0)})(${kJ(t.kineticEnergyChange.value)}) = ${powerTex(t.kineticEnergyRate.value)}`,
      note: 'rate of kinetic energy gained by the gas',
    })

  const device = sol.devices[0]
  const conv: WorkedLine[] = device
    ? [
        {
          tex: `\\text{${texEscape(sol.template)}}:\\ ${sym.Q('')} = ${E(device.q.value)},\\ ${sym.W('')} = 0`,
          note: `no shaft work; ${sym.Q('') === 'q' ? 'q' : 'Q'} is the heat into the gas${q < 0 ? ' (negative: lost to the surroundings)' : ''}. The kinetic energy and the velocities have no sign convention.`,
        },
      ]
    : []

  return [
    gas,
    { title: 'Inlet (state 1)', lines: inlet },
    { title: 'Exit (state 2)', lines: exit },
    ...(flowLines.length ? [{ title: 'Flow rate and areas', lines: flowLines }] : []),
    { title: 'In the course convention', lines: conv },
  ]
}

// ---- Turbojet ------------------------------------------------------------------------

function turbojetSections(sol: FormattedTurbojet, variant: Variant, sym: Symbols): WorkedSection[] {
  const g = flowGasOf(variant, 'turbojet')
  const inputs = specInputs(variant)
  const parsed = parseTurbojetInputs(inputs)
  const eff = {
    d: parsed.ok ? (parsed.value.diffuserEfficiency ?? 1) : 1,
    c: parsed.ok ? (parsed.value.compressorEfficiency ?? 1) : 1,
    t: parsed.ok ? (parsed.value.turbineEfficiency ?? 1) : 1,
    n: parsed.ok ? (parsed.value.nozzleEfficiency ?? 1) : 1,
    b: parsed.ok ? (parsed.value.burnerPressureRatio ?? 1) : 1,
  }
  const rp = parsed.ok ? parsed.value.pressureRatio : sol.states[2]!.p.value / sol.states[1]!.p.value
  const [s1, s2, s3, s4, s5, s6] = sol.states
  if (!s1 || !s2 || !s3 || !s4 || !s5 || !s6) return []
  const t = sol.totals
  const cp = g && g.constantCp ? g.cp(s1.T.value) : null
  const Qin = sym.Q('\\text{in}')

  const diffuser: WorkedLine[] = [
    stateLine(s1, 'ambient air entering the diffuser at the flight speed'),
    ...machLines(s1, g),
    cp !== null
      ? {
          tex: `T_2 = T_1 + \\frac{V_1^2}{2 c_p} = ${n4(s1.T.value)} + \\frac{${n4(s1.V.value)}^2}{2(${n4(cp)})} = ${K(s2.T.value)}`,
          note: 'the diffuser brings the air nearly to rest (V2 ≈ 0): h2 = h1 + V1²/2, the stagnation temperature',
        }
      : {
          tex: `h_2 = h_1 + \\frac{V_1^2}{2} = ${kJ(s1.h.value)} + \\frac{${n4(s1.V.value)}^2}{2000} = ${E(s2.h.value)} \\Rightarrow T_2 = ${K(s2.T.value)}`,
          note: 'the diffuser brings the air nearly to rest (V2 ≈ 0)',
        },
  ]
  if (g) {
    const T2s = g.TfromH(s1.h.value + eff.d * (s2.h.value - s1.h.value))
    if (eff.d < 1)
      diffuser.push({
        tex: `h_{2s} = h_1 + \\eta_D \\frac{V_1^2}{2} = ${kJ(s1.h.value)} + ${n4(eff.d)}\\,(${kJ(s2.h.value - s1.h.value)}) \\Rightarrow T_{2s} = ${K(T2s)}`,
        note: `diffuser (ram) efficiency ${words(eff.d)}: the pressure recovered is that of the isentropic temperature rise η_D·V1²/2`,
      })
    diffuser.push(
      cp !== null
        ? {
            tex: `p_2 = p_1 \\left(\\frac{T_{2${eff.d < 1 ? 's' : ''}}}{T_1}\\right)^{k/(k-1)} = ${n4(s1.p.value / 1000)} \\left(\\frac{${n4(T2s)}}{${n4(s1.T.value)}}\\right)^{${n4(g.gamma(s1.T.value) / (g.gamma(s1.T.value) - 1))}} = ${pressureTex(s2.p.value)}`,
            note: 'the ram pressure rise, isentropic relation',
          }
        : {
            tex: `p_2 = ${pressureTex(s2.p.value)}`,
            note: `isentropic from state 1 to ${words(T2s)} K (the gas data's s°(T))`,
          },
    )
  }

  const compressor: WorkedLine[] = [
    {
      tex: `p_3 = r_p\\,p_2 = (${n4(rp)})(${n4(s2.p.value / 1000)}) = ${pressureTex(s3.p.value)}`,
      note: `compressor pressure ratio ${words(rp)}`,
    },
  ]
  const wc = t.compressorWork.value
  if (g) {
    const T3s = g.isentropicTfromP(s2.T.value, s2.p.value, s3.p.value)
    compressor.push(isentropicLine(g, s2.T.value, s2.p.value, s3.p.value, T3s, 'T_{3s}', 'T_2'))
    if (eff.c < 1)
      compressor.push({
        tex: `h_3 = h_2 + \\frac{h_{3s} - h_2}{\\eta_c} = ${kJ(s2.h.value)} + \\frac{${kJ(g.h(T3s))} - ${kJp(s2.h.value)}}{${n4(eff.c)}} = ${E(s3.h.value)} \\Rightarrow T_3 = ${K(s3.T.value)}`,
        note: `compressor isentropic efficiency ${words(eff.c)}`,
      })
  }
  compressor.push({
    tex: `${sym.W('\\text{c,in}')} = h_3 - h_2 = ${kJ(s3.h.value)} - ${kJp(s2.h.value)} = ${E(wc)}`,
    note: 'compressor work input per kg of air (adiabatic, velocities negligible)',
  })

  const burner: WorkedLine[] = [
    {
      tex: `p_4 = ${eff.b !== 1 ? `${n4(eff.b)}\\,p_3 = ` : 'p_3 = '}${pressureTex(s4.p.value)},\\quad T_4 = ${K(s4.T.value)}`,
      note: eff.b !== 1 ? `burner pressure ratio ${words(eff.b)}` : 'the burner adds heat at constant pressure',
    },
    {
      tex: `${Qin} = h_4 - h_3 = ${kJ(s4.h.value)} - ${kJp(s3.h.value)} = ${E(t.heatIn.value)}`,
      note: 'heat added per kg of air (air standard: the fuel’s mass is not added to the flow)',
    },
  ]

  const wt = t.turbineWork.value
  const turbine: WorkedLine[] = [
    {
      tex: `${sym.W('\\text{t,out}')} = ${sym.W('\\text{c,in}')} \\Rightarrow h_5 = h_4 - (h_3 - h_2) = ${kJ(s4.h.value)} - ${kJp(wc)} = ${E(s5.h.value)} \\Rightarrow T_5 = ${K(s5.T.value)}`,
      note: 'the turbine only drives the compressor: its work output equals the compressor’s input',
    },
  ]
  if (g) {
    const T5s = g.TfromH(s4.h.value - wt / eff.t)
    if (eff.t < 1)
      turbine.push({
        tex: `h_{5s} = h_4 - \\frac{h_4 - h_5}{\\eta_t} = ${kJ(s4.h.value)} - \\frac{${kJ(wt)}}{${n4(eff.t)}} \\Rightarrow T_{5s} = ${K(T5s)}`,
        note: `turbine isentropic efficiency ${words(eff.t)}: the exit pressure is that of the isentropic expansion`,
      })
    turbine.push(
      cp !== null
        ? {
            tex: `p_5 = p_4 \\left(\\frac{T_{5${eff.t < 1 ? 's' : ''}}}{T_4}\\right)^{k/(k-1)} = ${n4(s4.p.value / 1000)} \\left(\\frac{${n4(T5s)}}{${n4(s4.T.value)}}\\right)^{${n4(g.gamma(s4.T.value) / (g.gamma(s4.T.value) - 1))}} = ${pressureTex(s5.p.value)}`,
            note: 'turbine exit pressure, isentropic relation',
          }
        : { tex: `p_5 = ${pressureTex(s5.p.value)}`, note: `isentropic from state 4 to ${words(T5s)} K` },
    )
  }

  const nozzle: WorkedLine[] = []
  if (g) {
    const T6s = g.isentropicTfromP(s5.T.value, s5.p.value, s6.p.value)
    nozzle.push(isentropicLine(g, s5.T.value, s5.p.value, s6.p.value, T6s, 'T_{6s}', 'T_5'))
    if (eff.n < 1)
      nozzle.push({
        tex: `h_6 = h_5 - \\eta_N (h_5 - h_{6s}) = ${kJ(s5.h.value)} - ${n4(eff.n)}\\,(${kJ(s5.h.value)} - ${kJp(g.h(T6s))}) = ${E(s6.h.value)} \\Rightarrow T_6 = ${K(s6.T.value)}`,
        note: `nozzle isentropic efficiency ${words(eff.n)}`,
      })
  }
  nozzle.push({
    tex: `V_6 = \\sqrt{2(h_5 - h_6)} = \\sqrt{2(${n4(snap(s5.h.value - s6.h.value, 1e3))})} = ${ms(s6.V.value)}`,
    note: 'the nozzle expands to the ambient pressure, p6 = p1; steady-flow energy equation with V5 ≈ 0 (h in J/kg)',
  })
  nozzle.push(stateLine(s6, 'nozzle exit'), ...machLines(s6, g))

  const V1 = s1.V.value
  const V6 = s6.V.value
  const perf: WorkedLine[] = [
    {
      tex: `\\frac{F}{\\dot m} = V_6 - V_1 = ${n4(V6)} - ${n4(V1)} = ${q4(t.specificThrust.value, 'N s/kg')}`,
      note: 'specific thrust: the momentum the engine adds to each kg of air (the nozzle is fully expanded, so there is no pressure thrust)',
    },
  ]
  const m = t.massFlow?.value
  if (m !== undefined && t.thrust && t.propulsivePower && t.heatRate) {
    perf.push(
      {
        tex: `F = \\dot m (V_6 - V_1) = (${n4(m)})(${n4(V6 - V1)}) = ${forceTex(t.thrust.value)}`,
        note: 'thrust',
      },
      {
        tex: `\\dot W_P = F V_1 = (${n4(t.thrust.value)})(${n4(V1)}) = ${powerTex(t.propulsivePower.value)}`,
        note: 'propulsive power: the thrust times the flight speed',
      },
      {
        tex: `\\dot Q_{\\text{in}} = \\dot m\\,${Qin} = (${n4(m)})(${kJ(t.heatIn.value)}) = ${powerTex(t.heatRate.value)}`,
        note: 'rate of heat added in the burner',
      },
    )
    if (t.compressorPower)
      perf.push({
        tex: `\\dot W_{\\text{c,in}} = \\dot m\\,${sym.W('\\text{c,in}')} = (${n4(m)})(${kJ(wc)}) = ${powerTex(t.compressorPower.value)}`,
        note: 'compressor power, supplied by the turbine',
      })
  } else {
    perf.push({
      tex: `w_P = \\frac{F}{\\dot m} V_1 = (${n4(t.specificThrust.value)})(${n4(V1)}) = ${E(t.propulsiveWork.value)}`,
      note: 'propulsive work per kg of air',
    })
  }
  perf.push(
    {
      tex: `\\eta_{\\text{th}} = \\frac{(V_6^2 - V_1^2)/2}{${Qin}} = \\frac{${kJ(t.kineticEnergyGain.value)}}{${kJ(t.heatIn.value)}} = ${n4(t.thermalEfficiency.value)}`,
      note: 'thermal efficiency: the kinetic energy gained per heat added',
    },
    {
      tex: `\\eta_P = \\frac{F V_1}{\\dot m (V_6^2 - V_1^2)/2} = \\frac{2 V_1}{V_1 + V_6} = \\frac{2(${n4(V1)})}{${n4(V1)} + ${n4(V6)}} = ${n4(t.propulsiveEfficiency.value)}`,
      note: 'propulsive (Froude) efficiency: the propulsive power per kinetic energy gained',
    },
    {
      tex: `\\eta_o = \\frac{\\dot W_P}{\\dot Q_{\\text{in}}} = \\eta_P\\,\\eta_{\\text{th}} = (${n4(t.propulsiveEfficiency.value)})(${n4(t.thermalEfficiency.value)}) = ${n4(t.overallEfficiency.value)}`,
      note: 'overall efficiency (the ratio some texts call the propulsive efficiency)',
    },
  )
  if (t.fuelAirRatio)
    perf.push({
      tex: `f = ${n4(t.fuelAirRatio.value)}${t.fuelFlow ? `,\\quad \\dot m_f = f\\,\\dot m = ${q4(t.fuelFlow.value, 'kg/s')}` : ''}`,
      note: 'fuel per kg of air: the heat added over the burner efficiency times the heating value',
    })

  const conv: WorkedLine[] = [
    {
      tex: `\\text{compressor}:\\ ${sym.W('')} = ${E(sol.devices[1]?.w.value ?? Number.NaN)},\\quad \\text{turbine}:\\ ${sym.W('')} = ${E(sol.devices[3]?.w.value ?? Number.NaN)}`,
      note:
        sym.convention === 'chemistry'
          ? 'w is work done ON the air: the compressor’s is positive, the turbine’s negative; they cancel'
          : 'W is work done BY the air: the compressor’s is negative, the turbine’s positive; they cancel',
    },
    {
      tex: `\\text{burner}:\\ ${sym.Q('')} = ${E(sol.devices[2]?.q.value ?? Number.NaN)}`,
      note: 'heat into the air; the diffuser and nozzle exchange no work or heat. Thrust, velocities and kinetic energy have no sign convention.',
    },
  ]

  return [
    { title: 'Gas', lines: gasLines(sol, g, s1.T.value) },
    { title: 'Diffuser (1 → 2)', lines: diffuser },
    { title: 'Compressor (2 → 3)', lines: compressor },
    { title: 'Burner (3 → 4)', lines: burner },
    { title: 'Turbine (4 → 5)', lines: turbine },
    { title: 'Nozzle (5 → 6)', lines: nozzle },
    { title: 'Thrust and efficiencies', lines: perf },
    { title: 'In the course convention', lines: conv },
  ]
}

/** The sections of a nozzle's, diffuser's or turbojet's worked solution. */
export function steadyFlowSections(sol: FormattedFlow, variant: Variant, sym: Symbols): WorkedSection[] {
  return sol.template === 'turbojet' ? turbojetSections(sol, variant, sym) : ductSections(sol, variant, sym)
}

/** The convention section's extra line: the steady-flow energy equation with kinetic energy. */
export function kineticEnergyLine(sym: Symbols): WorkedLine {
  return sym.convention === 'chemistry'
    ? {
        tex: '\\Delta\\left(h + \\tfrac{V^2}{2}\\right) = q + w',
        note: 'with kinetic energy, per kg of gas flowing (w: shaft work done on the gas)',
      }
    : {
        tex: '\\Delta\\left(h + \\tfrac{V^2}{2}\\right) = Q - W',
        note: 'with kinetic energy, per kg of gas flowing (W: shaft work done by the gas)',
      }
}
