import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import { womensArtisticFloorProfile } from '../../shared/domain/audit/readiness.ts'
import type { AuditReport } from '../../shared/schemas/audits.ts'
import type { Database } from '../../server/db/client.ts'
import { elementSteps } from '../../server/db/schema-catalogue.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { listElements } from '../../server/services/catalogue.ts'
import { appendHistory } from '../../server/services/progress-history.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn } from '../support/fixtures.ts'
import { doubleSaltoProfile } from '../support/profiles.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let coach: TestAgent
let clinician: TestAgent
let board: TestAgent
let otherDirector: TestAgent
let otherClubId: string
let base: string

const tumblingSenior = {
  id: 'tumbling-senior-passes',
  ...doubleSaltoProfile('Tumbling: senior passes'),
}

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'profiles')
  const other = await clubWithPeople(database.db, 'profiles-elsewhere')
  director = await signedIn(t, fx.people.director.email)
  coach = await signedIn(t, fx.people.coach.email)
  clinician = await signedIn(t, fx.people.clinician.email)
  board = await signedIn(t, fx.people.board.email)
  otherDirector = await signedIn(t, other.people.director.email)
  otherClubId = other.club.id
  base = `/api/clubs/${fx.club.id}`
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const listIds = async () =>
  ((await director.get(`${base}/requirement-profiles`).expect(200)).body as { id: string }[]).map(
    (p) => p.id,
  )

describe('POST /api/clubs/:clubId/requirement-profiles', () => {
  it('creates a profile and lists it beside the seeded one', async () => {
    const res = await director.post(`${base}/requirement-profiles`).send(tumblingSenior)
    expect(res.status).toBe(201)
    expect(res.body).toEqual(tumblingSenior)
    expect(await listIds()).toEqual([womensArtisticFloorProfile.id, tumblingSenior.id].sort())
  })

  it('refuses an id the club already uses with a 409 naming the field, and keeps the profile', async () => {
    const res = await director
      .post(`${base}/requirement-profiles`)
      .send({ ...tumblingSenior, label: 'Would overwrite' })
    expect(res.status).toBe(409)
    expect(res.body.error.code).toBe('profile_exists')
    expect(res.body.error.message).toContain(tumblingSenior.id)
    expect(res.body.error.issues).toEqual([{ path: 'id', message: res.body.error.message }])
    const kept = (await director.get(`${base}/requirement-profiles`).expect(200)).body.find(
      (p: { id: string }) => p.id === tumblingSenior.id,
    )
    expect(kept.label).toBe(tumblingSenior.label)
  })

  it('refuses to overwrite a seeded profile too', async () => {
    const res = await director
      .post(`${base}/requirement-profiles`)
      .send({ ...tumblingSenior, id: womensArtisticFloorProfile.id })
    expect(res.status).toBe(409)
    const seeded = (await director.get(`${base}/requirement-profiles`).expect(200)).body.find(
      (p: { id: string }) => p.id === womensArtisticFloorProfile.id,
    )
    expect(seeded.label).toBe(womensArtisticFloorProfile.label)
  })

  it.each([
    ['an id with capitals and spaces', { id: 'Senior Passes' }, 'id'],
    ['no discipline', { id: 'no-discipline', discipline: undefined }, 'discipline'],
    ['an unknown discipline', { id: 'rings', discipline: 'rings' }, 'discipline'],
    ['no category', { id: 'no-category', categories: [] }, 'categories'],
    ['no apparatus', { id: 'no-apparatus', apparatus: undefined }, 'apparatus'],
    ['an apparatus with spaces', { id: 'spaced', apparatus: 'Double mini' }, 'apparatus'],
    ['a blank name', { id: 'blank-name', label: '   ' }, 'label'],
    ['no requirement', { id: 'empty', requirements: [] }, 'requirements'],
    [
      'a requirement without a source',
      { id: 'unsourced', requirements: [{ ...tumblingSenior.requirements[0], source: '' }] },
      'requirements.0.source',
    ],
  ])('answers %s with a 400 naming the field', async (_case, change, path) => {
    const res = await director
      .post(`${base}/requirement-profiles`)
      .send({ ...tumblingSenior, ...change })
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain(path)
  })

  it('answers a body that is not a profile at all with a 400, not a 500', async () => {
    const list = await director.post(`${base}/requirement-profiles`).send([tumblingSenior])
    expect(list.status).toBe(400)
    const none = await director.post(`${base}/requirement-profiles`)
    expect(none.status).toBe(400)
    const broken = await director
      .post(`${base}/requirement-profiles`)
      .set('Content-Type', 'application/json')
      .send('{"id": ')
    expect(broken.status).toBe(400)
    expect(await listIds()).toEqual([womensArtisticFloorProfile.id, tumblingSenior.id].sort())
  })

  it('refuses coaches, clinicians and the board, and creates nothing', async () => {
    for (const agent of [coach, clinician, board]) {
      const res = await agent
        .post(`${base}/requirement-profiles`)
        .send({ ...tumblingSenior, id: 'not-allowed' })
      expect(res.status).toBe(403)
    }
    await request(t.app)
      .post(`${base}/requirement-profiles`)
      .send({ ...tumblingSenior, id: 'not-allowed' })
      .expect(401)
    expect(await listIds()).not.toContain('not-allowed')
  })
})

