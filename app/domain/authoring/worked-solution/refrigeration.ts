/** The worked solution of a vapour-compression cycle from the refrigerant's equation of state. Pure. */
import { parseVapourCompressionInputs } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { FormattedRefrigeration } from '#app/domain/thermo/refrigerants/refrigeration-template.ts'
import type { Refrigerant } from '#app/domain/thermo/refrigerants/index.ts'
import { type Variant } from '../definition.ts'
import { formatNumber, texEscape } from '../placeholders.ts'
import { refrigerantOf } from '../refrigeration-diagrams.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'
import { snap, sub, pressureText, pressureTex, n4, q4, specInputs } from './common.ts'
import type { Symbols } from './common.ts'

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

export function refrigerantStateLine(s: FormattedRefrigeration['states'][number]): WorkedLine {
  const n = sub(s.name)
  const x = s.x !== null ? `,\\ x_{${n}} = ${n4(s.x)}` : ''
  return {
    tex: `p_{${n}} = ${pressureTex(s.p.value)},\\ T_{${n}} = ${q4(s.T.value, 'K')}\\ (${q4(s.T.value - 273.15, '°C')}),\\ h_{${n}} = ${q4(s.h.value / 1000, 'kJ/kg')},\\ s_{${n}} = ${q4(s.s.value / 1000, 'kJ/(kg K)')}${x}`,
    note: `state ${s.name}: ${s.description} (${s.phase})`,
  }
}

export function refrigerationSections(sol: FormattedRefrigeration, variant: Variant, sym: Symbols): WorkedSection[] {
  const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
  const kJ = (x: number) => n4(x / 1000)
  const parsed = parseVapourCompressionInputs(specInputs(variant))
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
