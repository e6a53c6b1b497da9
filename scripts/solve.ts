/**
 * npm run solve -- <spec.json>
 * Reads a template or general-cycle spec (docs/spec-format.md) and prints the full solution
 * as JSON. Errors go to stderr as one clear line, exit code 1, no stack trace.
 */
import { readFileSync } from 'node:fs'
import { solveSpec } from '#app/domain/thermo/index.ts'

function die(message: string): never {
  process.stderr.write(`solve: ${message}\n`)
  process.exit(1)
}

const file = process.argv.slice(2).find((a) => a !== '--')
if (!file) die('usage: npm run solve -- <spec.json>   (formats: docs/spec-format.md)')
let text: string
try {
  text = readFileSync(file, 'utf8')
} catch (e) {
  die(`cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? 'error'}`)
}
let raw: unknown
try {
  raw = JSON.parse(text)
} catch (e) {
  die(`${file} is not valid JSON: ${e instanceof Error ? e.message : String(e)}`)
}
const result = solveSpec(raw)
if (!result.ok) {
  const e = result.error
  die(`${e.message}${e.code ? ` [${e.code}]` : ''}`)
}
process.stdout.write(JSON.stringify(result, null, 2) + '\n')
