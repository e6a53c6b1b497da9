/**
 * The bank's routes called with real Requests against PostgreSQL: the JSON API under /api/
 * (same permission checks as the pages, JSON errors), the preview, the export download and
 * the import upload's refusals (nothing written).
 */
import { count, eq } from 'drizzle-orm'
import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { action as previewAction } from '#app/routes/resources/api-preview.ts'
import { loader as problemLoader } from '#app/routes/resources/api-problem.ts'
import { loader as problemsLoader } from '#app/routes/resources/api-problems.ts'
import { loader as exportLoader } from '#app/routes/resources/bank-export.ts'
import { action as importAction, MAX_IMPORT_BYTES } from '#app/routes/bank/import.tsx'
import { action as newAction } from '#app/routes/bank/new.tsx'
import { action as editAction } from '#app/routes/bank/edit.tsx'
import { formValuesFromDefinition } from '#app/lib/problem-form.ts'
import { db } from '#app/server/db/client.server.ts'
import { problems, problemVersions } from '#app/server/db/schema.server.ts'
import { createProblem, freezeProblemVersion } from '#app/server/problems.server.ts'
import { addMember, createBankUser, createCourse, createUser } from '#tests/support/factories.ts'
import { args, BASE, getRequest, settle } from '#tests/support/requests.ts'
import { carnotDrill } from '#tests/support/definitions.ts'
import { sessionCookie } from '#tests/support/login.ts'

const carnot = (title?: string) => carnotDrill(title, 'An engine runs between $T_H =$ [Th] and 300 K.')

/** A multipart upload as a browser sends it: with its length stated. */
async function uploadRequest(path: string, form: FormData, cookie: string) {
  const encoded = new Response(form)
  const body = await encoded.arrayBuffer()
  return new Request(`${BASE}${path}`, {
    method: 'POST',
    body,
    headers: {
      'Content-Type': encoded.headers.get('Content-Type')!,
      'Content-Length': String(body.byteLength),
      Cookie: cookie,
    },
  })
}

function postJson(path: string, body: unknown, cookie?: string) {
  return new Request(`${BASE}${path}`, {
    method: 'POST',
    body: typeof body === 'string' ? body : JSON.stringify(body),
    headers: { 'Content-Type': 'application/json', ...(cookie ? { Cookie: cookie } : {}) },
  })
}

async function json(r: Response) {
  return { status: r.status, body: (await r.json()) as Record<string, unknown> }
}

describe('POST /api/preview', () => {
  test('draws the seeded variants with prompt HTML (MathML), key and diagrams; the key is the Carnot efficiency 1 − Tc/Th', async () => {
    const { user } = await createBankUser(db())
    const res = await json(
      (await previewAction(
        args(postJson('/api/preview', { definition: carnot(), seeds: [1, 2, 3, 4] }, await sessionCookie(user))),
      )) as Response,
    )
    expect(res.status).toBe(200)
    const body = res.body as unknown as {
      issues: unknown[]
      variants: {
        ok: boolean
        givens: { value: number }[]
        key: { value: number }[]
        promptHtml: string
        diagrams: { pv: { curves: unknown[] } }
      }[]
    }
    expect(body.issues).toEqual([])
    expect(body.variants).toHaveLength(4)
    for (const v of body.variants) {
      expect(v.ok).toBe(true)
      // Carnot efficiency of a reversible engine (common practice).
      expect(v.key[0]!.value).toBeCloseTo(1 - 300 / v.givens[0]!.value, 9)
      expect(v.promptHtml).toContain('<math')
      expect(v.diagrams.pv.curves).toHaveLength(4)
    }
  })

  test('a half-written problem comes back as issues by field, not an error', async () => {
    const { user } = await createBankUser(db())
    const def = {
      ...carnot(),
      givens: [{ name: '1bad', label: '', unit: 'K', rule: { kind: 'range', min: 5, max: 1, step: 0 } }],
    }
    const res = await json(
      (await previewAction(args(postJson('/api/preview', { definition: def }, await sessionCookie(user))))) as Response,
    )
    expect(res.status).toBe(200)
    const issues = res.body.issues as { path: string }[]
    expect(issues.some((i) => i.path.startsWith('givens.0'))).toBe(true)
    expect(res.body.variants).toEqual([])
  })

  test('the draft is parsed with the problem schema: unknown fields and wrong types are messages by field', async () => {
    const { user } = await createBankUser(db())
    const base = carnot()
    const def = { ...base, finds: [{ ...base.finds[0]!, points: 'one', colour: 'red' }] }
    const res = await json(
      (await previewAction(args(postJson('/api/preview', { definition: def }, await sessionCookie(user))))) as Response,
    )
    expect(res.status).toBe(200)
    expect(res.body.variants).toEqual([])
    expect(res.body.issues).toEqual(
      expect.arrayContaining([
        { path: 'finds.0.colour', message: 'colour is not a field here: remove it or check its spelling.' },
        { path: 'finds.0.points', message: expect.any(String) },
      ]),
    )
  })

  test('a format-1 draft is upgraded before it is drawn, as saving would store it', async () => {
    const { user } = await createBankUser(db())
    const old = { ...carnot(), format: 1, prompt: 'An engine runs between $T_H =$ @{Th} and 300 K.' }
    const res = await json(
      (await previewAction(
        args(postJson('/api/preview', { definition: old, seeds: [5] }, await sessionCookie(user))),
      )) as Response,
    )
    expect(res.body.issues).toEqual([])
    const [variant] = res.body.variants as { ok: boolean; promptHtml: string }[]
    expect(variant!.ok).toBe(true)
    expect(variant!.promptHtml).not.toContain('@{Th}')
    expect(variant!.promptHtml).toContain('<math')
  })

  test('junk bodies get a JSON 400 with a message', async () => {
    const { user } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    for (const body of [
      '{not json',
      JSON.stringify({ definition: carnot(), seeds: 'many' }),
      JSON.stringify({ definition: carnot(), seeds: [1, 2, 3, 4, 5, 6, 7] }),
    ]) {
      const res = await json((await previewAction(args(postJson('/api/preview', body, cookie)))) as Response)
      expect(res.status).toBe(400)
      expect(typeof res.body.error).toBe('string')
    }
  })

  test('signed out gets 401 and a student 403, as JSON', async () => {
    const signedOut = await settle(previewAction(args(postJson('/api/preview', { definition: carnot() }))))
    expect('thrown' in signedOut && (signedOut.thrown as Response).status).toBe(401)
    const student = await createUser(db())
    const course = await createCourse(db())
    await addMember(db(), student.id, course.id, 'student')
    const r = await settle(
      previewAction(args(postJson('/api/preview', { definition: carnot() }, await sessionCookie(student)))),
    )
    expect('thrown' in r).toBe(true)
    const res = await json((r as { thrown: Response }).thrown)
    expect(res.status).toBe(403)
    expect(res.body.error).toMatch(/instructors/)
  })
})

