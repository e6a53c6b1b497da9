import { describe, expect, test } from 'vitest'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { gradeAnswer, precheckAnswer } from './grade-answer.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const def = otto.earlierVersions?.[0] ?? otto.definition
const drawn = drawVariant(def, 4242, { convention: 'engineering' })
if (!drawn.ok) throw new Error(drawn.error.message)
const variant = drawn.variant
const find = (name: string) => def.finds.find((f) => f.name === name)!
const key = (name: string) => variant.key.find((k) => k.name === name)!

describe('gradeAnswer', () => {
  test('the key itself is correct and earns the whole share', () => {
    const k = key('wNet')
    const g = gradeAnswer({ find: find('wNet'), variant, answer: `${k.value} ${k.unit}`, share: 4, latePenalty: 0 })
    expect(g).toMatchObject({ verdict: 'correct', score: 4, pitfall: null })
    expect(g.value).toBeCloseTo(k.value, 9)
  })

  test('a late correct answer loses its penalty', () => {
    const k = key('wNet')
    expect(
      gradeAnswer({ find: find('wNet'), variant, answer: `${k.value} kJ/kg`, share: 4, latePenalty: 0.25 }).score,
    ).toBe(3)
  })

  test('the same work in J/kg is read and converted', () => {
    const k = key('wNet')
    expect(
      gradeAnswer({ find: find('wNet'), variant, answer: `${k.value * 1000} J/kg`, share: 4, latePenalty: 0 }).verdict,
    ).toBe('correct')
  })

  test('the sign of the other convention is named as a pitfall', () => {
    // The engineering net work of a heat engine is positive; the chemistry convention's w on the gas is its negative (common practice).
    const k = key('wNet')
    expect(k.value).toBeGreaterThan(0)
    const g = gradeAnswer({ find: find('wNet'), variant, answer: `${-k.value} kJ/kg`, share: 4, latePenalty: 0 })
    expect(g).toMatchObject({ verdict: 'incorrect', score: 0 })
    expect(g.pitfall?.id).toBe('sign-convention-flipped')
  })

  test('T1 taken in °C as if it were kelvin is named', () => {
    // Isentropic compression of an ideal gas with γ = 1.4: T2 = T1 r^(γ−1) (Çengel & Boles, Thermodynamics:
    // An Engineering Approach, the air-standard Otto cycle, from memory); with T1 in °C read as K
    // the slip gives the °C number × r^0.4.
    const t1C = variant.givens.find((g) => g.name === 'T1')!.value
    const r = variant.givens.find((g) => g.name === 'r')!.value
    const slipped = t1C * r ** 0.4
    const g = gradeAnswer({
      find: find('T2'),
      variant,
      answer: `${slipped.toPrecision(5)} K`,
      share: 2,
      latePenalty: 0,
    })
    expect(g.verdict).toBe('incorrect')
    expect(g.pitfall?.id).toBe('celsius-for-kelvin')
  })

  test('a wrong answer no pitfall explains has no pitfall', () => {
    const g = gradeAnswer({
      find: find('wNet'),
      variant,
      answer: `${key('wNet').value * 1.37} kJ/kg`,
      share: 4,
      latePenalty: 0,
    })
    expect(g).toMatchObject({ verdict: 'incorrect', pitfall: null })
  })

  test('a tolerance override replaces the find’s', () => {
    const k = key('wNet')
    const answer = `${k.value * 1.03} kJ/kg`
    expect(gradeAnswer({ find: find('wNet'), variant, answer, share: 4, latePenalty: 0 }).verdict).toBe('incorrect')
    expect(
      gradeAnswer({
        find: find('wNet'),
        variant,
        answer,
        share: 4,
        latePenalty: 0,
        tolerance: { kind: 'relative', value: 0.05 },
      }).verdict,
    ).toBe('correct')
  })
})

describe('precheckAnswer', () => {
  test.each([
    ['300 K', true],
    ['26.85 degC', true],
    ['3e2 K', true],
    ['hot', false],
    ['300 kPa', false],
    ['300', false],
    ['', false],
  ])('%j usable: %s', (answer, ok) => {
    expect(precheckAnswer(find('T2'), answer).ok).toBe(ok)
  })

  test('says why', () => {
    const p = precheckAnswer(find('T2'), '300 kPa')
    expect(p).toMatchObject({ ok: false, verdict: 'wrong-dimension' })
    expect(p.ok ? '' : p.message).toMatch(/temperature|K/)
  })

  test('a pure-number find takes a bare number', () => {
    expect(precheckAnswer(find('eta'), '0.55').ok).toBe(true)
  })
})

describe('a find that states its sense', () => {
  // In a chemistry course the solver's net work is the work done on the gas (negative for an
  // engine); with the sense "work done by the system" the key is its negative (positive).
  const byDef = {
    ...def,
    finds: def.finds.map((f) => (f.name === 'wNet' ? { ...f, sense: 'work-by-system' as const } : f)),
  }
  const chem = drawVariant(byDef, 4242, { convention: 'chemistry' })
  if (!chem.ok) throw new Error(chem.error.message)
  const k = chem.variant.key.find((x) => x.name === 'wNet')!
  const grade = (answer: string) =>
    gradeAnswer({
      find: byDef.finds.find((f) => f.name === 'wNet')!,
      variant: chem.variant,
      answer,
      share: 4,
      latePenalty: 0,
    })

  test('the positive key is correct in a chemistry course', () => {
    expect(k.value).toBeGreaterThan(0)
    expect(k.flipped).toBe(true)
    expect(grade(`${k.value} kJ/kg`).verdict).toBe('correct')
  })

  test('a slip is still recognised on the negated key: the number in J/kg labelled kJ/kg is the factor of 1000', () => {
    const g = grade(`${k.value * 1000} kJ/kg`)
    expect(g.verdict).toBe('incorrect')
    expect(g.pitfall?.id).toBe('kilo-factor')
  })

  test('the opposite sign is named as the sign slip, with the sense the question counts positive', () => {
    const g = grade(`${-k.value} kJ/kg`)
    expect(g.pitfall?.id).toBe('sign-convention-flipped')
    expect(g.pitfall?.feedback).toBe(
      "Your number has the right size but the wrong sign. This question counts the work done by the system as positive, whatever the course's sign convention.",
    )
  })
})
