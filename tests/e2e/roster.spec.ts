/**
 * A roster in Chromium, on a phone-sized screen: an instructor uploads a class list with one
 * bad row, sees what is wrong with it, fixes it in the box and imports; sees the new
 * students and their invitations waiting, revokes one (its link then says it was withdrawn),
 * and drops a student, who moves to the dropped list with a way back.
 *
 * The journey uses a course of its own, so the demo courses other files rely on are untouched.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p), { viewport: { width: 390, height: 844 } })

/** The page itself never scrolls sideways; wide tables scroll inside their own box. */
async function expectNoSidewaysScroll() {
  const widths = await page.evaluate(() => ({
    page: document.documentElement.scrollWidth,
    screen: window.innerWidth,
    // the outermost elements reaching past the right edge, to name in a failure
    wide: [...document.querySelectorAll('body *')]
      .filter((el) => el.getBoundingClientRect().right > window.innerWidth + 1 && !el.closest('.overflow-x-auto'))
      .slice(0, 8)
      .map((el) => `${el.tagName.toLowerCase()}.${el.className}`),
  }))
  expect(widths.page, `too wide: ${widths.wide.join(' | ')}`).toBeLessThanOrEqual(widths.screen)
}

test('an instructor imports a class list, fixes a bad row, revokes an invitation and drops a student', async () => {
  const k = Date.now().toString(36)
  const instructor = demoPeople.instructors[0]!
  const [course] = await e2eQuery<{ id: number }>(
    `insert into courses (department_id, term_id, code, title, time_zone, sign_convention)
       select department_id, term_id, $1, 'Roster journey', time_zone, sign_convention from courses where code = 'ENTH 210' limit 1
     returning id`,
    [`RST ${k}`],
  )
  await e2eQuery(
    `insert into memberships (user_id, course_id, role) select id, $1, 'instructor' from users where email = $2`,
    [course!.id, instructor.email],
  )

  await signIn(page, baseURL, instructor.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${course!.id}/people`)
  await page.getByText('No students yet. Import a class list, or invite them one at a time.').waitFor()
  await page.getByRole('link', { name: 'Import a class list' }).click()
  await page.getByRole('heading', { level: 1, name: 'Import a class list' }).waitFor()

  const csv = [
    'Student ID;Family name;Given name;E-mail;Section',
    `R${k}1;Abara;Chidi;chidi.${k}@students.example;Lab 1`,
    `R${k}2;Lindqvist;Maja;maja.${k}-at-students.example;Lab 1`,
    `R${k}3;Serrano;Tomás;tomas.${k}@students.example;Lab 2`,
  ].join('\r\n')
  await page
    .getByLabel('CSV file')
    .setInputFiles({ name: 'class-list.csv', mimeType: 'text/csv', buffer: Buffer.from(`\uFEFF${csv}\r\n`, 'utf8') })
  await page.getByRole('button', { name: 'Check the list' }).click()
  await page.getByRole('heading', { name: 'Rows to fix (1)' }).waitFor()
  const badRow = page.getByRole('row', { name: /Lindqvist/ })
  await badRow.getByText('The e-mail address is not valid', { exact: false }).waitFor()
  // Nothing is offered to import while a row is wrong, and nothing was written.
  expect(await page.getByRole('button', { name: /^Import \d+ student/ }).count()).toBe(0)
  expect(
    await e2eQuery('select 1 from memberships where course_id = $1 and role = $2', [course!.id, 'student']),
  ).toHaveLength(0)
  await expectNoSidewaysScroll()

  // Fix the row in the box that holds the list, and check again.
  const box = page.getByLabel('Or paste the class list')
  const text = await box.inputValue()
  expect(text).toContain(`maja.${k}-at-students.example`)
  await box.fill(text.replace(`maja.${k}-at-students.example`, `maja.${k}@students.example`))
  await page.getByRole('button', { name: 'Check the list' }).click()
  await page.getByRole('heading', { name: 'Rows ready (3)' }).waitFor()
  expect(await page.getByRole('heading', { name: /Rows to fix/ }).count()).toBe(0)
  await page.getByText('New sections: Lab 1, Lab 2.', { exact: false }).waitFor()
  await page.getByRole('button', { name: 'Import 3 students' }).click()

  await page.waitForURL(/\/people\?imported=3/)
  await page.getByText('Class list imported: 3 students added, 0 updated, 3 invitations sent.').waitFor()
  const roster = page.getByRole('table', { name: `People in RST ${k}` })
  for (const name of ['Chidi Abara', 'Maja Lindqvist', 'Tomás Serrano'])
    await roster.getByRole('rowheader', { name: new RegExp(name) }).waitFor()
  await page.getByRole('heading', { name: 'Invitations not yet accepted (3)' }).waitFor()
  await expectNoSidewaysScroll()

  // Revoke Tomás's invitation; the link then says it was withdrawn.
  await page.getByRole('button', { name: `Revoke the invitation to tomas.${k}@students.example` }).click()
  await page.getByText(`The invitation to tomas.${k}@students.example was revoked; its link no longer works.`).waitFor()
  await page.getByRole('heading', { name: 'Invitations not yet accepted (2)' }).waitFor()
  const [revoked] = await e2eQuery<{ token: string; revoked: boolean }>(
    `select token, revoked_at is not null as revoked from access_tokens where email = $1`,
    [`tomas.${k}@students.example`],
  )
  expect(revoked?.revoked).toBe(true)

  // Drop Maja: she moves to the dropped list with an undo.
  await page.getByRole('button', { name: 'Drop Maja Lindqvist' }).click()
  await page.getByText('Maja Lindqvist was dropped. Their answers are kept.').waitFor()
  await page.getByRole('heading', { name: 'Dropped students (1)' }).waitFor()
  await page
    .getByRole('table', { name: `Students dropped from RST ${k}` })
    .getByRole('button', { name: 'Undo drop Maja Lindqvist' })
    .waitFor()
  expect(await roster.getByRole('rowheader', { name: /Maja Lindqvist/ }).count()).toBe(0)
  const [m] = await e2eQuery<{ dropped: boolean }>(
    `select m.dropped_at is not null as dropped from memberships m join users u on u.id = m.user_id where m.course_id = $1 and u.email = $2`,
    [course!.id, `maja.${k}@students.example`],
  )
  expect(m?.dropped).toBe(true)

  // The sections the list named were set up, and fit the screen too.
  await page.getByRole('link', { name: 'Sections (2)' }).click()
  await page.getByRole('heading', { level: 2, name: /Lab 1 · 1 student/ }).waitFor()
  await expectNoSidewaysScroll()

  // The withdrawn link, opened by the student.
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)
  await page.goto(`${baseURL}/join/${revoked!.token}`)
  await page.getByText('This invitation was withdrawn by the course staff, so the link no longer works.').waitFor()
})
