/**
 * The student's dispute page and the attachment download, called with real Requests and
 * session cookies against PostgreSQL: a multipart dispute with a PNG is stored and redirects to
 * the problem page; bodies without a stated length, or stated too large, are refused before
 * they are read (the reason kept, nothing written); a text file named .png is refused by its
 * content; staff may not raise disputes; the file goes to its owner and the staff only, with
 * its detected type and a locked-down policy: an image inline, a PDF only ever as a download.
 */
import { deflateSync } from 'node:zlib'
import { count, eq } from 'drizzle-orm'
import { afterAll, describe, expect, test } from 'vitest'
import { disputeOutcome } from '#app/components/answer-form.tsx'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import {
  action,
  loader,
  MAX_DISPUTE_BODY_BYTES,
  type DisputeActionData,
} from '#app/routes/courses/assignments/dispute.tsx'
import {
  loader as problemLoader,
  action as problemAction,
  type ProblemPageData,
} from '#app/routes/courses/assignments/problem.tsx'
import { loader as disputeDetailLoader } from '#app/routes/courses/disputes/$disputeId.tsx'
import { contentDisposition, loader as attachmentLoader } from '#app/routes/resources/dispute-attachment.ts'
import { db } from '#app/server/db/client.server.ts'
import { attachments, disputes } from '#app/server/db/schema.server.ts'
import { resolveDispute } from '#app/server/disputes.server.ts'
import { gradeSubmission } from '#app/server/grading.server.ts'
import { stopBoss } from '#app/server/queue.server.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { addMember, createCourseWithAssignment, createUser, drawnVariant } from '#tests/support/factories.ts'
import { args, BASE, formRequest, getRequest, settle } from '#tests/support/requests.ts'
import { sessionCookie } from '#tests/support/login.ts'

const otto = DEMO_PROBLEMS.find((p) => p.definition.title === 'Air-standard Otto cycle')!
const ottoV1: ProblemDefinition = otto.earlierVersions?.[0] ?? otto.definition
const REASON = 'My net work has the right size; the sign follows the convention our lecture notes use.'

afterAll(async () => {
  await stopBoss()
})

/** A real 1×1 PNG: signature, IHDR, one IDAT, IEND, each chunk with its CRC. */
function tinyPng(): Uint8Array<ArrayBuffer> {
  const crcTable = Array.from({ length: 256 }, (_, n) => {
    let c = n
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1
    return c >>> 0
  })
  const crc32 = (bytes: Buffer) => {
    let c = 0xffffffff
    for (const b of bytes) c = crcTable[(c ^ b) & 0xff]! ^ (c >>> 8)
    return (c ^ 0xffffffff) >>> 0
  }
  const chunk = (type: string, body: Buffer) => {
    const head = Buffer.alloc(4)
    head.writeUInt32BE(body.length)
    const typed = Buffer.concat([Buffer.from(type, 'latin1'), body])
    const crc = Buffer.alloc(4)
    crc.writeUInt32BE(crc32(typed))
    return Buffer.concat([head, typed, crc])
  }
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(1, 0) // width
  ihdr.writeUInt32BE(1, 4) // height
  ihdr.set([8, 2, 0, 0, 0], 8) // 8-bit RGB, deflate, no filter method, no interlace
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])
  const pixels = deflateSync(Buffer.from([0, 0x20, 0x60, 0xa0])) // filter byte, then one RGB pixel
  return new Uint8Array(
    Buffer.concat([signature, chunk('IHDR', ihdr), chunk('IDAT', pixels), chunk('IEND', Buffer.alloc(0))]),
  )
}

