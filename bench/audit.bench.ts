import { eq } from 'drizzle-orm'
import { performance } from 'node:perf_hooks'
import type { DbOrTx } from '../server/db/client.ts'
import { athletes, progressEvents, progressRecords } from '../server/db/schema-athletes.ts'
import { elements } from '../server/db/schema-catalogue.ts'
import { createAthlete } from '../server/services/athletes.ts'
import { gatherInputs } from '../server/services/audit-inputs.ts'
import { runAndStore } from '../server/services/audits.ts'
import { listElements } from '../server/services/catalogue.ts'
import { createElement } from '../server/services/catalogue-writes.ts'
import { createClub } from '../server/services/clubs.ts'
import { addMembership, createUser } from '../server/services/members.ts'
import { appendHistory, type HistoryEvent } from '../server/services/progress-history.ts'
import { replayColumns } from '../server/services/progress-records.ts'
import { createSquad } from '../server/services/squads.ts'
import { report, time, timeInTurn, withBenchDatabase } from './harness.ts'

export const auditBenchAsOf = '2026-11-30'

/**
 * Builds the benchmark club through the services: 300 elements, 10 squads, 1,000 athletes with
 * 100 records each, every record climbing 4 steps (400,000 events).
 */
export async function buildAuditClub(db: DbOrTx) {
  const club = await createClub(db, { name: 'Bench club', slug: 'bench-audit' })
  const user = await createUser(db, { email: 'audit@bench.invalid', name: 'Bench' })
  await addMembership(db, { clubId: club.id, userId: user.id, role: 'director' })
  const access = { clubId: club.id, userId: user.id, role: 'director' as const }
  for (let i = (await listElements(db, club.id)).length; i < 300; i++) {
    await createElement(db, access, {
      name: `Bench element ${i}`,
      apparatus: `bench-${Math.floor(i / 2)}`,
      direction: i % 2 ? 'forward' : 'backward',
      quarterRotations: 4 * (1 + (i % 3)),
      twists: Array.from({ length: 1 + (i % 3) }, () => 0),
      shape: 'tuck',
      takeOff: 'standing',
    })
  }
  const catalogue = await listElements(db, club.id)
  const squadIds: string[] = []
  for (let s = 0; s < 10; s++) {
    squadIds.push(
      (
        await createSquad(db, club.id, {
          name: `Squad ${s}`,
          level: 'junior',
          discipline: 'artistic-women',
        })
      ).id,
    )
  }
  for (let chunk = 0; chunk < 10; chunk++) {
    const history: HistoryEvent[] = []
    for (let a = chunk * 100; a < (chunk + 1) * 100; a++) {
      const athlete = await createAthlete(db, club.id, {
        givenName: 'Bench',
        familyName: `Athlete ${a}`,
        birthYear: 2008 + (a % 10),
        squadId: squadIds[a % 10]!,
        discipline: 'artistic-women',
      })
      // 100 records per athlete, 4 events each
      for (let k = 0; k < 100; k++) {
        const element = catalogue[(a * 7 + k * 3) % catalogue.length]!
        for (let step = 0; step < 4; step++) {
          history.push({
            athleteId: athlete.id,
            elementId: element.id,
            coachId: user.id,
            change: {
              kind: 'step',
              stepIndex: step,
              occurredOn: `2026-0${1 + step * 2}-1${k % 10}`,
            },
          })
        }
      }
    }
    await appendHistory(db, club.id, history)
  }
  return { access, elementCount: catalogue.length }
}

/**
 * The audit of a club of 1,000 athletes × 300 elements (100,000 records built from about 400,000
 * events); target under 2 s. Beside it: only reading the rows it reads from PostgreSQL, and
 * only reading the events a replay of the whole history would need.
 */
export default async function auditBench() {
  await withBenchDatabase(async (database) => {
    const db = database.db
    const build = performance.now()
    const { access, elementCount } = await buildAuditClub(db)
    const clubId = access.clubId
    const events = await db.$count(progressEvents, eq(progressEvents.clubId, clubId))
    console.log(
      `\naudit: ${elementCount} elements × 1000 athletes, ${events} events (built in ${((performance.now() - build) / 1000).toFixed(0)} s)`,
    )

    // The tables were just written: collect their statistics, as autovacuum does on a live
    // database, so that no background analyze runs in the middle of the timings.
    await database.pool.query('vacuum analyze')
    // What the audit reads: one row per record (its stored timeline), the athletes and the
    // catalogue.
    const readRecords = () =>
      Promise.all([
        db
          .select({
            athleteId: progressRecords.athleteId,
            elementId: progressRecords.elementId,
            timeline: progressRecords.timeline,
          })
          .from(progressRecords)
          .where(eq(progressRecords.clubId, clubId)),
        db.select().from(elements).where(eq(elements.clubId, clubId)),
        db.select().from(athletes).where(eq(athletes.clubId, clubId)),
      ])
    // Eleven timed runs of each, in turn, so that one slow moment of the machine moves no median.
    const [audit, read, gather] = await timeInTurn(
      [
        () => runAndStore(db, access, { squadId: null, asOf: auditBenchAsOf }),
        readRecords,
        () => gatherInputs(db, clubId, null, auditBenchAsOf),
      ],
      11,
      2,
    )
    // What replaying the history would have to read: every event.
    const readEvents = await time(
      () => db.select(replayColumns).from(progressEvents).where(eq(progressEvents.clubId, clubId)),
      3,
      1,
    )
    report(
      'audit of the club (read, compute, hash, store)',
      audit!,
      read!,
      'reading the rows it reads',
    )
    report('audit of the club', audit!, readEvents, 'reading the 400,000 events')
    report('  of which gathering the inputs', gather!, read!, 'reading the rows it reads')
  })
}
