// The restricted expression reader: mathjs parses, we walk the tree ourselves.
//
// Two layers (besides the locked mathjs instance in math-instance.ts):
//  1. validateTree() refuses every node type except numbers, names, + − × ÷ ^, unary ±,
//     parentheses and calls of the small function allow-list. Assignments, function
//     definitions, blocks (a;b or line breaks), property/index access, matrices, objects,
//     ranges, conditionals, comparisons, strings, booleans, percent/mod, factorial,
//     transpose, unit conversion ("to"/"in") are all refused. Names must be a declared
//     variable, an allowed constant (pi, e) or a mathjs unit.
//  2. evaluateTree() computes the value with the arithmetic captured from mathjs. It never
//     calls mathjs evaluate/compile, so even a node type that slipped past (1) could not run.
//
// Used for students' answers (read-answer.ts) and, in a later issue, for instructors'
// expressions over named givens (compileRestrictedExpression / evaluateRestrictedExpression).
// No function here throws to its caller: failures come back as { ok: false, error }.

import type { MathNode, Unit } from 'mathjs'
import { isRecord } from '#app/domain/thermo/json.ts'
import { isValueless, mathCore, prefixName } from './math-instance.ts'
import { normalizeTypography } from './typography.ts'

/** Default and hard upper limits for the length of a text, in characters (UTF-16 units). */
export const MAX_EXPRESSION_LENGTH = 200
export const MAX_EXPRESSION_LENGTH_CAP = 2000

/** Functions an expression may call, each with exactly one argument. log and ln are natural. */
export const ALLOWED_FUNCTIONS = ['sqrt', 'exp', 'ln', 'log', 'log10', 'sin', 'cos', 'tan', 'abs'] as const
export type AllowedFunction = (typeof ALLOWED_FUNCTIONS)[number]

/** Named constants an expression may use (unless `allowConstants: false`). */
export const ALLOWED_CONSTANTS: Readonly<Record<string, number>> = Object.freeze({ pi: Math.PI, e: Math.E })

/** The largest power a unit may be raised to (m^3 is fine, m^1000 is junk). */
const MAX_UNIT_POWER = 12
/** Magnitudes beyond this are refused as out of range (JS doubles end near 1.8e308). */
const MAX_MAGNITUDE = 1e300

export type RestrictedErrorCode =
  | 'not-text'
  | 'empty'
  | 'too-long'
  | 'syntax'
  | 'assignment'
  | 'multiple-expressions'
  | 'function-not-allowed'
  | 'wrong-argument-count'
  | 'unknown-symbol'
  | 'unsupported-syntax'
  | 'not-a-number'
  | 'out-of-range'
  | 'not-real'
  | 'incompatible-units'
  | 'bad-exponent'
  | 'no-number'
  | 'wrong-dimension'
  | 'invalid-variable'
  | 'internal'

/** Thrown only inside this module (and read-answer.ts); converted to a result at the boundary. */
export class RestrictedError extends Error {
  readonly code: RestrictedErrorCode
  /** A name the user typed, when it is safe to quote back (letters/digits, short, not a mathjs function). */
  readonly symbol: string | undefined
  constructor(code: RestrictedErrorCode, symbol?: string) {
    super(code)
    this.name = 'RestrictedError'
    this.code = code
    this.symbol = symbol
  }
}

export type Value = number | Unit

/** A variable's value: a plain number, a mathjs Unit, or a value with a unit string. */
export type ScopeValue = number | Unit | { readonly value: number; readonly unit: string }

const IDENTIFIER = /^[A-Za-z][A-Za-z0-9_]*$/
const OFFSET_FREE: Readonly<Record<string, string>> = {
  degC: 'K',
  celsius: 'kelvin',
  degF: 'degR',
  fahrenheit: 'rankine',
}

/** Names that must never be looked up anywhere (prototype keys and the like). */
function isDangerousName(name: string): boolean {
  return !IDENTIFIER.test(name) || name in Object.prototype || name === 'prototype' || name === 'constructor'
}

