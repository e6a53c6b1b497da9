/**
 * The zod schemas that check a problem definition (app/domain/authoring/definition.ts) and
 * the bank document (docs/bank-format.md) at the edges: the editor's form, the import upload,
 * and the server before it writes. Isomorphic: the editor shows the same messages in the
 * browser that the server would return. Messages speak to the author in plain words.
 *
 * The template and pitfall ids are listed here rather than imported from the solver so that
 * this file stays light in the browser; problem-schema.test.ts fails when the lists drift.
 */
import { z } from 'zod'
import {
  DEFINITION_FORMAT,
  DIFFICULTIES,
  LEVELS,
  FIND_SENSES,
  MAX_HEATERS,
  NAME_PATTERN,
  type TemplateInputValue,
  type ProblemDefinition,
  upgradeDefinition,
} from '#app/domain/authoring/definition.ts'
import type { PitfallId } from '#app/domain/grading/pitfalls.ts'
import { isRecord } from '#app/domain/thermo/json.ts'
import { controlCharIssues } from '#app/lib/text-field.ts'

// ---- Limits ---------------------------------------------------------------------------

export const DEFINITION_LIMITS = {
  title: { min: 3, max: 160 },
  prompt: { max: 20_000 },
  givens: { max: 40 },
  finds: { min: 1, max: 30 },
  constraints: { max: 20 },
  topics: { max: 12, wordMax: 40 },
  label: { max: 200 },
  unit: { max: 40 },
  expression: { max: 500 },
  choices: { max: 100 },
  templateInputs: { max: 30 },
  points: { max: 1000 },
  sigFigs: { min: 1, max: 10 },
  decimals: { max: 10 },
} as const

/** The templates bank problems may use: the browser's copy of bankTemplateIds() (app/domain/thermo/catalog.ts), checked by problem-schema.test.ts. */
export const TEMPLATE_IDS = [
  'otto',
  'diesel',
  'dual',
  'brayton',
  'brayton-regenerative',
  'carnot-engine',
  'carnot-refrigerator',
  'carnot-heat-pump',
  'stirling',
  'ericsson',
  'brayton-intercool-reheat',
  'atkinson',
  'miller',
  'rankine',
  'rankine-reheat',
  'rankine-regenerative',
  'rankine-feedwater',
  'rankine-cogeneration',
  'steam-throttling-calorimeter',
  'steam-carnot',
  'vapour-compression',
  'vapour-compression-two-stage',
  'vapour-compression-cascade',
  'nozzle',
  'diffuser',
  'turbojet',
  'combined-cycle',
] as const

/** Every PitfallId (app/domain/grading/pitfalls.ts), in the order the grader tries them. */
export const PITFALL_IDS = [
  'sign-convention-flipped',
  'celsius-for-kelvin',
  'cp-cv-swapped',
  'gamma-monatomic-diatomic-swapped',
  'kilo-factor',
  'log10-for-ln',
  'per-mole-vs-per-kg',
] as const satisfies readonly PitfallId[]

export const VISIBILITIES = ['private', 'department', 'installation'] as const

// ---- Building blocks ------------------------------------------------------------------

const finite = (what: string) =>
  z.number({
    error: (iss) => (iss.input === undefined ? `Enter ${what}.` : `${capitalise(what)} must be a finite number.`),
  })

const text = (what: string, max: number, min = 0) =>
  z
    .string({ error: `Write ${what} as text.` })
    .trim()
    .min(min, min === 1 ? `Write ${what}.` : `Write at least ${min} characters for ${what}.`)
    .max(max, `Keep ${what} under ${max + 1} characters.`)

const Name = z
  .string({ error: 'Give a name.' })
  .regex(
    NAME_PATTERN,
    'A name starts with a letter and uses only letters, digits and _ (at most 32 characters), so it can be used in expressions.',
  )

const Expression = text('the expression', DEFINITION_LIMITS.expression.max, 1)

