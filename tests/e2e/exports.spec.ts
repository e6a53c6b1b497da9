/**
 * The instructor downloads the course gradebook as XLSX from the gradebook page; the
 * workbook, read back with exceljs, has the page's students in the page's order and the
 * totals the page shows, under the sentence that says which assignments count.
 */
import fs from 'node:fs/promises'
import os from 'node:os'
import path from 'node:path'
import ExcelJS from 'exceljs'
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { demoProblem } from '#tests/support/e2e-assignments.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p), { acceptDownloads: true })

test('the instructor downloads the XLSX, and it holds the totals the page shows', async () => {
  const ref = await demoProblem('Week 9: Gas turbines', 2)
  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${ref.courseId}/gradebook`)
  await page.getByTestId('counting-rule').getByText('Totals count only assignments whose due date has passed').waitFor()

  const rows = page.locator('table tbody tr')
  const onScreen = await rows.evaluateAll((trs) =>
    trs.map((tr) => {
      const cells = [...tr.querySelectorAll('td')]
      return { name: tr.querySelector('th a')?.textContent ?? '', total: cells[cells.length - 2]?.textContent ?? '' }
    }),
  )
  expect(onScreen.length).toBeGreaterThan(0)

  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: 'Download XLSX' }).click(),
  ])
  expect(download.suggestedFilename()).toMatch(/-grades-\d{4}-\d{2}-\d{2}\.xlsx$/)
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), 'cw-xlsx-'))
  try {
    const file = path.join(dir, download.suggestedFilename())
    await download.saveAs(file)
    const workbook = new ExcelJS.Workbook()
    await workbook.xlsx.readFile(file)
    const sheet = workbook.getWorksheet('Grades')!
    expect(sheet.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 })
    const header = (sheet.getRow(1).values as unknown[]).slice(1)
    expect(header.slice(0, 5)).toEqual(['Student ID', 'Family name', 'Given name', 'E-mail', 'Section'])
    const totalColumn = header.findIndex((h) => typeof h === 'string' && h.startsWith('Total (')) + 1
    expect(totalColumn).toBeGreaterThan(5)
    const inFile: { name: string; total: unknown }[] = []
    for (let r = 2; r <= sheet.rowCount; r++) {
      const row = sheet.getRow(r)
      const family = String(row.getCell(2).value ?? '')
      const given = String(row.getCell(3).value ?? '')
      inFile.push({ name: given ? `${family}, ${given}` : family, total: row.getCell(totalColumn).value })
    }
    // Numbers as numbers, the same figures as on the page, in the same order.
    for (const r of inFile) expect(typeof r.total).toBe('number')
    expect(inFile.map((r) => ({ name: r.name, total: String(r.total) }))).toEqual(
      onScreen.map((r) => ({ name: r.name, total: r.total.trim() })),
    )
  } finally {
    await fs.rm(dir, { recursive: true, force: true })
  }
})