/** True when `name` is a mathjs unit name (with prefix) we accept: not an offset unit with a prefix. */
export function isKnownUnitName(name: string): boolean {
  if (isDangerousName(name)) return false
  try {
    if (!mathCore.isValuelessUnit(name)) return false
    const u = mathCore.valuelessUnit(name)
    const c = u.units[0]
    return !(c && c.unit.offset !== 0 && prefixName(c) !== '')
  } catch {
    return false
  }
}

/**
 * A valueless unit for `name`. With `temperatureDifference`, °C and °F (degC, celsius,
 * degF, fahrenheit) become their offset-free twins K and degR, so "10 degC" is 10 K.
 */
export function valuelessUnit(name: string, temperatureDifference: boolean): Unit {
  if (!isKnownUnitName(name)) throw new RestrictedError('unknown-symbol', name)
  const mapped = temperatureDifference ? (OFFSET_FREE[name] ?? name) : name
  return viaMath(() => mathCore.valuelessUnit(mapped))
}

export function isUnit(v: unknown): v is Unit {
  return typeof v === 'object' && v !== null && 'type' in v && v.type === 'Unit'
}

/** True for a Unit carrying no dimensions at all (e.g. kJ/J). */
function isDimensionlessUnit(u: Unit): boolean {
  return u.dimensions.every((d) => d === 0)
}

// ---------------------------------------------------------------------------------------
// Tree validation

export interface TreeRules {
  /** Declared variable names (instructor expressions); empty for students' answers. */
  readonly variables: ReadonlySet<string>
  readonly allowConstants: boolean
  /** Only unit names, *, /, ^ with number exponents, and "1/unit" (used for unit strings). */
  readonly unitsOnly: boolean
}

export interface TreeFacts {
  /** Whether any name in the tree is a unit (false for "12.5" or "2*pi"). */
  readonly usesUnits: boolean
}

const ALLOWED_OPERATOR_FNS = new Set(['add', 'subtract', 'multiply', 'divide', 'pow', 'unaryMinus', 'unaryPlus'])
const ALLOWED_FUNCTION_SET: ReadonlySet<string> = new Set(ALLOWED_FUNCTIONS)
const MAX_TREE_DEPTH = 200

