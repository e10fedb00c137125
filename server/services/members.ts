import { randomUUID } from 'node:crypto'
import { and, eq } from 'drizzle-orm'
import type { Role } from '../../shared/domain/club.ts'
import type { MemberView, MembershipUpdate } from '../../shared/schemas/auth.ts'
import { hashPassword } from '../auth/password.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { AppContext } from '../context.ts'
import type { DbOrTx } from '../db/client.ts'
import { memberships, users } from '../db/schema-accounts.ts'
import { coachSquads } from '../db/schema-athletes.ts'
import { AppError, notFound } from '../http/errors.ts'
import { addVisitCoveringEverySquad, hasVisit } from './visit-access.ts'

export const invitationLifetimeMs = 7 * 24 * 3_600_000

export interface NewUser {
  email: string
  name: string
  /** Omitted for a person who has not set one yet. */
  password?: string
}

export async function createUser(db: DbOrTx, input: NewUser) {
  const passwordHash = input.password ? await hashPassword(input.password) : null
  const [user] = await db
    .insert(users)
    .values({
      id: randomUUID(),
      email: input.email.trim().toLowerCase(),
      name: input.name.trim(),
      passwordHash,
    })
    .returning()
  return user!
}

export interface NewMembership {
  clubId: string
  userId: string
  role: Role
  accessStartsOn?: string | null
  accessEndsOn?: string | null
}

/** Adds a member; a clinician given dates gets a visit of those dates covering every squad. */
export async function addMembership(db: DbOrTx, input: NewMembership) {
  const [membership] = await db.insert(memberships).values(input).returning()
  if (input.role === 'clinician' && input.accessStartsOn && input.accessEndsOn)
    await addVisitCoveringEverySquad(db, {
      clubId: input.clubId,
      userId: input.userId,
      firstDay: input.accessStartsOn,
      lastDay: input.accessEndsOn,
    })
  return membership!
}

/** Only clinicians carry a visit window. */
export const windowFor = (role: Role, starts?: string | null, ends?: string | null) =>
  role === 'clinician'
    ? { accessStartsOn: starts ?? null, accessEndsOn: ends ?? null }
    : { accessStartsOn: null, accessEndsOn: null }

export async function listMembers(db: DbOrTx, clubId: string): Promise<MemberView[]> {
  const rows = await db
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      accessStartsOn: memberships.accessStartsOn,
      accessEndsOn: memberships.accessEndsOn,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.clubId, clubId))
    .orderBy(memberships.role, users.name)
  const assignments = await db.select().from(coachSquads).where(eq(coachSquads.clubId, clubId))
  return rows.map((r) => ({
    ...r,
    squadIds: assignments.filter((a) => a.userId === r.userId).map((a) => a.squadId),
  }))
}

async function otherDirectors(db: DbOrTx, clubId: string, userId: string) {
  const rows = await db
    .select({ userId: memberships.userId })
    .from(memberships)
    .where(and(eq(memberships.clubId, clubId), eq(memberships.role, 'director')))
  return rows.filter((r) => r.userId !== userId).length
}

export async function updateMembership(
  ctx: AppContext,
  access: ClubAccess,
  userId: string,
  input: MembershipUpdate,
) {
  await ctx.db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.clubId, access.clubId), eq(memberships.userId, userId)))
      .for('update')
    if (!current) throw notFound('No such member in this club.')
    if (
      current.role === 'director' &&
      input.role !== 'director' &&
      (await otherDirectors(tx, access.clubId, userId)) === 0
    ) {
      throw new AppError(
        409,
        'last_director',
        'The club needs at least one director: make someone else director first.',
        [{ path: 'role', message: 'The club needs at least one director.' }],
      )
    }
    await tx
      .update(memberships)
      .set({ role: input.role, ...windowFor(input.role, input.accessStartsOn, input.accessEndsOn) })
      .where(and(eq(memberships.clubId, access.clubId), eq(memberships.userId, userId)))
    // Someone made clinician here for the first time gets their dates as a visit of every
    // squad; later dates are the Visits screen's to change.
    if (
      input.role === 'clinician' &&
      input.accessStartsOn &&
      input.accessEndsOn &&
      !(await hasVisit(tx, access.clubId, userId))
    )
      await addVisitCoveringEverySquad(tx, {
        clubId: access.clubId,
        userId,
        firstDay: input.accessStartsOn,
        lastDay: input.accessEndsOn,
      })
    if (input.role !== 'coach') {
      await tx
        .delete(coachSquads)
        .where(and(eq(coachSquads.clubId, access.clubId), eq(coachSquads.userId, userId)))
    }
  })
}

/** Ends a membership and every session of that person working in this club. */
export async function endMembership(ctx: AppContext, access: ClubAccess, userId: string) {
  await ctx.db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.clubId, access.clubId), eq(memberships.userId, userId)))
      .for('update')
    if (!current) throw notFound('No such member in this club.')
    if (current.role === 'director' && (await otherDirectors(tx, access.clubId, userId)) === 0) {
      throw new AppError(
        409,
        'last_director',
        'The club needs at least one director: make someone else director first.',
      )
    }
    await tx
      .delete(memberships)
      .where(and(eq(memberships.clubId, access.clubId), eq(memberships.userId, userId)))
  })
  await ctx.sessions.endInClub(userId, access.clubId)
}
