/**
 * The assignment picker in Chromium (issue #15): the instructor picks a version whose check
 * passed, adds a second problem whose version was never checked, is refused with the reason
 * beside it, ticks the override that names the reason, and the assignment is saved with the
 * override in the audit log. On a 390 px wide phone the choices fit the screen.
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

test('a checked version is taken; an unchecked one is refused until the override is ticked, which is audited', async () => {
  const instructorEmail = demoPeople.instructors[0]!.email
  const [course] = await e2eQuery<{ id: number; instructor_id: number }>(
    `select m.course_id as id, u.id as instructor_id from memberships m join users u on u.id = m.user_id where u.email = $1 and m.role = 'instructor' order by m.course_id limit 1`,
    [instructorEmail],
  )
  expect(course, 'a demo course of the instructor').toBeTruthy()
  const [source] = await e2eQuery<{ problem_id: number; version_id: number }>(
    'select problem_id, id as version_id from problem_versions order by id limit 1',
  )
  const stamp = Date.now().toString(36)
  // Two problems of the instructor's, set up directly: one whose version passed its check, one never checked.
  const make = async (title: string) => {
    const [p] = await e2eQuery<{ id: number }>(
      `insert into problems (owner_id, title, cycle, topics, difficulty, level) select $1, $2, cycle, topics, difficulty, level from problems where id = $3 returning id`,
      [course!.instructor_id, title, source!.problem_id],
    )
    const [v] = await e2eQuery<{ id: number }>(
      `insert into problem_versions (problem_id, number, definition, created_by) select $1, 1, definition, $2 from problem_versions where id = $3 returning id`,
      [p!.id, course!.instructor_id, source!.version_id],
    )
    return { problemId: p!.id, versionId: v!.id }
  }
  const checkedTitle = `Checked drill ${stamp}`
  const uncheckedTitle = `Unchecked drill ${stamp}`
  const checked = await make(checkedTitle)
  const unchecked = await make(uncheckedTitle)
  await e2eQuery(
    `insert into problem_sweeps (problem_version_id, requested_by, status, total, checked, failed) values ($1, $2, 'done', 500, 500, 0)`,
    [checked.versionId, course!.instructor_id],
  )

  await signIn(page, baseURL, instructorEmail, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${course!.id}/assignments/new`)
  const title = `Picker drill ${stamp}`
  await page.getByLabel('Title').fill(title)

  const row1 = page.locator('#af-items-0-versionId')
  const checkedRadio = row1.getByRole('radio', {
    name: new RegExp(`^${escape(checkedTitle)}, Version 1 .*Checked: 500 of 500 variants passed`),
  })
  await checkedRadio.check()
  // Each version links to its preview in the bank.
  expect(await row1.getByRole('link', { name: `Preview ${checkedTitle}, version 1` }).getAttribute('href')).toBe(
    `/bank/${checked.problemId}?version=1`,
  )
  await page.getByRole('button', { name: 'Add a problem' }).click()

  const row2 = page.locator('#af-items-1-versionId')
  await row2.waitFor()
  await row2.getByRole('radio', { name: new RegExp(`^${escape(uncheckedTitle)}, Version 1 .*Never checked`) }).check()
  await page.getByRole('button', { name: 'Create assignment' }).click()

  // Refused, with the reason beside the field; what was typed is still there.
  await page
    .getByText(
      'Never checked. Choose a version whose check passed, or tick “Assign although the version was never checked” to assign it anyway.',
      { exact: true },
    )
    .first()
    .waitFor()
  expect(page.url()).toContain('/assignments/new')
  expect(await page.getByLabel('Title').inputValue()).toBe(title)
  expect(await e2eQuery('select id from assignments where title = $1', [title])).toEqual([])
  // The passed version needs no override; only the unchecked row offers one.
  const override = page.getByRole('checkbox', { name: 'Assign although the version was never checked' })
  expect(await override.count()).toBe(1)
  await override.check()
  await page.getByRole('button', { name: 'Create assignment' }).click()
  await page.waitForURL(/\/assignments\/\d+$/)

  const [saved] = await e2eQuery<{ id: number }>('select id from assignments where title = $1', [title])
  expect(saved).toBeTruthy()
  const items = await e2eQuery<{ problem_version_id: number }>(
    'select problem_version_id from assignment_items where assignment_id = $1 order by position',
    [saved!.id],
  )
  expect(items.map((i) => i.problem_version_id)).toEqual([checked.versionId, unchecked.versionId])
  const audit = await e2eQuery<{ after: unknown }>(
    `select after from audit_events where assignment_id = $1 and kind = 'assignment-check-overridden'`,
    [saved!.id],
  )
  expect(audit).toEqual([
    { after: { items: [{ position: 2, versionId: unchecked.versionId, check: 'Never checked' }] } },
  ])

  // On a phone the choices fit: the radio rows and the preview links end within 390 px.
  await page.setViewportSize({ width: 390, height: 844 })
  await page.goto(`${baseURL}/courses/${course!.id}/assignments/new`)
  const phoneRow = page.locator('#af-items-0-versionId')
  const radio = phoneRow.getByRole('radio', { name: new RegExp(`^${escape(checkedTitle)}, Version 1 `) })
  await radio.waitFor()
  const preview = phoneRow.getByRole('link', { name: `Preview ${checkedTitle}, version 1` })
  const box = await preview.boundingBox()
  expect(box, 'the preview link is laid out').toBeTruthy()
  expect(box!.x + box!.width).toBeLessThanOrEqual(390)
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
})