/** Walks the parse tree and throws RestrictedError at the first node that is not allowed. */
export function validateTree(root: MathNode, rules: TreeRules): TreeFacts {
  let usesUnits = false
  const visit = (node: MathNode, depth: number, inExponent: boolean): void => {
    if (depth > MAX_TREE_DEPTH) throw new RestrictedError('unsupported-syntax')
    if (mathCore.isConstantNode(node)) {
      const value: unknown = node.value // typed a number, but true, null and the like parse too
      if (typeof value !== 'number') throw new RestrictedError('not-a-number')
      if (!Number.isFinite(value) || Math.abs(value) > MAX_MAGNITUDE) {
        throw new RestrictedError('out-of-range')
      }
      if (rules.unitsOnly && !inExponent) throw new RestrictedError('unsupported-syntax')
      return
    }
    if (mathCore.isSymbolNode(node)) {
      const name = String(node.name)
      if (isDangerousName(name)) throw new RestrictedError('unknown-symbol')
      if (!rules.unitsOnly && rules.variables.has(name)) return
      if (!rules.unitsOnly && rules.allowConstants && Object.hasOwn(ALLOWED_CONSTANTS, name)) return
      if (isKnownUnitName(name)) {
        if (inExponent) throw new RestrictedError('bad-exponent')
        usesUnits = true
        return
      }
      if (ALLOWED_FUNCTION_SET.has(name)) throw new RestrictedError('function-not-allowed')
      throw new RestrictedError('unknown-symbol', name)
    }
    if (mathCore.isParenthesisNode(node)) {
      const content: MathNode | undefined = node.content
      if (!content) throw new RestrictedError('syntax')
      visit(content, depth + 1, inExponent)
      return
    }
    if (mathCore.isOperatorNode(node)) {
      const fn = String(node.fn)
      const args: readonly MathNode[] = node.args ?? []
      if (!ALLOWED_OPERATOR_FNS.has(fn) || ('isPercentage' in node && node.isPercentage === true)) {
        throw new RestrictedError('unsupported-syntax')
      }
      if (rules.unitsOnly) {
        if (fn === 'add' || fn === 'subtract' || fn === 'unaryPlus') throw new RestrictedError('unsupported-syntax')
        if (fn === 'unaryMinus' && !inExponent) throw new RestrictedError('unsupported-syntax')
        if (fn === 'divide' && isConstantOne(args[0])) {
          visit(argAt(args, 1), depth + 1, inExponent)
          return
        }
      }
      if (fn === 'pow') {
        if (args.length !== 2) throw new RestrictedError('syntax')
        visit(argAt(args, 0), depth + 1, inExponent)
        visit(argAt(args, 1), depth + 1, true)
        return
      }
      for (const a of args) visit(a, depth + 1, inExponent)
      return
    }
    if (mathCore.isFunctionNode(node)) {
      // typed as a SymbolNode, but "(f)(2)" or "a.b(1)" parse with another node there
      const fnNode: unknown = node.fn
      if (!mathCore.isSymbolNode(fnNode) || rules.unitsOnly) {
        throw new RestrictedError('function-not-allowed')
      }
      const name = String(fnNode.name)
      if (!ALLOWED_FUNCTION_SET.has(name) || rules.variables.has(name)) {
        throw new RestrictedError('function-not-allowed')
      }
      const args: readonly MathNode[] = node.args ?? []
      if (args.length !== 1) throw new RestrictedError('wrong-argument-count')
      visit(argAt(args, 0), depth + 1, inExponent)
      return
    }
    switch (node.type) {
      case 'AssignmentNode':
      case 'FunctionAssignmentNode':
        throw new RestrictedError('assignment')
      case 'BlockNode':
        throw new RestrictedError('multiple-expressions')
      case 'ArrayNode':
      case 'ObjectNode':
        throw new RestrictedError('not-a-number')
      default:
        // AccessorNode, IndexNode, RangeNode, ConditionalNode, RelationalNode and anything new
        throw new RestrictedError('unsupported-syntax')
    }
  }
  visit(root, 0, false)
  return { usesUnits }
}

function isConstantOne(node: MathNode | undefined): boolean {
  return mathCore.isConstantNode(node) && node.value === 1
}

/** The i-th argument of an operator or function (the validator checked the count). */
function argAt(args: readonly MathNode[], i: number): MathNode {
  const a = args[i]
  if (a === undefined) throw new RestrictedError('syntax')
  return a
}

// ---------------------------------------------------------------------------------------
// Evaluation of a validated tree

export interface EvalContext {
  readonly scope: ReadonlyMap<string, Value>
  readonly allowConstants: boolean
  readonly temperatureDifference: boolean
}

function checkNumber(x: number): number {
  if (Number.isNaN(x)) throw new RestrictedError('not-real')
  if (!Number.isFinite(x) || Math.abs(x) > MAX_MAGNITUDE) throw new RestrictedError('out-of-range')
  return x
}

function checkValue(v: unknown): Value {
  if (typeof v === 'number') return checkNumber(v)
  if (isUnit(v)) {
    const value: unknown = v.value
    if (value === null) {
      // valueless, e.g. kJ/(kg K); a dimensionless valueless unit (kJ/J) is the number 1 … but
      // only once a number multiplies it, which mathjs does itself.
      return v
    }
    if (typeof value !== 'number') throw new RestrictedError('not-real')
    checkNumber(value)
    return v
  }
  throw new RestrictedError('not-a-number')
}

/** Evaluates a tree that validateTree() accepted. Throws RestrictedError. */
export function evaluateTree(root: MathNode, ctx: EvalContext): Value {
  const ev = (node: MathNode): Value => {
    if (mathCore.isConstantNode(node)) return checkNumber(node.value)
    if (mathCore.isSymbolNode(node)) {
      const name = String(node.name)
      const fromScope = ctx.scope.get(name)
      if (fromScope !== undefined) return fromScope
      const constant = ALLOWED_CONSTANTS[name]
      if (ctx.allowConstants && Object.hasOwn(ALLOWED_CONSTANTS, name) && constant !== undefined) return constant
      return valuelessUnit(name, ctx.temperatureDifference)
    }
    if (mathCore.isParenthesisNode(node)) return ev(node.content)
    if (mathCore.isOperatorNode(node)) {
      const args: readonly MathNode[] = node.args ?? []
      return evalOperator(String(node.fn), args.map(ev), args)
    }
    if (mathCore.isFunctionNode(node)) return evalFunction(String(node.fn.name), ev(argAt(node.args ?? [], 0)))
    throw new RestrictedError('unsupported-syntax')
  }
  return checkValue(ev(root))
}

