/**
 * Two-stage and cascade vapour-compression refrigeration, on the refrigerant properties of this
 * folder (Helmholtz equations of state). Pure; never throws.
 *
 * Two-stage compression with a flash chamber (open, direct-contact) and a mixing chamber — the
 * textbook arrangement (e.g. Çengel & Boles, Thermodynamics: An Engineering Approach, section on
 * multistage compression refrigeration systems), numbered as there:
 *
 *   1 evaporator exit (saturated vapour at p_evap) → 2 low-stage compressor exit (p_i)
 *   → 3 mixing chamber exit: 2 mixed with the flash vapour 9 (p_i) → 4 high-stage compressor
 *   exit (p_cond) → 5 condenser exit (saturated liquid) → 6 after the high-pressure valve
 *   (h6 = h5, a mixture at p_i) → flash chamber: 7 saturated liquid, 9 saturated vapour
 *   → 8 after the low-pressure valve (h8 = h7, at p_evap) → evaporator → 1.
 *
 * Per kg of refrigerant through the condenser, x6 leaves the flash chamber as vapour and
 * 1 − x6 goes through the evaporator. Optional superheat at the evaporator exit (1) and
 * subcooling at the condenser exit (5), as in the single-stage cycle; the flash chamber's
 * states 7 and 9 stay saturated, so a liquid subcooled below the flash chamber's saturation
 * temperature (h5 < h7: nothing would flash) is refused. The intermediate pressure defaults to √(p_evap·p_cond),
 * a common rule of thumb (not an optimum for every fluid).
 *
 * Cascade: two single-stage cycles (solveVapourCompression) coupled by an adiabatic cascade
 * heat exchanger, the lower cycle's condenser being the upper cycle's evaporator; the energy
 * balance of the exchanger gives ṁ_upper/ṁ_lower = q_H,lower / q_L,upper. Lower cycle
 * states 1–4, upper cycle 5–8 (as in the same textbook). Optional superheat at the cold
 * evaporator's exit (1) and subcooling at the outer condenser's exit (7); the exchanger's two
 * sides stay saturated.
 *
 * Teaching tool: not design data; defer to the applicable codes (e.g. refrigeration safety
 * standards), standards and licensed engineering practice for any real refrigeration plant.
 */
import type { FluidResult, FluidState, Refrigerant } from './types.ts'
import {
  TON_OF_REFRIGERATION,
  VAPOUR_COMPRESSION_CAUTION,
  solveVapourCompression,
  type CycleState,
  type SaturationGiven,
  type VapourCompressionResult,
} from './vapour-compression.ts'

export type RefrigerationFailureOutcome = {
  readonly ok: false
  readonly error: { readonly code: string; readonly message: string; readonly property?: string }
}

const bad = (message: string, property?: string, code = 'invalid-input'): RefrigerationFailureOutcome => ({
  ok: false,
  error: { code, message, ...(property ? { property } : {}) },
})
const k = (x: number) => Number(x.toPrecision(4))
const mpa = (p: number) => `${k(p / 1e6)} MPa`

function take(
  r: FluidResult<FluidState>,
  where: string,
  property?: string,
): { ok: true; s: FluidState } | { ok: false; fail: RefrigerationFailureOutcome } {
  return r.ok
    ? { ok: true, s: r.value }
    : { ok: false, fail: bad(`${where}: ${r.error.message}`, property, r.error.code) }
}

