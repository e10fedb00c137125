import { and, count, desc, eq, inArray } from 'drizzle-orm'
import { todayIso } from '../../shared/domain/access.ts'
import { visitPhase } from '../../shared/domain/visits.ts'
import type { VisitUpdate, VisitView } from '../../shared/schemas/visits.ts'
import { visitInputSchema } from '../../shared/schemas/visits.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { AppContext } from '../context.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs, invitations, memberships, users } from '../db/schema-accounts.ts'
import { squads } from '../db/schema-athletes.ts'
import { recommendations, visitSquads, visits } from '../db/schema-visits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { enqueueMail } from '../mail/outbox.ts'
import { assertInvitable, insertInvitation } from './invitations.ts'

// Visits: the director schedules, changes and cancels them; a clinician reads their own.

const invalid = (path: string, message: string) =>
  new AppError(400, 'invalid_input', message, [{ path, message }])

/** The visits of the club (directors) or the clinician's own, newest first. */
export async function listVisits(db: DbOrTx, access: ClubAccess): Promise<VisitView[]> {
  const rows = await db
    .select({
      visit: visits,
      clinicianName: users.name,
      invitedEmail: invitations.email,
    })
    .from(visits)
    .leftJoin(users, eq(users.id, visits.clinicianId))
    .leftJoin(
      invitations,
      and(eq(invitations.clubId, visits.clubId), eq(invitations.id, visits.invitationId)),
    )
    .where(
      and(
        eq(visits.clubId, access.clubId),
        access.role === 'director' ? undefined : eq(visits.clinicianId, access.userId),
      ),
    )
    .orderBy(desc(visits.firstDay), desc(visits.createdAt))
  if (rows.length === 0) return []
  const ids = rows.map((r) => r.visit.id)
  const covered = await db
    .select({ visitId: visitSquads.visitId, id: squads.id, name: squads.name })
    .from(visitSquads)
    .innerJoin(
      squads,
      and(eq(squads.clubId, visitSquads.clubId), eq(squads.id, visitSquads.squadId)),
    )
    .where(and(eq(visitSquads.clubId, access.clubId), inArray(visitSquads.visitId, ids)))
    .orderBy(squads.name)
  const counts = await db
    .select({ visitId: recommendations.visitId, n: count() })
    .from(recommendations)
    .where(and(eq(recommendations.clubId, access.clubId), inArray(recommendations.visitId, ids)))
    .groupBy(recommendations.visitId)
  const today = todayIso()
  return rows.map(({ visit, clinicianName, invitedEmail }) => {
    const cancelledAt = visit.cancelledAt?.toISOString() ?? null
    return {
      id: visit.id,
      clinicianId: visit.clinicianId,
      clinicianName,
      invitedEmail: visit.clinicianId ? null : invitedEmail,
      firstDay: visit.firstDay,
      lastDay: visit.lastDay,
      agenda: visit.agenda,
      squads: covered
        .filter((s) => s.visitId === visit.id)
        .map((s) => ({ id: s.id, name: s.name })),
      cancelledAt,
      phase: visitPhase(today, { ...visit, cancelledAt }),
      recommendationCount: counts.find((c) => c.visitId === visit.id)?.n ?? 0,
    }
  })
}

/** The squads named, all of this club; another club's or an unknown id answers 404. */
async function squadsOf(db: DbOrTx, clubId: string, squadIds: string[]) {
  const unique = [...new Set(squadIds)]
  const found = await db
    .select({ id: squads.id, name: squads.name })
    .from(squads)
    .where(and(eq(squads.clubId, clubId), inArray(squads.id, unique)))
  if (found.length !== unique.length) throw notFound('No such squad in this club.')
  return found.sort((a, b) => a.name.localeCompare(b.name))
}

const visitLines = (
  clubName: string,
  visit: { firstDay: string; lastDay: string; agenda: string },
  squadNames: string[],
) => [
  '',
  `Your visit to ${clubName} runs from ${visit.firstDay} to ${visit.lastDay}.`,
  `Squads you will review: ${squadNames.join(', ')}.`,
  ...(visit.agenda ? ['', `Agenda: ${visit.agenda}`] : []),
]

/**
 * Schedules a visit, in one transaction: for a clinician of the club, the visit and a mail
 * telling them; for an e-mail address, an invitation naming the squads, and the visit waiting
 * for the invitee to accept.
 */
