import { PassThrough } from 'node:stream'
import type { IncomingMessage } from 'node:http'
import { describe, expect, test } from 'vitest'
import { MAX_ATTACHMENT_BYTES } from '#app/lib/dispute-limits.ts'
import { MAX_IMPORT_BYTES } from '#app/routes/bank/import.tsx'
import { MAX_DISPUTE_BODY_BYTES } from '#app/routes/courses/assignments/dispute.tsx'
import {
  BANK_IMPORT_DOCUMENT_BYTES,
  BodyTooLargeError,
  boundedBody,
  bodyLimitFor,
  DEFAULT_BODY_BYTES,
} from './body-limit.ts'

describe('limits per path', () => {
  test('come from the pages’ own limits: the dispute upload and the bank import, 1 MB for everything else', () => {
    expect(BANK_IMPORT_DOCUMENT_BYTES).toBe(MAX_IMPORT_BYTES)
    for (const path of [
      '/courses/3/assignments/7/problems/2/dispute',
      '/courses/3/assignments/7/problems/2/dispute.data',
    ]) {
      expect(bodyLimitFor(path).limit).toBe(MAX_DISPUTE_BODY_BYTES)
    }
    expect(MAX_DISPUTE_BODY_BYTES).toBeGreaterThan(MAX_ATTACHMENT_BYTES)
    expect(bodyLimitFor('/bank/import').limit).toBeGreaterThan(MAX_IMPORT_BYTES)
    expect(bodyLimitFor('/bank/import.data').limit).toBe(bodyLimitFor('/bank/import').limit)
    for (const path of [
      '/sign-in',
      '/api/preview',
      '/courses/3/assignments/7/problems/2',
      '/courses/3/assignments/7/problems/2/dispute/x',
      '/bank/import/x',
    ]) {
      expect(bodyLimitFor(path).limit).toBe(DEFAULT_BODY_BYTES)
    }
  })
})

function fakeRequest() {
  // A PassThrough is a readable like IncomingMessage as far as the bounded body is concerned.
  return new PassThrough() as unknown as IncomingMessage & PassThrough
}

async function readAll(stream: NodeJS.ReadableStream) {
  let n = 0
  for await (const chunk of stream) n += (chunk as Buffer).byteLength
  return n
}

describe('a bounded body', () => {
  test('passes a body within the limit through unchanged', async () => {
    const req = fakeRequest()
    const body = boundedBody(req, 10, () => {})
    req.end(Buffer.from('0123456789'))
    expect(await readAll(body)).toBe(10)
  })

  test('ends with BodyTooLargeError one chunk past the limit and tells the caller, without reading on', async () => {
    const req = fakeRequest()
    let told = 0
    const body = boundedBody(req, 1000, () => told++)
    const reading = readAll(body)
    for (let i = 0; i < 5; i++) req.write(Buffer.alloc(400))
    await expect(reading).rejects.toBeInstanceOf(BodyTooLargeError)
    expect(told).toBe(1)
    expect(req.isPaused()).toBe(true)
  })

  test('does not read from the request until someone reads the body', async () => {
    const req = fakeRequest()
    boundedBody(req, 1000, () => {})
    req.write(Buffer.alloc(10))
    await new Promise((r) => setTimeout(r, 10))
    expect(req.readableLength).toBe(10)
  })
})
