// Rankine cycles with water/steam by IAPWS-IF97: ideal; with reheat; with pump and turbine
// isentropic efficiencies; with one open feedwater heater (and combinations).
//
// Units (SI, as the rest of the steam module): pressures in Pa, temperatures in K, specific
// enthalpy/work/heat in J/kg, entropy in J/(kg K), specific volume in m^3/kg. All specific
// energies are per kg of steam leaving the boiler (the boiler mass flow).
//
// Errors: solveRankine returns SteamResult<RankineResult>; it never throws for bad input.
//
// Teaching tool: the results illustrate textbook cycle analysis; they are not design data.
// Defer to the applicable codes and licensed engineering practice for any real plant.
import { fail, ok } from './errors.ts'
import type { SteamError, SteamResult } from './errors.ts'
import {
  STEAM_LIMITS,
  saturationTemperature,
  stateFromPH,
  stateFromPS,
  stateFromPT,
  stateFromPx,
} from './properties.ts'
import type { SteamPhase, SteamState } from './properties.ts'

export const RANKINE_CAUTION =
  'Teaching tool: an idealised textbook Rankine-cycle analysis with IAPWS-IF97 properties, not design data. Defer to the applicable codes and licensed engineering practice.'

export interface RankineInput {
  /** Boiler (high) pressure, Pa. */
  boilerPressure: number
  /** Condenser (low) pressure, Pa. The condenser exit is saturated liquid. */
  condenserPressure: number
  /** Turbine inlet temperature, K. Omit for saturated vapour at the boiler pressure. */
  turbineInletTemperature?: number
  /** Turbine inlet quality 0 < x <= 1 (wet steam leaving the boiler, below the critical
   *  pressure); instead of turbineInletTemperature. Omit both for saturated vapour. */
  turbineInletQuality?: number
  /** Pump isentropic efficiency, 0 < eta <= 1 (default 1: ideal). */
  pumpEfficiency?: number
  /** Turbine isentropic efficiency, 0 < eta <= 1 (default 1: ideal); applied to each turbine section. */
  turbineEfficiency?: number
  /** Reheat: the steam leaves the high-pressure turbine at `pressure` (Pa) and is reheated to `temperature` (K). */
  reheat?: { pressure: number; temperature: number }
  /** One open (direct-contact) feedwater heater at `pressure` (Pa), fed by steam bled from the turbine; its exit is saturated liquid. */
  openFeedwaterHeater?: { pressure: number }
}

export interface RankineStatePoint {
  /** State number along the cycle, '1', '2', ... */
  label: string
  description: string
  /** Pa */
  p: number
  /** K */
  T: number
  /** J/kg */
  h: number
  /** Specific internal energy, J/kg. */
  u: number
  /** J/(kg K) */
  s: number
  /** m^3/kg */
  v: number
  /** Quality for two-phase (and saturated) states; null for single-phase states. */
  x: number | null
  phase: SteamPhase
  /** Mass flow through this state per kg of boiler flow. */
  massFraction: number
}

export interface DeviceTransfer {
  device: string
  /** Heat to the working fluid in this device, J per kg of boiler flow, in the convention's sign. */
  heat: number
  /** Work in the convention's sign, J per kg of boiler flow. */
  work: number
}

export interface ConventionReport {
  convention: 'engineering' | 'chemistry'
  statement: string
  devices: DeviceTransfer[]
  /** Net heat to the working fluid over the cycle, J/kg. */
  netHeat: number
  /** Net work in this convention's sign, J/kg. */
  netWork: number
}

export interface RankineResult {
  variant: string
  basis: 'per kg of steam through the boiler'
  states: RankineStatePoint[]
  /** Fraction of the boiler flow bled to the open feedwater heater; null without one. */
  bleedFraction: number | null
  /** Magnitudes (all >= 0), J per kg of boiler flow. */
  pumpWork: number
  turbineWork: number
  heatIn: number
  heatOut: number
  netWork: number
  /** netWork / heatIn. */
  thermalEfficiency: number
  /** pumpWork / turbineWork. */
  backWorkRatio: number
  /** Quality at the (last) turbine exit; null if the exit is superheated vapour. */
  turbineExitQuality: number | null
  conventions: { engineering: ConventionReport; chemistry: ConventionReport }
  caution: string
}

function bad(message: string, property?: string): SteamResult<never> {
  const e: SteamError = { code: 'invalid-input', message }
  if (property) e.property = property
  return fail(e)
}

