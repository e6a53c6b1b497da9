/**
 * Checks on a problem definition beyond its shape (the zod schema in app/lib checks that):
 * names, ranges, expressions, the template's inputs, units, tolerances, placeholders, and one
 * trial variant (seed 1) to see that every output path names a number. Each finding has a
 * dotted path into the definition ('givens.2.rule.expression', 'finds.0.source.path') so the
 * editor can show it beside the field. Pure; never throws.
 */
import type { CheckNote } from '#app/domain/grading/index.ts'
import { compileRestrictedExpression, validateCheckRule } from '#app/domain/grading/index.ts'
import { resolveExpectedUnit } from '#app/domain/grading/units.ts'
import { readQuantity, solveBankSpec } from '#app/domain/thermo/index.ts'
import type { TemplateInput } from '#app/domain/thermo/index.ts'
import { templateEntry } from '#app/domain/thermo/catalog.ts'
import { whyPitfallCannotFire } from '#app/domain/grading/applicable-pitfalls.ts'
import type { Find, ProblemDefinition, TemplateInputValue } from './definition.ts'
import { NAME_PATTERN, checkRuleOf } from './definition.ts'
import { describeCompileError, drawGivens, isNumericGiven, rangeSteps } from './givens.ts'
import { parsePlaceholders } from './placeholders.ts'
import { previewSeeds } from './seed.ts'
import { senseErrors, senseWarnings, type ProblemVisibility } from './sense.ts'
import { PLACEHOLDER, buildSpec } from './substitute.ts'
import { convertFromSI, drawVariant, resolveConvention, solverErrorPath, unitAtPath } from './variant.ts'

export interface LintFinding {
  readonly path: string
  readonly message: string
}

const NOTE_MESSAGES: Readonly<Record<CheckNote, string>> = {
  'relative-tolerance-zero-expected':
    'The key is 0 in the trial variant, so a relative tolerance accepts only exactly 0: use an absolute tolerance.',
  'relative-tolerance-on-absolute-scale':
    'A relative tolerance on a °C or °F value is applied on the absolute scale (1 % of 27 °C is 3 K).',
}

function sentence(s: string): string {
  const t = s.trim()
  const c = t.charAt(0).toUpperCase() + t.slice(1)
  return /[.!?]$/.test(c) ? c : `${c}.`
}

/** The inputs of a template bank problems may use; null for any other id. */
function templateInputs(
  id: string,
): readonly (Pick<TemplateInput, 'name' | 'required' | 'description'> & { readonly dimension: string })[] | null {
  const e = templateEntry(id)
  return e && e.bank ? e.inputs : null
}

/** Every `@{name}` in the strings of a JSON-like value, with the path of its string. */
function placeholdersIn(x: unknown, path: string, out: { path: string; name: string }[]): void {
  if (typeof x === 'string') {
    for (const m of x.matchAll(PLACEHOLDER)) out.push({ path, name: m[1]! })
  } else if (Array.isArray(x)) {
    x.forEach((v, i) => placeholdersIn(v, `${path}.${i}`, out))
  } else if (x !== null && typeof x === 'object') {
    for (const [k, v] of Object.entries(x)) placeholdersIn(v, `${path}.${k}`, out)
  }
}

/**
 * A 'heater list' input (definition.ts HeaterInput): a list, each heater's kind and drains one
 * of the solver's words or a given's name, and an open heater without ttd or drains.
 */
function heaterListFindings(
  value: TemplateInputValue,
  path: string,
  givenNames: ReadonlySet<string>,
  add: (path: string, message: string) => void,
): void {
  if (typeof value === 'string') {
    add(
      path,
      'the heaters are a list of heaters (kind, pressure, and for a closed heater ttd and drains), not one text',
    )
    return
  }
  value.forEach((h, i) => {
    const at = `${path}.${i}`
    const kind = h.kind.trim()
    if (kind !== 'open' && kind !== 'closed' && !givenNames.has(kind))
      add(`${at}.kind`, `heater ${i + 1}: the kind is "open" or "closed" (or a given's name), not "${h.kind}"`)
    if (h.drains !== undefined) {
      const d = h.drains.trim()
      if (d !== 'backward' && d !== 'forward' && !givenNames.has(d))
        add(
          `${at}.drains`,
          `heater ${i + 1}: the drains go "backward" or "forward" (or a given's name), not "${h.drains}"`,
        )
    }
    if (kind === 'open' && (h.ttd !== undefined || h.drains !== undefined))
      add(
        `${at}.${h.ttd !== undefined ? 'ttd' : 'drains'}`,
        `heater ${i + 1} is open (direct contact): it takes no terminal temperature difference or drains; leave them empty`,
      )
  })
}

