import { asc, eq } from 'drizzle-orm'
import type { DbOrTx } from '../db/client.ts'
import { plannerStations, sessionPlans } from '../db/schema-planner.ts'
import { csvFile, flag, iso, jsonFile, type ArchiveFile } from './archive-files.ts'

/**
 * The session planner's part of the club archive: the gym's stations, and every saved plan with
 * the model it was computed from, its placements and the outcome recorded from it (JSON: a plan
 * is nested; the progress it recorded is in the progress files too).
 */
export function plannerArchiveFiles(db: DbOrTx, clubId: string): ArchiveFile[] {
  return [
    csvFile(
      'planner-stations.csv',
      'settings',
      ['id', 'name', 'modality', 'capacity', 'secondsPerTurn', 'needsSpotter', 'createdAt'],
      async () =>
        (
          await db
            .select()
            .from(plannerStations)
            .where(eq(plannerStations.clubId, clubId))
            .orderBy(asc(plannerStations.name), asc(plannerStations.id))
        ).map((s) => ({ ...s, needsSpotter: flag(s.needsSpotter), createdAt: iso(s.createdAt) })),
    ),
    jsonFile(
      'session-plans.json',
      'settings',
      async () =>
        (
          await db
            .select()
            .from(sessionPlans)
            .where(eq(sessionPlans.clubId, clubId))
            .orderBy(asc(sessionPlans.sessionDate), asc(sessionPlans.id))
        ).map(({ clubId: _club, createdAt, updatedAt, recordedAt, ...plan }) => ({
          ...plan,
          createdAt: iso(createdAt),
          updatedAt: iso(updatedAt),
          recordedAt: iso(recordedAt),
        })),
      { compact: true },
    ),
  ]
}
