import pg from 'pg'
import { describe, expect, test } from 'vitest'
import { isDatabaseUnavailable } from './unavailable.server.ts'

function withCode(code: string, message = 'x') {
  return Object.assign(new Error(message), { code })
}

describe('isDatabaseUnavailable', () => {
  test('knows a refused connection, a server shutting down or starting, and node-postgres’s own connection failures', () => {
    for (const e of [
      withCode('ECONNREFUSED', 'connect ECONNREFUSED 127.0.0.1:5432'),
      withCode('57P01', 'terminating connection due to administrator command'),
      withCode('57P03', 'the database system is starting up'),
      withCode('08006'),
      new Error('Connection terminated unexpectedly'),
      new Error('timeout exceeded when trying to connect'),
      // Node's dual-stack connect: one error per address tried.
      Object.assign(new AggregateError([withCode('ECONNREFUSED')], ''), {}),
      // drizzle wraps the driver's error.
      new Error('Failed query: select 1', { cause: withCode('ECONNREFUSED') }),
    ]) {
      expect(isDatabaseUnavailable(e), String(e)).toBe(true)
    }
  })

  test('leaves real bugs and bad queries alone', () => {
    for (const e of [
      new Error('boom'),
      withCode('23505', 'duplicate key'),
      withCode('42P01', 'relation does not exist'),
      new Response('x', { status: 404 }),
      null,
      'ECONNREFUSED',
    ]) {
      expect(isDatabaseUnavailable(e)).toBe(false)
    }
  })

  test('recognises what node-postgres really throws for a closed port', async () => {
    const client = new pg.Client({
      connectionString: 'postgres://nobody:x@127.0.0.1:1/none',
      connectionTimeoutMillis: 2000,
    })
    const error = await client.connect().then(
      () => null,
      (e: unknown) => e,
    )
    expect(isDatabaseUnavailable(error)).toBe(true)
  })
})
