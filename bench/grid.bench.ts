import { and, eq } from 'drizzle-orm'
import { athletes, progressRecords } from '../server/db/schema-athletes.ts'
import { createAthlete } from '../server/services/athletes.ts'
import { listElements } from '../server/services/catalogue.ts'
import { createElement } from '../server/services/catalogue-writes.ts'
import { createClub } from '../server/services/clubs.ts'
import { addMembership, createUser } from '../server/services/members.ts'
import { appendHistory, type HistoryEvent } from '../server/services/progress-history.ts'
import { athleteOfRecord } from '../server/services/progress-records.ts'
import { squadGrid } from '../server/services/progress-grid.ts'
import { createSquad } from '../server/services/squads.ts'
import { report, time, withBenchDatabase } from './harness.ts'

/**
 * The squad grid for 40 athletes × 150 elements (target: under 50 ms of server time), beside
 * the one SQL query of records it needs.
 */
export default async function gridBench() {
  await withBenchDatabase(async (database) => {
    const db = database.db
    const club = await createClub(db, { name: 'Bench club', slug: 'bench' })
    const user = await createUser(db, { email: 'bench@bench.invalid', name: 'Bench' })
    await addMembership(db, { clubId: club.id, userId: user.id, role: 'director' })
    const access = { clubId: club.id, userId: user.id, role: 'director' as const }
    const squad = await createSquad(db, club.id, {
      name: 'Bench squad',
      level: 'senior',
      discipline: 'tumbling',
    })
    for (let i = (await listElements(db, club.id)).length; i < 150; i++) {
      await createElement(db, access, {
        name: `Bench element ${i}`,
        apparatus: `bench-${i}`,
        direction: i % 2 ? 'forward' : 'backward',
        quarterRotations: 4,
        twists: [0],
        shape: 'tuck',
        takeOff: 'standing',
      })
    }
    const catalogue = await listElements(db, club.id)
    const history: HistoryEvent[] = []
    for (let a = 0; a < 40; a++) {
      const athlete = await createAthlete(db, club.id, {
        givenName: 'Bench',
        familyName: `Athlete ${a}`,
        birthYear: 2010,
        squadId: squad.id,
        discipline: 'tumbling',
      })
      for (const [k, element] of catalogue.entries()) {
        for (let step = 0; step <= (a + k) % 3; step++) {
          history.push({
            athleteId: athlete.id,
            elementId: element.id,
            coachId: user.id,
            change: { kind: 'step', stepIndex: step, occurredOn: `2026-0${1 + step}-01` },
          })
        }
      }
    }
    await appendHistory(db, club.id, history)
    console.log(
      `\nsquad grid: ${catalogue.length} elements × 40 athletes, ${history.length} events`,
    )

    const grid = await time(() => squadGrid(db, access, squad.id), 60)
    const bare = await time(
      () =>
        db
          .select({
            athleteId: progressRecords.athleteId,
            elementId: progressRecords.elementId,
            stepIndex: progressRecords.stepIndex,
            paused: progressRecords.paused,
            flagged: progressRecords.flagged,
          })
          .from(progressRecords)
          .innerJoin(athletes, athleteOfRecord)
          .where(and(eq(progressRecords.clubId, club.id), eq(athletes.squadId, squad.id))),
      60,
    )
    report('GET /squads/:id/grid (service, 40 × 150)', grid, bare, 'the bare records query')
  })
}