/** a saturation state below the critical point, or a failure naming the device */
function subcritical(
  f: Refrigerant,
  g: SaturationGiven,
  what: string,
  property: string,
): { ok: true; p: number; T: number } | { ok: false; fail: RefrigerationFailureOutcome } {
  if ('T' in g ? !Number.isFinite(g.T) : !Number.isFinite(g.p))
    return { ok: false, fail: bad(`${what}: give a finite temperature or pressure`, property) }
  if ('p' in g ? g.p >= f.pc : g.T >= f.Tc)
    return {
      ok: false,
      fail: bad(
        `${what}: ${'p' in g ? mpa(g.p) : `${k(g.T)} K`} is at or above the critical point of ${f.id} (${mpa(f.pc)}, ${k(f.Tc)} K); this cycle needs liquid–vapour states there`,
        property,
        'out-of-range',
      ),
    }
  const r = 'T' in g ? f.saturationT(g.T) : f.saturationP(g.p)
  if (!r.ok) return { ok: false, fail: bad(`${what}: ${r.error.message}`, property, r.error.code) }
  return { ok: true, p: r.value.p, T: r.value.T }
}

function checkEta(eta: number, property: string): RefrigerationFailureOutcome | null {
  return eta > 0 && eta <= 1 ? null : bad(`${property} must be in (0, 1] (got ${eta})`, property)
}

function checkKelvins(dT: number, property: string): RefrigerationFailureOutcome | null {
  return dT >= 0 && Number.isFinite(dT) ? null : bad(`${property} must be 0 K or more`, property)
}

/** Saturated vapour at p, or superheated by sh kelvins above its saturation temperature T. */
function vapourOut(f: Refrigerant, p: number, T: number, sh: number, where: string) {
  return sh === 0 ? take(f.statePx(p, 1), where, 'evaporator') : take(f.stateTP(T + sh, p), where, 'superheat')
}

/** Saturated liquid at p, or subcooled by sc kelvins below its saturation temperature T. */
function liquidOut(f: Refrigerant, p: number, T: number, sc: number, where: string) {
  if (sc === 0) return take(f.statePx(p, 0), where, 'condenser')
  if (T - sc <= f.Ttriple)
    return {
      ok: false as const,
      fail: bad(
        `${where}: ${k(sc)} K of subcooling is below the triple point of ${f.id}`,
        'subcooling',
        'out-of-range',
      ),
    }
  return take(f.stateTP(T - sc, p), where, 'subcooling')
}

/**
 * (p, h) → state, on the dome's edges too: inside [h_f, h_g] (to 1e-9 relative) the state is
 * the saturated mixture at p with x = (h − h_f)/(h_g − h_f), so that a limiting case (a
 * flash chamber at the condenser's or the evaporator's pressure) lands on the saturation line
 * instead of asking the (p, h) flash for a state exactly on it.
 */
function statePH(
  f: Refrigerant,
  p: number,
  h: number,
  where: string,
  property?: string,
): { ok: true; s: FluidState } | { ok: false; fail: RefrigerationFailureOutcome } {
  const liq = take(f.statePx(p, 0), where, property)
  if (!liq.ok) return liq
  const vap = take(f.statePx(p, 1), where, property)
  if (!vap.ok) return vap
  const hf = liq.s.h
  const hg = vap.s.h
  const eps = 1e-9 * Math.max(Math.abs(hf), Math.abs(hg), 1)
  if (h < hf - eps || h > hg + eps) return take(f.statePH(p, h), where, property)
  const x = Math.min(1, Math.max(0, (h - hf) / (hg - hf)))
  return x === 0 ? liq : x === 1 ? vap : take(f.statePx(p, x), where, property)
}

function compress(
  f: Refrigerant,
  inlet: FluidState,
  p: number,
  eta: number,
  where: string,
): { ok: true; s: FluidState } | { ok: false; fail: RefrigerationFailureOutcome } {
  // no pressure rise (a limiting case): no compression
  if (p <= inlet.p * (1 + 1e-12)) return { ok: true, s: inlet }
  const iso = take(f.statePS(p, inlet.s), `${where} (isentropic)`)
  if (!iso.ok || eta === 1) return iso
  return statePH(f, p, inlet.h + (iso.s.h - inlet.h) / eta, where)
}

// ---------------------------------------------------------------------------------------------
// Two-stage compression with a flash chamber

