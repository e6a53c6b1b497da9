import { describe, expect, test } from 'vitest'
import { DISABLED_MATHJS_FUNCTIONS, lockedMathMemberForTests, mathCore } from './math-instance.ts'
import {
  compileRestrictedExpression,
  evaluateRestrictedExpression,
  parseUnitString,
  validateTree,
} from './restricted-math.ts'
import type { RestrictedExpressionResult } from './restricted-math.ts'

const codeOf = (r: RestrictedExpressionResult): string => (r.ok ? 'ok' : r.error.code)

describe('the locked mathjs instance (mathjs docs, "Security": disable the risky functions)', () => {
  test.each([
    'import',
    'createUnit',
    'evaluate',
    'parse',
    'simplify',
    'derivative',
    'resolve',
    'reviver',
    'compile',
    'chain',
  ])('%s is overridden with a function that throws', (name) => {
    expect(DISABLED_MATHJS_FUNCTIONS).toContain(name)
    const fn = lockedMathMemberForTests(name)
    expect(typeof fn).toBe('function')
    expect(() => (fn as (...a: unknown[]) => unknown)('1 + 1')).toThrow(/disabled/)
  })

  test('import cannot be used to undo the lock', () => {
    const imp = lockedMathMemberForTests('import') as (o: unknown, opts: unknown) => unknown
    expect(() => imp({ evaluate: () => 1 }, { override: true })).toThrow()
    expect(() => (lockedMathMemberForTests('evaluate') as (s: string) => unknown)('1')).toThrow()
  })

  test('the captured parse still works (it is what the reader uses)', () => {
    expect(mathCore.parse('12 kJ').type).toBe('OperatorNode')
  })
})

describe('evaluateRestrictedExpression: what is allowed', () => {
  test.each([
    ['1 + 2*3', 7],
    ['2^10', 1024],
    ['-2^2', -4],
    ['sqrt(16)', 4],
    ['exp(0)', 1],
    ['ln(e^2)', 2],
    ['log(e)', 1], // log is the natural logarithm, as in mathjs
    ['log10(1000)', 3],
    ['abs(-3)', 3],
    ['sin(pi/2)', 1],
    ['cos(0)', 1],
    ['tan(0)', 0],
    ['2 pi', 2 * Math.PI],
    ['(1 + 2) * (3 + 4)', 21],
  ])('%s = %f', (text, value) => {
    const r = evaluateRestrictedExpression(text, {})
    expect(r.ok && r.kind === 'number' ? r.value : NaN).toBeCloseTo(value, 12)
  })

  test('variables with units, converted into an expected unit', () => {
    // closed form: ideal gas p·V = n·R·T → p = nRT/V; 1 mol, 8.314462618 J/(mol·K), 300 K, 0.0249 m³
    const r = evaluateRestrictedExpression(
      'n*R*T1/V1',
      {
        n: { value: 1, unit: 'mol' },
        R: { value: 8.314462618, unit: 'J/(mol·K)' },
        T1: { value: 300, unit: 'K' },
        V1: { value: 0.0249, unit: 'm^3' },
      },
      { expectedUnit: 'kPa' },
    )
    expect(r.ok && r.kind === 'quantity' ? r.value : NaN).toBeCloseTo((8.314462618 * 300) / 0.0249 / 1000, 9)
  })

  test('variables shadow unit names (m is a mass variable here, not metre)', () => {
    const r = evaluateRestrictedExpression(
      'm*cp*(T2 - T1)',
      {
        m: { value: 2, unit: 'kg' },
        cp: { value: 1.005, unit: 'kJ/(kg·K)' },
        T1: { value: 300, unit: 'K' },
        T2: { value: 400, unit: 'K' },
      },
      { expectedUnit: 'kJ' },
    )
    // closed form: Q = m·cp·ΔT = 2 × 1.005 × 100 kJ
    expect(r.ok && r.kind === 'quantity' ? r.value : NaN).toBeCloseTo(201, 9)
  })

  test('plain number and mathjs Unit scope values', () => {
    const u = mathCore.multiply(3, mathCore.valuelessUnit('kPa'))
    const r = evaluateRestrictedExpression('k*p', { k: 2, p: u as never }, { expectedUnit: 'Pa' })
    expect(r.ok && r.kind === 'quantity' ? r.value : NaN).toBeCloseTo(6000, 9)
  })

  test('the siValue of an absolute temperature is in kelvin', () => {
    const r = evaluateRestrictedExpression('27 degC', {})
    expect(r.ok && r.kind === 'quantity' ? r.siValue : NaN).toBeCloseTo(300.15, 9)
  })

  test('a compiled expression can be evaluated for many variants', () => {
    const c = compileRestrictedExpression('1 - (T_c/T_h)', { variables: ['T_c', 'T_h'] })
    if (!c.ok) throw new Error(c.error.code)
    for (const [tc, th] of [
      [300, 600],
      [280, 700],
    ] as const) {
      const r = c.expression.evaluate({ T_c: { value: tc, unit: 'K' }, T_h: { value: th, unit: 'K' } })
      // closed form: Carnot efficiency 1 − Tc/Th
      expect(r.ok && r.kind === 'number' ? r.value : NaN).toBeCloseTo(1 - tc / th, 12)
    }
    expect(codeOf(c.expression.evaluate({ T_c: 1 }))).toBe('invalid-variable')
  })
})

