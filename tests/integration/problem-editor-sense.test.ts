// The editor's save, through runEditorAction with a stand-in store: a find's sense is kept,
// and a pitfall that can never be recognised for its find is refused at its field, with
// everything typed kept, while a sense warning does not stop the save.
import { expect, test } from 'vitest'
import type { ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { formValuesFromDefinition } from '#app/lib/problem-form.ts'
import { runEditorAction, type SavableProblem } from '#app/server/problem-editor.server.ts'

const otto = (finds: Partial<ProblemDefinition['finds'][number]>): ProblemDefinition => ({
  format: 2,
  title: 'Otto net work',
  tags: { topics: [], difficulty: 'standard', level: 'second-year' },
  convention: 'course',
  prompt: 'Air enters at @{T1}.',
  givens: [
    { name: 'T1', label: 'intake temperature', unit: 'K', rule: { kind: 'range', min: 290, max: 310, step: 5 } },
  ],
  constraints: [],
  physics: {
    kind: 'template',
    template: 'otto',
    inputs: { gas: 'air', p1: '100 kPa', T1: 'T1', compressionRatio: '8', heatIn: '800 kJ/kg' },
  },
  finds: [
    {
      name: 'wnet',
      label: 'Work done by the air (positive)',
      source: { kind: 'output', path: 'totals.netWork' },
      unit: 'kJ/kg',
      points: 2,
      tolerance: { kind: 'relative', value: 0.01 },
      pitfalls: [],
      ...finds,
    },
  ],
})

function form(def: ProblemDefinition): FormData {
  const fd = new FormData()
  for (const [k, v] of Object.entries({ ...formValuesFromDefinition(def), visibility: 'department', intent: 'save' })) {
    if (k.endsWith('.pitfalls')) for (const p of v.split(',')) fd.append(k, p)
    else fd.append(k, v)
  }
  return fd
}

test('a find saved with its sense keeps it; a shared problem with a sense warning still saves', async () => {
  const saved: SavableProblem[] = []
  const save = async (p: SavableProblem) => (saved.push(p), 7)
  const r = await runEditorAction(form(otto({ sense: 'work-by-system' })), save)
  expect(r).toBeInstanceOf(Response)
  expect(saved[0]!.definition.finds[0]!.sense).toBe('work-by-system')
  // No sense: the words disagree with the chemistry sign, and the problem is shared; saving is not stopped.
  await runEditorAction(form(otto({})), save)
  expect(saved).toHaveLength(2)
  expect(saved[1]!.definition.finds[0]).not.toHaveProperty('sense')
})

test('the °C-for-K pitfall ticked where no °C reaches the solver is refused at its field, the typing kept', async () => {
  const saved: SavableProblem[] = []
  const r = (await runEditorAction(
    form(otto({ pitfalls: ['celsius-for-kelvin'] })),
    async (p) => (saved.push(p), 7),
  )) as unknown as {
    data: { issues: { path: string; message: string }[]; state: { values: Record<string, string> } }
    init: { status: number }
  }
  expect(saved).toEqual([])
  expect(r.init.status).toBe(400)
  expect(r.data.issues).toEqual([
    {
      path: 'finds.0.pitfalls',
      message: expect.stringMatching(
        /"celsius-for-kelvin" can never be recognised here: no temperature in °C reaches the solver/,
      ),
    },
  ])
  expect(r.data.state.values['finds.0.label']).toBe('Work done by the air (positive)')
})
