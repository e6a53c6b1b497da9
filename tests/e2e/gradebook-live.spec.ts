/**
 * With JavaScript on, an instructor's gradebook follows grading as it happens: a student
 * submits in another browser, and the instructor's table shows the answer being graded and
 * then its score without a reload.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage, watchConsole } from '#tests/support/browser.ts'
import { demoProblem, freshStudent, keyFor } from '#tests/support/e2e-assignments.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p))

test('the instructor’s gradebook shows a new answer graded without a reload', async () => {
  const ref = await demoProblem('Week 9: Gas turbines', 2)
  const student = await freshStudent(ref, [])
  const key = keyFor(ref, student.id)
  const firstFind = ref.definition.finds[0]!

  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(
    `${baseURL}/courses/${ref.courseId}/assignments/${ref.assignmentId}/gradebook?q=${encodeURIComponent(student.email)}&expand=1`,
  )
  // The row by the student's e-mail: the gradebook writes names family name first.
  const row = page.getByRole('row', { name: new RegExp(student.email.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')) })
  await row.waitFor()
  // A mark on the window: it survives only if the page is never reloaded.
  await page.evaluate(() => ((window as unknown as { stayedHere: boolean }).stayedHere = true))

  // The student answers in a browser of their own, with JavaScript on too.
  const context = await page.context().browser()!.newContext()
  const studentPage = await context.newPage()
  const studentProblems = watchConsole(studentPage)
  await signIn(studentPage, baseURL, student.email, DEMO_PASSWORD)
  await studentPage.waitForURL(`${baseURL}/`)
  await studentPage.goto(`${baseURL}/courses/${ref.courseId}/assignments/${ref.assignmentId}/problems/2`)
  await studentPage.getByLabel(firstFind.label).fill(key[firstFind.name]!.text)
  await studentPage.getByRole('button', { name: 'Submit answers' }).click()
  // In place: the verdict arrives on the student's page without a navigation.
  await studentPage.getByText('Correct').first().waitFor({ timeout: 30_000 })
  await context.close()
  expect(studentProblems()).toEqual([])

  // The instructor's table picks it up by itself: the find shows one attempt, correct.
  await expect.poll(() => row.getByText('1 attempt').count(), { timeout: 30_000, interval: 250 }).toBeGreaterThan(0)
  await row.getByText('✓').first().waitFor()
  expect(await page.evaluate(() => (window as unknown as { stayedHere?: boolean }).stayedHere)).toBe(true)
})
