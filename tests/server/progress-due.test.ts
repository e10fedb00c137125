import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { createSquad } from '../../server/services/squads.ts'
import { todayIso } from '../../shared/domain/access.ts'
import { addDays } from '../../shared/domain/progress.ts'
import type { CatalogueElement } from '../../shared/schemas/elements.ts'
import type { DueAthlete } from '../../shared/schemas/progress.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let director: TestAgent
let coach: TestAgent
let base: string
const ids = {} as Record<'recent' | 'stale' | 'never' | 'otherSquad', string>

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  const fx = await clubWithPeople(database.db, 'due')
  director = await signedIn(t, fx.people.director.email)
  coach = await signedIn(t, fx.people.coach.email)
  base = `/api/clubs/${fx.club.id}`
  // The coach has Squad A only; Squad B is another coach's.
  const other = await createSquad(database.db, fx.club.id, {
    name: 'Squad B',
    level: 'junior',
    discipline: 'artistic-women',
  })
  const athlete = async (familyName: string, squadId: string) =>
    (
      await createAthlete(database.db, fx.club.id, {
        givenName: 'Ada',
        familyName,
        birthYear: 2012,
        squadId,
        discipline: 'artistic-women',
      })
    ).id
  ids.recent = await athlete('Recent', fx.squad.id)
  ids.stale = await athlete('Stale', fx.squad.id)
  ids.never = await athlete('Never', fx.squad.id)
  ids.otherSquad = await athlete('Elsewhere', other.id)
  const [element] = (await director.get(`${base}/elements`).expect(200)).body as CatalogueElement[]
  const log = (athleteId: string, daysAgo: number) =>
    director
      .post(`${base}/athletes/${athleteId}/events`)
      .send({
        elementId: element!.id,
        kind: 'step',
        stepIndex: 0,
        occurredOn: addDays(todayIso(), -daysAgo),
        expectedLastEventId: null,
      })
      .expect(201)
  await log(ids.recent, 2)
  await log(ids.stale, 40)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const names = (body: DueAthlete[]) => body.map((a) => a.athleteName)

describe('GET /api/clubs/:clubId/progress-due', () => {
  it("lists a coach's own athletes with nothing logged for 28 days, never-logged first", async () => {
    const body = (await coach.get(`${base}/progress-due`).expect(200)).body as DueAthlete[]
    expect(names(body)).toEqual(['Ada Never', 'Ada Stale'])
    expect(body[0]!.lastEventOn).toBeNull()
    expect(body[1]!.lastEventOn).toBe(addDays(todayIso(), -40))
    expect(body[1]!.squadName).toBe('Squad A')
  })

  it('gives the director every squad, and a longer window leaves out the athlete seen 40 days ago', async () => {
    const all = (await director.get(`${base}/progress-due`).expect(200)).body as DueAthlete[]
    expect(names(all)).toEqual(['Ada Elsewhere', 'Ada Never', 'Ada Stale'])
    const longer = (await director.get(`${base}/progress-due?days=41`).expect(200)).body
    expect(names(longer)).toEqual(['Ada Elsewhere', 'Ada Never'])
    const shorter = (await director.get(`${base}/progress-due?days=2`).expect(200)).body
    expect(names(shorter)).toEqual(['Ada Elsewhere', 'Ada Never', 'Ada Stale', 'Ada Recent'])
  })

  it.each(['abc', '0', '366', '2.5'])('refuses days=%s with 400 naming the field', async (days) => {
    const res = await director.get(`${base}/progress-due?days=${days}`).expect(400)
    expect(res.body.error.issues[0].path).toBe('days')
  })
})
