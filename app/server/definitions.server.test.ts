/**
 * The one reader of stored definitions: today's documents come back as they were stored,
 * a format-1 document is upgraded on the way (the same upgrade as the bank import), and a
 * document that fails the shape check gives a plain error with the version (a result, an
 * error with status 500, and through orErrorPage the error page), never a broken definition.
 */
import { isRouteErrorResponse } from 'react-router'
import { afterEach, describe, expect, test, vi } from 'vitest'
import { DEMO_PROBLEMS } from '#seed/problems.ts'
import { upgradeDefinition } from '#app/domain/authoring/definition.ts'
import { readDefinition, StoredDefinitionError, tryReadDefinition } from './definitions.server.ts'
import { orErrorPage } from './error-page.server.ts'

const all = DEMO_PROBLEMS.flatMap((d) => [d.definition, ...(d.earlierVersions ?? [])])

afterEach(() => {
  vi.restoreAllMocks()
})

describe('readDefinition', () => {
  test.each(all.map((d) => [d.title, d] as const))(
    '%s passes the check and reads back exactly as stored',
    (_title, def) => {
      // What the database hands back: a JSON round trip of what was written.
      expect(readDefinition(JSON.parse(JSON.stringify(def)), 1)).toEqual(def)
    },
  )

  test('a format-1 document is upgraded to today’s format', () => {
    const def = all[0]!
    const old = { ...def, format: 1, prompt: 'Between @{Th} and 300 K; write @@{ for a brace.' }
    const read = readDefinition(old, 7)
    expect(read.format).toBe(2)
    expect(read).toEqual(upgradeDefinition(old))
    expect(read.prompt).not.toContain('@{Th}')
  })

  test('a document that fails the check: a result naming the version, an error with status 500', () => {
    const log = vi.spyOn(console, 'error').mockImplementation(() => {})
    const broken = { ...all[0]!, finds: [] }
    const read = tryReadDefinition(broken, 41)
    expect(read.ok).toBe(false)
    if (read.ok) return
    expect(read.error.code).toBe('stored-definition-invalid')
    expect(read.error.message).toMatch(/^Problem version 41 cannot be shown or graded/)
    expect(read.error.issues.map((i) => i.path)).toContain('finds')
    expect(log).toHaveBeenCalledTimes(1)
    // Logged once per version, however often the page asks.
    tryReadDefinition(broken, 41)
    expect(log).toHaveBeenCalledTimes(1)

    let thrown: unknown
    try {
      readDefinition(broken, 41)
    } catch (e) {
      thrown = e
    }
    expect(thrown).toBeInstanceOf(StoredDefinitionError)
    expect((thrown as StoredDefinitionError).status).toBe(500)
  })

  test('not an object at all fails the same way', () => {
    vi.spyOn(console, 'error').mockImplementation(() => {})
    for (const raw of [null, 'text', 42, []]) expect(tryReadDefinition(raw, 42).ok).toBe(false)
  })

  test('orErrorPage turns the error into the error page with its message, not a stack trace', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {})
    const broken = { ...all[0]!, title: '' }
    let thrown: unknown
    try {
      await orErrorPage(Promise.resolve().then(() => readDefinition(broken, 43)))
    } catch (e) {
      thrown = e
    }
    // What a loader throws: data(message, { status }); the error boundary shows the message.
    expect(thrown).toMatchObject({ type: 'DataWithResponseInit', init: { status: 500 } })
    expect((thrown as { data: unknown }).data).toMatch(/^Problem version 43 cannot be shown or graded/)
    expect(isRouteErrorResponse(thrown)).toBe(false)
  })
})
