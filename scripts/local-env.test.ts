import { afterEach, describe, expect, test } from 'vitest'
import { ensureAppUrl } from './local-env.ts'

describe('ensureAppUrl (npm start, npm run dev)', () => {
  const saved = { APP_URL: process.env.APP_URL, PORT: process.env.PORT }
  afterEach(() => {
    for (const [k, v] of Object.entries(saved)) {
      if (v === undefined) delete process.env[k]
      else process.env[k] = v
    }
  })

  test('points e-mailed links at the local server on PORT when APP_URL is unset', () => {
    delete process.env.APP_URL
    process.env.PORT = '3456'
    ensureAppUrl()
    expect(process.env.APP_URL).toBe('http://127.0.0.1:3456')
  })

  test('defaults to port 3000 and keeps an APP_URL that is set', () => {
    delete process.env.APP_URL
    delete process.env.PORT
    ensureAppUrl()
    expect(process.env.APP_URL).toBe('http://127.0.0.1:3000')
    process.env.APP_URL = 'https://cw.example.org'
    ensureAppUrl()
    expect(process.env.APP_URL).toBe('https://cw.example.org')
  })
})
