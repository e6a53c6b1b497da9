// The import boundaries are ESLint rules (eslint.config.js); `npm test` runs `eslint .` first.
// This checks that the rules bite: probe sources placed (in memory) inside app/domain and jobs/
// must be refused for each thing the rules forbid, and a clean domain module must pass.
import { ESLint } from 'eslint'
import { fileURLToPath } from 'node:url'
import { expect, test } from 'vitest'

const root = fileURLToPath(new URL('../..', import.meta.url))
const eslint = new ESLint({ cwd: root })

async function problems(file: string, code: string): Promise<string[]> {
  const [r] = await eslint.lintText(code, { filePath: `${root}${file}` })
  return (r?.messages ?? []).map((m) => `${m.ruleId}: ${m.message}`)
}

test.each([
  ['React', "import { useState } from 'react'\nexport const x = useState"],
  ['React Router', "import { Link } from 'react-router'\nexport const x = Link"],
  ['the database', "import { eq } from 'drizzle-orm'\nexport const x = eq"],
  ['the queue', "import PgBoss from 'pg-boss'\nexport const x = PgBoss"],
  ['a server module', "import { db } from '#app/server/db/client.server.ts'\nexport const x = db"],
  ['an isomorphic web helper', "import { cn } from '#app/lib/cn.ts'\nexport const x = cn"],
  ['a Node built-in', "import fs from 'node:fs'\nexport const x = fs"],
  ['the environment', 'export const x = process.env.DATABASE_URL'],
  ['a dynamic import', "export const x = () => import('pg')"],
  ['zod (parsing is for the edges)', "import { z } from 'zod'\nexport const x = z"],
])('app/domain may not use %s', async (_what, code) => {
  expect((await problems('app/domain/thermo/_probe.ts', code)).length).toBeGreaterThan(0)
})

test('a domain module that imports only the domain passes', async () => {
  expect(
    await problems(
      'app/domain/thermo/_probe.ts',
      "import { R_MOLAR } from '#app/domain/thermo/constants.ts'\nexport const x = 2 * R_MOLAR\n",
    ),
  ).toEqual([])
})

test.each([
  ['a page', "import { loader } from '#app/routes/home.tsx'\nexport const x = loader"],
  ['a component', "import { Button } from '#app/components/ui/button.tsx'\nexport const x = Button"],
  ['React Router', "import { redirect } from 'react-router'\nexport const x = redirect"],
])('a background job may not use %s', async (_what, code) => {
  expect((await problems('jobs/handlers/_probe.ts', code)).length).toBeGreaterThan(0)
})

test('a background job may use the server and the domain', async () => {
  expect(
    await problems(
      'jobs/handlers/_probe.ts',
      "import { db } from '#app/server/db/client.server.ts'\nimport { seedFrom } from '#app/domain/authoring/seed.ts'\nexport const x = [db, seedFrom]\n",
    ),
  ).toEqual([])
})

test.each([
  ['app/server/_probe.ts', 'export const f = (x: unknown) => x as string\n'],
  ['app/domain/grading/_probe.ts', 'export const f = (x: unknown) => x as unknown as number\n'],
  ['app/routes/_probe.tsx', 'export const f = (x: unknown) => (x as { a: 1 }).a\n'],
  ['jobs/handlers/_probe.ts', 'export const f = (x: unknown) => <string>x\n'],
])('production code may not assert a type (%s)', async (file, code) => {
  expect(await problems(file, code)).toContain(
    '@typescript-eslint/consistent-type-assertions: Do not use any type assertions.',
  )
})

test('`as const`, and an assertion in a test file, are allowed', async () => {
  expect(await problems('app/domain/thermo/_probe.ts', "export const KINDS = ['open', 'closed'] as const\n")).toEqual(
    [],
  )
  expect(await problems('app/domain/thermo/_probe.test.ts', 'export const f = (x: unknown) => x as string\n')).toEqual(
    [],
  )
})
