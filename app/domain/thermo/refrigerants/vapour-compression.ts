/**
 * The single-stage vapour-compression cycle, for a refrigerator or a heat pump, on the
 * refrigerant properties of this folder (Helmholtz equations of state):
 *
 *   1 evaporator exit (saturated vapour, or superheated by ΔT_sh) → 2 compressor exit
 *   (isentropic, or h2 = h1 + (h2s − h1)/η_c) → 3 condenser exit (saturated liquid, or
 *   subcooled by ΔT_sc) → 4 after the throttling valve (h4 = h3, a liquid–vapour mixture) → 1.
 *
 * Subcritical cycles give the evaporator and condenser as saturation temperatures or pressures.
 * A transcritical R-744 cycle gives the gas-cooler pressure (above the critical pressure) and the
 * gas-cooler exit temperature instead of a condenser. Per kilogram of refrigerant; with a mass
 * flow rate or a refrigeration capacity, also as rates. Pure; never throws.
 *
 * Teaching tool: not design data; defer to the applicable codes, standards and licensed
 * engineering practice for any real refrigeration plant.
 */
import type { FluidResult, FluidState, Refrigerant } from './types.ts'

export const VAPOUR_COMPRESSION_CAUTION =
  'Teaching tool: an idealised textbook vapour-compression cycle on published equations of state, not design data. Defer to the applicable codes, standards and licensed engineering practice.'

/** 1 ton of refrigeration = 12,000 Btu/h = 3.516853 kW (ASHRAE Handbook—Fundamentals, units chapter; common practice). */
export const TON_OF_REFRIGERATION = 3516.853

export type SaturationGiven = { readonly T: number } | { readonly p: number }

export interface VapourCompressionInput {
  readonly refrigerant: Refrigerant
  readonly purpose: 'refrigerator' | 'heat-pump'
  readonly evaporator: SaturationGiven
  /** a saturation temperature or pressure (subcritical), or a gas cooler (transcritical) */
  readonly condenser?: SaturationGiven
  readonly gasCooler?: { readonly p: number; readonly exitT: number }
  /** K of superheat at the evaporator exit (default 0: saturated vapour) */
  readonly superheat?: number
  /** K of subcooling at the condenser exit (default 0: saturated liquid) */
  readonly subcooling?: number
  /** compressor isentropic efficiency, 0 < η ≤ 1 (default 1) */
  readonly compressorEfficiency?: number
  /** kg/s, or a refrigeration capacity in W (exactly one of them, or neither) */
  readonly massFlow?: number
  readonly capacity?: number
}

export interface CycleState {
  readonly name: string
  readonly description: string
  readonly state: FluidState
}

export interface VapourCompressionResult {
  readonly states: readonly CycleState[]
  /** J/kg, all sizes */
  readonly refrigerationEffect: number
  readonly compressorWork: number
  readonly heatRejected: number
  readonly copRefrigerator: number
  readonly copHeatPump: number
  /** the Carnot COP between the evaporating temperature and the condensing (or gas-cooler exit) temperature */
  readonly carnotCop: number
  /** quality after the valve */
  readonly throttleQuality: number
  readonly massFlow: number | null
  readonly capacity: number | null
  readonly compressorPower: number | null
  readonly heatRejectionRate: number | null
  readonly transcritical: boolean
  readonly caution: string
}

export type VapourCompressionOutcome =
  | { readonly ok: true; readonly value: VapourCompressionResult }
  | {
      readonly ok: false
      readonly error: { readonly code: string; readonly message: string; readonly property?: string }
    }

const bad = (message: string, property?: string, code = 'invalid-input'): VapourCompressionOutcome => ({
  ok: false,
  error: { code, message, ...(property ? { property } : {}) },
})
const k = (x: number) => Number(x.toPrecision(4))

function take(
  r: FluidResult<FluidState>,
  where: string,
  property?: string,
): { ok: true; s: FluidState } | { ok: false; fail: VapourCompressionOutcome } {
  return r.ok
    ? { ok: true, s: r.value }
    : { ok: false, fail: bad(`${where}: ${r.error.message}`, property, r.error.code) }
}

function saturation(f: Refrigerant, g: SaturationGiven) {
  return 'T' in g ? f.saturationT(g.T) : f.saturationP(g.p)
}

