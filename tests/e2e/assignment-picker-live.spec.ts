/**
 * The assignment picker follows a check that is still running (GET /api/versions/:versionId/check):
 * the instructor opens the new-assignment page while a version's check runs, the check
 * finishes in the database, and the version's badge changes to the result without a reload,
 * inside a polite live region.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p))

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')

test('a running check turns into its result on the open page', async () => {
  const instructorEmail = demoPeople.instructors[0]!.email
  const [course] = await e2eQuery<{ id: number; instructor_id: number }>(
    `select m.course_id as id, u.id as instructor_id from memberships m join users u on u.id = m.user_id where u.email = $1 and m.role = 'instructor' order by m.course_id limit 1`,
    [instructorEmail],
  )
  expect(course, 'a demo course of the instructor').toBeTruthy()
  const [source] = await e2eQuery<{ problem_id: number; version_id: number }>(
    'select problem_id, id as version_id from problem_versions order by id limit 1',
  )
  const title = `Running drill ${Date.now().toString(36)}`
  const [p] = await e2eQuery<{ id: number }>(
    `insert into problems (owner_id, title, cycle, topics, difficulty, level) select $1, $2, cycle, topics, difficulty, level from problems where id = $3 returning id`,
    [course!.instructor_id, title, source!.problem_id],
  )
  const [v] = await e2eQuery<{ id: number }>(
    `insert into problem_versions (problem_id, number, definition, created_by) select $1, 1, definition, $2 from problem_versions where id = $3 returning id`,
    [p!.id, course!.instructor_id, source!.version_id],
  )
  const [sweep] = await e2eQuery<{ id: number }>(
    `insert into problem_sweeps (problem_version_id, requested_by, status, total, checked, failed) values ($1, $2, 'running', 500, 40, 0) returning id`,
    [v!.id, course!.instructor_id],
  )

  await signIn(page, baseURL, instructorEmail, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${course!.id}/assignments/new`)
  const row = page.locator('#af-items-0-versionId')
  const named = (words: string) =>
    row.getByRole('radio', { name: new RegExp(`^${escape(title)}, Version 1 .*${words}`) })
  await named('Check running: 40 of 500 variants so far').waitFor()
  const badge = row.locator('li', { has: page.getByRole('radio', { name: new RegExp(`^${escape(title)},`) }) })
  expect(await badge.locator('[aria-live="polite"]').count()).toBe(1)

  await e2eQuery(`update problem_sweeps set status = 'done', checked = 500, finished_at = now() where id = $1`, [
    sweep!.id,
  ])
  await named('Checked: 500 of 500 variants passed').waitFor({ timeout: 15_000 })
  expect(await badge.locator('[aria-live="polite"]').textContent()).toContain('Checked: 500 of 500 variants passed')
})