describe('GET /api/problems and /api/problems/:id', () => {
  test('list and fetch follow visibility: a private problem of another instructor is not there', async () => {
    const a = await createBankUser(db())
    const b = await createBankUser(db())
    const mine = await createProblem(db(), a.viewer, { definition: carnot('Mine'), visibility: 'private' })
    const shared = await createProblem(db(), b.viewer, {
      definition: carnot('Shared with all'),
      visibility: 'installation',
    })
    const hidden = await createProblem(db(), b.viewer, { definition: carnot('Hidden'), visibility: 'private' })
    const cookie = await sessionCookie(a.user)
    const list = await json(
      (await problemsLoader(args(getRequest('/api/problems?sort=title&dir=asc', { Cookie: cookie })))) as Response,
    )
    expect((list.body.rows as { title: string }[]).map((r) => r.title)).toEqual(['Mine', 'Shared with all'])
    const one = await json(
      (await problemLoader(
        args(getRequest(`/api/problems/${shared.problemId}`, { Cookie: cookie }), {
          problemId: String(shared.problemId),
        }),
      )) as Response,
    )
    expect(one.status).toBe(200)
    expect(one.body.canEdit).toBe(false)
    const own = await json(
      (await problemLoader(
        args(getRequest(`/api/problems/${mine.problemId}`, { Cookie: cookie }), { problemId: String(mine.problemId) }),
      )) as Response,
    )
    expect(own.body.canEdit).toBe(true)
    const none = await json(
      (await problemLoader(
        args(getRequest(`/api/problems/${hidden.problemId}`, { Cookie: cookie }), {
          problemId: String(hidden.problemId),
        }),
      )) as Response,
    )
    expect(none.status).toBe(404)
    const junk = await settle(
      problemLoader(args(getRequest('/api/problems/abc', { Cookie: cookie }), { problemId: 'abc' })),
    )
    expect('thrown' in junk && (junk.thrown as Response).status).toBe(404)
  })
})

