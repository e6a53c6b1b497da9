/**
 * npm run solve -- <spec.json>
 * Reads a template or general-cycle spec (docs/spec-format.md) and prints the full solution
 * as JSON. Errors go to stderr as one clear line, exit code 1, no stack trace. Warnings of the
 * solution (in its "warnings" list) are also printed to stderr, one line each; exit code 0.
 */
import { readFileSync } from 'node:fs'
import { basename, isAbsolute } from 'node:path'
import { solveSpec } from '#app/domain/thermo/index.ts'

/** One line on stderr, ending with the error code in brackets; exit 1. */
function die(message: string, code: string): never {
  process.stderr.write(`solve: ${message.replace(/\s+/g, ' ').trim()} [${code}]\n`)
  process.exit(1)
}

const file = process.argv.slice(2).find((a) => a !== '--')
if (!file) die('usage: npm run solve -- <spec.json> (formats: docs/spec-format.md)', 'usage')
// The file as the user named it, but never a full path of this machine.
const shown = isAbsolute(file) ? basename(file) : file
let text: string
try {
  text = readFileSync(file, 'utf8')
} catch (e) {
  die(`cannot read ${shown}`, (e as NodeJS.ErrnoException).code ?? 'unreadable')
}
if (text.trim() === '')
  die(`${shown} is empty: a spec is a JSON object with "template" and "inputs", or "cycle"`, 'empty-file')
let raw: unknown
try {
  raw = JSON.parse(text)
} catch {
  die(`${shown} is not valid JSON (a spec is a JSON object with "template" and "inputs", or "cycle")`, 'invalid-json')
}
const result = solveSpec(raw)
if (!result.ok) {
  const e = result.error
  die(e.message, e.code || 'invalid-spec')
}
process.stdout.write(JSON.stringify(result, null, 2) + '\n')
// Warnings (never fatal) also go to stderr, one line each, so they are seen above the JSON.
const warnings = 'warnings' in result && Array.isArray(result.warnings) ? result.warnings : []
for (const w of warnings as { code: string; message: string }[])
  process.stderr.write(`solve: warning: ${w.message.replace(/\s+/g, ' ').trim()} [${w.code}]\n`)
