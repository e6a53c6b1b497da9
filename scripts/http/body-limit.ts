/**
 * Request bodies are bounded before anything reads them. Each URL has a limit from what it
 * needs: forms and JSON 1 MB (a problem document with its preview is far smaller), the
 * dispute upload its 10 MB file plus room for the fields, the bank import its 2 MB
 * document plus the same room. A body that states a larger Content-Length is refused at once
 * with 413, unread; a body without a length (chunked) is counted as it streams and cut off at
 * the limit, so at most the limit is ever held.
 */
import type { IncomingMessage } from 'node:http'
import { Readable } from 'node:stream'
import type { NextFunction, Request, Response } from 'express'
import { MAX_ATTACHMENT_BYTES } from '#app/lib/dispute-limits.ts'
import { refuse } from './refusal.ts'

const KB = 1024
const MB = 1024 * KB

/** Forms and JSON posts. */
export const DEFAULT_BODY_BYTES = 1 * MB
/** Room for the other fields and the multipart framing around an uploaded file (as the pages allow). */
export const MULTIPART_ALLOWANCE_BYTES = 64 * KB
/** The bank import's own limit on the document (MAX_IMPORT_BYTES in app/routes/bank/import.tsx; a test keeps them equal). */
export const BANK_IMPORT_DOCUMENT_BYTES = 2 * MB

type Rule = { pattern: RegExp; limit: number; what: string }

/** Paths with a `.data` twin: React Router's client posts a form there when JavaScript runs. */
const RULES: Rule[] = [
  {
    pattern: /^\/courses\/[^/]+\/assignments\/[^/]+\/problems\/[^/]+\/dispute(?:\.data)?\/?$/,
    limit: MAX_ATTACHMENT_BYTES + MULTIPART_ALLOWANCE_BYTES,
    what: `That upload is larger than ${MAX_ATTACHMENT_BYTES / MB} MB, so it was not read and nothing was sent. Go back (your browser keeps what you typed) and choose a smaller file.`,
  },
  {
    pattern: /^\/bank\/import(?:\.data)?\/?$/,
    limit: BANK_IMPORT_DOCUMENT_BYTES + MULTIPART_ALLOWANCE_BYTES,
    what: `That file is larger than ${BANK_IMPORT_DOCUMENT_BYTES / MB} MB, so it was not read. Export fewer problems at a time.`,
  },
]

const DEFAULT_MESSAGE = `That request is larger than this page accepts (${DEFAULT_BODY_BYTES / MB} MB), so it was not read and nothing was saved. Go back and send less at a time.`

export function bodyLimitFor(pathname: string): { limit: number; message: string } {
  const rule = RULES.find((r) => r.pattern.test(pathname))
  return rule ? { limit: rule.limit, message: rule.what } : { limit: DEFAULT_BODY_BYTES, message: DEFAULT_MESSAGE }
}

export class BodyTooLargeError extends Error {
  constructor(readonly limit: number) {
    super(`The request body is larger than ${limit} bytes.`)
  }
}

/**
 * The request's body as a stream that ends with BodyTooLargeError once more than `limit`
 * bytes have come. Reading starts only when the stream is read, and the socket is paused
 * whenever the reader lags (backpressure), so nothing is buffered beyond a chunk or two.
 */
export function boundedBody(req: IncomingMessage, limit: number, onExceeded: () => void): Readable {
  let seen = 0
  let started = false
  const out = new Readable({
    read() {
      if (!started) {
        started = true
        req.on('data', onData)
        req.once('end', () => out.push(null))
        req.once('error', (e) => out.destroy(e))
        req.once('aborted', () => out.destroy(new Error('The client went away before sending the whole body.')))
      }
      req.resume()
    },
    destroy(error, callback) {
      req.off('data', onData)
      req.pause()
      callback(error)
    },
  })
  function onData(chunk: Buffer) {
    seen += chunk.byteLength
    if (seen > limit) {
      req.off('data', onData)
      req.pause()
      onExceeded()
      out.destroy(new BodyTooLargeError(limit))
      return
    }
    if (!out.push(chunk)) req.pause()
  }
  return out
}

/** Keeps the bounded body for the React Router handler (scripts/http/request-handler.ts). */
export type BodyLocals = { body?: Readable }

/**
 * Express middleware: refuses a stated length over the path's limit with 413 at once, and
 * gives the request handler a bounded stream for everything else with a body. When a
 * chunked body passes the limit, the 413 is sent right then and the connection closed.
 */
export function limitBodies() {
  return (req: Request, res: Response, next: NextFunction) => {
    const { limit, message } = bodyLimitFor(req.path)
    const tooLarge = () => refuse(req, res, 413, 'That upload is too large', message, { close: true })
    const stated = req.headers['content-length']
    if (stated !== undefined) {
      const length = Number(stated)
      if (!Number.isSafeInteger(length) || length < 0) {
        refuse(req, res, 400, 'That request could not be read', 'The request states a length that is not a number.', {
          close: true,
        })
        return
      }
      if (length > limit) {
        tooLarge()
        return
      }
    }
    ;(res.locals as BodyLocals).body = boundedBody(req, limit, tooLarge)
    next()
  }
}
