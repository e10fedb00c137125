import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle'
import { Lucia, TimeSpan } from 'lucia'
import type { Db } from '../db/client.ts'
import { sessions, users } from '../db/schema.ts'

// Every import of lucia stays in this folder, so that replacing it touches nothing else.

export interface SessionSettings {
  idleMinutes: number
  absoluteHours: number
  /** The app's public address is https: the cookie is Secure and __Host- prefixed everywhere. */
  secure: boolean
}

/**
 * Lucia keeps the session rows; the cookie is written by `sessions.ts`, which stores only the
 * SHA-256 of the cookie's secret as the session id (as lucia's own migration guide recommends).
 */
export function createLucia(db: Db, settings: SessionSettings) {
  const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users)
  return new Lucia(adapter, {
    sessionExpiresIn: new TimeSpan(settings.idleMinutes, 'm'),
    getSessionAttributes: (attributes) => ({
      createdAt: attributes.createdAt,
      clubId: attributes.clubId ?? null,
      userAgent: attributes.userAgent ?? null,
    }),
    getUserAttributes: (attributes) => ({ email: attributes.email, name: attributes.name }),
  })
}

export type AppLucia = ReturnType<typeof createLucia>

declare module 'lucia' {
  interface Register {
    Lucia: AppLucia
    // Keys as in the Drizzle table: the adapter inserts and reads them as they are.
    DatabaseSessionAttributes: {
      createdAt: Date
      clubId: string | null
      userAgent: string | null
    }
    DatabaseUserAttributes: { email: string; name: string }
  }
}

export { generateIdFromEntropySize, type Session, type User } from 'lucia'
