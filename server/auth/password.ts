import { hash, verify } from '@node-rs/argon2'

// argon2id with m=19456 KiB, t=2, p=1: the first configuration of the OWASP Password Storage
// Cheat Sheet. @node-rs/argon2 defaults to argon2id.
const options = { memoryCost: 19456, timeCost: 2, parallelism: 1 } as const

export function hashPassword(password: string): Promise<string> {
  return hash(password, options)
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password)
  } catch {
    return false
  }
}