/** A student with a graded, wrong answer to wNet (the opposite sign) and a right one to T2. */
async function setUp() {
  // One attempt per find: the wrong wNet cannot be answered again, so it may be disputed.
  const made = await createCourseWithAssignment(db(), [ottoV1], { students: 2, assignment: { attemptsPerFind: 1 } })
  const [student, other] = made.students as [(typeof made.students)[0], (typeof made.students)[0]]
  const item = made.items[0]!
  const variant = drawnVariant(made, ottoV1, { student, item })
  const key = Object.fromEntries(variant.key.map((k) => [k.name, k]))
  const problemPath = `/courses/${made.course.id}/assignments/${made.assignment.id}/problems/1`
  const params = { courseId: String(made.course.id), assignmentId: String(made.assignment.id), position: '1' }
  const cookie = await sessionCookie(student)
  const submitted = (await problemAction(
    args(
      formRequest(
        problemPath,
        { 'answer.T2': `${key.T2!.value} K`, 'answer.wNet': `${-key.wNet!.value} kJ/kg` },
        { Cookie: cookie },
      ),
      params,
    ),
  )) as Response
  const submissionId = Number(new URL(submitted.headers.get('Location')!, BASE).searchParams.get('receipt'))
  expect(await gradeSubmission(db(), submissionId)).toBe('graded')
  const ta = await createUser(db(), { name: 'Course TA', password: null })
  await addMember(db(), ta.id, made.course.id, 'ta')
  return {
    ...made,
    student,
    other,
    ta,
    problemPath,
    path: `${problemPath}/dispute`,
    params,
    cookie,
    otherCookie: await sessionCookie(other),
    staffCookie: await sessionCookie(made.instructor),
    taCookie: await sessionCookie(ta),
  }
}

type Setup = Awaited<ReturnType<typeof setUp>>

function disputeForm(fields: { find?: string; reason?: string; file?: File }) {
  const form = new FormData()
  form.set('find', fields.find ?? 'wNet')
  form.set('reason', fields.reason ?? REASON)
  if (fields.file) form.set('file', fields.file)
  else form.set('file', new File([], '', { type: 'application/octet-stream' }))
  return form
}

/** A multipart post as a browser sends it: with its length stated (unless told otherwise). */
async function upload(s: Setup, form: FormData, options: { cookie?: string; length?: string | null } = {}) {
  const encoded = new Response(form)
  const body = await encoded.arrayBuffer()
  const headers: Record<string, string> = {
    'Content-Type': encoded.headers.get('Content-Type')!,
    Cookie: options.cookie ?? s.cookie,
  }
  if (options.length !== null) headers['Content-Length'] = options.length ?? String(body.byteLength)
  return new Request(`${BASE}${s.path}?find=wNet`, { method: 'POST', body, headers })
}

function asData(value: unknown): { data: DisputeActionData; status: number } {
  const v = value as { type?: string; data: DisputeActionData; init: { status: number } | null }
  expect(v.type).toBe('DataWithResponseInit')
  return { data: v.data, status: v.init?.status ?? 200 }
}

async function counts(s: Setup) {
  const [d] = await db().select({ n: count() }).from(disputes).where(eq(disputes.courseId, s.course.id))
  const [a] = await db().select({ n: count() }).from(attachments).where(eq(attachments.courseId, s.course.id))
  return { disputes: d!.n, attachments: a!.n }
}

function statusOf(thrown: unknown): number {
  return thrown instanceof Response ? thrown.status : (thrown as { init: { status: number } }).init.status
}

