/**
 * The editor's buttons without JavaScript, through the new-problem page's action: "Remove"
 * on a row sends the form back without that row (renumbered, the rest as typed, nothing
 * saved), and the prompt's placeholders are checked by name when saving.
 */
import { count } from 'drizzle-orm'
import { describe, expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { formValuesFromDefinition, removeIntent } from '#app/lib/problem-form.ts'
import { action as newAction } from '#app/routes/bank/new.tsx'
import { db } from '#app/server/db/client.server.ts'
import { problems } from '#app/server/db/schema.server.ts'
import { createBankUser } from '#tests/support/factories.ts'
import { sessionCookie } from '#tests/support/login.ts'
import { args, BASE } from '#tests/support/requests.ts'

function carnot(prompt = 'An engine runs between $T_H =$ [Th] and [Tc].'): ProblemDefinition {
  return {
    format: 2,
    title: 'Carnot drill',
    tags: { topics: ['carnot'], difficulty: 'introductory', level: 'first-year' },
    convention: 'course',
    prompt,
    givens: [
      { name: 'Th', label: 'hot reservoir', unit: 'K', rule: { kind: 'range', min: 500, max: 900, step: 50 } },
      { name: 'Tc', label: 'cold reservoir', unit: 'K', rule: { kind: 'range', min: 280, max: 320, step: 10 } },
    ],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'carnot-engine',
      inputs: { gas: 'monatomic', amount: '1 mol', Th: 'Th', Tc: 'Tc', p1: '1000 kPa', expansionRatio: '2' },
    },
    finds: [
      {
        name: 'eta',
        label: 'Efficiency',
        source: { kind: 'output', path: 'totals.efficiency' },
        unit: '',
        points: 1,
        tolerance: { kind: 'relative', value: 0.01 },
        pitfalls: [],
      },
    ],
  }
}

function editorForm(def: ProblemDefinition, extra: Record<string, string>, cookie: string) {
  const body = new URLSearchParams({ ...formValuesFromDefinition(def), visibility: 'private', ...extra })
  return new Request(`${BASE}/bank/new`, {
    method: 'POST',
    body,
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: cookie },
  })
}

type Answer = {
  data?: unknown
  state?: { values: Record<string, string>; rows: Record<string, number> }
  issues?: { path: string; message: string }[]
}

describe('the editor without JavaScript', () => {
  test('"Remove" on a given sends the form back without it, renumbered, and saves nothing', async () => {
    const { user } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const before = (await db().select({ n: count() }).from(problems))[0]!.n
    const r = (await newAction(
      args(
        editorForm(carnot(), { intent: removeIntent('givens', 0), 'givens.1.label': 'cold side, as typed' }, cookie),
      ),
    )) as Answer
    expect(r.state!.values['givens.0.name']).toBe('Tc')
    expect(r.state!.values['givens.0.label']).toBe('cold side, as typed')
    expect(r.state!.values['givens.1.name']).toBeUndefined()
    expect(r.state!.rows.givens).toBe(2)
    expect(r.state!.values.prompt).toBe(carnot().prompt)
    expect(r.issues).toEqual([])
    expect((await db().select({ n: count() }).from(problems))[0]!.n).toBe(before)
  })

  test('a placeholder naming no given is refused at save, naming it', async () => {
    const { user } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const r = (await newAction(args(editorForm(carnot('Between [Th] and [Tx].'), { intent: 'save' }, cookie)))) as {
      data: Answer
      init: { status: number }
    }
    expect(r.init.status).toBe(400)
    expect(r.data.issues).toEqual([
      expect.objectContaining({
        path: 'prompt',
        message: expect.stringMatching(/placeholder \[Tx\] names no given \(the givens are Th, Tc\)/),
      }),
    ])
  })
})
