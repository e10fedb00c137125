import { and, count, eq, inArray } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { progressEvents } from '../../server/db/schema-athletes.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { createSquad } from '../../server/services/squads.ts'
import type { BatchPreview } from '../../shared/schemas/progress-batch.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

// Entries the tablet names (clientEventId) are stored once; a squad's batch is checked by the
// same rules as one entry and saved all or nothing. The rules are the product brief's (common
// practice, no published source); the step names and criteria are the standard catalogue's.

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let coach: TestAgent
let clinician: TestAgent
let base: string
let tucks: { backTuck: string; frontTuck: string }

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'batch')
  director = await signedIn(t, fx.people.director.email)
  coach = await signedIn(t, fx.people.coach.email)
  clinician = await signedIn(t, fx.people.clinician.email)
  base = `/api/clubs/${fx.club.id}`
  tucks = await floorTucks(database.db, fx.club.id)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

async function newSquad(size: number) {
  const squad = await createSquad(database.db, fx.club.id, {
    name: `Batch ${crypto.randomUUID().slice(0, 6)}`,
    level: 'junior',
    discipline: 'artistic-women',
  })
  await director
    .put(`${base}/squads/${squad.id}/coaches`)
    .send({ userIds: [fx.people.coach.id] })
    .expect(200)
  const athletes = []
  for (let i = 0; i < size; i++) {
    athletes.push(
      await createAthlete(database.db, fx.club.id, {
        givenName: `Ada ${i}`,
        familyName: `Quill ${String.fromCharCode(65 + i)}`,
        birthYear: 2013,
        squadId: squad.id,
        discipline: 'artistic-women',
      }),
    )
  }
  return { squad, athletes }
}

async function eventsOf(athleteIds: string[]) {
  const [row] = await database.db
    .select({ n: count() })
    .from(progressEvents)
    .where(
      and(eq(progressEvents.clubId, fx.club.id), inArray(progressEvents.athleteId, athleteIds)),
    )
  return row!.n
}

const step = (elementId: string, stepIndex: number, extra: Record<string, unknown> = {}) => ({
  elementId,
  kind: 'step',
  stepIndex,
  occurredOn: '2026-11-02',
  expectedLastEventId: null,
  ...extra,
})

describe('an entry named by the tablet', () => {
  it('is stored once: a repeat answers 200 with the stored event', async () => {
    const { athletes } = await newSquad(1)
    const body = step(tucks.backTuck, 0, { clientEventId: crypto.randomUUID() })
    const path = `${base}/athletes/${athletes[0]!.id}/events`
    const first = await coach.post(path).send(body).expect(201)
    expect(first.body.replayed).toBe(false)
    const again = await coach.post(path).send(body).expect(200)
    expect(again.body).toMatchObject({ eventId: first.body.eventId, replayed: true })
    expect(again.body.checks).toEqual(first.body.checks)
    expect(again.body.record.lastEventId).toBe(first.body.eventId)
    expect(await eventsOf([athletes[0]!.id])).toBe(1)
  })

  it('refuses the same id for another athlete, element or change with 409', async () => {
    const { athletes } = await newSquad(2)
    const id = crypto.randomUUID()
    const [a, b] = athletes.map((x) => `${base}/athletes/${x.id}/events`)
    await coach
      .post(a!)
      .send(step(tucks.backTuck, 0, { clientEventId: id }))
      .expect(201)
    for (const [path, body] of [
      [b!, step(tucks.backTuck, 0, { clientEventId: id })],
      [a!, step(tucks.frontTuck, 0, { clientEventId: id })],
      [a!, step(tucks.backTuck, 0, { clientEventId: id, note: 'Another entry' })],
    ] as const) {
      const res = await coach.post(path).send(body).expect(409)
      expect(res.body.error.code).toBe('client_event_reused')
      expect(res.body.error.issues[0].path).toBe('clientEventId')
    }
    expect(await eventsOf(athletes.map((x) => x.id))).toBe(1)
  })

  it('is stored once when two copies arrive at the same moment', async () => {
    const { athletes } = await newSquad(1)
    const body = step(tucks.backTuck, 0, { clientEventId: crypto.randomUUID() })
    const path = `${base}/athletes/${athletes[0]!.id}/events`
    const answers = await Promise.all([coach.post(path).send(body), coach.post(path).send(body)])
    expect(answers.map((r) => r.status).sort()).toEqual([200, 201])
    expect(answers[0]!.body.eventId).toBe(answers[1]!.body.eventId)
    expect(await eventsOf([athletes[0]!.id])).toBe(1)
  })
})

