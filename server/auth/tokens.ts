import { createHash, randomBytes } from 'node:crypto'

/** A URL-safe token of 256 bits from the system CSPRNG, for links sent by e-mail. */
export function newToken(): string {
  return randomBytes(32).toString('base64url')
}

/** What is stored instead of the token: a leaked table cannot be turned back into links. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}
