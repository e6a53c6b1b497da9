/**
 * One student's variant: givens drawn from the seed, the spec built from them, the solver's
 * solution, and the key (each find in its own unit). Recomputed on demand from the problem
 * version and the seed (../shared/DESIGN.md, "Variant"), so it must be deterministic and must
 * never throw: a broken definition comes back as a DrawResult error for the author. Pure.
 */
import type { CompiledRestrictedExpression, ScopeValue } from '#app/domain/grading/index.ts'
import { compileRestrictedExpression } from '#app/domain/grading/index.ts'
import { mathCore } from '#app/domain/grading/math-instance.ts'
import { isObjectLike, propertyOf } from '#app/domain/grading/plain-data.ts'
import { resolveExpectedUnit } from '#app/domain/grading/units.ts'
import type { Convention } from '#app/domain/thermo/index.ts'
import { readQuantity, solveBankSpec } from '#app/domain/thermo/index.ts'
import type { BankSolution } from '#app/domain/thermo/solve-spec.ts'
import { isRecord } from '#app/domain/thermo/json.ts'
import type { DrawResult, DrawnGiven, Find, KeyEntry, Physics, ProblemDefinition, VariantError } from './definition.ts'
import { describeCompileError, drawGivens, givenScope, isNumericGiven, toScopeValue } from './givens.ts'
import { senseFactor } from './sense.ts'
import { buildSpec } from './substitute.ts'

/** The convention a variant is solved in: the problem's own, or the course's for 'course'. */
export function resolveConvention(def: ProblemDefinition, courseConvention: Convention): Convention {
  return def.convention === 'course' ? courseConvention : def.convention
}

/**
 * The SI unit stored at a dotted path of a solution ({ value, unit } quantities), '' for a
 * bare number such as a Rankine state's quality. Walks the path as readQuantity does.
 */
export function unitAtPath(sol: object, path: string): string | null {
  let cur: unknown = sol
  for (const key of path.split('.')) {
    if (!isObjectLike(cur)) return null
    if (Array.isArray(cur)) {
      const idx = Number(key)
      cur = Number.isInteger(idx) && idx >= 1 ? cur[idx - 1] : cur.find((x: unknown) => propertyOf(x, 'name') === key)
    } else {
      cur = cur[key]
    }
  }
  if (typeof cur === 'number') return ''
  const unit = propertyOf(cur, 'unit')
  return typeof unit === 'string' ? unit : null
}

// Linear factors between unit pairs, so a sweep does not call mathjs for every key entry.
const factorCache = new Map<string, number>()
const FACTOR_CACHE_LIMIT = 500

/**
 * A solver value in its SI unit, converted into a find's unit ('' or '1' = pure number,
 * '%' = hundredths). °C and °F need an offset, not a factor. A string on failure.
 */
export function convertFromSI(value: number, siUnit: string, unit: string, isDifference = false): number | string {
  const src = resolveExpectedUnit(siUnit, false)
  if (src === null) return `the solver's unit "${siUnit}" cannot be read`
  const tgt = resolveExpectedUnit(unit, isDifference)
  if (tgt === null) return `the unit "${unit}" cannot be read`
  if (src.kind === 'dimensionless' || tgt.kind === 'dimensionless') {
    if (src.kind !== 'dimensionless' || tgt.kind !== 'dimensionless') {
      return `the value is in ${src.kind === 'dimensionless' ? 'a pure number' : `"${siUnit}"`}, which cannot be stated in ${tgt.kind === 'dimensionless' ? 'a pure number' : `"${unit}"`}`
    }
    return (value * src.scale) / tgt.scale
  }
  if (!src.unit.equalBase(tgt.unit)) return `the value is in "${siUnit}", which cannot be stated in "${unit}"`
  if (src.absoluteTwin !== null || tgt.absoluteTwin !== null) {
    return mathCore.numberIn(mathCore.scale(value, src.unit), tgt.unit)
  }
  const key = `${siUnit}|${unit}|${isDifference ? 'd' : 'a'}`
  let factor = factorCache.get(key)
  if (factor === undefined) {
    factor = mathCore.numberIn(mathCore.scale(1, src.unit), tgt.unit)
    if (factorCache.size >= FACTOR_CACHE_LIMIT) factorCache.clear()
    factorCache.set(key, factor)
  }
  return value * factor
}

type CompiledFind =
  | { readonly ok: true; readonly expression: CompiledRestrictedExpression | null }
  | { readonly ok: false; readonly error: VariantError }

const compiledFindsCache = new WeakMap<ProblemDefinition, readonly CompiledFind[]>()

function findError(f: Find, code: VariantError['code'], message: string): { ok: false; error: VariantError } {
  return { ok: false, error: { code, message: `Find "${f.name}": ${message}.`, property: f.name } }
}

/** Expression finds compiled once per definition; their names are numeric givens + earlier finds. */
function compileFinds(def: ProblemDefinition): readonly CompiledFind[] {
  const hit = compiledFindsCache.get(def)
  if (hit) return hit
  const names = def.givens.filter(isNumericGiven).map((g) => g.name)
  const out: CompiledFind[] = []
  for (const f of def.finds) {
    if (f.source.kind === 'expression') {
      const variables = [...new Set(names)]
      const c = compileRestrictedExpression(f.source.expression, {
        variables,
        expectedUnit: f.unit,
        temperatureDifference: f.isDifference === true,
      })
      if (c.ok) out.push({ ok: true, expression: c.expression })
      else if (c.error.code === 'wrong-dimension')
        out.push(findError(f, 'invalid-definition', `the unit "${f.unit}" cannot be read`))
      else
        out.push(
          findError(f, 'invalid-definition', describeCompileError(f.source.expression, new Set(variables), c.error)),
        )
    } else {
      out.push({ ok: true, expression: null })
    }
    names.push(f.name)
  }
  compiledFindsCache.set(def, out)
  return out
}

