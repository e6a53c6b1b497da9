/**
 * The staff pages on a phone-sized screen (390 × 844): the demo instructor, a TA and the
 * admin open each page they work with, and the page itself never scrolls sideways. Wide tables
 * scroll inside their own box instead; a failure names the elements that reach past the right
 * edge outside any such box (including a screen-reader-only label whose positioned ancestor is
 * outside the box, which widens the page although it sits in the table). Buttons are at least
 * 44 px tall, a target a thumb can hit. Screenshots of each page are left in /tmp (phone-*.png) for a look.
 */
import type { Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD, demoPeople } from '#seed/demo.ts'
import { signIn, useBrowserPage } from '#tests/support/browser.ts'
import { e2eQuery } from '#tests/support/e2e-db.ts'

const baseURL = inject('baseURL')
const WIDTH = 390
let page: Page
useBrowserPage((p) => (page = p), { viewport: { width: WIDTH, height: 844 } })

type Layout = { scrollWidth: number; screen: number; wide: string[]; smallButtons: string[] }

/** What reaches past the screen's right edge without a scrolling box to hold it, and buttons too small to tap. */
async function measure(): Promise<Layout> {
  return page.evaluate(() => {
    const screen = window.innerWidth
    /** True when nothing between `el` and the page clips or scrolls it sideways (following containing blocks). */
    const escapes = (el: Element): boolean => {
      let position = getComputedStyle(el).position
      if (position === 'fixed') return true
      for (let a = el.parentElement; a && a !== document.documentElement; a = a.parentElement) {
        const s = getComputedStyle(a)
        // An absolutely positioned box is clipped only by ancestors that contain it (positioned ones).
        const contains = position !== 'absolute' || s.position !== 'static' || s.transform !== 'none'
        if (!contains) continue
        if (s.overflowX !== 'visible') return false
        position = s.position
        if (position === 'fixed') return true
      }
      return true
    }
    const describe = (el: Element) => {
      const r = el.getBoundingClientRect()
      const cls =
        typeof el.className === 'string' && el.className ? `.${el.className.trim().split(/\s+/).join('.')}` : ''
      const text = (el.textContent ?? '').replace(/\s+/g, ' ').trim().slice(0, 60)
      return `${el.tagName.toLowerCase()}${cls} (right ${Math.round(r.right)} px, width ${Math.round(r.width)} px) “${text}”`
    }
    const over = [...document.body.querySelectorAll('*')].filter((el) => {
      const r = el.getBoundingClientRect()
      return r.width > 0 && r.right > screen + 0.5 && escapes(el)
    })
    // The outermost offenders first: an element whose parent also reaches past the edge is its parent's doing.
    const outermost = over.filter((el) => !el.parentElement || !over.includes(el.parentElement))
    const wide = outermost
      .sort((a, b) => b.getBoundingClientRect().right - a.getBoundingClientRect().right)
      .slice(0, 6)
      .map(describe)
    const smallButtons = [...document.querySelectorAll('main button, main input[type=submit], header button')]
      .filter((el) => {
        const r = el.getBoundingClientRect()
        return r.width > 0 && r.height < 44 - 0.5
      })
      .slice(0, 6)
      .map(describe)
    return { scrollWidth: document.documentElement.scrollWidth, screen, wide, smallButtons }
  })
}

