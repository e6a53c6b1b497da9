import { describe, expect, it } from 'vitest'
import { isVersionCheck } from './check-words.ts'
import { isKeyOf, isOneOf, isRecord, readJson } from './guards.ts'

describe('isKeyOf', () => {
  const LABELS = { open: 'Open', closed: 'Closed' }
  it('accepts an own key and refuses anything else, inherited names included', () => {
    expect(isKeyOf(LABELS, 'open')).toBe(true)
    expect(isKeyOf(LABELS, 'shut')).toBe(false)
    expect(isKeyOf(LABELS, 'toString')).toBe(false)
    expect(isKeyOf(LABELS, '__proto__')).toBe(false)
    expect(isKeyOf(LABELS, 1)).toBe(false)
    expect(isKeyOf(LABELS, null)).toBe(false)
  })
})

describe('isOneOf', () => {
  it('accepts only the listed strings', () => {
    const KINDS = ['open', 'closed'] as const
    expect(isOneOf(KINDS, 'closed')).toBe(true)
    expect(isOneOf(KINDS, 'Closed')).toBe(false)
    expect(isOneOf(KINDS, undefined)).toBe(false)
  })
})

describe('readJson', () => {
  const isPoint = (v: unknown): v is { x: number } => isRecord(v) && typeof v.x === 'number'
  it('gives the body when it has the shape', async () => {
    await expect(readJson(Response.json({ x: 2 }), isPoint, 'The point')).resolves.toEqual({ x: 2 })
  })
  it('says in a sentence when the body is of another shape or not JSON', async () => {
    await expect(readJson(Response.json({ y: 2 }), isPoint, 'The point')).rejects.toThrow(
      /^The point came back in a form this page cannot read/,
    )
    await expect(readJson(new Response('<html>proxy</html>'), isPoint, 'The point')).rejects.toThrow(
      /^The point came back in a form this page cannot read/,
    )
  })
})

describe('isVersionCheck', () => {
  it('accepts each state the check route sends', () => {
    expect(isVersionCheck({ state: 'never' })).toBe(true)
    expect(isVersionCheck({ state: 'passed', total: 500, checked: 500, failed: 0 })).toBe(true)
    expect(isVersionCheck({ state: 'failed', total: 500, checked: 500, failed: 83 })).toBe(true)
    expect(isVersionCheck({ state: 'running', total: 500, checked: 20, failed: 0 })).toBe(true)
  })
  it('refuses a pass with failures, a missing count and an unknown state', () => {
    expect(isVersionCheck({ state: 'passed', total: 500, checked: 500, failed: 3 })).toBe(false)
    expect(isVersionCheck({ state: 'failed', total: 500, checked: 500 })).toBe(false)
    expect(isVersionCheck({ state: 'green' })).toBe(false)
    expect(isVersionCheck(null)).toBe(false)
  })
})
