/**
 * The 'send-mail' job: one e-mail composed when it was queued, sent through
 * app/server/email.server.ts. A connection failure or a temporary (4xx) refusal is thrown
 * so pg-boss retries with backoff; a permanent (5xx) refusal will not change on retry and
 * goes straight to the dead-letter queue.
 *
 * Not idempotent by nature: a job that sends and then dies before pg-boss marks it complete
 * is sent again. One mail twice is preferred over none.
 */
import type { Db } from '#app/server/db/client.server.ts'
import { sendMail, type OutgoingMail } from '#app/server/email.server.ts'
import { PermanentJobError, queuePayloads } from '#app/server/queue.server.ts'

export type SendMailDeps = {
  database: Db
  attempt: { number: number; of: number }
  send?: (mail: OutgoingMail) => Promise<unknown>
}

function smtpResponseCode(e: unknown): number | undefined {
  const code = typeof e === 'object' && e !== null && 'responseCode' in e ? e.responseCode : undefined
  return typeof code === 'number' ? code : undefined
}

export async function handleSendMail(payload: unknown, deps: SendMailDeps): Promise<'sent'> {
  const parsed = queuePayloads['send-mail'].safeParse(payload)
  if (!parsed.success)
    throw new PermanentJobError(
      `send-mail payload is not valid: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`,
    )
  const { to, subject, text, html } = parsed.data
  try {
    await (deps.send ?? sendMail)(html === undefined ? { to, subject, text } : { to, subject, text, html })
  } catch (e) {
    const code = smtpResponseCode(e)
    const message = e instanceof Error ? e.message : String(e)
    if (code !== undefined && code >= 500 && code < 600)
      throw new PermanentJobError(`The mail server refused the message for good (${code}): ${message}`)
    throw e
  }
  return 'sent'
}