describe('export and import', () => {
  test('export of a problem you cannot see is refused; junk ids get a 400', async () => {
    const a = await createBankUser(db())
    const b = await createBankUser(db())
    const hidden = await createProblem(db(), b.viewer, { definition: carnot('Hidden'), visibility: 'private' })
    const cookie = await sessionCookie(a.user)
    const refused = await settle(
      exportLoader(args(getRequest(`/bank/export?ids=${hidden.problemId}`, { Cookie: cookie }))),
    )
    expect('thrown' in refused && (refused.thrown as { init: { status: number } }).init.status).toBe(404)
    const junk = await settle(exportLoader(args(getRequest('/bank/export?ids=1;drop', { Cookie: cookie }))))
    expect('thrown' in junk && (junk.thrown as { init: { status: number } }).init.status).toBe(400)
    const mine = await createProblem(db(), a.viewer, { definition: carnot('Mine'), visibility: 'private' })
    const ok = (await exportLoader(
      args(getRequest(`/bank/export?ids=${mine.problemId}`, { Cookie: cookie })),
    )) as Response
    expect(ok.headers.get('Content-Disposition')).toMatch(
      /attachment; filename="cyclewright-bank-\d{4}-\d{2}-\d{2}\.json"/,
    )
    const doc = (await ok.json()) as { problems: { definition: ProblemDefinition }[] }
    expect(doc.problems[0]!.definition).toEqual(carnot('Mine'))
  })

  test('an oversized file, a file that is not JSON, and no file are refused with a message and write nothing', async () => {
    const a = await createBankUser(db())
    const cookie = await sessionCookie(a.user)
    const before = (await db().select({ n: count() }).from(problems))[0]!.n
    const upload = (content: string | null, name = 'bank.json') => {
      const form = new FormData()
      if (content !== null) form.set('document', new File([content], name, { type: 'application/json' }))
      return uploadRequest('/bank/import', form, cookie)
    }
    const unstated = new Request(`${BASE}/bank/import`, {
      method: 'POST',
      body: 'document=x',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: cookie },
    })
    const cases: [Request, number, RegExp][] = [
      [await upload('x'.repeat(MAX_IMPORT_BYTES + 1)), 413, /larger than 2 MB/],
      [await upload('this is not json', 'notes.txt'), 400, /not a JSON document/],
      [await upload(null), 400, /Choose a bank document/],
      [await upload(JSON.stringify({ format: 'someone-else', version: 1, problems: [] })), 400, /Nothing was imported/],
      [unstated, 411, /did not say how large/],
    ]
    for (const [request, status, message] of cases) {
      const r = (await importAction(args(request))) as unknown as {
        data: { formError: string }
        init: { status: number }
      }
      expect(r.init.status).toBe(status)
      expect(r.data.formError).toMatch(message)
    }
    expect((await db().select({ n: count() }).from(problems))[0]!.n).toBe(before)
  })
})

describe('the editor form', () => {
  function editorForm(def: ProblemDefinition, extra: Record<string, string>, cookie: string, path = '/bank/new') {
    const body = new URLSearchParams({ ...formValuesFromDefinition(def), visibility: 'private', ...extra })
    return new Request(`${BASE}${path}`, {
      method: 'POST',
      body,
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: cookie },
    })
  }

  test('a valid form saves version 1 and redirects to the problem; a bad one returns 400 with issues by field and saves nothing', async () => {
    const { user } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const saved = (await newAction(
      args(editorForm(carnot('Saved from the form'), { intent: 'save' }, cookie)),
    )) as Response
    expect(saved.status).toBe(302)
    const id = Number(saved.headers.get('Location')!.split('/').pop())
    const [version] = await db().select().from(problemVersions).where(eq(problemVersions.problemId, id))
    expect(version!.number).toBe(1)
    expect(version!.definition).toEqual(carnot('Saved from the form'))

    const before = (await db().select({ n: count() }).from(problems))[0]!.n
    const bad = (await newAction(
      args(
        editorForm(
          carnot('Broken'),
          { intent: 'save', 'givens.0.rule.min': 'warm', 'finds.0.source.path': 'totals.nothingHere' },
          cookie,
        ),
      ),
    )) as unknown as {
      data: { issues: { path: string }[]; state: { values: Record<string, string> } }
      init: { status: number }
    }
    expect(bad.init.status).toBe(400)
    expect(bad.data.issues.map((i) => i.path)).toContain('givens.0.rule.min')
    // What the author typed comes back as typed.
    expect(bad.data.state.values['givens.0.rule.min']).toBe('warm')
    expect((await db().select({ n: count() }).from(problems))[0]!.n).toBe(before)

    const unknownIntent = (await newAction(args(editorForm(carnot(), { intent: 'launch' }, cookie)))) as unknown as {
      init: { status: number }
    }
    expect(unknownIntent.init.status).toBe(400)
  })

  test('saving a frozen version makes the next one; someone else cannot save', async () => {
    const a = await createBankUser(db())
    const b = await createBankUser(db())
    const made = await createProblem(db(), a.viewer, { definition: carnot('Frozen drill'), visibility: 'installation' })
    await freezeProblemVersion(db(), made.versionId)
    const path = `/bank/${made.problemId}/edit`
    const params = { problemId: String(made.problemId) }
    const changed = { ...carnot('Frozen drill'), prompt: 'Changed after the freeze: @{Th}.' }
    const saved = (await editAction(
      args(editorForm(changed, { intent: 'save' }, await sessionCookie(a.user), path), params),
    )) as Response
    expect(saved.status).toBe(302)
    const versions = await db().select().from(problemVersions).where(eq(problemVersions.problemId, made.problemId))
    expect(versions.map((v) => v.number).sort()).toEqual([1, 2])
    expect((versions.find((v) => v.number === 1)!.definition as ProblemDefinition).prompt).toBe(carnot().prompt)
    const refused = await settle(
      editAction(args(editorForm(changed, { intent: 'save' }, await sessionCookie(b.user), path), params)),
    )
    expect('thrown' in refused && (refused.thrown as { init: { status: number } }).init.status).toBe(403)
  })
})

