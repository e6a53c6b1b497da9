/**
 * The author guide and the bank format as pages: rendered from docs/*.md with headings that
 * can be linked to, links between the two guides kept, math through KaTeX; an unknown page
 * is a 404; students (who cannot use the bank) are refused.
 */
import { describe, expect, test } from 'vitest'
import { loader } from '#app/routes/help.tsx'
import { db } from '#app/server/db/client.server.ts'
import { createBankUser, createUser } from '#tests/support/factories.ts'
import { sessionCookie } from '#tests/support/login.ts'
import { args, getRequest, settle } from '#tests/support/requests.ts'

/** The status a loader threw: a Response, or React Router's data(message, { status }). */
function statusOf(r: { thrown: unknown } | { value: unknown }): number | null {
  if (!('thrown' in r)) return null
  const t = r.thrown as { status?: number; init?: { status?: number } }
  return t.status ?? t.init?.status ?? null
}

describe('help pages', () => {
  test('the author guide and the bank format render, with anchors and links between them', async () => {
    const { user } = await createBankUser(db())
    const cookie = await sessionCookie(user)
    const guide = (await loader(args(getRequest('/help/authoring', { Cookie: cookie }), { page: 'authoring' }))) as {
      title: string
      html: string
    }
    expect(guide.title).toBe('Writing a problem')
    expect(guide.html).toContain('<h3 id="placeholders">')
    expect(guide.html).toContain('<code>[T1 in °C, 1 dp]</code>')
    expect(guide.html).toContain('href="/help/bank-format#how-the-format-evolves"')
    expect(guide.html).not.toContain('placeholder-error')
    expect(guide.html).not.toContain('katex-error')
    const format = (await loader(
      args(getRequest('/help/bank-format', { Cookie: cookie }), { page: 'bank-format' }),
    )) as { title: string; html: string }
    expect(format.title).toBe('The bank document')
    expect(format.html).toContain('id="how-the-format-evolves"')
    expect(format.html).toContain('href="/help/authoring#placeholders"')
    expect(format.html).not.toContain('katex-error')
  })

  test('an unknown page is a 404; a student is refused', async () => {
    const { user } = await createBankUser(db())
    const missing = await settle(
      loader(args(getRequest('/help/nothing', { Cookie: await sessionCookie(user) }), { page: 'nothing' })),
    )
    expect(statusOf(missing)).toBe(404)
    const student = await createUser(db())
    const refused = await settle(
      loader(args(getRequest('/help/authoring', { Cookie: await sessionCookie(student) }), { page: 'authoring' })),
    )
    expect(statusOf(refused)).toBe(403)
  })
})
