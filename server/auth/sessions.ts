import { createHash } from 'node:crypto'
import { and, eq, ne } from 'drizzle-orm'
import type { Request, RequestHandler, Response } from 'express'
import type { SessionView } from '../../shared/schemas/auth.ts'
import type { Db } from '../db/client.ts'
import { sessions } from '../db/schema-accounts.ts'
import {
  createLucia,
  generateIdFromEntropySize,
  type Session,
  type SessionSettings,
  type User,
} from './lucia.ts'

export interface AuthContext {
  user: User
  session: Session
}

declare module 'express-serve-static-core' {
  interface Request {
    /** The signed-in person, set by `loadSession`; null when signed out. */
    auth?: AuthContext | null
  }
}

/** A public handle for a session: lets a person end one of their sessions without its secret. */
export const sessionHandle = (id: string) =>
  createHash('sha256').update(id).digest('hex').slice(0, 24)

/** The stored session id: the SHA-256 of the secret in the cookie, so a leaked table signs nobody in. */
export const storedSessionId = (secret: string) => createHash('sha256').update(secret).digest('hex')

const plainCookie = 'twofold_session'
/** A device that signed in before: the password limits do not let others lock it out. */
const plainDeviceCookie = 'twofold_device'
const hostDeviceCookie = '__Host-twofold_device'
const deviceSeconds = 180 * 24 * 3600
/** Over https the cookie is __Host- prefixed: Secure, Path=/, no Domain, so no subdomain can set it. */
const hostCookie = '__Host-twofold_session'

/** Reached over https: directly, through a trusted proxy (TRUST_PROXY), or at an https PUBLIC_URL. */
const overHttps = (req: Request, settings: SessionSettings) => settings.secure || req.secure

function readCookie(header: string, name: string, pattern = /^[a-z0-9]{1,64}$/): string | null {
  for (const part of header.split(';')) {
    const eq = part.indexOf('=')
    if (eq > 0 && part.slice(0, eq).trim() === name) {
      const value = part.slice(eq + 1).trim()
      return pattern.test(value) ? value : null
    }
  }
  return null
}

/**
 * A browser-session cookie: no Max-Age or Expires, so it goes when the browser closes; the
 * server ends the session itself after the idle and absolute lifetimes.
 */
function sessionCookie(name: string, value: string, secure: boolean, clear = false) {
  const parts = [`${name}=${value}`, 'Path=/', 'HttpOnly', 'SameSite=Lax']
  if (secure) parts.push('Secure')
  if (clear) parts.push('Max-Age=0')
  return parts.join('; ')
}

/**
 * Sessions: a random id in an HttpOnly SameSite=Lax cookie, stored server side, sliding idle
 * timeout and a hard absolute lifetime counted from sign-in.
 */
export function createSessions(db: Db, settings: SessionSettings) {
  const lucia = createLucia(db, settings)
  const idleMs = settings.idleMinutes * 60_000
  const absoluteMs = settings.absoluteHours * 3_600_000

  const cookieName = (req: Request) => (overHttps(req, settings) ? hostCookie : plainCookie)

  async function start(
    req: Request,
    res: Response,
    userId: string,
    meta: { clubId: string | null },
  ) {
    const secret = generateIdFromEntropySize(25)
    const session = await lucia.createSession(
      userId,
      {
        createdAt: new Date(),
        clubId: meta.clubId,
        userAgent: req.get('user-agent')?.slice(0, 300) ?? null,
      },
      { sessionId: storedSessionId(secret) },
    )
    res.append('Set-Cookie', sessionCookie(cookieName(req), secret, overHttps(req, settings)))
    return session
  }

  function clearCookie(req: Request, res: Response) {
    res.append('Set-Cookie', sessionCookie(cookieName(req), '', overHttps(req, settings), true))
  }

  /** Reads and checks the cookie; extends the idle timeout; ends sessions past their lifetime. */
  const load: RequestHandler = async (req, res, next) => {
    req.auth = null
    const secret = readCookie(req.headers.cookie ?? '', cookieName(req))
    if (!secret) return next()
    const { session, user } = await lucia.validateSession(storedSessionId(secret))
    if (!session || !user) {
      clearCookie(req, res)
      return next()
    }
    const now = Date.now()
    const deadline = session.createdAt.getTime() + absoluteMs
    if (now >= deadline) {
      await lucia.invalidateSession(session.id)
      clearCookie(req, res)
      return next()
    }
    // Slide the idle timeout at most once a minute, never past the absolute deadline.
    const wanted = Math.min(now + idleMs, deadline)
    if (wanted - session.expiresAt.getTime() > 60_000) {
      session.expiresAt = new Date(wanted)
      await db
        .update(sessions)
        .set({ expiresAt: session.expiresAt })
        .where(eq(sessions.id, session.id))
    }
    req.auth = { session, user }
    next()
  }

  const deviceCookieName = (req: Request) =>
    overHttps(req, settings) ? hostDeviceCookie : plainDeviceCookie

  return {
    lucia,
    load,
    start,
    clearCookie,
    /** The secret of the device cookie, if the request carries one. */
    readDevice: (req: Request) =>
      readCookie(req.headers.cookie ?? '', deviceCookieName(req), /^[A-Za-z0-9_-]{43}$/),
    /** Sets the device cookie: kept for 180 days, sent to this site only, unreadable by scripts. */
    setDevice(req: Request, res: Response, secret: string) {
      const parts = [
        `${deviceCookieName(req)}=${secret}`,
        'Path=/',
        `Max-Age=${deviceSeconds}`,
        'HttpOnly',
        'SameSite=Lax',
      ]
      if (overHttps(req, settings)) parts.push('Secure')
      res.append('Set-Cookie', parts.join('; '))
    },
    async end(req: Request, res: Response) {
      if (req.auth) await lucia.invalidateSession(req.auth.session.id)
      clearCookie(req, res)
    },
    endAll: (userId: string) => lucia.invalidateUserSessions(userId),
    async endOthers(userId: string, keepId: string) {
      await db.delete(sessions).where(and(eq(sessions.userId, userId), ne(sessions.id, keepId)))
    },
    async endInClub(userId: string, clubId: string) {
      await db.delete(sessions).where(and(eq(sessions.userId, userId), eq(sessions.clubId, clubId)))
    },
    async setClub(sessionId: string, clubId: string) {
      await db.update(sessions).set({ clubId }).where(eq(sessions.id, sessionId))
    },
    async list(userId: string, currentId: string): Promise<SessionView[]> {
      const rows = await db.select().from(sessions).where(eq(sessions.userId, userId))
      return rows
        .filter((r) => r.expiresAt.getTime() > Date.now())
        .sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime())
        .map((r) => ({
          handle: sessionHandle(r.id),
          createdAt: r.createdAt.toISOString(),
          expiresAt: r.expiresAt.toISOString(),
          userAgent: r.userAgent,
          current: r.id === currentId,
        }))
    },
    /** Ends one of the person's own sessions by its handle; false when there is none. */
    async endByHandle(userId: string, handle: string) {
      const rows = await db
        .select({ id: sessions.id })
        .from(sessions)
        .where(eq(sessions.userId, userId))
      const match = rows.find((r) => sessionHandle(r.id) === handle)
      if (!match) return false
      await lucia.invalidateSession(match.id)
      return true
    },
  }
}

export type Sessions = ReturnType<typeof createSessions>
