/**
 * A dispute from end to end in Chromium: a student disputes a graded verdict with a reason
 * and a PNG of their working, a TA finds it in the review queue, sees the upload and the
 * worked solution, and adjusts the score with a comment; the student reads the outcome on the
 * problem page, the score is in the gradebook, the e-mail is in the outbox and the change in
 * the audit log. A PDF carrying JavaScript is offered to the TA as a download only.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'
import { tinyPng } from '#tests/support/png.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p))

type Target = {
  course_id: number
  assignment_id: number
  position: number
  find_name: string
  email: string
  name: string
  user_id: number
}

/** A demo student with a wrong graded answer on the open week-9 assignment and no dispute yet. */
async function studentToDispute(): Promise<Target> {
  const [target] = await e2eQuery<Target>(
    `select a.course_id, a.id as assignment_id, i.position, p.find_name, u.email, u.name, u.id as user_id
       from part_results p join assignments a on a.id = p.assignment_id join assignment_items i on i.id = p.item_id join users u on u.id = p.user_id
      where a.title = 'Week 9: Gas turbines' and p.verdict = 'incorrect'
        and not exists (select 1 from part_results q where q.item_id = p.item_id and q.user_id = p.user_id and q.find_name = p.find_name and q.verdict = 'correct')
        and not exists (select 1 from disputes d where d.user_id = p.user_id)
      order by u.name, p.id limit 1`,
  )
  expect(target, 'a demo student with a wrong answer on week 9').toBeTruthy()
  return target!
}

/** Signs in as the student, sends a dispute with the file, and signs out. */
async function raiseWithFile(t: Target, problemUrl: string, file: { name: string; mimeType: string; buffer: Buffer }) {
  await signIn(page, baseURL, t.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(problemUrl)
  const disputeLink = page.locator(`a[href$="/dispute?find=${t.find_name}"]`)
  await disputeLink.first().click()
  await page.getByLabel('Why do you think the verdict is wrong?').waitFor()
  await page
    .getByLabel('Why do you think the verdict is wrong?')
    .fill('I used the isentropic relation correctly; my working is attached. Please check the rounding.')
  await page.getByLabel('Your worked solution (optional)').setInputFiles(file)
  await page.getByRole('button', { name: 'Send dispute' }).click()
  await page.waitForURL(/\?disputed=/)
  await page.getByText('Your dispute was sent; you will get an e-mail when it is resolved.').waitFor()
  await page
    .getByText(/Dispute open since/)
    .first()
    .waitFor()
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)
}

/** Signs in as a TA of the course and opens the student's dispute from the review queue. */
async function reviewAsTa(t: Target) {
  await signIn(page, baseURL, demoPeople.tas[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${t.course_id}/disputes`)
  await page.getByRole('heading', { level: 1, name: 'Review queue' }).waitFor()
  const row = page.getByRole('row', { name: new RegExp(t.name) })
  await row.getByRole('link', { name: 'Review' }).click()
  await page.getByRole('button', { name: 'Resolve dispute' }).waitFor()
}

test('a student disputes a verdict with a file, a TA adjusts it, and everyone sees the outcome', async () => {
  const t = await studentToDispute()
  const problemUrl = `${baseURL}/courses/${t.course_id}/assignments/${t.assignment_id}/problems/${t.position}`
  await raiseWithFile(t, problemUrl, { name: 'my-working.png', mimeType: 'image/png', buffer: tinyPng() })

  // A TA of the course reviews it.
  await reviewAsTa(t)
  // The upload is shown in the page, read from its bytes as a PNG, with its name as the text alternative.
  const img = page.locator('img[src$="/attachment"]')
  await img.waitFor()
  await expect.poll(() => img.evaluate((el) => (el as HTMLImageElement).naturalWidth)).toBe(1)
  expect(await img.getAttribute('alt')).toContain('my-working.png')
  // The key and the worked solution are there to judge by.
  await page.getByText('Worked solution', { exact: true }).click()
  await expect.poll(() => page.getByText('No worked solution is available for this variant.').count()).toBe(0)
  expect(await page.getByRole('img', { name: /P–v and T–s diagrams|diagram/ }).count()).toBeGreaterThan(0)

  await page.getByLabel('Adjust this find’s score').check()
  await page.getByLabel('New score').fill('1')
  await page
    .getByLabel('Comment to the student')
    .fill('Your method is right; one point for it, the rounding cost the rest.')
  await page.getByRole('button', { name: 'Resolve dispute' }).click()
  await page.getByText(/Resolved: 1 answer/).waitFor()

  // The e-mail to the student went through the queue to the outbox.
  const lastMail = async () =>
    (
      await e2eQuery<{ subject: string; text: string }>(
        'select subject, text from mail_messages where $1 = any(envelope_to) order by id desc limit 1',
        [t.email],
      )
    )[0]
  await expect.poll(lastMail, { timeout: 20_000 }).toBeTruthy()
  expect((await lastMail())!.text).toContain('one point for it')

  // The score is in the gradebook at once, and the change in the audit log (instructors).
  const [score] = await e2eQuery<{ score: number }>(
    `select max(score)::float8 as score from part_results p join assignment_items i on i.id = p.item_id where p.user_id = $1 and i.assignment_id = $2 and i.position = $3 and p.find_name = $4`,
    [t.user_id, t.assignment_id, t.position, t.find_name],
  )
  expect(score!.score).toBe(1)
  const [audit] = await e2eQuery<{ n: number }>(
    `select count(*)::int as n from audit_events where kind = 'dispute' and user_id = $1`,
    [t.user_id],
  )
  expect(audit!.n).toBe(1)
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)

  // The student reads the outcome on the problem page.
  await signIn(page, baseURL, t.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(problemUrl)
  await page
    .getByText(/Score adjusted: from .* to 1/)
    .first()
    .waitFor()
})

test('a PDF that carries JavaScript is offered as a download only: never opened in the page, and its script never runs', async () => {
  const t = await studentToDispute()
  const problemUrl = `${baseURL}/courses/${t.course_id}/assignments/${t.assignment_id}/problems/${t.position}`
  const pdf = Buffer.from(
    '%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R /OpenAction 3 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\n' +
      "3 0 obj << /S /JavaScript /JS (app.alert\\('from the PDF'\\)) >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n",
  )
  await raiseWithFile(t, problemUrl, { name: 'working.pdf', mimeType: 'application/pdf', buffer: pdf })
  const dialogs: string[] = []
  page.on('dialog', (d) => {
    dialogs.push(d.message())
    void d.dismiss()
  })
  await reviewAsTa(t)
  const link = page.getByRole('link', { name: 'Download working.pdf' })
  await link.waitFor()
  await page
    .getByText('PDF files are downloaded, not opened here, so nothing inside them runs in this site.', { exact: false })
    .waitFor()
  expect(await page.getByText(/\(PDF, \d+ bytes\)/).count()).toBe(1)
  // Nothing on the page opens the file: no frame, embed or object points at it.
  expect(await page.locator('iframe, embed, object').count()).toBe(0)
  // The server sends it as a download, whoever asks and however.
  const href = (await link.getAttribute('href'))!
  const headers = await page.evaluate(async (url) => {
    const r = await fetch(url)
    return {
      type: r.headers.get('content-type'),
      disposition: r.headers.get('content-disposition'),
      csp: r.headers.get('content-security-policy'),
    }
  }, href)
  expect(headers.type).toBe('application/pdf')
  expect(headers.disposition).toMatch(/^attachment; filename="working\.pdf"/)
  expect(headers.csp).toContain('sandbox')
  expect(dialogs).toEqual([])
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL(/\/sign-in/)
})
