/**
 * Drawing a problem's givens from a seed: ranges on their grid, choices, expressions over
 * earlier givens, then the constraints (redrawn with a derived seed until they hold). The same
 * seed always gives the same givens, on every machine, so a variant never has to be stored.
 *
 * Also the quantity helpers variant.ts shares: givens and finds become mathjs quantities for
 * the restricted expression reader (app/domain/grading), and numbers are printed without
 * float noise. Pure.
 */
import type { Unit } from 'mathjs'
import type { CompiledRestrictedExpression, ScopeValue } from '#app/domain/grading/index.ts'
import { ALLOWED_CONSTANTS, ALLOWED_FUNCTIONS, compileRestrictedExpression } from '#app/domain/grading/index.ts'
import { mathCore } from '#app/domain/grading/math-instance.ts'
import { isKnownUnitName } from '#app/domain/grading/restricted-math.ts'
import { resolveExpectedUnit } from '#app/domain/grading/units.ts'
import { mulberry32 } from '#app/domain/random.ts'
import { isOneOf } from '#app/domain/thermo/json.ts'
import type { Constraint, DrawnGiven, Given, ProblemDefinition, VariantError } from './definition.ts'
import { seedFrom } from './seed.ts'

/** How many draws a set of constraints gets before the problem is called impossible. */
export const MAX_DRAW_ATTEMPTS = 200

export type DrawGivensResult =
  { readonly ok: true; readonly givens: DrawnGiven[] } | { readonly ok: false; readonly error: VariantError }

// ---- Numbers ------------------------------------------------------------------------

/** 12 significant digits: far below any tolerance, and 0.1 + 0.2 prints as 0.3. */
export function cleanNumber(x: number): number {
  if (!Number.isFinite(x)) return x
  const c = Number(x.toPrecision(12))
  return c === 0 ? 0 : c
}

export function formatNumber(x: number): string {
  return String(cleanNumber(x))
}

/** "350 K", "0.85", "air": the text the solver and the prompt receive. */
export function givenText(value: number, unit: string): string {
  const n = formatNumber(value)
  return unit.trim() === '' ? n : `${n} ${unit}`
}

