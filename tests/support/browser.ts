/**
 * Debian's Chromium driven by playwright-core (never a downloaded browser), with the
 * launch flags from the project's stack notes: without the networking flags Chromium
 * keeps trying to reach the internet, which this machine does not allow. Playwright gives
 * every launch a new, empty profile directory of its own (the fresh --user-data-dir).
 */
import fs from 'node:fs'
import { chromium, type Browser, type BrowserContextOptions, type Page } from 'playwright-core'
import { afterAll, afterEach, beforeAll, beforeEach, expect } from 'vitest'

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'

export async function launchBrowser(): Promise<{ browser: Browser; close: () => Promise<void> }> {
  if (!fs.existsSync(CHROMIUM)) throw new Error(`Chromium is not installed at ${CHROMIUM}: apt-get install -y chromium`)
  const browser = await chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  })
  return {
    browser,
    close: async () => {
      await browser.close()
    },
  }
}

/** Fails the test on any console error or uncaught page error. */
export function watchConsole(page: Page): () => string[] {
  const problems: string[] = []
  page.on('console', (m) => {
    if (m.type() === 'error' && !/status of 40[034]/.test(m.text())) problems.push(m.text())
  })
  page.on('pageerror', (e) => problems.push(e.message))
  return () => problems
}

export async function signIn(page: Page, baseURL: string, email: string, password: string) {
  await page.goto(`${baseURL}/sign-in`)
  await page.getByLabel('E-mail address').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/**
 * The usual life of an end-to-end file: one browser for the file, a fresh context and page
 * for each test (handed to `use`), and the test fails on any console error it caused.
 */
export function useBrowserPage(use: (page: Page) => void, contextOptions: BrowserContextOptions = {}) {
  let browser: Browser
  let close: () => Promise<void>
  let page: Page
  let problems: () => string[]
  beforeAll(async () => {
    ;({ browser, close } = await launchBrowser())
  })
  afterAll(async () => {
    await close?.()
  })
  beforeEach(async () => {
    const context = await browser.newContext(contextOptions)
    page = await context.newPage()
    problems = watchConsole(page)
    use(page)
  })
  afterEach(async () => {
    await page.context().close()
    expect(problems()).toEqual([])
  })
}
