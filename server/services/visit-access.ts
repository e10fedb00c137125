import { and, asc, eq, gte, isNull, lte } from 'drizzle-orm'
import type { DbOrTx } from '../db/client.ts'
import { squads } from '../db/schema-athletes.ts'
import { visitSquads, visits } from '../db/schema-visits.ts'

// A clinician's access to a club derives from their visits: not cancelled, and today between
// the first and the last day, both included. Only the squads those visits cover are readable.

const ofClinician = (clubId: string, userId: string) =>
  and(eq(visits.clubId, clubId), eq(visits.clinicianId, userId), isNull(visits.cancelledAt))

/** Whether a visit is open today and, if not, the next one to come. */
export async function clinicianVisitDays(
  db: DbOrTx,
  clubId: string,
  userId: string,
  today: string,
): Promise<{ open: boolean; next: { firstDay: string; lastDay: string } | null }> {
  const [next] = await db
    .select({ firstDay: visits.firstDay, lastDay: visits.lastDay })
    .from(visits)
    .where(and(ofClinician(clubId, userId), gte(visits.lastDay, today)))
    .orderBy(asc(visits.firstDay))
    .limit(1)
  if (!next) return { open: false, next: null }
  return { open: next.firstDay <= today, next }
}

/** The squads covered by the clinician's visits open today. */
export async function clinicianSquadIds(
  db: DbOrTx,
  clubId: string,
  userId: string,
  today: string,
): Promise<string[]> {
  const rows = await db
    .selectDistinct({ squadId: visitSquads.squadId })
    .from(visitSquads)
    .innerJoin(
      visits,
      and(eq(visits.clubId, visitSquads.clubId), eq(visits.id, visitSquads.visitId)),
    )
    .where(
      and(ofClinician(clubId, userId), lte(visits.firstDay, today), gte(visits.lastDay, today)),
    )
  return rows.map((r) => r.squadId)
}

/** The open visit of the clinician covering the squad (the latest to start), if any. */
export async function openVisitCovering(
  db: DbOrTx,
  clubId: string,
  userId: string,
  squadId: string,
  today: string,
) {
  const [row] = await db
    .select({ id: visits.id })
    .from(visits)
    .innerJoin(
      visitSquads,
      and(
        eq(visitSquads.clubId, visits.clubId),
        eq(visitSquads.visitId, visits.id),
        eq(visitSquads.squadId, squadId),
      ),
    )
    .where(
      and(ofClinician(clubId, userId), lte(visits.firstDay, today), gte(visits.lastDay, today)),
    )
    .orderBy(asc(visits.firstDay))
  return row ?? null
}

/**
 * A visit covering every squad of the club, for a clinician given dates on their membership
 * (as before visits existed): what they could read then, they can read now.
 */
export async function addVisitCoveringEverySquad(
  db: DbOrTx,
  input: { clubId: string; userId: string; firstDay: string; lastDay: string },
) {
  const [visit] = await db
    .insert(visits)
    .values({
      clubId: input.clubId,
      clinicianId: input.userId,
      firstDay: input.firstDay,
      lastDay: input.lastDay,
      agenda: 'Visit window of the membership',
    })
    .returning({ id: visits.id })
  const all = await db.select({ id: squads.id }).from(squads).where(eq(squads.clubId, input.clubId))
  if (all.length > 0)
    await db
      .insert(visitSquads)
      .values(all.map((s) => ({ clubId: input.clubId, visitId: visit!.id, squadId: s.id })))
  return visit!.id
}

/** Whether the person has any visit in the club, cancelled or not. */
export async function hasVisit(db: DbOrTx, clubId: string, userId: string) {
  const [row] = await db
    .select({ id: visits.id })
    .from(visits)
    .where(and(eq(visits.clubId, clubId), eq(visits.clinicianId, userId)))
    .limit(1)
  return Boolean(row)
}
