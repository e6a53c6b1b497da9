/**
 * Finding PostgreSQL's unique violation (SQLSTATE 23505, PostgreSQL manual, Appendix A
 * "PostgreSQL Error Codes") in an error or in what it wraps, as drizzle wraps the driver's error.
 */
import { describe, expect, test } from 'vitest'
import { isUniqueViolation } from './pg-errors.server.ts'

const pgError = (code: string, constraint?: string) => Object.assign(new Error('pg'), { code, constraint })

describe('isUniqueViolation', () => {
  test('the error itself, or wrapped in cause', () => {
    expect(isUniqueViolation(pgError('23505', 'courses_term_code_key'), 'courses_term_code_key')).toBe(true)
    const wrapped = new Error('Failed query', { cause: pgError('23505', 'courses_term_code_key') })
    expect(isUniqueViolation(wrapped, 'courses_term_code_key')).toBe(true)
    expect(isUniqueViolation(wrapped)).toBe(true)
  })

  test('another constraint, another code, or no error at all is not one', () => {
    expect(isUniqueViolation(pgError('23505', 'other_key'), 'courses_term_code_key')).toBe(false)
    expect(isUniqueViolation(pgError('23503', 'courses_term_code_key'), 'courses_term_code_key')).toBe(false)
    for (const e of [null, undefined, 'text', 23505, { code: 23505 }]) expect(isUniqueViolation(e)).toBe(false)
  })

  test('a chain of causes that loops back ends', () => {
    const a: { code: string; cause?: unknown } = { code: '08006' }
    a.cause = a
    expect(isUniqueViolation(a)).toBe(false)
  })
})
