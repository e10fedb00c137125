import { and, count, eq, inArray } from 'drizzle-orm'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { progressEvents } from '../../server/db/schema-athletes.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { createSquad } from '../../server/services/squads.ts'
import { testApp, type TestApp } from './app.ts'
import { freshDatabase } from './database.ts'
import { clubWithPeople, floorTucks, signedIn } from './fixtures.ts'

/**
 * A club for the squad batch tests: a fresh database and app, the club's director, coach and
 * clinician signed in, and the standard catalogue's floor back and front tucks.
 */
export interface BatchClub {
  database: Database
  t: TestApp
  fx: Awaited<ReturnType<typeof clubWithPeople>>
  director: TestAgent
  coach: TestAgent
  clinician: TestAgent
  /** `/api/clubs/:clubId` */
  base: string
  tucks: { backTuck: string; frontTuck: string }
}

export async function openBatchClub(label: string): Promise<BatchClub> {
  const database = await freshDatabase()
  let t: TestApp | undefined
  try {
    t = await testApp(database)
    const fx = await clubWithPeople(database.db, label)
    return {
      database,
      t,
      fx,
      director: await signedIn(t, fx.people.director.email),
      coach: await signedIn(t, fx.people.coach.email),
      clinician: await signedIn(t, fx.people.clinician.email),
      base: `/api/clubs/${fx.club.id}`,
      tucks: await floorTucks(database.db, fx.club.id),
    }
  } catch (err) {
    // What was opened is closed, so that the failure shown is this one alone.
    await t?.close()
    await database.close()
    throw err
  }
}

export async function closeBatchClub(club: BatchClub | undefined) {
  await club?.t.close()
  await club?.database.close()
}

/**
 * A new junior squad of `size` athletes born in 2013, named `${givenName} ${i}` and
 * `${familyName} A`, `B`, …; the club's coach coaches it unless `coached` is false.
 */
export async function newBatchSquad(
  club: BatchClub,
  size: number,
  { coached = true, givenName = 'Ada', familyName = 'Quill' } = {},
) {
  const { database, fx, director, base } = club
  const squad = await createSquad(database.db, fx.club.id, {
    name: `${familyName} ${crypto.randomUUID().slice(0, 6)}`,
    level: 'junior',
    discipline: 'artistic-women',
  })
  if (coached)
    await director
      .put(`${base}/squads/${squad.id}/coaches`)
      .send({ userIds: [fx.people.coach.id] })
      .expect(200)
  const athletes = []
  for (let i = 0; i < size; i++) {
    athletes.push(
      await createAthlete(database.db, fx.club.id, {
        givenName: `${givenName} ${i}`,
        familyName: `${familyName} ${String.fromCharCode(65 + i)}`,
        birthYear: 2013,
        squadId: squad.id,
        discipline: 'artistic-women',
      }),
    )
  }
  return { squad, athletes }
}

/** How many events the club holds for these athletes. */
export async function eventCount(club: BatchClub, athleteIds: string[]) {
  const [row] = await club.database.db
    .select({ n: count() })
    .from(progressEvents)
    .where(
      and(
        eq(progressEvents.clubId, club.fx.club.id),
        inArray(progressEvents.athleteId, athleteIds),
      ),
    )
  return row!.n
}