describe('the dispute page', () => {
  test('shows the student their graded answer, its verdict and that they may dispute it', async () => {
    const s = await setUp()
    const page = await loader(args(getRequest(`${s.path}?find=wNet`, { Cookie: s.cookie }), s.params))
    expect(page.find.name).toBe('wNet')
    expect(page.find.label).toBe(ottoV1.finds.find((f) => f.name === 'wNet')!.label)
    expect(page.find.last).toMatchObject({ verdict: 'incorrect', attempt: 1 })
    expect(page.allowance.allowed).toBe(true)
    expect(page.back).toBe(s.problemPath)

    const unknown = await settle(loader(args(getRequest(`${s.path}?find=nope`, { Cookie: s.cookie }), s.params)))
    expect('thrown' in unknown && statusOf(unknown.thrown)).toBe(404)
    const missing = await settle(loader(args(getRequest(s.path, { Cookie: s.cookie }), s.params)))
    expect('thrown' in missing && statusOf(missing.thrown)).toBe(404)
  })

  test('a find without a graded answer shows why it cannot be disputed', async () => {
    const s = await setUp()
    const page = await loader(args(getRequest(`${s.path}?find=eta`, { Cookie: s.cookie }), s.params))
    expect(page.find.last).toBeNull()
    expect(page.allowance.allowed).toBe(false)
    if (!page.allowance.allowed) expect(page.allowance.reason.length).toBeGreaterThan(10)
  })

  test('staff get 403 from the page and the action, and nothing is written', async () => {
    const s = await setUp()
    for (const cookie of [s.staffCookie, s.taCookie]) {
      const page = await settle(loader(args(getRequest(`${s.path}?find=wNet`, { Cookie: cookie }), s.params)))
      expect('thrown' in page && statusOf(page.thrown)).toBe(403)
      const posted = await settle(action(args(await upload(s, disputeForm({}), { cookie }), s.params)))
      expect('thrown' in posted && statusOf(posted.thrown)).toBe(403)
    }
    expect(await counts(s)).toEqual({ disputes: 0, attachments: 0 })
  })
})

