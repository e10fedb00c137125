import { and, eq, sql } from 'drizzle-orm'
import type { RequestHandler } from 'express'
import { z } from 'zod'
import type { Role } from '../../shared/domain/club.ts'
import { todayIso } from '../../shared/domain/access.ts'
import type { Db } from '../db/client.ts'
import { memberships } from '../db/schema-accounts.ts'
import { clinicianVisitDays } from '../services/visit-access.ts'
import { AppError } from '../http/errors.ts'
import type { Sessions } from './sessions.ts'

export interface ClubAccess {
  clubId: string
  userId: string
  role: Role
}

declare module 'express-serve-static-core' {
  interface Request {
    /** Set by `requireClubAccess` on every /api/clubs/:clubId route. */
    club?: ClubAccess
  }
}

export const unauthenticated = () => new AppError(401, 'unauthenticated', 'Please sign in.')

/** Rejects requests that are not signed in. */
export const requireSignIn: RequestHandler = (req, _res, next) => {
  next(req.auth ? undefined : unauthenticated())
}

const clubIdSchema = z.uuid()

/**
 * Deny by default: the person must be signed in and a member of the club in the path; a
 * clinician only during one of their visits (see visit-access.ts). Another club's id answers 404, as if it did not exist.
 */
export function requireClubAccess(db: Db, sessions: Sessions): RequestHandler {
  // Every club request asks it: its SQL is built once (sent unnamed, as in lucia.ts).
  const membershipOf = db
    .select({ role: memberships.role })
    .from(memberships)
    .where(
      and(
        eq(memberships.clubId, sql.placeholder('clubId')),
        eq(memberships.userId, sql.placeholder('userId')),
      ),
    )
    .prepare('')
  return async (req, _res, next) => {
    if (!req.auth) throw unauthenticated()
    const parsed = clubIdSchema.safeParse(req.params.clubId)
    if (!parsed.success) throw new AppError(404, 'not_found', 'No such club.')
    const clubId = parsed.data
    const [membership] = await membershipOf.execute({ clubId, userId: req.auth.user.id })
    if (!membership) throw new AppError(404, 'not_found', 'No such club.')
    if (membership.role === 'clinician') {
      // A clinician works in the club only during one of their visits.
      const days = await clinicianVisitDays(db, clubId, req.auth.user.id, todayIso())
      if (!days.open) {
        const when = days.next
          ? `Your next visit runs from ${days.next.firstDay} to ${days.next.lastDay}`
          : 'You have no visit scheduled'
        throw new AppError(
          403,
          'access_window_closed',
          `${when}; the club's data is open to you only during a visit.`,
        )
      }
    }
    if (req.auth.session.clubId !== clubId) {
      await sessions.setClub(req.auth.session.id, clubId)
      req.auth.session.clubId = clubId
    }
    req.club = { clubId, userId: req.auth.user.id, role: membership.role }
    next()
  }
}

const refusals: Record<Role, string> = {
  director: 'This is not available to directors.',
  coach: 'Only the technical director can do this.',
  clinician: 'Visiting clinicians can read squads and leave recommendations, not this.',
  board: 'Board members see the board summary only.',
}

/** The route's own role list, checked after `requireClubAccess`. */
export function allowRoles(allowed: readonly Role[]): RequestHandler {
  return (req, _res, next) => {
    const role = req.club?.role
    if (!role) return next(unauthenticated())
    next(allowed.includes(role) ? undefined : new AppError(403, 'forbidden', refusals[role]))
  }
}
