// What an audit reads, as of a date: the catalogue, the athletes of the scope and each record's
// steps as of that date. Kept apart from running and storing audits because it is the part whose
// speed matters (see bench/audit.bench.ts).

import { and, asc, eq, inArray, isNull } from 'drizzle-orm'
import { defaultAgeThresholds, type AgeThresholdTable } from '../../shared/domain/age-categories.ts'
import type {
  AuditInputs,
  AuditRecord,
  RequirementProfile,
} from '../../shared/domain/audit/types.ts'
import { paceWindow, stepsAsOf, timelinePace } from '../../shared/domain/progress.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, progressRecords } from '../db/schema-athletes.ts'
import { ageThresholds, requirementProfiles } from '../db/schema-audits.ts'
import { elementSteps } from '../db/schema-catalogue.ts'
import { listElements } from './catalogue.ts'
import { replayedTimeline } from './progress-records.ts'

/** Athletes whose records one query reads: about 20,000 rows for 200 athletes. */
const defaultAthletesPerBatch = 200
/** Lets the event loop run whatever is waiting (I/O, timers) before going on. */
const yieldToOthers = () => new Promise<void>((resolve) => setImmediate(resolve))

export async function clubProfiles(db: DbOrTx, clubId: string): Promise<RequirementProfile[]> {
  const rows = await db
    .select()
    .from(requirementProfiles)
    .where(eq(requirementProfiles.clubId, clubId))
    .orderBy(asc(requirementProfiles.id))
  return rows.map((r) => ({
    id: r.id,
    label: r.label,
    discipline: r.discipline,
    apparatus: r.apparatus,
    categories: r.categories as RequirementProfile['categories'],
    source: r.source,
    requirements: r.requirements as RequirementProfile['requirements'],
  }))
}

export async function clubAgeThresholds(db: DbOrTx, clubId: string): Promise<AgeThresholdTable> {
  const rows = await db.select().from(ageThresholds).where(eq(ageThresholds.clubId, clubId))
  const table = { ...defaultAgeThresholds }
  for (const r of rows)
    table[r.discipline] = {
      juniorFromAge: r.juniorFromAge,
      seniorFromAge: r.seniorFromAge,
      source: r.source,
    }
  return table
}

/**
 * Everything the audit reads, as of a date: the catalogue, the athletes of the scope, each
 * record's highest step reached by that date (in today's steps), the athletes' recent pace, the
 * club's profiles and age bands.
 *
 * The steps come from each record's stored timeline, which is the replay of all its events
 * (corrections included, wherever they fall), so no event is read here (but for a record whose
 * timeline is not stored yet, replayed from its events): the result is the same
 * as replaying the events as of the date (tests/shared/progress.test.ts checks that equivalence).
 */
export async function gatherInputs(
  db: DbOrTx,
  clubId: string,
  squadId: string | null,
  asOf: string,
  { athletesPerBatch = defaultAthletesPerBatch }: { athletesPerBatch?: number } = {},
): Promise<AuditInputs> {
  if (!Number.isInteger(athletesPerBatch) || athletesPerBatch < 1) {
    throw new RangeError(
      `athletesPerBatch must be a whole number of at least 1: ${athletesPerBatch}`,
    )
  }
  const inRoster = and(
    eq(athletes.clubId, clubId),
    isNull(athletes.archivedAt),
    squadId ? eq(athletes.squadId, squadId) : undefined,
  )
  // One query after another: the caller may hand us a transaction, whose one connection runs
  // one query at a time.
  const catalogue = await listElements(db, clubId)
  const stepRows = await db
    .select({ elementId: elementSteps.elementId, position: elementSteps.position })
    .from(elementSteps)
    .where(eq(elementSteps.clubId, clubId))
  const roster = await db
    .select({
      id: athletes.id,
      squadId: athletes.squadId,
      birthYear: athletes.birthYear,
      discipline: athletes.discipline,
    })
    .from(athletes)
    .where(inRoster)
  const profiles = await clubProfiles(db, clubId)
  const thresholds = await clubAgeThresholds(db, clubId)
  const stepCount = new Map<string, number>()
  for (const s of stepRows)
    stepCount.set(s.elementId, Math.max(stepCount.get(s.elementId) ?? 0, s.position + 1))

  // The records, a batch of athletes at a time: each batch's rows are done with before the next
  // is read, so a large club's rows never sit in memory all at once, and between batches the
  // database and this process are free for other work. Each athlete's rows come in the order
  // the table holds them, as from one query over the club.
  const records: AuditRecord[] = []
  const paces: Record<string, number> = {}
  const window = paceWindow(asOf)
  const ids = roster.map((a) => a.id).sort()
  for (let from = 0; from < ids.length; from += athletesPerBatch) {
    // One batch after another: inside the snapshot's transaction its one connection runs one
    // query at a time anyway, so asking for the next batch early would only queue it.
    const recordRows = await db
      .select({
        athleteId: progressRecords.athleteId,
        elementId: progressRecords.elementId,
        timeline: progressRecords.timeline,
      })
      .from(progressRecords)
      .where(
        and(
          eq(progressRecords.clubId, clubId),
          inArray(progressRecords.athleteId, ids.slice(from, from + athletesPerBatch)),
        ),
      )
    for (const row of recordRows) {
      const timeline =
        row.timeline ?? (await replayedTimeline(db, clubId, row.athleteId, row.elementId))
      const reached = stepsAsOf(timeline, asOf)
      if (reached === null) continue
      records.push({
        athleteId: row.athleteId,
        elementId: row.elementId,
        stepIndex: reached[2],
      })
      paces[row.athleteId] = (paces[row.athleteId] ?? 0) + timelinePace(timeline, window)
    }
    await yieldToOthers()
  }
  return {
    asOf,
    elements: catalogue.map((e) => ({
      id: e.id,
      name: e.name,
      apparatus: e.apparatus,
      direction: e.direction,
      rotationClass: e.rotationClass,
      twistBand: e.twistBand,
      counterpartId: e.counterpartId,
      stepCount: stepCount.get(e.id) ?? 1,
    })),
    athletes: roster,
    records,
    paces,
    profiles,
    ageThresholds: thresholds,
  }
}

/**
 * `gatherInputs` in one read-only snapshot: the catalogue, the roster and every batch of records
 * are read as of one moment, so an entry saved while an audit reads is in all of its reads or in
 * none. Inside a caller's transaction it reads in that transaction.
 */
export function gatherSnapshot(
  db: DbOrTx,
  clubId: string,
  squadId: string | null,
  asOf: string,
): Promise<AuditInputs> {
  return db.transaction((tx) => gatherInputs(tx, clubId, squadId, asOf), {
    isolationLevel: 'repeatable read',
    accessMode: 'read only',
  })
}