function findSourcePath(f: Find, i: number): string {
  return f.source.kind === 'output' ? `finds.${i}.source.path` : `finds.${i}.source.expression`
}

/** Semantic checks, in the order of the definition. An empty list means nothing to fix. */
export function lintDefinition(def: ProblemDefinition): LintFinding[] {
  try {
    return lintUnsafe(def)
  } catch (e) {
    return [{ path: '', message: `The problem could not be checked (${e instanceof Error ? e.message : String(e)}).` }]
  }
}

function lintUnsafe(def: ProblemDefinition): LintFinding[] {
  const out: LintFinding[] = []
  const add = (path: string, message: string): void => {
    out.push({ path, message: sentence(message) })
  }

  // Names
  const seen = new Map<string, string>()
  const nameCheck = (name: string, path: string, what: string): void => {
    if (!NAME_PATTERN.test(name))
      add(path, `"${name}" is not a usable name: start with a letter, then letters, digits or _ (at most 32)`)
    const before = seen.get(name)
    if (before !== undefined) add(path, `the name "${name}" is already used by ${before}`)
    else seen.set(name, what)
  }
  def.givens.forEach((g, i) => nameCheck(g.name, `givens.${i}.name`, `given ${i + 1}`))
  def.finds.forEach((f, i) => nameCheck(f.name, `finds.${i}.name`, `find ${i + 1}`))

  // Givens
  const numericGivens: string[] = []
  const givenNames = new Set(def.givens.map((g) => g.name))
  def.givens.forEach((g, i) => {
    const base = `givens.${i}`
    const unitOk = resolveExpectedUnit(g.unit, false) !== null
    if (!unitOk) add(`${base}.unit`, `"${g.unit}" is not a unit we can read`)
    const rule = g.rule
    if (rule.kind === 'range') {
      if (![rule.min, rule.max].every(Number.isFinite)) add(`${base}.rule.min`, 'min and max must be numbers')
      else if (rule.max < rule.min) add(`${base}.rule.max`, `max (${rule.max}) is below min (${rule.min})`)
      if (!Number.isFinite(rule.step) || rule.step <= 0) add(`${base}.rule.step`, 'the step must be greater than 0')
      else if (rangeSteps(rule.min, rule.max, rule.step) !== null && (rule.max - rule.min) / rule.step > 1e6)
        add(`${base}.rule.step`, 'the step is so small that the range has over a million values')
    } else if (rule.kind === 'choice') {
      if (rule.values.length === 0) add(`${base}.rule.values`, 'the choice needs at least one value')
      const texts = rule.values.filter((v) => typeof v === 'string').length
      if (texts > 0 && texts < rule.values.length)
        add(`${base}.rule.values`, 'mix of numbers and texts: give all numbers or all texts')
    } else if (unitOk) {
      const earlier = new Set(numericGivens)
      const c = compileRestrictedExpression(rule.expression, { variables: numericGivens, expectedUnit: g.unit })
      if (!c.ok)
        add(
          `${base}.rule.expression`,
          laterNameMessage(rule.expression, earlier, givenNames, def) ??
            describeCompileError(rule.expression, earlier, c.error),
        )
    }
    if (isNumericGiven(g)) numericGivens.push(g.name)
  })

  // Constraints
  const numericSet = new Set(numericGivens)
  def.constraints.forEach((c, i) => {
    for (const side of ['left', 'right'] as const) {
      const r = compileRestrictedExpression(c[side], { variables: numericGivens })
      if (!r.ok) add(`constraints.${i}.${side}`, describeCompileError(c[side], numericSet, r.error))
    }
  })

  // Physics
  const physicsPlaceholders: { path: string; name: string }[] = []
  if (def.physics.kind === 'template') {
    const p = def.physics
    const inputs = templateInputs(p.template)
    if (inputs === null) {
      add('physics.template', `there is no template "${p.template}"`)
    } else {
      const known = new Set(inputs.map((x) => x.name))
      for (const k of Object.keys(p.inputs)) {
        if (!known.has(k))
          add(`physics.inputs.${k}`, `template "${p.template}" has no input "${k}"; it takes ${[...known].join(', ')}`)
      }
      for (const inp of inputs) {
        if (inp.required && !Object.hasOwn(p.inputs, inp.name))
          add(`physics.inputs.${inp.name}`, `template "${p.template}" needs "${inp.name}" (${inp.description})`)
        const value = p.inputs[inp.name]
        if (value === undefined) continue
        if (inp.dimension === 'heater list') heaterListFindings(value, `physics.inputs.${inp.name}`, givenNames, add)
        else if (typeof value !== 'string')
          add(
            `physics.inputs.${inp.name}`,
            `"${inp.name}" takes one text value (a given's name or a value with its unit), not a list`,
          )
      }
    }
    placeholdersIn(p.inputs, 'physics.inputs', physicsPlaceholders)
  } else {
    placeholdersIn(def.physics.cycle, 'physics.cycle', physicsPlaceholders)
  }
  for (const ph of physicsPlaceholders) {
    if (!givenNames.has(ph.name)) add(ph.path, `@{${ph.name}} names no given`)
  }

  // Finds
  const findNames = [...numericGivens]
  def.finds.forEach((f, i) => {
    const base = `finds.${i}`
    const unitOk = resolveExpectedUnit(f.unit, f.isDifference === true) !== null
    if (!unitOk) add(`${base}.unit`, `"${f.unit}" is not a unit we can read`)
    if (f.source.kind === 'expression' && unitOk) {
      const allowed = new Set(findNames)
      const c = compileRestrictedExpression(f.source.expression, {
        variables: [...allowed],
        expectedUnit: f.unit,
        temperatureDifference: f.isDifference === true,
      })
      if (!c.ok)
        add(
          `${base}.source.expression`,
          laterNameMessage(
            f.source.expression,
            allowed,
            new Set([...givenNames, ...def.finds.map((x) => x.name)]),
            def,
          ) ?? describeCompileError(f.source.expression, allowed, c.error),
        )
    }
    if (unitOk) {
      const v = validateCheckRule({ value: 1, unit: f.unit }, checkRuleOf(f))
      if (!v.ok && v.error.property !== 'expected.unit')
        add(`${base}.${v.error.property.replace(/^rule\./, '')}`, v.error.message)
    }
    f.pitfalls.forEach((id) => {
      const why = whyPitfallCannotFire(def, i, id)
      if (why !== null) add(`${base}.pitfalls`, `the pitfall "${id}" can never be recognised here: ${why}. Untick it`)
    })
    findNames.push(f.name)
  })
  for (const e of senseErrors(def)) add(e.path, e.message)

  // Prompt
  const parsed = parsePlaceholders(def.prompt)
  for (const e of parsed.errors) add('prompt', e.message)
  const unknownInPrompt = [...new Set(parsed.placeholders.map((p) => p.name).filter((n) => !givenNames.has(n)))]
  const known = [...givenNames].join(', ')
  for (const n of unknownInPrompt)
    add(
      'prompt',
      `The placeholder [${n}] names no given${known ? ` (the givens are ${known})` : ''}; write \\[ for a bracket that is only a bracket`,
    )

  // A trial variant, only when the definition is otherwise sound: its errors would repeat the above.
  if (out.length === 0) trial(def, add)
  return out
}

