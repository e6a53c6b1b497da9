import { describe, expect, test } from 'vitest'
import type { DrawnGiven } from './definition.ts'
import { upgradeDefinition } from './definition.ts'
import {
  convertValue,
  expandPlaceholders,
  formatGivenValue,
  parsePlaceholders,
  placeholderText,
  scanPlaceholders,
  unitToTex,
  upgradeLegacyPrompt,
} from './placeholders.ts'

const given = (name: string, value: number, unit: string, text = `${value} ${unit}`.trim()): DrawnGiven => ({
  name,
  label: name,
  value,
  unit,
  text,
})
const T1 = given('T1', 300, 'K')
const p1 = given('p1', 101.325, 'kPa')
const gas = { name: 'gas', label: 'gas', value: NaN, unit: '', text: 'air' } satisfies DrawnGiven

describe('parsePlaceholders', () => {
  test.each([
    ['[T1]', { name: 'T1' }],
    ['[T1 in kPa]', { name: 'T1', unit: 'kPa' }],
    ['[T1 in °C]', { name: 'T1', unit: '°C' }],
    ['[T1, 3 sf]', { name: 'T1', sigFigs: 3 }],
    ['[T1,2dp]', { name: 'T1', decimals: 2 }],
    ['[T1 in °C, 1 dp]', { name: 'T1', unit: '°C', decimals: 1 }],
    ['[q_in in kJ/(kg K), 4 sf]', { name: 'q_in', unit: 'kJ/(kg K)', sigFigs: 4 }],
  ])('%s is read as %o', (text, expected) => {
    const r = parsePlaceholders(`x ${text} y`)
    expect(r.errors).toEqual([])
    expect(r.placeholders).toHaveLength(1)
    const { start, end, ...rest } = r.placeholders[0]!
    expect(rest).toEqual(expected)
    expect(start).toBe(2)
    expect(end).toBe(2 + text.length)
  })

  test('\\[ is a bracket that is only a bracket, and the placeholder after it still counts', () => {
    const r = parsePlaceholders('write \\[T1] to show brackets, [p1] is real')
    expect(r.placeholders.map((p) => p.name)).toEqual(['p1'])
    expect(r.errors).toEqual([])
    expect(scanPlaceholders('a \\[T1] b')).toEqual([{ kind: 'text', text: 'a [T1] b', offset: 0 }])
  })

  test.each([
    ['a bracket that does not start with a letter', 'see [1] and [ T1 ] and [] and [-3, 4]'],
    ['a Markdown link', 'the [steam tables](https://example.org/steam)'],
    ['a bracket after a TeX command', '$\\sqrt[n]{x}$ and $\\left[ a \\right]$ and $\\left[T1 \\right]$'],
    ['a bracket never closed on its line', 'an open [T1 bracket\n] here'],
    ['a bracket holding another', '[a [b'],
    ['a bracket longer than a placeholder', `[${'a'.repeat(90)}]`],
  ])('not a placeholder: %s', (_name, text) => {
    expect(parsePlaceholders(text)).toEqual({ placeholders: [], errors: [] })
  })

  test('inside math "](" is no link, so the placeholder counts', () => {
    expect(parsePlaceholders('[T1](1 + r)', { math: true }).placeholders.map((p) => p.name)).toEqual(['T1'])
    expect(parsePlaceholders('[T1](1 + r)').placeholders).toEqual([])
  })

  test.each([
    ['[T1x! in K]', /not a given name/],
    ['[T1, 3 sig]', /unknown option "3 sig"/],
    ['[T1, 0 sf]', /significant figures must be 1 to 15/],
    ['[T1, 20 dp]', /decimal places must be 0 to 12/],
    ['[T1 in ]', /cannot read|needs a unit/],
    ['[T1 foo]', /cannot read \[T1 foo\].*\\\[/],
    ['[see note]', /cannot read \[see note\]: write \[see\]/],
  ])('%j is an error with its offset, saying how to write a bracket', (text, message) => {
    const r = parsePlaceholders(`ab ${text}`)
    expect(r.placeholders).toEqual([])
    expect(r.errors).toHaveLength(1)
    expect(r.errors[0]!.offset).toBe(3)
    expect(r.errors[0]!.message).toMatch(message)
  })

  test('a name that is not one is not a placeholder when it starts with a digit', () => {
    // "[1T]" starts with a digit: plain text, like a reference mark "[1]".
    expect(parsePlaceholders('x [1T] y')).toEqual({ placeholders: [], errors: [] })
  })

  test('placeholderText writes what the parser reads', () => {
    for (const [name, o] of [
      ['T1', {}],
      ['T1', { unit: '°C' }],
      ['p1', { sigFigs: 3 }],
      ['q', { unit: 'kJ/kg', decimals: 2 }],
    ] as const) {
      const text = placeholderText(name, o)
      const { start: _s, end: _e, ...rest } = parsePlaceholders(text).placeholders[0]!
      expect(rest).toEqual({ name, ...o })
    }
  })
})

describe('upgradeLegacyPrompt (definition format 1 → 2)', () => {
  test.each([
    ['@{T1}', '[T1]'],
    ['@{ T1 }', '[T1]'],
    ['at @{T1 in °C, 1 dp} and @{p1, 3 sf}', 'at [T1 in °C, 1 dp] and [p1, 3 sf]'],
    ['write @@{T1} for a brace', 'write @{T1} for a brace'],
    ['a list [see below] and [1]', 'a list \\[see below] and [1]'],
    ['the [steam tables](https://example.org) stay a link', 'the [steam tables](https://example.org) stay a link'],
    ['$\\sqrt[n]{@{x}}$ and $\\left[@{T1}\\right]$', '$\\sqrt[n]{[x]}$ and $\\left[[T1]\\right]$'],
    ['already escaped \\[T1]', 'already escaped \\[T1]'],
    ['@{T1}(gauge)', '[T1] (gauge)'],
    ['unclosed @{T1 stays', 'unclosed @{T1 stays'],
    ['money $5 and @{r}', 'money $5 and [r]'],
  ])('%j → %j', (old, upgraded) => {
    expect(upgradeLegacyPrompt(old)).toBe(upgraded)
  })

  test('old and new prompts show the same text for the same givens', () => {
    const old =
      'Air (@{gas}) at @{T1} = @{T1 in °C, 1 dp}; write @@{T1}, see [note] and [the tables](https://example.org)'
    const upgraded = upgradeLegacyPrompt(old)
    expect(expandPlaceholders(upgraded, [T1, gas])).toEqual({
      text: 'Air (air) at 300\u00A0K = 26.9\u00A0°C; write @{T1}, see [note] and [the tables](https://example.org)',
      errors: [],
    })
  })

  test('a format-2 definition is left as it is; a format-1 one changes only its prompt and format', () => {
    const def = {
      format: 1,
      title: 't',
      prompt: 'at @{T1}',
      givens: [{ name: 'T1' }],
      physics: { kind: 'template', template: 'otto', inputs: { T3: '@{T1} + 500 K' } },
    }
    expect(upgradeDefinition(def)).toEqual({ ...def, format: 2, prompt: 'at [T1]' })
    const current = { ...def, format: 2 }
    expect(upgradeDefinition(current)).toBe(current)
    expect(upgradeDefinition('not a document')).toBe('not a document')
  })
})

describe('formatGivenValue', () => {
  test('as drawn, without float noise, with a no-break space before the unit', () => {
    expect(formatGivenValue(given('x', 0.1 + 0.2, 'kJ/kg'), undefined, { tex: false })).toEqual({
      ok: true,
      text: '0.3\u00A0kJ/kg',
    })
  })
  test('300 K in °C is 26.85 °C (0 °C = 273.15 K, SI Brochure 9th ed., from memory)', () => {
    expect(formatGivenValue(T1, undefined, { unit: '°C', tex: false })).toEqual({ ok: true, text: '26.85\u00A0°C' })
    expect(formatGivenValue(given('t', 26.85, '°C'), undefined, { unit: 'K', tex: false })).toEqual({
      ok: true,
      text: '300\u00A0K',
    })
  })
  test('101.325 kPa is 1 atm and 1.01325 bar (exact by definition, SI Brochure Table 8, from memory)', () => {
    expect(formatGivenValue(p1, undefined, { unit: 'atm', tex: false })).toEqual({ ok: true, text: '1\u00A0atm' })
    expect(formatGivenValue(p1, undefined, { unit: 'bar', tex: false })).toEqual({ ok: true, text: '1.01325\u00A0bar' })
  })
  test.each([
    [{ sigFigs: 3 }, '101\u00A0kPa'],
    [{ sigFigs: 5 }, '101.33\u00A0kPa'],
    [{ sigFigs: 7 }, '101.3250\u00A0kPa'],
    [{ decimals: 0 }, '101\u00A0kPa'],
    [{ decimals: 1 }, '101.3\u00A0kPa'],
    [{ decimals: 4 }, '101.3250\u00A0kPa'],
  ])('rounding %o gives %s', (opt, text) => {
    expect(formatGivenValue(p1, undefined, { ...opt, tex: false })).toEqual({ ok: true, text })
  })
  test('the given display rule applies in its own unit; the placeholder option wins', () => {
    expect(formatGivenValue(p1, { decimals: 1 }, { tex: false })).toEqual({ ok: true, text: '101.3\u00A0kPa' })
    expect(formatGivenValue(p1, { sigFigs: 2 }, { tex: false })).toEqual({ ok: true, text: '100\u00A0kPa' })
    expect(formatGivenValue(p1, { decimals: 1 }, { decimals: 3, tex: false })).toEqual({
      ok: true,
      text: '101.325\u00A0kPa',
    })
  })
  test('large and small numbers in scientific form; negatives with a minus sign', () => {
    expect(formatGivenValue(given('E', 1.234e10, 'J'), undefined, { sigFigs: 3, tex: false })).toEqual({
      ok: true,
      text: '1.23\u00A0×\u00A010¹⁰\u00A0J',
    })
    expect(formatGivenValue(given('E', 1.5e-6, 'm^3'), undefined, { tex: true })).toEqual({
      ok: true,
      text: '1.5\\times10^{-6}\\,\\mathrm{m}^{3}',
    })
    expect(formatGivenValue(given('q', -800, 'kJ/kg'), undefined, { tex: false })).toEqual({
      ok: true,
      text: '\u2212800\u00A0kJ/kg',
    })
  })
  test('TeX form: thin space and units in \\mathrm', () => {
    expect(formatGivenValue(given('T', 350, 'K'), undefined, { tex: true })).toEqual({
      ok: true,
      text: '350\\,\\mathrm{K}',
    })
    expect(formatGivenValue(T1, undefined, { unit: '°C', tex: true })).toEqual({
      ok: true,
      text: '26.85\\,{}^{\\circ}\\mathrm{C}',
    })
    expect(unitToTex('kJ/(kg·K)')).toBe('\\mathrm{kJ}/(\\mathrm{kg}{\\cdot}\\mathrm{K})')
    expect(unitToTex('kJ/(kg K)')).toBe('\\mathrm{kJ}/(\\mathrm{kg}{\\cdot}\\mathrm{K})')
    expect(unitToTex('m^3/kg')).toBe('\\mathrm{m}^{3}/\\mathrm{kg}')
    expect(unitToTex('%')).toBe('\\%')
  })
  test('a text choice inserts its text and refuses units or rounding', () => {
    expect(formatGivenValue(gas, undefined, { tex: false })).toEqual({ ok: true, text: 'air' })
    expect(formatGivenValue(gas, undefined, { tex: true })).toEqual({ ok: true, text: '\\text{air}' })
    expect(formatGivenValue(gas, undefined, { unit: 'K', tex: false })).toMatchObject({
      ok: false,
      message: expect.stringMatching(/text choice/),
    })
  })
  test('a unit of another dimension, or no unit at all, is a message, not a throw', () => {
    expect(formatGivenValue(T1, undefined, { unit: 'kPa', tex: false })).toMatchObject({
      ok: false,
      message: expect.stringMatching(/different dimensions/),
    })
    expect(formatGivenValue(T1, undefined, { unit: 'furlongs per fortnight', tex: false })).toMatchObject({
      ok: false,
      message: expect.stringMatching(/not a unit/),
    })
  })
  test('a pure number shown in %', () => {
    expect(convertValue(0.85, '', '%')).toEqual({ ok: true, value: 85 })
    expect(formatGivenValue(given('eta', 0.85, ''), undefined, { unit: '%', tex: false })).toEqual({
      ok: true,
      text: '85\u00A0%',
    })
  })
})

describe('expandPlaceholders', () => {
  test('replaces every placeholder and undoes escapes', () => {
    const r = expandPlaceholders('Air ([gas]) at [T1] = [T1 in °C, 1 dp]; write \\[T1] literally', [T1, gas])
    expect(r.errors).toEqual([])
    expect(r.text).toBe('Air (air) at 300\u00A0K = 26.9\u00A0°C; write [T1] literally')
  })
  test('unknown names and bad options come back with name, message and offset', () => {
    const text = 'at [T9] and [T1 in kPa] and [T1, 3 sig]'
    const r = expandPlaceholders(text, [T1])
    expect(r.errors).toEqual([
      { name: 'T9', message: 'unknown given T9', offset: text.indexOf('[T9') },
      { name: 'T1', message: expect.stringMatching(/different dimensions/), offset: text.indexOf('[T1 in') },
      { name: 'T1', message: expect.stringMatching(/unknown option/), offset: text.indexOf('[T1, 3') },
    ])
    expect(r.text).toContain('[unknown given T9]')
  })
})
