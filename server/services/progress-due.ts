import { and, eq, inArray, isNull, max } from 'drizzle-orm'
import { compareDue, isProgressDue } from '../../shared/domain/progress-due.ts'
import type { DueAthlete } from '../../shared/schemas/progress.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, progressRecords, squads } from '../db/schema-athletes.ts'
import { athleteOfRecord } from './progress-records.ts'
import { readableSquadIds } from './scope.ts'

/**
 * The athletes of the squads the person may read (a coach's own) with nothing logged for `days`
 * days as of `today`, the longest waiting first: what a coach has due on the gym floor.
 */
export async function progressDue(
  db: DbOrTx,
  access: ClubAccess,
  options: { days: number; today: string },
): Promise<DueAthlete[]> {
  const readable = await readableSquadIds(db, access)
  if (readable !== 'all' && readable.length === 0) return []
  const rows = await db
    .select({
      athleteId: athletes.id,
      givenName: athletes.givenName,
      familyName: athletes.familyName,
      squadId: squads.id,
      squadName: squads.name,
      lastEventOn: max(progressRecords.lastEventOn),
    })
    .from(athletes)
    .innerJoin(squads, and(eq(squads.clubId, athletes.clubId), eq(squads.id, athletes.squadId)))
    .leftJoin(progressRecords, athleteOfRecord)
    .where(
      and(
        eq(athletes.clubId, access.clubId),
        isNull(athletes.archivedAt),
        readable === 'all' ? undefined : inArray(athletes.squadId, readable),
      ),
    )
    .groupBy(athletes.id, athletes.givenName, athletes.familyName, squads.id, squads.name)
  return rows
    .map((r) => ({
      athleteId: r.athleteId,
      athleteName: `${r.givenName} ${r.familyName}`,
      squadId: r.squadId,
      squadName: r.squadName,
      lastEventOn: r.lastEventOn,
    }))
    .filter((r) => isProgressDue(r.lastEventOn, options.today, options.days))
    .sort(compareDue)
}
