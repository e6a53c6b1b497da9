/**
 * The worked solutions of the two-stage (flash chamber) and cascade vapour-compression cycles,
 * from the refrigerants' equations of state. Every number is the variant's solution's (its
 * states and totals); the isentropic exit state of a compressor with an efficiency below one is
 * the one number read from the equation of state here, as the single-stage solution does. Pure.
 *
 * Two-stage (states 1–9 as the solver numbers them, per kg through the condenser): throttling
 * h6 = h5, the flash chamber's vapour fraction x6 = (h6 − h7)/(h9 − h7), h8 = h7, the mixing
 * chamber h3 = x6 h9 + (1 − x6) h2, each compressor with its efficiency, q_L = (1 − x6)(h1 − h8),
 * w = (1 − x6)(h2 − h1) + (h4 − h3), COP. Cascade (lower cycle B states 1–4, upper cycle A
 * states 5–8, per kg of the lower cycle's refrigerant): the adiabatic exchanger's balance
 * ṁ_A (h5 − h8) = ṁ_B (h2 − h3), each cycle's work, COP.
 */
import { parseCascadeInputs, parseTwoStageInputs } from '#app/domain/thermo/refrigerants/multi-stage-template.ts'
import type {
  FormattedCascade,
  FormattedState,
  FormattedTwoStage,
} from '#app/domain/thermo/refrigerants/multi-stage-template.ts'
import type { Refrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import { type Variant } from '../definition.ts'
import { formatNumber, texEscape } from '../placeholders.ts'
import { refrigerantOf } from '../refrigeration-diagrams.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'
import { n4, pressureText, q4, snap, specInputs, sub } from './common.ts'
import { hasLength } from '../tuple.ts'
import type { Symbols } from './common.ts'
import { refrigerantStateLine, shortSource } from './refrigeration.ts'

const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
const kJ = (x: number) => n4(x / 1000)
const kW = (x: number) => q4(x / 1000, 'kW')
const fluidNameOf = (substance: string) => substance.replace(/\s*\(.*\)\s*$/, '')
const n = (s: { name: string }) => sub(s.name)

function fluidLines(fluids: readonly { what: string; f: Refrigerant | null; name: string }[]): WorkedLine[] {
  return [
    ...fluids.map(({ what, f, name }) => ({
      tex: '',
      note: `${what}${name}: properties from the equation of state of ${f ? shortSource(f.source) : 'its published equation of state'}.`,
    })),
    {
      tex: '',
      note: 'Enthalpy and entropy are measured from the IIR reference state (h = 200 kJ/kg and s = 1 kJ/(kg K) for saturated liquid at 0 °C); tables with another zero differ by a constant, and differences agree.',
    },
  ]
}

/**
 * A compressor from `inlet` to `exit`: isentropic (s_exit = s_inlet), or from the isentropic exit
 * state at the exit pressure and the efficiency, h = h_in + (h_s − h_in)/η.
 */
function compressorLines(
  f: Refrigerant | null,
  inlet: FormattedState,
  exit: FormattedState,
  eta: number | null,
  name: string,
  etaTex: string,
): WorkedLine[] {
  if (eta !== null && eta < 1) {
    const iso = f ? f.statePS(exit.p.value, inlet.s.value) : null
    if (iso && iso.ok) {
      const hs = iso.value.h
      return [
        {
          tex: `s_{${n(exit)}s} = s_{${n(inlet)}} = ${q4(inlet.s.value / 1000, 'kJ/(kg K)')},\\quad h_{${n(exit)}s} = ${q4(hs / 1000, 'kJ/kg')}`,
          note: `the ${name}'s isentropic exit at ${pressureText(exit.p.value)}`,
        },
        {
          tex: `h_{${n(exit)}} = h_{${n(inlet)}} + \\frac{h_{${n(exit)}s} - h_{${n(inlet)}}}{${etaTex}} = ${kJ(inlet.h.value)} + \\frac{${kJ(hs)} - ${kJ(inlet.h.value)}}{${n4(eta)}} = ${E(exit.h.value)}`,
          note: `${name} isentropic efficiency ${formatNumber(eta, { sigFigs: WORKED_SIG_FIGS }, false)}`,
        },
      ]
    }
    return []
  }
  return [
    {
      tex: `s_{${n(exit)}} = s_{${n(inlet)}} = ${q4(inlet.s.value / 1000, 'kJ/(kg K)')}`,
      note: `isentropic ${name}: state ${exit.name} from its pressure and this entropy`,
    },
  ]
}

/** h_out = h_in through a valve, and the quality of the mixture it gives from h_f and h_fg at its pressure. */
function valveLines(
  f: Refrigerant | null,
  inlet: FormattedState,
  exit: FormattedState,
  name: string,
  quality = true,
): WorkedLine[] {
  const out: WorkedLine[] = [
    {
      tex: `h_{${n(exit)}} = h_{${n(inlet)}} = ${E(inlet.h.value)}`,
      note: `${name}: no work and no heat, so the enthalpy does not change`,
    },
  ]
  const sat = quality && f ? f.saturationP(exit.p.value) : null
  if (quality && sat && sat.ok && exit.x !== null) {
    const hf = sat.value.liquid.h
    const hfg = sat.value.vapour.h - hf
    out.push({
      tex: `x_{${n(exit)}} = \\frac{h_{${n(exit)}} - h_f}{h_{fg}} = \\frac{${kJ(exit.h.value)} - ${kJ(hf)}}{${kJ(hfg)}} = ${n4(exit.x)}`,
      note: `a liquid–vapour mixture: quality from the saturation properties at ${pressureText(exit.p.value)}`,
    })
  }
  return out
}

function conventionLines(devices: FormattedTwoStage['devices'], sym: Symbols): WorkedLine[] {
  return devices.map((d) => ({
    tex: `\\text{${texEscape(d.device)}}:\\ ${sym.Q('')} = ${E(d.q.value)},\\ ${sym.W('')} = ${E(d.w.value)}`,
    note:
      sym.convention === 'chemistry'
        ? 'w is work done ON the refrigerant (a compressor’s is positive); q is heat into it'
        : 'W is work done BY the refrigerant (a compressor’s is negative); Q is heat into it',
  }))
}

/**
 * COP_Carnot = T_L/(T_H − T_L) between the saturation temperatures of the outer evaporator and
 * condenser: T_L from a wet state at the evaporator pressure (the evaporator exit may be
 * superheated), T_H from the solver's Carnot COP (the condenser exit may be subcooled).
 */
function carnotLine(TL: number, carnot: number): WorkedLine | null {
  const TH = carnot > 0 ? TL * (1 + 1 / carnot) : Number.NaN
  if (!(TH > TL) || !Number.isFinite(carnot)) return null
  return {
    tex: `\\mathrm{COP}_{R,\\text{Carnot}} = \\frac{T_L}{T_H - T_L} = \\frac{${n4(TL)}}{${n4(TH)} - ${n4(TL)}} = ${n4(carnot)}`,
    note: 'the Carnot bound between the evaporating and the condensing temperatures of the outer heat exchangers, in K',
  }
}

// ---- Two-stage compression with a flash chamber ----------------------------------------------

export function twoStageSections(sol: FormattedTwoStage, variant: Variant, sym: Symbols): WorkedSection[] {
  const parsed = parseTwoStageInputs(specInputs(variant))
  const f: Refrigerant | null = parsed.ok ? parsed.value.refrigerant : refrigerantOf(sol.substance)
  const etaL = parsed.ok ? (parsed.value.lowStageEfficiency ?? 1) : null
  const etaH = parsed.ok ? (parsed.value.highStageEfficiency ?? 1) : null
  const fluidName = fluidNameOf(sol.substance)
  const refrigerant = { title: 'Refrigerant', lines: fluidLines([{ what: '', f, name: sol.substance }]) }
  const st = sol.states
  if (!hasLength(st, 9)) return [refrigerant, { title: `States (${fluidName})`, lines: st.map(refrigerantStateLine) }]
  const [s1, s2, s3, s4, s5, s6, s7, s8, s9] = st
  const t = sol.totals
  const x6 = t.flashVapourFraction.value
  const m = t.lowToHighMassRatio.value
  const QL = sym.Q('L')
  const QH = sym.Q('H')
  const Wlow = sym.W('\\text{low,in}')
  const Whigh = sym.W('\\text{high,in}')
  const Win = sym.W('\\text{in}')

  const states: WorkedLine[] = [
    refrigerantStateLine(s1),
    ...compressorLines(f, s1, s2, etaL, 'low-stage compressor', '\\eta_{\\text{low}}'),
    refrigerantStateLine(s2),
    refrigerantStateLine(s5),
    // its quality x6 is the flash chamber's vapour fraction, below
    ...valveLines(f, s5, s6, 'high-pressure valve', false),
    refrigerantStateLine(s6),
    refrigerantStateLine(s7),
    refrigerantStateLine(s9),
    {
      tex: `x_{${n(s6)}} = \\frac{h_{${n(s6)}} - h_{${n(s7)}}}{h_{${n(s9)}} - h_{${n(s7)}}} = \\frac{${kJ(s6.h.value)} - ${kJ(s7.h.value)}}{${kJ(s9.h.value)} - ${kJ(s7.h.value)}} = ${n4(x6)}`,
      note: 'flash chamber: of each kg entering it, x6 leaves as saturated vapour (9) and 1 − x6 as saturated liquid (7)',
    },
    ...valveLines(f, s7, s8, 'low-pressure valve'),
    refrigerantStateLine(s8),
    {
      tex: `h_{${n(s3)}} = x_{${n(s6)}}\\,h_{${n(s9)}} + (1 - x_{${n(s6)}})\\,h_{${n(s2)}} = (${n4(x6)})(${kJ(s9.h.value)}) + (${n4(m)})(${kJ(s2.h.value)}) = ${E(s3.h.value)}`,
      note: 'mixing chamber (adiabatic, no work): the flash vapour and the low-stage discharge leave together at the intermediate pressure',
    },
    refrigerantStateLine(s3),
    ...compressorLines(f, s3, s4, etaH, 'high-stage compressor', '\\eta_{\\text{high}}'),
    refrigerantStateLine(s4),
  ]

  const qL = t.refrigerationEffect.value
  const wLow = t.lowStageWork.value
  const wHigh = t.highStageWork.value
  const w = t.compressorWork.value
  const qH = t.heatRejected.value
  const devices: WorkedLine[] = [
    {
      tex: `\\frac{\\dot m_{\\text{low}}}{\\dot m_{\\text{high}}} = 1 - x_{${n(s6)}} = ${n4(m)}`,
      note: 'kg through the evaporator and the low-stage compressor per kg through the condenser',
    },
    {
      tex: `${QL} = (1 - x_{${n(s6)}})(h_{${n(s1)}} - h_{${n(s8)}}) = (${n4(m)})(${kJ(s1.h.value)} - ${kJ(s8.h.value)}) = ${E(qL)}`,
      note: 'evaporator: the refrigeration effect, heat taken in from the cold space',
    },
    {
      tex: `${Wlow} = (1 - x_{${n(s6)}})(h_{${n(s2)}} - h_{${n(s1)}}) = (${n4(m)})(${kJ(s2.h.value)} - ${kJ(s1.h.value)}) = ${E(wLow)}`,
      note: 'adiabatic low-stage compressor: its work input is the rise in enthalpy of the flow through it',
    },
    {
      tex: `${Whigh} = h_{${n(s4)}} - h_{${n(s3)}} = ${kJ(s4.h.value)} - ${kJ(s3.h.value)} = ${E(wHigh)}`,
      note: 'adiabatic high-stage compressor, which takes the whole flow',
    },
    {
      tex: `${Win} = ${Wlow} + ${Whigh} = ${kJ(wLow)} + ${kJ(wHigh)} = ${E(w)}`,
      note: 'the work input of both compressors',
    },
    {
      tex: `${QH} = h_{${n(s4)}} - h_{${n(s5)}} = ${kJ(s4.h.value)} - ${kJ(s5.h.value)} = ${E(qH)}`,
      note: 'condenser: the heat rejected',
    },
    {
      tex: `${QH} = ${QL} + ${Win} = ${kJ(qL)} + ${kJ(w)} = ${E(qL + w)}`,
      note: 'check: over the cycle the heat rejected is the heat taken in plus the work put in',
    },
  ]

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
  const carnot = carnotLine(s8.T.value, t.carnotCopRefrigerator.value)
  if (carnot) perf.push(carnot)
  const mHigh = t.highStageMassFlow?.value
  const mLow = t.lowStageMassFlow?.value
  if (mHigh !== undefined && mLow !== undefined && t.capacity) {
    const given = parsed.ok ? parsed.value : null
    if (given?.capacity !== undefined)
      perf.push({
        tex: `\\dot m_{\\text{high}} = \\frac{\\dot Q_L}{${QL}} = \\frac{${kW(t.capacity.value)}}{${E(qL)}} = ${q4(mHigh, 'kg/s')}`,
        note: 'the flow through the condenser that gives the refrigeration capacity',
      })
    else if (given?.lowStageMassFlow !== undefined)
      perf.push({
        tex: `\\dot m_{\\text{high}} = \\frac{\\dot m_{\\text{low}}}{1 - x_{${n(s6)}}} = \\frac{${n4(mLow)}}{${n4(m)}} = ${q4(mHigh, 'kg/s')}`,
        note: 'the flow through the condenser, from the flow through the evaporator',
      })
    else perf.push({ tex: `\\dot m_{\\text{high}} = ${q4(mHigh, 'kg/s')}`, note: 'the flow through the condenser' })
    if (given?.lowStageMassFlow === undefined)
      perf.push({
        tex: `\\dot m_{\\text{low}} = (1 - x_{${n(s6)}})\\,\\dot m_{\\text{high}} = (${n4(m)})(${n4(mHigh)}) = ${q4(mLow, 'kg/s')}`,
        note: 'the flow through the evaporator and the low-stage compressor',
      })
    if (given?.capacity === undefined)
      perf.push({
        tex: `\\dot Q_L = \\dot m_{\\text{high}}\\,${QL} = (${n4(mHigh)})(${kJ(qL)}) = ${kW(t.capacity.value)}`,
        note: 'refrigeration capacity',
      })
    if (t.lowStagePower && t.highStagePower && t.compressorPower)
      perf.push(
        {
          tex: `\\dot W_{\\text{low,in}} = \\dot m_{\\text{high}}\\,${Wlow} = ${kW(t.lowStagePower.value)},\\quad \\dot W_{\\text{high,in}} = \\dot m_{\\text{high}}\\,${Whigh} = ${kW(t.highStagePower.value)}`,
          note: 'each compressor’s power input',
        },
        {
          tex: `\\dot W_{\\text{in}} = \\dot m_{\\text{high}}\\,${Win} = (${n4(mHigh)})(${kJ(w)}) = ${kW(t.compressorPower.value)}`,
          note: 'the power input of both compressors',
        },
      )
    if (t.heatRejectionRate)
      perf.push({
        tex: `\\dot Q_H = \\dot m_{\\text{high}}\\,${QH} = (${n4(mHigh)})(${kJ(qH)}) = ${kW(t.heatRejectionRate.value)}`,
        note: 'rate of heat rejection',
      })
  }
  return [
    refrigerant,
    { title: `States (${fluidName})`, lines: states },
    { title: 'Devices (per kg through the condenser)', lines: devices },
    { title: 'In the course convention', lines: conventionLines(sol.devices, sym) },
    { title: 'Performance', lines: perf },
  ]
}

// ---- Cascade ---------------------------------------------------------------------------------

function cycleStateLines(
  f: Refrigerant | null,
  [a, b, c, d]: readonly [FormattedState, FormattedState, FormattedState, FormattedState],
  eta: number | null,
  which: string,
): WorkedLine[] {
  return [
    refrigerantStateLine(a),
    ...compressorLines(f, a, b, eta, `${which}-cycle compressor`, `\\eta_{${which === 'lower' ? 'B' : 'A'}}`),
    refrigerantStateLine(b),
    refrigerantStateLine(c),
    ...valveLines(f, c, d, `${which}-cycle valve`),
    refrigerantStateLine(d),
  ]
}

export function cascadeSections(sol: FormattedCascade, variant: Variant, sym: Symbols): WorkedSection[] {
  const parsed = parseCascadeInputs(specInputs(variant))
  const fl = parsed.ok ? parsed.value.lowerRefrigerant : null
  const fu = parsed.ok ? parsed.value.upperRefrigerant : null
  const etaB = parsed.ok ? (parsed.value.lowerEfficiency ?? 1) : null
  const etaA = parsed.ok ? (parsed.value.upperEfficiency ?? 1) : null
  const lowerName = fl ? fl.name : (sol.states[0]?.refrigerant ?? 'the lower refrigerant')
  const upperName = fu ? fu.name : (sol.states[4]?.refrigerant ?? 'the upper refrigerant')
  const refrigerants = {
    title: 'Refrigerants',
    lines: fluidLines([
      { what: 'Lower cycle B: ', f: fl, name: lowerName },
      { what: 'Upper cycle A: ', f: fu, name: upperName },
    ]),
  }
  const st = sol.states
  if (!hasLength(st, 8)) return [refrigerants, { title: 'States', lines: st.map(refrigerantStateLine) }]
  const [s1, s2, s3, s4, s5, s6, s7, s8] = st
  const t = sol.totals
  const ratio = t.massFlowRatio.value
  const QL = sym.Q('L')
  const QH = sym.Q('H')
  const WB = sym.W('\\text{B,in}')
  const WA = sym.W('\\text{A,in}')
  const Win = sym.W('\\text{in}')

  const exchanger: WorkedLine[] = [
    {
      tex: `\\dot m_A\\,(h_{${n(s5)}} - h_{${n(s8)}}) = \\dot m_B\\,(h_{${n(s2)}} - h_{${n(s3)}})`,
      note: 'cascade heat exchanger, adiabatic as a whole: the heat the lower cycle B rejects is the heat the upper cycle A takes in',
    },
    {
      tex: `\\frac{\\dot m_A}{\\dot m_B} = \\frac{h_{${n(s2)}} - h_{${n(s3)}}}{h_{${n(s5)}} - h_{${n(s8)}}} = \\frac{${kJ(s2.h.value)} - ${kJ(s3.h.value)}}{${kJ(s5.h.value)} - ${kJ(s8.h.value)}} = ${n4(ratio)}`,
      note: 'kg of the upper cycle’s refrigerant per kg of the lower cycle’s',
    },
    {
      tex: `\\Delta T = T_{${n(s3)}} - T_{${n(s5)}} = ${n4(s3.T.value)} - ${n4(s5.T.value)} = ${q4(snap(t.exchangerTemperatureDifference.value, 1), 'K')}`,
      note: 'the lower cycle condenses at least as warm as the upper cycle evaporates, so heat can flow from B to A (equal is the ideal limit)',
    },
  ]

  const qL = t.refrigerationEffect.value
  const wB = t.lowerCompressorWork.value
  const wA = t.upperCompressorWork.value
  const w = t.compressorWork.value
  const qH = t.heatRejected.value
  const devices: WorkedLine[] = [
    {
      tex: `${QL} = h_{${n(s1)}} - h_{${n(s4)}} = ${kJ(s1.h.value)} - ${kJ(s4.h.value)} = ${E(qL)}`,
      note: 'evaporator of the lower cycle: the refrigeration effect, heat taken in from the cold space',
    },
    {
      tex: `${WB} = h_{${n(s2)}} - h_{${n(s1)}} = ${kJ(s2.h.value)} - ${kJ(s1.h.value)} = ${E(wB)}`,
      note: 'lower-cycle compressor (adiabatic): the rise in enthalpy',
    },
    {
      tex: `${WA} = \\frac{\\dot m_A}{\\dot m_B}(h_{${n(s6)}} - h_{${n(s5)}}) = (${n4(ratio)})(${kJ(s6.h.value)} - ${kJ(s5.h.value)}) = ${E(wA)}`,
      note: 'upper-cycle compressor, per kg of the lower cycle’s refrigerant',
    },
    {
      tex: `${Win} = ${WB} + ${WA} = ${kJ(wB)} + ${kJ(wA)} = ${E(w)}`,
      note: 'the work input of both compressors',
    },
    {
      tex: `${QH} = \\frac{\\dot m_A}{\\dot m_B}(h_{${n(s6)}} - h_{${n(s7)}}) = (${n4(ratio)})(${kJ(s6.h.value)} - ${kJ(s7.h.value)}) = ${E(qH)}`,
      note: 'condenser of the upper cycle: the heat rejected to the surroundings',
    },
    {
      tex: `${QH} = ${QL} + ${Win} = ${kJ(qL)} + ${kJ(w)} = ${E(qL + w)}`,
      note: 'check: over the whole system the heat rejected is the heat taken in plus the work put in',
    },
  ]

  const perf: WorkedLine[] = [
    {
      tex: `\\mathrm{COP}_R = \\frac{${QL}}{${Win}} = \\frac{${kJ(qL)}}{${kJ(w)}} = ${n4(t.copRefrigerator.value)}`,
      note: 'coefficient of performance of the cascade as a refrigerator',
    },
    {
      tex: `\\mathrm{COP}_B = \\frac{h_{${n(s1)}} - h_{${n(s4)}}}{h_{${n(s2)}} - h_{${n(s1)}}} = ${n4(t.lowerCycleCop.value)},\\quad \\mathrm{COP}_A = \\frac{h_{${n(s5)}} - h_{${n(s8)}}}{h_{${n(s6)}} - h_{${n(s5)}}} = ${n4(t.upperCycleCop.value)}`,
      note: 'each cycle on its own; the cascade’s COP is below both, as the work of both compressors buys the one refrigeration effect',
    },
  ]
  const carnot = carnotLine(s4.T.value, t.carnotCopRefrigerator.value)
  if (carnot) perf.push(carnot)
  const mB = t.lowerMassFlow?.value
  const mA = t.upperMassFlow?.value
  if (mB !== undefined && mA !== undefined && t.capacity) {
    const given = parsed.ok ? parsed.value : null
    if (given?.capacity !== undefined)
      perf.push({
        tex: `\\dot m_B = \\frac{\\dot Q_L}{${QL}} = \\frac{${kW(t.capacity.value)}}{${E(qL)}} = ${q4(mB, 'kg/s')}`,
        note: 'the lower cycle’s flow that gives the refrigeration capacity',
      })
    else if (given?.upperMassFlow !== undefined)
      perf.push({
        tex: `\\dot m_B = \\frac{\\dot m_A}{\\dot m_A/\\dot m_B} = \\frac{${n4(mA)}}{${n4(ratio)}} = ${q4(mB, 'kg/s')}`,
        note: 'the lower cycle’s flow, from the upper cycle’s and the exchanger’s balance',
      })
    else perf.push({ tex: `\\dot m_B = ${q4(mB, 'kg/s')}`, note: 'the lower cycle’s refrigerant mass flow rate' })
    if (given?.upperMassFlow === undefined)
      perf.push({
        tex: `\\dot m_A = \\frac{\\dot m_A}{\\dot m_B}\\,\\dot m_B = (${n4(ratio)})(${n4(mB)}) = ${q4(mA, 'kg/s')}`,
        note: 'the upper cycle’s refrigerant mass flow rate',
      })
    if (given?.capacity === undefined)
      perf.push({
        tex: `\\dot Q_L = \\dot m_B\\,${QL} = (${n4(mB)})(${kJ(qL)}) = ${kW(t.capacity.value)}`,
        note: 'refrigeration capacity',
      })
    if (t.lowerCompressorPower && t.upperCompressorPower && t.compressorPower)
      perf.push(
        {
          tex: `\\dot W_{\\text{B,in}} = \\dot m_B\\,${WB} = ${kW(t.lowerCompressorPower.value)},\\quad \\dot W_{\\text{A,in}} = \\dot m_B\\,${WA} = ${kW(t.upperCompressorPower.value)}`,
          note: 'each compressor’s power input',
        },
        {
          tex: `\\dot W_{\\text{in}} = \\dot m_B\\,${Win} = (${n4(mB)})(${kJ(w)}) = ${kW(t.compressorPower.value)}`,
          note: 'the power input of both compressors',
        },
      )
    if (t.heatRejectionRate)
      perf.push({
        tex: `\\dot Q_H = \\dot m_B\\,${QH} = (${n4(mB)})(${kJ(qH)}) = ${kW(t.heatRejectionRate.value)}`,
        note: 'rate of heat rejection',
      })
  }
  return [
    refrigerants,
    {
      title: `Lower cycle B (${fluidNameOf(lowerName)})`,
      lines: cycleStateLines(fl, [s1, s2, s3, s4], etaB, 'lower'),
    },
    {
      title: `Upper cycle A (${fluidNameOf(upperName)})`,
      lines: cycleStateLines(fu, [s5, s6, s7, s8], etaA, 'upper'),
    },
    { title: 'Cascade heat exchanger', lines: exchanger },
    { title: 'Devices (per kg of the lower cycle’s refrigerant)', lines: devices },
    { title: 'In the course convention', lines: conventionLines(sol.devices, sym) },
    { title: 'Performance', lines: perf },
  ]
}
