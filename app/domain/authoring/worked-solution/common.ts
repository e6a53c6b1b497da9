/** Numbers, units, symbols and the sign-convention section every worked solution shares. Pure. */
import type { Convention } from '#app/domain/thermo/index.ts'
import { CONVENTIONS, parseCycleSpec, parseTemplateInputs, templates } from '#app/domain/thermo/index.ts'
import type { CycleSpec } from '#app/domain/thermo/cycle.ts'
import { isRecord } from '#app/domain/thermo/json.ts'
import type { Variant } from '../definition.ts'
import { formatNumber, texEscape, withUnit } from '../placeholders.ts'
import { symbolTex } from '../quantities.ts'
import type { WorkedLine, WorkedSection } from './types.ts'
import { WORKED_SIG_FIGS } from './types.ts'

// ---- Numbers and units --------------------------------------------------------------

/** Rounding residue of an exact zero (Δs of an isentropic step is ~1e-13 J/(kg·K)). */
export function snap(x: number, scale: number): number {
  return Math.abs(x) < 1e-9 * Math.max(1, Math.abs(scale)) ? 0 : x
}

/** A number to 4 significant figures, as TeX. */
export function n4(x: number): string {
  return x === 0 ? '0' : formatNumber(x, { sigFigs: WORKED_SIG_FIGS }, true)
}

/** A number to 4 significant figures with a unit, as TeX. */
export function q4(x: number, unit: string): string {
  return withUnit(n4(x), unit, true)
}

/** Wrapped in parentheses when negative, for substitution into a formula. */
export function par(tex: string): string {
  return tex.startsWith('-') ? `(${tex})` : tex
}

export interface Units {
  /** per unit amount: kJ/kg or kJ/mol */
  readonly energy: string
  readonly entropy: string
  readonly volume: string
  /** SI value → shown value */
  readonly e: (x: number) => number
  readonly s: (x: number) => number
}

export function unitsFor(basis: 'mass' | 'mole'): Units {
  return basis === 'mass'
    ? { energy: 'kJ/kg', entropy: 'kJ/(kg K)', volume: 'm^3/kg', e: (x) => x / 1000, s: (x) => x / 1000 }
    : { energy: 'kJ/mol', entropy: 'J/(mol K)', volume: 'm^3/mol', e: (x) => x / 1000, s: (x) => x }
}

/** Pressure as a student writes it: kPa below 1 MPa, MPa from there. */
export function pressureTex(pa: number): string {
  return Math.abs(pa) >= 1e6 ? q4(pa / 1e6, 'MPa') : q4(pa / 1000, 'kPa')
}

/** A given or find name as a TeX symbol (quantities.ts): T1 → T_1, W_net → W_{\text{net}}, eta → \eta. */
export const texName = symbolTex

/** A state name as a subscript: "1" → 1, "A" → A, anything else in \text. */
export function sub(name: string): string {
  return /^[A-Za-z0-9]{1,3}$/.test(name) ? name : `\\text{${texEscape(name)}}`
}

// ---- Convention ---------------------------------------------------------------------

export interface Symbols {
  readonly convention: Convention
  /** heat symbol with subscript */
  readonly Q: (s: string) => string
  /** work symbol (of the convention) with subscript */
  readonly W: (s: string) => string
  /** the convention's work from the work done BY the gas */
  readonly fromBy: (wBy: number) => number
}

export function symbolsFor(convention: Convention): Symbols {
  return convention === 'chemistry'
    ? { convention, Q: (s) => (s ? `q_{${s}}` : 'q'), W: (s) => (s ? `w_{${s}}` : 'w'), fromBy: (w) => -w }
    : { convention, Q: (s) => (s ? `Q_{${s}}` : 'Q'), W: (s) => (s ? `W_{${s}}` : 'W'), fromBy: (w) => w }
}

export function conventionSection(
  convention: Convention,
  flow: boolean,
  fluid = 'gas',
): { text: string; section: WorkedSection } {
  const c = CONVENTIONS[convention]
  const lines: WorkedLine[] =
    convention === 'chemistry'
      ? [
          {
            tex: '\\Delta U = q + w',
            note: `chemistry convention: q is the heat into the system, w the work done ON the system (positive when the ${fluid} is compressed)`,
          },
          ...(flow ? [{ tex: '\\Delta h = q + w', note: 'steady flow: w is the shaft work done on the fluid' }] : []),
        ]
      : [
          {
            tex: '\\Delta U = Q - W',
            note: `engineering convention: Q is the heat into the system, W the work done BY the system (positive when the ${fluid} expands)`,
          },
          ...(flow ? [{ tex: '\\Delta h = Q - W', note: 'steady flow: W is the shaft work done by the fluid' }] : []),
        ]
  lines.push({ tex: '', note: 'Values per unit amount; a negative heat leaves the system.' })
  const text = `${convention}: ${c.equation}; ${c.heat}; ${c.work}${flow ? `; ${c.flowEquation}` : ''}`
  return { text, section: { title: 'Sign convention', lines } }
}

// ---- The spec behind a solution (for n, η, ε and the gas) ----------------------------

/** The spec's `inputs` as the solver was given them, unparsed ({} when absent): each template's parser checks them. */
export function specInputs(variant: Pick<Variant, 'spec'>): unknown {
  return variant.spec.inputs ?? {}
}

export function cycleSpecOf(spec: Readonly<Record<string, unknown>>): CycleSpec | null {
  try {
    if (typeof spec.template === 'string') {
      const t = templates[spec.template]
      const inputs = spec.inputs
      if (!t || !isRecord(inputs)) return null
      const parsed = parseTemplateInputs(t.inputs, inputs)
      if (!parsed.ok) return null
      const built = t.build(parsed.value)
      return built.ok ? built.spec : null
    }
    if (spec.cycle !== undefined) {
      const p = parseCycleSpec(spec.cycle)
      return p.ok ? p.value : null
    }
  } catch {
    return null
  }
  return null
}

/** Pressure in words for a note: kPa below 1 MPa, MPa from there. */
export function pressureText(pa: number): string {
  return Math.abs(pa) >= 1e6
    ? `${formatNumber(pa / 1e6, { sigFigs: WORKED_SIG_FIGS }, false)} MPa`
    : `${formatNumber(pa / 1000, { sigFigs: WORKED_SIG_FIGS }, false)} kPa`
}
