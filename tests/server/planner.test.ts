import { and, asc, eq } from 'drizzle-orm'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { progressRecords } from '../../server/db/schema-athletes.ts'
import { elementSteps } from '../../server/db/schema-catalogue.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { eraseAthlete } from '../../server/services/erasure.ts'
import { createSquad } from '../../server/services/squads.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { addDays, clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let coach: TestAgent
let base: string
let frontTuck: string
let backTuck: string
let fresh: string // never started the front tuck
let started: string // on step 1 of the front tuck
let otherSquadAthlete: string
let stationIds: string[]

const person = async (squadId: string, familyName: string) =>
  (
    await createAthlete(database.db, fx.club.id, {
      givenName: 'Ada',
      familyName,
      birthYear: 2013,
      squadId,
      discipline: 'artistic-women',
    })
  ).id

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database, { worker: false })
  fx = await clubWithPeople(database.db, 'planner')
  ;({ frontTuck, backTuck } = await floorTucks(database.db, fx.club.id))
  coach = await signedIn(t, fx.people.coach.email)
  base = `/api/clubs/${fx.club.id}`
  fresh = await person(fx.squad.id, 'Fresh')
  started = await person(fx.squad.id, 'Started')
  const other = await createSquad(database.db, fx.club.id, {
    name: 'Squad B',
    level: 'junior',
    discipline: 'artistic-women',
  })
  otherSquadAthlete = await person(other.id, 'Elsewhere')
  for (const stepIndex of [0, 1]) {
    const record = await coach.get(`${base}/athletes/${started}/records/${frontTuck}`)
    await coach
      .post(`${base}/athletes/${started}/events`)
      .send({
        elementId: frontTuck,
        kind: 'step',
        stepIndex,
        occurredOn: addDays(-30 + stepIndex * 10),
        expectedLastEventId: record.body.lastEventId ?? null,
      })
      .expect(201)
  }
  // A station for every modality of the front tuck's first three steps.
  const steps = await database.db
    .select({ modality: elementSteps.modality })
    .from(elementSteps)
    .where(and(eq(elementSteps.clubId, fx.club.id), eq(elementSteps.elementId, frontTuck)))
    .orderBy(asc(elementSteps.position))
  const modalities = [...new Set(steps.slice(0, 3).map((s) => s.modality))]
  stationIds = []
  for (const modality of modalities) {
    const res = await coach
      .post(`${base}/planner/stations`)
      .send({
        name: `Station ${modality}`,
        modality,
        capacity: 2,
        secondsPerTurn: 30,
        needsSpotter: ['hand-spot', 'spotting-rig'].includes(modality),
      })
      .expect(201)
    stationIds.push(res.body.id)
  }
})
afterAll(async () => {
  await t?.close()
  await database?.close()
})

const request = (overrides: Record<string, unknown> = {}) => ({
  squadId: fx.squad.id,
  athleteIds: [fresh, started],
  minutes: 20,
  blocks: 2,
  coaches: 1,
  stationIds,
  focus: { mode: 'elements', elementIds: [frontTuck] },
  ...overrides,
})

describe('POST /api/clubs/:clubId/planner/stations', () => {
  it.each([
    [{ name: '' }, 'name'],
    [{ secondsPerTurn: 0 }, 'secondsPerTurn'],
    [{ capacity: 1.5 }, 'capacity'],
    [{ modality: 'moon' }, 'modality'],
    [{ needsSpotter: 'yes' }, 'needsSpotter'],
  ])('refuses %o, naming the field', async (bad, field) => {
    const body = {
      name: 'Bed',
      modality: 'trampoline',
      capacity: 1,
      secondsPerTurn: 30,
      needsSpotter: false,
    }
    const res = await coach.post(`${base}/planner/stations`).send({ ...body, ...bad })
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain(field)
  })

  it('refuses a second station of the same name', async () => {
    const res = await coach.post(`${base}/planner/stations`).send({
      name: (await coach.get(`${base}/planner/stations`)).body[0].name,
      modality: 'trampoline',
      capacity: 1,
      secondsPerTurn: 30,
      needsSpotter: false,
    })
    expect(res.status).toBe(409)
    expect(res.body.error.issues[0].path).toBe('name')
  })
})

