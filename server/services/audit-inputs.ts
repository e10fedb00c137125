// What an audit reads, as of a date: the catalogue, the athletes of the scope and each record's
// steps as of that date. Kept apart from running and storing audits because it is the part whose
// speed matters (see bench/audit.bench.ts).

import { and, asc, eq, isNull, sql, type SQL } from 'drizzle-orm'
import { defaultAgeThresholds, type AgeThresholdTable } from '../../shared/domain/age-categories.ts'
import type {
  AuditElement,
  AuditInputs,
  AuditRecord,
  RequirementProfile,
} from '../../shared/domain/audit/types.ts'
import { netSteps, paceOf, paceWindow, stepsAsOf } from '../../shared/domain/pace.ts'
import type { TimelinePoint } from '../../shared/domain/progress.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, progressRecords } from '../db/schema-athletes.ts'
import { ageThresholds, requirementProfiles } from '../db/schema-audits.ts'
import { elements } from '../db/schema-catalogue.ts'
import { counterpart, counterpartOfElement, progressionLength } from './catalogue-columns.ts'
import { athleteOfRecord, replayedTimeline } from './progress-records.ts'

/** Cursors opened by this process so far, for their names. */
let cursorCount = 0

/** Records one read of the cursor brings: about 200 athletes' worth. */
const defaultRecordsPerRead = 20_000
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
 * The catalogue as the audit sees it, in one query: each element's classification as stored
 * (derived on every write, the columns the catalogue's filters use too), its counterpart found by
 * key as the catalogue finds it, and the length of its progression (1 when it has no steps).
 * Only what the audit uses: deriving an element's notation and the rest for 300 elements took
 * longer than reading them.
 */
export async function auditCatalogue(db: DbOrTx, clubId: string): Promise<AuditElement[]> {
  return db
    .select({
      id: elements.id,
      name: elements.name,
      apparatus: elements.apparatus,
      direction: elements.direction,
      rotationClass: elements.rotationClass,
      twistBand: elements.twistBand,
      counterpartId: counterpart.id,
      stepCount: progressionLength(1),
    })
    .from(elements)
    .leftJoin(counterpart, counterpartOfElement)
    .where(eq(elements.clubId, clubId))
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
  { recordsPerRead = defaultRecordsPerRead }: { recordsPerRead?: number } = {},
): Promise<AuditInputs> {
  if (!Number.isSafeInteger(recordsPerRead) || recordsPerRead < 1) {
    throw new RangeError(`recordsPerRead must be a whole number of at least 1: ${recordsPerRead}`)
  }
  const inRoster = and(
    eq(athletes.clubId, clubId),
    isNull(athletes.archivedAt),
    squadId ? eq(athletes.squadId, squadId) : undefined,
  )
  // One query after another: the caller may hand us a transaction, whose one connection runs
  // one query at a time.
  const catalogue = await auditCatalogue(db, clubId)
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

  const records: AuditRecord[] = []
  // Whole steps per athlete, turned into paces once all are in: the same paces, to the last
  // digit, whatever order the rows come in (they are part of the input hash).
  const net = new Map<string, number>()
  const window = paceWindow(asOf)
  await readRecords(db, clubId, inRoster, recordsPerRead, async (rows, tx) => {
    for (const row of rows) {
      // Replayed on the cursor's own connection: in its snapshot, and without asking the pool
      // for a second connection while this one is held.
      const timeline =
        row.timeline ?? (await replayedTimeline(tx, clubId, row.athlete_id, row.element_id))
      const reached = stepsAsOf(timeline, asOf)
      if (reached === null) continue
      records.push({
        athleteId: row.athlete_id,
        elementId: row.element_id,
        stepIndex: reached[2],
      })
      net.set(row.athlete_id, (net.get(row.athlete_id) ?? 0) + netSteps(timeline, window))
    }
  })
  const paces: Record<string, number> = {}
  for (const [athleteId, steps] of net) paces[athleteId] = paceOf(steps, window)
  return {
    asOf,
    elements: catalogue,
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

interface RecordRow {
  athlete_id: string
  element_id: string
  timeline: TimelinePoint[] | null
}

/**
 * Hands the records of the athletes `inRoster` picks to `take`, `recordsPerRead` rows at a time,
 * through a cursor over one query: a large club's rows never sit in memory all at once, yet the
 * table is read in one pass (pages in key order, or a query per list of athletes, measured
 * 10–25% slower). Between reads the process is free for other work; the next rows are not asked
 * for before `take` is done with these, so the audit keeps to one core at a time (the database's
 * or this process's) and leaves the other to the web processes. Runs in a transaction (a
 * savepoint inside the caller's), which a cursor needs.
 */
async function readRecords(
  db: DbOrTx,
  clubId: string,
  inRoster: SQL | undefined,
  recordsPerRead: number,
  take: (rows: RecordRow[], tx: DbOrTx) => Promise<void>,
) {
  await db.transaction(async (tx) => {
    // The whole result is wanted: plan for all its rows, not the first tenth a cursor's plan
    // favours by default (a plan that starts fast and reads the table in key order, slower).
    // Put back afterwards: in a caller's transaction the setting would outlive this savepoint.
    const { rows: settings } = await tx.execute<{ previous: string }>(
      sql`select current_setting('cursor_tuple_fraction') as previous`,
    )
    await tx.execute(sql`select set_config('cursor_tuple_fraction', '1', true)`)
    // A name of its own (a counter, never anything a person typed): the caller's transaction may
    // hold cursors of its own. Gathers sharing one transaction still run one after another, as
    // every query on its one connection does.
    const cursor = `audit_records_${++cursorCount}`
    const query = tx
      .select({
        athleteId: progressRecords.athleteId,
        elementId: progressRecords.elementId,
        timeline: progressRecords.timeline,
      })
      .from(progressRecords)
      .innerJoin(athletes, athleteOfRecord)
      .where(and(eq(progressRecords.clubId, clubId), inRoster))
    await tx.execute(sql`declare ${sql.identifier(cursor)} no scroll cursor for ${query}`)
    // FETCH takes its count as a literal; recordsPerRead is a checked safe whole number.
    const fetch = sql`fetch ${sql.raw(String(recordsPerRead))} from ${sql.identifier(cursor)}`
    for (;;) {
      const { rows }: { rows: unknown[] } = await tx.execute(fetch)
      await take(rows as RecordRow[], tx)
      if (rows.length < recordsPerRead) break
      await yieldToOthers()
    }
    await tx.execute(sql`close ${sql.identifier(cursor)}`)
    await tx.execute(
      sql`select set_config('cursor_tuple_fraction', ${settings[0]!.previous}, true)`,
    )
  })
}
