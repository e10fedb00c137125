import { createAthlete } from '../server/services/athletes.ts'
import { listElements } from '../server/services/catalogue.ts'
import { createElement } from '../server/services/catalogue-writes.ts'
import { createClub } from '../server/services/clubs.ts'
import { addMembership, createUser } from '../server/services/members.ts'
import { saveBatch } from '../server/services/progress-batch.ts'
import { recordEvent } from '../server/services/progress-events.ts'
import { createSquad } from '../server/services/squads.ts'
import { report, time, withBenchDatabase } from './harness.ts'

/**
 * Squad batch logging: 20 athletes' "passed the next step" in one save (target: within 3× of
 * one entry), beside a single entry. Each run logs a fresh element, so every run starts each
 * record at its first step.
 */
export default async function batchBench() {
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
    const runs = 30
    const warmup = 3
    for (let i = (await listElements(db, club.id)).length; i < 2 * (runs + warmup); i++) {
      await createElement(db, access, {
        name: `Bench element ${i}`,
        apparatus: `bench-${i}`,
        direction: 'sideward',
        quarterRotations: 4,
        twists: [0],
        shape: 'tuck',
        takeOff: 'standing',
      })
    }
    const elementIds = (await listElements(db, club.id)).map((e) => e.id)
    const athleteIds: string[] = []
    for (let a = 0; a < 20; a++) {
      const athlete = await createAthlete(db, club.id, {
        givenName: 'Bench',
        familyName: `Athlete ${a}`,
        birthYear: 2010,
        squadId: squad.id,
        discipline: 'tumbling',
      })
      athleteIds.push(athlete.id)
    }
    console.log(`\nsquad batch: 20 athletes, ${elementIds.length} elements`)
    const occurredOn = '2026-11-02'

    let single = 0
    const one = await time(
      () =>
        recordEvent(db, access, athleteIds[0]!, {
          elementId: elementIds[single++]!,
          kind: 'step',
          stepIndex: 0,
          occurredOn,
          expectedLastEventId: null,
          clientEventId: crypto.randomUUID(),
        }),
      runs,
      warmup,
    )
    let batch = runs + warmup
    const twenty = await time(
      () => {
        const elementId = elementIds[batch++]!
        return saveBatch(db, access, squad.id, {
          elementId,
          occurredOn,
          dryRun: false,
          entries: athleteIds.map((athleteId) => ({
            athleteId,
            elementId,
            expectedLastEventId: null,
            clientEventId: crypto.randomUUID(),
          })),
        })
      },
      runs,
      warmup,
    )
    report('POST /squads/:id/progress-batch (service, 20 athletes)', twenty, one, 'one entry')
  })
}
