/**
 * The device lines of a steam plant's worked solution (rankine-feedwater, rankine-cogeneration):
 * each feedwater heater's mass and energy balance with the variant's numbers (open: mixing;
 * closed: the bleed condenses, its drain goes backward through a trap or is pumped forward,
 * the feedwater leaves at T_sat − TTD), the bleed fractions, every pump, each turbine section
 * with the flow passing it, the reheater, the condenser and the process heater. Every number is
 * the solution's own (its states' enthalpies and mass fractions, its heaters), so nothing here
 * can disagree with the key. Null when the states are not in the solver's shape
 * (../steam-plant-layout.ts), so the caller falls back. Pure.
 */
import type { FormattedRankine, FormattedRankineState } from '#app/domain/thermo/steam/rankine-template.ts'
import { plantLayout, type PlantHeaterLayout } from '../steam-plant-layout.ts'
import { formatNumber } from '../placeholders.ts'
import type { Symbols } from './common.ts'
import { n4, pressureTex, pressureText, q4, snap, sub } from './common.ts'
import type { WorkedLine } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'

type State = FormattedRankineState

const kJ = (x: number) => n4(x / 1000)
const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
const h = (s: State) => `h_{${sub(s.name)}}`
const hv = (s: State) => kJ(s.h.value)
const words = (x: number) => formatNumber(x, { sigFigs: WORKED_SIG_FIGS }, false)
/** A mass fraction as TeX in parentheses, for a product. */
const m = (x: number) => `(${n4(x)})`

export interface PlantEfficiencies {
  readonly pump: number | null
  readonly turbine: number | null
}

/** The bleed fraction of heater i (1-based) as a symbol. */
export const bleedSymbol = (i: number) => `y_{${i}}`