export interface TwoStageInput {
  readonly refrigerant: Refrigerant
  readonly evaporator: SaturationGiven
  readonly condenser: SaturationGiven
  /** the flash chamber's pressure, Pa (default √(p_evap·p_cond)) */
  readonly intermediatePressure?: number
  /** isentropic efficiencies, 0 < η ≤ 1 (default 1) */
  readonly lowStageEfficiency?: number
  readonly highStageEfficiency?: number
  /** K of superheat at the evaporator exit, K of subcooling at the condenser exit (default 0) */
  readonly superheat?: number
  readonly subcooling?: number
  /** at most one: kg/s through the condenser (high stage), kg/s through the evaporator (low stage), or a capacity in W */
  readonly highStageMassFlow?: number
  readonly lowStageMassFlow?: number
  readonly capacity?: number
}

export interface TwoStageResult {
  readonly states: readonly CycleState[]
  readonly intermediatePressure: number
  readonly intermediatePressureDefaulted: boolean
  /** x6: the fraction of the refrigerant entering the flash chamber that leaves it as vapour */
  readonly flashVapourFraction: number
  /** ṁ_low/ṁ_high = 1 − x6 */
  readonly lowToHighMassRatio: number
  /** J/kg, per kg through the evaporator: h1 − h8 */
  readonly refrigerationEffectPerKgEvaporator: number
  /** J/kg, per kg through the condenser (the textbook basis): (1 − x6)(h1 − h8), and likewise below */
  readonly refrigerationEffect: number
  readonly lowStageWork: number
  readonly highStageWork: number
  readonly compressorWork: number
  readonly heatRejected: number
  readonly copRefrigerator: number
  readonly copHeatPump: number
  readonly carnotCopRefrigerator: number
  readonly carnotCopHeatPump: number
  /** kg/s and W, when a flow or capacity is given */
  readonly highStageMassFlow: number | null
  readonly lowStageMassFlow: number | null
  readonly capacity: number | null
  readonly capacityTons: number | null
  readonly lowStagePower: number | null
  readonly highStagePower: number | null
  readonly compressorPower: number | null
  readonly heatRejectionRate: number | null
  /** the energy balances, relative residuals (should be ~1e-15) */
  readonly balances: { readonly flashChamber: number; readonly mixingChamber: number; readonly cycle: number }
  readonly caution: string
}

export type TwoStageOutcome = { readonly ok: true; readonly value: TwoStageResult } | RefrigerationFailureOutcome

function flowChoice(
  given: readonly [string, number | undefined][],
): { ok: true; which: string | null; value: number } | { ok: false; fail: RefrigerationFailureOutcome } {
  const present = given.filter((g): g is [string, number] => g[1] !== undefined)
  if (present.length > 1)
    return {
      ok: false,
      fail: bad(`give at most one of ${given.map(([n]) => n).join(', ')}`, present[1]![0]),
    }
  if (present.length === 0) return { ok: true, which: null, value: 0 }
  const [which, value] = present[0]!
  if (!(value > 0 && Number.isFinite(value))) return { ok: false, fail: bad(`${which} must be positive`, which) }
  return { ok: true, which, value }
}

