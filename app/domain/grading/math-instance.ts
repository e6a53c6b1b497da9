// The one private mathjs instance the grading code uses, locked down once at module load.
//
// Follows mathjs's own security guidance (docs page "Security", "Less vulnerable expression
// parser"): make a private instance, capture the functions we need, then override the
// functions that parse, rewrite or extend expressions (import, createUnit, evaluate, parse,
// simplify, derivative, …) with functions that throw. On top of that, nothing here ever
// calls mathjs's own evaluate/compile on text from outside: restricted-math.ts walks the
// parse tree itself and only calls the arithmetic captured below.
//
// Units added to the private instance before it is locked (documented in units.ts):
//   cal  = 4.184 J exactly, the thermochemical calorie (NIST SP 811, 2008 ed., B.8:
//          cal_th = 4.184 J). mathjs 15 defines no calorie at all. The International
//          Table calorie (4.1868 J, used by some engineering texts) differs by 0.07 %.
//          Prefixes allowed, so kcal = 4184 J. Aliases: calorie, calories.
//   Btu  = mathjs's BTU (International Table Btu, 1055.05585262 J), the textbook spelling.

import { all, create } from 'mathjs'
import type {
  ConstantNode,
  FactoryFunctionMap,
  FunctionNode,
  MathNode,
  MathType,
  OperatorNode,
  OperatorNodeFn,
  OperatorNodeOp,
  ParenthesisNode,
  SymbolNode,
  Unit,
  UnitComponent,
} from 'mathjs'
import { isRecord } from '#app/domain/thermo/json.ts'

/** mathjs's full factory set; its types allow `undefined` (a record lookup), so check it once. */
function allFactories(): FactoryFunctionMap {
  if (all === undefined) throw new Error('mathjs exports no "all" factories')
  return all
}

const math = create(allFactories())

math.createUnit('cal', { definition: '4.184 J', prefixes: 'short', aliases: ['calorie', 'calories'] })
math.createUnit('Btu', { definition: '1 BTU' })

/** What the grading code may use from mathjs, captured before the lock-down. */
export interface MathCore {
  readonly parse: (text: string) => MathNode
  /** Whether `name` (with any prefix) is a unit mathjs knows, e.g. "kJ" or "degC". */
  readonly isValuelessUnit: (name: string) => boolean
  /** The valueless unit `name` ("kJ" without a number), as `new Unit(null, name)`; throws for a non-unit. */
  readonly valuelessUnit: (name: string) => Unit
  readonly add: (a: Unit, b: Unit) => Unit
  readonly subtract: (a: Unit, b: Unit) => Unit
  readonly multiply: (a: number | Unit, b: number | Unit) => number | Unit
  /** A number times a unit (12 and kJ give 12 kJ): always a Unit. */
  readonly scale: (n: number, u: Unit) => Unit
  readonly divide: (a: number | Unit, b: number | Unit) => number | Unit
  readonly pow: (a: Unit, b: number) => Unit
  readonly unaryMinus: (a: Unit) => Unit
  readonly sqrt: (a: Unit) => Unit
  readonly abs: (a: Unit) => Unit
  readonly sin: (a: Unit) => number
  readonly cos: (a: Unit) => number
  readonly tan: (a: Unit) => number
  /** The number `q` is in the valueless unit `unit`: mathjs's `q.toNumber(unit)`, which takes a Unit at run time. */
  readonly numberIn: (q: Unit, unit: Unit) => number
  // mathjs's own node guards (they check the node's class, as its `type` does)
  readonly isConstantNode: (x: unknown) => x is ConstantNode
  readonly isSymbolNode: (x: unknown) => x is SymbolNode
  readonly isParenthesisNode: (x: unknown) => x is ParenthesisNode
  readonly isOperatorNode: (x: unknown) => x is OperatorNode<OperatorNodeOp, OperatorNodeFn>
  readonly isFunctionNode: (x: unknown) => x is FunctionNode
}

// The functions themselves, taken from the instance before the lock-down below replaces
// parse (and the others in DISABLED_MATHJS_FUNCTIONS) with throwing stubs.
const { add, subtract, multiply, divide, pow, unaryMinus, sqrt, abs, sin, cos, tan, unit, isUnit } = math
const { isConstantNode, isSymbolNode, isParenthesisNode, isOperatorNode, isFunctionNode } = math
const parse = math.parse.bind(math)
const isValuelessUnit = math.Unit.isValuelessUnit.bind(math.Unit)

