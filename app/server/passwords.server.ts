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

export const passwordRules = { minLength: 10, maxLength: 200 } as const
