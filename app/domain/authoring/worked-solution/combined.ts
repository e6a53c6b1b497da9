/**
 * The worked solution of the combined gas–steam cycle (combined/combined-template.ts): the gas
 * turbine per kg of gas (compressor, combustor, turbine as enthalpy differences), the
 * heat-recovery steam generator's balance giving the steam per kg of gas, the steam cycle per
 * kg of steam (the Rankine module, with the plant's own pump and turbine efficiencies), and the
 * plant's totals. Every number comes from the solution. Pure.
 */
import type { FormattedCombined } from '#app/domain/thermo/combined/combined-template.ts'
import { isRecord } from '#app/domain/thermo/json.ts'
import type { Variant } from '../definition.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { snap, sub, pressureTex, n4, q4, par } from './common.ts'
import type { Symbols } from './common.ts'
import { rankineSections } from './rankine.ts'

const kJ = (x: number) => n4(snap(x, 1e3) / 1000)
const E = (x: number) => q4(snap(x, 1e3) / 1000, 'kJ/kg')

/**
 * The variant as the steam cycle alone would be written: the Rankine module reads its pump and
 * turbine efficiencies from the spec's inputs, which the combined template names its own way.
 */
function bottomingVariant(variant: Variant): Variant {
  const raw = variant.spec.inputs
  const inputs: Readonly<Record<string, unknown>> = isRecord(raw) ? raw : {}
  const pick: Record<string, unknown> = {}
  const map: [string, string][] = [
    ['boilerPressure', 'boilerPressure'],
    ['condenserPressure', 'condenserPressure'],
    ['steamTemperature', 'turbineInletTemperature'],
    ['pumpEfficiency', 'pumpEfficiency'],
    ['steamTurbineEfficiency', 'turbineEfficiency'],
  ]
  for (const [from, to] of map) if (inputs[from] !== undefined) pick[to] = inputs[from]
  return { ...variant, spec: { template: 'rankine', inputs: pick } }
}

