/**
 * The problem editor's sense and pitfall choices in Chromium: a work find offers the sign
 * pitfall, an efficiency does not; the °C-for-K pitfall appears only once a given in °C
 * reaches the solver; a question saying "work done by the air" with no sense stated is
 * warned about (and the warning goes once the sense is stated), and the sense is saved.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p))

const field = (path: string) => page.locator(`[name="${path}"]`)
const pitfallBox = (find: number, id: string) => page.locator(`input[name="finds.${find}.pitfalls"][value="${id}"]`)

test('the editor offers only pitfalls that can fire, warns when the words and the sign disagree, and saves the sense', async () => {
  const title = `Otto net work by the air ${Date.now()}`
  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/bank/new`)

  await field('title').fill(title)
  await field('prompt').fill('Air enters an Otto engine at [T1]. Find the net work.')
  await field('givens.0.name').fill('T1')
  await field('givens.0.label').fill('intake temperature')
  await field('givens.0.unit').fill('K')
  await field('givens.0.rule.kind').selectOption('range')
  await field('givens.0.rule.min').fill('290')
  await field('givens.0.rule.max').fill('310')
  await field('givens.0.rule.step').fill('5')
  await field('physics.template').selectOption('otto')
  await field('physics.inputs.gas').waitFor()
  await field('physics.inputs.gas').fill('air')
  await field('physics.inputs.p1').fill('100 kPa')
  await field('physics.inputs.T1').fill('T1')
  await field('physics.inputs.compressionRatio').fill('8')
  await field('physics.inputs.heatIn').fill('800 kJ/kg')
  await field('finds.0.name').fill('wnet')
  await field('finds.0.label').fill('Work done by the air (positive)')
  await field('finds.0.source.kind').selectOption('output')
  await field('finds.0.source.path').fill('totals.netWork')
  await field('finds.0.unit').fill('kJ/kg')
  await field('finds.0.points').fill('2')
  await field('finds.0.tolerance.kind').selectOption('relative')
  await field('finds.0.tolerance.value').fill('0.01')

  // The question says "by the air"; with no sense a chemistry-convention course keys it negative.
  const warning = page.locator('#' + (await field('finds.0.sense').getAttribute('id'))! + '-warning')
  await expect
    .poll(() => warning.textContent(), { timeout: 15_000 })
    .toMatch(/in a chemistry-convention course the key is the work done on the system/)
  // No °C reaches the solver: that pitfall is not offered; the sign one is, for the net work.
  await expect.poll(() => pitfallBox(0, 'sign-convention-flipped').count(), { timeout: 15_000 }).toBe(1)
  expect(await pitfallBox(0, 'celsius-for-kelvin').count()).toBe(0)

  // A given in °C that reaches the solver brings the pitfall back.
  await field('givens.0.unit').fill('degC')
  await field('givens.0.rule.min').fill('17')
  await field('givens.0.rule.max').fill('37')
  await expect.poll(() => pitfallBox(0, 'celsius-for-kelvin').count(), { timeout: 15_000 }).toBe(1)

  await field('finds.0.sense').selectOption('work-by-system')
  await expect.poll(() => warning.count(), { timeout: 15_000 }).toBe(0)
  await pitfallBox(0, 'sign-convention-flipped').check()

  await page.getByRole('button', { name: 'Save' }).click()
  await page.getByRole('heading', { level: 1, name: title }).waitFor()
  const problemId = Number(new URL(page.url()).pathname.split('/').pop())
  const [version] = await e2eQuery<{ definition: { finds: { sense?: string; pitfalls: string[] }[] } }>(
    'select definition from problem_versions where problem_id = $1',
    [problemId],
  )
  expect(version!.definition.finds[0]!.sense).toBe('work-by-system')
  expect(version!.definition.finds[0]!.pitfalls).toEqual(['sign-convention-flipped'])
})