const GivenRuleSchema = z.discriminatedUnion(
  'kind',
  [
    z
      .strictObject({
        kind: z.literal('range'),
        min: finite('the smallest value'),
        max: finite('the largest value'),
        step: finite('the step').positive('The step must be greater than 0.'),
      })
      .refine((r) => r.min <= r.max, { message: 'The largest value must not be below the smallest.', path: ['max'] })
      .refine((r) => (r.max - r.min) / r.step <= 1_000_000, {
        message: 'The step is too small for this range: keep it to at most a million values.',
        path: ['step'],
      }),
    z.strictObject({
      kind: z.literal('choice'),
      values: z
        .array(
          z.union([finite('a value'), text('a value', 200, 1)], { error: 'Each choice is a number or a short text.' }),
        )
        .min(1, 'Give at least one value to choose from.')
        .max(DEFINITION_LIMITS.choices.max, `Give at most ${DEFINITION_LIMITS.choices.max} values to choose from.`),
    }),
    z.strictObject({ kind: z.literal('expression'), expression: Expression }),
  ],
  { error: 'Choose how the given is drawn: range, choice or expression.' },
)

const GivenSchema = z.strictObject({
  name: Name,
  label: text('a label', DEFINITION_LIMITS.label.max, 1),
  unit: text('the unit', DEFINITION_LIMITS.unit.max),
  rule: GivenRuleSchema,
  display: z
    .strictObject({
      decimals: z
        .int('Decimals must be a whole number.')
        .min(0, 'Decimals cannot be negative.')
        .max(DEFINITION_LIMITS.decimals.max, `Show at most ${DEFINITION_LIMITS.decimals.max} decimals.`)
        .optional(),
      sigFigs: z
        .int('Significant figures must be a whole number.')
        .min(1, 'Show at least 1 significant figure.')
        .max(DEFINITION_LIMITS.sigFigs.max, `Show at most ${DEFINITION_LIMITS.sigFigs.max} significant figures.`)
        .optional(),
    })
    .optional(),
})

const ConstraintSchema = z.strictObject({
  left: Expression,
  op: z.enum(['<', '<=', '>', '>=', '!='], { error: 'Compare with one of <, <=, >, >= or !=.' }),
  right: Expression,
  message: text('the message', 300).optional(),
})

/** One feedwater heater of a 'heater list' input (definition.ts HeaterInput): texts that may name a given. */
const HeaterSchema = z.strictObject(
  {
    kind: text('the heater kind ("open" or "closed", or a given\'s name)', 60, 1),
    pressure: text('the heater pressure, such as "0.5 MPa" or a given\'s name', 500, 1),
    name: text('the heater name', 60, 1).optional(),
    ttd: text('the terminal temperature difference, such as "3 K"', 500, 1).optional(),
    drains: text('where the drains go ("backward" or "forward")', 60, 1).optional(),
  },
  {
    error: (iss) =>
      iss.code === 'unrecognized_keys'
        ? `A heater takes kind, pressure, name, ttd and drains, not ${iss.keys.join(', ')}.`
        : 'Give each heater as a group of fields: kind, pressure, and optionally name, ttd and drains.',
  },
)

const HeaterListSchema = z
  .array(HeaterSchema, { error: 'Give the heaters as a list.' })
  .min(1, 'Give at least one heater, or leave the input out.')
  .max(MAX_HEATERS, `Give at most ${MAX_HEATERS} heaters.`)

const InputTextSchema = text('the input value', 500)

/** A template input: a text, or a list of heaters (the one list-valued input, 'heaters'); the lint checks which input takes which. */
const TemplateInputValueSchema = z.unknown().transform((v, ctx): TemplateInputValue => {
  const r = Array.isArray(v) ? HeaterListSchema.safeParse(v) : InputTextSchema.safeParse(v)
  if (r.success) return r.data
  for (const iss of r.error.issues)
    ctx.addIssue({
      code: 'custom',
      path: iss.path,
      message:
        iss.code === 'invalid_type' && iss.path.length === 0
          ? 'Give each template input as text, or the heaters as a list of { kind, pressure, … }.'
          : iss.message,
    })
  return z.NEVER
})

const PhysicsSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({
      kind: z.literal('template'),
      template: z.enum(TEMPLATE_IDS, { error: `Choose one of the solver's templates: ${TEMPLATE_IDS.join(', ')}.` }),
      inputs: z
        .record(
          z.string().regex(/^[A-Za-z][A-Za-z0-9_]{0,39}$/, 'A template input name is a word of letters, digits and _.'),
          TemplateInputValueSchema,
          {
            error: 'Give the template inputs as names with text values (and the heaters as a list).',
          },
        )
        .refine(
          (r) => Object.keys(r).length <= DEFINITION_LIMITS.templateInputs.max,
          `Give at most ${DEFINITION_LIMITS.templateInputs.max} template inputs.`,
        ),
    }),
    z.strictObject({
      kind: z.literal('cycle'),
      cycle: z.record(z.string(), z.unknown(), {
        error: 'Give the cycle as an object with states and steps, as in a spec file.',
      }),
    }),
  ],
  { error: 'Choose the kind of physics: template or cycle.' },
)

const ToleranceSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({
      kind: z.literal('relative'),
      value: finite('the tolerance')
        .gt(0, 'A relative tolerance must be greater than 0.')
        .max(1, 'A relative tolerance is a fraction: at most 1 (0.02 means 2 %).'),
    }),
    z.strictObject({
      kind: z.literal('absolute'),
      value: finite('the tolerance').min(0, 'An absolute tolerance cannot be negative.'),
      unit: text('the unit', DEFINITION_LIMITS.unit.max).optional(),
    }),
  ],
  { error: 'Choose the kind of tolerance: relative or absolute.' },
)

const SigFigsSchema = z
  .strictObject({
    min: z
      .int('Significant figures must be a whole number.')
      .min(1, 'Ask for at least 1 significant figure.')
      .max(10, 'Ask for at most 10 significant figures.')
      .optional(),
    max: z
      .int('Significant figures must be a whole number.')
      .min(1, 'Allow at least 1 significant figure.')
      .max(10, 'Allow at most 10 significant figures.')
      .optional(),
  })
  .refine((s) => s.min === undefined || s.max === undefined || s.min <= s.max, {
    message: 'The most significant figures allowed must not be below the fewest.',
    path: ['max'],
  })

const FindSourceSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({
      kind: z.literal('output'),
      path: z
        .string({ error: 'Give the solver output, like totals.netWork.' })
        .regex(
          /^[A-Za-z][A-Za-z0-9]*(\.([A-Za-z][A-Za-z0-9]*|\d{1,3}))*$/,
          'Give the solver output as a dotted path, like totals.netWork or states.2.T.',
        )
        .max(120, 'Keep the output path under 121 characters.'),
    }),
    z.strictObject({ kind: z.literal('expression'), expression: Expression }),
  ],
  { error: 'Choose where the answer comes from: output or expression.' },
)

const FindSchema = z.strictObject({
  name: Name,
  label: text('the question', DEFINITION_LIMITS.label.max, 1),
  source: FindSourceSchema,
  unit: text('the unit', DEFINITION_LIMITS.unit.max),
  points: finite('the points')
    .min(0, 'Points cannot be negative.')
    .max(DEFINITION_LIMITS.points.max, `Give at most ${DEFINITION_LIMITS.points.max} points.`),
  tolerance: ToleranceSchema,
  sigFigs: SigFigsSchema.optional(),
  isDifference: z.boolean({ error: 'Say true or false.' }).optional(),
  allowBareNumber: z.boolean({ error: 'Say true or false.' }).optional(),
  pitfalls: z
    .array(z.enum(PITFALL_IDS, { error: `Choose pitfalls from: ${PITFALL_IDS.join(', ')}.` }), {
      error: 'List the pitfalls (an empty list is fine).',
    })
    .max(PITFALL_IDS.length, 'Each pitfall can be listed once.'),
  sense: z
    .enum(FIND_SENSES, { error: `Choose the sense from: ${FIND_SENSES.join(', ')} (or leave it out).` })
    .optional(),
})

