/**
 * The worked solution of the throttling calorimeter (steam/calorimeter.ts): the calorimeter's
 * pressure and temperature fix the enthalpy of the superheated steam, the throttle keeps it, and
 * the line pressure's saturation properties turn it into the line steam's quality. Every number
 * comes from the solution or from IAPWS-IF97 at the solution's own pressures. Pure.
 */
import { saturationAtP } from '#app/domain/thermo/steam/properties.ts'
import type { FormattedCalorimeter } from '#app/domain/thermo/steam/calorimeter.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { pressureTex, pressureText, n4, q4 } from './common.ts'

const kJ = (x: number) => n4(x / 1000)

export function calorimeterSections(sol: FormattedCalorimeter): WorkedSection[] {
  const [line, cal] = sol.states
  const t = sol.totals
  if (!line || !cal) return []
  const states: WorkedLine[] = [
    {
      tex: `p_1 = ${pressureTex(line.p.value)}`,
      note: 'state 1: the line steam (wet) before the throttle',
    },
    {
      tex: `p_2 = ${pressureTex(cal.p.value)},\\ T_2 = ${q4(cal.T.value, 'K')}\\ (${q4(cal.T.value - 273.15, '°C')})`,
      note: 'state 2: the steam in the calorimeter, after the throttle',
    },
    {
      tex: `T_2 - T_{\\text{sat}}(p_2) = ${n4(cal.T.value)} - ${n4(t.calorimeterSaturationTemperature.value)} = ${q4(t.superheat.value, 'K')}`,
      note: 'the calorimeter steam is superheated, so its pressure and temperature fix its state',
    },
    {
      tex: `h_2 = h(p_2, T_2) = ${q4(cal.h.value / 1000, 'kJ/kg')}`,
      note: 'superheated steam, IAPWS-IF97',
    },
  ]
  const throttle: WorkedLine[] = [
    {
      tex: 'h_1 = h_2',
      note: 'the throttle is adiabatic and does no work, and the change of kinetic energy is negligible: the enthalpy is the same on both sides',
    },
  ]
  const sat = saturationAtP(line.p.value)
  if (sat.ok) {
    const hf = sat.value.liquid.h
    const hfg = sat.value.vapour.h - hf
    throttle.push({
      tex: `h_f = ${q4(hf / 1000, 'kJ/kg')},\\ h_{fg} = ${q4(hfg / 1000, 'kJ/kg')}`,
      note: `saturation at the line pressure, ${pressureText(line.p.value)} (T_sat = ${n4(sat.value.T)} K)`,
    })
    throttle.push({
      tex: `x_1 = \\frac{h_1 - h_f}{h_{fg}} = \\frac{${kJ(cal.h.value)} - ${kJ(hf)}}{${kJ(hfg)}} = ${n4(t.quality.value)}`,
      note: 'the quality of the line steam',
    })
    const calSat = saturationAtP(cal.p.value)
    if (calSat.ok)
      throttle.push({
        tex: `x_{\\min} = \\frac{h_g(p_2) - h_f}{h_{fg}} = \\frac{${kJ(calSat.value.vapour.h)} - ${kJ(hf)}}{${kJ(hfg)}} = ${n4(t.lowestMeasurableQuality.value)}`,
        note: 'the wettest line steam this calorimeter pressure can measure: any wetter and the throttled steam is no longer superheated',
      })
  } else {
    throttle.push({ tex: `x_1 = ${n4(t.quality.value)}`, note: 'the quality of the line steam' })
  }
  return [
    { title: 'States (water/steam, IAPWS-IF97)', lines: states },
    { title: 'Throttling (per kg of steam sampled)', lines: throttle },
  ]
}