export function solveTwoStage(input: TwoStageInput): TwoStageOutcome {
  const f = input.refrigerant
  const etaL = input.lowStageEfficiency ?? 1
  const etaH = input.highStageEfficiency ?? 1
  const sh = input.superheat ?? 0
  const sc = input.subcooling ?? 0
  const e =
    checkEta(etaL, 'lowStageEfficiency') ??
    checkEta(etaH, 'highStageEfficiency') ??
    checkKelvins(sh, 'superheat') ??
    checkKelvins(sc, 'subcooling')
  if (e) return e
  const flow = flowChoice([
    ['highStageMassFlow', input.highStageMassFlow],
    ['lowStageMassFlow', input.lowStageMassFlow],
    ['capacity', input.capacity],
  ])
  if (!flow.ok) return flow.fail

  const ev = subcritical(f, input.evaporator, 'evaporator', 'evaporator')
  if (!ev.ok) return ev.fail
  const cd = subcritical(f, input.condenser, 'condenser', 'condenser')
  if (!cd.ok) return cd.fail
  const pL = ev.p
  const pH = cd.p
  if (!(pH > pL) || !(cd.T > ev.T))
    return bad(`the evaporator (${k(ev.T)} K) must be colder than the condenser (${k(cd.T)} K)`, 'evaporator')
  const defaulted = input.intermediatePressure === undefined
  let pI = input.intermediatePressure ?? Math.sqrt(pL * pH)
  // a pressure given equal to an end (to 1e-9) is that end: the limiting single-stage cases
  if (Math.abs(pI - pL) <= 1e-9 * pL) pI = pL
  if (Math.abs(pI - pH) <= 1e-9 * pH) pI = pH
  if (!Number.isFinite(pI) || pI < pL || pI > pH)
    return bad(
      `the flash chamber's pressure (${Number.isFinite(pI) ? mpa(pI) : String(pI)}) must lie between the evaporator's (${mpa(pL)}) and the condenser's (${mpa(pH)})`,
      'intermediatePressure',
      'out-of-range',
    )

  const s1r = vapourOut(f, pL, ev.T, sh, 'evaporator exit')
  if (!s1r.ok) return s1r.fail
  const s1 = s1r.s
  const s5r = liquidOut(f, pH, cd.T, sc, 'condenser exit')
  if (!s5r.ok) return s5r.fail
  const s5 = s5r.s
  const s7r = take(f.statePx(pI, 0), 'flash chamber liquid', 'intermediatePressure')
  if (!s7r.ok) return s7r.fail
  const s7 = s7r.s
  const s9r = take(f.statePx(pI, 1), 'flash chamber vapour', 'intermediatePressure')
  if (!s9r.ok) return s9r.fail
  const s9 = s9r.s

  // A liquid colder than the flash chamber's saturation temperature would not flash: the
  // saturated states 7 and 9 could not both leave it.
  if (s5.h < s7.h * (1 - 1e-12))
    return bad(
      `the condenser exit (${k(s5.T)} K with ${k(sc)} K of subcooling) is colder than the flash chamber's saturation temperature (${k(s7.T)} K), so nothing would flash there: give less subcooling or a lower flash chamber pressure`,
      'subcooling',
      'unphysical',
    )
  // 6: throttled to the flash chamber (h6 = h5), its quality from the saturation pair at p_i
  const s6r = statePH(f, pI, s5.h, 'after the high-pressure valve', 'intermediatePressure')
  if (!s6r.ok) return s6r.fail
  const s6 = s6r.s
  const x6 = Math.min(1, Math.max(0, (s5.h - s7.h) / (s9.h - s7.h)))
  // 8: throttled to the evaporator (h8 = h7)
  const s8r = statePH(f, pL, s7.h, 'after the low-pressure valve', 'evaporator')
  if (!s8r.ok) return s8r.fail
  const s8 = s8r.s

  // 2: low stage; 3: the mix of 2 (1 − x6) and the flash vapour 9 (x6); 4: high stage
  const s2r = compress(f, s1, pI, etaL, 'low-stage compressor exit')
  if (!s2r.ok) return s2r.fail
  const s2 = s2r.s
  const h3 = x6 * s9.h + (1 - x6) * s2.h
  const s3r = statePH(f, pI, h3, 'mixing chamber exit', 'intermediatePressure')
  if (!s3r.ok) return s3r.fail
  const s3 = s3r.s
  const s4r = compress(f, s3, pH, etaH, 'high-stage compressor exit')
  if (!s4r.ok) return s4r.fail
  const s4 = s4r.s

  const m = 1 - x6 // kg through the evaporator per kg through the condenser
  const qEvap = s1.h - s8.h
  const qL = m * qEvap
  const wLow = m * (s2.h - s1.h)
  const wHigh = s4.h - s3.h
  const w = wLow + wHigh
  const qH = s4.h - s5.h
  if (!(qEvap > 0) || !(w > 0))
    return bad('this cycle takes no heat from the cold space: check the pressures', 'evaporator', 'unphysical')

  const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1)
  const balances = {
    // in: 1 kg at h6; out: x6 at h9 + (1 − x6) at h7
    flashChamber: rel(s6.h, x6 * s9.h + m * s7.h),
    // in: x6 at h9 + (1 − x6) at h2; out: 1 kg at h3
    mixingChamber: rel(x6 * s9.h + m * s2.h, s3.h),
    // q_H = q_L + w
    cycle: rel(qH, qL + w),
  }

  let mHigh: number | null = null
  if (flow.which === 'highStageMassFlow') mHigh = flow.value
  else if (flow.which === 'lowStageMassFlow') mHigh = flow.value / m
  else if (flow.which === 'capacity') mHigh = flow.value / qL
  if (flow.which === 'lowStageMassFlow' && !(m > 0))
    return bad('no refrigerant reaches the evaporator at these pressures', 'lowStageMassFlow', 'unphysical')
  const rate = (x: number) => (mHigh === null ? null : mHigh * x)
  const TL = ev.T
  const TH = cd.T
  return {
    ok: true,
    value: {
      states: [
        {
          name: '1',
          description: sh === 0 ? 'evaporator exit, saturated vapour' : `evaporator exit, ${k(sh)} K of superheat`,
          state: s1,
        },
        { name: '2', description: 'low-stage compressor exit', state: s2 },
        { name: '3', description: 'mixing chamber exit (low-stage discharge + flash vapour)', state: s3 },
        { name: '4', description: 'high-stage compressor exit', state: s4 },
        {
          name: '5',
          description: sc === 0 ? 'condenser exit, saturated liquid' : `condenser exit, ${k(sc)} K of subcooling`,
          state: s5,
        },
        { name: '6', description: 'after the high-pressure valve, entering the flash chamber', state: s6 },
        { name: '7', description: 'flash chamber liquid, saturated', state: s7 },
        { name: '8', description: 'after the low-pressure valve', state: s8 },
        { name: '9', description: 'flash chamber vapour, saturated', state: s9 },
      ],
      intermediatePressure: pI,
      intermediatePressureDefaulted: defaulted,
      flashVapourFraction: x6,
      lowToHighMassRatio: m,
      refrigerationEffectPerKgEvaporator: qEvap,
      refrigerationEffect: qL,
      lowStageWork: wLow,
      highStageWork: wHigh,
      compressorWork: w,
      heatRejected: qH,
      copRefrigerator: qL / w,
      copHeatPump: qH / w,
      carnotCopRefrigerator: TL / (TH - TL),
      carnotCopHeatPump: TH / (TH - TL),
      highStageMassFlow: mHigh,
      lowStageMassFlow: rate(m),
      capacity: rate(qL),
      capacityTons: mHigh === null ? null : (mHigh * qL) / TON_OF_REFRIGERATION,
      lowStagePower: rate(wLow),
      highStagePower: rate(wHigh),
      compressorPower: rate(w),
      heatRejectionRate: rate(qH),
      balances,
      caution: VAPOUR_COMPRESSION_CAUTION,
    },
  }
}