export const ProblemDefinitionSchema = z
  .strictObject({
    format: z.literal(DEFINITION_FORMAT, {
      error: (iss) =>
        typeof iss.input === 'number' && iss.input > DEFINITION_FORMAT
          ? `This problem was written by a newer Cyclewright (definition format ${iss.input}); this one reads format ${DEFINITION_FORMAT}.`
          : `Set format to ${DEFINITION_FORMAT}.`,
    }),
    title: text('a title', DEFINITION_LIMITS.title.max, DEFINITION_LIMITS.title.min),
    tags: z.strictObject({
      topics: z
        .array(
          z
            .string({ error: 'Each topic is a short text.' })
            .trim()
            .toLowerCase()
            .min(1, 'A topic cannot be empty.')
            .max(
              DEFINITION_LIMITS.topics.wordMax,
              `Keep each topic under ${DEFINITION_LIMITS.topics.wordMax + 1} characters.`,
            ),
          {
            error: 'List the topics (an empty list is fine).',
          },
        )
        .max(DEFINITION_LIMITS.topics.max, `Give at most ${DEFINITION_LIMITS.topics.max} topics.`),
      difficulty: z.enum(DIFFICULTIES, { error: `Choose a difficulty: ${DIFFICULTIES.join(', ')}.` }),
      level: z.enum(LEVELS, { error: `Choose a level: ${LEVELS.join(', ')}.` }),
    }),
    convention: z.enum(['course', 'chemistry', 'engineering'], {
      error: 'Choose the sign convention: course, chemistry or engineering.',
    }),
    prompt: z
      .string({ error: 'Write the problem text.' })
      .min(1, 'Write the problem text.')
      .max(
        DEFINITION_LIMITS.prompt.max,
        `Keep the problem text under ${DEFINITION_LIMITS.prompt.max.toLocaleString('en')} characters.`,
      ),
    givens: z
      .array(GivenSchema, { error: 'List the givens (an empty list is fine).' })
      .max(DEFINITION_LIMITS.givens.max, `Give at most ${DEFINITION_LIMITS.givens.max} givens.`),
    constraints: z
      .array(ConstraintSchema, { error: 'List the constraints (an empty list is fine).' })
      .max(DEFINITION_LIMITS.constraints.max, `Give at most ${DEFINITION_LIMITS.constraints.max} constraints.`),
    physics: PhysicsSchema,
    finds: z
      .array(FindSchema, { error: 'List what students must find.' })
      .min(DEFINITION_LIMITS.finds.min, 'Ask for at least one answer.')
      .max(DEFINITION_LIMITS.finds.max, `Ask for at most ${DEFINITION_LIMITS.finds.max} answers.`),
  })
  .superRefine((d, ctx) => {
    // Givens and finds share one namespace: expressions and placeholders refer to both.
    const seen = new Set<string>()
    const check = (list: 'givens' | 'finds', name: string, i: number) => {
      if (seen.has(name))
        ctx.addIssue({
          code: 'custom',
          path: [list, i, 'name'],
          message: `The name ${name} is already used by another given or find.`,
        })
      seen.add(name)
    }
    d.givens.forEach((g, i) => check('givens', g.name, i))
    d.finds.forEach((f, i) => check('finds', f.name, i))
    d.finds.forEach((f, i) => {
      if (new Set(f.pitfalls).size !== f.pitfalls.length)
        ctx.addIssue({ code: 'custom', path: ['finds', i, 'pitfalls'], message: 'Each pitfall can be listed once.' })
    })
  })

export type ProblemDefinitionInput = z.input<typeof ProblemDefinitionSchema>

// The schema's output must be usable as the domain type (definition.ts is the contract).
type Assert<T extends true> = T
export type SchemaAgreesWithDefinition = Assert<
  z.output<typeof ProblemDefinitionSchema> extends ProblemDefinition ? true : false
>
export type PitfallListComplete = Assert<PitfallId extends (typeof PITFALL_IDS)[number] ? true : false>

// ---- Messages -------------------------------------------------------------------------

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1)
}

const KIND_WORDS: Record<string, string> = {
  number: 'a number',
  string: 'text',
  boolean: 'true or false',
  array: 'a list',
  object: 'a group of fields',
  record: 'a group of fields',
}

/** Plain words for the issues no schema above words itself (wrong types, unknown keys). */
function authorMessage(iss: z.core.$ZodRawIssue): string | undefined {
  switch (iss.code) {
    case 'invalid_type': {
      const want = KIND_WORDS[iss.expected] ?? iss.expected
      if (iss.input === undefined) return `This field is missing: it needs ${want}.`
      if (iss.expected === 'number' && typeof iss.input === 'number') return 'This must be a finite number.'
      return `This should be ${want}.`
    }
    case 'invalid_value':
      return iss.values.length === 1
        ? `This must be ${JSON.stringify(iss.values[0])}.`
        : `Choose one of: ${iss.values.join(', ')}.`
    case 'invalid_union':
      return 'This does not match any of the allowed forms.'
    case 'too_small':
      return iss.origin === 'array'
        ? `Give at least ${iss.minimum}.`
        : iss.origin === 'string'
          ? `Write at least ${iss.minimum} characters.`
          : `This must be at least ${iss.minimum}.`
    case 'too_big':
      return iss.origin === 'array'
        ? `Give at most ${iss.maximum}.`
        : iss.origin === 'string'
          ? `Keep this under ${Number(iss.maximum) + 1} characters.`
          : `This must be at most ${iss.maximum}.`
    case 'invalid_format':
      return iss.format === 'datetime'
        ? 'Give a date and time like 2026-12-02T10:00:00Z.'
        : 'This is not in the expected form.'
    default:
      return undefined
  }
}