/** Opens `path`, waits for `ready`, keeps a screenshot, and checks the page fits the screen. */
async function checkPage(name: string, path: string, ready: (page: Page) => Promise<unknown>) {
  await page.goto(`${baseURL}${path}`)
  await ready(page)
  // The page in screen-high pieces (the right edge is cut at the screen's), to look at.
  const height = await page.evaluate(() => document.documentElement.scrollHeight)
  for (let i = 0, y = 0; y < height && i < 8; i++, y += 1000) {
    await page.screenshot({
      path: `/tmp/phone-${name}-${i}.png`,
      fullPage: true,
      clip: { x: 0, y, width: WIDTH, height: Math.min(1000, height - y) },
    })
  }
  if (process.env.PHONE_SHOTS === '1') {
    // Each box that scrolls sideways, scrolled to its far end, to see the part off the screen.
    const boxes = page.locator('.overflow-x-auto, .overflow-auto')
    for (let i = 0; i < (await boxes.count()); i++) {
      const box = boxes.nth(i)
      if (!(await box.evaluate((el) => el.scrollWidth > el.clientWidth))) continue
      await box.evaluate((el) => (el.scrollLeft = el.scrollWidth))
      await box.screenshot({ path: `/tmp/phone-${name}-box${i}-end.png` })
      await box.evaluate((el) => (el.scrollLeft = 0))
    }
  }
  const layout = await measure()
  expect.soft(layout.screen, 'the viewport is a phone’s').toBe(WIDTH)
  expect
    .soft(layout.scrollWidth, `${name} (${path}) is wider than the screen: ${layout.wide.join(' | ')}`)
    .toBeLessThanOrEqual(WIDTH)
  expect.soft(layout.smallButtons, `${name}: buttons under 44 px tall`).toEqual([])
}

const h1 = (name: string | RegExp) => (p: Page) => p.getByRole('heading', { level: 1, name }).waitFor()

type Demo = {
  courseId: number
  assignmentId: number
  weekSix: number
  pinnedVersion: number
  latestVersion: number
  openDispute: number
  resolvedDispute: number
}

async function demo(): Promise<Demo> {
  const [a] = await e2eQuery<{ course_id: number; id: number }>(
    `select course_id, id from assignments where title = 'Week 9: Gas turbines'`,
  )
  const [six] = await e2eQuery<{ id: number; pinned: number; latest: number }>(
    `select a.id, i.problem_version_id as pinned, (select max(v.id) from problem_versions v where v.problem_id = i.problem_id) as latest
       from assignments a join assignment_items i on i.assignment_id = a.id and i.position = 1 where a.title = 'Week 6: Otto and Diesel cycles'`,
  )
  const [open] = await e2eQuery<{ id: number }>(
    `select id from disputes where course_id = $1 and status = 'open' and attachment_id is not null order by id limit 1`,
    [a!.course_id],
  )
  const [resolved] = await e2eQuery<{ id: number }>(
    `select id from disputes where course_id = $1 and status <> 'open' order by id limit 1`,
    [a!.course_id],
  )
  expect(open && resolved && six, 'the demo has week 6, an open dispute with a file and a resolved one').toBeTruthy()
  return {
    courseId: a!.course_id,
    assignmentId: a!.id,
    weekSix: six!.id,
    pinnedVersion: six!.pinned,
    latestVersion: six!.latest,
    openDispute: open!.id,
    resolvedDispute: resolved!.id,
  }
}

async function signInAs(email: string) {
  await signIn(page, baseURL, email, DEMO_PASSWORD)
  await page.waitForURL(`${baseURL}/`)
}