export function solveVapourCompression(input: VapourCompressionInput): VapourCompressionOutcome {
  const f = input.refrigerant
  const sh = input.superheat ?? 0
  const sc = input.subcooling ?? 0
  const eta = input.compressorEfficiency ?? 1
  if (!(sh >= 0 && Number.isFinite(sh))) return bad('superheat must be 0 K or more', 'superheat')
  if (!(sc >= 0 && Number.isFinite(sc))) return bad('subcooling must be 0 K or more', 'subcooling')
  if (!(eta > 0 && eta <= 1)) return bad(`compressorEfficiency must be in (0, 1] (got ${eta})`, 'compressorEfficiency')
  if ((input.condenser === undefined) === (input.gasCooler === undefined))
    return bad(
      'give a condenser (saturation temperature or pressure) or, for a transcritical cycle, a gas cooler — exactly one',
      'condenser',
    )
  if (input.massFlow !== undefined && input.capacity !== undefined)
    return bad('give the mass flow rate or the refrigeration capacity, not both', 'massFlow')
  if (input.massFlow !== undefined && !(input.massFlow > 0))
    return bad('the mass flow rate must be positive', 'massFlow')
  if (input.capacity !== undefined && !(input.capacity > 0))
    return bad('the refrigeration capacity must be positive', 'capacity')

  const ev = saturation(f, input.evaporator)
  if (!ev.ok) return bad(`evaporator: ${ev.error.message}`, 'evaporator', ev.error.code)
  const pL = ev.value.p
  const TL = ev.value.T

  // ---- state 1: evaporator exit
  const s1r = take(sh === 0 ? f.statePx(pL, 1) : f.stateTP(TL + sh, pL), 'evaporator exit', 'superheat')
  if (!s1r.ok) return s1r.fail
  const s1 = s1r.s

  // ---- high side
  let pH: number
  let TH: number
  let s3: FluidState
  const transcritical = input.gasCooler !== undefined
  if (input.gasCooler) {
    const { p, exitT } = input.gasCooler
    if (!(p > f.pc))
      return bad(
        `a gas cooler works above the critical pressure (${k(f.pc / 1e6)} MPa for ${f.id}); below it, give a condenser`,
        'gasCooler',
      )
    const r = take(f.stateTP(exitT, p), 'gas-cooler exit', 'gasCoolerExitT')
    if (!r.ok) return r.fail
    pH = p
    TH = exitT
    s3 = r.s
    if (sc !== 0)
      return bad(
        'subcooling applies to a condenser, not to a gas cooler (give its exit temperature instead)',
        'subcooling',
      )
  } else {
    const cd = saturation(f, input.condenser!)
    if (!cd.ok) return bad(`condenser: ${cd.error.message}`, 'condenser', cd.error.code)
    pH = cd.value.p
    TH = cd.value.T
    const r = take(sc === 0 ? f.statePx(pH, 0) : f.stateTP(TH - sc, pH), 'condenser exit', 'subcooling')
    if (!r.ok) return r.fail
    s3 = r.s
  }
  if (!(pH > pL) || !(TH > TL))
    return bad(`the evaporator (${k(TL)} K) must be colder than the condenser or gas cooler (${k(TH)} K)`, 'evaporator')

  // ---- state 2: compressor exit
  const s2sr = take(f.statePS(pH, s1.s), 'compressor exit (isentropic)')
  if (!s2sr.ok) return s2sr.fail
  const h2 = s1.h + (s2sr.s.h - s1.h) / eta
  const s2r = take(eta === 1 ? { ok: true, value: s2sr.s } : f.statePH(pH, h2), 'compressor exit')
  if (!s2r.ok) return s2r.fail
  const s2 = s2r.s

  // ---- state 4: after the valve
  const s4r = take(f.statePH(pL, s3.h), 'after the throttling valve')
  if (!s4r.ok) return s4r.fail
  const s4 = s4r.s
  if (s4.x === null)
    return bad(
      'the refrigerant leaves the valve outside the liquid–vapour dome: check the pressures and temperatures',
      'evaporator',
      'unphysical',
    )

  const qL = s1.h - s4.h
  const w = s2.h - s1.h
  const qH = s2.h - s3.h
  if (!(qL > 0) || !(w > 0))
    return bad('this cycle takes no heat from the cold space: check the temperatures', 'evaporator', 'unphysical')
  let mdot: number | null = input.massFlow ?? null
  if (input.capacity !== undefined) mdot = input.capacity / qL
  const carnotCop = input.purpose === 'refrigerator' ? TL / (TH - TL) : TH / (TH - TL)
  return {
    ok: true,
    value: {
      states: [
        {
          name: '1',
          description: sh === 0 ? 'evaporator exit, saturated vapour' : `evaporator exit, ${k(sh)} K of superheat`,
          state: s1,
        },
        { name: '2', description: 'compressor exit', state: s2 },
        {
          name: '3',
          description: transcritical
            ? 'gas-cooler exit'
            : sc === 0
              ? 'condenser exit, saturated liquid'
              : `condenser exit, ${k(sc)} K of subcooling`,
          state: s3,
        },
        { name: '4', description: 'after the throttling valve', state: s4 },
      ],
      refrigerationEffect: qL,
      compressorWork: w,
      heatRejected: qH,
      copRefrigerator: qL / w,
      copHeatPump: qH / w,
      carnotCop,
      throttleQuality: s4.x,
      massFlow: mdot,
      capacity: mdot === null ? null : mdot * qL,
      compressorPower: mdot === null ? null : mdot * w,
      heatRejectionRate: mdot === null ? null : mdot * qH,
      transcritical,
      caution: VAPOUR_COMPRESSION_CAUTION,
    },
  }
}