// ---------------------------------------------------------------------------------------------
// Cascade

export interface CascadeInput {
  readonly lowerRefrigerant: Refrigerant
  readonly upperRefrigerant: Refrigerant
  /** the lower cycle's evaporator (the cold space) */
  readonly evaporator: SaturationGiven
  /** the cascade heat exchanger: the lower cycle condenses, the upper cycle evaporates */
  readonly lowerCondenser: SaturationGiven
  readonly upperEvaporator: SaturationGiven
  /** the upper cycle's condenser (to the surroundings) */
  readonly condenser: SaturationGiven
  readonly lowerEfficiency?: number
  readonly upperEfficiency?: number
  /** K of superheat at the lower cycle's evaporator exit, K of subcooling at the upper cycle's condenser exit (default 0) */
  readonly superheat?: number
  readonly subcooling?: number
  /** at most one: kg/s in the lower cycle, kg/s in the upper cycle, or a capacity in W */
  readonly lowerMassFlow?: number
  readonly upperMassFlow?: number
  readonly capacity?: number
}

export interface CascadeResult {
  readonly lower: VapourCompressionResult
  readonly upper: VapourCompressionResult
  /** states 1–4 (lower cycle) and 5–8 (upper cycle) */
  readonly states: readonly (CycleState & { readonly cycle: 'lower' | 'upper'; readonly refrigerant: string })[]
  /** ṁ_upper/ṁ_lower = (h2 − h3)/(h5 − h8), from the cascade exchanger's energy balance */
  readonly massFlowRatio: number
  /** J/kg, per kg of the lower cycle's refrigerant */
  readonly refrigerationEffect: number
  readonly lowerCompressorWork: number
  /** per kg of the lower cycle's refrigerant: ṁ_upper/ṁ_lower × (h6 − h5) */
  readonly upperCompressorWork: number
  readonly compressorWork: number
  readonly heatRejected: number
  readonly copRefrigerator: number
  readonly copHeatPump: number
  readonly carnotCopRefrigerator: number
  readonly carnotCopHeatPump: number
  /** the temperature difference across the exchanger, K (lower condensing − upper evaporating, ≥ 0) */
  readonly exchangerTemperatureDifference: number
  readonly lowerMassFlow: number | null
  readonly upperMassFlow: number | null
  readonly capacity: number | null
  readonly capacityTons: number | null
  readonly lowerCompressorPower: number | null
  readonly upperCompressorPower: number | null
  readonly compressorPower: number | null
  readonly heatRejectionRate: number | null
  /** relative residuals: the exchanger's balance and q_H = q_L + w overall */
  readonly balances: { readonly exchanger: number; readonly cycle: number }
  readonly caution: string
}