describe('evaluateRestrictedExpression: what is refused (the tree walk)', () => {
  test.each([
    ['x = 1', 'assignment'],
    ['f(x) = x^2', 'assignment'],
    ['a = 1; a', 'multiple-expressions'],
    ['1; 2', 'multiple-expressions'],
    ['1\n2', 'multiple-expressions'],
    ['import({}, {})', 'function-not-allowed'],
    ['createUnit("foo")', 'syntax'], // strings are refused before parsing
    ['createUnit(foo)', 'function-not-allowed'],
    ['evaluate(1)', 'function-not-allowed'],
    ['parse(1)', 'function-not-allowed'],
    ['simplify(1)', 'function-not-allowed'],
    ['derivative(x, x)', 'function-not-allowed'],
    ['resolve(1)', 'function-not-allowed'],
    ['compile(1)', 'function-not-allowed'],
    ['chain(1)', 'function-not-allowed'],
    ['reviver(1)', 'function-not-allowed'],
    ['max(1, 2)', 'function-not-allowed'],
    ['sqrt(1, 2)', 'wrong-argument-count'],
    ['evaluate', 'unknown-symbol'],
    ['__proto__', 'unknown-symbol'],
    ['constructor', 'unknown-symbol'],
    ['toString', 'unknown-symbol'],
    ['hasOwnProperty', 'unknown-symbol'],
    ['Infinity', 'out-of-range'],
    ['NaN', 'out-of-range'],
    ['foo', 'unknown-symbol'],
    ['[1, 2]', 'not-a-number'],
    ['{a: 1}', 'not-a-number'],
    ['true', 'not-a-number'],
    ['null', 'not-a-number'],
    ['a.b', 'unknown-symbol'],
    ['kg.value', 'unknown-symbol'], // a dot between letters is read as a multiplication dot
    ['pi.constructor', 'unknown-symbol'],
    ['(pi).constructor', 'unsupported-syntax'], // property access
    ['(kg)["value"]', 'syntax'],
    ['(kg)[1]', 'unsupported-syntax'],
    ['pi[1]', 'unsupported-syntax'],
    ['1:3', 'unsupported-syntax'],
    ['1 < 2', 'unsupported-syntax'],
    ['1 == 1', 'unsupported-syntax'],
    ['true ? 1 : 2', 'unsupported-syntax'],
    ['5!', 'unsupported-syntax'],
    ['12 kJ to J', 'unsupported-syntax'],
    ['12 kJ in J', 'unsupported-syntax'],
    ['7 mod 2', 'unsupported-syntax'],
    ['50%', 'unsupported-syntax'],
    ['1 & 2', 'unsupported-syntax'],
    ['not 1', 'unsupported-syntax'],
    ['1e999', 'out-of-range'],
    ['10^400', 'out-of-range'],
    ['1/0', 'out-of-range'],
    ['sqrt(-1)', 'not-real'],
    ['ln(0)', 'not-real'],
    ['(-8)^(1/3)', 'not-real'],
    ['12 kJ + 3 kg', 'incompatible-units'],
    ['12 kJ + 3', 'incompatible-units'],
    ['exp(2 kJ)', 'incompatible-units'],
    ['sin(2 kg)', 'incompatible-units'],
    ['m^kg', 'bad-exponent'],
    ['m^100', 'bad-exponent'],
    ['"abc"', 'syntax'],
    ['1 # comment', 'syntax'],
    ['', 'empty'],
    ['   ', 'empty'],
    ['(((1)', 'syntax'],
  ])('%j → %s', (text, code) => {
    expect(codeOf(evaluateRestrictedExpression(text, {}))).toBe(code)
  })

  test('the length limit (200 by default, adjustable up to 2000)', () => {
    const long = '1+'.repeat(150) + '1'
    expect(codeOf(evaluateRestrictedExpression(long, {}))).toBe('too-long')
    expect(codeOf(evaluateRestrictedExpression(long, {}, { maxLength: 500 }))).toBe('ok')
    expect(codeOf(evaluateRestrictedExpression('1+'.repeat(1500) + '1', {}, { maxLength: 1e9 }))).toBe('too-long')
  })

  test('deeply nested brackets are fine within the length limit', () => {
    expect(codeOf(evaluateRestrictedExpression('('.repeat(99) + '1' + ')'.repeat(99), {}))).toBe('ok')
  })

  test('dangerous or clashing variable names are refused', () => {
    for (const name of ['constructor', '__proto__', 'toString', 'sqrt', '1a', 'a-b', '']) {
      const c = compileRestrictedExpression('1', { variables: [name] })
      expect(c.ok ? 'ok' : c.error.code).toBe('invalid-variable')
    }
  })

  test('an inherited property of the scope is never used as a variable', () => {
    const scope = Object.create({ p: 5 }) as Record<string, number>
    expect(codeOf(evaluateRestrictedExpression('p', scope))).toBe('unknown-symbol')
  })

  test('expectedUnit of another dimension is an error', () => {
    expect(codeOf(evaluateRestrictedExpression('3 kg', {}, { expectedUnit: 'kJ' }))).toBe('wrong-dimension')
    expect(codeOf(evaluateRestrictedExpression('3', {}, { expectedUnit: 'kJ' }))).toBe('wrong-dimension')
    expect(codeOf(evaluateRestrictedExpression('3 kJ', {}, { expectedUnit: '' }))).toBe('wrong-dimension')
  })

  test('error messages do not mention the library or echo the input', () => {
    for (const text of ['import({})', 'createUnit(x)', 'evaluate', 'x = 1', '__proto__']) {
      const r = evaluateRestrictedExpression(text, {})
      expect(r.ok).toBe(false)
      const message = r.ok ? '' : r.error.message
      expect(message).not.toMatch(/mathjs|disabled|Error|stack|undefined|proto|import|createUnit|evaluate/i)
    }
  })
})

