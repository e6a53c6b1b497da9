/**
 * An instructor opens the course gradebook, follows a student's name to that student's page,
 * and sees the givens of the student's own variant (the numbers the server draws from the
 * seed, computed here with the same pure code) and one of their answers with its verdict. On
 * a 390 px wide phone the page itself never scrolls sideways: wide tables scroll in their box.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { formatGivenValue } from '#app/domain/authoring/placeholders.ts'
import { studentVariant } from '#app/server/grading.server.ts'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
let page: Page
useBrowserPage((p) => (page = p), { viewport: { width: 390, height: 844 } })

const VERDICT_WORDS: Record<string, string> = {
  correct: 'Correct',
  incorrect: 'Incorrect',
  unreadable: 'Could not be read',
  'wrong-dimension': 'Wrong kind of unit',
}

/** A demo student of the first instructor's course with a graded answer, and that answer's problem. */
async function studentWithAnswer() {
  const [row] = await e2eQuery<{
    course_id: number
    user_id: number
    email: string
    assignment_id: number
    problem_id: number
    version_id: number
    definition: ProblemDefinition
    convention: 'chemistry' | 'engineering'
    answer: string
    verdict: string
    find_name: string
  }>(
    `select a.course_id, pr.user_id, u.email, a.id as assignment_id, i.problem_id, i.problem_version_id as version_id, v.definition,
            c.sign_convention as convention, pr.answer, pr.verdict, pr.find_name
       from part_results pr
       join assignment_items i on i.id = pr.item_id
       join assignments a on a.id = i.assignment_id
       join courses c on c.id = a.course_id
       join problem_versions v on v.id = i.problem_version_id
       join users u on u.id = pr.user_id
       join memberships m on m.user_id = pr.user_id and m.course_id = a.course_id and m.role = 'student' and m.dropped_at is null
       join memberships staff on staff.course_id = a.course_id and staff.role = 'instructor'
       join users su on su.id = staff.user_id and su.email = $1
      where pr.verdict is not null and a.due_at < now()
      order by pr.id limit 1`,
    [demoPeople.instructors[0]!.email],
  )
  if (!row) throw new Error('The demo has no graded answer in the first instructor’s course')
  return row
}

test('from the gradebook to a student’s page: their givens and an answer with its verdict', async () => {
  const s = await studentWithAnswer()
  const drawn = studentVariant({
    versionId: s.version_id,
    definition: s.definition,
    assignmentId: s.assignment_id,
    problemId: s.problem_id,
    userId: s.user_id,
    courseConvention: s.convention,
  })
  if (!drawn.ok) throw new Error(drawn.error.message)
  const given = drawn.variant.givens.find((g) => Number.isFinite(g.value))!
  const shown = formatGivenValue(given, s.definition.givens.find((g) => g.name === given.name)?.display, { tex: false })
  if (!shown.ok) throw new Error(shown.message)

  await signIn(page, baseURL, demoPeople.instructors[0]!.email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
  await page.goto(`${baseURL}/courses/${s.course_id}/gradebook?q=${encodeURIComponent(s.email)}`)
  const row = page.getByRole('row', { name: new RegExp(s.email.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')) })
  await row.getByRole('link').first().click()
  await page.waitForURL(`${baseURL}/courses/${s.course_id}/students/${s.user_id}`)

  await page.getByRole('heading', { level: 1 }).waitFor()
  await page.getByText(s.email).first().waitFor()
  const givens = page
    .getByRole('region', { name: new RegExp(`problem`) })
    .filter({ hasText: given.label })
    .first()
  await givens
    .getByRole('row', { name: new RegExp(given.label) })
    .first()
    .waitFor()
  const givenRow = (
    await givens
      .getByRole('row', { name: new RegExp(given.label) })
      .first()
      .innerText()
  ).replace(/\u00a0/g, ' ')
  expect(givenRow).toContain(shown.text.replace(/\u00a0/g, ' '))

  const answer = page
    .getByRole('row')
    .filter({ hasText: s.answer })
    .filter({ hasText: VERDICT_WORDS[s.verdict]! })
    .first()
  await answer.waitFor()
  expect(await answer.isVisible()).toBe(true)

  // A phone: the page does not scroll sideways; wide tables scroll in their own box.
  const width = await page.evaluate(() => document.documentElement.scrollWidth)
  expect(width).toBeLessThanOrEqual(390)

  // The people page links the student here too.
  await page.goto(`${baseURL}/courses/${s.course_id}/people`)
  const href = await page
    .locator(`a[href="/courses/${s.course_id}/students/${s.user_id}"]`)
    .first()
    .getAttribute('href')
  expect(href).toBe(`/courses/${s.course_id}/students/${s.user_id}`)
})