/**
 * Findings worth a look that do not stop a save: a question whose words and key disagree in
 * some convention ("work done by the air" keyed as work done on it in a chemistry course), a
 * work or heat find with no sense in a problem shared with other courses. Pure and light (no
 * solver), never throws.
 */
export function lintWarnings(
  def: ProblemDefinition,
  options: { readonly visibility?: ProblemVisibility } = {},
): LintFinding[] {
  try {
    return senseWarnings(def, options)
  } catch {
    return []
  }
}

/** "uses X, which is defined after it" when the expression names a later given or find. */
function laterNameMessage(
  text: string,
  allowed: ReadonlySet<string>,
  all: ReadonlySet<string>,
  def: ProblemDefinition,
): string | null {
  const later = [...new Set([...text.matchAll(/(?<![0-9.A-Za-z_])[A-Za-z][A-Za-z0-9_]*/g)].map((m) => m[0]))].filter(
    (n) => all.has(n) && !allowed.has(n),
  )
  if (later.length === 0) return null
  const isText = (n: string): boolean => def.givens.some((g) => g.name === n && !isNumericGiven(g))
  const texts = later.filter(isText)
  if (texts.length > 0)
    return `${texts.map((n) => `"${n}"`).join(', ')} is a text given and has no number to compute with`
  return `uses ${later.map((n) => `"${n}"`).join(', ')} before ${later.length === 1 ? 'it is' : 'they are'} defined: expressions may use only what is listed above them`
}

