// The JSON edge for Rankine cycles: specs with quantities as strings with units
// ("15 MPa", "10 kPa", "600 °C", "85 %") are read once into SI numbers with the shared unit
// reader (../units.ts, parseQuantity), then solved by solveRankine. Documented in docs/steam.md.
//
// Teaching tool: not design data; defer to the applicable codes and licensed engineering practice.
import { parseQuantity } from '../units.ts'
import type { Dimension } from '../units.ts'
import { fail, ok } from './errors.ts'
import type { SteamResult } from './errors.ts'
import { solveRankine } from './rankine.ts'
import type { RankineInput, RankineResult } from './rankine.ts'

const KEYS = new Set([
  'template',
  'title',
  'convention',
  'boilerPressure',
  'condenserPressure',
  'turbineInletTemperature',
  'pumpEfficiency',
  'turbineEfficiency',
  'reheat',
  'openFeedwaterHeater',
])

function isObj(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x)
}

function read(raw: unknown, dim: Dimension, where: string): SteamResult<number> {
  const r = parseQuantity(typeof raw === 'number' && dim === 'dimensionless' ? String(raw) : raw, [dim])
  if (!r.ok) return fail({ code: 'invalid-input', property: where, message: `${where}: ${r.error.message}` })
  return ok(r.value.value)
}

/** Read a Rankine spec object into SI numbers (see docs/steam.md). */
export function parseRankineSpec(raw: unknown): SteamResult<RankineInput> {
  if (!isObj(raw)) return fail({ code: 'invalid-input', message: 'the Rankine spec must be a JSON object' })
  for (const k of Object.keys(raw)) {
    if (!KEYS.has(k)) return fail({ code: 'invalid-input', property: k, message: `unknown field "${k}" in the Rankine spec (allowed: ${[...KEYS].join(', ')})` })
  }
  for (const k of ['boilerPressure', 'condenserPressure'] as const) {
    if (raw[k] === undefined) return fail({ code: 'invalid-input', property: k, message: `${k} is required, e.g. "${k === 'boilerPressure' ? '15 MPa' : '10 kPa'}"` })
  }
  const pB = read(raw.boilerPressure, 'pressure', 'boilerPressure')
  if (!pB.ok) return pB
  const pC = read(raw.condenserPressure, 'pressure', 'condenserPressure')
  if (!pC.ok) return pC
  const input: RankineInput = { boilerPressure: pB.value, condenserPressure: pC.value }
  if (raw.turbineInletTemperature !== undefined) {
    const r = read(raw.turbineInletTemperature, 'temperature', 'turbineInletTemperature')
    if (!r.ok) return r
    input.turbineInletTemperature = r.value
  }
  for (const k of ['pumpEfficiency', 'turbineEfficiency'] as const) {
    if (raw[k] === undefined) continue
    const r = read(raw[k], 'dimensionless', k)
    if (!r.ok) return r
    input[k] = r.value
  }
  if (raw.reheat !== undefined) {
    const rh = raw.reheat
    if (!isObj(rh)) return fail({ code: 'invalid-input', property: 'reheat', message: 'reheat must be an object { "pressure": "4 MPa", "temperature": "600 °C" }' })
    const p = read(rh.pressure, 'pressure', 'reheat.pressure')
    if (!p.ok) return p
    const T = read(rh.temperature, 'temperature', 'reheat.temperature')
    if (!T.ok) return T
    input.reheat = { pressure: p.value, temperature: T.value }
  }
  if (raw.openFeedwaterHeater !== undefined) {
    const f = raw.openFeedwaterHeater
    if (!isObj(f)) return fail({ code: 'invalid-input', property: 'openFeedwaterHeater', message: 'openFeedwaterHeater must be an object { "pressure": "1.2 MPa" }' })
    const p = read(f.pressure, 'pressure', 'openFeedwaterHeater.pressure')
    if (!p.ok) return p
    input.openFeedwaterHeater = { pressure: p.value }
  }
  return ok(input)
}

/** Parse and solve a Rankine spec. */
export function solveRankineSpec(raw: unknown): SteamResult<RankineResult> {
  const p = parseRankineSpec(raw)
  if (!p.ok) return p
  return solveRankine(p.value)
}

const f = (x: number, d: number) => x.toFixed(d)

/**
 * A plain-text report of a solved cycle in one sign convention (kPa/MPa, °C, kJ/kg), ending
 * with the teaching-tool caution.
 */
export function formatRankine(r: RankineResult, convention: 'engineering' | 'chemistry' = 'engineering'): string {
  const c = r.conventions[convention]
  const lines: string[] = []
  lines.push(`${r.variant}, ${r.basis}`)
  lines.push('state  p [kPa]      T [°C]    h [kJ/kg]   s [kJ/(kg K)]  v [m^3/kg]     x       mass fraction  description')
  for (const s of r.states) {
    lines.push(
      [
        s.label.padEnd(6),
        f(s.p / 1000, 3).padStart(11),
        f(s.T - 273.15, 2).padStart(10),
        f(s.h / 1000, 2).padStart(11),
        f(s.s / 1000, 4).padStart(13),
        s.v.toPrecision(5).padStart(12),
        (s.x === null ? '-' : f(s.x, 4)).padStart(8),
        f(s.massFraction, 4).padStart(13),
        '  ' + s.description,
      ].join(' '),
    )
  }
  lines.push(`sign convention: ${c.convention}: ${c.statement}`)
  for (const d of c.devices) lines.push(`  ${d.device.padEnd(42)} heat ${f(d.heat / 1000, 2).padStart(10)} kJ/kg   work ${f(d.work / 1000, 2).padStart(10)} kJ/kg`)
  lines.push(`  net heat ${f(c.netHeat / 1000, 2)} kJ/kg, net work ${f(c.netWork / 1000, 2)} kJ/kg (in this convention)`)
  lines.push(
    `pump work ${f(r.pumpWork / 1000, 2)} kJ/kg, turbine work ${f(r.turbineWork / 1000, 2)} kJ/kg, heat in ${f(r.heatIn / 1000, 2)} kJ/kg, heat out ${f(r.heatOut / 1000, 2)} kJ/kg, net work ${f(r.netWork / 1000, 2)} kJ/kg (magnitudes)`,
  )
  lines.push(
    `thermal efficiency ${f(100 * r.thermalEfficiency, 2)} %, back-work ratio ${f(100 * r.backWorkRatio, 3)} %, turbine-exit quality ${r.turbineExitQuality === null ? 'superheated (no quality)' : f(r.turbineExitQuality, 4)}${r.bleedFraction === null ? '' : `, bleed fraction ${f(r.bleedFraction, 4)}`}`,
  )
  lines.push(r.caution)
  return lines.join('\n')
}
