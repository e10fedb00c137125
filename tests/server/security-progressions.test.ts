import { and, eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { elementStepMaps } from '../../server/db/schema-catalogue.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import type { ElementDetail } from '../../shared/schemas/catalogue.ts'
import type { ProgressionStep } from '../../shared/schemas/progressions.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let base: string
let tucks: Awaited<ReturnType<typeof floorTucks>>

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'progressions')
  director = await signedIn(t, fx.people.director.email)
  base = `/api/clubs/${fx.club.id}`
  tucks = await floorTucks(database.db, fx.club.id)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const detailOf = async (id: string) =>
  (await director.get(`${base}/elements/${id}`).expect(200)).body as ElementDetail

const names = (steps: ProgressionStep[]) => steps.map((s) => s.name)

/** An athlete whose record on the element stands on `stepIndex`. */
async function athleteOn(elementId: string, stepIndex: number) {
  const athlete = await createAthlete(database.db, fx.club.id, {
    givenName: 'Cleo',
    familyName: `Marchbank ${Math.random().toString(36).slice(2, 7)}`,
    birthYear: 2012,
    squadId: fx.squad.id,
    discipline: 'artistic-women',
  })
  await director
    .post(`${base}/athletes/${athlete.id}/events`)
    .send({
      elementId,
      kind: 'step',
      stepIndex,
      skipReason: 'Assessed on arrival.',
      occurredOn: '2026-11-02',
      expectedLastEventId: null,
    })
    .expect(201)
  return athlete
}

const recordOf = async (athleteId: string, elementId: string) =>
  (await director.get(`${base}/athletes/${athleteId}/records/${elementId}`).expect(200)).body as {
    stepIndex: number
    steps: ProgressionStep[]
  }

const mapsOf = (elementId: string) =>
  database.db
    .select()
    .from(elementStepMaps)
    .where(and(eq(elementStepMaps.clubId, fx.club.id), eq(elementStepMaps.elementId, elementId)))

/** The same progression with its second and third steps swapped, and where each old step goes. */
function swapSecondAndThird(steps: ProgressionStep[]) {
  const reordered = [...steps]
  reordered[1] = steps[2]!
  reordered[2] = steps[1]!
  const mapping = steps.map((_, i) => (i === 1 ? 2 : i === 2 ? 1 : i))
  return { steps: reordered, mapping }
}

describe('PUT /api/clubs/:clubId/elements/:id/steps, edited at the same time', () => {
  it('applies one of two identical concurrent reorders and answers the other 409 with the current progression', async () => {
    const elementId = tucks.backTuck
    const athlete = await athleteOn(elementId, 1)
    const before = await detailOf(elementId)
    const stepOfAthlete = before.steps[1]!.name
    const edit = { ...swapSecondAndThird(before.steps), stepsVersion: before.stepsVersion }

    const answers = await Promise.all([
      director.put(`${base}/elements/${elementId}/steps`).send(edit),
      director.put(`${base}/elements/${elementId}/steps`).send(edit),
    ])

    expect(answers.map((a) => a.status).sort()).toEqual([200, 409])
    const saved = answers.find((a) => a.status === 200)!.body as ElementDetail
    const refused = answers.find((a) => a.status === 409)!.body
    expect(saved.stepsVersion).toBe(before.stepsVersion + 1)
    expect(refused.error.code).toBe('conflict')
    expect(refused.error.message).toMatch(/changed/)
    expect(refused.error.element.stepsVersion).toBe(saved.stepsVersion)
    expect(names(refused.error.element.steps)).toEqual(names(edit.steps))

    // The athlete followed their step once: to its new place, not back again.
    const record = await recordOf(athlete.id, elementId)
    expect(record.stepIndex).toBe(2)
    expect(record.steps[record.stepIndex]!.name).toBe(stepOfAthlete)
    expect(await mapsOf(elementId)).toHaveLength(1)
  })

  it('refuses an edit made against an older version and changes nothing', async () => {
    const elementId = tucks.frontTuck
    const athlete = await athleteOn(elementId, 1)
    const first = await detailOf(elementId)
    const firstEdit = { ...swapSecondAndThird(first.steps), stepsVersion: first.stepsVersion }
    await director.put(`${base}/elements/${elementId}/steps`).send(firstEdit).expect(200)
    const current = await detailOf(elementId)
    const recordBefore = await recordOf(athlete.id, elementId)

    const stale = await director
      .put(`${base}/elements/${elementId}/steps`)
      .send({ ...swapSecondAndThird(first.steps), stepsVersion: first.stepsVersion })

    expect(stale.status).toBe(409)
    expect(stale.body.error.code).toBe('conflict')
    expect(stale.body.error.element).toEqual(current)
    expect(await detailOf(elementId)).toEqual(current)
    expect(await recordOf(athlete.id, elementId)).toEqual(recordBefore)
    expect(await mapsOf(elementId)).toHaveLength(1)
  })

  it('answers an edit without the version it was made against with 400 naming stepsVersion', async () => {
    const elementId = tucks.backTuck
    const current = await detailOf(elementId)
    const res = await director
      .put(`${base}/elements/${elementId}/steps`)
      .send({ steps: current.steps, mapping: current.steps.map((_, i) => i) })
    expect(res.status).toBe(400)
    expect(res.body.error.issues).toEqual([
      expect.objectContaining({ path: 'stepsVersion', message: expect.any(String) }),
    ])
    expect(await detailOf(elementId)).toEqual(current)
  })
})

describe('PUT /api/clubs/:clubId/elements/:id/prerequisites, edited at the same time', () => {
  const prerequisitesOf = async (id: string) =>
    (await detailOf(id)).prerequisites.map((p) => ({
      elementId: p.elementId,
      stepIndex: p.stepIndex,
    }))

  it('saves identical concurrent lists once each, without an error', async () => {
    const list = [{ elementId: tucks.backTuck, stepIndex: 1 }]
    const answers = await Promise.all(
      [1, 2, 3, 4, 5].map(() =>
        director
          .put(`${base}/elements/${tucks.frontTuck}/prerequisites`)
          .send({ prerequisites: list }),
      ),
    )
    expect(answers.map((a) => a.status)).toEqual([200, 200, 200, 200, 200])
    expect(await prerequisitesOf(tucks.frontTuck)).toEqual(list)
  })

  it('refuses the second of two concurrent edits that together would go round in a circle', async () => {
    await director
      .put(`${base}/elements/${tucks.frontTuck}/prerequisites`)
      .send({ prerequisites: [] })
      .expect(200)
    const answers = await Promise.all([
      director
        .put(`${base}/elements/${tucks.frontTuck}/prerequisites`)
        .send({ prerequisites: [{ elementId: tucks.backTuck, stepIndex: 0 }] }),
      director
        .put(`${base}/elements/${tucks.backTuck}/prerequisites`)
        .send({ prerequisites: [{ elementId: tucks.frontTuck, stepIndex: 0 }] }),
    ])
    expect(answers.map((a) => a.status).sort()).toEqual([200, 400])
    expect(answers.find((a) => a.status === 400)!.body.error.code).toBe('prerequisite_cycle')
    const required = [
      ...(await prerequisitesOf(tucks.frontTuck)),
      ...(await prerequisitesOf(tucks.backTuck)),
    ]
    expect(required).toHaveLength(1)
  })
})
