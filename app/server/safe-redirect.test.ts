import { describe, expect, test } from 'vitest'
import { safeRedirect } from './auth.server.ts'

describe('safeRedirect', () => {
  // Each of these either leaves the site, or cannot go into a Location header.
  test.each([
    ['//evil.example', 'protocol-relative'],
    ['//evil.example/x', 'protocol-relative with a path'],
    ['///evil.example', 'three slashes'],
    ['/\\evil.example', 'backslash read as a slash'],
    ['/\\\\evil.example', 'two backslashes'],
    ['\\\\evil.example', 'leading backslashes'],
    ['/%09/evil.example', 'encoded tab, which browsers drop'],
    ['/\t/evil.example', 'raw tab'],
    ['/%2F%2Fevil.example', 'encoded slashes'],
    ['/%2f/evil.example', 'lower-case encoded slash'],
    ['/%5C%5Cevil.example', 'encoded backslashes'],
    ['/%5Cevil.example', 'one encoded backslash'],
    ['/%252F%252Fevil.example', 'double-encoded slashes'],
    ['/%25252F%25252Fevil.example', 'triple-encoded slashes'],
    ['/.//evil.example', 'dot then two slashes'],
    ['\r\n', 'CR LF alone'],
    ['/\r\nSet-Cookie: x=1', 'header injection'],
    ['/%0D%0ASet-Cookie:%20x=1', 'encoded header injection'],
    ['/x?y=%0D%0A', 'encoded CR LF in the query'],
    ['/\u0000', 'NUL'],
    ['/%00', 'encoded NUL'],
    ['/\u0085', 'C1 next-line'],
    ['/a b', 'raw space'],
    ['/%20/evil.example', 'encoded space'],
    ['/\u2028', 'line separator'],
    ['/%E0%A4%A', 'a broken percent escape'],
    ['javascript:alert(1)', 'javascript: URL'],
    ['JavaScript:alert(1)', 'javascript: URL in capitals'],
    ['/javascript:alert(1)//', 'a double slash after a scheme-like path'],
    ['https://evil.example', 'absolute URL'],
    ['http:/evil.example', 'scheme with one slash'],
    ['evil.example', 'relative without a slash'],
    ['', 'empty'],
    [' /courses', 'leading space'],
    ['/' + 'a'.repeat(2001), 'too long'],
  ])('%j (%s) goes to the fallback', (input) => {
    expect(safeRedirect(input)).toBe('/')
    expect(safeRedirect(input, '/courses')).toBe('/courses')
  })

  test.each([
    ['/', '/'],
    ['/courses/3', '/courses/3'],
    ['/courses/3/gradebook?tab=scores#top', '/courses/3/gradebook?tab=scores#top'],
    ['/bank?q=rankine%20cycle', '/bank?q=rankine%20cycle'],
    ['/ä', '/%C3%A4'],
    ['/problems/Dampf-Über', '/problems/Dampf-%C3%9Cber'],
    ['/a/../b', '/b'],
  ])('%j stays on the site as %j', (input, expected) => {
    expect(safeRedirect(input)).toBe(expected)
  })

  test('anything but a string goes to the fallback', () => {
    expect(safeRedirect(null)).toBe('/')
    expect(safeRedirect(undefined)).toBe('/')
    expect(safeRedirect(new File(['x'], '/courses'))).toBe('/')
  })

  test('what it returns is a valid Location header and passes again unchanged', () => {
    for (const input of ['/ä', '/courses/3?x=1', '/problems/Dampf-Über#ß']) {
      const out = safeRedirect(input)
      expect(() => new Headers({ Location: out })).not.toThrow()
      expect(safeRedirect(out)).toBe(out)
    }
  })
})
