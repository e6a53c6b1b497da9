import { describe, expect, test, vi } from 'vitest'

vi.mock('@node-rs/argon2', async (importOriginal) => {
  const real = await importOriginal<typeof import('@node-rs/argon2')>()
  return { ...real, verify: vi.fn(real.verify), hash: vi.fn(real.hash) }
})

const argon2 = await import('@node-rs/argon2')
const { checkPassword, hashPassword } = await import('./passwords.server.ts')

describe('checkPassword', () => {
  test('a real hash: true for its password, false for another', async () => {
    const h = await hashPassword('the right password')
    expect(await checkPassword(h, 'the right password')).toBe(true)
    expect(await checkPassword(h, 'not it')).toBe(false)
  })

  test('no account still runs one argon2 verify (against a dummy hash made once) and says false', async () => {
    vi.mocked(argon2.verify).mockClear()
    vi.mocked(argon2.hash).mockClear()
    expect(await checkPassword(undefined, 'anything')).toBe(false)
    expect(await checkPassword(null, 'anything else')).toBe(false)
    expect(await checkPassword('', 'a third')).toBe(false)
    expect(vi.mocked(argon2.verify)).toHaveBeenCalledTimes(3)
    const hashes = vi.mocked(argon2.verify).mock.calls.map((c) => c[0])
    expect(hashes[0]).toMatch(/^\$argon2id\$/)
    expect(new Set(hashes).size).toBe(1)
    expect(vi.mocked(argon2.hash).mock.calls.length).toBeLessThanOrEqual(1)
  })
})