export type FieldIssue = { path: string; message: string }

function toFieldIssues(issues: readonly z.core.$ZodIssue[], prefix: readonly PropertyKey[] = []): FieldIssue[] {
  const out: FieldIssue[] = []
  for (const iss of issues) {
    const at = [...prefix, ...iss.path]
    if (iss.code === 'unrecognized_keys') {
      // One line per unknown field, at the field itself, so the author sees where it is.
      for (const key of iss.keys)
        out.push({
          path: dotted([...at, key]),
          message: `${key} is not a field here: remove it or check its spelling.`,
        })
    } else out.push({ path: dotted(at), message: iss.message })
  }
  return out
}

function dotted(path: readonly PropertyKey[]): string {
  return path.map((p) => String(p)).join('.')
}

/** Every problem with a definition, as dotted paths ('givens.0.rule.min'); [] when it is valid. */
export function definitionIssues(raw: unknown): FieldIssue[] {
  const control = controlCharIssues(raw, () => 'this text')
  if (control.length > 0) return control
  const r = ProblemDefinitionSchema.safeParse(raw, { error: authorMessage })
  return r.success ? [] : toFieldIssues(r.error.issues)
}

/** Parses a definition with the author-facing messages; the value is normalised (trimmed, topics lower case). */
export function parseDefinition(
  raw: unknown,
): { ok: true; value: ProblemDefinition } | { ok: false; issues: FieldIssue[] } {
  // Checked before the shape: PostgreSQL cannot store a NUL in a definition, wherever it is.
  // The editor shows its fields back without NUL characters (problem-editor.server.ts), and says so.
  const control = controlCharIssues(raw, () => 'this text', { echoed: true })
  if (control.length > 0) return { ok: false, issues: control }
  // An older document (format 1) is brought up to date first (definition.ts).
  const r = ProblemDefinitionSchema.safeParse(upgradeDefinition(raw), { error: authorMessage })
  return r.success ? { ok: true, value: r.data } : { ok: false, issues: toFieldIssues(r.error.issues) }
}

// ---- The bank document ----------------------------------------------------------------

export const BANK_FORMAT_ID = 'cyclewright-bank' as const
/** 2: definitions of format 2 (`[T1]` placeholders). Version 1 documents still import (upgraded). */
export const BANK_FORMAT_VERSION = 2 as const
/** Bank document versions readBankDocument still reads. */
export const BANK_FORMAT_VERSIONS_READ: readonly number[] = [1, 2]
export const BANK_MAX_PROBLEMS = 500

export const BankProblemSchema = z.strictObject({
  /** Repeated from the definition so that a reader of the file can find the problem. */
  title: text('a title', DEFINITION_LIMITS.title.max, 1),
  visibility: z.enum(VISIBILITIES, { error: `Choose a visibility: ${VISIBILITIES.join(', ')}.` }).optional(),
  origin: z
    .strictObject({
      title: text('the original title', DEFINITION_LIMITS.title.max, 1),
      author: text("the original author's name", 200, 1),
    })
    .optional(),
  // An older definition (format 1) is upgraded before it is checked.
  definition: z.preprocess(upgradeDefinition, ProblemDefinitionSchema),
})
/** One problem of a bank document, with the definition typed as the domain contract. */
export type BankProblem = {
  title: string
  visibility?: (typeof VISIBILITIES)[number]
  origin?: { title: string; author: string }
  definition: ProblemDefinition
}

export const BankDocumentSchema = z.strictObject({
  format: z.literal(BANK_FORMAT_ID),
  version: z.literal(BANK_FORMAT_VERSION),
  exportedAt: z.iso.datetime({ offset: true }),
  problems: z.array(BankProblemSchema).min(1).max(BANK_MAX_PROBLEMS),
})
export type BankDocument = {
  format: typeof BANK_FORMAT_ID
  version: typeof BANK_FORMAT_VERSION
  exportedAt: string
  problems: BankProblem[]
}

export type BankError = {
  /** "Problem 3 (Otto cycle efficiency)", or "The document" for the envelope. */
  problem: string
  /** Dotted path inside that problem ('definition.givens.0.rule.min'); '' for the whole. */
  field: string
  message: string
}