/** The turbine-inlet quality, if given: in (0, 1], below the critical pressure, not with a temperature. */
export function checkInletQuality(x: number, pB: number, T: number | undefined): SteamError | null {
  const property = 'turbineInletQuality'
  if (typeof x !== 'number' || !Number.isFinite(x))
    return {
      code: 'invalid-input',
      property,
      message: `turbine inlet quality must be a finite number (got ${String(x)})`,
    }
  if (T !== undefined)
    return {
      code: 'invalid-input',
      property,
      message:
        'give the turbine inlet temperature or its quality, not both: wet steam is fixed by pressure and quality, its temperature is the saturation temperature',
    }
  if (x < 0 || x > 1)
    return {
      code: 'invalid-input',
      property,
      message: `turbine inlet quality x = ${x} must lie in [0, 1] (0 saturated liquid, 1 saturated vapour)`,
    }
  if (x === 0)
    return {
      code: 'invalid-input',
      property,
      message:
        'turbine inlet quality x = 0 is saturated liquid: a steam turbine needs vapour at its inlet (give 0 < x <= 1)',
    }
  if (pB >= STEAM_LIMITS.P_CRIT)
    return {
      code: 'invalid-input',
      property,
      message: `at the boiler pressure ${pB} Pa (not below the critical pressure 22.064 MPa) there is no wet steam: give turbineInletTemperature instead`,
    }
  return null
}

export function inletDescription(input: { turbineInletTemperature?: number; turbineInletQuality?: number }): string {
  if (input.turbineInletQuality !== undefined && input.turbineInletQuality < 1)
    return `boiler exit, wet steam x = ${input.turbineInletQuality} (turbine inlet)`
  if (input.turbineInletQuality === 1 || input.turbineInletTemperature === undefined)
    return 'boiler exit, saturated vapour (turbine inlet)'
  return 'boiler exit (turbine inlet)'
}

function point(label: string, description: string, st: SteamState, massFraction: number): RankineStatePoint {
  return {
    label,
    description,
    p: st.p,
    T: st.T,
    h: st.h,
    u: st.u,
    s: st.s,
    v: st.v,
    x: st.x,
    phase: st.phase,
    massFraction,
  }
}

