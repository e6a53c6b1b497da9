// Bank problems on steam plants with feedwater heaters and cogeneration, end to end: the
// editor's heater rows without JavaScript (add, remove naming the row, save through the
// new-problem page's action), the stored version read back, listed under its cycle, exported and
// imported through JSON, previewed (key, worked solution naming each heater, T–s diagram with the
// dome) and drawn per student. Demo data: the invented plants of seed/problems.ts.
import { QueryClient, QueryClientProvider } from '@tanstack/react-query'
import { eq } from 'drizzle-orm'
import { createElement } from 'react'
import { renderToString } from 'react-dom/server'
import { createRoutesStub } from 'react-router'
import { ProblemEditor } from '#app/components/problem-editor/index.tsx'
import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { drawVariant } from '#app/domain/authoring/variant.ts'
import {
  addHeaterIntent,
  editorStateFromDefinition,
  formValuesFromDefinition,
  removeHeaterIntent,
} from '#app/lib/problem-form.ts'
import { action as newAction } from '#app/routes/bank/new.tsx'
import { db } from '#app/server/db/client.server.ts'
import { problemVersions } from '#app/server/db/schema.server.ts'
import { previewProblem } from '#app/server/preview.server.ts'
import { editorOptions } from '#app/server/problem-editor.server.ts'
import {
  BankQuerySchema,
  createProblem,
  exportBank,
  getProblemDetail,
  importBank,
  listBankProblems,
} from '#app/server/problems.server.ts'
import { createBankUser } from '#tests/support/factories.ts'
import { sessionCookie } from '#tests/support/login.ts'
import { args, BASE } from '#tests/support/requests.ts'
import { DEMO_PROBLEMS } from '#seed/problems.ts'

const tag = `zp${Math.random().toString(36).slice(2, 8)}`

function demo(template: string): ProblemDefinition {
  const d = DEMO_PROBLEMS.find(
    (p) => p.definition.physics.kind === 'template' && p.definition.physics.template === template,
  )
  if (!d) throw new Error(`no demo problem on ${template}`)
  return { ...d.definition, title: `${d.definition.title} ${tag}`, tags: { ...d.definition.tags, topics: [tag] } }
}

function editorForm(def: ProblemDefinition, extra: Record<string, string>, cookie: string) {
  const body = new URLSearchParams({ ...formValuesFromDefinition(def), visibility: 'private' })
  // the blank heater row the editor always shows (its selects carry values)
  body.append('physics.inputs.heaters.2.kind', 'open')
  body.append('physics.inputs.heaters.2.drains', '')
  for (const [k, v] of Object.entries(extra)) body.set(k, v)
  return new Request(`${BASE}/bank/new`, {
    method: 'POST',
    body,
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: cookie },
  })
}

type Answer = {
  state?: { values: Record<string, string>; heaterRows?: number }
  issues?: { path: string; message: string }[]
}