export type CascadeOutcome = { readonly ok: true; readonly value: CascadeResult } | RefrigerationFailureOutcome

export function solveCascade(input: CascadeInput): CascadeOutcome {
  const fl = input.lowerRefrigerant
  const fu = input.upperRefrigerant
  const etaL = input.lowerEfficiency ?? 1
  const etaU = input.upperEfficiency ?? 1
  const sh = input.superheat ?? 0
  const sc = input.subcooling ?? 0
  const e =
    checkEta(etaL, 'lowerEfficiency') ??
    checkEta(etaU, 'upperEfficiency') ??
    checkKelvins(sh, 'superheat') ??
    checkKelvins(sc, 'subcooling')
  if (e) return e
  const flow = flowChoice([
    ['lowerMassFlow', input.lowerMassFlow],
    ['upperMassFlow', input.upperMassFlow],
    ['capacity', input.capacity],
  ])
  if (!flow.ok) return flow.fail
  const evL = subcritical(fl, input.evaporator, 'evaporator (lower cycle)', 'evaporator')
  if (!evL.ok) return evL.fail
  const cdL = subcritical(fl, input.lowerCondenser, 'cascade exchanger, lower cycle condensing', 'lowerCondenser')
  if (!cdL.ok) return cdL.fail
  const evU = subcritical(fu, input.upperEvaporator, 'cascade exchanger, upper cycle evaporating', 'upperEvaporator')
  if (!evU.ok) return evU.fail
  const cdU = subcritical(fu, input.condenser, 'condenser (upper cycle)', 'condenser')
  if (!cdU.ok) return cdU.fail
  // heat flows from the lower cycle's condensing refrigerant to the upper cycle's evaporating one
  const dT = cdL.T - evU.T
  if (dT < -1e-9 * cdL.T)
    return bad(
      `in the cascade heat exchanger the lower cycle condenses at ${k(cdL.T)} K, colder than the upper cycle evaporates (${k(evU.T)} K): heat cannot flow from the lower cycle to the upper one; raise the lower cycle's condensing temperature or lower the upper cycle's evaporating temperature`,
      'lowerCondenser',
      'unphysical',
    )
  if (!(cdL.T > evL.T))
    return bad(
      `the lower cycle's evaporator (${k(evL.T)} K) must be colder than its condenser in the exchanger (${k(cdL.T)} K)`,
      'evaporator',
    )
  if (!(cdU.T > evU.T))
    return bad(
      `the upper cycle's evaporator in the exchanger (${k(evU.T)} K) must be colder than its condenser (${k(cdU.T)} K)`,
      'condenser',
    )

  const cycle = (
    f: Refrigerant,
    ev: SaturationGiven,
    cd: SaturationGiven,
    eta: number,
    which: 'lower' | 'upper',
    dT: { superheat?: number; subcooling?: number },
  ): { ok: true; r: VapourCompressionResult } | { ok: false; fail: RefrigerationFailureOutcome } => {
    const r = solveVapourCompression({
      refrigerant: f,
      purpose: 'refrigerator',
      evaporator: ev,
      condenser: cd,
      compressorEfficiency: eta,
      ...dT,
    })
    if (r.ok) return { ok: true, r: r.value }
    return { ok: false, fail: bad(`${which} cycle: ${r.error.message}`, r.error.property, r.error.code) }
  }
  const lo = cycle(fl, { p: evL.p }, { p: cdL.p }, etaL, 'lower', { superheat: sh })
  if (!lo.ok) return lo.fail
  const up = cycle(fu, { p: evU.p }, { p: cdU.p }, etaU, 'upper', { subcooling: sc })
  if (!up.ok) return up.fail
  const L = lo.r
  const U = up.r

  const ratio = L.heatRejected / U.refrigerationEffect
  const qL = L.refrigerationEffect
  const wL = L.compressorWork
  const wU = ratio * U.compressorWork
  const w = wL + wU
  const qH = ratio * U.heatRejected
  const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1)
  const [, l2, l3] = L.states
  const [u1, , , u4] = U.states
  const balances = {
    exchanger: rel(l2!.state.h - l3!.state.h, ratio * (u1!.state.h - u4!.state.h)),
    cycle: rel(qH, qL + w),
  }

  let mLow: number | null = null
  if (flow.which === 'lowerMassFlow') mLow = flow.value
  else if (flow.which === 'upperMassFlow') mLow = flow.value / ratio
  else if (flow.which === 'capacity') mLow = flow.value / qL
  const rate = (x: number) => (mLow === null ? null : mLow * x)
  const TL = evL.T
  const TH = cdU.T
  const tag = (c: 'lower' | 'upper', f: Refrigerant, offset: number) => (s: CycleState, i: number) => ({
    name: String(i + 1 + offset),
    description: `${c} cycle (${f.id}): ${s.description}`,
    state: s.state,
    cycle: c,
    refrigerant: f.id,
  })
  return {
    ok: true,
    value: {
      lower: L,
      upper: U,
      states: [...L.states.map(tag('lower', fl, 0)), ...U.states.map(tag('upper', fu, 4))],
      massFlowRatio: ratio,
      refrigerationEffect: qL,
      lowerCompressorWork: wL,
      upperCompressorWork: wU,
      compressorWork: w,
      heatRejected: qH,
      copRefrigerator: qL / w,
      copHeatPump: qH / w,
      carnotCopRefrigerator: TL / (TH - TL),
      carnotCopHeatPump: TH / (TH - TL),
      exchangerTemperatureDifference: Math.max(0, dT),
      lowerMassFlow: mLow,
      upperMassFlow: rate(ratio),
      capacity: rate(qL),
      capacityTons: mLow === null ? null : (mLow * qL) / TON_OF_REFRIGERATION,
      lowerCompressorPower: rate(wL),
      upperCompressorPower: rate(wU),
      compressorPower: rate(w),
      heatRejectionRate: rate(qH),
      balances,
      caution: VAPOUR_COMPRESSION_CAUTION,
    },
  }
}
