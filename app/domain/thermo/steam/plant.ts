// A general steam plant on the Rankine cycle: any number of feedwater heaters, each open
// (direct contact; a deaerator is an open heater) or closed (tube-and-shell, drains cascaded
// backward through a trap or pumped forward), optional reheat, optional wet turbine inlet, and
// optional cogeneration (part of the steam extracted to a process heater).
//
// Units (SI, as the rest of the steam module): Pa, K, J/kg, J/(kg K), m^3/kg. Every specific
// energy is per kg of steam leaving the boiler (the boiler mass flow).
//
// Modelling choices (textbook practice, e.g. Cengel & Boles, Chapter 10):
//  - heaters are adiabatic and have no pressure losses; the bled steam enters at the turbine's
//    pressure at the extraction point;
//  - an open heater delivers saturated liquid at its pressure; a pump after it raises the
//    feedwater to the next open heater's pressure (or the boiler pressure);
//  - a closed heater's feedwater passes at the pressure of the pump that feeds it and leaves at
//    T_sat(p_bled) - TTD (terminal temperature difference, default 0 K); its drain leaves the
//    shell as saturated liquid at the bled-steam pressure and is either throttled backward
//    (isenthalpic trap) into the next lower-pressure heater (or the condenser below the lowest
//    heater), or pumped forward into the feedwater line just after the heater;
//  - the process heater returns its condensate as saturated liquid at the process pressure,
//    pumped to the boiler pressure and mixed into the feedwater at the boiler inlet;
//  - a heater at the reheat pressure takes its steam from the high-pressure turbine exhaust
//    (before reheating), as does a process extraction at that pressure.
// The bleed fractions come from the heater energy and mass balances. Pumped-forward drains
// couple a heater's inlet enthalpy to the bleed of the heater below, so the balances are solved
// by repeated substitution until every fraction is steady to 1e-15 (the balances then close
// to about 1e-12; each residual is reported).
//
// Errors: solveSteamPlant returns SteamResult<PlantResult>; bad input is a result error with a
// message, never a throw.
//
// Teaching tool: an idealised textbook analysis, not design data. Defer to the applicable codes
// and licensed engineering practice for any real plant.
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
import type { SteamState } from './properties.ts'
import { checkInletQuality, inletDescription, RANKINE_CAUTION } from './rankine.ts'
import type { ConventionReport, DeviceTransfer, RankineResult, RankineStatePoint } from './rankine.ts'

export const PLANT_CAUTION =
  'Teaching tool: an idealised textbook steam-plant analysis (feedwater heaters, cogeneration) with IAPWS-IF97 properties, not design data. Defer to the applicable codes and licensed engineering practice.'

export interface FeedwaterHeaterInput {
  /** 'open': direct contact (a deaerator is one); 'closed': tube-and-shell. */
  kind: 'open' | 'closed'
  /** Pressure of the bled steam (the heater shell), Pa. */
  pressure: number
  /** Closed only: terminal temperature difference T_sat(p) - T_feedwater,out, K (default 0). */
  terminalTemperatureDifference?: number
  /** Closed only: 'backward' (default) throttles the drain through a trap to the next
   *  lower-pressure heater, or to the condenser below the lowest heater; 'forward' pumps it
   *  into the feedwater line just after this heater. */
  drains?: 'backward' | 'forward'
  /** Optional label, e.g. 'deaerator'. */
  name?: string
}

export interface PlantInput {
  boilerPressure: number
  condenserPressure: number
  turbineInletTemperature?: number
  turbineInletQuality?: number
  pumpEfficiency?: number
  turbineEfficiency?: number
  reheat?: { pressure: number; temperature: number }
  /** Listed from the highest pressure (nearest the boiler) to the lowest. */
  feedwaterHeaters?: FeedwaterHeaterInput[]
  /** Cogeneration: `fraction` of the boiler flow extracted at `pressure` to a process heater. */
  process?: { pressure: number; fraction: number }
}