describe('POST /api/clubs/:clubId/planner/plan', () => {
  it('places each athlete on the step reached or the next one, never further', async () => {
    const res = await coach.post(`${base}/planner/plan`).send(request())
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const steps = (id: string) =>
      res.body.model.athletes
        .find((a: { id: string }) => a.id === id)
        .options.map((o: { stepIndex: number }) => o.stepIndex)
    expect(steps(fresh)).toEqual([0])
    expect(steps(started)).toEqual([1, 2])
    expect(res.body.placements.length).toBeGreaterThan(0)
    expect(res.body.focusSource).toBe('chosen elements')
    expect(res.body.solver.gap).toBeGreaterThanOrEqual(0)
  })

  it.each([
    [{ minutes: undefined }, 'minutes'],
    [{ athleteIds: [] }, 'athleteIds'],
    [{ blocks: 40 }, 'blocks'],
    [{ focus: { mode: 'elements', elementIds: [] } }, 'focus.elementIds'],
    [{ stationIds: ['not-a-uuid'] }, 'stationIds.0'],
  ])('refuses %o, naming the field', async (bad, field) => {
    const res = await coach.post(`${base}/planner/plan`).send(request(bad))
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain(field)
  })

  it('refuses athletes of another squad', async () => {
    const res = await coach
      .post(`${base}/planner/plan`)
      .send(request({ athleteIds: [fresh, otherSquadAthlete] }))
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('athleteIds')
  })

  it('refuses a coach a squad not theirs', async () => {
    const res = await coach.post(`${base}/planner/plan`).send(
      request({
        squadId: (
          await createSquad(database.db, fx.club.id, {
            name: 'Squad C',
            level: 'junior',
            discipline: 'tumbling',
          })
        ).id,
      }),
    )
    expect(res.status).toBe(403)
  })

  it('asks for chosen elements when there is no audit to take the gaps from', async () => {
    const res = await coach.post(`${base}/planner/plan`).send(request({ focus: { mode: 'gaps' } }))
    expect(res.status).toBe(409)
    expect(res.body.error.issues[0].path).toBe('focus')
  })
})

describe('saved plans and their outcome', () => {
  async function saved() {
    const plan = await coach.post(`${base}/planner/plan`).send(request()).expect(200)
    const res = await coach
      .post(`${base}/plans`)
      .send({
        squadId: fx.squad.id,
        sessionDate: addDays(0),
        model: plan.body.model,
        placements: plan.body.placements,
      })
      .expect(201)
    return res.body
  }

  it('saves a plan for the squad and date, and reopens it as it was', async () => {
    const plan = await saved()
    const list = await coach.get(`${base}/plans?squadId=${fx.squad.id}`).expect(200)
    expect(list.body.map((p: { id: string }) => p.id)).toContain(plan.id)
    const again = await coach.get(`${base}/plans/${plan.id}`).expect(200)
    expect(again.body.placements).toEqual(plan.placements)
    expect(again.body.sessionDate).toBe(addDays(0))
  })

  it('refuses a placement at a station the plan does not have, naming it', async () => {
    const plan = await saved()
    const res = await coach.put(`${base}/plans/${plan.id}`).send({
      squadId: fx.squad.id,
      sessionDate: addDays(0),
      model: plan.model,
      placements: [{ ...plan.placements[0], stationId: crypto.randomUUID() }],
    })
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('placements.0')
  })

  it('records who passed their next step in one go, through the progress records', async () => {
    const plan = await saved()
    const res = await coach
      .post(`${base}/plans/${plan.id}/outcome`)
      .send({ occurredOn: addDays(0), passed: [{ athleteId: started, elementId: frontTuck }] })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.outcome.passed).toEqual([
      { athleteId: started, elementId: frontTuck, stepIndex: 2 },
    ])
    const [record] = await database.db
      .select({ stepIndex: progressRecords.stepIndex })
      .from(progressRecords)
      .where(and(eq(progressRecords.athleteId, started), eq(progressRecords.elementId, frontTuck)))
    expect(record!.stepIndex).toBe(2)
    const twice = await coach
      .post(`${base}/plans/${plan.id}/outcome`)
      .send({ occurredOn: addDays(0), passed: [] })
    expect(twice.status).toBe(409)
  })

  it('writes nothing when one pass of the batch is refused', async () => {
    const plan = await saved()
    const res = await coach.post(`${base}/plans/${plan.id}/outcome`).send({
      occurredOn: addDays(0),
      passed: [
        { athleteId: fresh, elementId: frontTuck },
        { athleteId: fresh, elementId: backTuck },
      ],
    })
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('passed.1')
    const rows = await database.db
      .select()
      .from(progressRecords)
      .where(and(eq(progressRecords.athleteId, fresh), eq(progressRecords.elementId, frontTuck)))
    expect(rows.filter((r) => r.lastEventId !== null)).toEqual([])
    expect((await coach.get(`${base}/plans/${plan.id}`)).body.recordedAt).toBeNull()
  })
})

describe('erasing an athlete for good', () => {
  it('takes them out of every saved plan, leaving the rest of the squad', async () => {
    const gone = await person(fx.squad.id, 'Leaving')
    const plan = await coach
      .post(`${base}/planner/plan`)
      .send(request({ athleteIds: [fresh, gone] }))
    const saved = await coach
      .post(`${base}/plans`)
      .send({
        squadId: fx.squad.id,
        sessionDate: addDays(0),
        model: plan.body.model,
        placements: plan.body.placements,
      })
      .expect(201)
    const director = {
      clubId: fx.club.id,
      userId: fx.people.director.id,
      role: 'director' as const,
    }
    await eraseAthlete(database.db, t.context.jobs, director, gone, { confirmName: 'Ada Leaving' })
    const after = await coach.get(`${base}/plans/${saved.body.id}`).expect(200)
    expect(JSON.stringify(after.body)).not.toContain(gone)
    expect(after.body.model.athletes.map((a: { id: string }) => a.id)).toEqual([fresh])
  })
})
