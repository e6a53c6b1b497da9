/**
 * A bank problem's content: what one version of a problem holds. Plain data (JSON-ready),
 * stored as one jsonb document per version and carried whole by the bank document
 * (docs/bank-format.md). Pure types and constants; the zod schema that checks a document
 * at the edges lives in app/lib/problem-schema.ts and must agree with these types.
 *
 * Words (../shared/DESIGN.md): givens are drawn per student, finds are what students answer,
 * a variant is one student's instance fixed by its seed.
 */
import type { CheckRule, PitfallId, Tolerance } from '#app/domain/grading/index.ts'
import type { SigFigRule } from '#app/domain/grading/sig-figs.ts'
import type { Convention } from '#app/domain/thermo/index.ts'
import { isRecord } from '#app/domain/thermo/json.ts'
import type { BankSolution } from '#app/domain/thermo/solve-spec.ts'
import { upgradeLegacyPrompt } from './placeholder-syntax.ts'

/**
 * Version of the definition document itself; bumped when its shape or meaning changes.
 * 1: prompts wrote placeholders as `@{T1}`. 2: as `[T1]` (./placeholders.ts).
 */
export const DEFINITION_FORMAT = 2 as const
/** The oldest format upgradeDefinition still reads. */
export const OLDEST_DEFINITION_FORMAT = 1 as const

/**
 * A definition document of any format we still read, brought to DEFINITION_FORMAT. The one
 * upgrade: the bank import and every read of a stored version go through it (the migration
 * drizzle/0007_prompt_placeholders.sql already upgraded what was stored). Anything that is
 * not an older document comes back as it is, for the shape check to judge; givens, finds
 * and physics are never touched, so a variant's numbers and key stay the same. Pure.
 */
export function upgradeDefinition(raw: unknown): unknown {
  if (!isRecord(raw)) return raw
  const doc = raw
  if (doc.format !== 1) return raw
  return { ...doc, format: 2, ...(typeof doc.prompt === 'string' ? { prompt: upgradeLegacyPrompt(doc.prompt) } : {}) }
}

/** Given and find names: identifiers usable in expressions and placeholders. */
export const NAME_PATTERN = /^[A-Za-z][A-Za-z0-9_]{0,31}$/

export type GivenRule =
  /** Values min, min + step, …, up to max (inclusive, to rounding); step > 0. */
  | { readonly kind: 'range'; readonly min: number; readonly max: number; readonly step: number }
  /** One of a list, equally likely. Numbers, or texts for non-numeric givens (a gas preset id). */
  | { readonly kind: 'choice'; readonly values: readonly (number | string)[] }
  /** A restricted mathjs expression over givens listed before this one (units allowed). */
  | { readonly kind: 'expression'; readonly expression: string }

export interface Given {
  readonly name: string
  /** What the given is, for authors and the worked solution ("compressor inlet temperature"). */
  readonly label: string
  /** The unit the drawn number is in: "K", "kPa", "kJ/kg", "" for a pure number or a text choice. */
  readonly unit: string
  readonly rule: GivenRule
  /** How a placeholder shows the value when it does not say: decimals or significant figures. */
  readonly display?: { readonly decimals?: number; readonly sigFigs?: number }
}

/** left op right, both sides evaluated as quantities over the givens and compared in SI. */
export interface Constraint {
  readonly left: string
  readonly op: '<' | '<=' | '>' | '>=' | '!='
  readonly right: string
  /** Shown to the author when the constraint can never be met ("TH must exceed TL by 100 K"). */
  readonly message?: string
}

/**
 * One feedwater heater of a steam-plant template's `heaters` input (the one input whose
 * dimension is 'heater list'; docs/steam.md). Every field is a text and may name a given, as
 * any other input: kind "open" | "closed", pressure "0.5 MPa", and for a closed heater ttd
 * "3 K" and drains "backward" | "forward".
 */
export interface HeaterInput {
  readonly kind: string
  readonly pressure: string
  readonly name?: string
  readonly ttd?: string
  readonly drains?: string
}

/** The fields of a HeaterInput, in the order the editor shows them. */
export const HEATER_FIELDS = ['kind', 'pressure', 'name', 'ttd', 'drains'] as const
export type HeaterField = (typeof HEATER_FIELDS)[number]
/** At most this many heaters (the steam-plant solver's own limit). */
export const MAX_HEATERS = 12

/** A template input's value: a text, or (for a 'heater list' input) the list of heaters. */
export type TemplateInputValue = string | readonly HeaterInput[]

/**
 * The physics. Every text value may name a given: a value that is exactly a given's name is
 * replaced by "<value> <unit>"; `@{name}` inside a longer text is replaced the same way.
 * Other texts pass to the solver as they are ("air", "100 kPa", "8").
 */
export type Physics =
  /** One of the solver's named templates (docs/spec-format.md, docs/steam.md). */
  | {
      readonly kind: 'template'
      readonly template: string
      readonly inputs: Readonly<Record<string, TemplateInputValue>>
    }
  /** A general state-and-process cycle, as the "cycle" object of a spec file. */
  | { readonly kind: 'cycle'; readonly cycle: unknown }

export type FindSource =
  /** A solver output by dotted path: 'totals.netWork', 'steps.3.q', 'states.2.T', 'totals.turbineExitQuality'. */
  | { readonly kind: 'output'; readonly path: string }
  /** A restricted mathjs expression over givens and the finds listed before this one. */
  | { readonly kind: 'expression'; readonly expression: string }