export interface HeaterResult {
  name: string
  kind: 'open' | 'closed'
  drains: 'backward' | 'forward' | null
  /** Pa */
  pressure: number
  /** Fraction of the boiler flow bled to this heater. */
  bleedFraction: number
  /** Bled-steam state (turbine extraction). */
  bleedEnthalpy: number
  bleedTemperature: number
  /** Feedwater leaving the heater (before any forward-drain mixing): K, J/kg. */
  feedwaterExitTemperature: number
  feedwaterExitEnthalpy: number
  /** Feedwater entering the heater, J/kg. */
  feedwaterInletEnthalpy: number
  /** Mass flow of feedwater through the heater (tubes, or into the open heater from below), per kg of boiler flow. */
  feedwaterFlow: number
  /** Drain flows arriving from the heater above, per kg of boiler flow. */
  drainsIn: number
  /** Heat given up by the steam side = heat taken by the feedwater, J per kg of boiler flow. */
  heatTransferred: number
  /** |energy in - energy out| / heat transferred, from the final state values. */
  balanceResidual: number
}

export interface PlantResult extends RankineResult {
  heaters: HeaterResult[]
  /** Fraction of the boiler flow to the process heater; null without cogeneration. */
  processFraction: number | null
  /** Heat delivered to the process, J per kg of boiler flow; null without cogeneration. */
  processHeat: number | null
  /** (netWork + processHeat) / heatIn; null without cogeneration. */
  utilisationFactor: number | null
  /** Fraction of the boiler flow reaching the condenser (turbine exhaust plus cascaded drains). */
  condenserFlow: number
}

function bad(message: string, property?: string): SteamResult<never> {
  const e: SteamError = { code: 'invalid-input', message }
  if (property) e.property = property
  return fail(e)
}

const finite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v)
const kPa = (p: number) => `${+(p / 1000).toPrecision(6)} kPa`

interface Heater {
  index: number
  name: string
  kind: 'open' | 'closed'
  drains: 'backward' | 'forward' | null
  p: number
  ttd: number
  /** saturated liquid at p (drain / open-heater exit) */
  hf: number
  Tsat: number
  /** feedwater pressure through a closed heater (the pump that feeds it) */
  pFeed: number
  // filled from the turbine path
  hb: number
  Tb: number
  // fixed feedwater-side states
  hOut: number
  TOut: number
  /** forward drain pumped to pFeed */
  hDrainPumped: number
  /** open heater: exit pumped to the next pressure */
  hPumped: number
  pPumpTo: number
  // unknowns
  y: number
  drainsIn: number
  flowDown: number
  flowTube: number
  hIn: number
}

/** Solve a steam plant. See PlantInput for the options and units. Never throws. */
export function solveSteamPlant(input: PlantInput): SteamResult<PlantResult> {
  try {
    return solve(input)
  } catch (e) {
    return fail({
      code: 'no-convergence',
      message: `internal error in the steam-plant solver: ${e instanceof Error ? e.message : String(e)}`,
    })
  }
}