function heaterLines(hl: PlantHeaterLayout, lowerName: string | null, lines: WorkedLine[]): void {
  const ht = hl.heater
  const i = hl.index + 1
  const y = ht.bleedFraction.value
  const D = ht.drainsIn.value
  const Ft = ht.feedwaterFlow.value
  const yS = bleedSymbol(i)
  const b = hl.bleed
  const fin = hl.feedIn
  const up = hl.drainsFrom
  const DS = `D_{${i}}`
  const drainsNote =
    up && D > 0
      ? `; ${DS} = ${words(D)} of drains arrive from the heater above through a trap (h stays ${hv(up)} kJ/kg)`
      : ''
  const where = `${ht.name} at ${pressureText(ht.pressure.value)}`
  if (ht.kind === 'open') {
    const F = hl.exit.massFraction
    const hf = hl.exit
    lines.push({
      tex: `${yS} + ${up && D > 0 ? `${DS} + ` : ''}\\dot m_{\\text{in}} = ${n4(F)} \\Rightarrow \\dot m_{\\text{in}} = ${n4(Ft)}`,
      note: `${where} (open, direct contact): mass balance; ${words(F)} of the boiler flow leaves it as saturated liquid${drainsNote}`,
    })
    const num = F * (hf.h.value - fin.h.value) - (up && D > 0 ? D * (up.h.value - fin.h.value) : 0)
    const den = b.h.value - fin.h.value
    lines.push({
      tex: `${yS}\\,${h(b)} + ${up && D > 0 ? `${DS}\\,${h(up)} + ` : ''}\\dot m_{\\text{in}}\\,${h(fin)} = ${n4(F)}\\,${h(hf)}`,
      note: 'energy balance: the bled steam mixes with the feedwater (adiabatic, no work)',
    })
    lines.push({
      tex: `${yS} = \\frac{${n4(F)}(${hv(hf)} - ${hv(fin)})${up && D > 0 ? ` - ${m(D)}(${hv(up)} - ${hv(fin)})` : ''}}{${hv(b)} - ${hv(fin)}} = \\frac{${kJ(num)}}{${kJ(den)}} = ${n4(y)}`,
      note: 'the balance solved for the bleed fraction (per kg through the boiler)',
    })
  } else {
    const d = hl.drain!
    const out = hl.exit
    const ttd = d.T.value - out.T.value
    lines.push({
      tex: `T_{${sub(out.name)}} = T_{\\text{sat}}(${pressureTex(ht.pressure.value)}) - \\text{TTD} = ${n4(d.T.value)} - ${n4(snap(ttd, 1))} = ${q4(out.T.value, 'K')}`,
      note: `${where} (closed, tube and shell): the feedwater leaves ${words(snap(ttd, 1))} K below the saturation temperature of the bled steam`,
    })
    const forward = ht.drains === 'forward'
    const dT = out.h.value - fin.h.value
    const upTerm = up && D > 0 ? ` + ${DS}(${h(up)} - ${h(d)})` : ''
    if (forward) {
      lines.push({
        tex: `${yS}(${h(b)} - ${h(d)})${upTerm} = \\dot m_{\\text{tube}}(${h(out)} - ${h(fin)}),\\quad \\dot m_{\\text{tube}} = ${n4(hl.mixed!.massFraction)} - ${yS}${up && D > 0 ? ` - ${DS}` : ''}`,
        note: `energy balance: the bled steam condenses to saturated liquid and heats ${words(Ft)} of the boiler flow in the tubes; the drain is pumped forward into the feedwater line${drainsNote}`,
      })
      const F = hl.mixed!.massFraction
      const num = (F - (up && D > 0 ? D : 0)) * dT - (up && D > 0 ? D * (up.h.value - d.h.value) : 0)
      const den = b.h.value - d.h.value + dT
      lines.push({
        tex: `${yS} = \\frac{(${n4(F)}${up && D > 0 ? ` - ${n4(D)}` : ''})(${hv(out)} - ${hv(fin)})${up && D > 0 ? ` - ${m(D)}(${hv(up)} - ${hv(d)})` : ''}}{(${hv(b)} - ${hv(d)}) + (${hv(out)} - ${hv(fin)})} = \\frac{${kJ(num)}}{${kJ(den)}} = ${n4(y)}`,
        note: 'the balance solved for the bleed fraction',
      })
      const mixed = hl.mixed!
      const dp = hl.drainPumpExit!
      const hMix = (Ft * out.h.value + d.massFraction * dp.h.value) / mixed.massFraction
      lines.push({
        tex: `${h(mixed)} = \\frac{${m(Ft)}(${hv(out)}) + ${m(d.massFraction)}(${hv(dp)})}{${n4(mixed.massFraction)}} = ${E(hMix)}`,
        note: 'the pumped drain joins the feedwater leaving the heater (adiabatic mixing)',
      })
    } else {
      lines.push({
        tex: `${yS}(${h(b)} - ${h(d)})${upTerm} = ${n4(Ft)}(${h(out)} - ${h(fin)})`,
        note: `energy balance: the bled steam condenses to saturated liquid and heats the ${words(Ft)} of the boiler flow passing the tubes${drainsNote}`,
      })
      const num = Ft * dT - (up && D > 0 ? D * (up.h.value - d.h.value) : 0)
      const den = b.h.value - d.h.value
      lines.push({
        tex: `${yS} = \\frac{${n4(Ft)}(${hv(out)} - ${hv(fin)})${up && D > 0 ? ` - ${m(D)}(${hv(up)} - ${hv(d)})` : ''}}{${hv(b)} - ${hv(d)}} = \\frac{${kJ(num)}}{${kJ(den)}} = ${n4(y)}`,
        note: 'the balance solved for the bleed fraction',
      })
      lines.push({
        tex: `\\dot m_{\\text{drain}} = ${yS}${up && D > 0 ? ` + ${DS}` : ''} = ${n4(d.massFraction)}`,
        note: `the drain (saturated liquid, ${hv(d)} kJ/kg) goes backward through a trap to ${lowerName ?? 'the condenser'}; throttling keeps its enthalpy`,
      })
    }
  }
  lines.push({
    tex: `Q_{\\mathrm{FWH${i}}} = \\dot m_{\\text{tube}}(${h(hl.exit)} - ${h(fin)}) = ${m(Ft)}(${hv(hl.exit)} - ${hv(fin)}) = ${E(ht.heatTransferred.value)}`,
    note: `heat the feedwater takes up in ${ht.name} (per kg through the boiler); the bleed fraction ${yS} is ${words(y)}`,
  })
}

