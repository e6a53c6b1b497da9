import { describe, expect, test } from 'vitest'
import { MAX_PAGE, pageParam, readPageParam, readTextParam, textParamProblem } from '#app/lib/query-params.ts'

const q = (s: string) => new URLSearchParams(s)

describe('page numbers from the address', () => {
  test('absent or empty is page 1; whole numbers from 1 to the limit are kept', () => {
    expect(readPageParam(q(''))).toEqual({ ok: true, page: 1 })
    expect(readPageParam(q('page='))).toEqual({ ok: true, page: 1 })
    expect(readPageParam(q('page=1'))).toEqual({ ok: true, page: 1 })
    expect(readPageParam(q('page=0042'))).toEqual({ ok: true, page: 42 })
    expect(readPageParam(q(`page=${MAX_PAGE}`))).toEqual({ ok: true, page: MAX_PAGE })
    expect(readPageParam(q('p=7'), 'p')).toEqual({ ok: true, page: 7 })
  })

  test('anything else is refused with a message that quotes it, names the parameter and gives the range', () => {
    for (const bad of [
      '99999999999999999999',
      '1e308',
      '-1',
      '0',
      '2.5',
      String(MAX_PAGE + 1),
      'abc',
      '3%00',
      'Infinity',
      '0x10',
      ' 1 2 ',
    ]) {
      const r = readPageParam(q(`page=${bad}`))
      expect(r.ok, bad).toBe(false)
      if (!r.ok) {
        expect(r.problem.param).toBe('page')
        expect(r.problem.message).toMatch(
          /^The page number in the address \(page=“.*”\) must be a whole number from 1 to 100,000\./,
        )
        expect(r.problem.message).not.toMatch(/\u0000/)
      }
    }
    expect(readPageParam(q('page=99999999999999999999999999999999')).ok).toBe(false)
    const long = readPageParam(q(`page=${'9'.repeat(80)}`))
    expect(!long.ok && long.problem.message).toContain('“99999999999999999999999…”')
  })

  test('pageParam throws a 400 for the error page', () => {
    expect(pageParam(q('page=3'))).toBe(3)
    try {
      pageParam(q('page=1e308'))
      expect.unreachable()
    } catch (e) {
      expect(e).toMatchObject({
        type: 'DataWithResponseInit',
        init: { status: 400 },
        data: expect.stringMatching(/page number/),
      })
    }
  })
})

describe('text from the address', () => {
  test('a search without control characters is kept as it is', () => {
    expect(readTextParam(q('q=otto%09cycle'), 'q', 'the search')).toEqual({ ok: true, value: 'otto\tcycle' })
    expect(readTextParam(q(''), 'q', 'the search')).toEqual({ ok: true, value: '' })
  })

  test('a NUL is refused, the text given back without it', () => {
    const r = readTextParam(q('q=ot%00to'), 'q', 'the search')
    expect(r).toEqual({
      ok: false,
      value: 'otto',
      problem: { param: 'q', message: expect.stringMatching(/^The search had a NUL character/) },
    })
  })

  test('textParamProblem names the first parameter with a control character', () => {
    expect(textParamProblem(q('q=a&section=B'), { q: 'the search', section: 'the section' })).toBeNull()
    expect(textParamProblem(q('q=a&section=B%07'), { q: 'the search', section: 'the section' })).toEqual({
      param: 'section',
      message:
        'The section in the address (section) has an invisible control character (U+0007, at character 2), which cannot be accepted. Remove it and try again.',
    })
  })
})
