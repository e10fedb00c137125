import { and, eq } from 'drizzle-orm'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { mailOutbox } from '../../server/db/schema-accounts.ts'
import { createSquad } from '../../server/services/squads.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { addDays, clubWithPeople, signedIn, testPassword } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let other: Awaited<ReturnType<typeof clubWithPeople>>
let squadB: { id: string }
let director: TestAgent
const base = () => `/api/clubs/${fx.club.id}`

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'visits')
  other = await clubWithPeople(database.db, 'visits-other')
  squadB = await createSquad(database.db, fx.club.id, {
    name: 'Squad B',
    level: 'senior',
    discipline: 'tumbling',
  })
  director = await signedIn(t, fx.people.director.email)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const mailsTo = (to: string) => database.db.select().from(mailOutbox).where(eq(mailOutbox.to, to))

describe('POST /api/clubs/:clubId/visits', () => {
  it('schedules a visit for a clinician of the club and tells them which squads', async () => {
    const res = await director.post(`${base()}/visits`).send({
      clinicianId: fx.people.clinician.id,
      firstDay: addDays(5),
      lastDay: addDays(7),
      squadIds: [squadB.id],
      agenda: 'Vault and floor landings',
    })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      clinicianId: fx.people.clinician.id,
      firstDay: addDays(5),
      lastDay: addDays(7),
      phase: 'upcoming',
      squads: [{ id: squadB.id, name: 'Squad B' }],
      agenda: 'Vault and floor landings',
      recommendationCount: 0,
    })
    const mail = await t.mailer.fake!.waitFor(fx.people.clinician.email)
    expect(mail.text).toContain(`runs from ${addDays(5)} to ${addDays(7)}`)
    expect(mail.text).toContain('Squads you will review: Squad B.')
  })

  it('invites someone new by e-mail naming the squads; accepting gives them the visit', async () => {
    const email = 'visiting.expert@test.example'
    const res = await director.post(`${base()}/visits`).send({
      email,
      firstDay: addDays(-1),
      lastDay: addDays(1),
      squadIds: [squadB.id],
    })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({ clinicianId: null, invitedEmail: email, phase: 'open' })
    const mail = await t.mailer.fake!.waitFor(email)
    expect(mail.text).toContain('Squads you will review: Squad B.')
    const token = /#token=([A-Za-z0-9_-]+)/.exec(mail.text)![1]
    const accepted = await request(t.app)
      .post('/api/auth/invitations/accept')
      .send({ token, name: 'Visiting Expert', password: testPassword })
    expect(accepted.status).toBe(200)
    const clinician = await signedIn(t, email)
    // Only the covered squad: Squad A is not part of this visit.
    const squads = await clinician.get(`${base()}/squads`).expect(200)
    expect(squads.body.map((s: { name: string }) => s.name)).toEqual(['Squad B'])
    await clinician.get(`${base()}/squads/${fx.squad.id}`).expect(403)
    const visits = await clinician.get(`${base()}/visits`).expect(200)
    expect(visits.body).toHaveLength(1)
    expect(visits.body[0]).toMatchObject({ clinicianName: 'Visiting Expert', invitedEmail: null })
  })

  it.each([
    [{ firstDay: addDays(3), lastDay: addDays(2) }, 'lastDay'],
    [{ squadIds: [] }, 'squadIds'],
    [{ clinicianId: undefined }, 'clinicianId'],
    [{ firstDay: 'next week' }, 'firstDay'],
    [{ lastDay: addDays(-2), firstDay: addDays(-3) }, 'lastDay'],
  ])('answers 400 naming the field for %j', async (change, field) => {
    const res = await director.post(`${base()}/visits`).send({
      clinicianId: fx.people.clinician.id,
      firstDay: addDays(1),
      lastDay: addDays(2),
      squadIds: [fx.squad.id],
      ...change,
    })
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain(field)
  })

  it('refuses a coach as the clinician, naming the field', async () => {
    const res = await director.post(`${base()}/visits`).send({
      clinicianId: fx.people.coach.id,
      firstDay: addDays(1),
      lastDay: addDays(2),
      squadIds: [fx.squad.id],
    })
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('clinicianId')
  })

  it("answers 404 for another club's squad", async () => {
    const res = await director.post(`${base()}/visits`).send({
      clinicianId: fx.people.clinician.id,
      firstDay: addDays(1),
      lastDay: addDays(2),
      squadIds: [other.squad.id],
    })
    expect(res.status).toBe(404)
  })
})

describe('PATCH and cancel /api/clubs/:clubId/visits/:visitId', () => {
  it('changes dates and squads, then a cancelled visit cannot be changed', async () => {
    const created = await director.post(`${base()}/visits`).send({
      clinicianId: fx.people.clinician.id,
      firstDay: addDays(10),
      lastDay: addDays(12),
      squadIds: [fx.squad.id],
    })
    const id = created.body.id
    const changed = await director
      .patch(`${base()}/visits/${id}`)
      .send({ lastDay: addDays(14), squadIds: [fx.squad.id, squadB.id] })
    expect(changed.status).toBe(200)
    expect(changed.body.lastDay).toBe(addDays(14))
    expect(changed.body.squads.map((s: { name: string }) => s.name)).toEqual(['Squad A', 'Squad B'])
    const bad = await director.patch(`${base()}/visits/${id}`).send({ lastDay: addDays(9) })
    expect(bad.status).toBe(400)
    expect(bad.body.error.issues[0].path).toBe('lastDay')
    const cancelled = await director.post(`${base()}/visits/${id}/cancel`)
    expect(cancelled.body.phase).toBe('cancelled')
    await director.patch(`${base()}/visits/${id}`).send({ agenda: 'x' }).expect(409)
  })

  it("answers 404 for another club's visit", async () => {
    const otherDirector = await signedIn(t, other.people.director.email)
    const created = await director.post(`${base()}/visits`).send({
      clinicianId: fx.people.clinician.id,
      firstDay: addDays(20),
      lastDay: addDays(21),
      squadIds: [fx.squad.id],
    })
    await otherDirector
      .patch(`/api/clubs/${other.club.id}/visits/${created.body.id}`)
      .send({ agenda: 'x' })
      .expect(404)
    await director.patch(`${base()}/visits/not-a-uuid`).send({ agenda: 'x' }).expect(400)
  })

  it('sends the clinician one mail per visit scheduled', async () => {
    const before = (await mailsTo(fx.people.clinician.email)).length
    await director.post(`${base()}/visits`).send({
      clinicianId: fx.people.clinician.id,
      firstDay: addDays(30),
      lastDay: addDays(31),
      squadIds: [fx.squad.id],
    })
    const after = await database.db
      .select()
      .from(mailOutbox)
      .where(and(eq(mailOutbox.to, fx.people.clinician.email)))
    expect(after.length).toBe(before + 1)
  })
})
