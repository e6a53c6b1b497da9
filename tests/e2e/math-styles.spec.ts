/**
 * Math is typeset once: every page that renders KaTeX has its stylesheet (linked once from the
 * root), so the MathML copy KaTeX writes for screen readers is visually hidden and only the
 * typeset HTML shows. Checked on the assignment page with math in its instructions and on a
 * student's problem page; and the header shows our mark, named "Cyclewright", with the same
 * drawing as the favicon.
 */
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { demoProblem, freshStudent } from '#tests/support/e2e-assignments.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p))

const TITLE = 'Week 11: Rankine cycles'
let original: string | null = null

beforeAll(async () => {
  const [row] = await e2eQuery<{ instructions: string | null }>(
    'select instructions from assignments where title = $1',
    [TITLE],
  )
  original = row?.instructions ?? null
  await e2eQuery('update assignments set instructions = $2 where title = $1', [
    TITLE,
    `${original ?? ''}\n\nThe efficiency is $\\eta = W_{\\text{net}}/Q_{\\text{in}}$.`,
  ])
})

afterAll(async () => {
  await e2eQuery('update assignments set instructions = $2 where title = $1', [TITLE, original])
})

/** How the first .katex-mathml under `scope` is laid out: hidden by the stylesheet, or not. */
async function mathmlStyle(scope: string) {
  const mathml = page.locator(`${scope} .katex-mathml`).first()
  await mathml.waitFor({ state: 'attached' })
  return mathml.evaluate((el) => {
    const s = getComputedStyle(el)
    const r = el.getBoundingClientRect()
    return { position: s.position, clipPath: s.clipPath, overflow: s.overflow, width: r.width, height: r.height }
  })
}

function expectHidden(style: Awaited<ReturnType<typeof mathmlStyle>>) {
  expect(style.position).toBe('absolute')
  // KaTeX 0.16 hides it with clip-path: inset(50%) in a 1 px absolute box.
  expect(style.clipPath).toBe('inset(50%)')
  expect(style.overflow).toBe('hidden')
  expect(style.width).toBeLessThanOrEqual(1)
  expect(style.height).toBeLessThanOrEqual(1)
}

test('the assignment page typesets the math in its instructions once', async () => {
  const ref = await demoProblem(TITLE, 1)
  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${ref.courseId}/assignments/${ref.assignmentId}`)
  await page.locator('.prompt-html .katex').first().waitFor()
  expectHidden(await mathmlStyle('.prompt-html'))
  // The typeset copy is visible.
  const html = await page.locator('.prompt-html .katex-html').first().boundingBox()
  expect(html?.width ?? 0).toBeGreaterThan(20)
  // The stylesheet comes from the root, once.
  const sheets = await page.evaluate(() =>
    [...document.querySelectorAll('link[rel="stylesheet"]')].map((l) => (l as HTMLLinkElement).href),
  )
  expect(new Set(sheets).size).toBe(sheets.length)
})

test("a student's problem page typesets its prompt once", async () => {
  const ref = await demoProblem('Week 6: Otto and Diesel cycles', 1)
  const student = await freshStudent(ref)
  await signIn(page, baseURL, student.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${ref.courseId}/assignments/${ref.assignmentId}/problems/1`)
  expectHidden(await mathmlStyle('main'))
})

test('the header shows our mark, named Cyclewright, and the favicon is the same mark', async () => {
  await page.goto(`${baseURL}/sign-in`)
  const mark = page.getByRole('banner').getByRole('img', { name: 'Cyclewright' })
  await mark.waitFor()
  expect(await mark.evaluate((el) => el.tagName.toLowerCase())).toBe('svg')
  expect(await page.getByRole('banner').getByRole('link', { name: 'Cyclewright' }).count()).toBe(1)
  expect(await page.getByRole('banner').textContent()).not.toMatch(/[⟳↻]/)
  const icon = await page.locator('link[rel="icon"]').getAttribute('href')
  expect(icon).toBe('/favicon.svg')
  const res = await page.request.get(`${baseURL}${icon}`)
  expect(res.status()).toBe(200)
  expect(await res.text()).toContain('<title>Cyclewright</title>')
})
