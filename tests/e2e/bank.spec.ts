/**
 * The problem bank in Chromium: an instructor writes a problem in the editor, sees its
 * variants previewed live, saves it, checks it over many variants through the job queue,
 * exports it and imports the document again.
 */
import fs from 'node:fs'
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople, demoStudents } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p), { acceptDownloads: true })

const field = (path: string) => page.locator(`[name="${path}"]`)

test('an instructor writes a problem, previews it, checks it, exports it and imports it again', async () => {
  const title = `Carnot efficiency drill ${Date.now()}`
  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Problem bank' }).click()
  await page.waitForURL(`${baseURL}/bank`)
  await page.getByRole('link', { name: 'New problem' }).click()
  await page.waitForURL(`${baseURL}/bank/new`)

  await field('title').fill(title)
  await field('tags.topics').fill('carnot, second law')
  await field('prompt').fill(
    'A reversible engine runs between $T_H = $ [Th] and a cold reservoir at 300 K. What is its efficiency?',
  )
  await field('givens.0.name').fill('Th')
  await field('givens.0.label').fill('hot reservoir temperature')
  await field('givens.0.unit').fill('K')
  await field('givens.0.rule.kind').selectOption('range')
  await field('givens.0.rule.min').fill('500')
  await field('givens.0.rule.max').fill('900')
  await field('givens.0.rule.step').fill('50')
  await field('physics.template').selectOption('carnot-engine')
  await field('physics.inputs.gas').waitFor()
  await field('physics.inputs.gas').fill('monatomic')
  await field('physics.inputs.amount').fill('1 mol')
  await field('physics.inputs.Th').fill('Th')
  await field('physics.inputs.Tc').fill('300 K')
  await field('physics.inputs.p1').fill('1000 kPa')
  await field('physics.inputs.expansionRatio').fill('2')
  await field('finds.0.name').fill('eta')
  await field('finds.0.label').fill('Thermal efficiency')
  await field('finds.0.source.kind').selectOption('output')
  await field('finds.0.source.path').fill('totals.efficiency')
  await field('finds.0.unit').fill('')
  await field('finds.0.points').fill('2')
  await field('finds.0.tolerance.kind').selectOption('relative')
  await field('finds.0.tolerance.value').fill('0.01')

  // The live preview draws the seeded variants while the author types.
  const preview = page.locator('#preview')
  await preview
    .getByRole('heading', { name: /seed 1/ })
    .first()
    .waitFor({ timeout: 30_000 })
  await expect.poll(() => preview.getByText('Thermal efficiency').count(), { timeout: 30_000 }).toBeGreaterThan(0)

  await page.getByRole('button', { name: 'Save' }).click()
  await page.getByRole('heading', { level: 1, name: title }).waitFor()
  expect(page.url()).toMatch(/\/bank\/\d+$/)
  const problemId = Number(new URL(page.url()).pathname.split('/').pop())

  // The key of each previewed variant is the Carnot efficiency 1 − Tc/Th of its own givens
  // (common practice: the Carnot efficiency of reversible engines).
  const [version] = await e2eQuery<{ definition: { givens: { name: string }[] } }>(
    'select definition from problem_versions where problem_id = $1',
    [problemId],
  )
  expect(version!.definition.givens[0]!.name).toBe('Th')
  const columns = page.locator('[data-variant-seed]')
  expect(await columns.count()).toBe(3)
  for (let i = 0; i < 3; i++) {
    const text = (await columns.nth(i).textContent()) ?? ''
    const th = Number(text.match(/Th\s*(\d+)\s*K/)?.[1])
    const eta = Number(text.match(/eta\s*(0\.\d+)/)?.[1])
    expect(th).toBeGreaterThanOrEqual(500)
    expect(eta).toBeCloseTo(1 - 300 / th, 3)
  }
  expect(await page.locator('svg[role="img"]').count()).toBeGreaterThanOrEqual(6)

  // Check it over 50 variants in the background queue; the page follows the progress.
  await page.getByLabel('Variants to check').fill('50')
  await page.getByRole('button', { name: 'Check this version' }).click()
  await page.getByText('All 50 variants are physical.').waitFor({ timeout: 60_000 })

  // Export this problem, then import the document again.
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: 'Export', exact: true }).click(),
  ])
  const file = await download.path()
  const doc = JSON.parse(fs.readFileSync(file, 'utf8')) as {
    format: string
    version: number
    problems: { definition: { title: string } }[]
  }
  expect(doc.format).toBe('cyclewright-bank')
  expect(doc.version).toBe(2)
  expect(doc.problems.map((p) => p.definition.title)).toEqual([title])

  await page.goto(`${baseURL}/bank/import`)
  await page
    .getByLabel('Bank document')
    .setInputFiles({ name: 'bank.json', mimeType: 'application/json', buffer: fs.readFileSync(file) })
  await page.getByRole('button', { name: 'Import' }).click()
  await page.waitForURL(/\/bank\?imported=1/)
  await page.getByText('Imported 1 problem into your bank').waitFor()
  const copies = await e2eQuery<{ n: number }>('select count(*)::int as n from problems where title = $1', [title])
  expect(copies[0]!.n).toBe(2)
})

test('a document with an invalid problem is refused whole, with the problem and field named', async () => {
  await signIn(page, baseURL, demoPeople.instructors[1]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  const before = await e2eQuery<{ n: number }>('select count(*)::int as n from problems')
  await page.goto(`${baseURL}/bank/import`)
  const bad = {
    format: 'cyclewright-bank',
    version: 1,
    exportedAt: new Date().toISOString(),
    problems: [{ title: 'Broken', definition: { format: 1, title: 'Broken' } }],
  }
  await page
    .getByLabel('Bank document')
    .setInputFiles({ name: 'broken.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(bad)) })
  await page.getByRole('button', { name: 'Import' }).click()
  const alert = page.getByRole('alert')
  await alert.waitFor()
  expect(await alert.textContent()).toContain('Nothing was imported')
  expect(await alert.textContent()).toContain('Problem 1 (Broken)')
  const after = await e2eQuery<{ n: number }>('select count(*)::int as n from problems')
  expect(after[0]!.n).toBe(before[0]!.n)
})

test('students cannot open the bank', async () => {
  await signIn(page, baseURL, demoStudents()[2]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Problem bank' }).count()).toBe(
    0,
  )
  const res = await page.goto(`${baseURL}/bank`)
  expect(res?.status()).toBe(403)
  const api = await page.goto(`${baseURL}/api/problems`)
  expect(api?.status()).toBe(403)
})