test('the instructor’s pages fit a phone', async () => {
  const d = await demo()
  expect(d.latestVersion, 'week 6 uses an older version, so a regrade has something to preview').not.toBe(
    d.pinnedVersion,
  )
  await signInAs(demoPeople.instructors[0]!.email)
  const c = `/courses/${d.courseId}`
  const a = `${c}/assignments/${d.assignmentId}`
  await checkPage('instructor-course', c, h1(/ENTH 210/))
  await checkPage('instructor-gradebook', `${c}/gradebook`, (p) => p.getByTestId('counting-rule').waitFor())
  // Scrolled to the last column, each score is still read beside its student, under the caption.
  const scrolled = await page
    .locator('table')
    .first()
    .evaluate((table) => {
      const box = table.parentElement!
      box.scrollLeft = box.scrollWidth
      const inView = (el: Element) => {
        const r = el.getBoundingClientRect()
        return r.left >= box.getBoundingClientRect().left - 0.5 && r.right <= window.innerWidth + 0.5
      }
      return {
        scrolled: box.scrollLeft > 0,
        student: inView(table.querySelector('tbody th')!),
        caption: inView(table.querySelector('caption')!),
      }
    })
  expect(scrolled).toEqual({ scrolled: true, student: true, caption: true })
  await checkPage('instructor-assignment-gradebook', `${a}/gradebook`, (p) =>
    p.locator('table tbody tr').first().waitFor(),
  )
  await checkPage('instructor-assignment-gradebook-expanded', `${a}/gradebook?expand=1`, (p) =>
    p.locator('table tbody tr').first().waitFor(),
  )
  await checkPage('instructor-answers', `${a}/problems/1/answers`, h1(/Answers to problem 1/))
  await checkPage('instructor-statistics', `${a}/statistics`, (p) => p.getByRole('heading', { level: 1 }).waitFor())
  await checkPage('instructor-extensions', `${a}/extensions`, (p) => p.getByRole('heading', { level: 1 }).waitFor())
  await checkPage('instructor-regrade', `${c}/assignments/${d.weekSix}/problems/1/regrade`, (p) =>
    p.getByRole('heading', { level: 1 }).waitFor(),
  )
  await checkPage(
    'instructor-regrade-preview',
    `${c}/assignments/${d.weekSix}/problems/1/regrade?version=${d.latestVersion}&preview=1`,
    (p) => p.getByRole('heading', { level: 1 }).waitFor(),
  )
  await checkPage('instructor-disputes', `${c}/disputes`, h1('Review queue'))
  // The way into each dispute is on the screen without scrolling the table.
  const review = page.getByRole('link', { name: /^Review the dispute of/ }).first()
  expect(await review.evaluate((el) => el.getBoundingClientRect().right)).toBeLessThanOrEqual(WIDTH)
  await checkPage('instructor-disputes-all', `${c}/disputes?status=all`, h1('Review queue'))
  await checkPage('instructor-dispute-open', `${c}/disputes/${d.openDispute}`, (p) =>
    p.getByRole('button', { name: 'Resolve dispute' }).waitFor(),
  )
  await checkPage('instructor-dispute-resolved', `${c}/disputes/${d.resolvedDispute}`, (p) =>
    p.getByRole('heading', { level: 1 }).waitFor(),
  )
})

test('a TA’s pages fit a phone', async () => {
  const d = await demo()
  await signInAs(demoPeople.tas[0]!.email)
  const c = `/courses/${d.courseId}`
  const a = `${c}/assignments/${d.assignmentId}`
  await checkPage('ta-course', c, h1(/ENTH 210/))
  await checkPage('ta-disputes', `${c}/disputes`, h1('Review queue'))
  await checkPage('ta-dispute-open', `${c}/disputes/${d.openDispute}`, (p) =>
    p.getByRole('button', { name: 'Resolve dispute' }).waitFor(),
  )
  // With the worked solution open: its equations scroll inside their own box.
  await checkPage('ta-dispute-worked', `${c}/disputes/${d.openDispute}`, async (p) => {
    await p.getByText('Worked solution', { exact: true }).click()
    await p.locator('details[open] .katex').first().waitFor()
  })
  await checkPage('ta-gradebook', `${c}/gradebook`, (p) => p.getByTestId('counting-rule').waitFor())
  await checkPage('ta-assignment-gradebook', `${a}/gradebook?expand=1`, (p) =>
    p.locator('table tbody tr').first().waitFor(),
  )
  await checkPage('ta-answers', `${a}/problems/2/answers`, h1(/Answers to problem 2/))
  await checkPage('ta-statistics', `${a}/statistics`, (p) => p.getByRole('heading', { level: 1 }).waitFor())
  await checkPage('ta-extensions', `${a}/extensions`, (p) => p.getByRole('heading', { level: 1 }).waitFor())
})

test('the admin’s grade exports fit a phone, with an export listed', async () => {
  await signInAs(demoPeople.admin.email)
  await page.goto(`${baseURL}/admin/exports`)
  await page.getByLabel('Term').selectOption({ index: 1 })
  await page.getByRole('button', { name: 'Export grades' }).click()
  await page.waitForURL(/requested=/)
  // Wait for the worker to finish it, so the files column is there too.
  await page
    .getByRole('link', { name: /course totals|assignment rows/i })
    .first()
    .waitFor({ timeout: 30_000 })
  await checkPage('admin-exports', '/admin/exports', h1('Grade exports'))
  await checkPage('admin-home', '/admin', (p) => p.getByRole('heading', { level: 1 }).waitFor())
})
