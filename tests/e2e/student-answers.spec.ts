/**
 * A student answers an assignment problem with JavaScript turned off: the plain form posts,
 * an unreadable answer is refused without using an attempt and stays in the form, good
 * answers are stored with a receipt — also beside a refused one, after a redirect that shows
 * the refusal and keeps every text typed — a double click stores one press, a reload posts
 * nothing, and after a reload the worker's verdicts are shown.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { demoProblem, freshStudent, keyFor } from '#tests/support/e2e-assignments.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p), { javaScriptEnabled: false })

test('with JavaScript off a student submits, is told what could not be read, and sees the verdicts after a reload', async () => {
  const ref = await demoProblem('Week 9: Gas turbines', 1)
  const student = await freshStudent(ref)
  const key = keyFor(ref, student.id)

  await signIn(page, baseURL, student.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${ref.courseId}`)
  await page.getByRole('link', { name: 'Week 9: Gas turbines' }).first().click()
  await page.getByRole('link', { name: ref.definition.title }).click()
  await page.waitForURL(`${baseURL}/courses/${ref.courseId}/assignments/${ref.assignmentId}/problems/1`)

  // Only an unreadable answer: refused, nothing stored, the text kept.
  const t2 = page.getByLabel('Compressor exit temperature')
  await t2.fill('warm-ish')
  await page.getByRole('button', { name: 'Submit answers' }).click()
  await page
    .getByText(/No attempt was used/)
    .first()
    .waitFor()
  expect(await page.getByLabel('Compressor exit temperature').inputValue()).toBe('warm-ish')
  expect(
    await e2eQuery('select id from submissions where item_id = $1 and user_id = $2', [ref.itemId, student.id]),
  ).toHaveLength(0)

  // A right temperature, a net work with the other convention's sign and an unreadable
  // efficiency, sent with a double click: one press is stored (the efficiency is refused and
  // uses no attempt), and the POST redirects to its receipt.
  expect(await page.locator('input[type="hidden"][name="formToken"]').getAttribute('value')).toMatch(
    /^[A-Za-z0-9_-]{21}$/,
  )
  await page.getByLabel('Compressor exit temperature').fill(key.T2!.text)
  await page.getByLabel('Net work per kg of air').fill(`${-Number(key.wNet!.value.toPrecision(6))} kJ/kg`)
  await page.getByLabel('Thermal efficiency').fill('about half')
  await page.getByRole('button', { name: 'Submit answers' }).dblclick()
  await page.waitForURL(/\?receipt=\d+/)
  await page.getByText('Grading in the background. Reload the page to see the result.').waitFor()
  await page.getByText('Some answers were not submitted. They did not use an attempt.').waitFor()
  expect(await page.getByLabel('Net work per kg of air').inputValue()).toBe(
    `${-Number(key.wNet!.value.toPrecision(6))} kJ/kg`,
  )
  expect(await page.getByLabel('Thermal efficiency').inputValue()).toBe('about half')
  expect(await page.getByLabel('Thermal efficiency').getAttribute('aria-invalid')).toBe('true')
  const stored = () =>
    e2eQuery<{ id: number }>('select id from submissions where item_id = $1 and user_id = $2', [ref.itemId, student.id])
  const counted = () =>
    e2eQuery<{ find_name: string; attempt: number }>(
      'select find_name, attempt from part_results where item_id = $1 and user_id = $2 order by find_name',
      [ref.itemId, student.id],
    )
  expect(await stored()).toHaveLength(1)
  expect((await counted()).map((p) => [p.find_name, p.attempt])).toEqual([
    ['T2', 1],
    ['wNet', 1],
  ])
  const receiptUrl = page.url()
  expect(receiptUrl).toContain(`?receipt=${(await stored())[0]!.id}`)

  // A reload of the receipt page is a GET: nothing is posted again.
  await page.reload()
  expect(await stored()).toHaveLength(1)

  // The worker grades it; a reload (a plain GET after the redirect) shows the verdicts.
  await expect
    .poll(
      async () => {
        await page.reload()
        return page.getByText(/Being graded/).count()
      },
      { timeout: 30_000, interval: 500 },
    )
    .toBe(0)
  await page.getByText('Correct').first().waitFor()
  await page.getByText('Incorrect').first().waitFor()
  await page
    .getByText(/wrong sign/)
    .first()
    .waitFor()
  await page
    .getByText(/Attempt 1 of \d+; \d+ left/)
    .first()
    .waitFor()
})