describe('a squad batch', () => {
  const batch = (squadId: string) => `${base}/squads/${squadId}/progress-batch`

  it('shows every athlete’s step, the next step with its criterion, and the single entry’s checks', async () => {
    const { squad, athletes } = await newSquad(3)
    const element = (await director.get(`${base}/elements/${tucks.backTuck}`).expect(200)).body
    const started = await coach
      .post(`${base}/athletes/${athletes[0]!.id}/events`)
      .send(step(tucks.backTuck, 0, { occurredOn: '2026-11-01' }))
      .expect(201)
    const preview: BatchPreview = (
      await coach
        .post(batch(squad.id))
        .send({ elementId: tucks.backTuck, occurredOn: '2026-11-02', dryRun: true })
        .expect(200)
    ).body
    expect(preview.rows.map((r) => r.athleteId)).toEqual(athletes.map((a) => a.id))
    const [first, second] = preview.rows
    expect(first).toMatchObject({
      stepIndex: 0,
      lastEventId: started.body.eventId,
      nextStep: { index: 1, name: element.steps[1].name, criterion: element.steps[1].criterion },
    })
    expect(second).toMatchObject({
      stepIndex: null,
      nextStep: { index: 0, name: element.steps[0].name, criterion: element.steps[0].criterion },
      checks: [],
    })
    // The standard first step's minimum is 7 days (progression templates); one day after
    // reaching it, passing on is flagged, as the single entry's check says.
    expect(element.steps[0].minDays).toBe(7)
    expect(first!.checks.map((c) => c.code)).toEqual(['min-days'])
    const single = await coach
      .post(`${base}/athletes/${athletes[0]!.id}/events/check`)
      .send(step(tucks.backTuck, 1, { expectedLastEventId: started.body.eventId }))
      .expect(200)
    expect(first!.checks).toEqual(single.body.checks)
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(1)
  })

  it('saves every ticked athlete’s next step in one request', async () => {
    const { squad, athletes } = await newSquad(3)
    const res = await coach
      .post(batch(squad.id))
      .send({
        elementId: tucks.backTuck,
        counterpartId: tucks.frontTuck,
        occurredOn: '2026-11-02',
        entries: [
          { athleteId: athletes[0]!.id, elementId: tucks.backTuck, expectedLastEventId: null },
          { athleteId: athletes[1]!.id, elementId: tucks.backTuck, expectedLastEventId: null },
          { athleteId: athletes[1]!.id, elementId: tucks.frontTuck, expectedLastEventId: null },
        ],
      })
      .expect(201)
    expect(
      res.body.results.map((r: { record: { stepIndex: number } }) => r.record.stepIndex),
    ).toEqual([0, 0, 0])
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(3)
  })

  it('saves nothing when one entry fails, naming that entry', async () => {
    const { squad, athletes } = await newSquad(4)
    const entries = athletes.map((a) => ({
      athleteId: a.id,
      elementId: tucks.backTuck,
      expectedLastEventId: null,
    }))
    // From no step to step 3 skips steps 1 and 2 (hand-worked): a reason is needed.
    entries[3] = { ...entries[3]!, stepIndex: 2 } as (typeof entries)[number]
    const res = await coach
      .post(batch(squad.id))
      .send({ elementId: tucks.backTuck, occurredOn: '2026-11-02', entries })
      .expect(400)
    expect(res.body.error.code).toBe('reason_required')
    expect(res.body.error.issues[0].path).toBe('entries.3.skipReason')
    expect(res.body.error.message).toMatch(/skips/)
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(0)

    entries[3] = { ...entries[3]!, skipReason: 'Assessed on arrival' } as (typeof entries)[number]
    const saved = await coach
      .post(batch(squad.id))
      .send({ elementId: tucks.backTuck, occurredOn: '2026-11-02', entries })
      .expect(201)
    expect(saved.body.results[3].record).toMatchObject({ stepIndex: 2, flagged: true })
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(4)
  })

  it('answers 409 for a stale record and saves none of the batch', async () => {
    const { squad, athletes } = await newSquad(2)
    await coach
      .post(`${base}/athletes/${athletes[1]!.id}/events`)
      .send(step(tucks.backTuck, 0))
      .expect(201)
    const res = await coach
      .post(batch(squad.id))
      .send({
        elementId: tucks.backTuck,
        occurredOn: '2026-11-02',
        entries: athletes.map((a) => ({
          athleteId: a.id,
          elementId: tucks.backTuck,
          expectedLastEventId: null,
        })),
      })
      .expect(409)
    expect(res.body.error).toMatchObject({ path: 'entries.1.expectedLastEventId' })
    expect(res.body.error.record.stepIndex).toBe(0)
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(1)
  })

  it('stores a repeated batch once, also when two copies race', async () => {
    const { squad, athletes } = await newSquad(3)
    const body = {
      elementId: tucks.backTuck,
      occurredOn: '2026-11-02',
      entries: athletes.map((a) => ({
        athleteId: a.id,
        elementId: tucks.backTuck,
        clientEventId: crypto.randomUUID(),
        expectedLastEventId: null,
      })),
    }
    const answers = await Promise.all([
      coach.post(batch(squad.id)).send(body),
      coach.post(batch(squad.id)).send(body),
    ])
    expect(answers.map((r) => r.status).sort()).toEqual([200, 201])
    expect(answers[0]!.body.results.map((r: { eventId: string }) => r.eventId)).toEqual(
      answers[1]!.body.results.map((r: { eventId: string }) => r.eventId),
    )
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(3)
  })

  it('is for the squad’s coaches and directors only, and for its own athletes and elements', async () => {
    const { squad, athletes } = await newSquad(1)
    const other = await createSquad(database.db, fx.club.id, {
      name: 'Not coached',
      level: 'senior',
      discipline: 'tumbling',
    })
    const body = (athleteId: string) => ({
      elementId: tucks.backTuck,
      occurredOn: '2026-11-02',
      entries: [{ athleteId, elementId: tucks.backTuck, expectedLastEventId: null }],
    })
    const refused = await coach.post(batch(other.id)).send(body(athletes[0]!.id)).expect(403)
    expect(refused.body.error.message).toBe('Not coached is not one of your squads.')
    await clinician.post(batch(squad.id)).send(body(athletes[0]!.id)).expect(403)
    const stranger = await createAthlete(database.db, fx.club.id, {
      givenName: 'Ida',
      familyName: 'Moss',
      birthYear: 2012,
      squadId: other.id,
      discipline: 'artistic-women',
    })
    const outside = await director.post(batch(squad.id)).send(body(stranger.id)).expect(400)
    expect(outside.body.error.issues[0].path).toBe('entries.0.athleteId')
    const wrongPair = await coach
      .post(batch(squad.id))
      .send({ ...body(athletes[0]!.id), counterpartId: tucks.backTuck })
      .expect(400)
    expect(wrongPair.body.error.issues[0].path).toBe('counterpartId')
    const none = await coach
      .post(batch(squad.id))
      .send({ elementId: tucks.backTuck, occurredOn: '2026-11-02', entries: [] })
      .expect(400)
    expect(none.body.error.issues[0].path).toBe('entries')
    expect(await eventsOf([athletes[0]!.id, stranger.id])).toBe(0)
  })
})
