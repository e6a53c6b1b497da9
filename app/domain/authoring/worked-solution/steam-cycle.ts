/**
 * The worked solution of water in the general cycle format (steam/steam-cycle.ts), as the vapour
 * Carnot template gives it: IAPWS-IF97 states, each reversible step with its relation (isothermal
 * q = T Δs, isentropic q = 0, isobaric, isochoric) in a closed system or in steady flow, and the
 * totals. Every number comes from the solution. Pure.
 */
import { saturationAtT } from '#app/domain/thermo/steam/properties.ts'
import type { FormattedSteamCycle } from '#app/domain/thermo/steam/steam-cycle.ts'
import { formatNumber } from '../placeholders.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'
import { snap, sub, pressureTex, n4, q4, par } from './common.ts'
import type { Symbols } from './common.ts'

type SteamState = FormattedSteamCycle['states'][number]
type SteamStep = FormattedSteamCycle['steps'][number]

const kJ = (x: number) => n4(snap(x, 1e3) / 1000)
const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')

function stateLines(s: SteamState): WorkedLine[] {
  const n = sub(s.name)
  const lines: WorkedLine[] = [
    {
      tex: `p_{${n}} = ${pressureTex(s.p.value)},\\ T_{${n}} = ${q4(s.T.value, 'K')}\\ (${q4(s.T.value - 273.15, '°C')}),\\ v_{${n}} = ${q4(s.v.value, 'm^3/kg')},\\ u_{${n}} = ${q4(s.u.value / 1000, 'kJ/kg')},\\ h_{${n}} = ${q4(s.h.value / 1000, 'kJ/kg')},\\ s_{${n}} = ${q4(s.s.value / 1000, 'kJ/(kg K)')}`,
      note: `state ${s.name} (${s.phase})`,
    },
  ]
  if (s.x !== null && s.x > 0 && s.x < 1) {
    const sat = saturationAtT(s.T.value)
    if (sat.ok) {
      const sf = sat.value.liquid.s
      const sfg = sat.value.vapour.s - sf
      lines.push({
        tex: `x_{${n}} = \\frac{s_{${n}} - s_f}{s_{fg}} = \\frac{${n4(s.s.value / 1000)} - ${n4(sf / 1000)}}{${n4(sfg / 1000)}} = ${n4(s.x)}`,
        note: `two-phase: quality from the saturation properties at ${formatNumber(s.T.value - 273.15, { sigFigs: WORKED_SIG_FIGS }, false)} °C`,
      })
    }
  } else if (s.x !== null) {
    lines.push({ tex: `x_{${n}} = ${n4(s.x)}`, note: s.x === 0 ? 'saturated liquid' : 'saturated vapour' })
  }
  return lines
}

/** One step: Δu, Δh, Δs, then the process relation for q and the work done by the water. */
function stepLines(sol: FormattedSteamCycle, st: SteamStep, sym: Symbols): WorkedLine[] {
  const a = sol.states.find((s) => s.name === st.from)
  const b = sol.states.find((s) => s.name === st.to)
  if (!a || !b) return [{ tex: `${sym.Q('')} = ${E(st.q.value)},\\ ${sym.W('')} = ${E(st.w.value)}` }]
  const [na, nb] = [sub(a.name), sub(b.name)]
  const ab = `${na}${nb}`
  const flow = sol.system === 'flow'
  // Inside the dome T Δs and Δh are the same number, but IF97's saturation states agree only to
  // about 1e-6: the few J/kg left over are shown as the zero they are (the key keeps them).
  const scale = Math.max(Math.abs(st.q.value), Math.abs(st.dH.value), Math.abs(st.dU.value))
  const wShown = Math.abs(st.w.value) < 1e-5 * scale ? 0 : st.w.value
  const wBy = sym.convention === 'chemistry' ? -wShown : wShown
  const Wb = `W_{\\text{by},${ab}}`
  const Q = sym.Q(ab)
  const lines: WorkedLine[] = [
    {
      tex: `\\Delta u = u_{${nb}} - u_{${na}} = ${kJ(b.u.value)} - ${par(kJ(a.u.value))} = ${E(st.dU.value)},\\quad \\Delta h = h_{${nb}} - h_{${na}} = ${E(st.dH.value)},\\quad \\Delta s = ${q4(snap(st.dS.value, 1e3) / 1000, 'kJ/(kg K)')}`,
      note: `${st.label}: ${st.process}${flow ? ', steady flow' : ', closed system'}`,
    },
  ]
  const balance = flow ? `\\Delta h` : `\\Delta u`
  const dE = flow ? st.dH.value : st.dU.value
  switch (st.process) {
    case 'isothermal':
      lines.push({
        tex: `${Q} = T\\,\\Delta s = (${q4(a.T.value, 'K')})(${n4(snap(st.dS.value, 1e3) / 1000)}\\,\\mathrm{kJ/(kg\\,K)}) = ${E(st.q.value)}`,
        note: 'reversible heat at constant temperature (inside the dome the pressure is constant too)',
      })
      lines.push({
        tex: `${Wb} = ${Q} - ${balance} = ${kJ(st.q.value)} - ${par(kJ(dE))} = ${E(wBy)}`,
        note: flow ? 'steady-flow energy balance' : 'first law for the closed system',
      })
      break
    case 'isentropic':
      lines.push({ tex: `${Q} = 0`, note: 'reversible and adiabatic' })
      lines.push({
        tex: `${Wb} = -${balance} = ${E(wBy)}`,
        note: flow ? 'steady-flow energy balance with no heat' : 'first law with no heat',
      })
      break
    case 'isobaric':
      if (flow) {
        lines.push({ tex: `${Wb} = -\\int v\\,dp = 0`, note: 'no technical work at constant pressure' })
        lines.push({ tex: `${Q} = \\Delta h = ${E(st.q.value)}` })
      } else {
        lines.push({
          tex: `${Wb} = p\\,(v_{${nb}} - v_{${na}}) = (${pressureTex(a.p.value)})(${n4(b.v.value)} - ${n4(a.v.value)})\\,\\mathrm{m^3/kg} = ${E(wBy)}`,
          note: 'boundary work at constant pressure',
        })
        lines.push({ tex: `${Q} = \\Delta u + ${Wb} = \\Delta h = ${E(st.q.value)}` })
      }
      break
    case 'isochoric':
      if (flow) {
        lines.push({
          tex: `${Wb} = -v\\,(p_{${nb}} - p_{${na}}) = ${E(wBy)}`,
          note: 'technical work at constant specific volume',
        })
        lines.push({ tex: `${Q} = \\Delta h + ${Wb} = ${E(st.q.value)}` })
      } else {
        lines.push({ tex: `${Wb} = 0`, note: 'no boundary work at constant volume' })
        lines.push({ tex: `${Q} = \\Delta u = ${E(st.q.value)}` })
      }
      break
    default:
      lines.push({ tex: `${Q} = ${E(st.q.value)}` })
  }
  lines.push({
    tex: `${sym.W(ab)} = ${E(wShown)}`,
    note:
      sym.convention === 'chemistry'
        ? 'in the course convention: w is the work done ON the water (= −W_by)'
        : 'in the course convention: W is the work done BY the water',
  })
  return lines
}

