/**
 * Named working substances. Constant-cp presets are built through makeConstantCp; NASA
 * presets wrap the polynomial sets of nasa7.ts.
 */
import { R_MOLAR } from '../constants.ts'
import { makeConstantCp } from './constant-cp.ts'
import type { Basis, Gas } from './gas.ts'
import { DRY_AIR_NASA, nasa7Gas, speciesSet } from './nasa7.ts'
import type { Nasa7Set } from './nasa7.ts'

/** Çengel & Boles, Thermodynamics: An Engineering Approach, Table A-1/A-2 (air: M = 28.97 kg/kmol), from memory. */
const AIR_M = 0.02897

export const GAS_PRESET_IDS = [
  'air',
  'monatomic',
  'diatomic',
  'nasa:dry-air',
  'nasa:N2',
  'nasa:O2',
  'nasa:Ar',
  'nasa:CO2',
  'nasa:H2O',
] as const
export type GasPresetId = (typeof GAS_PRESET_IDS)[number]

export type PresetResult =
  { ok: true; gas: Gas } | { ok: false; error: { code: 'invalid-gas'; message: string; property?: string } }

const NASA_SETS: Record<string, () => Nasa7Set> = {
  'nasa:dry-air': () => DRY_AIR_NASA,
  'nasa:N2': () => speciesSet('N2'),
  'nasa:O2': () => speciesSet('O2'),
  'nasa:Ar': () => speciesSet('Ar'),
  'nasa:CO2': () => speciesSet('CO2'),
  'nasa:H2O': () => speciesSet('H2O'),
}

/**
 * A preset gas on the requested basis. Defaults: air per kilogram, monatomic and diatomic
 * per mole, NASA gases per mole. Monatomic/diatomic have no molar mass unless one is given,
 * so they can be per kilogram only with `molarMass`.
 */
export function gasPreset(id: string, basis?: Basis, molarMass?: number): PresetResult {
  switch (id) {
    case 'air': {
      // Çengel & Boles, Thermodynamics: An Engineering Approach, Table A-2(a), air at 300 K:
      // cp = 1.005 kJ/(kg·K), cv = 0.718 kJ/(kg·K), R = 0.2870 kJ/(kg·K), k = 1.400 (from memory).
      // Built from cp and R, so cv = 718 J/(kg·K) and γ = 1.39972, which the table rounds to 1.400.
      const M = molarMass ?? AIR_M
      const f = basis === 'mole' ? M : 1
      return {
        ok: true,
        gas: makeConstantCp({
          id: 'air',
          label: 'air, constant cp = 1.005 kJ/(kg·K), R = 0.287 kJ/(kg·K)',
          basis: basis ?? 'mass',
          R: 287 * f,
          cp: 1005 * f,
          cv: 718 * f,
          molarMass: M,
          source: 'Çengel & Boles, Thermodynamics: An Engineering Approach, Table A-2 (from memory)',
        }),
      }
    }
    case 'monatomic':
    case 'diatomic': {
      const b = basis ?? 'mole'
      if (b === 'mass' && molarMass === undefined) {
        return {
          ok: false,
          error: {
            code: 'invalid-gas',
            message: `the ${id} preset per kilogram needs a molar mass`,
            property: 'molarMass',
          },
        }
      }
      const f = b === 'mass' ? 1 / molarMass! : 1
      const R = R_MOLAR * f
      const cv = (id === 'monatomic' ? 1.5 : 2.5) * R
      return {
        ok: true,
        gas: makeConstantCp({
          id,
          label: id === 'monatomic' ? 'monatomic ideal gas (cv = 3/2 R)' : 'diatomic ideal gas (cv = 5/2 R)',
          basis: b,
          R,
          cv,
          cp: cv + R,
          molarMass,
          source:
            'equipartition: cv = 3/2 R (monatomic), 5/2 R (diatomic, rotation without vibration); common practice',
        }),
      }
    }
    default: {
      const set = NASA_SETS[id]
      if (!set) {
        return {
          ok: false,
          error: {
            code: 'invalid-gas',
            message: `unknown gas "${id}": use one of ${GAS_PRESET_IDS.join(', ')} or give constants`,
            property: 'gas',
          },
        }
      }
      return { ok: true, gas: nasa7Gas(set(), basis ?? 'mole') }
    }
  }
}