/**
 * The device lines of a steam plant, or null when its states are not in the solver's shape.
 * `sym` gives the convention's symbols; `eff` the pump and turbine efficiencies read from the
 * spec (null when unread).
 */
export function plantDeviceLines(sol: FormattedRankine, sym: Symbols, eff: PlantEfficiencies): WorkedLine[] | null {
  const layout = plantLayout(sol)
  if (!layout) return null
  const lines: WorkedLine[] = []
  const { condenserExit: c1, condensatePumpExit: c2, heaters, process, topFeed, boilerExit, path, turbineExit } = layout

  // Heaters, highest pressure first (the bleed fractions y_1, y_2, … in the heaters' order).
  heaters.forEach((hl, i) => {
    const lower = heaters[i + 1]
    heaterLines(hl, lower ? lower.heater.name : null, lines)
  })

  // Pumps.
  const pumps: { symbol: string; value: number }[] = []
  const pump = (symbol: string, name: string, inlet: State, exit: State, flow: number) => {
    const value = flow * (exit.h.value - inlet.h.value)
    lines.push({
      tex: `${symbol} = ${m(flow)}(${h(exit)} - ${h(inlet)}) = ${m(flow)}(${hv(exit)} - ${hv(inlet)}) = ${E(value)}`,
      note: `${name}: ${words(flow)} of the boiler flow, ${pressureText(inlet.p.value)} → ${pressureText(exit.p.value)}`,
    })
    if (eff.pump !== null) {
      const ws = (flow * inlet.v.value * (exit.p.value - inlet.p.value)) / eff.pump
      lines.push({
        tex: `${m(flow)}\\frac{v_{${sub(inlet.name)}}(p_{${sub(exit.name)}} - p_{${sub(inlet.name)}})}{\\eta_p} = ${m(flow)}\\frac{(${q4(inlet.v.value, 'm^3/kg')})(${pressureTex(exit.p.value)} - ${pressureTex(inlet.p.value)})}{${n4(eff.pump)}} = ${E(ws)}`,
        note: 'the v Δp form for a nearly incompressible liquid agrees closely',
      })
    }
    pumps.push({ symbol, value })
  }
  let pumpNo = 0
  const pumpSym = () => sym.W(`\\mathrm{p${++pumpNo},in}`)
  pump(pumpSym(), 'condensate pump', c1, c2, c2.massFraction)
  for (const hl of [...heaters].reverse()) {
    if (hl.pumpExit) pump(pumpSym(), `pump after ${hl.heater.name}`, hl.exit, hl.pumpExit, hl.exit.massFraction)
    if (hl.drainPumpExit && hl.drain)
      pump(pumpSym(), `drain pump of ${hl.heater.name}`, hl.drain, hl.drainPumpExit, hl.drain.massFraction)
  }
  if (process) pump(pumpSym(), 'process-condensate pump', process.liquid, process.pumped, process.liquid.massFraction)

  // Boiler.
  let boilerIn = topFeed
  if (process) {
    const yP = process.liquid.massFraction
    const mix = (1 - yP) * topFeed.h.value + yP * process.pumped.h.value
    lines.push({
      tex: `${h(process.mixed)} = ${m(1 - yP)}(${hv(topFeed)}) + ${m(yP)}(${hv(process.pumped)}) = ${E(mix)}`,
      note: 'boiler inlet: the feedwater from the heaters mixes with the pumped process condensate',
    })
    boilerIn = process.mixed
  }
  const boilerQ = boilerExit.h.value - boilerIn.h.value
  lines.push({
    tex: `${sym.Q('\\mathrm{boiler}')} = ${h(boilerExit)} - ${h(boilerIn)} = ${hv(boilerExit)} - ${hv(boilerIn)} = ${E(boilerQ)}`,
    note: 'boiler: q = Δh, the whole boiler flow',
  })

  // Turbine sections and the reheater.
  const etaNote =
    eff.turbine !== null && eff.turbine < 1
      ? `turbine isentropic efficiency ${words(eff.turbine)}`
      : 'isentropic: s is conserved'
  const sections: { symbol: string; value: number }[] = []
  const reheats: { symbol: string; value: number }[] = []
  let cur = boilerExit
  for (const s of [...path, turbineExit]) {
    if (s.description.startsWith('reheater exit')) {
      const value = s.massFraction * (s.h.value - cur.h.value)
      const symbol = sym.Q('\\mathrm{reheat}')
      lines.push({
        tex: `${symbol} = ${m(s.massFraction)}(${h(s)} - ${h(cur)}) = ${m(s.massFraction)}(${hv(s)} - ${hv(cur)}) = ${E(value)}`,
        note: `reheater at ${pressureText(s.p.value)}: ${words(s.massFraction)} of the boiler flow is reheated`,
      })
      reheats.push({ symbol, value })
    } else {
      const k = sections.length + 1
      const value = s.massFraction * (cur.h.value - s.h.value)
      const symbol = sym.W(`\\mathrm{T${k},out}`)
      lines.push({
        tex: `${symbol} = ${m(s.massFraction)}(${h(cur)} - ${h(s)}) = ${m(s.massFraction)}(${hv(cur)} - ${hv(s)}) = ${E(value)}`,
        note: `turbine section ${k}, ${pressureText(cur.p.value)} → ${pressureText(s.p.value)}: ${words(s.massFraction)} of the boiler flow passes it; ${etaNote}`,
      })
      sections.push({ symbol, value })
    }
    cur = s
  }

  // Condenser: the turbine exhaust, and any drains cascaded below the lowest heater.
  const drains = c1.massFraction - turbineExit.massFraction
  const lowest = heaters.at(-1)
  const drainState = drains > 1e-12 && lowest?.drain ? lowest.drain : null
  const qOut =
    turbineExit.massFraction * (turbineExit.h.value - c1.h.value) +
    (drainState ? drains * (drainState.h.value - c1.h.value) : 0)
  lines.push({
    tex: `${sym.Q('\\mathrm{cond,out}')} = ${m(turbineExit.massFraction)}(${hv(turbineExit)} - ${hv(c1)})${drainState ? ` + ${m(drains)}(${hv(drainState)} - ${hv(c1)})` : ''} = ${E(qOut)}`,
    note: drainState
      ? `condenser: the turbine exhaust and the drains trapped down from ${lowest!.heater.name} condense to saturated liquid`
      : 'condenser: the turbine exhaust condenses to saturated liquid',
  })

  // Process heat.
  if (process) {
    const yP = process.liquid.massFraction
    const qP = yP * (process.extraction.h.value - process.liquid.h.value)
    lines.push({
      tex: `${sym.Q('\\mathrm{process}')} = ${m(yP)}(${h(process.extraction)} - ${h(process.liquid)}) = ${m(yP)}(${hv(process.extraction)} - ${hv(process.liquid)}) = ${E(qP)}`,
      note: `process heater: ${words(yP)} of the boiler flow, extracted at ${pressureText(process.extraction.p.value)}, gives up its heat and returns as saturated liquid`,
    })
  }

  const sum = (total: string, parts: { symbol: string; value: number }[], value: number, note: string) => {
    if (parts.length < 2) return
    lines.push({
      tex: `${total} = ${parts.map((p) => p.symbol).join(' + ')} = ${parts.map((p) => kJ(p.value)).join(' + ')} = ${E(value)}`,
      note,
    })
  }
  sum(sym.W('\\mathrm{turb,out}'), sections, sol.totals.turbineWork.value, 'all turbine sections')
  sum(sym.W('\\mathrm{pump,in}'), pumps, sol.totals.pumpWork.value, 'all pumps')
  if (reheats.length > 0)
    sum(
      sym.Q('\\mathrm{in}'),
      [{ symbol: sym.Q('\\mathrm{boiler}'), value: boilerQ }, ...reheats],
      sol.totals.heatIn.value,
      'heat taken in: boiler and reheater',
    )
  return lines
}