/** Runs a mathjs operation; its errors (incompatible units, wrong angle type) get our code. */
function viaMath<T>(op: () => T): T {
  try {
    return op()
  } catch (e) {
    if (e instanceof RestrictedError) throw e
    throw new RestrictedError('incompatible-units')
  }
}

function requireValued(u: Unit): Unit {
  if (isValueless(u)) throw new RestrictedError('no-number')
  return u
}

function evalOperator(fn: string, args: Value[], nodes: readonly MathNode[]): Value {
  const [a, b] = args
  if (a === undefined) throw new RestrictedError('syntax')
  switch (fn) {
    case 'unaryPlus':
      return a
    case 'unaryMinus':
      return typeof a === 'number' ? checkNumber(-a) : checkValue(viaMath(() => mathCore.unaryMinus(requireValued(a))))
    case 'add':
    case 'subtract': {
      if (b === undefined) throw new RestrictedError('syntax')
      if (typeof a === 'number' && typeof b === 'number') return checkNumber(fn === 'add' ? a + b : a - b)
      if (typeof a === 'number' || typeof b === 'number') throw new RestrictedError('incompatible-units')
      if (!a.equalBase(b)) throw new RestrictedError('incompatible-units')
      requireValued(a)
      requireValued(b)
      return checkValue(viaMath(() => (fn === 'add' ? mathCore.add(a, b) : mathCore.subtract(a, b))))
    }
    case 'multiply': {
      if (b === undefined) throw new RestrictedError('syntax')
      if (typeof a === 'number' && typeof b === 'number') return checkNumber(a * b)
      return checkValue(viaMath(() => mathCore.multiply(a, b)))
    }
    case 'divide': {
      if (b === undefined) throw new RestrictedError('syntax')
      if (typeof a === 'number' && typeof b === 'number') {
        if (b === 0) throw new RestrictedError('out-of-range')
        return checkNumber(a / b)
      }
      if (typeof b === 'number' && b === 0) throw new RestrictedError('out-of-range')
      if (isUnit(b) && b.value === 0) throw new RestrictedError('out-of-range')
      // "1/s" in a unit string: keep it valueless (s^-1), as mathjs would give the number 1 a value
      if (a === 1 && isUnit(b) && isValueless(b) && isConstantOne(nodes[0])) {
        return checkValue(viaMath(() => mathCore.pow(b, -1)))
      }
      return checkValue(viaMath(() => mathCore.divide(a, b)))
    }
    case 'pow': {
      if (b === undefined) throw new RestrictedError('syntax')
      if (typeof b !== 'number') throw new RestrictedError('bad-exponent')
      if (typeof a === 'number') return checkNumber(Math.pow(a, b))
      if (!Number.isFinite(b) || Math.abs(b) > MAX_UNIT_POWER) throw new RestrictedError('bad-exponent')
      return checkValue(viaMath(() => mathCore.pow(a, b)))
    }
    default:
      throw new RestrictedError('unsupported-syntax')
  }
}