/** Decimal places a number is written with (0.05 → 2, 1e-7 → 7, 250 → 0). */
function decimalsOf(x: number): number {
  const s = String(Math.abs(x))
  const m = /^(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/.exec(s)
  if (!m) return 0
  const frac = m[2]?.length ?? 0
  const exp = m[3] ? Number(m[3]) : 0
  return Math.min(15, Math.max(0, frac - exp))
}

function roundTo(x: number, decimals: number): number {
  const r = Number(x.toFixed(Math.min(20, Math.max(0, decimals))))
  return r === 0 ? 0 : r
}

/** A given's display rule applied to a computed value, so the prompt and the solver agree. */
function applyDisplay(x: number, display: Given['display']): number {
  if (display?.decimals !== undefined && Number.isInteger(display.decimals) && display.decimals >= 0)
    return roundTo(x, display.decimals)
  if (
    display?.sigFigs !== undefined &&
    Number.isInteger(display.sigFigs) &&
    display.sigFigs >= 1 &&
    display.sigFigs <= 21
  ) {
    return x === 0 ? 0 : Number(x.toPrecision(display.sigFigs))
  }
  return cleanNumber(x)
}

/** How many grid points a range has, or null when the rule cannot be drawn from. */
export function rangeSteps(min: number, max: number, step: number): number | null {
  if (![min, max, step].every(Number.isFinite) || step <= 0 || max < min) return null
  return Math.floor((max - min) / step + 1e-9)
}

// ---- Quantities ---------------------------------------------------------------------

/**
 * A number in a unit as a value for the restricted reader. °C and °F become kelvin and
 * rankine first: mathjs subtracts two °C values as if both were offsets, and "T3 - T1" must
 * be a plain difference. With `isDifference`, °C and °F are differences (1 °C = 1 K). Null
 * when the unit cannot be read.
 */
export function toScopeValue(value: number, unit: string, isDifference = false): ScopeValue | null {
  const e = resolveExpectedUnit(unit, isDifference)
  if (e === null) return null
  if (e.kind === 'dimensionless') return value * e.scale
  const q = mathCore.scale(value, e.unit)
  if (e.absoluteTwin === null) return q
  return mathCore.scale(mathCore.numberIn(q, e.absoluteTwin), e.absoluteTwin)
}

/** The numeric givens as scope values (text choices have no number and are left out). */
export function givenScope(givens: readonly DrawnGiven[]): Record<string, ScopeValue> {
  const scope: Record<string, ScopeValue> = {}
  for (const g of givens) {
    if (!Number.isFinite(g.value)) continue
    const v = toScopeValue(g.value, g.unit)
    if (v !== null) scope[g.name] = v
  }
  return scope
}

/** Whether a given always draws a number (text choices never take part in expressions). */
export function isNumericGiven(g: Given): boolean {
  return g.rule.kind !== 'choice' || g.rule.values.every((v) => typeof v === 'number')
}

/**
 * Names an expression uses that are not in `allowed` and are not units, functions or
 * constants: the names to quote when the reader says "unknown symbol". A scan of the text,
 * good enough for messages.
 */
export function unknownNames(text: string, allowed: ReadonlySet<string>): string[] {
  const found = new Set<string>()
  for (const m of text.matchAll(/(?<![0-9.A-Za-z_])[A-Za-z][A-Za-z0-9_]*/g)) {
    const name = m[0]
    if (allowed.has(name) || Object.hasOwn(ALLOWED_CONSTANTS, name) || isOneOf(ALLOWED_FUNCTIONS, name)) continue
    if (isKnownUnitName(name)) continue
    found.add(name)
  }
  return [...found]
}

/** A reader error as an author-facing sentence, naming unknown names when there are some. */
export function describeCompileError(
  text: string,
  allowed: ReadonlySet<string>,
  error: { code: string; message: string },
): string {
  if (error.code === 'unknown-symbol') {
    const names = unknownNames(text, allowed)
    if (names.length > 0)
      return `uses ${names.map((n) => `"${n}"`).join(', ')}, which is not defined before it (nor a unit)`
  }
  return error.message.replace(/^The expression/, 'the expression').replace(/\.$/, '')
}

// ---- Preparing a definition once -----------------------------------------------------

type PreparedGiven =
  | {
      readonly given: Given
      readonly kind: 'range'
      readonly rule: Extract<Given['rule'], { kind: 'range' }>
      readonly steps: number
      readonly decimals: number
    }
  | { readonly given: Given; readonly kind: 'choice'; readonly rule: Extract<Given['rule'], { kind: 'choice' }> }
  | { readonly given: Given; readonly kind: 'expression'; readonly compiled: CompiledRestrictedExpression }

interface PreparedConstraint {
  readonly index: number
  readonly constraint: Constraint
  readonly left: CompiledRestrictedExpression
  readonly right: CompiledRestrictedExpression
}

type Prepared =
  | {
      readonly ok: true
      readonly givens: readonly PreparedGiven[]
      readonly constraints: readonly PreparedConstraint[]
      readonly needsScope: boolean
    }
  | { readonly ok: false; readonly error: VariantError }

// Compiling is most of the cost of a draw; a sweep draws the same definition hundreds of times.
const preparedCache = new WeakMap<ProblemDefinition, Prepared>()

function givenError(g: Given, message: string): { ok: false; error: VariantError } {
  return { ok: false, error: { code: 'given-error', message: `Given "${g.name}": ${message}.`, property: g.name } }
}

function prepare(def: ProblemDefinition): Prepared {
  const hit = preparedCache.get(def)
  if (hit) return hit
  const p = prepareUncached(def)
  preparedCache.set(def, p)
  return p
}

function prepareUncached(def: ProblemDefinition): Prepared {
  const givens: PreparedGiven[] = []
  const earlier: string[] = []
  for (const g of def.givens) {
    const rule = g.rule
    if (rule.kind === 'range') {
      const steps = rangeSteps(rule.min, rule.max, rule.step)
      if (steps === null)
        return givenError(
          g,
          `the range needs finite min <= max and a step > 0 (got ${rule.min} to ${rule.max} by ${rule.step})`,
        )
      givens.push({
        given: g,
        kind: 'range',
        rule,
        steps,
        decimals: Math.max(decimalsOf(rule.min), decimalsOf(rule.step)),
      })
    } else if (rule.kind === 'choice') {
      if (rule.values.length === 0) return givenError(g, 'the choice has no values')
      if (rule.values.some((v) => typeof v === 'number' && !Number.isFinite(v)))
        return givenError(g, 'a choice value is not a finite number')
      givens.push({ given: g, kind: 'choice', rule })
    } else {
      const allowed = new Set(earlier)
      const c = compileRestrictedExpression(rule.expression, { variables: earlier, expectedUnit: g.unit })
      if (!c.ok) {
        const msg =
          c.error.code === 'wrong-dimension'
            ? `the unit "${g.unit}" cannot be read`
            : describeCompileError(rule.expression, allowed, c.error)
        return givenError(g, msg)
      }
      givens.push({ given: g, kind: 'expression', compiled: c.expression })
    }
    if (isNumericGiven(g)) earlier.push(g.name)
  }
  const constraints: PreparedConstraint[] = []
  const allowed = new Set(earlier)
  for (const [index, constraint] of def.constraints.entries()) {
    const sides: CompiledRestrictedExpression[] = []
    for (const side of ['left', 'right'] as const) {
      const text = constraint[side]
      const c = compileRestrictedExpression(text, { variables: earlier })
      if (!c.ok) {
        return {
          ok: false,
          error: {
            code: 'invalid-definition',
            message: `Constraint ${index + 1} (${side} side "${text}"): ${describeCompileError(text, allowed, c.error)}.`,
            property: `constraints.${index}.${side}`,
          },
        }
      }
      sides.push(c.expression)
    }
    constraints.push({ index, constraint, left: sides[0]!, right: sides[1]! })
  }
  // Quantities for the reader cost a mathjs call each: build them only when something reads them.
  return {
    ok: true,
    givens,
    constraints,
    needsScope: constraints.length > 0 || givens.some((g) => g.kind === 'expression'),
  }
}

// ---- Drawing ---------------------------------------------------------------------------

function drawOnce(
  givens: readonly PreparedGiven[],
  needsScope: boolean,
  rand: () => number,
): { ok: true; givens: DrawnGiven[]; scope: Record<string, ScopeValue> } | { ok: false; error: VariantError } {
  const drawn: DrawnGiven[] = []
  const scope: Record<string, ScopeValue> = {}
  for (const p of givens) {
    const g = p.given
    let value: number
    let text: string
    if (p.kind === 'range') {
      const rule = p.rule
      const k = Math.min(p.steps, Math.floor(rand() * (p.steps + 1)))
      value = roundTo(rule.min + k * rule.step, p.decimals)
      text = givenText(value, g.unit)
    } else if (p.kind === 'choice') {
      const values = p.rule.values
      const pick = values[Math.min(values.length - 1, Math.floor(rand() * values.length))]!
      if (typeof pick === 'string') {
        value = Number.NaN
        text = pick
      } else {
        value = cleanNumber(pick)
        text = givenText(value, g.unit)
      }
    } else {
      const r = p.compiled.evaluate(scope)
      if (!r.ok) {
        const detail =
          r.error.code === 'wrong-dimension'
            ? `the expression does not give a quantity in ${g.unit === '' ? 'a pure number' : `"${g.unit}"`}`
            : describeCompileError(p.compiled.text, new Set(p.compiled.variables), r.error)
        return givenError(g, detail)
      }
      value = applyDisplay(r.value, g.display)
      text = givenText(value, g.unit)
    }
    drawn.push({ name: g.name, label: g.label, value, unit: g.unit, text })
    if (needsScope && Number.isFinite(value)) {
      const sv = toScopeValue(value, g.unit)
      if (sv === null) return givenError(g, `the unit "${g.unit}" cannot be read`)
      scope[g.name] = sv
    }
  }
  return { ok: true, givens: drawn, scope }
}

type Side = { kind: 'number'; value: number } | { kind: 'quantity'; si: number; unit: Unit }

function compare(a: number, op: Constraint['op'], b: number): boolean {
  switch (op) {
    case '<':
      return a < b
    case '<=':
      return a <= b
    case '>':
      return a > b
    case '>=':
      return a >= b
    case '!=':
      return a !== b
  }
}

/** One side of a constraint evaluated, or an error for the author. */
function evaluateSide(
  c: PreparedConstraint,
  side: 'left' | 'right',
  scope: Record<string, ScopeValue>,
): Side | VariantError {
  const compiled = side === 'left' ? c.left : c.right
  const r = compiled.evaluate(scope)
  if (!r.ok) {
    return {
      code: 'invalid-definition',
      message: `Constraint ${c.index + 1} (${side} side "${compiled.text}"): ${describeCompileError(compiled.text, new Set(compiled.variables), r.error)}.`,
      property: `constraints.${c.index}.${side}`,
    }
  }
  return r.kind === 'number'
    ? { kind: 'number', value: r.value }
    : { kind: 'quantity', si: r.siValue, unit: r.quantity }
}

/** Whether a constraint holds for these givens, or an error for the author. */
function checkConstraint(c: PreparedConstraint, scope: Record<string, ScopeValue>): boolean | VariantError {
  const l = evaluateSide(c, 'left', scope)
  if ('code' in l) return l
  const r = evaluateSide(c, 'right', scope)
  if ('code' in r) return r
  let a: number
  let b: number
  if (l.kind === 'quantity' && r.kind === 'quantity') {
    if (!l.unit.equalBase(r.unit)) return mismatch(c)
    a = l.si
    b = r.si
  } else if (l.kind === 'number' && r.kind === 'number') {
    a = l.value
    b = r.value
  } else {
    // "p1 > 0" is fine without a unit: zero is zero in every unit.
    const num = l.kind === 'number' ? l.value : r.kind === 'number' ? r.value : Number.NaN
    if (num !== 0) return mismatch(c)
    a = l.kind === 'number' ? l.value : l.si
    b = r.kind === 'number' ? r.value : r.si
  }
  return compare(a, c.constraint.op, b)
}

function mismatch(c: PreparedConstraint): VariantError {
  return {
    code: 'invalid-definition',
    message: `Constraint ${c.index + 1}: "${c.constraint.left}" and "${c.constraint.right}" are quantities of different kinds.`,
    property: `constraints.${c.index}`,
  }
}

/** The seed of the n-th draw: the variant's own seed first, then seeds derived from it. */
export function attemptSeed(seed: number, attempt: number): number {
  return attempt === 0 ? seed >>> 0 : seedFrom('redraw', seed >>> 0, attempt)
}

/** Draws the givens of one variant. Never throws. */
export function drawGivens(def: ProblemDefinition, seed: number): DrawGivensResult {
  try {
    const p = prepare(def)
    if (!p.ok) return p
    const unmet = new Array<number>(p.constraints.length).fill(0)
    for (let attempt = 0; attempt < MAX_DRAW_ATTEMPTS; attempt++) {
      const d = drawOnce(p.givens, p.needsScope, mulberry32(attemptSeed(seed, attempt)))
      if (!d.ok) return d
      let allMet = true
      for (const c of p.constraints) {
        const ok = checkConstraint(c, d.scope)
        if (typeof ok !== 'boolean') return { ok: false, error: ok }
        if (!ok) {
          unmet[c.index]! += 1
          allMet = false
        }
      }
      if (allMet) return { ok: true, givens: d.givens }
    }
    const worst = unmet.indexOf(Math.max(...unmet))
    const c = def.constraints[worst]!
    const what = `${c.left} ${c.op} ${c.right}`
    const message = c.message
      ? `${c.message} (${what} was not met in ${MAX_DRAW_ATTEMPTS} draws; widen the ranges)`
      : `${what} was not met in ${MAX_DRAW_ATTEMPTS} draws; widen the ranges`
    return { ok: false, error: { code: 'constraint-never-met', message, property: `constraints.${worst}` } }
  } catch (e) {
    return {
      ok: false,
      error: {
        code: 'invalid-definition',
        message: `The givens could not be drawn (${e instanceof Error ? e.message : String(e)}).`,
      },
    }
  }
}