/**
 * Which way a work or heat find counts positive, in words that mean the same in either sign
 * convention. With a sense the key has the sign the words promise in every course; the
 * course's convention then only decides the symbols (w or W, q or Q). Without one, a work
 * output keeps the convention's sign (w done ON the system, or W done BY it).
 */
export const FIND_SENSES = ['work-by-system', 'work-on-system', 'heat-into-system', 'heat-out-of-system'] as const
export type FindSense = (typeof FIND_SENSES)[number]

/** How a sense is said to authors and in messages. */
export const FIND_SENSE_WORDS: Readonly<Record<FindSense, string>> = {
  'work-by-system': 'work done by the system',
  'work-on-system': 'work done on the system',
  'heat-into-system': 'heat into the system',
  'heat-out-of-system': 'heat out of the system',
}

export interface Find {
  readonly name: string
  /** The question as students see it beside the input ("Net work per kilogram of air"). */
  readonly label: string
  readonly source: FindSource
  /** The unit the key is stated in and the answer is compared in; "" for a pure number. */
  readonly unit: string
  readonly points: number
  readonly tolerance: Tolerance
  readonly sigFigs?: SigFigRule
  /** A temperature difference: °C and °F carry no offset. */
  readonly isDifference?: boolean
  /** Answers without a unit are read in `unit` (always so for a pure number). */
  readonly allowBareNumber?: boolean
  /** Pitfalls that give feedback on a wrong answer to this find (app/domain/grading/pitfalls.ts). */
  readonly pitfalls: readonly PitfallId[]
  /** Which way the key counts positive (work and heat finds only); absent: the convention decides. */
  readonly sense?: FindSense
}

export const DIFFICULTIES = ['introductory', 'standard', 'challenging'] as const
export type Difficulty = (typeof DIFFICULTIES)[number]
export const LEVELS = ['first-year', 'second-year', 'upper-level', 'graduate'] as const
export type Level = (typeof LEVELS)[number]

export interface ProblemTags {
  /** Free topic words, lower case ("isentropic efficiency", "regeneration"). */
  readonly topics: readonly string[]
  readonly difficulty: Difficulty
  readonly level: Level
}

/** 'course' takes the sign convention of the course the problem is assigned in. */
export type ProblemConvention = 'course' | 'chemistry' | 'engineering'

export interface ProblemDefinition {
  readonly format: typeof DEFINITION_FORMAT
  readonly title: string
  readonly tags: ProblemTags
  readonly convention: ProblemConvention
  /** Markdown with $inline$ and $$display$$ math, and [given] placeholders (docs/authoring.md). */
  readonly prompt: string
  readonly givens: readonly Given[]
  readonly constraints: readonly Constraint[]
  readonly physics: Physics
  readonly finds: readonly Find[]
}

/** The cycle a problem is about, for tags and filters: the template id, or 'general'. */
export function cycleOf(physics: Physics): string {
  return physics.kind === 'template' ? physics.template : 'general'
}

/** The grading rule of a find, as app/domain/grading's checkAnswer takes it. */
export function checkRuleOf(find: Find): CheckRule {
  return {
    tolerance: find.tolerance,
    ...(find.sigFigs ? { sigFigs: find.sigFigs } : {}),
    ...(find.isDifference ? { isDifference: true } : {}),
    ...(find.allowBareNumber || find.unit === '' ? { allowBareNumber: true } : {}),
  }
}

// ---- What drawing a variant gives (app/domain/authoring/variant.ts) -------------------

export interface DrawnGiven {
  readonly name: string
  readonly label: string
  /** The number in the given's own unit (NaN for a text choice). */
  readonly value: number
  readonly unit: string
  /** The value as the solver and the prompt receive it: "350 K", "air". */
  readonly text: string
}

export interface KeyEntry {
  readonly name: string
  readonly label: string
  /** In the find's unit. */
  readonly value: number
  readonly unit: string
  readonly points: number
  /** The output path when the find is bound to one (pitfall diagnosis re-solves it). */
  readonly path: string | null
  /** The key is the solver's value at `path` negated, to keep the find's stated sense. */
  readonly flipped?: true
}

export interface Variant {
  readonly seed: number
  readonly convention: Convention
  readonly givens: readonly DrawnGiven[]
  /** The spec file object solved for this variant (what solveSpec and diagnosePitfall take). */
  readonly spec: Readonly<Record<string, unknown>>
  /** An ideal-gas cycle, a Rankine cycle or a vapour-compression cycle (./solution-kind.ts tells which). */
  readonly solution: BankSolution
  readonly key: readonly KeyEntry[]
}

export type VariantErrorCode =
  'invalid-definition' | 'given-error' | 'constraint-never-met' | 'solve-error' | 'find-undefined'

export interface VariantError {
  readonly code: VariantErrorCode
  readonly message: string
  /** The given, find or input the message is about. */
  readonly property?: string
}

export type DrawResult =
  | { readonly ok: true; readonly variant: Variant }
  | { readonly ok: false; readonly seed: number; readonly error: VariantError }

// ---- What a sweep gives (app/domain/authoring/sweep.ts) --------------------------------

export type SweepFailureCode =
  | VariantErrorCode
  | 'temperature-not-positive'
  | 'pressure-not-positive'
  | 'efficiency-out-of-range'
  | 'quality-out-of-range'

export interface SweepFailure {
  readonly seed: number
  readonly code: SweepFailureCode
  readonly message: string
  /** Givens of the failing variant as drawn ("T1 = 350 K"), when drawing got that far. */
  readonly givens?: readonly string[]
}

export interface SweepSummary {
  readonly checked: number
  readonly failed: number
  /** At most a few hundred are kept; `failed` counts all. */
  readonly failures: readonly SweepFailure[]
}
