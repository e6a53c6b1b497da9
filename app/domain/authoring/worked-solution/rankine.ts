/** The worked solution of a Rankine cycle: IAPWS-IF97 states, each device as an enthalpy difference, and the totals. Pure. */
import { saturationAtP } from '#app/domain/thermo/steam/properties.ts'
import { parsePlantInputs, parseRankineInputs } from '#app/domain/thermo/steam/rankine-template.ts'
import type { FormattedRankine, FormattedRankineState } from '#app/domain/thermo/steam/rankine-template.ts'
import { type Variant } from '../definition.ts'
import { formatNumber, texEscape } from '../placeholders.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'
import { snap, sub, pressureText, pressureTex, n4, q4, specInputs } from './common.ts'
import type { Symbols } from './common.ts'
import { isSteamPlant } from '../steam-plant-layout.ts'
import { bleedSymbol, plantDeviceLines } from './steam-plant.ts'

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

  const inputs = parseRankineInputs(sol.template, specInputs(variant))
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

/** A steam plant's device lines (./steam-plant.ts) with the efficiencies read from the variant's spec. */
function plantLines(sol: FormattedRankine, variant: Variant, sym: Symbols): WorkedLine[] | null {
  const inputs = parsePlantInputs(sol.template, specInputs(variant))
  return plantDeviceLines(sol, sym, {
    pump: inputs.ok ? (inputs.value.pumpEfficiency ?? 1) : null,
    turbine: inputs.ok ? (inputs.value.turbineEfficiency ?? 1) : null,
  })
}

export function rankineSections(sol: FormattedRankine, variant: Variant, sym: Symbols): WorkedSection[] {
  const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')
  const stateSection: WorkedSection = {
    title: 'States (water/steam, IAPWS-IF97)',
    lines: sol.states.flatMap(rankineStateLine),
  }
  const lines =
    (isSteamPlant(sol) ? plantLines(sol, variant, sym) : rankineDeviceLines(sol, variant, sym)) ??
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
    t.processHeat
      ? {
          tex: `\\eta = 1 - \\frac{${sym.Q('\\mathrm{out}')} + ${sym.Q('\\mathrm{process}')}}{${sym.Q('\\mathrm{in}')}} = 1 - \\frac{${n4(t.heatOut.value / 1000)} + ${n4(t.processHeat.value / 1000)}}{${n4(t.heatIn.value / 1000)}} = ${n4(1 - (t.heatOut.value + t.processHeat.value) / t.heatIn.value)}`,
          note: 'the same from the heats: over a cycle the net work is the net heat, and the process heat leaves the water too',
        }
      : {
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
  if (t.bleedFractions && sol.heaters) {
    const ys = t.bleedFractions
    sol.heaters.forEach((ht, i) =>
      totals.push({
        tex: `${bleedSymbol(i + 1)} = ${n4(ys[i]?.value ?? NaN)}`,
        note: `fraction of the boiler flow bled to ${ht.name} (${ht.kind}, ${pressureText(ht.pressure.value)})`,
      }),
    )
    if (ys.length > 1 && t.bleedFraction !== null)
      totals.push({
        tex: `y = ${ys.map((_, i) => bleedSymbol(i + 1)).join(' + ')} = ${n4(t.bleedFraction.value)}`,
        note: 'the steam bled to all the heaters',
      })
  } else if (t.bleedFraction !== null)
    totals.push({ tex: `y = ${n4(t.bleedFraction.value)}`, note: 'fraction of the steam bled to the feedwater heater' })
  if (t.processHeat && t.utilisationFactor) {
    totals.push({
      tex: `${sym.Q('\\mathrm{process}')} = ${E(t.processHeat.value)}`,
      note: `process heat delivered per kg through the boiler${t.processFraction ? ` (${formatNumber(t.processFraction.value, { sigFigs: WORKED_SIG_FIGS }, false)} of the steam to the process)` : ''}`,
    })
    totals.push({
      tex: `\\varepsilon_u = \\frac{${sym.W('\\mathrm{net,out}')} + ${sym.Q('\\mathrm{process}')}}{${sym.Q('\\mathrm{in}')}} = \\frac{${n4(t.netWork.value / 1000)} + ${n4(t.processHeat.value / 1000)}}{${n4(t.heatIn.value / 1000)}} = ${n4(t.utilisationFactor.value)}`,
      note: 'utilisation factor: the share of the heat taken in that ends as work or process heat',
    })
  }
  return [
    stateSection,
    deviceSection,
    { title: 'In the course convention', lines: conv },
    { title: 'Cycle totals', lines: totals },
  ]
}