export type BankReadResult = { ok: true; problems: BankProblem[] } | { ok: false; errors: BankError[] }

const THE_DOCUMENT = 'The document'

// The envelope first: when it is not ours or is from a newer release, problem-by-problem
// messages would only bury the one message that matters.
const EnvelopeSchema = z.object({
  format: z.unknown(),
  version: z.unknown(),
  exportedAt: z.iso.datetime({ offset: true, error: 'Give exportedAt as a date and time like 2026-12-02T10:00:00Z.' }),
  problems: z
    .array(z.unknown(), { error: 'The document has no list of problems.' })
    .min(1, 'The document holds no problems.')
    .max(BANK_MAX_PROBLEMS, `A document holds at most ${BANK_MAX_PROBLEMS} problems; split it into several files.`),
})

function problemName(index: number, raw: unknown): string {
  const o = isRecord(raw) ? raw : {}
  const def = isRecord(o.definition) ? o.definition : {}
  const title =
    typeof def.title === 'string' && def.title.trim()
      ? def.title.trim()
      : typeof o.title === 'string' && o.title.trim()
        ? o.title.trim()
        : null
  // Shown on the import page: control characters (a NUL cannot be shown) are left out of the name.
  const plain = title?.replace(/[\u0000-\u001F\u007F]/g, '') ?? null
  const short = plain && plain.length > 60 ? `${plain.slice(0, 57)}…` : plain
  return short ? `Problem ${index + 1} (${short})` : `Problem ${index + 1}`
}

/**
 * Checks a bank document and names every error: which problem (by position and title) and
 * which field (dotted path). Accepts the parsed JSON, or the JSON text itself.
 */
export function readBankDocument(raw: unknown): BankReadResult {
  const doc = (message: string, field = ''): BankReadResult => ({
    ok: false,
    errors: [{ problem: THE_DOCUMENT, field, message }],
  })
  let value = raw
  if (typeof raw === 'string') {
    try {
      value = JSON.parse(raw)
    } catch {
      return doc(
        'This file is not valid JSON. Export the bank again, or check the file was not cut short or edited by hand.',
      )
    }
  }
  if (!isRecord(value)) return doc('This is not a Cyclewright bank document: it should be one JSON object.')
  const o = value
  if (o.format !== BANK_FORMAT_ID)
    return doc(`This is not a Cyclewright bank document: format should be "${BANK_FORMAT_ID}".`, 'format')
  if (typeof o.version === 'number' && Number.isInteger(o.version) && o.version > BANK_FORMAT_VERSION) {
    return doc(
      `This document was made by a newer Cyclewright (bank format version ${o.version}); this one reads version ${BANK_FORMAT_VERSION}. Update Cyclewright, or export again from an older one.`,
      'version',
    )
  }
  if (typeof o.version !== 'number' || !BANK_FORMAT_VERSIONS_READ.includes(o.version))
    return doc(`Set version to ${BANK_FORMAT_VERSION}.`, 'version')

  const errors: BankError[] = []
  const envelope = EnvelopeSchema.safeParse(value, { error: authorMessage })
  if (!envelope.success)
    for (const i of toFieldIssues(envelope.error.issues))
      errors.push({ problem: THE_DOCUMENT, field: i.path, message: i.message })
  const extra = Object.keys(o).filter((k) => !['format', 'version', 'exportedAt', 'problems'].includes(k))
  for (const k of extra)
    errors.push({
      problem: THE_DOCUMENT,
      field: k,
      message: `${k} is not a field of a bank document: remove it or check its spelling.`,
    })
  if (!Array.isArray(o.problems) || o.problems.length > BANK_MAX_PROBLEMS) return { ok: false, errors }

  const problems: BankProblem[] = []
  o.problems.forEach((p, i) => {
    const control = controlCharIssues(p, () => 'this text')
    if (control.length > 0) {
      for (const issue of control)
        errors.push({ problem: problemName(i, p), field: issue.path, message: issue.message })
      return
    }
    const r = BankProblemSchema.safeParse(p, { error: authorMessage })
    if (r.success) problems.push(r.data)
    else
      for (const issue of toFieldIssues(r.error.issues))
        errors.push({ problem: problemName(i, p), field: issue.path, message: issue.message })
  })
  return errors.length ? { ok: false, errors } : { ok: true, problems }
}