export async function createVisit(
  ctx: AppContext,
  access: ClubAccess,
  body: unknown,
  origin: string,
): Promise<VisitView> {
  const input = visitInputSchema.parse(body)
  if (input.lastDay < todayIso()) throw invalid('lastDay', 'The visit cannot end before today.')
  const covered = await squadsOf(ctx.db, access.clubId, input.squadIds)
  const [club] = await ctx.db.select().from(clubs).where(eq(clubs.id, access.clubId))
  const lines = visitLines(
    club!.name,
    input,
    covered.map((s) => s.name),
  )
  let clinician: { id: string; email: string } | null = null
  if (input.clinicianId) {
    const [member] = await ctx.db
      .select({ id: users.id, email: users.email, role: memberships.role })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.clubId, access.clubId), eq(memberships.userId, input.clinicianId)))
    if (!member || member.role !== 'clinician')
      throw invalid('clinicianId', 'Choose a clinician of this club.')
    clinician = member
  } else {
    await assertInvitable(ctx.db, access.clubId, input.email!)
  }
  const id = await ctx.db.transaction(async (tx) => {
    const invitation = clinician
      ? null
      : await insertInvitation(
          ctx,
          tx,
          access,
          {
            email: input.email!,
            role: 'clinician',
            accessStartsOn: input.firstDay,
            accessEndsOn: input.lastDay,
          },
          origin,
          lines.slice(2),
        )
    const [visit] = await tx
      .insert(visits)
      .values({
        clubId: access.clubId,
        clinicianId: clinician?.id ?? null,
        invitationId: invitation?.id ?? null,
        firstDay: input.firstDay,
        lastDay: input.lastDay,
        agenda: input.agenda,
        createdBy: access.userId,
      })
      .returning({ id: visits.id })
    await tx
      .insert(visitSquads)
      .values(covered.map((s) => ({ clubId: access.clubId, visitId: visit!.id, squadId: s.id })))
    if (clinician)
      await enqueueMail(tx, ctx.jobs, {
        to: clinician.email,
        subject: `Your visit to ${club!.name}, ${input.firstDay} to ${input.lastDay}`,
        text: ['Hello,', ...lines, '', `Sign in during the visit: ${origin}/sign-in`].join('\n'),
      })
    return visit!.id
  })
  return (await listVisits(ctx.db, access)).find((v) => v.id === id)!
}

async function lockedVisit(db: DbOrTx, clubId: string, visitId: string) {
  const [visit] = await db
    .select()
    .from(visits)
    .where(and(eq(visits.clubId, clubId), eq(visits.id, visitId)))
    .for('update')
  if (!visit) throw notFound('No such visit in this club.')
  if (visit.cancelledAt)
    throw new AppError(409, 'visit_cancelled', 'This visit was cancelled; schedule a new one.')
  return visit
}

/** New dates, squads or agenda for a visit not cancelled, in one transaction. */
export async function updateVisit(
  db: DbOrTx,
  access: ClubAccess,
  visitId: string,
  input: VisitUpdate,
): Promise<VisitView> {
  await db.transaction(async (tx) => {
    const visit = await lockedVisit(tx, access.clubId, visitId)
    const firstDay = input.firstDay ?? visit.firstDay
    const lastDay = input.lastDay ?? visit.lastDay
    if (lastDay < firstDay)
      throw invalid(
        input.lastDay ? 'lastDay' : 'firstDay',
        'The last day cannot be before the first day.',
      )
    await tx
      .update(visits)
      .set({ firstDay, lastDay, agenda: input.agenda ?? visit.agenda })
      .where(and(eq(visits.clubId, access.clubId), eq(visits.id, visitId)))
    if (visit.invitationId)
      await tx
        .update(invitations)
        .set({ accessStartsOn: firstDay, accessEndsOn: lastDay })
        .where(and(eq(invitations.clubId, access.clubId), eq(invitations.id, visit.invitationId)))
    if (input.squadIds) {
      const covered = await squadsOf(tx, access.clubId, input.squadIds)
      await tx
        .delete(visitSquads)
        .where(and(eq(visitSquads.clubId, access.clubId), eq(visitSquads.visitId, visitId)))
      await tx
        .insert(visitSquads)
        .values(covered.map((s) => ({ clubId: access.clubId, visitId, squadId: s.id })))
    }
  })
  return (await listVisits(db, access)).find((v) => v.id === visitId)!
}

/** Cancels a visit: the clinician's access through it ends; its recommendations stay. */
export async function cancelVisit(db: DbOrTx, access: ClubAccess, visitId: string) {
  await db.transaction(async (tx) => {
    await lockedVisit(tx, access.clubId, visitId)
    await tx
      .update(visits)
      .set({ cancelledAt: new Date() })
      .where(and(eq(visits.clubId, access.clubId), eq(visits.id, visitId)))
  })
  return (await listVisits(db, access)).find((v) => v.id === visitId)!
}