export function steamCycleSections(sol: FormattedSteamCycle, sym: Symbols): WorkedSection[] {
  const t = sol.totals
  const states: WorkedSection = {
    title: 'States (water/steam, IAPWS-IF97)',
    lines: sol.states.flatMap(stateLines),
  }
  const steps: WorkedSection = {
    title: `Processes (per kg of water${sol.system === 'flow' ? ', steady flow' : ''})`,
    lines: sol.steps.flatMap((st) => stepLines(sol, st, sym)),
  }
  const net = sym.W('\\text{net}')
  const totals: WorkedLine[] = [
    {
      tex: `${net} = ${sol.steps.map((s) => sym.W(`${sub(s.from)}${sub(s.to)}`)).join(' + ')} = ${E(t.netWork.value)}`,
      note: 'net work in the course convention, the sum over the steps',
    },
    {
      tex: `${sym.Q('\\text{in}')} = ${E(t.heatIn.value)},\\quad ${sym.Q('\\text{out}')} = ${E(t.heatOut.value)}`,
      note: 'heat added is the sum of the positive step heats, heat rejected the sum of the negative ones',
    },
  ]
  if (t.efficiency !== null) {
    const wOut = Math.abs(t.netWork.value)
    totals.push({
      tex: `\\eta = \\frac{|${net}|}{${sym.Q('\\text{in}')}} = \\frac{${kJ(wOut)}}{${kJ(t.heatIn.value)}} = ${n4(t.efficiency.value)}`,
      note: 'thermal efficiency',
    })
    if (sol.template === 'steam-carnot') {
      const TH = Math.max(...sol.states.map((s) => s.T.value))
      const TL = Math.min(...sol.states.map((s) => s.T.value))
      totals.push({
        tex: `\\eta_{\\text{Carnot}} = 1 - \\frac{T_L}{T_H} = 1 - \\frac{${n4(TL)}}{${n4(TH)}} = ${n4(1 - TL / TH)}`,
        note: 'the same from the two temperatures alone: every reversible engine between two reservoirs has this efficiency',
      })
    }
  }
  const sections: WorkedSection[] = [states, steps]
  // The mass: the ratio of a step's whole-amount value to its per-kg value (the format states both).
  const ref = sol.steps
    .flatMap((s) => [
      [s.total.dU.value, s.dU.value],
      [s.total.q.value, s.q.value],
    ])
    .find(([, per]) => Math.abs(per!) > 1e-6)
  const m = ref ? ref[0]! / ref[1]! : null
  if (m !== null && Number.isFinite(m) && Math.abs(m - 1) > 1e-9) {
    const kJwhole = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ')
    sections.push({
      title: `For the whole amount (m = ${formatNumber(m, { sigFigs: WORKED_SIG_FIGS }, false)} kg)`,
      lines: sol.steps.map((st) => {
        const ab = `${sub(st.from)}${sub(st.to)}`
        return {
          tex: `m\\,${sym.Q(ab)} = ${kJwhole(st.total.q.value)},\\quad m\\,${sym.W(ab)} = ${kJwhole(st.total.w.value)},\\quad m\\,\\Delta u = ${kJwhole(st.total.dU.value)}`,
          note: `${st.label}: the per-kg values times the mass`,
        }
      }),
    })
  }
  if (sol.steps.length > 1 || t.efficiency !== null) sections.push({ title: 'Cycle totals', lines: totals })
  return sections
}