/** mathjs's result types are wide (any MathType); the grading code only ever meets numbers and units. */
function numberOrUnit(x: MathType): number | Unit {
  if (typeof x === 'number' || isUnit(x)) return x
  throw new TypeError('mathjs gave neither a number nor a unit')
}

function onlyUnit(x: MathType): Unit {
  if (isUnit(x)) return x
  throw new TypeError('mathjs gave no unit')
}

const captured: MathCore = Object.freeze({
  parse: (text: string): MathNode => parse(text),
  isValuelessUnit: (name: string): boolean => isValuelessUnit(name),
  valuelessUnit: (name: string): Unit => {
    // math.unit(name) is `new Unit(null, name)` for a valueless unit name; refuse anything else
    if (!isValuelessUnit(name)) throw new TypeError(`"${name}" is not a unit`)
    return unit(name)
  },
  add: (a: Unit, b: Unit): Unit => add(a, b),
  subtract: (a: Unit, b: Unit): Unit => subtract(a, b),
  multiply: (a: number | Unit, b: number | Unit): number | Unit => numberOrUnit(multiply(a, b)),
  scale: (n: number, u: Unit): Unit => onlyUnit(multiply(n, u)),
  divide: (a: number | Unit, b: number | Unit): number | Unit => numberOrUnit(divide(a, b)),
  pow: (a: Unit, b: number): Unit => onlyUnit(pow(a, b)),
  unaryMinus: (a: Unit): Unit => unaryMinus(a),
  sqrt: (a: Unit): Unit => sqrt(a),
  abs: (a: Unit): Unit => abs(a),
  sin: (a: Unit): number => sin(a),
  cos: (a: Unit): number => cos(a),
  tan: (a: Unit): number => tan(a),
  numberIn: (q: Unit, target: Unit): number => q.to(target).toNumber(),
  isConstantNode,
  isSymbolNode,
  isParenthesisNode,
  isOperatorNode,
  isFunctionNode,
})

/**
 * Whether `u` is a unit without a number ("kJ", "kJ/(kg K)"). mathjs types `Unit.value` as a
 * number, but a valueless unit holds null there.
 */
export function isValueless(u: Unit): boolean {
  const value: unknown = u.value
  return value === null
}

/**
 * The name of a unit component's prefix ("k" in kJ, "" for none). mathjs types `prefix` as a
 * string, but at run time it is the prefix object { name, value, scientific }.
 */
export function prefixName(c: UnitComponent): string {
  const prefix: unknown = c.prefix
  if (typeof prefix === 'string') return prefix
  return isRecord(prefix) && typeof prefix.name === 'string' ? prefix.name : ''
}

/** The factor of a unit component's prefix (1000 for k, 1 for none); see prefixName for why. */
export function prefixValue(c: UnitComponent): number {
  const prefix: unknown = c.prefix
  return isRecord(prefix) ? Number(prefix.value) : NaN
}

/** The functions overridden with throwing stubs (those that exist in this mathjs version). */
export const DISABLED_MATHJS_FUNCTIONS: readonly string[] = [
  'import',
  'createUnit',
  'evaluate',
  'parse',
  'parser',
  'compile',
  'simplify',
  'simplifyConstant',
  'simplifyCore',
  'rationalize',
  'derivative',
  'resolve',
  'reviver',
  'replacer',
  'chain',
  'leafCount',
  'symbolicEqual',
  'help',
].filter((name) => name in math)

/** Thrown by a disabled mathjs function; never reaches a student (callers catch everything). */
class DisabledFunctionError extends Error {
  constructor(name: string) {
    super(`mathjs function ${name} is disabled in the grading instance`)
    this.name = 'DisabledFunctionError'
  }
}

{
  const stubs: Record<string, () => never> = {}
  for (const name of DISABLED_MATHJS_FUNCTIONS) {
    stubs[name] = () => {
      throw new DisabledFunctionError(name)
    }
  }
  math.import(stubs, { override: true })
}

export const mathCore: MathCore = captured

/**
 * A member of the locked instance itself (a disabled function, say), exported ONLY so tests
 * can prove the lock-down (restricted-math.test.ts). Production code uses `mathCore`.
 */
export function lockedMathMemberForTests(name: string): unknown {
  const member: unknown = Reflect.get(math, name)
  return member
}

/** Whether `name` is a function or constant of mathjs (used to avoid quoting such names back). */
export function isMathjsName(name: string): boolean {
  return typeof name === 'string' && name in math
}
