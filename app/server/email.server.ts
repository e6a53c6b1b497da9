/**
 * Outgoing mail through nodemailer. SMTP_URL points at a real relay; without it, mail
 * goes to the local fake SMTP server (fake-smtp.server.ts) on 127.0.0.1, which keeps
 * every message in PostgreSQL for the outbox page and for tests.
 */
import nodemailer, { type Transporter } from 'nodemailer'
import { env } from './env.server.ts'
import { enqueue, type JobConnection } from './queue.server.ts'

let transporter: Transporter | undefined
let transporterKey = ''

function transport(): Transporter {
  const e = env()
  const url = e.SMTP_URL || `smtp://127.0.0.1:${e.FAKE_SMTP_PORT}`
  if (!transporter || transporterKey !== url) {
    transporter = nodemailer.createTransport(url)
    transporterKey = url
  }
  return transporter
}

export type OutgoingMail = { to: string; subject: string; text: string; html?: string }

/** Sends at once. Only the 'send-mail' job calls this; everything else queues its mail. */
export async function sendMail(mail: OutgoingMail) {
  return transport().sendMail({ from: env().MAIL_FROM, ...mail })
}

/**
 * Queues a message for the worker's 'send-mail' job, so a slow or failing relay never holds
 * up a request and a failed send is retried. With `connection` (withJobTransaction) the mail
 * is queued only if the transaction that wanted it commits.
 */
export async function queueMail(mail: OutgoingMail, options: { connection?: JobConnection } = {}) {
  return enqueue('send-mail', { v: 1, ...mail }, options)
}

function escapeHtml(s: string) {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!)
}

/** A short plain message with one link, as text and as simple HTML. */
export function linkMail(opts: {
  to: string
  subject: string
  lines: string[]
  link: string
  linkLabel: string
  after?: string[]
}): OutgoingMail {
  const text = [
    ...opts.lines,
    '',
    `${opts.linkLabel}: ${opts.link}`,
    '',
    ...(opts.after ?? []),
    '',
    '— Cyclewright',
  ].join('\n')
  const html = [
    ...opts.lines.map((l) => `<p>${escapeHtml(l)}</p>`),
    `<p><a href="${escapeHtml(opts.link)}">${escapeHtml(opts.linkLabel)}</a></p>`,
    ...(opts.after ?? []).map((l) => `<p>${escapeHtml(l)}</p>`),
    '<p>— Cyclewright</p>',
  ].join('\n')
  return { to: opts.to, subject: opts.subject, text, html }
}