describe('raising a dispute', () => {
  test('a reason with a small PNG is stored with its detected type and redirects to the problem page, which then shows the open dispute', async () => {
    const s = await setUp()
    const png = tinyPng()
    const res = (await action(
      args(await upload(s, disputeForm({ file: new File([png], 'my working.png', { type: 'image/png' }) })), s.params),
    )) as Response
    expect(res).toBeInstanceOf(Response)
    expect(res.status).toBe(302)
    expect(res.headers.get('Location')).toBe(`${s.problemPath}?disputed=wNet`)

    const [row] = await db().select().from(disputes).where(eq(disputes.userId, s.student.id))
    expect(row).toMatchObject({ findName: 'wNet', status: 'open', reason: REASON })
    const [file] = await db().select().from(attachments).where(eq(attachments.id, row!.attachmentId!))
    expect(file!.contentType).toBe('image/png')
    expect(new Uint8Array(file!.data)).toEqual(png)

    const page = await problemLoader(args(getRequest(`${s.problemPath}?disputed=wNet`, { Cookie: s.cookie }), s.params))
    expect(page.disputed).toBe('wNet')
    expect(page.disputes).toEqual([expect.objectContaining({ findName: 'wNet', status: 'open', id: row!.id })])

    // One open dispute per find: the page now says so and a second post is refused.
    const again = await loader(args(getRequest(`${s.path}?find=wNet`, { Cookie: s.cookie }), s.params))
    expect(again.allowance.allowed).toBe(false)
    const second = asData(await action(args(await upload(s, disputeForm({})), s.params)))
    expect(second.status).toBe(400)
    expect(second.data.formError).toMatch(/already/)
    expect(second.data.reason).toBe(REASON)
    expect(await counts(s)).toEqual({ disputes: 1, attachments: 1 })
  })

  test('without a file the dispute is stored with no attachment', async () => {
    const s = await setUp()
    const res = (await action(args(await upload(s, disputeForm({})), s.params))) as Response
    expect(res.status).toBe(302)
    expect(await counts(s)).toEqual({ disputes: 1, attachments: 0 })
  })

  test('a reason that is too short comes back with its text, a message beside it, and a request to choose the file again', async () => {
    const s = await setUp()
    const result = asData(
      await action(
        args(await upload(s, disputeForm({ reason: 'wrong', file: new File([tinyPng()], 'w.png') })), s.params),
      ),
    )
    expect(result.status).toBe(400)
    expect(result.data.reason).toBe('wrong')
    expect(result.data.fieldErrors.reason).toMatch(/at least 10 characters/)
    expect(result.data.fileNotKept).toMatch(/choose the file again/)
    expect(await counts(s)).toEqual({ disputes: 0, attachments: 0 })
  })

  test('a text file named .png is refused by its content, the reason kept and nothing written', async () => {
    const s = await setUp()
    const fake = new File(['These are my notes, not a picture.\n'], 'working.png', { type: 'image/png' })
    const result = asData(await action(args(await upload(s, disputeForm({ file: fake })), s.params)))
    expect(result.status).toBe(400)
    expect(result.data.fieldErrors.file).toMatch(/PDF, PNG or JPEG/)
    expect(result.data.reason).toBe(REASON)
    expect(result.data.fileNotKept).toMatch(/“working\.png”.*choose the file again/)
    expect(await counts(s)).toEqual({ disputes: 0, attachments: 0 })
  })

  test('a post that does not state its length is refused with 411, the reason kept and nothing written', async () => {
    const s = await setUp()
    const request = await upload(s, disputeForm({ file: new File([tinyPng()], 'w.png') }), { length: null })
    expect(request.headers.get('content-length')).toBeNull()
    const result = asData(await action(args(request, s.params)))
    expect(result.status).toBe(411)
    expect(result.data.formError).toMatch(/did not say how large/)
    expect(result.data.reason).toBe(REASON)
    expect(await counts(s)).toEqual({ disputes: 0, attachments: 0 })
  })

  test('a post stated larger than the limit is refused before its body is read, the reason kept and nothing written', async () => {
    const s = await setUp()
    // The real body of an oversized upload: the fields, then a file whose bytes only flow once
    // the test lets them. The action must answer while they are still held back.
    const boundary = '----cyclewright-test-boundary'
    const head = new TextEncoder().encode(
      `--${boundary}\r\nContent-Disposition: form-data; name="find"\r\n\r\nwNet\r\n` +
        `--${boundary}\r\nContent-Disposition: form-data; name="reason"\r\n\r\n${REASON}\r\n` +
        `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="huge.pdf"\r\nContent-Type: application/pdf\r\n\r\n%PDF-1.7\n`,
    )
    let release!: () => void
    const held = new Promise<void>((resolve) => (release = resolve))
    let sentAfterHead = 0
    const body = new ReadableStream<Uint8Array>({
      async start(controller) {
        controller.enqueue(head)
        await held
        const block = new Uint8Array(1024 * 1024)
        for (let i = 0; i < 11; i++) {
          controller.enqueue(block)
          sentAfterHead += block.byteLength
        }
        controller.enqueue(new TextEncoder().encode(`\r\n--${boundary}--\r\n`))
        controller.close()
      },
    })
    const request = new Request(`${BASE}${s.path}?find=wNet`, {
      method: 'POST',
      body,
      duplex: 'half',
      headers: {
        'Content-Type': `multipart/form-data; boundary=${boundary}`,
        'Content-Length': String(MAX_DISPUTE_BODY_BYTES + 1024 * 1024),
        Cookie: s.cookie,
      },
    } as RequestInit)
    const result = asData(await action(args(request, s.params)))
    expect(sentAfterHead).toBe(0)
    release()
    expect(result.status).toBe(413)
    expect(result.data.formError).toMatch(/larger than 10 MB/)
    expect(result.data.fieldErrors.file).toMatch(/at most 10 MB/)
    expect(result.data.reason).toBe(REASON)
    expect(await counts(s)).toEqual({ disputes: 0, attachments: 0 })
  })

  test('a stated length over the limit is refused even when the body is small', async () => {
    const s = await setUp()
    const result = asData(
      await action(args(await upload(s, disputeForm({}), { length: String(MAX_DISPUTE_BODY_BYTES + 1) }), s.params)),
    )
    expect(result.status).toBe(413)
    expect(await counts(s)).toEqual({ disputes: 0, attachments: 0 })
  })
})