/**
 * Where in the definition a solver refusal belongs, so the editor can show it beside the
 * field: 'physics.inputs.<input>' when the solver names a template input the author wrote
 * ('gas.basis' belongs to 'gas'), else 'physics'; a general cycle is 'physics.cycle'.
 */
export function solverErrorPath(physics: Physics, property: string | undefined): string {
  if (physics.kind === 'cycle') return 'physics.cycle'
  const inputs: unknown = physics.inputs
  if (property === undefined || !isRecord(inputs)) return 'physics'
  const input = property.split('.')[0]!
  if (input === '' || !Object.hasOwn(inputs, input)) return 'physics'
  // A row of a list input (a heater: 'heaters.1.pressure') is named down to the row's field,
  // so the editor marks that row rather than the whole list.
  const row = /^[^.]+\.(\d{1,2})(?:\.([A-Za-z]+))?$/.exec(property)
  const list = inputs[input]
  if (row && Array.isArray(list) && Number(row[1]) < list.length)
    return `physics.inputs.${input}.${row[1]}${row[2] ? `.${row[2]}` : ''}`
  return `physics.inputs.${input}`
}

/** Capitalised, unless it opens with a name the author typed ("compressionRatio", "gas.basis", "steps[1].q"). */
function solverMessage(e: { message: string }): string {
  return /^[a-z]+\s/.test(e.message) ? e.message.charAt(0).toUpperCase() + e.message.slice(1) : e.message
}

function computeKey(
  def: ProblemDefinition,
  givens: readonly DrawnGiven[],
  solution: BankSolution,
  convention: Convention,
): { ok: true; key: KeyEntry[] } | { ok: false; error: VariantError } {
  const compiled = compileFinds(def)
  // Quantities for the reader cost a mathjs call each: only expression finds need them.
  const needsScope = compiled.some((c) => c.ok && c.expression !== null)
  const scope: Record<string, ScopeValue> = needsScope ? givenScope(givens) : {}
  const key: KeyEntry[] = []
  const templateId = def.physics.kind === 'template' ? def.physics.template : null
  for (const [i, f] of def.finds.entries()) {
    const c = compiled[i]!
    if (!c.ok) return c
    let value: number
    let path: string | null = null
    let flipped = false
    if (f.source.kind === 'output') {
      path = f.source.path
      const raw = readQuantity(solution, path)
      const siUnit = unitAtPath(solution, path)
      if (raw === null || siUnit === null || !Number.isFinite(raw)) {
        return findError(
          f,
          'find-undefined',
          raw === null || siUnit === null
            ? `the solution has no number at "${path}"`
            : `the value at "${path}" is not a finite number`,
        )
      }
      const v = convertFromSI(raw, siUnit, f.unit, f.isDifference === true)
      if (typeof v === 'string') return findError(f, 'invalid-definition', `${v} (output "${path}")`)
      // A stated sense fixes the sign whatever the convention (sense.ts).
      flipped = senseFactor(f.sense, path, templateId, convention) === -1
      value = flipped ? -v : v
    } else {
      const r = c.expression!.evaluate(scope)
      if (!r.ok) {
        const msg =
          r.error.code === 'wrong-dimension'
            ? `the expression does not give a quantity in ${f.unit === '' ? 'a pure number' : `"${f.unit}"`}`
            : describeCompileError(f.source.expression, new Set(c.expression!.variables), r.error)
        return findError(f, 'invalid-definition', msg)
      }
      value = r.value
    }
    if (!Number.isFinite(value))
      return findError(f, 'find-undefined', `the key is not a finite number${path ? ` (output "${path}")` : ''}`)
    key.push({
      name: f.name,
      label: f.label,
      value,
      unit: f.unit,
      points: f.points,
      path,
      ...(flipped ? { flipped: true as const } : {}),
    })
    if (!needsScope) continue
    const sv = toScopeValue(value, f.unit, f.isDifference === true)
    if (sv === null) return findError(f, 'invalid-definition', `the unit "${f.unit}" cannot be read`)
    scope[f.name] = sv
  }
  return { ok: true, key }
}

/**
 * Draws the variant of `seed`. `options.convention` is the course's; a problem that fixes its
 * own convention keeps it (resolveConvention). Never throws.
 */
export function drawVariant(
  def: ProblemDefinition,
  seed: number,
  options: { readonly convention: Convention },
): DrawResult {
  try {
    const convention = resolveConvention(def, options.convention)
    const drawn = drawGivens(def, seed)
    if (!drawn.ok) return { ok: false, seed, error: drawn.error }
    const spec = buildSpec(def, drawn.givens, convention)
    const solved = solveBankSpec(spec)
    if (!solved.ok) {
      const e = solved.error
      return {
        ok: false,
        seed,
        error: { code: 'solve-error', message: solverMessage(e), property: solverErrorPath(def.physics, e.property) },
      }
    }
    const key = computeKey(def, drawn.givens, solved, convention)
    if (!key.ok) return { ok: false, seed, error: key.error }
    return { ok: true, variant: { seed, convention, givens: drawn.givens, spec, solution: solved, key: key.key } }
  } catch (e) {
    return {
      ok: false,
      seed,
      error: {
        code: 'invalid-definition',
        message: `The variant could not be drawn (${e instanceof Error ? e.message : String(e)}).`,
      },
    }
  }
}