describe('the heater list in the editor without JavaScript', () => {
  test('the page shows each heater as a labelled row with a Remove button naming it, and an Add button', () => {
    const def = demo('rankine-feedwater')
    const Stub = createRoutesStub([
      {
        path: '/bank/new',
        Component: () =>
          createElement(ProblemEditor, {
            state: editorStateFromDefinition(def, 'private'),
            issues: [{ path: 'physics.inputs.heaters.1.pressure', message: 'Check this pressure.' }],
            options: editorOptions(),
            preview: null,
            focusSummary: false,
            saveLabel: 'Save',
          }),
      },
    ])
    const html = renderToString(
      createElement(
        QueryClientProvider,
        { client: new QueryClient() },
        createElement(Stub, { initialEntries: ['/bank/new'] }),
      ),
    ).replaceAll('<!-- -->', '')
    expect(html).toContain('name="physics.inputs.heaters.0.kind"')
    expect(html).toContain('name="physics.inputs.heaters.1.pressure"')
    expect(html).toContain('name="physics.inputs.heaters.2.pressure"') // the blank row to type into
    expect(html).not.toContain('name="physics.inputs.heaters.3.pressure"')
    expect(html).toContain('aria-label="Heater 1 terminal temperature difference"')
    expect(html).toContain('aria-label="Remove heater 2 (deaerator)"')
    expect(html).toContain(`value="${removeHeaterIntent('heaters', 0)}"`)
    expect(html).toContain(`value="${addHeaterIntent('heaters')}"`)
    expect(html).toContain('Check this pressure.')
    expect(html).toContain('aria-describedby="field-physics-inputs-heaters-1-pressure-error"')
    // the given named in a heater field is kept as typed
    expect(html).toMatch(
      /name="physics.inputs.heaters.0.pressure"[^>]*value="pC"|value="pC"[^>]*name="physics.inputs.heaters.0.pressure"/,
    )
  })

  test('"Add a heater" shows one more blank row, and "Remove" drops the row it names, renumbered', async () => {
    const { user } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const def = demo('rankine-feedwater')
    const added = (await newAction(args(editorForm(def, { intent: addHeaterIntent('heaters') }, cookie)))) as Answer
    expect(added.state!.heaterRows).toBe(4) // two heaters and two blank rows
    expect(added.state!.values['physics.inputs.heaters.1.name']).toBe('deaerator')
    const removed = (await newAction(
      args(editorForm(def, { intent: removeHeaterIntent('heaters', 0) }, cookie)),
    )) as Answer
    expect(removed.state!.values['physics.inputs.heaters.0.name']).toBe('deaerator')
    expect(removed.state!.values['physics.inputs.heaters.0.kind']).toBe('open')
    expect(removed.state!.values['physics.inputs.heaters.1.pressure']).toBeUndefined()
    expect(removed.state!.heaterRows).toBe(2)
  })

  test('a heater row saves with the problem, and a bad kind is refused beside its field', async () => {
    const { user, viewer } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const def = demo('rankine-feedwater')
    const saved = (await newAction(args(editorForm(def, { intent: 'save' }, cookie)))) as Response
    expect(saved.status).toBe(302)
    const id = Number(saved.headers.get('Location')!.split('/').pop())
    const [version] = await db().select().from(problemVersions).where(eq(problemVersions.problemId, id))
    expect(version!.definition).toEqual(def)
    const detail = await getProblemDetail(db(), viewer, id)
    expect(detail?.latest.definition?.physics).toEqual(def.physics)
    const list = await listBankProblems(db(), viewer, BankQuerySchema.parse({ q: tag, cycle: 'rankine-feedwater' }))
    expect(list.rows.map((r) => r.id)).toEqual([id])

    const bad = (await newAction(
      args(editorForm(def, { intent: 'save', 'physics.inputs.heaters.1.kind': 'sideways' }, cookie)),
    )) as unknown as { data: Answer; init: { status: number } }
    expect(bad.init.status).toBe(400)
    expect(bad.data.issues).toContainEqual(
      expect.objectContaining({
        path: 'physics.inputs.heaters.1.kind',
        message: expect.stringMatching(/open.*closed/),
      }),
    )
  })
})

describe('steam-plant bank problems', () => {
  test('export and import carry the heater list as it was', async () => {
    const { viewer: author } = await createBankUser(db(), { name: 'Exporting Author' })
    const { viewer: importer } = await createBankUser(db())
    const def = demo('rankine-feedwater')
    const { problemId } = await createProblem(db(), author, { definition: def, visibility: 'private' })
    const doc = await exportBank(db(), author, [problemId])
    const result = await importBank(db(), importer, JSON.parse(JSON.stringify(doc)))
    if (!result.ok) throw new Error(JSON.stringify(result.errors))
    const imported = await getProblemDetail(db(), importer, result.problemIds[0]!)
    expect(imported?.latest.definition).toEqual(def)
  })

  test.each(['rankine-feedwater', 'rankine-cogeneration'])(
    'the %s preview has the key, a worked solution of every device and a T–s diagram with the dome',
    (template) => {
      const def = demo(template)
      const preview = previewProblem(def, { convention: 'chemistry' })
      expect(preview.issues).toEqual([])
      expect(preview.variants.length).toBeGreaterThan(0)
      for (const v of preview.variants) {
        if (!v.ok) throw new Error(v.error.message)
        expect(v.warnings).toEqual([])
        expect(v.key.every((k) => Number.isFinite(k.value))).toBe(true)
        expect(v.workedHtml).not.toContain('steady-flow energy balance with the enthalpies and mass fractions above')
        if (template === 'rankine-feedwater') {
          expect(v.workedHtml).toContain('deaerator')
          expect(v.diagrams.ts.curves.filter((c) => c.process.startsWith('bleed steam'))).toHaveLength(2)
        } else {
          expect(v.workedHtml).toContain('utilisation factor')
          expect(v.diagrams.ts.curves.map((c) => c.process)).toContain('process heater (isobaric cooling)')
        }
        expect(v.diagrams.ts.dome?.fluid).toBe('water')
      }
    },
  )

  test('a stored plant draws a variant per student, the net work positive in both conventions', async () => {
    const { viewer } = await createBankUser(db())
    const { problemId } = await createProblem(db(), viewer, {
      definition: demo('rankine-cogeneration'),
      visibility: 'private',
    })
    const stored = (await getProblemDetail(db(), viewer, problemId))!.latest.definition
    if (!stored) throw new Error('the stored plant does not read')
    for (const convention of ['engineering', 'chemistry'] as const) {
      const drawn = drawVariant(stored, 5, { convention })
      if (!drawn.ok) throw new Error(drawn.error.message)
      const [qP, wNet, epsU] = drawn.variant.key
      expect(qP!.value).toBeGreaterThan(0)
      expect(wNet!.value).toBeGreaterThan(0)
      expect(epsU!.value).toBeGreaterThan(0)
      expect(epsU!.value).toBeLessThan(1)
    }
  })
})