function solve(input: PlantInput): SteamResult<PlantResult> {
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
    if (!finite(v)) return bad(`${name} must be a finite number`, name)
  }
  if (!(etaP > 0 && etaP <= 1)) return bad(`pumpEfficiency must be in (0, 1] (got ${etaP})`, 'pumpEfficiency')
  if (!(etaT > 0 && etaT <= 1)) return bad(`turbineEfficiency must be in (0, 1] (got ${etaT})`, 'turbineEfficiency')
  if (!(pC > 0)) return bad('condenserPressure must be positive', 'condenserPressure')
  if (!(pC < pB)) return bad('condenserPressure must be below boilerPressure', 'condenserPressure')
  if (pC >= STEAM_LIMITS.P_CRIT)
    return bad(
      'the condenser pressure must be below the critical pressure (22.064 MPa) for condensation',
      'condenserPressure',
    )
  const rh = input.reheat
  if (rh) {
    if (!finite(rh.pressure) || !finite(rh.temperature))
      return bad('reheat pressure and temperature must be finite numbers', 'reheat')
    if (!(rh.pressure > pC && rh.pressure < pB))
      return bad('reheat pressure must lie between the condenser and boiler pressures', 'reheat.pressure')
  }
  const proc = input.process
  if (proc) {
    if (!finite(proc.pressure) || !finite(proc.fraction))
      return bad('process pressure and fraction must be finite numbers', 'process')
    if (!(proc.pressure > pC && proc.pressure < pB))
      return bad('the process-steam pressure must lie between the condenser and boiler pressures', 'process.pressure')
    if (proc.pressure >= STEAM_LIMITS.P_CRIT)
      return bad(
        'the process-steam pressure must be below the critical pressure (the process heater returns saturated liquid)',
        'process.pressure',
      )
    if (!(proc.fraction > 0 && proc.fraction < 1))
      return bad(
        `the fraction of the steam sent to the process must lie strictly between 0 and 1 (got ${proc.fraction})`,
        'process.fraction',
      )
  }

  // --- heaters: validation ---------------------------------------------------------------
  const list = input.feedwaterHeaters ?? []
  if (!Array.isArray(list)) return bad('feedwaterHeaters must be a list', 'feedwaterHeaters')
  if (list.length > 12) return bad('at most 12 feedwater heaters', 'feedwaterHeaters')
  const heaters: Heater[] = []
  for (let i = 0; i < list.length; i++) {
    const h = list[i]!
    const where = `feedwaterHeaters.${i}`
    if (typeof h !== 'object' || h === null)
      return bad(`heater ${i + 1} must be an object with kind and pressure`, where)
    if (h.kind !== 'open' && h.kind !== 'closed')
      return bad(`heater ${i + 1}: kind must be "open" or "closed" (got ${JSON.stringify(h.kind)})`, `${where}.kind`)
    if (!finite(h.pressure)) return bad(`heater ${i + 1}: pressure must be a finite number`, `${where}.pressure`)
    if (!(h.pressure > pC && h.pressure < pB))
      return bad(
        `heater ${i + 1}: its pressure ${kPa(h.pressure)} must lie between the condenser (${kPa(pC)}) and boiler (${kPa(pB)}) pressures`,
        `${where}.pressure`,
      )
    if (h.pressure >= STEAM_LIMITS.P_CRIT)
      return bad(
        `heater ${i + 1}: its pressure must be below the critical pressure 22.064 MPa (its drain or exit is saturated liquid)`,
        `${where}.pressure`,
      )
    if (i > 0 && !(h.pressure < list[i - 1]!.pressure))
      return bad(
        `heater pressures out of order: list the heaters from the highest pressure (nearest the boiler) to the lowest, each lower than the one before (heater ${i + 1} at ${kPa(h.pressure)} follows heater ${i} at ${kPa(list[i - 1]!.pressure)})`,
        `${where}.pressure`,
      )
    if (h.kind === 'open' && (h.terminalTemperatureDifference !== undefined || h.drains !== undefined))
      return bad(
        `heater ${i + 1} is open (direct contact): it has no terminal temperature difference or drains; its exit is saturated liquid`,
        where,
      )
    const ttd = h.terminalTemperatureDifference ?? 0
    if (!finite(ttd))
      return bad(
        `heater ${i + 1}: terminal temperature difference must be a finite number of kelvins`,
        `${where}.terminalTemperatureDifference`,
      )
    if (h.drains !== undefined && h.drains !== 'backward' && h.drains !== 'forward')
      return bad(
        `heater ${i + 1}: drains must be "backward" (cascaded through a trap) or "forward" (pumped into the feedwater line)`,
        `${where}.drains`,
      )
    const sat = stateFromPx(h.pressure, 0)
    if (!sat.ok) return sat
    const name = h.name ?? `${h.kind} feedwater heater ${i + 1}`
    heaters.push({
      index: i,
      name,
      kind: h.kind,
      drains: h.kind === 'closed' ? (h.drains ?? 'backward') : null,
      p: h.pressure,
      ttd,
      hf: sat.value.h,
      Tsat: sat.value.T,
      pFeed: NaN,
      hb: NaN,
      Tb: NaN,
      hOut: NaN,
      TOut: NaN,
      hDrainPumped: NaN,
      hPumped: NaN,
      pPumpTo: NaN,
      y: 0,
      drainsIn: 0,
      flowDown: 0,
      flowTube: 0,
      hIn: NaN,
    })
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

  // --- boiler exit -------------------------------------------------------------------------
  let inlet: SteamResult<SteamState>
  if (input.turbineInletQuality !== undefined) {
    const e = checkInletQuality(input.turbineInletQuality, pB, input.turbineInletTemperature)
    if (e) return fail(e)
    inlet = stateFromPx(pB, input.turbineInletQuality)
  } else if (input.turbineInletTemperature === undefined) {
    if (pB >= STEAM_LIMITS.P_CRIT)
      return bad(
        'give turbineInletTemperature: above the critical pressure there is no saturated vapour',
        'turbineInletTemperature',
      )
    inlet = stateFromPx(pB, 1)
  } else {
    const T3 = input.turbineInletTemperature
    if (!finite(T3)) return bad('turbineInletTemperature must be a finite number', 'turbineInletTemperature')
    if (pB < STEAM_LIMITS.P_CRIT) {
      const Ts = saturationTemperature(pB)
      if (Ts.ok && T3 <= Ts.value)
        return bad(
          `turbine inlet temperature ${T3} K is not above the saturation temperature ${Ts.value} K at the boiler pressure: the steam would not be superheated vapour (give turbineInletQuality for wet steam)`,
          'turbineInletTemperature',
        )
    }
    inlet = stateFromPT(pB, T3)
  }
  if (!inlet.ok) return inlet

  // --- turbine path: expansion states at every extraction / reheat pressure ------------------
  const pressures = [
    ...new Set([...heaters.map((h) => h.p), ...(rh ? [rh.pressure] : []), ...(proc ? [proc.pressure] : [])]),
  ].sort((a, b) => b - a)
  interface Stop {
    p: number
    /** turbine state arriving at p (before any reheat) */
    at: SteamState
    /** state leaving p into the next section (reheated or not) */
    leave: SteamState
    reheated: boolean
  }
  const stops: Stop[] = []
  let cur = inlet.value
  for (const p of pressures) {
    const out = expand(cur, p)
    if (!out.ok) return out
    let leave = out.value
    const reheated = !!rh && p === rh.pressure
    if (reheated) {
      const re = stateFromPT(p, rh!.temperature)
      if (!re.ok) return re
      if (!(re.value.h > out.value.h))
        return bad('reheat temperature must be above the high-pressure turbine exit temperature', 'reheat.temperature')
      leave = re.value
    }
    stops.push({ p, at: out.value, leave, reheated })
    cur = leave
  }
  const exhaust = expand(cur, pC)
  if (!exhaust.ok) return exhaust
  const stopAt = (p: number) => stops.find((s) => s.p === p)!
  for (const h of heaters) {
    const st = stopAt(h.p).at
    h.hb = st.h
    h.Tb = st.T
  }

  // --- feedwater side: fixed states -----------------------------------------------------------
  const cond = stateFromPx(pC, 0)
  if (!cond.ok) return cond
  // Pressure after each pump: the next open heater above, or the boiler.
  const asc = [...heaters].reverse() // lowest pressure first
  const nextOpenAbove = (i: number): number => {
    for (let k = i + 1; k < asc.length; k++) if (asc[k]!.kind === 'open') return asc[k]!.p
    return pB
  }
  const condPumpTo = nextOpenAbove(-1)
  const condPumped = pump(cond.value, condPumpTo)
  if (!condPumped.ok) return condPumped
  let segP = condPumpTo
  for (let i = 0; i < asc.length; i++) {
    const h = asc[i]!
    if (h.kind === 'open') {
      const sat = stateFromPx(h.p, 0)
      if (!sat.ok) return sat
      h.pPumpTo = nextOpenAbove(i)
      const out = pump(sat.value, h.pPumpTo)
      if (!out.ok) return out
      h.hPumped = out.value.h
      h.hOut = sat.value.h
      h.TOut = sat.value.T
      segP = h.pPumpTo
    } else {
      h.pFeed = segP
      const TOut = h.Tsat - h.ttd
      // Leaving at the bled steam's own temperature (TTD 0 with wet or saturated bled steam) is
      // the textbook ideal; hotter than the bled steam is impossible.
      if (!(TOut <= h.Tb + 1e-9))
        return bad(
          `${h.name}: with a terminal temperature difference of ${h.ttd} K the feedwater would leave at ${TOut.toFixed(2)} K, hotter than the bled steam's ${h.Tb.toFixed(2)} K: a heater cannot make the feedwater hotter than the steam heating it (use a larger terminal temperature difference)`,
          `feedwaterHeaters.${h.index}.terminalTemperatureDifference`,
        )
      const out = stateFromPT(h.pFeed, TOut)
      if (!out.ok) return out
      if (out.value.x !== null || out.value.phase === 'vapour')
        return bad(
          `${h.name}: the feedwater would not stay liquid at ${kPa(h.pFeed)} and ${TOut.toFixed(2)} K`,
          `feedwaterHeaters.${h.index}`,
        )
      h.hOut = out.value.h
      h.TOut = TOut
      if (h.drains === 'forward') {
        const sat = stateFromPx(h.p, 0)
        if (!sat.ok) return sat
        const dp = pump(sat.value, h.pFeed)
        if (!dp.ok) return dp
        h.hDrainPumped = dp.value.h
      }
    }
  }
  let procLiquid: SteamState | null = null
  let procReturn: SteamState | null = null
  if (proc) {
    const a = stateFromPx(proc.pressure, 0)
    if (!a.ok) return a
    const b = pump(a.value, pB)
    if (!b.ok) return b
    procLiquid = a.value
    procReturn = b.value
  }
  const yP = proc ? proc.fraction : 0

  // --- heater balances: repeated substitution --------------------------------------------------
  // Bottom-up: feedwater enthalpy entering each heater given the flows (forward drains mix).
  const feedUp = () => {
    let h = condPumped.value.h
    for (const ht of asc) {
      ht.hIn = h
      if (ht.kind === 'open') h = ht.hPumped
      else if (ht.drains === 'forward')
        h = ht.flowDown > 0 ? (ht.flowTube * ht.hOut + (ht.y + ht.drainsIn) * ht.hDrainPumped) / ht.flowDown : ht.hOut
      else h = ht.hOut
    }
    return h
  }
  // Top-down: bleed fractions and flows given the inlet enthalpies.
  const flowsDown = (): SteamError | null => {
    let F = 1 - yP // feedwater leaving the top of the train (the process return joins at the boiler)
    let D = 0 // drains cascading backward into the next heater
    let hD = 0
    for (const ht of heaters) {
      ht.flowDown = F
      ht.drainsIn = D
      if (ht.kind === 'open') {
        // y hb + D hD + Fin hIn = F hf ; y + D + Fin = F
        ht.y = (F * (ht.hOut - ht.hIn) - D * (hD - ht.hIn)) / (ht.hb - ht.hIn)
        ht.flowTube = F - ht.y - D
        F = ht.flowTube
        D = 0
      } else {
        const dT = ht.hOut - ht.hIn
        if (ht.drains === 'forward') {
          // y (hb - hf) + D (hD - hf) = (F - y - D) dT
          ht.y = ((F - D) * dT - D * (hD - ht.hf)) / (ht.hb - ht.hf + dT)
          ht.flowTube = F - ht.y - D
          F = ht.flowTube
          D = 0
        } else {
          // y (hb - hf) + D (hD - hf) = F dT
          ht.y = (F * dT - D * (hD - ht.hf)) / (ht.hb - ht.hf)
          ht.flowTube = F
          D = D + ht.y
          hD = ht.hf
        }
      }
      if (!Number.isFinite(ht.y))
        return { code: 'no-convergence', message: `${ht.name}: the heater balance has no solution` }
    }
    return null
  }
  let converged = false
  for (let it = 0; it < 500; it++) {
    const before = heaters.map((h) => h.y)
    feedUp()
    const e = flowsDown()
    if (e) return fail(e)
    if (heaters.every((h, i) => Math.abs(h.y - before[i]!) <= 1e-15)) {
      converged = true
      break
    }
  }
  if (!converged)
    return fail({
      code: 'no-convergence',
      message: 'the feedwater-heater balances did not settle (please report these inputs)',
    })
  const topFeed = feedUp()

  for (const ht of heaters) {
    const where = `feedwaterHeaters.${ht.index}`
    if (!(ht.hOut > ht.hIn))
      return bad(
        `${ht.name} at ${kPa(ht.p)}: the feedwater arrives at ${(ht.hIn / 1000).toFixed(2)} kJ/kg and would leave at ${(ht.hOut / 1000).toFixed(2)} kJ/kg, so it would not be heated: check the heater pressures${ht.kind === 'closed' ? ' and its terminal temperature difference' : ''}`,
        `${where}.pressure`,
      )
    if (!(ht.y > 0 && ht.y < 1))
      return bad(
        `${ht.name} at ${kPa(ht.p)}: its balance gives a bleed fraction ${ht.y}, outside (0, 1): ${
          ht.y <= 0 && ht.drainsIn > 0
            ? 'the drains cascaded into it from the heater above already bring more heat than the feedwater can take (add a heater between them, pump those drains forward, or change the pressures)'
            : 'the bled steam cannot do this heating (check the heater pressures and order)'
        }`,
        `${where}.pressure`,
      )
    if (!(ht.flowTube > 0))
      return bad(
        `${ht.name}: the heater balances leave no feedwater flowing through it (${ht.flowTube}): too much steam is bled`,
        `${where}.pressure`,
      )
  }

  // Turbine flows: m after each stop.
  let m = 1
  let turbineWork = 0
  const sectionWorks: { name: string; w: number; from: number; to: number; m: number }[] = []
  let from = inlet.value
  let fromP = pB
  const mAt = new Map<number, number>()
  for (const st of stops) {
    const w = m * (from.h - st.at.h)
    sectionWorks.push({ name: '', w, from: fromP, to: st.p, m })
    turbineWork += w
    mAt.set(st.p, m)
    const bled =
      heaters.filter((h) => h.p === st.p).reduce((a, h) => a + h.y, 0) + (proc && proc.pressure === st.p ? yP : 0)
    m -= bled
    if (!(m > 0))
      return bad(
        `the extractions at and above ${kPa(st.p)} take all the steam (${1 - m} of the boiler flow): nothing would be left to expand further`,
        'feedwaterHeaters',
      )
    from = st.leave
    fromP = st.p
  }
  const wLast = m * (from.h - exhaust.value.h)
  sectionWorks.push({ name: '', w: wLast, from: fromP, to: pC, m })
  turbineWork += wLast
  const mLast = m
  sectionWorks.forEach((s, i) => {
    s.name = sectionWorks.length === 1 ? 'turbine' : `turbine section ${i + 1} (${kPa(s.from)} → ${kPa(s.to)})`
  })

  // Flow to the condenser: turbine exhaust + drains cascaded below the lowest heater.
  const lowest = heaters[heaters.length - 1]
  const drainsToCondenser =
    lowest && lowest.kind === 'closed' && lowest.drains === 'backward' ? lowest.drainsIn + lowest.y : 0
  const condenserFlow = mLast + drainsToCondenser
  const bottomFlow = asc.length ? asc[0]!.flowTube : 1 - yP
  // Mass balance at the condensate pump (closed form: what leaves the condenser is what the train takes).
  const massResidual = Math.abs(condenserFlow - bottomFlow)
  if (massResidual > 1e-9)
    return fail({
      code: 'no-convergence',
      message: `mass balance at the condenser does not close (${massResidual}); please report these inputs`,
    })

  const boilerIn = (1 - yP) * topFeed + (procReturn ? yP * procReturn.h : 0)
  const boilerQ = inlet.value.h - boilerIn
  let reheatQ = 0
  // Mass through the reheater is what is left after the extractions at that pressure.
  if (rh) {
    const st = stopAt(rh.pressure)
    const bled =
      heaters.filter((h) => h.p === st.p).reduce((a, h) => a + h.y, 0) + (proc && proc.pressure === st.p ? yP : 0)
    reheatQ = (mAt.get(st.p)! - bled) * (st.leave.h - st.at.h)
  }
  const heatIn = boilerQ + reheatQ
  const heatOut = mLast * (exhaust.value.h - cond.value.h) + drainsToCondenser * ((lowest?.hf ?? 0) - cond.value.h)
  const processHeat = proc && procLiquid ? yP * (stopAt(proc.pressure).at.h - procLiquid.h) : null

  // Pumps.
  const pumpWorks: { name: string; w: number }[] = []
  pumpWorks.push({
    name: heaters.length || proc ? 'condensate pump' : 'pump',
    w: bottomFlow * (condPumped.value.h - cond.value.h),
  })
  for (const ht of asc) {
    if (ht.kind === 'open') pumpWorks.push({ name: `pump after ${ht.name}`, w: ht.flowDown * (ht.hPumped - ht.hOut) })
    else if (ht.drains === 'forward')
      pumpWorks.push({ name: `drain pump of ${ht.name}`, w: (ht.y + ht.drainsIn) * (ht.hDrainPumped - ht.hf) })
  }
  if (procLiquid && procReturn)
    pumpWorks.push({ name: 'process-condensate pump', w: yP * (procReturn.h - procLiquid.h) })
  const pumpWork = pumpWorks.reduce((a, b) => a + b.w, 0)
  const netWork = turbineWork - pumpWork

  // --- heater results and residuals ------------------------------------------------------------
  const heaterResults: HeaterResult[] = heaters.map((ht, i) => {
    const hD = i > 0 ? heaters[i - 1]!.hf : 0
    let inE: number
    let outE: number
    let q: number
    if (ht.kind === 'open') {
      inE = ht.y * ht.hb + ht.drainsIn * hD + ht.flowTube * ht.hIn
      outE = ht.flowDown * ht.hOut
      q = ht.flowTube * (ht.hOut - ht.hIn)
    } else {
      inE = ht.y * ht.hb + ht.drainsIn * hD + ht.flowTube * ht.hIn
      outE = (ht.y + ht.drainsIn) * ht.hf + ht.flowTube * ht.hOut
      q = ht.flowTube * (ht.hOut - ht.hIn)
    }
    return {
      name: ht.name,
      kind: ht.kind,
      drains: ht.drains,
      pressure: ht.p,
      bleedFraction: ht.y,
      bleedEnthalpy: ht.hb,
      bleedTemperature: ht.Tb,
      feedwaterExitTemperature: ht.TOut,
      feedwaterExitEnthalpy: ht.hOut,
      feedwaterInletEnthalpy: ht.hIn,
      feedwaterFlow: ht.flowTube,
      drainsIn: ht.drainsIn,
      heatTransferred: q,
      balanceResidual: Math.abs(inE - outE) / q,
    }
  })

  // --- states --------------------------------------------------------------------------------
  const states: RankineStatePoint[] = []
  const add = (description: string, st: SteamState, massFraction: number) => {
    states.push({
      label: String(states.length + 1),
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
    })
  }
  const at = (p: number, h: number): SteamResult<SteamState> => stateFromPH(p, h)
  add('condenser exit, saturated liquid (condensate pump inlet)', cond.value, condenserFlow)
  add(`condensate pump exit (${kPa(condPumpTo)})`, condPumped.value, bottomFlow)
  for (const ht of asc) {
    if (ht.kind === 'open') {
      const s1 = stateFromPx(ht.p, 0)
      if (!s1.ok) return s1
      add(`${ht.name} exit, saturated liquid`, s1.value, ht.flowDown)
      const s2 = at(ht.pPumpTo, ht.hPumped)
      if (!s2.ok) return s2
      add(`pump exit after ${ht.name} (${kPa(ht.pPumpTo)})`, s2.value, ht.flowDown)
    } else {
      const s1 = at(ht.pFeed, ht.hOut)
      if (!s1.ok) return s1
      add(`feedwater leaving ${ht.name} (T_sat(${kPa(ht.p)}) − ${ht.ttd} K)`, s1.value, ht.flowTube)
      const drain = stateFromPx(ht.p, 0)
      if (!drain.ok) return drain
      add(
        `${ht.name} drain, saturated liquid (${ht.drains === 'forward' ? 'to its drain pump' : 'through a trap to the next lower heater'})`,
        drain.value,
        ht.y + ht.drainsIn,
      )
      if (ht.drains === 'forward') {
        const s2 = at(ht.pFeed, ht.hDrainPumped)
        if (!s2.ok) return s2
        add(`drain pump exit of ${ht.name}`, s2.value, ht.y + ht.drainsIn)
        const hMix = (ht.flowTube * ht.hOut + (ht.y + ht.drainsIn) * ht.hDrainPumped) / ht.flowDown
        const s3 = at(ht.pFeed, hMix)
        if (!s3.ok) return s3
        add(`feedwater after mixing in the drain of ${ht.name}`, s3.value, ht.flowDown)
      }
    }
  }
  if (procLiquid && procReturn) {
    add('process heater exit, saturated liquid', procLiquid, yP)
    add('process-condensate pump exit', procReturn, yP)
    const mix = at(pB, boilerIn)
    if (!mix.ok) return mix
    add('boiler inlet (feedwater mixed with the process condensate)', mix.value, 1)
  }
  add(inletDescription(input), inlet.value, 1)
  for (const st of stops) {
    const uses = [
      ...heaters.filter((h) => h.p === st.p).map((h) => h.name),
      ...(proc && proc.pressure === st.p ? ['process heater'] : []),
    ]
    const what = [uses.length ? `extraction to ${uses.join(' and ')}` : '', st.reheated ? 'to the reheater' : '']
      .filter(Boolean)
      .join('; ')
    add(`turbine at ${kPa(st.p)}${what ? ` (${what})` : ''}`, st.at, mAt.get(st.p)!)
    if (st.reheated) {
      const bled =
        heaters.filter((h) => h.p === st.p).reduce((a, h) => a + h.y, 0) + (proc && proc.pressure === st.p ? yP : 0)
      add('reheater exit', st.leave, mAt.get(st.p)! - bled)
    }
  }
  add('turbine exit (condenser inlet)', exhaust.value, mLast)

  // --- conventions -----------------------------------------------------------------------------
  const devices: DeviceTransfer[] = []
  for (const pw of pumpWorks) devices.push({ device: pw.name, heat: 0, work: -pw.w })
  devices.push({ device: 'boiler', heat: boilerQ, work: 0 })
  for (const tw of sectionWorks) devices.push({ device: tw.name, heat: 0, work: tw.w })
  if (rh) devices.push({ device: 'reheater', heat: reheatQ, work: 0 })
  for (const ht of heaters) devices.push({ device: `${ht.name} (adiabatic)`, heat: 0, work: 0 })
  if (proc) devices.push({ device: 'process heater', heat: -processHeat!, work: 0 })
  devices.push({ device: 'condenser', heat: -heatOut, work: 0 })
  const netHeat = heatIn - heatOut - (processHeat ?? 0)
  const engineering: ConventionReport = {
    convention: 'engineering',
    statement:
      'ΔU = Q − W: Q is heat added to the working fluid, W is work done BY the working fluid (turbine work positive, pump work negative).',
    devices,
    netHeat,
    netWork,
  }
  const chemistry: ConventionReport = {
    convention: 'chemistry',
    statement:
      'ΔU = q + w: q is heat added to the working fluid, w is work done ON the working fluid (pump work positive, turbine work negative).',
    devices: devices.map((d) => ({ device: d.device, heat: d.heat, work: d.work === 0 ? 0 : -d.work })),
    netHeat,
    netWork: -netWork,
  }

  const parts: string[] = []
  if (etaP === 1 && etaT === 1) parts.push('ideal')
  else parts.push(`pump efficiency ${etaP}, turbine efficiency ${etaT}`)
  if (input.turbineInletQuality !== undefined && input.turbineInletQuality < 1) parts.push('wet turbine inlet')
  if (rh) parts.push('reheat')
  const nOpen = heaters.filter((h) => h.kind === 'open').length
  const nClosed = heaters.length - nOpen
  if (nOpen) parts.push(`${nOpen} open feedwater heater${nOpen > 1 ? 's' : ''}`)
  if (nClosed) parts.push(`${nClosed} closed feedwater heater${nClosed > 1 ? 's' : ''}`)
  if (proc) parts.push(`cogeneration (${proc.fraction} of the steam to process at ${kPa(proc.pressure)})`)

  return ok({
    variant: `Steam plant, Rankine cycle (${parts.join(', ')})`,
    basis: 'per kg of steam through the boiler',
    states,
    bleedFraction: heaters.length ? heaters.reduce((a, h) => a + h.y, 0) : null,
    pumpWork,
    turbineWork,
    heatIn,
    heatOut,
    netWork,
    thermalEfficiency: netWork / heatIn,
    backWorkRatio: pumpWork / turbineWork,
    turbineExitQuality: exhaust.value.x,
    conventions: { engineering, chemistry },
    caution: proc || heaters.length ? PLANT_CAUTION : RANKINE_CAUTION,
    heaters: heaterResults,
    processFraction: proc ? yP : null,
    processHeat,
    utilisationFactor: proc ? (netWork + processHeat!) / heatIn : null,
    condenserFlow,
  })
}
