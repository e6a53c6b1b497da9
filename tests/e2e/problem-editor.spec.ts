/**
 * The problem editor's layout and row controls in Chromium, 1400 px wide: the preview sits
 * beside the form and stays in view while the form scrolls; "Insert a given" puts the
 * placeholder at the prompt's cursor (by mouse and by keyboard); "Remove" takes its row
 * away at once, names the row, and the rows left are renumbered; empty rows show hints,
 * never values.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p), { viewport: { width: 1400, height: 900 } })

const field = (path: string) => page.locator(`[name="${path}"]`)

async function openNewProblem() {
  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/bank/new`)
  // Hydrated: the live preview's note replaces the "press Preview" one.
  await page.getByText('updated as you type').waitFor()
}

test('at 1400 px the preview is beside the form and stays in view while the form scrolls', async () => {
  await openNewProblem()
  const form = (await page.locator('#problem-form').boundingBox())!
  const preview = (await page.locator('#preview').boundingBox())!
  expect(preview.x).toBeGreaterThanOrEqual(form.x + form.width)
  expect(Math.abs(preview.y - form.y)).toBeLessThan(40)
  expect(form.width).toBeGreaterThan(600)
  // Wider than the page column (1152 px): the editor uses the window's width.
  expect(preview.x + preview.width - form.x).toBeGreaterThan(1250)
  await page.getByRole('button', { name: 'Add a find' }).scrollIntoViewIfNeeded()
  const after = (await page.locator('#preview').boundingBox())!
  expect(after.y).toBeGreaterThanOrEqual(0)
  expect(after.y).toBeLessThan(100)
  expect(after.x).toBe(preview.x)
})

test('empty rows show hints, not values; Insert a given puts [T1] at the cursor; Remove takes its row away', async () => {
  await openNewProblem()
  expect(await field('givens.0.name').inputValue()).toBe('')
  expect(await field('givens.0.name').getAttribute('placeholder')).toBe('e.g. T1')
  expect(await field('finds.0.points').inputValue()).toBe('')

  await field('givens.0.name').fill('T1')
  await field('givens.0.label').fill('intake temperature')
  await field('givens.0.unit').fill('K')
  const insertT1 = page.getByRole('button', { name: /^Insert \[T1\]/ })
  await insertT1.waitFor({ timeout: 15_000 })

  const prompt = field('prompt')
  await prompt.fill('Air at  enters.')
  await prompt.focus()
  await prompt.evaluate((el: HTMLTextAreaElement) => el.setSelectionRange(7, 7))
  await insertT1.click()
  expect(await prompt.inputValue()).toBe('Air at [T1] enters.')
  // The focus is back in the prompt, just after the placeholder: typing goes on from there.
  await page.keyboard.type(' (dry)')
  expect(await prompt.inputValue()).toBe('Air at [T1] (dry) enters.')
  // By keyboard: the list's button takes Enter.
  await prompt.evaluate((el: HTMLTextAreaElement) => el.setSelectionRange(el.value.length, el.value.length))
  await insertT1.focus()
  await page.keyboard.press('Enter')
  expect(await prompt.inputValue()).toBe('Air at [T1] (dry) enters.[T1]')

  // A second given, through the server's "Add a given".
  await page.getByRole('button', { name: 'Add a given' }).click()
  await field('givens.1.name').waitFor()
  await expect.poll(() => field('givens.0.name').inputValue()).toBe('T1')
  await field('givens.1.name').fill('p1')
  await field('givens.1.label').fill('intake pressure')
  expect(await field('prompt').inputValue()).toBe('Air at [T1] (dry) enters.[T1]')

  const remove = page.getByRole('button', { name: 'Remove given T1' })
  expect(await remove.textContent()).toBe('Remove')
  expect(await remove.getAttribute('type')).toBe('submit')
  const url = page.url()
  await remove.click()
  await expect.poll(() => field('givens.0.name').inputValue()).toBe('p1')
  expect(await field('givens.0.label').inputValue()).toBe('intake pressure')
  expect(await page.getByRole('button', { name: 'Remove given T1' }).count()).toBe(0)
  expect(await page.getByRole('button', { name: 'Remove given p1' }).count()).toBe(1)
  // At once, in the page: no round trip, and what was typed elsewhere stays.
  expect(page.url()).toBe(url)
  expect(await field('prompt').inputValue()).toBe('Air at [T1] (dry) enters.[T1]')
  expect(await page.evaluate(() => document.activeElement?.id)).toBe(
    await page.locator('section[aria-labelledby="givens-title"]').getAttribute('id'),
  )
  // The list beside the prompt follows the givens.
  await page.getByRole('button', { name: /^Insert \[p1\]/ }).waitFor({ timeout: 15_000 })
  await expect.poll(() => page.getByRole('button', { name: /^Insert \[T1\]/ }).count(), { timeout: 15_000 }).toBe(0)
})
