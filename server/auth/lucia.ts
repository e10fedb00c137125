import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle'
import { eq, sql } from 'drizzle-orm'
import { Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from 'lucia'
import type { Db } from '../db/client.ts'
import { sessions, users } from '../db/schema-accounts.ts'

// Every import of lucia stays in this folder, so that replacing it touches nothing else.

export interface SessionSettings {
  idleMinutes: number
  absoluteHours: number
  /** The app's public address is https: the cookie is Secure and __Host- prefixed everywhere. */
  secure: boolean
}

/**
 * The Drizzle adapter, but for the lookup every signed-in request makes: it reads only the user
 * columns a session needs (never the password hash), and its SQL is built once. Prepared under
 * an empty name, the statement is still sent unnamed, so nothing is kept on the database
 * connections (a pooler in front may give each query another one).
 */
class SessionAdapter extends DrizzlePostgreSQLAdapter {
  private readonly lookup

  constructor(db: Db) {
    super(db, sessions, users)
    this.lookup = db
      .select({
        id: sessions.id,
        userId: sessions.userId,
        expiresAt: sessions.expiresAt,
        createdAt: sessions.createdAt,
        clubId: sessions.clubId,
        userAgent: sessions.userAgent,
        email: users.email,
        name: users.name,
      })
      .from(sessions)
      .innerJoin(users, eq(sessions.userId, users.id))
      .where(eq(sessions.id, sql.placeholder('id')))
      .prepare('')
  }

  override async getSessionAndUser(
    sessionId: string,
  ): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const [row] = await this.lookup.execute({ id: sessionId })
    if (!row) return [null, null]
    const { id, userId, expiresAt, createdAt, clubId, userAgent, email, name } = row
    return [
      { id, userId, expiresAt, attributes: { createdAt, clubId, userAgent } },
      { id: userId, attributes: { email, name } },
    ]
  }
}

/**
 * Lucia keeps the session rows; the cookie is written by `sessions.ts`, which stores only the
 * SHA-256 of the cookie's secret as the session id (as lucia's own migration guide recommends).
 */
export function createLucia(db: Db, settings: SessionSettings) {
  const adapter = new SessionAdapter(db)
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
