import { randomBytes } from 'node:crypto'
import { hash, verify } from '@node-rs/argon2'

// @node-rs/argon2 hashes with argon2id by default (its Algorithm.Argon2id); the cost
// parameters are the library's defaults (m = 19 MiB, t = 2, p = 1), which follow the
// OWASP password-storage recommendation for argon2id (common practice).
export function hashPassword(password: string): Promise<string> {
  return hash(password)
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password)
  } catch {
    return false
  }
}

// A hash of a password nobody knows, made once per process, so that trying an address with
// no account (or one without a password yet) costs the same argon2 work as a wrong password
// for a real one: the time of an answer does not tell who has an account.
let dummyHash: Promise<string> | undefined
function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hash(`no account ${randomBytes(16).toString('base64url')}`)
  return dummyHash
}

/**
 * Checks a password against an account's hash; with no hash (no such account, or none set
 * yet) it verifies against the dummy hash and answers false, taking the same time.
 */
export async function checkPassword(passwordHash: string | null | undefined, password: string): Promise<boolean> {
  if (passwordHash) return verifyPassword(passwordHash, password)
  await verifyPassword(await dummyPasswordHash(), password)
  return false
}

export const passwordRules = { minLength: 10, maxLength: 200 } as const
