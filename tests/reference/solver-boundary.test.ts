import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { expect, test } from 'vitest'

// The pure folders must not import the web layer, the database, the queue, Node built-ins or
// read the environment (../shared/DESIGN.md, house rules). Scan the source text of every
// non-test module.
const root = join(import.meta.dirname, '../..')
const FORBIDDEN: [RegExp, string][] = [
  [/from\s+['"]react(-dom)?(\/[^'"]*)?['"]/, 'react'],
  [/from\s+['"]react-router(\/[^'"]*)?['"]/, 'react-router'],
  [/from\s+['"]drizzle-orm(\/[^'"]*)?['"]/, 'drizzle-orm'],
  [/from\s+['"]pg['"]/, 'pg'],
  [/from\s+['"]pg-boss['"]/, 'pg-boss'],
  [/from\s+['"]#app\/server\//, '#app/server'],
  [/from\s+['"]node:/, 'node:*'],
  [/import\(\s*['"](node:|pg|react|drizzle)/, 'dynamic import'],
  [/process\.env/, 'process.env'],
]

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name)
    return statSync(p).isDirectory() ? walk(p) : /\.tsx?$/.test(name) && !/\.test\.tsx?$/.test(name) ? [p] : []
  })
}

const files = [...walk(join(root, 'app/domain/thermo')), ...walk(join(root, 'app/domain/grading')), ...walk(join(root, 'app/domain/authoring'))]

test('there are files to scan', () => expect(files.length).toBeGreaterThan(10))

test.each(files.map((f) => [relative(root, f), f]))('%s imports nothing forbidden', (_rel, f) => {
  const text = readFileSync(f, 'utf8')
  for (const [re, what] of FORBIDDEN) expect(re.test(text), `${what} in ${_rel}`).toBe(false)
})