/** Output paths to suggest when a find names none the solution has, by the problem's cycle. */
function pathExamples(def: ProblemDefinition): string {
  const id = def.physics.kind === 'template' ? def.physics.template : ''
  if (id === 'vapour-compression')
    return 'e.g. totals.copRefrigerator, totals.refrigerationEffect, totals.compressorWork, states.4.x, devices.1.w'
  if (id === 'vapour-compression-two-stage')
    return 'e.g. totals.copRefrigerator, totals.flashVapourFraction, totals.refrigerationEffect, totals.lowStageWork, totals.highStageWork, totals.heatRejected, states.6.x; rates (totals.capacity, totals.highStageMassFlow, totals.lowStageMassFlow, totals.compressorPower) need highStageMassFlow, lowStageMassFlow or capacity'
  if (id === 'vapour-compression-cascade')
    return 'e.g. totals.copRefrigerator, totals.massFlowRatio, totals.refrigerationEffect, totals.lowerCompressorWork, totals.upperCompressorWork, totals.heatRejected, states.4.x; rates (totals.capacity, totals.lowerMassFlow, totals.upperMassFlow, totals.compressorPower) need lowerMassFlow, upperMassFlow or capacity'
  if (id.startsWith('rankine')) return 'e.g. totals.netWork, totals.efficiency, totals.turbineExitQuality, states.2.h'
  if (id === 'turbojet')
    return 'e.g. totals.exitVelocity, totals.thrust, totals.propulsivePower, totals.propulsiveEfficiency, states.3.T, devices.2.w; thrust and powers need the massFlow input'
  if (id === 'nozzle' || id === 'diffuser')
    return 'e.g. totals.exitVelocity, totals.exitTemperature, totals.exitMach, totals.areaRatio, states.2.p; areas and rates need massFlow or inletArea'
  return 'e.g. totals.netWork, states.2.T, steps.1.q'
}

function trial(def: ProblemDefinition, add: (path: string, message: string) => void): void {
  const seed = previewSeeds(1)[0]!
  const convention = resolveConvention(def, 'engineering')
  const drawn = drawGivens(def, seed)
  if (!drawn.ok) {
    const e = drawn.error
    const gi = def.givens.findIndex((g) => g.name === e.property)
    const givenPath =
      gi >= 0 ? (def.givens[gi]!.rule.kind === 'expression' ? `givens.${gi}.rule.expression` : `givens.${gi}`) : null
    const path = givenPath ?? (e.property?.startsWith('constraints.') ? e.property : 'physics')
    add(path, e.message)
    return
  }
  const solved = solveBankSpec(buildSpec(def, drawn.givens, convention))
  if (!solved.ok) {
    add(
      solverErrorPath(def.physics, solved.error.property),
      `the trial variant (seed ${seed}) does not solve: ${solved.error.message}`,
    )
    return
  }
  let outputsOk = true
  def.finds.forEach((f, i) => {
    if (f.source.kind !== 'output') return
    const raw = readQuantity(solved, f.source.path)
    const siUnit = unitAtPath(solved, f.source.path)
    if (raw === null || siUnit === null) {
      outputsOk = false
      add(`finds.${i}.source.path`, `the solution has no number at "${f.source.path}" (${pathExamples(def)})`)
      return
    }
    const v = convertFromSI(Number.isFinite(raw) ? raw : 0, siUnit, f.unit, f.isDifference === true)
    if (typeof v === 'string') {
      outputsOk = false
      add(`finds.${i}.unit`, v)
    }
  })
  if (!outputsOk) return
  const r = drawVariant(def, seed, { convention })
  if (!r.ok) {
    const fi = def.finds.findIndex((f) => f.name === r.error.property)
    const physicsPath =
      r.error.code === 'solve-error' && r.error.property?.startsWith('physics') ? r.error.property : 'physics'
    add(fi >= 0 ? findSourcePath(def.finds[fi]!, fi) : physicsPath, r.error.message.replace(/^Find "[^"]*": /, ''))
    return
  }
  r.variant.key.forEach((k, i) => {
    const f = def.finds[i]!
    const v = validateCheckRule({ value: k.value, unit: f.unit }, checkRuleOf(f))
    if (!v.ok) add(`finds.${i}.${v.error.property.replace(/^rule\./, '')}`, v.error.message)
    else for (const note of v.notes) add(`finds.${i}.tolerance`, NOTE_MESSAGES[note])
  })
}