function evalFunction(name: string, x: Value): Value {
  switch (name) {
    case 'sqrt':
      if (typeof x === 'number') {
        if (x < 0) throw new RestrictedError('not-real')
        return Math.sqrt(x)
      }
      if (!isValueless(x) && x.value < 0) throw new RestrictedError('not-real')
      return checkValue(viaMath(() => mathCore.sqrt(x)))
    case 'abs':
      return typeof x === 'number' ? Math.abs(x) : checkValue(viaMath(() => mathCore.abs(requireValued(x))))
    case 'exp':
      return checkNumber(Math.exp(asPureNumber(x)))
    case 'ln':
    case 'log': {
      const v = asPureNumber(x)
      if (v <= 0) throw new RestrictedError('not-real')
      return checkNumber(Math.log(v))
    }
    case 'log10': {
      const v = asPureNumber(x)
      if (v <= 0) throw new RestrictedError('not-real')
      return checkNumber(Math.log10(v))
    }
    case 'sin':
    case 'cos':
    case 'tan': {
      if (typeof x === 'number')
        return checkNumber(name === 'sin' ? Math.sin(x) : name === 'cos' ? Math.cos(x) : Math.tan(x))
      const fn = name === 'sin' ? mathCore.sin : name === 'cos' ? mathCore.cos : mathCore.tan
      return checkNumber(viaMath(() => fn(requireValued(x)))) // mathjs accepts angle units only; anything else throws
    }
    default:
      throw new RestrictedError('function-not-allowed')
  }
}

/** exp/log need a pure number; a unit that cancels (kJ/J) is allowed. */
function asPureNumber(x: Value): number {
  if (typeof x === 'number') return x
  if (isDimensionlessUnit(x) && !isValueless(x)) return checkNumber(x.value)
  throw new RestrictedError('incompatible-units')
}

// ---------------------------------------------------------------------------------------
// Parsing text

export interface ParseTextOptions {
  readonly variables: ReadonlySet<string>
  readonly allowConstants: boolean
  readonly unitsOnly: boolean
  readonly maxLength: number
  /** The text is already normalised (normalizeTypography ran); do not run it again. */
  readonly alreadyNormalized?: boolean
}

export interface ParsedText {
  readonly normalized: string
  readonly tree: MathNode
  readonly facts: TreeFacts
}

/** A name the slash rule may group: a unit that no variable or constant shadows. */
export function isUnitNameFor(name: string, variables: ReadonlySet<string>, allowConstants: boolean): boolean {
  return !variables.has(name) && !(allowConstants && Object.hasOwn(ALLOWED_CONSTANTS, name)) && isKnownUnitName(name)
}

