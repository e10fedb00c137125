import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { assignCoach, createSquad } from '../../server/services/squads.ts'
import type { SquadView } from '../../shared/schemas/squads.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let squadB: string
let squadC: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database, { worker: false })
  fx = await clubWithPeople(database.db, 'squads')
  squadB = (
    await createSquad(database.db, fx.club.id, {
      name: 'Squad B',
      level: 'senior',
      discipline: 'tumbling',
    })
  ).id
  squadC = (
    await createSquad(database.db, fx.club.id, {
      name: 'Squad C',
      level: 'development',
      discipline: 'artistic-women',
    })
  ).id
  await assignCoach(database.db, fx.club.id, squadB, fx.people.director.id)
  await assignCoach(database.db, fx.club.id, squadB, fx.people.coach.id)
  for (const [squadId, n] of [
    [fx.squad.id, 3],
    [squadB, 2],
  ] as const) {
    for (let i = 0; i < n; i++) {
      await createAthlete(database.db, fx.club.id, {
        givenName: 'Ada',
        familyName: `Squad ${squadId.slice(0, 4)} ${i}`,
        birthYear: 2012,
        squadId,
        discipline: 'artistic-women',
      })
    }
  }
  // Another club's squad and athletes count for nothing here.
  const other = await clubWithPeople(database.db, 'squads-other')
  await createAthlete(database.db, other.club.id, {
    givenName: 'Bo',
    familyName: 'Elsewhere',
    birthYear: 2012,
    squadId: other.squad.id,
    discipline: 'artistic-women',
  })
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const base = () => `/api/clubs/${fx.club.id}`

describe('GET /api/clubs/:clubId/squads', () => {
  it('lists every squad by name with its coaches and its athletes not archived', async () => {
    const director = await signedIn(t, fx.people.director.email)
    const athletes = (await director.get(`${base()}/athletes`).expect(200)).body as {
      id: string
      squadId: string
    }[]
    const archived = athletes.find((a) => a.squadId === fx.squad.id)!
    await director.patch(`${base()}/athletes/${archived.id}`).send({ archived: true }).expect(200)

    const squads = (await director.get(`${base()}/squads`).expect(200)).body as SquadView[]
    expect(squads).toEqual([
      {
        id: fx.squad.id,
        clubId: fx.club.id,
        name: 'Squad A',
        level: 'junior',
        discipline: 'artistic-women',
        coachIds: [fx.people.coach.id],
        athleteCount: 2,
      },
      {
        id: squadB,
        clubId: fx.club.id,
        name: 'Squad B',
        level: 'senior',
        discipline: 'tumbling',
        coachIds: [fx.people.director.id, fx.people.coach.id].sort(),
        athleteCount: 2,
      },
      {
        id: squadC,
        clubId: fx.club.id,
        name: 'Squad C',
        level: 'development',
        discipline: 'artistic-women',
        coachIds: [],
        athleteCount: 0,
      },
    ])
  })

  it("shows a coach only the squads they coach, with each squad's coaches", async () => {
    const coach = await signedIn(t, fx.people.coach.email)
    const squads = (await coach.get(`${base()}/squads`).expect(200)).body as SquadView[]
    expect(squads.map((s) => [s.name, s.coachIds.length])).toEqual([
      ['Squad A', 1],
      ['Squad B', 2],
    ])
  })
})
