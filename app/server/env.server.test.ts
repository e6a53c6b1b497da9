import { afterEach, describe, expect, test } from 'vitest'
import { appUrl, parseEnv, resetEnv } from './env.server.ts'

const base = { DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/db', SESSION_SECRET: 'a-secret-of-sixteen-or-more' }

describe('APP_URL', () => {
  test('production refuses to start without it, in one clear line', () => {
    let message = ''
    try {
      parseEnv({ ...base, NODE_ENV: 'production' })
    } catch (e) {
      message = (e as Error).message
    }
    expect(message).toMatch(/^The environment is not set up: APP_URL must be set in production/)
    expect(message).not.toContain('\n')
  })

  test('an empty APP_URL counts as unset in production', () => {
    expect(() => parseEnv({ ...base, NODE_ENV: 'production', APP_URL: '' })).toThrow(
      /APP_URL must be set in production/,
    )
  })

  test('production starts with it', () => {
    expect(parseEnv({ ...base, NODE_ENV: 'production', APP_URL: 'https://cyclewright.example.org' }).APP_URL).toBe(
      'https://cyclewright.example.org',
    )
  })

  test('only http and https addresses are accepted', () => {
    expect(() => parseEnv({ ...base, APP_URL: 'javascript:alert(1)' })).toThrow(/APP_URL/)
    expect(() => parseEnv({ ...base, APP_URL: 'not a url' })).toThrow(/APP_URL/)
  })

  test('development and tests may leave it unset', () => {
    expect(parseEnv({ ...base, NODE_ENV: 'development' }).APP_URL).toBeUndefined()
    expect(parseEnv({ ...base, NODE_ENV: 'test' }).APP_URL).toBeUndefined()
  })
})

describe('appUrl', () => {
  const saved = { ...process.env }
  afterEach(() => {
    process.env = { ...saved }
    resetEnv()
  })

  test('is APP_URL without its trailing slash', () => {
    Object.assign(process.env, base, { NODE_ENV: 'test', APP_URL: 'https://cw.example.org/' })
    resetEnv()
    expect(appUrl()).toBe('https://cw.example.org')
  })

  test('without APP_URL, the local server on PORT (never anything from a request)', () => {
    Object.assign(process.env, base, { NODE_ENV: 'development', PORT: '4123' })
    delete process.env.APP_URL
    resetEnv()
    expect(appUrl()).toBe('http://127.0.0.1:4123')
    // The signature takes no request: a Host header cannot reach the link.
    expect(appUrl.length).toBe(0)
  })
})