/** Checks length, normalises typography, parses with the captured mathjs parse, validates. */
export function parseRestrictedText(text: string, options: ParseTextOptions): ParsedText {
  if (text.length > options.maxLength) throw new RestrictedError('too-long')
  if (text.trim() === '') throw new RestrictedError('empty')
  const isUnitName = (name: string): boolean => isUnitNameFor(name, options.variables, options.allowConstants)
  const normalized = options.alreadyNormalized
    ? text.trim()
    : normalizeTypography(text, {
        isUnitName,
        letterXIsTimes: !options.variables.has('x') && !options.variables.has('X'),
      })
  if (normalized === '') throw new RestrictedError('empty')
  // mathjs comments (# …) and string literals have no place in a value
  if (/[#"'`]/.test(normalized)) throw new RestrictedError('syntax')
  let tree: MathNode
  try {
    tree = mathCore.parse(normalized)
  } catch {
    throw new RestrictedError('syntax')
  }
  const facts = validateTree(tree, options)
  return { normalized, tree, facts }
}

/** Turns any thrown value into a RestrictedError; anything unexpected becomes 'internal'. */
export function toRestrictedError(e: unknown): RestrictedError {
  if (e instanceof RestrictedError) return e
  if (e instanceof RangeError) return new RestrictedError('unsupported-syntax') // e.g. stack depth
  return new RestrictedError('internal')
}

// ---------------------------------------------------------------------------------------
// Public: instructors' expressions over named variables

export interface RestrictedExpressionOptions {
  /** Longest accepted text, default MAX_EXPRESSION_LENGTH (200), at most 2000. */
  readonly maxLength?: number
  /** Whether pi and e may be used (default true). */
  readonly allowConstants?: boolean
  /** Read °C/°F as temperature differences (10 °C = 10 K). Default false (absolute). */
  readonly temperatureDifference?: boolean
  /** Convert the result into this unit; a result of another dimension is an error. Use
   *  '' or '1' for a pure number. */
  readonly expectedUnit?: string
}

export type RestrictedValue =
  | { readonly ok: true; readonly kind: 'number'; readonly value: number }
  | {
      readonly ok: true
      readonly kind: 'quantity'
      /** In `unit`: the expectedUnit when one was given, otherwise mathjs's own unit. */
      readonly value: number
      readonly unit: string
      /** The value in SI base units (K for temperatures, absolute). */
      readonly siValue: number
      readonly quantity: Unit
    }

export type RestrictedExpressionResult =
  | RestrictedValue
  | { readonly ok: false; readonly error: { readonly code: RestrictedErrorCode; readonly message: string } }

export interface CompiledRestrictedExpression {
  readonly text: string
  readonly variables: readonly string[]
  /** Evaluates with the given values; never throws. Missing variables are an error result. */
  evaluate(scope: Readonly<Record<string, ScopeValue>>): RestrictedExpressionResult
}

export type CompileRestrictedResult =
  | { readonly ok: true; readonly expression: CompiledRestrictedExpression }
  | { readonly ok: false; readonly error: { readonly code: RestrictedErrorCode; readonly message: string } }

const EXPRESSION_MESSAGES: Readonly<Record<RestrictedErrorCode, string>> = {
  'not-text': 'The expression must be text.',
  empty: 'The expression is empty.',
  'too-long': 'The expression is too long.',
  syntax: 'The expression could not be read; check brackets and operators.',
  assignment: 'Assignments and function definitions are not allowed in an expression.',
  'multiple-expressions': 'Write a single expression (no ";" or line breaks).',
  'function-not-allowed': `Only these functions can be used: ${ALLOWED_FUNCTIONS.join(', ')}.`,
  'wrong-argument-count': 'Each function takes exactly one argument.',
  'unknown-symbol': 'The expression uses a name that is neither a declared variable nor a unit.',
  'unsupported-syntax': 'The expression uses syntax that is not allowed (only numbers, names, + - * / ^ and brackets).',
  'not-a-number': 'The expression must give a single number or quantity.',
  'out-of-range': 'The expression gives a number that is too large, too small, or a division by zero.',
  'not-real': 'The expression has no real value (e.g. the square root or logarithm of a negative number).',
  'incompatible-units': 'The expression combines quantities whose units do not fit together.',
  'bad-exponent': 'An exponent must be a plain number (and at most 12 for a unit).',
  'no-number': 'The expression has a unit but no number.',
  'wrong-dimension': 'The expression does not give a quantity of the expected dimension.',
  'invalid-variable': 'A variable name or value is not valid.',
  internal: 'The expression could not be evaluated.',
}

function fail(code: RestrictedErrorCode): { ok: false; error: { code: RestrictedErrorCode; message: string } } {
  return { ok: false, error: { code, message: EXPRESSION_MESSAGES[code] } }
}

function clampMaxLength(n: number | undefined): number {
  if (n === undefined || !Number.isFinite(n) || n <= 0) return MAX_EXPRESSION_LENGTH
  return Math.min(Math.floor(n), MAX_EXPRESSION_LENGTH_CAP)
}

function toScopeValue(v: unknown, temperatureDifference: boolean): Value {
  if (typeof v === 'number') return checkNumber(v)
  if (isUnit(v)) return checkValue(v)
  if (isRecord(v)) {
    const { value, unit } = v
    if (typeof value === 'number' && typeof unit === 'string') {
      const u = parseUnitString(unit, temperatureDifference)
      if (u === null) throw new RestrictedError('invalid-variable')
      return u === 1 ? checkNumber(value) : checkValue(viaMath(() => mathCore.multiply(checkNumber(value), u)))
    }
  }
  throw new RestrictedError('invalid-variable')
}

/**
 * Parses a unit string ("kJ/(kg·K)", "°C", "m³") into a valueless Unit, or 1 for a pure
 * number ('' or '1'), or null when it is not a unit. Never throws.
 */
export function parseUnitString(text: string, temperatureDifference: boolean): Unit | 1 | null {
  try {
    const t = text.trim()
    if (t === '' || t === '1') return 1
    const parsed = parseRestrictedText(t, {
      variables: new Set(),
      allowConstants: false,
      unitsOnly: true,
      maxLength: MAX_EXPRESSION_LENGTH,
    })
    const v = evaluateTree(parsed.tree, { scope: new Map(), allowConstants: false, temperatureDifference })
    if (!isUnit(v) || !isValueless(v)) return null
    return v
  } catch {
    return null
  }
}

/**
 * Parses and validates an expression once; `evaluate(scope)` can then be called per variant.
 * `variables` lists the names the expression may use (they shadow unit names: a variable m
 * hides the unit metre). Never throws.
 */
export function compileRestrictedExpression(
  text: string,
  options: RestrictedExpressionOptions & { readonly variables: readonly string[] },
): CompileRestrictedResult {
  try {
    if (typeof text !== 'string') return fail('not-text')
    const names = Array.isArray(options.variables) ? options.variables : []
    for (const n of names) {
      if (typeof n !== 'string' || isDangerousName(n) || ALLOWED_FUNCTION_SET.has(n)) return fail('invalid-variable')
    }
    const variables = new Set<string>(names)
    const allowConstants = options.allowConstants !== false
    const temperatureDifference = options.temperatureDifference === true
    const parsed = parseRestrictedText(text, {
      variables,
      allowConstants,
      unitsOnly: false,
      maxLength: clampMaxLength(options.maxLength),
    })
    let expected: Unit | 1 | undefined
    if (options.expectedUnit !== undefined) {
      const u = parseUnitString(options.expectedUnit, temperatureDifference)
      if (u === null) return fail('wrong-dimension')
      expected = u
    }
    const frozenNames = Object.freeze([...variables])
    const expression: CompiledRestrictedExpression = {
      text,
      variables: frozenNames,
      evaluate(scope) {
        try {
          const map = new Map<string, Value>()
          for (const name of frozenNames) {
            if (scope === null || typeof scope !== 'object' || !Object.hasOwn(scope, name)) {
              return fail('invalid-variable')
            }
            map.set(name, toScopeValue(scope[name], temperatureDifference))
          }
          const v = evaluateTree(parsed.tree, { scope: map, allowConstants, temperatureDifference })
          return describeValue(v, expected)
        } catch (e) {
          return fail(toRestrictedError(e).code)
        }
      },
    }
    return { ok: true, expression }
  } catch (e) {
    return fail(toRestrictedError(e).code)
  }
}

function describeValue(v: Value, expected: Unit | 1 | undefined): RestrictedExpressionResult {
  if (typeof v === 'number') {
    if (expected === undefined || expected === 1) return { ok: true, kind: 'number', value: v }
    return fail('wrong-dimension')
  }
  if (isValueless(v)) return fail('no-number')
  if (isDimensionlessUnit(v)) {
    const n = checkNumber(v.value)
    if (expected === undefined || expected === 1) return { ok: true, kind: 'number', value: n }
    return fail('wrong-dimension')
  }
  // mathjs keeps a single offset unit's value in that unit (27 for 27 degC); toSI() is absolute
  const siValue = checkNumber(viaMath(() => v.toSI().value))
  if (expected === undefined) {
    return { ok: true, kind: 'quantity', value: checkNumber(v.toNumber()), unit: v.formatUnits(), siValue, quantity: v }
  }
  if (expected === 1 || !v.equalBase(expected)) return fail('wrong-dimension')
  const value = checkNumber(mathCore.numberIn(v, expected))
  return { ok: true, kind: 'quantity', value, unit: expected.formatUnits(), siValue, quantity: v }
}

/**
 * Evaluates an expression over named values in one go (compile + evaluate). The names of
 * `scope` are the allowed variables. Never throws; see RestrictedExpressionResult.
 */
export function evaluateRestrictedExpression(
  text: string,
  scope: Readonly<Record<string, ScopeValue>>,
  options: RestrictedExpressionOptions = {},
): RestrictedExpressionResult {
  try {
    const names = scope !== null && typeof scope === 'object' ? Object.keys(scope) : []
    const compiled = compileRestrictedExpression(text, { ...options, variables: names })
    if (!compiled.ok) return compiled
    return compiled.expression.evaluate(scope)
  } catch (e) {
    return fail(toRestrictedError(e).code)
  }
}