/** Solve a Rankine cycle. See RankineInput for the variants and units. */
export function solveRankine(input: RankineInput): SteamResult<RankineResult> {
  const pB = input.boilerPressure
  const pC = input.condenserPressure
  const etaP = input.pumpEfficiency ?? 1
  const etaT = input.turbineEfficiency ?? 1
  for (const [name, v] of [
    ['boilerPressure', pB],
    ['condenserPressure', pC],
    ['pumpEfficiency', etaP],
    ['turbineEfficiency', etaT],
  ] as const) {
    if (typeof v !== 'number' || !Number.isFinite(v)) return bad(`${name} must be a finite number`, name)
  }
  if (!(etaP > 0 && etaP <= 1)) return bad(`pumpEfficiency must be in (0, 1] (got ${etaP})`, 'pumpEfficiency')
  if (!(etaT > 0 && etaT <= 1)) return bad(`turbineEfficiency must be in (0, 1] (got ${etaT})`, 'turbineEfficiency')
  if (!(pC < pB)) return bad('condenserPressure must be below boilerPressure', 'condenserPressure')
  if (pC >= STEAM_LIMITS.P_CRIT)
    return fail({
      code: 'out-of-range',
      property: 'condenserPressure',
      bound: { name: 'p < 22.064 MPa', value: STEAM_LIMITS.P_CRIT, unit: 'Pa' },
      message: 'the condenser pressure must be below the critical pressure (22.064 MPa) for condensation',
    })
  const rh = input.reheat
  const fwh = input.openFeedwaterHeater
  if (rh) {
    if (!Number.isFinite(rh.pressure) || !Number.isFinite(rh.temperature))
      return bad('reheat pressure and temperature must be finite numbers', 'reheat')
    if (!(rh.pressure > pC && rh.pressure < pB))
      return bad('reheat pressure must lie between the condenser and boiler pressures', 'reheat.pressure')
  }
  if (fwh) {
    if (!Number.isFinite(fwh.pressure))
      return bad('feedwater-heater pressure must be a finite number', 'openFeedwaterHeater')
    if (!(fwh.pressure > pC && fwh.pressure < pB))
      return bad(
        'feedwater-heater pressure must lie between the condenser and boiler pressures',
        'openFeedwaterHeater.pressure',
      )
    if (fwh.pressure >= STEAM_LIMITS.P_CRIT)
      return bad(
        'feedwater-heater pressure must be below the critical pressure (its exit is saturated liquid)',
        'openFeedwaterHeater.pressure',
      )
    if (rh && fwh.pressure === rh.pressure)
      return bad('feedwater-heater and reheat pressures must differ', 'openFeedwaterHeater.pressure')
  }

  const states: RankineStatePoint[] = []
  let n = 0
  const add = (description: string, st: SteamState, m: number) => {
    n += 1
    const pt = point(String(n), description, st, m)
    states.push(pt)
    return pt
  }

  const pump = (from: SteamState, pOut: number): SteamResult<SteamState> => {
    const isen = stateFromPS(pOut, from.s)
    if (!isen.ok) return isen
    return stateFromPH(pOut, from.h + (isen.value.h - from.h) / etaP)
  }
  const expand = (from: SteamState, pOut: number): SteamResult<SteamState> => {
    const isen = stateFromPS(pOut, from.s)
    if (!isen.ok) return isen
    return stateFromPH(pOut, from.h - etaT * (from.h - isen.value.h))
  }

  // --- liquid side -------------------------------------------------------------------------
  const s1 = stateFromPx(pC, 0)
  if (!s1.ok) return s1
  const devicesEng: DeviceTransfer[] = []
  let pumpWork = 0
  let y = 0
  const st1 = add('condenser exit, saturated liquid (pump inlet)', s1.value, 1)
  let feed: SteamState
  let pumpIIn: RankineStatePoint | null = null
  let pumpIOut: RankineStatePoint | null = null
  let heaterOut: SteamState | null = null
  if (fwh) {
    const a = pump(s1.value, fwh.pressure)
    if (!a.ok) return a
    pumpIOut = add('pump I exit, to the open feedwater heater', a.value, NaN) // fraction set below
    pumpIIn = st1
    const b = stateFromPx(fwh.pressure, 0)
    if (!b.ok) return b
    heaterOut = b.value
    add('open feedwater heater exit, saturated liquid (pump II inlet)', b.value, 1)
    const c = pump(b.value, pB)
    if (!c.ok) return c
    feed = c.value
    add('pump II exit, to the boiler', c.value, 1)
  } else {
    const a = pump(s1.value, pB)
    if (!a.ok) return a
    feed = a.value
    add('pump exit, to the boiler', a.value, 1)
  }

  // --- boiler exit -------------------------------------------------------------------------
  let inlet: SteamResult<SteamState>
  const xIn = input.turbineInletQuality
  if (xIn !== undefined) {
    const e = checkInletQuality(xIn, pB, input.turbineInletTemperature)
    if (e) return fail(e)
    inlet = stateFromPx(pB, xIn)
  } else if (input.turbineInletTemperature === undefined) {
    if (pB >= STEAM_LIMITS.P_CRIT)
      return bad(
        'give turbineInletTemperature: above the critical pressure there is no saturated vapour',
        'turbineInletTemperature',
      )
    inlet = stateFromPx(pB, 1)
  } else {
    const T3 = input.turbineInletTemperature
    if (!Number.isFinite(T3)) return bad('turbineInletTemperature must be a finite number', 'turbineInletTemperature')
    if (pB < STEAM_LIMITS.P_CRIT) {
      const Ts = saturationTemperature(pB)
      if (Ts.ok && T3 <= Ts.value)
        return bad(
          `turbine inlet temperature ${T3} K is not above the saturation temperature ${Ts.value} K at the boiler pressure: the steam would not be superheated vapour`,
          'turbineInletTemperature',
        )
    }
    inlet = stateFromPT(pB, T3)
  }
  if (!inlet.ok) return inlet
  add(inletDescription(input), inlet.value, 1)
  let heatIn = inlet.value.h - feed.h
  const boilerQ = heatIn

  // --- turbine path ------------------------------------------------------------------------
  type Event = { p: number; kind: 'reheat' | 'bleed' }
  const events: Event[] = []
  if (rh) events.push({ p: rh.pressure, kind: 'reheat' })
  if (fwh) events.push({ p: fwh.pressure, kind: 'bleed' })
  events.sort((a, b) => b.p - a.p)

  let cur = inlet.value
  let m = 1
  let turbineWork = 0
  let reheatQ = 0
  let section = 0
  const sectionNames =
    events.length === 0 ? ['turbine'] : ['high-pressure turbine', 'low-pressure turbine', 'turbine section 3']
  const turbineWorks: { name: string; w: number }[] = []
  let bleedPoint: RankineStatePoint | null = null
  for (const ev of events) {
    const out = expand(cur, ev.p)
    if (!out.ok) return out
    const w = m * (cur.h - out.value.h)
    turbineWork += w
    turbineWorks.push({ name: sectionNames[section] ?? `turbine section ${section + 1}`, w })
    section++
    if (ev.kind === 'reheat') {
      add('high-pressure turbine exit (to the reheater)', out.value, m)
      const re = stateFromPT(ev.p, rh!.temperature)
      if (!re.ok) return re
      if (!(re.value.h > out.value.h))
        return bad('reheat temperature must be above the high-pressure turbine exit temperature', 'reheat.temperature')
      add('reheater exit (low-pressure turbine inlet)', re.value, m)
      reheatQ = m * (re.value.h - out.value.h)
      cur = re.value
    } else {
      // Open feedwater heater: y h_bleed + (1 - y) h_pumpI_out = h_heater_out.
      const hb = out.value.h
      y = (heaterOut!.h - pumpIOut!.h) / (hb - pumpIOut!.h)
      if (!(y > 0 && y < 1))
        return bad(
          `the bled steam cannot heat the feedwater at this feedwater-heater pressure (bleed fraction ${y})`,
          'openFeedwaterHeater.pressure',
        )
      bleedPoint = add('turbine extraction to the open feedwater heater', out.value, m)
      cur = out.value
      m = 1 - y
    }
  }
  const exit = expand(cur, pC)
  if (!exit.ok) return exit
  const wLast = m * (cur.h - exit.value.h)
  turbineWork += wLast
  turbineWorks.push({ name: sectionNames[section] ?? `turbine section ${section + 1}`, w: wLast })
  add('turbine exit (condenser inlet)', exit.value, m)
  heatIn += reheatQ
  const heatOut = m * (exit.value.h - s1.value.h)

  // Mass fractions through the low-pressure pump and the condenser side.
  if (fwh && pumpIOut) {
    pumpIOut.massFraction = 1 - y
    st1.massFraction = 1 - y
  }
  if (bleedPoint) bleedPoint.massFraction = 1 // the flow arriving at the extraction point
  // Pump work magnitudes.
  const pumpWorks: { name: string; w: number }[] = []
  if (fwh && pumpIIn && pumpIOut && heaterOut) {
    pumpWorks.push({ name: 'pump I (condensate)', w: (1 - y) * (pumpIOut.h - pumpIIn.h) })
    pumpWorks.push({ name: 'pump II (feedwater)', w: feed.h - heaterOut.h })
  } else {
    pumpWorks.push({ name: 'pump', w: feed.h - s1.value.h })
  }
  pumpWork = pumpWorks.reduce((a, b) => a + b.w, 0)
  const netWork = turbineWork - pumpWork

  // --- sign conventions --------------------------------------------------------------------
  for (const pw of pumpWorks) devicesEng.push({ device: pw.name, heat: 0, work: -pw.w })
  devicesEng.push({ device: 'boiler', heat: boilerQ, work: 0 })
  for (const tw of turbineWorks) devicesEng.push({ device: tw.name, heat: 0, work: tw.w })
  if (rh) devicesEng.push({ device: 'reheater', heat: reheatQ, work: 0 })
  if (fwh) devicesEng.push({ device: 'open feedwater heater (adiabatic mixing)', heat: 0, work: 0 })
  devicesEng.push({ device: 'condenser', heat: -heatOut, work: 0 })
  const engineering: ConventionReport = {
    convention: 'engineering',
    statement:
      'ΔU = Q − W: Q is heat added to the working fluid, W is work done BY the working fluid (turbine work positive, pump work negative).',
    devices: devicesEng,
    netHeat: heatIn - heatOut,
    netWork,
  }
  const chemistry: ConventionReport = {
    convention: 'chemistry',
    statement:
      'ΔU = q + w: q is heat added to the working fluid, w is work done ON the working fluid (pump work positive, turbine work negative).',
    devices: devicesEng.map((d) => ({ device: d.device, heat: d.heat, work: d.work === 0 ? 0 : -d.work })),
    netHeat: heatIn - heatOut,
    netWork: -netWork,
  }

  const parts: string[] = []
  if (etaP === 1 && etaT === 1) parts.push('ideal')
  else parts.push(`pump efficiency ${etaP}, turbine efficiency ${etaT}`)
  if (rh) parts.push('reheat')
  if (fwh) parts.push('one open feedwater heater')
  if (input.turbineInletQuality !== undefined && input.turbineInletQuality < 1) parts.push('wet turbine inlet')

  return ok({
    variant: `Rankine cycle (${parts.join(', ')})`,
    basis: 'per kg of steam through the boiler',
    states,
    bleedFraction: fwh ? y : null,
    pumpWork,
    turbineWork,
    heatIn,
    heatOut,
    netWork,
    thermalEfficiency: netWork / heatIn,
    backWorkRatio: pumpWork / turbineWork,
    turbineExitQuality: exit.value.x,
    conventions: { engineering, chemistry },
    caution: RANKINE_CAUTION,
  })
}
