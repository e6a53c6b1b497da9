/**
 * A new term and course from start to finish, on a phone-sized screen: the admin adds a term
 * and a course and makes an instructor of it (and invites an address that has no account),
 * the instructor changes the course's settings, copies the course to the new term, and finds
 * the assignment there with its dates moved by the days between the terms' first days.
 */
import type { Page } from 'playwright-core'
import { describe, expect, inject, test } from 'vitest'
import { hashPassword } from '#app/server/passwords.server.ts'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p), { viewport: { width: 390, height: 844 } })

/** Nothing on the page is wider than the phone's screen (tables scroll inside their own box). */
async function fitsThePhone() {
  const width = await page.evaluate(() => document.documentElement.scrollWidth)
  const wider = await page.evaluate(() =>
    [...document.querySelectorAll('body *')]
      .filter((e) => e.getBoundingClientRect().right > 391)
      .slice(-3)
      .map((e) => `${e.tagName}.${String(e.className).slice(0, 40)}: ${(e.textContent ?? '').slice(0, 40)}`),
  )
  expect(
    width,
    `${page.url()} is wider than the phone; the widest elements end in ${wider.join(' | ')}`,
  ).toBeLessThanOrEqual(390)
}

async function signOut() {
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)
}

describe('courses and terms in the browser', () => {
  test(
    'admin adds a term and a course and an instructor; the instructor edits the settings and copies the course to the new term',
    { timeout: 120_000 },
    async () => {
      const stamp = Date.now().toString(36)
      const termName = `Winter 2027 ${stamp}`
      const code = `ENTH 1${stamp.slice(-4)}`
      const title = 'Heat engines'
      // An instructor with an account in the demo department, not yet in any course.
      const instructorEmail = `hedda.${stamp}@kestrel-hollow.example`
      const invitedEmail = `newcomer.${stamp}@kestrel-hollow.example`
      const [dept] = await e2eQuery<{ id: number }>('select department_id as id from users where email = $1', [
        demoPeople.admin.email,
      ])
      await e2eQuery('insert into users (email, name, password_hash, department_id) values ($1, $2, $3, $4)', [
        instructorEmail,
        'Hedda Lindqvist',
        await hashPassword(DEMO_PASSWORD),
        dept!.id,
      ])

      // ---- The admin: a term, a course, an instructor ----
      await signIn(page, baseURL, demoPeople.admin.email, DEMO_PASSWORD)
      await page.waitForURL(`${baseURL}/`)
      await page.goto(`${baseURL}/admin`)
      await page.getByRole('link', { name: 'Terms' }).first().click()
      await page.getByRole('heading', { level: 1, name: 'Terms' }).waitFor()
      await page.getByLabel('Name').fill(termName)
      await page.getByLabel('First day').fill('2027-01-04')
      // A last day before the first is refused beside the field, and nothing is added.
      await page.getByLabel('Last day').fill('2027-01-01')
      await page.getByRole('button', { name: 'Add term' }).click()
      await page.getByText('The last day must come after the first day.').waitFor()
      expect(await page.getByLabel('Last day').getAttribute('aria-invalid')).toBe('true')
      expect(await e2eQuery('select id from terms where name = $1', [termName])).toHaveLength(0)
      await page.getByLabel('Last day').fill('2027-04-30')
      await page.getByRole('button', { name: 'Add term' }).click()
      await page.getByText(`${termName} was added.`).waitFor()
      await fitsThePhone()
      const [winter] = await e2eQuery<{ id: number }>('select id from terms where name = $1', [termName])
      const [autumn] = await e2eQuery<{ id: number }>("select id from terms where name = 'Autumn 2026'")

      await page.goto(`${baseURL}/admin`)
      await page.getByRole('link', { name: 'New course' }).click()
      await page.getByRole('heading', { level: 1, name: 'New course' }).waitFor()
      await page.getByLabel('Term').selectOption(String(autumn!.id))
      await page.getByLabel('Code').fill(code)
      await page.getByLabel('Title').fill(title)
      await page.getByLabel(/Engineering convention/).check()
      await page.getByLabel('Time zone').fill('Atlantis/Lost')
      await page.getByRole('button', { name: 'Create course' }).click()
      await page.getByText('“Atlantis/Lost” is not a time zone we know.', { exact: false }).waitFor()
      expect(await page.getByLabel('Time zone').getAttribute('aria-invalid')).toBe('true')
      expect(await page.getByLabel('Code').inputValue()).toBe(code)
      await page.getByLabel('Time zone').fill('Europe/Oslo')
      await page.getByRole('button', { name: 'Create course' }).click()
      await page.getByText('The course was created.').waitFor()
      await fitsThePhone()
      const [course] = await e2eQuery<{ id: number; department_id: number }>(
        'select id, department_id from courses where code = $1',
        [code],
      )
      expect(course!.department_id).toBe(dept!.id)
      expect(page.url()).toContain(`/admin/courses/${course!.id}`)

      await page.getByLabel('Instructor’s e-mail address').fill(instructorEmail)
      await page.getByRole('button', { name: 'Add instructor' }).click()
      await page.getByText(`Hedda Lindqvist (${instructorEmail}) is now an instructor of this course.`).waitFor()
      await page.getByLabel('Instructor’s e-mail address').fill(invitedEmail)
      await page.getByRole('button', { name: 'Add instructor' }).click()
      await page.getByText(`An invitation to join as instructor was sent to ${invitedEmail}`).waitFor()
      const lastMail = async () =>
        (
          await e2eQuery<{ subject: string }>(
            'select subject from mail_messages where $1 = any(envelope_to) order by id desc limit 1',
            [invitedEmail],
          )
        )[0]
      await expect.poll(lastMail, { timeout: 20_000 }).toBeTruthy()
      expect((await lastMail())!.subject).toBe(`You are invited to ${code} on Cyclewright`)

      // An assignment in the course (set up directly: the assignment form has its own tests), on a demo problem's version.
      const [item] = await e2eQuery<{ problem_id: number; problem_version_id: number }>(
        'select problem_id, problem_version_id from assignment_items order by id limit 1',
      )
      const [instructor] = await e2eQuery<{ id: number }>('select id from users where email = $1', [instructorEmail])
      const [assignment] = await e2eQuery<{ id: number }>(
        `insert into assignments (course_id, title, opens_at, due_at, created_by, key_release, key_released_at)
       values ($1, 'Week 5: engines', '2026-10-05T07:00:00Z', '2026-10-12T21:59:00Z', $2, 'manual', '2026-10-13T08:00:00Z') returning id`,
        [course!.id, instructor!.id],
      )
      await e2eQuery(
        'insert into assignment_items (assignment_id, position, problem_id, problem_version_id, points) values ($1, 1, $2, $3, 10)',
        [assignment!.id, item!.problem_id, item!.problem_version_id],
      )
      // The admin's course page shows its times in the course's zone, and says so.
      await page.reload()
      await page.getByRole('columnheader', { name: 'Due (Europe/Oslo)' }).waitFor()
      await page.getByRole('cell', { name: 'Mon 12 Oct 2026, 23:59' }).waitFor()
      await signOut()

      // ---- The instructor: settings, then the copy ----
      await signIn(page, baseURL, instructorEmail, DEMO_PASSWORD)
      await page.waitForURL(`${baseURL}/`)
      await page
        .getByRole('link', { name: new RegExp(`${code} ${title}`) })
        .first()
        .click()
      await page.getByRole('navigation', { name: 'Course' }).getByRole('link', { name: 'Settings' }).click()
      await page.getByRole('heading', { level: 1, name: 'Course settings' }).waitFor()
      await fitsThePhone()
      await page.getByLabel('Title', { exact: true }).fill(`${title} and refrigerators`)
      await page.getByLabel('Time zone').fill('UTC+2')
      await page.getByRole('button', { name: 'Save settings' }).click()
      await page.getByText('not an offset', { exact: false }).waitFor()
      expect(await page.getByLabel('Title', { exact: true }).inputValue()).toBe(`${title} and refrigerators`)
      await page.getByLabel('Time zone').fill('Europe/Oslo')
      await page.getByRole('button', { name: 'Save settings' }).click()
      await page.getByText('The settings were saved.').waitFor()
      await page.screenshot({ path: 'tests/.artifacts/course-settings-phone.png', fullPage: true })
      const [saved] = await e2eQuery<{ title: string }>('select title from courses where id = $1', [course!.id])
      expect(saved!.title).toBe(`${title} and refrigerators`)

      await page.getByLabel('Term to copy to').selectOption(String(winter!.id))
      expect(await page.getByLabel('Code of the copy').inputValue()).toBe(code)
      // The copy form starts from the settings just saved, not from the page as first loaded.
      expect(await page.getByLabel('Title of the copy').inputValue()).toBe(`${title} and refrigerators`)
      await page.getByRole('button', { name: 'Copy the course' }).click()
      await page.getByText('dates moved by +119 days', { exact: false }).waitFor()
      const [copy] = await e2eQuery<{ id: number; copied_from_id: number }>(
        'select id, copied_from_id from courses where term_id = $1 and code = $2',
        [winter!.id, code],
      )
      expect(copy!.copied_from_id).toBe(course!.id)
      expect(page.url()).toBe(`${baseURL}/courses/${copy!.id}/settings?copied=1`)
      await page.getByRole('link', { name: 'Open the course page' }).click()
      await page.getByRole('heading', { level: 1, name: `${code} ${title} and refrigerators` }).waitFor()
      expect(await page.getByText(termName).count()).toBeGreaterThan(0)
      // 119 days later on the Oslo clock: 09:00 and 23:59 again, though summer time has ended.
      const row = page.getByRole('row', { name: /Week 5: engines/ })
      await row.getByRole('cell', { name: 'Mon 1 Feb 2027, 09:00 (Europe/Oslo)' }).waitFor()
      await row.getByRole('cell', { name: /Mon 8 Feb 2027, 23:59 \(Europe\/Oslo\)/ }).waitFor()
      const [copiedAssignment] = await e2eQuery<{ key_released_at: Date | null; problem_version_id: number }>(
        'select a.key_released_at, i.problem_version_id from assignments a join assignment_items i on i.assignment_id = a.id where a.course_id = $1',
        [copy!.id],
      )
      expect(copiedAssignment).toEqual({ key_released_at: null, problem_version_id: item!.problem_version_id })
      await fitsThePhone()
      await page.screenshot({ path: 'tests/.artifacts/course-copy-phone.png', fullPage: true })
    },
  )

  test('a student is refused the settings page and the admin pages', async () => {
    const [student] = await e2eQuery<{ email: string; course_id: number }>(
      "select u.email, m.course_id from memberships m join users u on u.id = m.user_id where m.role = 'student' and u.password_hash is not null order by u.id limit 1",
    )
    await signIn(page, baseURL, student!.email, DEMO_PASSWORD)
    await page.waitForURL(`${baseURL}/`)
    expect((await page.goto(`${baseURL}/courses/${student!.course_id}/settings`))?.status()).toBe(403)
    expect((await page.goto(`${baseURL}/admin/terms`))?.status()).toBe(403)
    expect((await page.goto(`${baseURL}/admin/courses/new`))?.status()).toBe(403)
  })
})
