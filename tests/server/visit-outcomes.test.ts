import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { publish, runAndStore } from '../../server/services/audits.ts'
import { addDaysIso } from '../../shared/domain/visits.ts'
import { todayIso } from '../../shared/domain/access.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { addDays, clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

// Worked example, by hand (rules in shared/domain/visit-outcomes.ts): one squad of three
// athletes, all on the back tuck. A month ago Ada reached step 1 and Bea step 2; Cy never
// started. Today the clinician recommends Ada aim for step 2 and Bea for step 3; the coach
// accepts Ada's and logs her step 2, and declines Bea's. The audit as of today reports:
// Ada 1 → 2, moved; Bea 2 → 2, not moved, declined. Accepted 1, moved 1. Comparable: the back
// tuck for the squad's athletes no recommendation named on it: Cy alone, never started and
// still not: 1 comparable, 0 moved.

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let coach: TestAgent
let clinician: TestAgent
let director: TestAgent
let board: TestAgent
const ids: Record<'ada' | 'bea' | 'cy', string> = { ada: '', bea: '', cy: '' }
let backTuck: string
const base = () => `/api/clubs/${fx.club.id}`
const today = todayIso()

async function step(athleteId: string, stepIndex: number, occurredOn: string) {
  const record = await coach.get(`${base()}/athletes/${athleteId}/records/${backTuck}`)
  const res = await coach.post(`${base()}/athletes/${athleteId}/events`).send({
    elementId: backTuck,
    kind: 'step',
    stepIndex,
    occurredOn,
    expectedLastEventId: record.body.lastEventId ?? null,
    skipReason: 'Shown at an assessment.',
  })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
}
async function recommend(athleteId: string, suggestedStepIndex: number) {
  const res = await clinician.post(`${base()}/recommendations`).send({
    squadId: fx.squad.id,
    athleteId,
    elementId: backTuck,
    suggestedStepIndex,
    text: 'Aim one step higher.',
    dueOn: addDays(14),
  })
  expect(res.status).toBe(201)
  return res.body.id as string
}

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'outcomes')
  for (const [key, givenName] of [
    ['ada', 'Ada'],
    ['bea', 'Bea'],
    ['cy', 'Cy'],
  ] as const) {
    ids[key] = (
      await createAthlete(database.db, fx.club.id, {
        givenName,
        familyName: 'Example',
        birthYear: 2013,
        squadId: fx.squad.id,
        discipline: 'artistic-women',
      })
    ).id
  }
  backTuck = (await floorTucks(database.db, fx.club.id)).backTuck
  coach = await signedIn(t, fx.people.coach.email)
  clinician = await signedIn(t, fx.people.clinician.email)
  director = await signedIn(t, fx.people.director.email)
  board = await signedIn(t, fx.people.board.email)
  await step(ids.ada, 1, addDaysIso(today, -30))
  await step(ids.bea, 2, addDaysIso(today, -30))
  const forAda = await recommend(ids.ada, 2)
  const forBea = await recommend(ids.bea, 3)
  await coach.post(`${base()}/recommendations/${forAda}/status`).send({ status: 'accepted' })
  await coach
    .post(`${base()}/recommendations/${forBea}/status`)
    .send({ status: 'declined', note: 'Her landings need a month first.' })
  await step(ids.ada, 2, today)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

describe('visit outcomes in the next audit', () => {
  let auditId: string
  beforeAll(async () => {
    const access = { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' as const }
    auditId = await runAndStore(database.db, access, { squadId: null, asOf: today })
    await publish(database.db, access, auditId)
  })

  it('reports each named athlete’s step on the day before and as of the audit', async () => {
    const res = await director.get(`${base()}/audits/${auditId}`)
    expect(res.status).toBe(200)
    const outcomes = res.body.visitOutcomes
    const row = (athleteId: string) =>
      outcomes.recommendations.find((r: { athleteId: string }) => r.athleteId === athleteId)
    expect(row(ids.ada)).toMatchObject({
      status: 'accepted',
      stepBefore: 1,
      stepAtAudit: 2,
      moved: true,
    })
    expect(row(ids.bea)).toMatchObject({
      status: 'declined',
      stepBefore: 2,
      stepAtAudit: 2,
      moved: false,
    })
    expect(outcomes.summary).toEqual({
      accepted: 1,
      acceptedMoved: 1,
      comparable: 1,
      comparableMoved: 0,
    })
    expect(outcomes.elementNames[backTuck]).toBeTypeOf('string')
    expect(res.body.athleteNames[ids.ada]).toBe('Ada Example')
  })

  it('keeps the stored outcomes when the recommendation changes later', async () => {
    const [rec] = (await director.get(`${base()}/recommendations`).query({ athleteId: ids.ada }))
      .body as { id: string }[]
    await coach
      .post(`${base()}/recommendations/${rec!.id}/status`)
      .send({ status: 'done', note: 'Step 2 reached.' })
    const res = await director.get(`${base()}/audits/${auditId}`)
    expect(res.body.visitOutcomes.summary.acceptedMoved).toBe(1)
    expect(
      res.body.visitOutcomes.recommendations.find(
        (r: { athleteId: string }) => r.athleteId === ids.ada,
      ).status,
    ).toBe('accepted')
  })

  it('gives the board the counts only', async () => {
    const res = await board.get(`${base()}/board-summary`)
    expect(res.status).toBe(200)
    expect(res.body.latest.visitOutcomes).toEqual({
      accepted: 1,
      acceptedMoved: 1,
      comparable: 1,
      comparableMoved: 0,
    })
    const text = JSON.stringify(res.body)
    for (const id of Object.values(ids)) expect(text).not.toContain(id)
    expect(text).not.toContain('Ada')
  })

  it('reports nothing for a scope without a visit', async () => {
    const access = { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' as const }
    const other = await clubWithPeople(database.db, 'outcomes-none')
    const id = await runAndStore(
      database.db,
      { ...access, clubId: other.club.id, userId: other.people.director.id },
      { squadId: null, asOf: today },
    )
    const res = await (
      await signedIn(t, other.people.director.email)
    ).get(`/api/clubs/${other.club.id}/audits/${id}`)
    expect(res.body.visitOutcomes).toBeNull()
  })

  it('keeps an erased athlete’s row under a neutral label, without their id', async () => {
    const res = await director
      .post(`${base()}/athletes/${ids.bea}/erase`)
      .send({ confirmName: 'Bea Example' })
    expect(res.status).toBe(204)
    const report = (await director.get(`${base()}/audits/${auditId}`)).body
    expect(JSON.stringify(report.visitOutcomes)).not.toContain(ids.bea)
    const names = report.visitOutcomes.recommendations.map(
      (r: { athleteId: string }) => report.athleteNames[r.athleteId],
    )
    expect(names.sort()).toEqual(['Ada Example', 'Erased athlete'])
  })
})