describe('GET /courses/:c/disputes/:d/attachment', () => {
  test('the owner and the staff get the bytes with the detected type under a locked-down policy; another student gets 404', async () => {
    const s = await setUp()
    const png = tinyPng()
    // Named .jpg on purpose: the stored type comes from the bytes, and the served name follows it.
    await action(
      args(
        await upload(s, disputeForm({ file: new File([png], 'Résumé "final".jpg', { type: 'image/jpeg' }) })),
        s.params,
      ),
    )
    const [row] = await db().select().from(disputes).where(eq(disputes.userId, s.student.id))
    const path = `/courses/${s.course.id}/disputes/${row!.id}/attachment`
    const params = { courseId: String(s.course.id), disputeId: String(row!.id) }

    for (const cookie of [s.cookie, s.staffCookie, s.taCookie]) {
      const res = (await attachmentLoader(args(getRequest(path, { Cookie: cookie }), params))) as Response
      expect(res.status).toBe(200)
      expect(res.headers.get('Content-Type')).toBe('image/png')
      expect(res.headers.get('X-Content-Type-Options')).toBe('nosniff')
      expect(res.headers.get('Content-Security-Policy')).toBe("default-src 'none'; img-src 'self'; sandbox")
      expect(res.headers.get('Cache-Control')).toBe('private, no-store')
      const disposition = res.headers.get('Content-Disposition')!
      expect(disposition).toMatch(/^inline; filename="[\x20-\x7e]+\.png"; filename\*=UTF-8''\S+\.png$/)
      expect(disposition).not.toMatch(/filename="[^"]*"[^;]*"/)
      expect(new Uint8Array(await res.arrayBuffer())).toEqual(png)
    }

    const other = await settle(attachmentLoader(args(getRequest(path, { Cookie: s.otherCookie }), params)))
    expect('thrown' in other && statusOf(other.thrown)).toBe(404)
    const missing = await settle(
      attachmentLoader(args(getRequest(path, { Cookie: s.cookie }), { ...params, disputeId: String(row!.id + 1000) })),
    )
    expect('thrown' in missing && statusOf(missing.thrown)).toBe(404)
  })

  test('a PDF, even one carrying JavaScript, is only ever sent as a download, for the owner and the staff alike', async () => {
    const s = await setUp()
    // A PDF whose document-open action runs a script: what a viewer inside the page might run.
    const pdf = new TextEncoder().encode(
      '%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R /OpenAction 3 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\n' +
        "3 0 obj << /S /JavaScript /JS (app.alert\\('from the PDF'\\)) >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n",
    )
    const res0 = (await action(
      args(
        await upload(s, disputeForm({ file: new File([pdf], 'working.pdf', { type: 'application/pdf' }) })),
        s.params,
      ),
    )) as Response
    expect(res0.status).toBe(302)
    const [row] = await db().select().from(disputes).where(eq(disputes.userId, s.student.id))
    const path = `/courses/${s.course.id}/disputes/${row!.id}/attachment`
    const params = { courseId: String(s.course.id), disputeId: String(row!.id) }
    for (const cookie of [s.cookie, s.staffCookie, s.taCookie]) {
      const res = (await attachmentLoader(args(getRequest(path, { Cookie: cookie }), params))) as Response
      expect(res.status).toBe(200)
      expect(res.headers.get('Content-Type')).toBe('application/pdf')
      expect(res.headers.get('Content-Disposition')).toBe(
        `attachment; filename="working.pdf"; filename*=UTF-8''working.pdf`,
      )
      expect(res.headers.get('X-Content-Type-Options')).toBe('nosniff')
      expect(res.headers.get('Content-Security-Policy')).toBe("default-src 'none'; img-src 'self'; sandbox")
      expect(new Uint8Array(await res.arrayBuffer())).toEqual(pdf)
    }
    // The student's own dispute page knows it is a PDF and its size, to offer it as a download.
    const mine = await disputeDetailLoader(
      args(getRequest(`/courses/${s.course.id}/disputes/${row!.id}`, { Cookie: s.cookie }), params),
    )
    expect(mine.mine?.attachment).toEqual({
      fileName: 'working.pdf',
      contentType: 'application/pdf',
      size: pdf.byteLength,
    })
    const staff = await disputeDetailLoader(
      args(getRequest(`/courses/${s.course.id}/disputes/${row!.id}`, { Cookie: s.taCookie }), params),
    )
    expect(staff.staff?.attachment).toMatchObject({
      fileName: 'working.pdf',
      contentType: 'application/pdf',
      size: pdf.byteLength,
    })
  })

  test('a dispute without a file has no attachment to serve', async () => {
    const s = await setUp()
    await action(args(await upload(s, disputeForm({})), s.params))
    const [row] = await db().select().from(disputes).where(eq(disputes.userId, s.student.id))
    const params = { courseId: String(s.course.id), disputeId: String(row!.id) }
    const res = await settle(
      attachmentLoader(
        args(getRequest(`/courses/${s.course.id}/disputes/${row!.id}/attachment`, { Cookie: s.cookie }), params),
      ),
    )
    expect('thrown' in res && statusOf(res.thrown)).toBe(404)
  })
})