export function combinedSections(sol: FormattedCombined, variant: Variant, sym: Symbols): WorkedSection[] {
  const t = sol.totals
  const g = (name: string) => sol.gasStates.find((s) => s.name === name)
  const [g1, g2, g3, g4, g5] = ['1', '2', '3', '4', '5'].map(g)
  const gasLabel = sol.substance.replace(/\s*\(topping\).*$/, '')
  const states: WorkedLine[] = [
    {
      tex: '',
      note: `Gas: ${gasLabel}. Its enthalpy and entropy come from the gas's own property data; only their differences enter the balances.`,
    },
    ...sol.gasStates.map((s) => ({
      tex: `p_{${sub(s.name)}} = ${pressureTex(s.p.value)},\\ T_{${sub(s.name)}} = ${q4(s.T.value, 'K')},\\ h_{${sub(s.name)}} = ${q4(s.h.value / 1000, 'kJ/kg')},\\ s_{${sub(s.name)}} = ${q4(s.s.value / 1000, 'kJ/(kg K)')}`,
      note: `gas state ${s.name}: ${s.description}`,
    })),
  ]
  const Wc = sym.W('\\text{c,in}')
  const Wgt = sym.W('\\text{gt,out}')
  const Wgas = sym.W('\\text{gas,net}')
  const Qin = sym.Q('\\text{in}')
  const gas: WorkedLine[] = []
  if (g1 && g2 && g3 && g4) {
    gas.push(
      {
        tex: `${Wc} = h_2 - h_1 = ${kJ(g2.h.value)} - ${par(kJ(g1.h.value))} = ${E(t.compressorWork.value)}`,
        note: 'compressor: adiabatic steady flow, work done on the gas',
      },
      {
        tex: `${Qin} = h_3 - h_2 = ${kJ(g3.h.value)} - ${kJ(g2.h.value)} = ${E(t.heatIn.value)}`,
        note: 'combustor, taken as heat added to air at constant pressure (air-standard)',
      },
      {
        tex: `${Wgt} = h_3 - h_4 = ${kJ(g3.h.value)} - ${kJ(g4.h.value)} = ${E(t.gasTurbineWork.value)}`,
        note: 'gas turbine: adiabatic steady flow, work done by the gas',
      },
      {
        tex: `${Wgas} = ${Wgt} - ${Wc} = ${kJ(t.gasTurbineWork.value)} - ${kJ(t.compressorWork.value)} = ${E(t.gasNetWork.value)}`,
        note: 'net work of the gas turbine per kg of gas',
      },
    )
  }
  const hrsg: WorkedLine[] = []
  const steam = sol.bottoming.states
  const feed = steam.find((s) => s.description.startsWith('pump exit'))
  const steamOut = steam.find((s) => s.description.startsWith('boiler exit'))
  if (g4 && g5 && feed && steamOut) {
    const [nf, ns] = [sub(feed.name), sub(steamOut.name)]
    hrsg.push(
      {
        tex: `\\dot m_{\\text{gas}}(h_4 - h_5) = \\dot m_{\\text{steam}}(h_{${ns},\\text{steam}} - h_{${nf},\\text{steam}})`,
        note: 'heat-recovery steam generator: what the exhaust gives up, the water takes (no loss to the surroundings)',
      },
      {
        tex: `y = \\frac{\\dot m_{\\text{steam}}}{\\dot m_{\\text{gas}}} = \\frac{h_4 - h_5}{h_{${ns},\\text{steam}} - h_{${nf},\\text{steam}}} = \\frac{${kJ(g4.h.value)} - ${kJ(g5.h.value)}}{${kJ(steamOut.h.value)} - ${kJ(feed.h.value)}} = ${n4(t.steamPerGas.value)}`,
        note: 'kg of steam raised per kg of gas',
      },
      {
        tex: `T_4 - T_{${ns},\\text{steam}} = ${q4(t.hotEndDifference.value, 'K')},\\quad T_5 - T_{${nf},\\text{steam}} = ${q4(t.coldEndDifference.value, 'K')}${t.pinchDifference !== null ? `,\\quad \\Delta T_{\\text{pinch}} = ${q4(t.pinchDifference.value, 'K')}` : ''}`,
        note: 'the gas stays hotter than the water at both ends of the HRSG and where the water starts to boil',
      },
    )
  }
  const steamSections = rankineSections(sol.bottoming, bottomingVariant(variant), sym)
    .filter((s) => s.title !== 'In the course convention')
    .map((s) => ({ ...s, title: `Steam cycle — ${s.title.charAt(0).toLowerCase()}${s.title.slice(1)}` }))
  const Wnet = sym.W('\\text{net,out}')
  const totals: WorkedLine[] = [
    {
      tex: `${sym.W('\\text{steam,net}')} = y\\,w_{\\text{steam}} = (${n4(t.steamPerGas.value)})(${kJ(sol.bottoming.totals.netWork.value)}) = ${E(t.steamNetWork.value)}`,
      note: 'the steam cycle’s net work, per kg of gas',
    },
    {
      tex: `${Wnet} = ${Wgas} + ${sym.W('\\text{steam,net}')} = ${kJ(t.gasNetWork.value)} + ${kJ(t.steamNetWork.value)} = ${E(t.netWork.value)}`,
      note: 'net work of the plant per kg of gas',
    },
    {
      tex: `\\eta = \\frac{${Wnet}}{${Qin}} = \\frac{${kJ(t.netWork.value)}}{${kJ(t.heatIn.value)}} = ${n4(t.efficiency.value)}`,
      note: 'thermal efficiency of the combined cycle',
    },
    {
      tex: `\\eta_{\\text{gas}} = ${n4(t.gasEfficiency.value)},\\quad \\eta_{\\text{steam}} = ${n4(t.steamEfficiency.value)}`,
      note: 'each cycle alone: the gas turbine on the fuel’s heat, the steam cycle on the heat it takes from the exhaust',
    },
    {
      tex: `${Qin} = ${Wnet} + ${sym.Q('\\text{stack}')} + ${sym.Q('\\text{cond}')} = ${kJ(t.netWork.value)} + ${kJ(t.stackLoss.value)} + ${kJ(t.condenserHeat.value)} = ${E(t.netWork.value + t.stackLoss.value + t.condenserHeat.value)}`,
      note: 'check: the fuel’s heat leaves as work, with the stack gas (cooled to T₁ in the surroundings) and through the condenser (y times the condenser heat per kg of steam), all per kg of gas',
    },
    { tex: `${sym.W('\\text{net}')} = ${E(t.netWorkSigned.value)}`, note: 'the net work in the course convention' },
  ]
  if (t.power !== null)
    totals.push({
      tex: `\\dot W_{\\text{net}} = \\dot m_{\\text{gas}}\\,${Wnet} = ${q4(t.power.value / 1e6, 'MW')}`,
      note: 'net power with the gas flow given',
    })
  return [
    { title: 'Gas states (per kg of gas)', lines: states },
    { title: 'Gas turbine (per kg of gas)', lines: gas },
    { title: 'Heat-recovery steam generator', lines: hrsg },
    ...steamSections,
    { title: 'Plant totals (per kg of gas)', lines: totals },
  ]
}
