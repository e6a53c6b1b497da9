/**
 * Reading a problem version's stored definition: the one way the server turns the jsonb
 * column into a ProblemDefinition. An older document (format 1) is upgraded
 * (upgradeDefinition, definition.ts) and every document is checked against the schema the
 * editor and the bank import use (problem-schema.ts), so a document changed by hand in the
 * database, or stored under looser rules, is caught here, with the version it belongs to,
 * instead of breaking a page or a grade further on.
 *
 * tryReadDefinition answers { ok: false, error } and never throws, for jobs and lists that
 * go on without the one broken version. readDefinition throws StoredDefinitionError: a
 * PageError (status 500) with a plain message, which orErrorPage (error-page.server.ts) turns
 * into the error page with that message, and a job records as its reason; never a stack
 * trace to the person. The log names the version and the fields that fail.
 */
import { upgradeDefinition, type ProblemDefinition } from '#app/domain/authoring/definition.ts'
import { parseDefinition, type FieldIssue } from '#app/lib/problem-schema.ts'
import { PageError } from './error-page.server.ts'

export type StoredDefinitionProblem = {
  code: 'stored-definition-invalid'
  message: string
  /** What the shape check found, by field ('finds.0.unit'), for the log. */
  issues: FieldIssue[]
}

/** A stored definition that fails the shape check: nothing can be shown or graded from it. */
export class StoredDefinitionError extends PageError {
  readonly code = 'stored-definition-invalid'
  constructor(readonly problem: StoredDefinitionProblem) {
    super(problem.message, 500)
    this.name = 'StoredDefinitionError'
  }
}

export type StoredDefinitionResult =
  { ok: true; definition: ProblemDefinition } | { ok: false; error: StoredDefinitionProblem }

// Logged once per version and process: a list shown again and again should not fill the log.
const reported = new Set<number | undefined>()
const REPORTED_LIMIT = 1000

function describe(versionId: number | undefined): string {
  return versionId === undefined ? 'A problem version' : `Problem version ${versionId}`
}

/** The stored definition, upgraded and checked; { ok: false } (and one line in the log) when it fails the check. */
export function tryReadDefinition(json: unknown, versionId?: number): StoredDefinitionResult {
  const upgraded = upgradeDefinition(json)
  const parsed = parseDefinition(upgraded)
  // The document as stored (upgraded), not the check's normalised copy (trimmed, topics in
  // lower case), so that pages and grades see exactly what was saved, as before this check.
  // The check passed, so it has the shape of the schema's output, which is ProblemDefinition.
  // eslint-disable-next-line @typescript-eslint/consistent-type-assertions -- what the check just passed, kept as stored
  if (parsed.ok) return { ok: true, definition: upgraded as ProblemDefinition }
  if (!reported.has(versionId) && reported.size < REPORTED_LIMIT) {
    reported.add(versionId)
    const found = parsed.issues.map((i) => `${i.path || '(whole)'}: ${i.message}`).join('; ')
    console.error(`${describe(versionId)}: the stored definition fails the shape check (${found})`)
  }
  return {
    ok: false,
    error: {
      code: 'stored-definition-invalid',
      message: `${describe(versionId)} cannot be shown or graded: its stored definition does not pass the problem check. Nothing was changed; please tell your administrator.`,
      issues: parsed.issues,
    },
  }
}

/** The stored definition, upgraded and checked; throws StoredDefinitionError when it fails the check. */
export function readDefinition(json: unknown, versionId?: number): ProblemDefinition {
  const read = tryReadDefinition(json, versionId)
  if (!read.ok) throw new StoredDefinitionError(read.error)
  return read.definition
}