describe('contentDisposition', () => {
  test('keeps an ASCII name for old clients and the original in UTF-8, always ending in the detected type', () => {
    expect(contentDisposition('working.pdf', 'application/pdf')).toBe(
      `attachment; filename="working.pdf"; filename*=UTF-8''working.pdf`,
    )
    expect(contentDisposition('working.png', 'image/png')).toBe(
      `inline; filename="working.png"; filename*=UTF-8''working.png`,
    )
    expect(contentDisposition('Résumé "final";.png', 'image/png')).toBe(
      `inline; filename="Resume _final_.png"; filename*=UTF-8''R%C3%A9sum%C3%A9%20%22final%22%3B.png`,
    )
    expect(contentDisposition('photo.JPEG', 'image/jpeg')).toMatch(/filename="photo\.JPEG"/)
    expect(contentDisposition('notes.txt', 'image/png')).toMatch(/filename="notes\.txt\.png"/)
    expect(contentDisposition('計算.pdf', 'application/pdf')).toMatch(
      /^attachment; filename="attachment\.pdf"; filename\*=UTF-8''%E8%A8%88%E7%AE%97\.pdf$/,
    )
  })
})

describe('the outcome on the problem page', () => {
  test('after staff adjust the score, the problem page has the resolved dispute and says what changed, with the comment', async () => {
    const s = await setUp()
    await action(args(await upload(s, disputeForm({})), s.params))
    const [row] = await db().select().from(disputes).where(eq(disputes.userId, s.student.id))
    const resolved = await resolveDispute(db(), {
      courseId: s.course.id,
      disputeId: row!.id,
      actor: { id: s.ta.id, isAdmin: false, role: 'ta' },
      decision: 'adjust',
      newScore: 1,
      comment: 'Half marks: the size is right.',
    })
    expect(resolved.ok).toBe(true)

    const page = (await problemLoader(
      args(getRequest(s.problemPath, { Cookie: s.cookie }), s.params),
    )) as ProblemPageData
    expect(page.disputed).toBeNull()
    const latest = page.disputes!.find((d) => d.findName === 'wNet')!
    expect(latest).toMatchObject({
      status: 'adjusted',
      scoreBefore: 0,
      scoreAfter: 1,
      comment: 'Half marks: the size is right.',
    })
    expect(disputeOutcome(latest)).toBe('Score adjusted: from 0 to 1 — Half marks: the size is right.')
    expect(page.problem.results.finds.find((f) => f.name === 'wNet')!.score).toBe(1)

    // Staff preview their own variant: no disputes of theirs, and no confirmation from the query.
    const staffPage = await problemLoader(
      args(getRequest(`${s.problemPath}?disputed=wNet`, { Cookie: s.staffCookie }), s.params),
    )
    expect(staffPage.disputes).toEqual([])
    expect(staffPage.disputed).toBeNull()
  })

  test('upheld and rejected outcomes read as the student is told them', () => {
    const base = {
      id: 1,
      findName: 'wNet',
      createdAt: '2026-12-01T10:00:00Z',
      resolvedAt: '2026-12-02T10:00:00Z',
      scoreBefore: 0,
      scoreAfter: 2,
    }
    expect(disputeOutcome({ ...base, status: 'upheld', comment: null })).toBe(
      'Answer accepted: your answer counts as correct',
    )
    expect(
      disputeOutcome({ ...base, status: 'rejected', scoreAfter: 0, comment: 'The sign is part of the answer.' }),
    ).toBe('Score kept at 0 — The sign is part of the answer.')
  })
})