describe('saving over a save made meanwhile', () => {
  test('a stale editor gets a 409 with every typed value kept; saving again replaces the newer version on purpose', async () => {
    const a = await createBankUser(db())
    const made = await createProblem(db(), a.viewer, { definition: carnot('Two tabs'), visibility: 'private' })
    const cookie = await sessionCookie(a.user)
    const params = { problemId: String(made.problemId) }
    const path = `/bank/${made.problemId}/edit`
    const opened = (
      await db().select({ at: problems.updatedAt }).from(problems).where(eq(problems.id, made.problemId))
    )[0]!.at.toISOString()
    const post = (prompt: string, basedOn: string) =>
      new Request(`${BASE}${path}`, {
        method: 'POST',
        body: new URLSearchParams({
          ...formValuesFromDefinition({ ...carnot('Two tabs'), prompt }),
          visibility: 'private',
          intent: 'save',
          _basedOn: basedOn,
        }),
        headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: cookie },
      })
    // The first tab saves.
    expect(((await editAction(args(post('First tab: @{Th}.', opened), params))) as Response).status).toBe(302)
    // The second tab, opened at the same time, is told and keeps its text.
    const stale = (await editAction(args(post('Second tab: @{Th}.', opened), params))) as unknown as {
      data: { issues: { path: string; message: string }[]; state: { values: Record<string, string> } }
      init: { status: number }
    }
    expect(stale.init.status).toBe(409)
    expect(stale.data.issues[0]!.message).toMatch(/saved this problem after you opened it/)
    expect(stale.data.state.values.prompt).toBe('Second tab: @{Th}.')
    const [v] = await db().select().from(problemVersions).where(eq(problemVersions.problemId, made.problemId))
    expect((v!.definition as ProblemDefinition).prompt).toBe('First tab: @{Th}.')
    // Saving again from the refilled form (now based on the newer save) replaces it.
    const again = (await editAction(
      args(post('Second tab: @{Th}.', stale.data.state.values._basedOn!), params),
    )) as Response
    expect(again.status).toBe(302)
    const [w] = await db().select().from(problemVersions).where(eq(problemVersions.problemId, made.problemId))
    expect((w!.definition as ProblemDefinition).prompt).toBe('Second tab: @{Th}.')
  })
})

describe('import credit', () => {
  test('the credit a document carries is kept on the imported problem and exported again', async () => {
    const a = await createBankUser(db())
    const cookie = await sessionCookie(a.user)
    const doc = {
      format: 'cyclewright-bank',
      version: 1,
      exportedAt: new Date().toISOString(),
      problems: [
        {
          title: 'Carnot drill',
          origin: { title: 'Carnot drill, first edition', author: 'R. Quillfeather' },
          definition: carnot(),
        },
      ],
    }
    const form = new FormData()
    form.set('document', new File([JSON.stringify(doc)], 'bank.json', { type: 'application/json' }))
    const res = (await importAction(args(await uploadRequest('/bank/import', form, cookie)))) as Response
    expect(res.status).toBe(302)
    const [row] = await db()
      .select({ id: problems.id, importedFrom: problems.importedFrom })
      .from(problems)
      .where(eq(problems.ownerId, a.user.id))
    expect(row!.importedFrom).toEqual({ title: 'Carnot drill, first edition', author: 'R. Quillfeather' })
    const detail = await json(
      (await problemLoader(
        args(getRequest(`/api/problems/${row!.id}`, { Cookie: cookie }), { problemId: String(row!.id) }),
      )) as Response,
    )
    expect(detail.body.importedFrom).toEqual({ title: 'Carnot drill, first edition', author: 'R. Quillfeather' })
    const download = (await exportLoader(
      args(getRequest(`/bank/export?ids=${row!.id}`, { Cookie: cookie })),
    )) as Response
    const exported = (await download.json()) as { problems: { origin: unknown }[] }
    expect(exported.problems[0]!.origin).toEqual({ title: 'Carnot drill, first edition', author: 'R. Quillfeather' })
  })
})
