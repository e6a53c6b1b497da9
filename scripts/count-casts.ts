// Counts the type assertions (`x as T`, `<T>x`) in production code with the TypeScript parser,
// so the number the codebase is held to is one anybody can reproduce: `npm run count:casts`.
// `as const` is not counted (it narrows, it does not assert). `x as unknown as T` counts twice,
// as it is two assertions. Tests (*.test.ts), declaration files and generated route types are
// not production code and are left out.
//
//   npm run count:casts              totals per folder and the files with the most
//   npm run count:casts -- --list    every assertion with its file and line
import fs from 'node:fs'
import path from 'node:path'
import ts from 'typescript'

const root = path.resolve(import.meta.dirname, '..')
const FOLDERS = ['app', 'jobs']

function productionFiles(dir: string, out: string[] = []): string[] {
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name)
    if (entry.isDirectory()) {
      if (entry.name === 'node_modules' || entry.name.startsWith('.')) continue
      productionFiles(p, out)
    } else if (/\.tsx?$/.test(entry.name) && !/\.test\.tsx?$/.test(entry.name) && !entry.name.endsWith('.d.ts')) {
      out.push(p)
    }
  }
  return out
}

export interface Assertion {
  readonly file: string
  readonly line: number
  readonly text: string
}

export function assertionsIn(file: string, text: string): Assertion[] {
  const kind = file.endsWith('.tsx') ? ts.ScriptKind.TSX : ts.ScriptKind.TS
  const src = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true, kind)
  const found: Assertion[] = []
  const visit = (node: ts.Node): void => {
    if (ts.isAsExpression(node) || ts.isTypeAssertionExpression(node)) {
      const t = node.type
      const isConst = ts.isTypeReferenceNode(t) && t.typeName.getText(src) === 'const'
      if (!isConst) {
        const { line } = src.getLineAndCharacterOfPosition(node.getStart(src))
        found.push({ file, line: line + 1, text: node.getText(src).replace(/\s+/g, ' ').slice(0, 120) })
      }
    }
    ts.forEachChild(node, visit)
  }
  visit(src)
  return found
}

function main(): void {
  const list = process.argv.includes('--list')
  const all: Assertion[] = []
  for (const folder of FOLDERS) {
    for (const file of productionFiles(path.join(root, folder))) {
      all.push(...assertionsIn(path.relative(root, file), fs.readFileSync(file, 'utf8')))
    }
  }
  if (list) {
    for (const a of all) console.log(`${a.file}:${a.line}: ${a.text}`)
    return
  }
  const byFolder = new Map<string, number>()
  const byFile = new Map<string, number>()
  for (const a of all) {
    const parts = a.file.split(path.sep)
    const folder = parts.slice(0, parts[1] === 'domain' ? 3 : 2).join('/')
    byFolder.set(folder, (byFolder.get(folder) ?? 0) + 1)
    byFile.set(a.file, (byFile.get(a.file) ?? 0) + 1)
  }
  for (const [folder, n] of [...byFolder].sort()) console.log(`${String(n).padStart(5)}  ${folder}/`)
  console.log(`${String(all.length).padStart(5)}  type assertions in production code (app/, jobs/)`)
  console.log('\nmost in one file:')
  for (const [file, n] of [...byFile].sort((a, b) => b[1] - a[1]).slice(0, 10)) {
    console.log(`${String(n).padStart(5)}  ${file}`)
  }
}

if (import.meta.url === `file://${process.argv[1]}`) main()
