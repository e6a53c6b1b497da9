/**
 * Prompts moving from definition format 1 (`@{T1}`) to 2 (`[T1]`): the migration
 * drizzle/0007_prompt_placeholders.sql rewrites stored prompts exactly as
 * upgradeLegacyPrompt does (run again here against rows written the old way, frozen ones
 * included, with givens and finds untouched), and the bank import takes an old document
 * (bank version 1, definition format 1) and a new one, storing both in today's format.
 */
import { readFile } from 'node:fs/promises'
import { eq, sql } from 'drizzle-orm'
import { describe, expect, test } from 'vitest'
import { DEFINITION_FORMAT, upgradeDefinition, type ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { upgradeLegacyPrompt } from '#app/domain/authoring/placeholders.ts'
import { BANK_FORMAT_VERSION } from '#app/lib/problem-schema.ts'
import { db } from '#app/server/db/client.server.ts'
import { problemVersions } from '#app/server/db/schema.server.ts'
import { createProblem, exportBank, freezeProblemVersion, importBank } from '#app/server/problems.server.ts'
import { createBankUser } from '#tests/support/factories.ts'

const MIGRATION = new URL('../../drizzle/0007_prompt_placeholders.sql', import.meta.url)

function carnot(prompt: string, format: number = DEFINITION_FORMAT): ProblemDefinition {
  return {
    format,
    title: 'Carnot drill',
    tags: { topics: ['carnot'], difficulty: 'introductory', level: 'first-year' },
    convention: 'course',
    prompt,
    givens: [
      { name: 'Th', label: 'hot reservoir', unit: 'K', rule: { kind: 'range', min: 500, max: 900, step: 50 } },
      { name: 'p1', label: 'start pressure', unit: 'kPa', rule: { kind: 'choice', values: [900, 1000] } },
    ],
    constraints: [],
    physics: {
      kind: 'template',
      template: 'carnot-engine',
      inputs: { gas: 'monatomic', amount: '1 mol', Th: 'Th', Tc: '300 K', p1: '@{p1}', expansionRatio: '2' },
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
  } as unknown as ProblemDefinition
}

/** Old prompts with every case the rewrite handles. */
const OLD_PROMPTS = [
  'An engine runs between $T_H =$ @{Th} and 300 K, starting at @{p1 in bar, 2 dp}.',
  'Spaces @{ Th } and options @{Th in °C, 1 dp}, @{p1, 3 sf}; a literal @@{Th} stays.',
  'Brackets [see below], [1] and the [steam tables](https://example.org/steam) and \\[Th].',
  'Math: $\\sqrt[n]{@{Th}}$, $\\left[@{Th}\\right]$ and @{Th}(absolute) and @{Th}.',
  'Unclosed @{Th stays, and @{Th\n} over two lines stays too; $5 and @{p1}.',
  'Line one @{Th}\n\nLine two [x] @{p1 in kPa}',
]

async function runMigration() {
  await db().execute(sql.raw(await readFile(MIGRATION, 'utf8')))
}

describe('the migration of stored prompts', () => {
  test('rewrites each old prompt exactly as upgradeLegacyPrompt, frozen versions too, and leaves givens, physics and finds', async () => {
    const a = await createBankUser(db())
    const ids: number[] = []
    for (const [i, prompt] of OLD_PROMPTS.entries()) {
      const made = await createProblem(db(), a.viewer, {
        definition: carnot(`Placeholder-free at first ${i}.`),
        visibility: 'private',
      })
      if (i % 2 === 0) await freezeProblemVersion(db(), made.versionId)
      // Written the way a release before format 2 stored it.
      await db()
        .update(problemVersions)
        .set({ definition: carnot(prompt, 1) })
        .where(eq(problemVersions.id, made.versionId))
      ids.push(made.versionId)
    }
    const current = await createProblem(db(), a.viewer, {
      definition: carnot('Already new: [Th] and \\[note] and @{p1}.'),
      visibility: 'private',
    })

    await runMigration()

    for (const [i, id] of ids.entries()) {
      const [row] = await db()
        .select({ definition: problemVersions.definition, frozenAt: problemVersions.frozenAt })
        .from(problemVersions)
        .where(eq(problemVersions.id, id))
      const def = row!.definition as ProblemDefinition
      expect(def.prompt, OLD_PROMPTS[i]).toBe(upgradeLegacyPrompt(OLD_PROMPTS[i]!))
      expect(def).toEqual(upgradeDefinition(carnot(OLD_PROMPTS[i]!, 1)))
      expect(def.format).toBe(2)
      const { prompt: _p, format: _f, ...rest } = def
      const { prompt: _op, format: _of, ...oldRest } = carnot(OLD_PROMPTS[i]!, 1)
      expect(rest).toEqual(oldRest)
      expect(row!.frozenAt !== null).toBe(i % 2 === 0)
    }
    expect(
      (await db().select().from(problemVersions).where(eq(problemVersions.id, ids[0]!)))[0]!.definition,
    ).toMatchObject({
      prompt: 'An engine runs between $T_H =$ [Th] and 300 K, starting at [p1 in bar, 2 dp].',
    })
    const [untouched] = await db()
      .select({ definition: problemVersions.definition })
      .from(problemVersions)
      .where(eq(problemVersions.id, current.versionId))
    expect((untouched!.definition as ProblemDefinition).prompt).toBe('Already new: [Th] and \\[note] and @{p1}.')

    // Twice changes nothing.
    const before = await db().select().from(problemVersions)
    await runMigration()
    expect(await db().select().from(problemVersions)).toEqual(before)
  })
})

describe('importing bank documents', () => {
  test('an old document (version 1, definition format 1) imports, upgraded; a new one too; both export as today’s format', async () => {
    const a = await createBankUser(db())
    const old = {
      format: 'cyclewright-bank',
      version: 1,
      exportedAt: '2026-11-30T10:00:00.000Z',
      problems: [
        {
          title: 'Carnot drill',
          definition: carnot('Between @{Th} and 300 K; write @@{ for a brace, [see notes].', 1),
        },
      ],
    }
    const oldResult = await importBank(db(), a.viewer, old)
    expect(oldResult).toMatchObject({ ok: true })
    const fresh = {
      format: 'cyclewright-bank',
      version: BANK_FORMAT_VERSION,
      exportedAt: '2026-12-03T10:00:00.000Z',
      problems: [{ title: 'Carnot drill', definition: carnot('Between [Th in °C, 0 dp] and 300 K.') }],
    }
    const newResult = await importBank(db(), a.viewer, fresh)
    expect(newResult).toMatchObject({ ok: true })
    if (!oldResult.ok || !newResult.ok) return

    const prompts = async (id: number) => {
      const rows = await db()
        .select({ definition: problemVersions.definition })
        .from(problemVersions)
        .where(eq(problemVersions.problemId, id))
      return rows.map((r) => r.definition as ProblemDefinition)
    }
    expect(await prompts(oldResult.problemIds[0]!)).toEqual([
      expect.objectContaining({ format: 2, prompt: 'Between [Th] and 300 K; write @{ for a brace, \\[see notes].' }),
    ])
    expect(await prompts(newResult.problemIds[0]!)).toEqual([
      expect.objectContaining({ format: 2, prompt: 'Between [Th in °C, 0 dp] and 300 K.' }),
    ])

    const exported = await exportBank(db(), a.viewer, 'own')
    expect(exported.version).toBe(BANK_FORMAT_VERSION)
    expect(exported.problems.map((p) => p.definition.format)).toEqual([2, 2])
    // What was exported imports again.
    expect(await importBank(db(), a.viewer, JSON.parse(JSON.stringify(exported)))).toMatchObject({ ok: true })
  })

  test('a document from a newer release is refused with a clear message', async () => {
    const a = await createBankUser(db())
    const r = await importBank(db(), a.viewer, {
      format: 'cyclewright-bank',
      version: BANK_FORMAT_VERSION + 1,
      exportedAt: '2026-12-03T10:00:00.000Z',
      problems: [],
    })
    expect(r).toMatchObject({ ok: false, errors: [{ message: expect.stringMatching(/newer Cyclewright/) }] })
  })
})
