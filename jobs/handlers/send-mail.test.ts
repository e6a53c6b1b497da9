import { describe, expect, test } from 'vitest'
import type { Db } from '#app/server/db/client.server.ts'
import type { OutgoingMail } from '#app/server/email.server.ts'
import { PermanentJobError } from '#app/server/queue.server.ts'
import { handleSendMail } from './send-mail.ts'

const database = {} as Db
const attempt = { number: 1, of: 6 }

function recorder(fail?: unknown) {
  const sent: OutgoingMail[] = []
  const send = async (mail: OutgoingMail) => {
    if (fail) throw fail
    sent.push(mail)
  }
  return { sent, send }
}

describe('handleSendMail', () => {
  test('sends the queued message as composed', async () => {
    const { sent, send } = recorder()
    const payload = {
      v: 1,
      to: 'ada@test.example',
      subject: 'Grades released',
      text: 'Your grades are in.',
      html: '<p>Your grades are in.</p>',
    }
    expect(await handleSendMail(payload, { database, attempt, send })).toBe('sent')
    expect(sent).toEqual([
      {
        to: 'ada@test.example',
        subject: 'Grades released',
        text: 'Your grades are in.',
        html: '<p>Your grades are in.</p>',
      },
    ])
  })

  test('a message without HTML is sent as text only', async () => {
    const { sent, send } = recorder()
    await handleSendMail({ v: 1, to: 'b@test.example', subject: 'S', text: 'T' }, { database, attempt, send })
    expect(sent).toEqual([{ to: 'b@test.example', subject: 'S', text: 'T' }])
  })

  test.each([
    ['no payload', undefined],
    ['another version', { v: 2, to: 'a@test.example', subject: 'S', text: 'T' }],
    ['not an address', { v: 1, to: 'nobody', subject: 'S', text: 'T' }],
    ['an empty subject', { v: 1, to: 'a@test.example', subject: '', text: 'T' }],
    ['no text', { v: 1, to: 'a@test.example', subject: 'S' }],
  ])('a malformed payload (%s) fails for good and sends nothing', async (_what, payload) => {
    const { sent, send } = recorder()
    await expect(handleSendMail(payload, { database, attempt, send })).rejects.toBeInstanceOf(PermanentJobError)
    expect(sent).toEqual([])
  })

  test.each([
    ['a refused connection', Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:2525'), { code: 'ECONNREFUSED' })],
    ['a temporary refusal', Object.assign(new Error('451 try again later'), { responseCode: 451 })],
  ])('%s is thrown as it is, so the job is retried', async (_what, error) => {
    const { send } = recorder(error)
    const thrown = await handleSendMail(
      { v: 1, to: 'a@test.example', subject: 'S', text: 'T' },
      { database, attempt, send },
    ).catch((e: unknown) => e)
    expect(thrown).toBe(error)
    expect(thrown).not.toBeInstanceOf(PermanentJobError)
  })

  test('a permanent refusal (5xx) fails for good with the server’s answer', async () => {
    const { send } = recorder(Object.assign(new Error('550 mailbox unavailable'), { responseCode: 550 }))
    const thrown = await handleSendMail(
      { v: 1, to: 'a@test.example', subject: 'S', text: 'T' },
      { database, attempt, send },
    ).catch((e: unknown) => e)
    expect(thrown).toBeInstanceOf(PermanentJobError)
    expect((thrown as Error).message).toContain('550 mailbox unavailable')
  })
})
