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
import type { MathNode, Unit } from 'mathjs'

const math = create(all as NonNullable<typeof all>)

math.createUnit('cal', { definition: '4.184 J', prefixes: 'short', aliases: ['calorie', 'calories'] })
math.createUnit('Btu', { definition: '1 BTU' })

/** A mathjs Unit constructor that also accepts `null` (a "valueless" unit such as kJ). */
interface UnitClass {
  new (value: number | null, name: string): Unit
  isValuelessUnit(name: string): boolean
}

/** What the grading code may use from mathjs, captured before the lock-down. */
export interface MathCore {
  readonly parse: (text: string) => MathNode
  readonly Unit: UnitClass
  readonly add: (a: Unit, b: Unit) => Unit
  readonly subtract: (a: Unit, b: Unit) => Unit
  readonly multiply: (a: number | Unit, b: number | Unit) => number | Unit
  readonly divide: (a: number | Unit, b: number | Unit) => number | Unit
  readonly pow: (a: Unit, b: number) => Unit
  readonly unaryMinus: (a: Unit) => Unit
  readonly sqrt: (a: Unit) => Unit
  readonly abs: (a: Unit) => Unit
  readonly sin: (a: Unit) => number
  readonly cos: (a: Unit) => number
  readonly tan: (a: Unit) => number
}

const captured: MathCore = Object.freeze({
  parse: math.parse.bind(math) as unknown as MathCore['parse'],
  Unit: math.Unit as unknown as UnitClass,
  add: math.add as unknown as MathCore['add'],
  subtract: math.subtract as unknown as MathCore['subtract'],
  multiply: math.multiply as unknown as MathCore['multiply'],
  divide: math.divide as unknown as MathCore['divide'],
  pow: math.pow as unknown as MathCore['pow'],
  unaryMinus: math.unaryMinus as unknown as MathCore['unaryMinus'],
  sqrt: math.sqrt as unknown as MathCore['sqrt'],
  abs: math.abs as unknown as MathCore['abs'],
  sin: math.sin as unknown as MathCore['sin'],
  cos: math.cos as unknown as MathCore['cos'],
  tan: math.tan as unknown as MathCore['tan'],
})

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
 * The locked instance itself, exported ONLY so tests can prove the lock-down
 * (restricted-math.test.ts). Production code uses `mathCore`.
 */
export const lockedMathInstanceForTests: { readonly [name: string]: unknown } = math as unknown as {
  readonly [name: string]: unknown
}

/** Whether `name` is a function or constant of mathjs (used to avoid quoting such names back). */
export function isMathjsName(name: string): boolean {
  return typeof name === 'string' && name in math
}
