/**
 * Releasing grades in Chromium: the instructor presses "Release grades…", reads what will
 * happen and to how many, confirms, and the grades are released; a student of the course then
 * finds on their home page what is due next, with its time left.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p))

const DAY = 86_400_000

test('the instructor releases grades through the confirmation; the student’s home page shows what is due', async () => {
  const instructorEmail = demoPeople.instructors[0]!.email
  const [course] = await e2eQuery<{ id: number; instructor_id: number }>(
    `select m.course_id as id, u.id as instructor_id from memberships m join users u on u.id = m.user_id where u.email = $1 and m.role = 'instructor' order by m.course_id limit 1`,
    [instructorEmail],
  )
  expect(course, 'a demo course of the instructor').toBeTruthy()
  const [student] = await e2eQuery<{ email: string }>(
    `select u.email from memberships m join users u on u.id = m.user_id where m.course_id = $1 and m.role = 'student' and m.dropped_at is null order by u.id limit 1`,
    [course!.id],
  )
  const [{ n: students } = { n: 0 }] = await e2eQuery<{ n: number }>(
    `select count(*)::int as n from memberships where course_id = $1 and role = 'student' and dropped_at is null`,
    [course!.id],
  )
  const [item] = await e2eQuery<{ problem_id: number; problem_version_id: number }>(
    'select problem_id, problem_version_id from assignment_items order by id limit 1',
  )
  const stamp = Date.now().toString(36)
  const pastTitle = `Release drill ${stamp}`
  const dueTitle = `Due soon ${stamp}`
  // Set up directly (the assignment form has its own tests): one past due, one due in two days.
  const make = async (title: string, opensAt: Date, dueAt: Date) => {
    const [a] = await e2eQuery<{ id: number }>(
      `insert into assignments (course_id, title, opens_at, due_at, created_by) values ($1, $2, $3, $4, $5) returning id`,
      [course!.id, title, opensAt, dueAt, course!.instructor_id],
    )
    await e2eQuery(
      'insert into assignment_items (assignment_id, position, problem_id, problem_version_id, points) values ($1, 1, $2, $3, 10)',
      [a!.id, item!.problem_id, item!.problem_version_id],
    )
    return a!.id
  }
  const now = Date.now()
  const pastId = await make(pastTitle, new Date(now - 9 * DAY), new Date(now - 2 * DAY))
  await make(dueTitle, new Date(now - DAY), new Date(now + 2 * DAY + 3 * 3600_000))

  // ---- The instructor releases the grades, through the confirmation ----
  await signIn(page, baseURL, instructorEmail, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${course!.id}/assignments/${pastId}`)
  await page.getByRole('button', { name: 'Release grades…' }).click()
  await page.waitForURL(/\?confirm=release-grades/)
  await page
    .getByText(
      `E-mails ${students} student${students === 1 ? '' : 's'} their score for ${pastTitle}; this cannot be undone.`,
    )
    .waitFor()
  // Nothing is released by the first press.
  expect(
    (
      await e2eQuery<{ at: Date | null }>('select grades_released_at as at from assignments where id = $1', [pastId])
    )[0]!.at,
  ).toBeNull()
  await page.getByRole('button', { name: 'Yes, release the grades' }).click()
  await page.waitForURL(/\?done=grades/)
  await page.getByText('The grades are released; students are being e-mailed their scores.').waitFor()
  expect(
    (
      await e2eQuery<{ at: Date | null }>('select grades_released_at as at from assignments where id = $1', [pastId])
    )[0]!.at,
  ).not.toBeNull()
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)

  // ---- The student's home page says what is due ----
  await signIn(page, baseURL, student!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.getByRole('heading', { name: 'Due next' }).waitFor()
  const row = page.locator(`[data-due="${dueTitle}"]`)
  await row.waitFor()
  expect(await row.innerText()).toMatch(/2 days (2|3) hours left · 0 of 10 points so far/)
  expect(await page.locator(`[data-due="${pastTitle}"]`).count()).toBe(0)
})
