import { describe, expect, test } from 'vitest'
import { z } from 'zod'
import {
  controlCharIssues,
  controlCharMessage,
  echoValues,
  findControlChar,
  hasControlChar,
  textField,
  withoutNul,
} from '#app/lib/text-field.ts'

describe('control characters', () => {
  test('NUL and the other C0 codes and DEL are refused; tab, line feed and carriage return are not', () => {
    for (const c of [
      '\u0000',
      '\u0001',
      '\u0007',
      '\u0008',
      '\u000B',
      '\u000C',
      '\u000E',
      '\u001B',
      '\u001F',
      '\u007F',
    ])
      expect(hasControlChar(`a${c}b`), JSON.stringify(c)).toBe(true)
    for (const ok of [
      'plain',
      'tab\there',
      'two\nlines',
      'windows\r\nlines',
      'ünïcödé — “quotes” 日本',
      '\u0085 next line (C1) is left alone',
    ])
      expect(hasControlChar(ok), ok).toBe(false)
  })

  test('the first one is found by its position, counted from 1, and its code', () => {
    expect(findControlChar('abc')).toBeNull()
    expect(findControlChar('ab\u0007c\u0000')).toEqual({ index: 3, code: 'U+0007' })
    expect(findControlChar('\u007F')).toEqual({ index: 1, code: 'U+007F' })
  })

  test('messages name the field, say what is wrong and what to do', () => {
    expect(controlCharMessage('the reason', 'a\u0000b')).toMatch(
      /^The reason had a NUL character .* It has been taken out of the text shown here/,
    )
    expect(controlCharMessage('the reason', 'a\u0000b', { echoed: false })).toMatch(
      /^The reason has a NUL character .* Remove it and try again\.$/,
    )
    expect(controlCharMessage('the reason', 'a\u0000b\u0007')).toMatch(/also has other invisible control characters/)
    expect(controlCharMessage('the title', 'x\u001Fy')).toBe(
      'The title has an invisible control character (U+001F, at character 2), which cannot be accepted. Remove it and try again.',
    )
  })

  test('the echo leaves out only the NUL characters', () => {
    expect(withoutNul('a\u0000b\u0000\u0007\tc')).toBe('ab\u0007\tc')
    expect(echoValues({ reason: 'x\u0000y', other: 'kept' })).toEqual({ reason: 'xy', other: 'kept' })
  })
})

describe('textField', () => {
  const Schema = z.object({ reason: textField('the reason').trim().min(3, 'Too short.').max(10, 'Too long.') })

  test('passes ordinary text through the rules chained after it', () => {
    expect(Schema.parse({ reason: '  hello  ' })).toEqual({ reason: 'hello' })
    expect(Schema.safeParse({ reason: 'hi' }).error?.issues[0]?.message).toBe('Too short.')
  })

  test('refuses control characters with one message, before the length rules', () => {
    const r = Schema.safeParse({ reason: 'x\u0000' })
    expect(r.success).toBe(false)
    expect(r.error?.issues).toHaveLength(1)
    expect(r.error?.issues[0]).toMatchObject({
      path: ['reason'],
      message: expect.stringMatching(/^The reason had a NUL character/),
    })
  })

  test('a missing value gets the plain message given', () => {
    expect(
      textField('the e-mail address', { required: 'Enter an e-mail address.' }).safeParse(undefined).error?.issues[0]
        ?.message,
    ).toBe('Enter an e-mail address.')
  })
})

describe('controlCharIssues', () => {
  test('finds every string (and key) with a control character, by dotted path', () => {
    const doc = {
      title: 'ok',
      finds: [{ label: 'a\u0000' }, { label: 'fine' }],
      physics: { cycle: { 'ga\u0001s': 'air', states: ['x', 'y\u0000'] } },
      n: 3,
      none: null,
    }
    expect(controlCharIssues(doc).map((i) => i.path)).toEqual([
      'finds.0.label',
      'physics.cycle.ga\u0001s',
      'physics.cycle.states.1',
    ])
    expect(controlCharIssues({ title: 'clean', list: [1, 'two'] })).toEqual([])
    expect(controlCharIssues('top\u0000', () => 'this text')).toEqual([
      { path: '', message: expect.stringMatching(/^This text has a NUL character/) },
    ])
  })
})