describe('validateTree directly (a second line of defence behind the character checks)', () => {
  const rules = { variables: new Set<string>(), allowConstants: true, unitsOnly: false }
  test.each([
    ['a = 1', 'assignment'],
    ['f(x) = 1', 'assignment'],
    ['1; 2', 'multiple-expressions'],
    ['"s"', 'not-a-number'],
    ['[1]', 'not-a-number'],
    ['x.y', 'unsupported-syntax'],
    ['sqrt.x', 'unsupported-syntax'],
    ['x?.y', 'unsupported-syntax'],
    ['a[1]', 'unsupported-syntax'],
  ])('%j → %s', (text, code) => {
    let got = 'none'
    try {
      validateTree(mathCore.parse(text), rules)
    } catch (e) {
      got = (e as { code?: string }).code ?? 'other'
    }
    expect(got).toBe(code)
  })
})

describe('parseUnitString', () => {
  test.each(['kJ', 'kJ/(kg·K)', 'm³', '°C', '1/s', 'W/m^2/K'])('%s parses to a valueless unit', (u) => {
    const r = parseUnitString(u, false)
    expect(r !== null && r !== 1 && (r.value as unknown) === null).toBe(true)
  })
  test.each(['2 kJ', 'sqrt(m)', 'kJ + J', 'pi', 'e', 'foo', '-kJ'])('%s is not a unit', (u) => {
    expect(parseUnitString(u, false)).toBeNull()
  })
})