describe('PUT /api/clubs/:clubId/requirement-profiles/:id', () => {
  it('edits a profile that exists', async () => {
    const res = await director
      .put(`${base}/requirement-profiles/${tumblingSenior.id}`)
      .send({ ...tumblingSenior, categories: ['junior', 'senior'] })
    expect(res.status).toBe(200)
    expect(res.body.categories).toEqual(['junior', 'senior'])
  })

  it('answers 404 for an unknown id instead of creating it', async () => {
    const res = await director
      .put(`${base}/requirement-profiles/never-created`)
      .send({ ...tumblingSenior, id: 'never-created' })
    expect(res.status).toBe(404)
    expect(await listIds()).not.toContain('never-created')
  })
})

describe('DELETE /api/clubs/:clubId/requirement-profiles/:id', () => {
  it('refuses coaches, clinicians and the board, and deletes nothing', async () => {
    for (const agent of [coach, clinician, board]) {
      await agent.delete(`${base}/requirement-profiles/${tumblingSenior.id}`).expect(403)
    }
    expect(await listIds()).toContain(tumblingSenior.id)
  })

  it('deletes a profile, after which it is neither listed nor deletable again', async () => {
    await director.delete(`${base}/requirement-profiles/${tumblingSenior.id}`).expect(204)
    expect(await listIds()).toEqual([womensArtisticFloorProfile.id])
    const again = await director.delete(`${base}/requirement-profiles/${tumblingSenior.id}`)
    expect(again.status).toBe(404)
    expect(again.body.error.code).toBe('not_found')
  })

  it('answers 404 for an id no profile could have', async () => {
    const res = await director.delete(`${base}/requirement-profiles/NOT%20AN%20ID`)
    expect(res.status).toBe(404)
    expect(res.body.error.message).toBe('No such requirement profile in this club.')
  })

  it('deletes in the director’s own club only, never another club’s profile of the same id', async () => {
    const path = `/requirement-profiles/${womensArtisticFloorProfile.id}`
    await otherDirector.delete(`/api/clubs/${fx.club.id}${path}`).expect(404)
    await otherDirector.delete(`/api/clubs/${otherClubId}${path}`).expect(204)
    expect(await listIds()).toContain(womensArtisticFloorProfile.id)
  })

  it('leaves a stored audit’s readiness results as they were', async () => {
    // Born 2013: 13 in 2026, a junior from 1 January 2027 (FIG WAG juniors 14–15, from memory),
    // so an audit as of 2026-06-30 checks her against the junior profile.
    await createAthlete(database.db, fx.club.id, {
      givenName: 'Ida',
      familyName: 'Wrenlow',
      birthYear: 2013,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
    const auditId = await runAndStore(
      database.db,
      { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' },
      { squadId: null, asOf: '2026-06-30' },
    )
    const before = (await director.get(`${base}/audits/${auditId}`).expect(200)).body as AuditReport
    expect(before.result.readiness).toHaveLength(1)
    expect(before.result.readiness[0]!.profileId).toBe(womensArtisticFloorProfile.id)
    expect(before.result.readiness[0]!.requirements).toHaveLength(
      womensArtisticFloorProfile.requirements.length,
    )

    await director
      .delete(`${base}/requirement-profiles/${womensArtisticFloorProfile.id}`)
      .expect(204)
    expect(await listIds()).toEqual([])

    const after = (await director.get(`${base}/audits/${auditId}`).expect(200)).body as AuditReport
    expect(after.result).toEqual(before.result)
  })
})

describe('a requirement is met on its profile’s apparatus', () => {
  it('never counts a trampoline element towards the women’s floor profile', async () => {
    // The seeded profile is the women's floor composition requirements (FIG WAG Code of Points
    // 2022–2024, floor exercise, from memory): a salto with a full twist, a double salto, a
    // salto forward or sideward, a salto backward. An athlete competition-ready on trampoline
    // saltos that would match all four on geometry alone has met none of them on floor.
    const club = await clubWithPeople(database.db, 'profiles-apparatus')
    const access = {
      clubId: club.club.id,
      userId: club.people.director.id,
      role: 'director' as const,
    }
    const athlete = await createAthlete(database.db, club.club.id, {
      givenName: 'Tova',
      familyName: 'Brackley',
      birthYear: 2013, // a junior from 1 January 2027 (FIG WAG juniors 14–15, from memory)
      squadId: club.squad.id,
      discipline: 'artistic-women',
    })
    const catalogue = await listElements(database.db, club.club.id)
    const trampoline = (direction: string, quarters: number, twists: number[]) =>
      catalogue.find(
        (e) =>
          e.apparatus === 'trampoline' &&
          e.direction === direction &&
          e.quarterRotations === quarters &&
          JSON.stringify(e.twists) === JSON.stringify(twists),
      )!
    const ready = [
      trampoline('backward', 8, [2, 0]), // full-in double back: double, full twist, backward
      trampoline('forward', 4, [0]), // front salto
    ]
    const steps = await database.db.select().from(elementSteps)
    const last = (id: string) =>
      Math.max(...steps.filter((s) => s.elementId === id).map((s) => s.position))
    await appendHistory(
      database.db,
      club.club.id,
      ready.map((e) => ({
        athleteId: athlete.id,
        elementId: e.id,
        coachId: club.people.coach.id,
        change: {
          kind: 'step' as const,
          stepIndex: last(e.id),
          occurredOn: '2026-05-10',
          skipReason: 'Assessed',
        },
      })),
    )
    const auditId = await runAndStore(database.db, access, { squadId: null, asOf: '2026-06-30' })
    const director = await signedIn(t, club.people.director.email)
    const report = (await director.get(`/api/clubs/${club.club.id}/audits/${auditId}`).expect(200))
      .body as AuditReport
    const [row] = report.result.readiness
    expect(row!.profileId).toBe(womensArtisticFloorProfile.id)
    expect(row!.requirements.map((r) => [r.requirementId, r.met])).toEqual([
      ['salto-full-twist', false],
      ['double-salto', false],
      ['salto-forward-sideward', false],
      ['salto-backward', false],
    ])
    expect(row!.missingCount).toBe(4)
    // every suggestion is a floor element, never the trampoline ones she already does
    const apparatusOf = new Map(catalogue.map((e) => [e.id, e.apparatus]))
    for (const r of row!.requirements) expect(apparatusOf.get(r.elementId!)).toBe('floor')
  })
})
