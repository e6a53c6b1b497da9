/**
 * The local fake mail server for the demo and the tests: a real SMTP server (the
 * smtp-server package) on 127.0.0.1 that accepts every message and stores it in the
 * mail_messages table (the outbox). It never relays anything anywhere.
 */
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'
import type { Db } from './db/client.server.ts'
import { mailMessages } from './db/schema.server.ts'

const MAX_MESSAGE_BYTES = 5 * 1024 * 1024

export type FakeSmtp = { port: number; close: () => Promise<void> }

export function startFakeSmtp(
  database: Db,
  port: number,
  log: (line: string) => void = console.log,
): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: MAX_MESSAGE_BYTES,
    banner: 'Cyclewright local mail catcher',
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          await database.insert(mailMessages).values({
            messageId: parsed.messageId ?? null,
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            envelopeTo: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : null,
          })
          callback()
        })
        .catch((e: unknown) => {
          log(`Local mail catcher could not store a message: ${e instanceof Error ? e.message : String(e)}`)
          callback(new Error('Message not stored'))
        })
    },
  })
  return new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => {
      server.off('error', reject)
      server.on('error', (e) => log(`Local mail catcher error: ${e.message}`))
      const address = server.server.address()
      const actual = typeof address === 'object' && address ? address.port : port
      resolve({ port: actual, close: () => new Promise<void>((r) => server.close(() => r())) })
    })
  })
}
