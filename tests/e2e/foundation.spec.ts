import type { Page } from 'playwright-core'
import { describe, expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople, demoStudents } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p))

describe('each role signs in and sees its own home', () => {
  test.each([
    ['admin', demoPeople.admin.email, 'Department overview'],
    ['instructor', demoPeople.instructors[0]!.email, 'Teaching'],
    ['ta', demoPeople.tas[1]!.email, 'Assisting'],
    ['student', demoStudents()[0]!.email, 'Your courses'],
  ])('%s', async (role, email, heading) => {
    await signIn(page, baseURL, email, DEMO_PASSWORD)
    await page.waitForURL(`${baseURL}/`)
    await expect.poll(() => page.locator('[data-home-role]').getAttribute('data-home-role')).toBe(role)
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe(heading)
    const nav = page.getByRole('navigation', { name: 'Main' })
    if (role === 'admin') expect(await nav.getByRole('link', { name: 'Outbox' }).count()).toBe(1)
    else expect(await nav.getByRole('link', { name: 'Outbox' }).count()).toBe(0)
  })
})

test('a wrong password shows the clear error and keeps the address typed', async () => {
  await signIn(page, baseURL, demoPeople.instructors[1]!.email, 'not-the-password')
  const alert = page.getByRole('alert')
  await alert.waitFor()
  expect(await alert.textContent()).toContain('That e-mail address and password do not match an account')
  expect(await page.getByLabel('E-mail address').inputValue()).toBe(demoPeople.instructors[1]!.email)
})

test('a student opening an instructor page gets the 403 page', async () => {
  await signIn(page, baseURL, demoStudents()[1]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  const [course] = await e2eQuery<{ id: number }>("select id from courses where code = 'ENTH 210'")
  const res = await page.goto(`${baseURL}/courses/${course!.id}/people`)
  expect(res?.status()).toBe(403)
  expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('You do not have access to this page')
  const admin = await page.goto(`${baseURL}/admin/outbox`)
  expect(admin?.status()).toBe(403)
})

test('an unknown address gets the friendly 404 page', async () => {
  const res = await page.goto(`${baseURL}/no/such/page`)
  expect(res?.status()).toBe(404)
  expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('We could not find that page')
})

test('an instructor invites a student, who follows the e-mailed link, sets a password and signs in', async () => {
  const email = `invited.${Date.now()}@students.kestrel-hollow.example`
  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page
    .getByRole('list', { name: 'Courses' })
    .getByRole('link', { name: /ENTH 210 Engineering Thermodynamics I/ })
    .click()
  await page.getByRole('navigation', { name: 'Course' }).getByRole('link', { name: 'People' }).click()
  // The course header is rendered once, by the course layout, with the current page marked.
  await page.getByRole('heading', { level: 1, name: 'People' }).waitFor()
  expect(await page.getByRole('navigation', { name: 'Course' }).count()).toBe(1)
  expect(
    await page
      .getByRole('navigation', { name: 'Course' })
      .getByRole('link', { name: 'People' })
      .getAttribute('aria-current'),
  ).toBe('page')
  await page.getByLabel('E-mail address').fill(email)
  await page.getByLabel('Role').selectOption('student')
  await page.getByRole('button', { name: 'Send invitation' }).click()
  await page.getByText(`Invitation sent to ${email}.`).waitFor()
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)

  // The message went over real SMTP to the local catcher, which stored it in PostgreSQL.
  // It is sent by the worker's 'send-mail' job, so it may take a moment.
  const lastMail = async () =>
    (
      await e2eQuery<{ text: string; subject: string }>(
        'select text, subject from mail_messages where $1 = any(envelope_to) order by id desc limit 1',
        [email],
      )
    )[0]
  await expect.poll(lastMail, { timeout: 20_000 }).toBeTruthy()
  const mail = await lastMail()
  expect(mail?.subject).toBe('You are invited to ENTH 210 on Cyclewright')
  const link = mail!.text.match(/https?:\/\/\S+\/join\/\S+/)?.[0]
  expect(link).toBeTruthy()

  await page.goto(link!)
  await page.getByLabel('Your name').fill('Wren Invitee')
  await page.getByLabel('Choose a password').fill('a brand new password')
  await page.getByLabel('The same password again').fill('a brand new password')
  await page.getByRole('button', { name: 'Create my account and join' }).click()
  await page.waitForURL(/\/courses\/\d+$/)
  // The address changes before the course page has rendered; wait for the page itself.
  await page.getByRole('heading', { level: 1, name: 'ENTH 210 Engineering Thermodynamics I', exact: true }).waitFor()

  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)
  await signIn(page, baseURL, email, 'a brand new password')
  await page.waitForURL(`${baseURL}/`)
  expect(await page.locator('[data-home-role]').getAttribute('data-home-role')).toBe('student')
  await page.screenshot({ path: 'tests/.artifacts/student-home.png', fullPage: true })
})
